package mechanics

import (
	"fmt"
	"math"
)

// SlipWeakening is linear slip-weakening friction (Ida 1972; Palmer &
// Rice 1973): the friction coefficient falls linearly with slip D from its
// static value μs to its residual (dynamic) value μd over the critical
// slip distance Dc and stays there,
//
//	μ(D) = μs − (μs − μd)·min(D/Dc, 1),
//
// and the shear strength of a plane at effective normal stress σn′ is
//
//	τs = c + μ(D)·σn′.
//
// While D < Dc the strength falls with slip at the weakening rate
//
//	W = (τp − τr)/Dc = (μs − μd)·σn′/Dc,
//
// with the peak strength τp = c + μs·σn′ and the residual strength
// τr = c + μd·σn′ (Palmer & Rice 1973). The cohesion c does not weaken.
// A fracture held open (σn′ < 0) has no frictional strength: σn′ is
// clamped at 0, so τs = c and W = 0 there.
type SlipWeakening struct {
	Static       float64 // μs, static friction coefficient, > 0
	Residual     float64 // μd, residual friction coefficient, 0 < μd ≤ μs
	CriticalSlip float64 // Dc, slip over which μ falls from μs to μd, m, > 0
	Cohesion     float64 // c, Pa, ≥ 0
}

// Validate returns an error unless μs > 0, 0 < μd ≤ μs, Dc > 0 and c ≥ 0.
func (f SlipWeakening) Validate() error {
	if err := firstError(
		f.Onset().Validate(),
		positive("friction_residual", f.Residual),
		positive("critical_slip", f.CriticalSlip),
	); err != nil {
		return err
	}
	if f.Residual > f.Static {
		return &InputError{Name: "friction_residual", Value: f.Residual,
			Want: fmt.Sprintf("must be ≤ friction_static (%g)", f.Static)}
	}
	return nil
}

// Onset returns the Coulomb criterion of slip onset, τ ≥ c + μs·σn′: the
// peak strength of the unslipped plane.
func (f SlipWeakening) Onset() Coulomb {
	return Coulomb{Friction: f.Static, Cohesion: f.Cohesion}
}

// Friction returns μ(D) = μs − (μs − μd)·min(D/Dc, 1) after slip D, m.
// Negative slip counts as none.
func (f SlipWeakening) Friction(slip float64) float64 {
	w := min(max(slip, 0)/f.CriticalSlip, 1)
	return f.Static - (f.Static-f.Residual)*w
}

// Strength returns the shear strength τs = c + μ(D)·max(σn′, 0), Pa, after
// slip D, m, at effective normal stress sigmaNEff = σn − p, Pa.
func (f SlipWeakening) Strength(slip, sigmaNEff float64) float64 {
	return f.Cohesion + f.Friction(slip)*max(sigmaNEff, 0)
}

// WeakeningRate returns W = (μs − μd)·max(σn′, 0)/Dc, Pa/m, the rate at
// which the strength falls with slip while D < Dc, at effective normal
// stress sigmaNEff, Pa.
func (f SlipWeakening) WeakeningRate(sigmaNEff float64) float64 {
	return (f.Static - f.Residual) * math.Max(sigmaNEff, 0) / f.CriticalSlip
}

// ShearMode is the crack mode of slip on a two-dimensional slipping
// region: in-plane (mode II) when the slip is along the dimension that the
// region's half-size measures, anti-plane (mode III) when it is across it.
type ShearMode int

const (
	InPlane   ShearMode = iota // mode II: μ* = G/(1−ν)
	AntiPlane                  // mode III: μ* = G
)

// String returns "mode II" or "mode III".
func (m ShearMode) String() string {
	switch m {
	case InPlane:
		return "mode II"
	case AntiPlane:
		return "mode III"
	}
	return fmt.Sprintf("ShearMode(%d)", int(m))
}

// EffectiveShearModulus returns the modulus μ* of a 2-D shear crack in
// rock of shear modulus g, Pa, and Poisson's ratio nu: G/(1−ν) in mode II
// and G in mode III (Uenishi & Rice 2003). It panics on an unknown mode.
func EffectiveShearModulus(g, nu float64, mode ShearMode) float64 {
	switch mode {
	case InPlane:
		return g / (1 - nu)
	case AntiPlane:
		return g
	}
	panic("mechanics: unknown shear mode " + mode.String())
}

// NucleationFactor is the constant of the nucleation half-length
// a_n = NucleationFactor·μ*/W of linear slip-weakening friction: half the
// smallest eigenvalue β0 of the problem
//
//	−(1/π)·∫₋₁¹ φ′(t)/(t − s) dt = β·φ(s),  φ(±1) = 0,
//
// which governs the quasi-static equilibrium of a slipping region of
// half-length a under W once lengths are scaled by a: it loses its last
// equilibrium when 2aW/μ* = β0 (Uenishi & Rice 2003, who show that the
// eigenvalue problem is the one of Dascalu, Ionescu & Campillo 2000).
// Uenishi & Rice quote a_n ≈ 0.579·μ*/W (from memory; their abstract, which
// was read, states only that a_n ∝ μ*/W is set by this eigenvalue problem
// and is independent of the loading). The ten digits here were computed
// for slipfront by a Galerkin solution in the basis √(1−s²)·U_{n−1}(s)
// (Chebyshev polynomials of the second kind), converged to 1e−10 at 40
// terms; the package tests repeat that computation and also find the
// same length from a boundary-element crack.
const NucleationFactor = 0.5788869418

