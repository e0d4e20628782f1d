package mechanics

import (
	"math"
	"testing"

	"slipfront/internal/numtest"
)

// docs/references.md §8.3 (Pollard & Segall 1987): a = 10 m, Δτ = 1 MPa,
// G = 30 GPa, ν = 0.25 gives δ_max = 5.0e−4 m and δ_avg = 3.926991e−4 m.
func TestPlaneStrainCrackSlip(t *testing.T) {
	k, err := NewPlaneStrainCrack(30e9, 0.25)
	if err != nil {
		t.Fatal(err)
	}
	const printed7 = 1e-6 // relative, 7 significant digits printed
	// The patch's half-size is half the smaller dimension: 20 m × 100 m
	// and 100 m × 20 m are both 2-D cracks of half-size 10 m.
	for _, p := range []Patch{{Length: 20, Height: 100}, {Length: 100, Height: 20}} {
		numtest.Abs(t, "half-size", p.HalfSize(), 10, 0)
		avg := 1e6 / k.ShearStiffness(p)
		numtest.Rel(t, "average slip", avg, 3.926991e-4, printed7)
		// δ_avg = (π/4)·δ_max, δ_max = 2(1−ν)Δτa/G = 5e−4 m.
		numtest.Rel(t, "maximum slip", avg*4/math.Pi, 5.0e-4, roundOff)
	}
	// The smaller dimension governs: a taller patch of the same length is
	// no softer once its height exceeds its length.
	if k.ShearStiffness(Patch{Length: 20, Height: 40}) != k.ShearStiffness(Patch{Length: 20, Height: 400}) {
		t.Error("plane-strain stiffness depends on the larger dimension")
	}
	if k.ShearStiffness(Patch{Length: 20, Height: 10}) <= k.ShearStiffness(Patch{Length: 20, Height: 20}) {
		t.Error("a shorter patch should be stiffer")
	}
}

// docs/references.md §8.1 (Eshelby 1957; Keilis-Borok 1959): a circular crack
// with G = 30 GPa; D̄ = 16Δσa/(7πG) and M0 = (16/7)Δσa³. The patch is a
// square of the circle's area, side a√π, so its equivalent radius is a.
func TestCircularCrack(t *testing.T) {
	const g = 30e9
	k, err := NewCircularCrack(g)
	if err != nil {
		t.Fatal(err)
	}
	const printed7 = 1e-6 // relative, 7 significant digits printed
	for _, tc := range []struct{ ds, a, m0, slip float64 }{
		{1e6, 1, 2.285714e6, 2.425218e-5},
		{1e6, 10, 2.285714e9, 2.425218e-4},
		{3e6, 100, 6.857143e12, 7.275655e-3},
		{10e6, 1000, 2.285714e16, 2.425218e-1},
	} {
		side := tc.a * math.Sqrt(math.Pi)
		p := Patch{Length: side, Height: side}
		numtest.Rel(t, "equivalent radius", p.EquivalentRadius(), tc.a, roundOff)
		d := tc.ds / k.ShearStiffness(p)
		numtest.Rel(t, "average slip", d, tc.slip, printed7)
		m0 := Moment(g, p.Area(), d)
		numtest.Rel(t, "M0", m0, tc.m0, printed7)
		numtest.Rel(t, "M0 = (16/7)Δσa³", m0, 16.0/7*tc.ds*tc.a*tc.a*tc.a, roundOff)
	}
}

// The average opening of a 2-D crack of half-length a = 10 m under a net
// pressure of 1 MPa is π(1−ν)Δp·a/(2G) = 3.926991e-4 m for G = 30 GPa,
// ν = 0.25 (Sneddon 1946; docs/references.md §8.3: δ_avg = (π/4)·δ_max).
func TestOpeningStiffness(t *testing.T) {
	k, err := NewPlaneStrainCrack(30e9, 0.25)
	if err != nil {
		t.Fatal(err)
	}
	avg := 1e6 / k.OpeningStiffness(Patch{Length: 20, Height: 100})
	numtest.Rel(t, "average opening", avg, 3.926991e-4, 1e-6)
}
