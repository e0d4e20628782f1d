package mechanics

import (
	"math"
)

// Patch is a rectangular patch of a fracture that slips or opens as one
// piece: a fracture element along a trace with its conducting height.
type Patch struct {
	Length float64 // extent along the trace (strike), m
	Height float64 // extent down dip, m
}

// Validate returns an error unless both dimensions are finite and > 0.
func (p Patch) Validate() error {
	return firstError(positive("patch length", p.Length), positive("patch height", p.Height))
}

// Area returns the patch area L·H, m².
func (p Patch) Area() float64 { return p.Length * p.Height }

// HalfSize returns the half-size a of the 2-D crack that stands for the
// patch, m: half of the smaller of length and height, a = min(L, H)/2.
// The stiffness of a long rectangular crack is governed by its short
// dimension, the one across which the slip or opening profile develops;
// the 2-D (plane-strain) solution is that of an infinitely long crack of
// width 2a (Pollard & Segall 1987). A square patch is thus treated as a
// 2-D crack of half-width L/2, which overestimates the slip of a real
// square crack (a modelling choice, no source).
func (p Patch) HalfSize() float64 { return 0.5 * math.Min(p.Length, p.Height) }

// EquivalentRadius returns the radius of the circle with the patch's area,
// √(L·H/π), m.
func (p Patch) EquivalentRadius() float64 { return math.Sqrt(p.Length * p.Height / math.Pi) }

// Stiffness gives the elastic stiffness of a slipping patch, the ratio of
// a uniform shear stress drop to the average slip it causes. It isolates
// the crack formula from the slip model, so that an elastic interaction
// between patches (a boundary-element solution, docs/references.md §9–§10) can
// take its place.
type Stiffness interface {
	// ShearStiffness returns k, Pa/m: a uniform shear stress drop Δτ on
	// the patch gives the average slip D̄ = Δτ/k.
	ShearStiffness(p Patch) float64
}

// PlaneStrainCrack is the stiffness of a 2-D crack in plane strain of
// half-size a = p.HalfSize(). A uniform shear stress drop Δτ gives the
// slip profile δ(x) = 2(1−ν)Δτ/G·√(a² − x²) (mode II), whose average is
// D̄ = π(1−ν)·Δτ·a/(2G), so k = 2G/(π(1−ν)a) (Pollard & Segall 1987;
// docs/references.md §8.3). The mode II form is used for every slip direction;
// slip parallel to the crack's long side (mode III) would be larger by
// 1/(1−ν).
type PlaneStrainCrack struct {
	ShearModulus float64 // G, Pa
	PoissonRatio float64 // ν
}

// NewPlaneStrainCrack returns the plane-strain crack stiffness for shear
// modulus g, Pa, and Poisson's ratio nu; an error unless g > 0 and
// 0 < ν < 0.5.
func NewPlaneStrainCrack(g, nu float64) (PlaneStrainCrack, error) {
	if err := firstError(positive("shear_modulus", g), poisson("poisson_ratio", nu)); err != nil {
		return PlaneStrainCrack{}, err
	}
	return PlaneStrainCrack{ShearModulus: g, PoissonRatio: nu}, nil
}

// ShearStiffness returns 2G/(π(1−ν)a), Pa/m, with a = p.HalfSize().
func (c PlaneStrainCrack) ShearStiffness(p Patch) float64 {
	return crackStiffness(c.ShearModulus, c.PoissonRatio, p.HalfSize())
}

// OpeningStiffness returns 2G/(π(1−ν)a), Pa/m, with a = p.HalfSize(): the
// net pressure per metre of average opening of the patch as a 2-D crack
// (Sneddon 1946; docs/references.md §8.3), equal to its shear stiffness.
func (c PlaneStrainCrack) OpeningStiffness(p Patch) float64 {
	return crackStiffness(c.ShearModulus, c.PoissonRatio, p.HalfSize())
}

// crackStiffness returns 2G/(π(1−ν)a): the ratio of a uniform load to the
// average displacement discontinuity of a 2-D crack of half-size a, the
// same in shear (mode II) and opening (mode I, Sneddon 1946).
func crackStiffness(g, nu, a float64) float64 {
	return 2 * g / (math.Pi * (1 - nu) * a)
}

// CircularCrack is the stiffness of a circular (penny-shaped) shear crack
// of radius a = p.EquivalentRadius(), the radius of the circle with the
// patch's area, so that the moment G·A·D̄ is that of the crack. A uniform
// stress drop Δσ gives the average slip D̄ = 16·Δσ·a/(7πG), so
// k = 7πG/(16a), and M0 = G·πa²·D̄ = (16/7)·Δσ·a³ (Eshelby 1957;
// Keilis-Borok 1959; docs/references.md §8.1). The constant 16/(7π) belongs to
// a Poisson's ratio of 1/4 (Lamé λ = G), the form in which the result is
// commonly quoted (from memory); the model takes no ν.
type CircularCrack struct {
	ShearModulus float64 // G, Pa
}

// NewCircularCrack returns the circular crack stiffness for shear modulus
// g, Pa; an error unless g > 0.
func NewCircularCrack(g float64) (CircularCrack, error) {
	if err := positive("shear_modulus", g); err != nil {
		return CircularCrack{}, err
	}
	return CircularCrack{ShearModulus: g}, nil
}

// ShearStiffness returns 7πG/(16a), Pa/m, with a = p.EquivalentRadius().
func (c CircularCrack) ShearStiffness(p Patch) float64 {
	return 7 * math.Pi * c.ShearModulus / (16 * p.EquivalentRadius())
}
