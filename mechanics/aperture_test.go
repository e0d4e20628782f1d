package mechanics

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"slipfront/internal/numtest"
)

// apertureModel returns a model with the given closure-law parameters and
// G = 30 GPa, ν = 0.25 (the docs/references.md §8.3 rock).
func apertureModel(e0, sref, phi, dmax float64) ApertureModel {
	return ApertureModel{ZeroStress: e0, ClosureStress: sref, DilationAngle: phi, DilationSlipLimit: dmax,
		ShearModulus: 30e9, PoissonRatio: 0.25}
}

// docs/references.md §6.2 check values for e = (e0 + D·tan φ)/(1 + 9σn′/σn,ref)
// (Willis-Richards, Watanabe & Takahashi 1996), tolerance 1e−12 relative
// there; the printed digits bound ours.
func TestApertureCheckValues(t *testing.T) {
	patch := Patch{Length: 20, Height: 40}
	tests := []struct {
		e0, d, phi, snEff, sref float64 // m, m, degrees, Pa, Pa
		want                    float64 // m
		tol                     float64 // relative: the printed digits
	}{
		{1e-4, 0, 2.5, 20e6, 40e6, 1.8181818e-5, 1e-7},
		{1e-4, 5e-3, 2.5, 20e6, 40e6, 5.787358446e-5, 1e-9},
		{1e-4, 5e-3, 2.5, 0, 40e6, 3.183047145e-4, 1e-9},
		{5e-4, 1e-3, 5, 30e6, 20e6, 4.05164596e-5, 1e-8},
	}
	for _, tc := range tests {
		m := apertureModel(tc.e0, tc.sref, tc.phi*deg, 10e-3) // Dmax above every D
		const p = 30e6
		numtest.Rel(t, "aperture", m.Aperture(p+tc.snEff, p, tc.d, patch), tc.want, tc.tol)
	}
	// The 5 mm-slip row against the no-slip row raises the cubic-law
	// transmissivity ×32.25 (docs/references.md §6.2).
	numtest.Rel(t, "transmissivity gain", TransmissivityGain(5.787358446e-5, 1.8181818e-5), 32.25, 1e-4)
	numtest.Rel(t, "permeability gain", PermeabilityGain(2, 1), 4, 0)
}

// At σn′ = 0 and D = 0 the aperture is e0; it falls with σn′, rises with
// D up to Dmax and stays there.
func TestApertureMonotone(t *testing.T) {
	m := apertureModel(5e-4, 20e6, 2.5*deg, 5e-3)
	patch := Patch{Length: 20, Height: 40}
	const sn = 60e6
	numtest.Rel(t, "e(σn′=0, D=0)", m.Aperture(sn, sn, 0, patch), 5e-4, roundOff)
	prev := math.Inf(1)
	for eff := 0.0; eff <= 60e6; eff += 2e6 {
		e := m.Aperture(sn, sn-eff, 1e-3, patch)
		if e >= prev {
			t.Errorf("aperture not decreasing in σn′ at %g Pa: %g ≥ %g", eff, e, prev)
		}
		prev = e
	}
	prev = 0
	for d := 0.0; d <= 5e-3; d += 0.5e-3 {
		e := m.Aperture(sn, 30e6, d, patch)
		if e <= prev {
			t.Errorf("aperture not increasing in D at %g m", d)
		}
		prev = e
	}
	capped := m.Aperture(sn, 30e6, 5e-3, patch)
	for _, d := range []float64{5.1e-3, 1e-2, 1} {
		numtest.Rel(t, "capped dilation", m.Aperture(sn, 30e6, d, patch), capped, 0)
	}
	// Negative slip counts as none.
	numtest.Rel(t, "negative slip", m.Aperture(sn, 30e6, -1e-3, patch), m.Aperture(sn, 30e6, 0, patch), 0)
}

// Above the normal stress the fracture opens by the average opening of a
// pressurised 2-D crack, π(1−ν)Δp·a/(2G) (Sneddon 1946; docs/references.md
// §8.3: a = 10 m, Δp = 1 MPa, G = 30 GPa, ν = 0.25 give 3.926991e−4 m).
func TestApertureOpening(t *testing.T) {
	m := apertureModel(5e-4, 20e6, 2.5*deg, 5e-3)
	patch := Patch{Length: 20, Height: 40} // a = 10 m
	const sn, d = 60e6, 2e-3
	closedAtZero := m.Aperture(sn, sn, d, patch)
	numtest.Rel(t, "e at σn′ = 0", closedAtZero, 5e-4+d*math.Tan(2.5*deg), roundOff)
	open := m.Aperture(sn, sn+1e6, d, patch)
	numtest.Rel(t, "opening", open-closedAtZero, 3.926991e-4, 1e-6)
	// Continuous at the switch: δ either side, the apertures differ by no
	// more than the two one-sided slopes allow (a jump would exceed it).
	const delta = 1e-3 // Pa
	_, below := m.Evaluate(sn, sn-delta, d, patch)
	_, above := m.Evaluate(sn, sn+delta, d, patch)
	numtest.Abs(t, "jump at p = σn", m.Aperture(sn, sn+delta, d, patch)-m.Aperture(sn, sn-delta, d, patch),
		0, 2*delta*(below+above))
}

