package mechanics

import (
	"math"
)

// ApertureModel is the mechanical aperture of a fracture with hyperbolic
// normal closure, capped shear dilation and, above the normal stress,
// elastic opening.
//
// While the fracture is closed (σn′ = σn − p ≥ 0) the aperture is
//
//	e = (e0 + min(D, Dmax)·tan φ_dil) / (1 + 9·σn′/σn,ref)
//
// (Willis-Richards, Watanabe & Takahashi 1996, with the slip cap of later
// papers; docs/references.md §6.2), where D is the accumulated slip, and
// σn,ref the effective normal stress that closes the fracture to a tenth.
//
// When the pore pressure exceeds the normal stress the fracture is jacked
// open: the closure law is held at σn′ = 0 (docs/references.md §6.2) and the
// average opening of a 2-D crack under the net pressure Δp = p − σn is
// added,
//
//	e = e0 + min(D, Dmax)·tan φ_dil + π(1−ν)·Δp·a/(2G)
//
// (Sneddon 1946; docs/references.md §8.3), with a = Patch.HalfSize(), half the
// smaller of the patch's length and height.
//
// The aperture is continuous at the switch p = σn, but its slope is not:
// de/dp is 9·(e0 + D·tan φ_dil)/σn,ref just below (the closure law's
// compliance at zero stress) and π(1−ν)a/(2G) just above (the crack's
// compliance). The two are different physics (asperity contact versus an
// elastic crack) and no source ties them together, so the kink is kept;
// [ApertureModel.Evaluate] returns the closed-side slope at p = σn exactly.
type ApertureModel struct {
	ZeroStress        float64 // e0, aperture at zero effective normal stress and no slip, m
	ClosureStress     float64 // σn,ref, effective normal stress closing the fracture to e0/10, Pa
	DilationAngle     float64 // φ_dil, shear-dilation angle, radians
	DilationSlipLimit float64 // Dmax, slip beyond which dilation stops growing, m
	ShearModulus      float64 // G of the rock, Pa
	PoissonRatio      float64 // ν of the rock
}

// Validate returns an error unless e0 > 0, σn,ref > 0, 0 ≤ φ_dil < π/2,
// Dmax ≥ 0, G > 0 and 0 < ν < 0.5.
func (m ApertureModel) Validate() error {
	if err := firstError(
		positive("zero_stress_aperture", m.ZeroStress),
		positive("closure_stress", m.ClosureStress),
		nonNegative("dilation_slip_limit", m.DilationSlipLimit),
		positive("shear_modulus", m.ShearModulus),
		poisson("poisson_ratio", m.PoissonRatio),
	); err != nil {
		return err
	}
	if !(m.DilationAngle >= 0 && m.DilationAngle < math.Pi/2) {
		return &InputError{Name: "dilation_angle", Value: m.DilationAngle, Want: "must be in [0, π/2) radians"}
	}
	return nil
}

// Aperture returns the mechanical aperture, m, of a fracture patch with
// total normal stress sigmaN and pore pressure p, Pa, after accumulated
// slip, m. Negative slip counts as none.
func (m ApertureModel) Aperture(sigmaN, p, slip float64, patch Patch) float64 {
	e, _ := m.Evaluate(sigmaN, p, slip, patch)
	return e
}

// Evaluate returns the aperture e, m, and its derivative with respect to
// the pore pressure at fixed normal stress and slip, de/dp, m/Pa (the
// fracture's normal compliance, which the flow solver needs for storage).
// Closed (σn′ ≥ 0):
//
//	de/dp = (e0 + D·tan φ_dil)·(9/σn,ref) / (1 + 9·σn′/σn,ref)²
//
// open: de/dp = π(1−ν)a/(2G).
func (m ApertureModel) Evaluate(sigmaN, p, slip float64, patch Patch) (e, dedp float64) {
	free := m.ZeroStress + m.dilation(slip)
	eff := sigmaN - p
	if eff >= 0 {
		c := 9 / m.ClosureStress
		f := 1 + c*eff
		return free / f, free * c / (f * f)
	}
	k := crackStiffness(m.ShearModulus, m.PoissonRatio, patch.HalfSize())
	return free - eff/k, 1 / k
}

// DilationFactor returns (e0 + min(D, Dmax)·tan φ_dil)/e0, the factor by
// which the accumulated slip D multiplies the closed aperture at any fixed
// effective normal stress: the closure factor 1/(1 + 9·σn′/σn,ref) is the
// same with and without slip and cancels. A fracture that slipped while
// pressurised and then returns to its initial pore pressure and stress
// keeps the aperture e_init·DilationFactor(D): the dilation stays, the
// jacking and elastic opening do not.
func (m ApertureModel) DilationFactor(slip float64) float64 {
	return 1 + m.dilation(slip)/m.ZeroStress
}

// SlipDerivative returns ∂e/∂D, the change of aperture with slip at fixed
// stress and pressure (dimensionless): tan φ_dil / (1 + 9·σn′/σn,ref) when
// closed, tan φ_dil when open, and 0 once the slip has reached the
// dilation limit.
func (m ApertureModel) SlipDerivative(sigmaN, p, slip float64) float64 {
	if slip >= m.DilationSlipLimit || m.DilationAngle == 0 {
		return 0
	}
	t := math.Tan(m.DilationAngle)
	if eff := sigmaN - p; eff >= 0 {
		return t / (1 + 9*eff/m.ClosureStress)
	}
	return t
}

// dilation returns min(max(D, 0), Dmax)·tan φ_dil, m.
func (m ApertureModel) dilation(slip float64) float64 {
	d := math.Min(math.Max(slip, 0), m.DilationSlipLimit)
	if d == 0 {
		return 0 // most patches have not slipped: skip the tangent
	}
	return d * math.Tan(m.DilationAngle)
}

// PermeabilityGain returns (e/eInit)², the factor by which the fracture's
// cubic-law permeability e²/12 has grown from the initial aperture eInit.
func PermeabilityGain(e, eInit float64) float64 {
	r := e / eInit
	return r * r
}

// TransmissivityGain returns (e/eInit)³, the factor by which the
// fracture's cubic-law transmissivity e³/12 has grown from the initial
// aperture eInit.
func TransmissivityGain(e, eInit float64) float64 {
	r := e / eInit
	return r * r * r
}