// NucleationHalfLength returns the half-length a_n = NucleationFactor·μ*/W,
// m, at which a slipping region on a fault with linear slip-weakening rate
// W, Pa/m, becomes unstable, for the effective modulus μ*, Pa
// ([EffectiveShearModulus]) (Uenishi & Rice 2003). It is +Inf when W ≤ 0:
// without weakening there is no instability.
func NucleationHalfLength(effectiveModulus, weakeningRate float64) float64 {
	if !(weakeningRate > 0) {
		return math.Inf(1)
	}
	return NucleationFactor * effectiveModulus / weakeningRate
}

// SlipClass says whether a slipping region slips seismically.
type SlipClass int

const (
	Aseismic SlipClass = iota // stable, quasi-static slip: moment, not an event
	Seismic                   // unstable, dynamic slip: an event
)

// String returns "aseismic" or "seismic".
func (c SlipClass) String() string {
	switch c {
	case Aseismic:
		return "aseismic"
	case Seismic:
		return "seismic"
	}
	return fmt.Sprintf("SlipClass(%d)", int(c))
}

// Nucleation is the criterion that splits slip on a fracture with linear
// slip-weakening friction into seismic and aseismic.
//
// A slipping region of half-length a under slip-weakening rate W is in
// stable quasi-static equilibrium while a < a_n = 0.5789·μ*/W: it grows
// only as fast as its loading (here, the pressure front) grows, which is
// aseismic slip. At a = a_n no quasi-static equilibrium is left and the
// region grows dynamically: it nucleates an event. Uenishi & Rice (2003)
// prove that a_n does not depend on how the loading is distributed, so the
// criterion needs only the region's size, the friction and the moduli.
//
// Limits of the criterion, which the caller must respect:
//
//   - It is a 2-D, quasi-static result for a planar fault in a homogeneous
//     elastic whole space with one weakening rate; W is evaluated at the
//     region's mean effective normal stress, so a strongly non-uniform σn′
//     (a sharp pressure front) is approximated.
//   - It applies while the region is weakening (slip below Dc over most of
//     it). A region that has slipped past Dc everywhere has constant
//     residual friction: whether it then runs away depends on the stress
//     level outside it, which this criterion does not judge.
//   - A region shorter than 2·a_n that stops growing stays aseismic even if
//     it slipped; one that becomes seismic ruptures dynamically, and the
//     final size of that event is set by the stress state, not by a_n.
//   - The patch is treated as a 2-D crack of half-size min(L, H)/2
//     ([Patch.HalfSize]), the same modelling choice (no source) as
//     [PlaneStrainCrack]: a patch must exceed the nucleation size in its
//     smaller dimension.
//   - With W ≤ 0 (μd = μs, or an open fracture) slip is always aseismic.
type Nucleation struct {
	Friction     SlipWeakening
	ShearModulus float64   // G, Pa
	PoissonRatio float64   // ν
	Mode         ShearMode // crack mode of the slip across the patch's smaller dimension
}

// Validate returns an error for invalid friction, G ≤ 0, ν outside
// (0, 0.5) or an unknown mode.
func (n Nucleation) Validate() error {
	if err := firstError(n.Friction.Validate(),
		positive("shear_modulus", n.ShearModulus),
		poisson("poisson_ratio", n.PoissonRatio)); err != nil {
		return err
	}
	if n.Mode != InPlane && n.Mode != AntiPlane {
		return &InputError{Name: "shear mode", Value: float64(n.Mode), Want: "must be InPlane (0) or AntiPlane (1)"}
	}
	return nil
}

// HalfLength returns the nucleation half-length a_n, m, at effective normal
// stress sigmaNEff, Pa; +Inf when there is no weakening.
func (n Nucleation) HalfLength(sigmaNEff float64) float64 {
	mu := EffectiveShearModulus(n.ShearModulus, n.PoissonRatio, n.Mode)
	return NucleationHalfLength(mu, n.Friction.WeakeningRate(sigmaNEff))
}

// Classify returns Seismic when the slipping patch's half-size
// p.HalfSize() has reached the nucleation half-length at its mean
// effective normal stress sigmaNEff, Pa, and Aseismic otherwise.
func (n Nucleation) Classify(p Patch, sigmaNEff float64) SlipClass {
	if p.HalfSize() >= n.HalfLength(sigmaNEff) {
		return Seismic
	}
	return Aseismic
}
