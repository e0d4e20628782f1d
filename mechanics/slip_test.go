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

func TestSlipModel(t *testing.T) {
	k, err := NewPlaneStrainCrack(30e9, 0.25)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewSlipModel(Coulomb{Friction: 0.6, Cohesion: 1e6}, 0.5, k)
	if err != nil {
		t.Fatal(err)
	}
	patch := Patch{Length: 20, Height: 40}
	const sn, tau = 64e6, 15e6
	// Below the criterion: τ = 15 < 1 + 0.6·(64 − 30) = 21.4 MPa.
	if r := m.Slip(sn, tau, 30e6, patch); r.Slips || r.Slip != 0 || r.StressDrop != 0 {
		t.Errorf("slipped below the criterion: %+v", r)
	}
	// At p = 45 MPa: 1 + 0.6·19 = 12.4 ≤ 15, slips; the residual is
	// 0.5·19 = 9.5 MPa, the drop 5.5 MPa, the slip 5.5 MPa/k.
	r := m.Slip(sn, tau, 45e6, patch)
	if !r.Slips {
		t.Fatal("did not slip above the criterion")
	}
	numtest.Rel(t, "residual shear", r.ResidualShear, 9.5e6, roundOff)
	numtest.Rel(t, "stress drop", r.StressDrop, 5.5e6, roundOff)
	// Pollard & Segall (1987), docs/references.md §8.3: 1 MPa on a = 10 m gives
	// 3.926991e−4 m; the slip is linear in the drop.
	numtest.Rel(t, "slip", r.Slip, 5.5*3.926991e-4, 1e-6)
	// Open fracture (p > σn): no friction is left, the whole τ drops.
	r = m.Slip(sn, tau, 70e6, patch)
	if !r.Slips || r.ResidualShear != 0 {
		t.Errorf("open fracture: %+v", r)
	}
	numtest.Rel(t, "open stress drop", r.StressDrop, tau, roundOff)
}

func TestSlipModelErrors(t *testing.T) {
	k := PlaneStrainCrack{ShearModulus: 30e9, PoissonRatio: 0.25}
	tests := []struct {
		name     string
		c        Coulomb
		residual float64
		k        Stiffness
	}{
		{"friction 0", Coulomb{Friction: 0}, 0.5, k},
		{"negative cohesion", Coulomb{Friction: 0.6, Cohesion: -1}, 0.5, k},
		{"residual 0", Coulomb{Friction: 0.6}, 0, k},
		{"residual above static", Coulomb{Friction: 0.6}, 0.7, k},
		{"no stiffness", Coulomb{Friction: 0.6}, 0.5, nil},
	}
	for _, tc := range tests {
		if _, err := NewSlipModel(tc.c, tc.residual, tc.k); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
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