// de/dp against a central finite difference (gonum diff/fd) on both
// branches, and the one-sided slopes at the switch against the closed
// forms.
func TestApertureDerivative(t *testing.T) {
	m := apertureModel(5e-4, 20e6, 2.5*deg, 5e-3)
	patch := Patch{Length: 30, Height: 40}
	const sn, d = 60e6, 2e-3
	e := func(p float64) float64 { return m.Aperture(sn, p, d, patch) }
	// Step 1 kPa: truncation ~(9h/σn,ref)² ≈ 2e−7 relative, round-off
	// ~1e−16·e/h ≈ 1e−23 m/Pa against slopes ≳ 1e−12 m/Pa.
	const h, fdTol = 1e3, 1e-6
	for _, p := range []float64{0, 10e6, 30e6, 50e6, 59.9e6, 60.1e6, 70e6} {
		_, want := m.Evaluate(sn, p, d, patch)
		got := fd.Derivative(e, p, &fd.Settings{Formula: fd.Central, Step: h})
		numtest.Rel(t, "de/dp", want, got, fdTol)
	}
	// One-sided slopes at p = σn: the closure law's 9(e0 + D tan φ)/σn,ref
	// below, the crack's π(1−ν)a/(2G) above; Evaluate returns the former.
	below := fd.Derivative(e, sn, &fd.Settings{Formula: fd.Backward, Step: h})
	above := fd.Derivative(e, sn, &fd.Settings{Formula: fd.Forward, Step: h})
	free := 5e-4 + d*math.Tan(2.5*deg)
	const oneSidedTol = 1e-3 // first-order formulas: error ~ 9h/σn,ref ≈ 5e−4
	numtest.Rel(t, "slope below", below, 9*free/20e6, oneSidedTol)
	numtest.Rel(t, "slope above", above, math.Pi*0.75*15/(2*30e9), oneSidedTol)
	_, at := m.Evaluate(sn, sn, d, patch)
	numtest.Rel(t, "slope at the switch", at, 9*free/20e6, roundOff)
}

func TestApertureValidate(t *testing.T) {
	good := apertureModel(5e-4, 20e6, 2.5*deg, 5e-3)
	if err := good.Validate(); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		edit func(*ApertureModel)
	}{
		{"e0 = 0", func(m *ApertureModel) { m.ZeroStress = 0 }},
		{"e0 < 0", func(m *ApertureModel) { m.ZeroStress = -1e-4 }},
		{"σn,ref = 0", func(m *ApertureModel) { m.ClosureStress = 0 }},
		{"φ < 0", func(m *ApertureModel) { m.DilationAngle = -0.1 }},
		{"φ = 90°", func(m *ApertureModel) { m.DilationAngle = math.Pi / 2 }},
		{"Dmax < 0", func(m *ApertureModel) { m.DilationSlipLimit = -1 }},
		{"G = 0", func(m *ApertureModel) { m.ShearModulus = 0 }},
		{"ν = 0", func(m *ApertureModel) { m.PoissonRatio = 0 }},
		{"ν = 0.5", func(m *ApertureModel) { m.PoissonRatio = 0.5 }},
		{"ν NaN", func(m *ApertureModel) { m.PoissonRatio = math.NaN() }},
	}
	for _, tc := range tests {
		m := good
		tc.edit(&m)
		if err := m.Validate(); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

// ∂e/∂D against a central finite difference (gonum/diff/fd), closed and
// open, and zero past the dilation limit (Willis-Richards et al. 1996 form).
func TestSlipDerivative(t *testing.T) {
	m := ApertureModel{ZeroStress: 1e-4, ClosureStress: 40e6, DilationAngle: 2.5 * math.Pi / 180,
		DilationSlipLimit: 5e-3, ShearModulus: 30e9, PoissonRatio: 0.25}
	patch := Patch{Length: 20, Height: 10}
	for _, c := range []struct{ sigmaN, p, slip float64 }{{50e6, 30e6, 1e-3}, {50e6, 52e6, 2e-3}, {50e6, 30e6, 0}} {
		want := fd.Derivative(func(d float64) float64 { return m.Aperture(c.sigmaN, c.p, d, patch) }, c.slip+1e-5,
			&fd.Settings{Formula: fd.Central, Step: 1e-6})
		numtest.Rel(t, "∂e/∂D", m.SlipDerivative(c.sigmaN, c.p, c.slip+1e-5), want, 1e-6)
	}
	if m.SlipDerivative(50e6, 30e6, 6e-3) != 0 {
		t.Error("dilation past its limit")
	}
}

// The dilation factor is the ratio of the closed aperture with and without
// slip at any one effective normal stress (the closure law of
// Willis-Richards, Watanabe & Takahashi 1996 divides both alike), and it
// stops growing at the dilation limit: back at the initial pressure a
// slipped fracture keeps e_init·factor.
func TestDilationFactor(t *testing.T) {
	m := apertureModel(1e-4, 40e6, 5*math.Pi/180, 5e-3)
	patch := Patch{Length: 20, Height: 10}
	for _, c := range []struct{ sigmaN, p, slip float64 }{
		{50e6, 20e6, 1e-3}, {50e6, 49e6, 1e-3}, {80e6, 20e6, 4e-3}, {50e6, 20e6, 0}, {50e6, 20e6, 9e-3},
	} {
		want := m.Aperture(c.sigmaN, c.p, c.slip, patch) / m.Aperture(c.sigmaN, c.p, 0, patch)
		numtest.Rel(t, "dilation factor", m.DilationFactor(c.slip), want, 1e-14)
	}
	// By hand: 1 + min(D, Dmax)·tan 5°/e0 with D past the limit.
	numtest.Rel(t, "capped factor", m.DilationFactor(9e-3), 1+5e-3*math.Tan(5*math.Pi/180)/1e-4, 1e-14)
}
