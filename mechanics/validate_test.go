package mechanics

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/scenarios"
)

// Every constructor returns an *InputError naming the parameter for bad
// input (naming the parameter, its value and the allowed range), and never panics.
func TestBadInput(t *testing.T) {
	good := Gradients{Sv: 25e3, SHmax: 27e3, Shmin: 19e3, PorePressure: 11e3, SHmaxAzimuth: 75 * deg}
	withG := func(edit func(*Gradients)) func() error {
		return func() error {
			g := good
			edit(&g)
			_, err := StressAtDepth(g, 2600)
			return err
		}
	}
	andersonian := func(a Andersonian) func() error {
		return func() error { _, err := NewAndersonian(a); return err }
	}
	tests := []struct {
		name  string
		call  func() error
		param string
	}{
		{"negative Sv gradient", withG(func(g *Gradients) { g.Sv = -25e3 }), "sv_gradient"},
		{"zero SHmax gradient", withG(func(g *Gradients) { g.SHmax = 0 }), "shmax_gradient"},
		{"negative Shmin gradient", withG(func(g *Gradients) { g.Shmin = -1 }), "shmin_gradient"},
		{"negative pore-pressure gradient", withG(func(g *Gradients) { g.PorePressure = -1 }), "pore_pressure_gradient"},
		{"NaN azimuth", withG(func(g *Gradients) { g.SHmaxAzimuth = math.NaN() }), "shmax_azimuth"},
		{"SHmax < Shmin", withG(func(g *Gradients) { g.SHmax = 18e3 }), "shmax_gradient"},
		{"pore pressure above Shmin", withG(func(g *Gradients) { g.PorePressure = 20e3 }), "pore_pressure_gradient"},
		{"zero depth", func() error { _, err := StressAtDepth(good, 0); return err }, "depth"},
		{"infinite depth", func() error { _, err := StressAtDepth(good, math.Inf(1)); return err }, "depth"},
		{"SHmax < Shmin magnitudes", andersonian(Andersonian{SHmax: 50e6, Shmin: 55e6, Sv: 75e6}), "shmax"},
		{"negative Sv", andersonian(Andersonian{SHmax: 90e6, Shmin: 55e6, Sv: -75e6}), "sv"},
		{"pore pressure ≥ S3", andersonian(Andersonian{SHmax: 90e6, Shmin: 55e6, Sv: 75e6, PorePressure: 55e6}), "pore_pressure"},
		{"negative pore pressure", andersonian(Andersonian{SHmax: 90e6, Shmin: 55e6, Sv: 75e6, PorePressure: -1}), "pore_pressure"},
		{"asymmetric tensor", func() error {
			_, err := NewStress([3][3]float64{{80e6, 10e6, 0}, {0, 60e6, 0}, {0, 0, 70e6}}, 0)
			return err
		}, "stress[0][1]"},
		{"NaN tensor", func() error {
			_, err := NewStress([3][3]float64{{80e6, 0, 0}, {0, math.NaN(), 0}, {0, 0, 70e6}}, 0)
			return err
		}, "stress[1][1]"},
		{"friction 0", func() error { return Coulomb{Friction: 0}.Validate() }, "friction_static"},
		{"negative friction", func() error { return Coulomb{Friction: -0.6}.Validate() }, "friction_static"},
		{"frictional limit with friction 0", func() error {
			_, err := workedExample(t).CheckFrictionalLimit(0)
			return err
		}, "friction_static"},
		{"negative cohesion", func() error { return Coulomb{Friction: 0.6, Cohesion: -1}.Validate() }, "cohesion"},
		{"zero shear modulus", func() error { _, err := NewPlaneStrainCrack(0, 0.25); return err }, "shear_modulus"},
		{"Poisson's ratio 0", func() error { _, err := NewPlaneStrainCrack(30e9, 0); return err }, "poisson_ratio"},
		{"Poisson's ratio 0.5", func() error { _, err := NewPlaneStrainCrack(30e9, 0.5); return err }, "poisson_ratio"},
		{"negative Poisson's ratio", func() error { _, err := NewPlaneStrainCrack(30e9, -0.1); return err }, "poisson_ratio"},
		{"negative shear modulus, circular", func() error { _, err := NewCircularCrack(-1); return err }, "shear_modulus"},
		{"zero patch height", func() error { return Patch{Length: 10, Height: 0}.Validate() }, "patch height"},
		{"residual friction above static", func() error {
			return SlipWeakening{Static: 0.6, Residual: 0.8, CriticalSlip: 1e-3}.Validate()
		}, "friction_residual"},
	}
	for _, tc := range tests {
		err := tc.call()
		var ie *InputError
		if !errors.As(err, &ie) {
			t.Errorf("%s: error %v, want an *InputError", tc.name, err)
			continue
		}
		if ie.Name != tc.param {
			t.Errorf("%s: error names %q, want %q (%v)", tc.name, ie.Name, tc.param, err)
		}
	}
}

// The scenario constructors carry the SI values across (scenario.go
// defaults: G 15 GPa, ν 0.25, μs 0.6, μd 0.5, e0 0.5 mm, σn,ref 20 MPa,
// φ 2.5°, Dmax 5 mm) and pass bad values on as errors.
func TestFromScenario(t *testing.T) {
	st := scenarios.Stress{SvGradient: 25e3, SHmaxGradient: 27e3, ShminGradient: 19e3,
		PorePressureGradient: 11e3, SHmaxAzimuth: 75 * deg}
	s, err := StressFromScenario(st, 2600)
	if err != nil {
		t.Fatal(err)
	}
	if p := s.Principal(); p[0].Name != "SHmax" || p[0].Value != 27e3*2600 || s.PorePressure() != 11e3*2600 {
		t.Errorf("principal %+v, pore pressure %g", p, s.PorePressure())
	}
	rock := scenarios.Rock{ShearModulus: 15e9, PoissonRatio: 0.25, FrictionStatic: 0.6, FrictionResidual: 0.5,
		ZeroStressAperture: 0.5e-3, ClosureStress: 20e6, DilationAngle: 2.5 * deg, DilationSlipLimit: 5e-3,
		SlipWeakeningDistance: 1e-3}
	f, err := FrictionFromScenario(rock)
	if err != nil {
		t.Fatal(err)
	}
	if f.Static != 0.6 || f.Residual != 0.5 || f.CriticalSlip != 1e-3 {
		t.Errorf("friction %+v", f)
	}
	a, err := ApertureFromScenario(rock)
	if err != nil {
		t.Fatal(err)
	}
	if a.ZeroStress != 0.5e-3 || a.ClosureStress != 20e6 || a.ShearModulus != 15e9 {
		t.Errorf("aperture model %+v", a)
	}
	bad := rock
	bad.PoissonRatio = 0.6
	if _, err := ApertureFromScenario(bad); err == nil {
		t.Error("Poisson's ratio 0.6 accepted by the aperture model")
	}
	bad = rock
	bad.FrictionStatic = 0
	if _, err := CoulombFromScenario(bad); err == nil {
		t.Error("friction 0 accepted")
	}
	st.SHmaxGradient = 18e3
	if _, err := StressFromScenario(st, 2600); err == nil {
		t.Error("SHmax gradient below Shmin accepted")
	}
	layer, err := LayerFromScenario(rock, scenarios.Layer{Depth: 2600, Thickness: 30}, 0.8)
	if err != nil {
		t.Fatal(err)
	}
	if layer != (Layer{Poroelastic: Poroelastic{Biot: 0.8, Poisson: 0.25}, Thickness: 30}) {
		t.Errorf("layer %+v", layer)
	}
	if _, err := LayerFromScenario(rock, scenarios.Layer{Depth: 2600, Thickness: 30}, 0); err == nil {
		t.Error("Biot's coefficient 0 accepted")
	}
	g := DepletionGridFromScenario(scenarios.Grid{XMin: -800, YMin: -500, CellSize: 10, Cols: 160, Rows: 100})
	if g != (DepletionGrid{Cols: 160, Rows: 100, DX: 10, DY: 10}) {
		t.Errorf("depletion grid %+v", g)
	}
	if g.Cells() != (scenarios.Grid{CellSize: 10, Cols: 160, Rows: 100}).Cells() {
		t.Errorf("depletion grid has %d cells, the map grid %d", g.Cells(), 160*100)
	}
}

// The optimal receiver is the vertical plane on which the horizontal
// in-situ stresses come closest to Coulomb failure, τ − μ′σn largest in
// the right-lateral sense (45° − φ/2 from SHmax, docs/references.md §7.3):
// no other strike, scanned every 0.01°, does better. A given strike and
// sense are taken as they are.
func TestReceiverFromScenario(t *testing.T) {
	const mu, shmax, shmin = 0.4, 90e6, 55e6
	az := 60 * math.Pi / 180
	// Horizontal stress tensor, compression-positive, east–north frame.
	c, s := math.Sin(az), math.Cos(az) // SHmax direction (east, north)
	st := elastic.Stress{XX: shmax*c*c + shmin*s*s, YY: shmax*s*s + shmin*c*c, XY: (shmax - shmin) * c * s}
	coulomb := func(t r2.Vec) float64 { return st.Coulomb(t, mu, elastic.RightLateral) }
	tangent, sense := ReceiverFromScenario(scenarios.Coulomb{Receiver: "optimal", EffectiveFriction: mu}, az)
	if sense != elastic.RightLateral {
		t.Fatalf("optimal receiver slips %v, want right-lateral", sense)
	}
	best := coulomb(tangent)
	for k := range 18000 {
		a := float64(k) * 0.01 * math.Pi / 180
		if v := coulomb(r2.Vec{X: math.Sin(a), Y: math.Cos(a)}); v > best+1e-6 {
			t.Fatalf("strike %.2f°: τ − μ′σn = %.6g Pa beats the optimal receiver's %.6g Pa", float64(k)*0.01, v, best)
		}
	}
	tangent, sense = ReceiverFromScenario(scenarios.Coulomb{Receiver: "strike", ReceiverStrike: 330 * math.Pi / 180,
		ReceiverSense: "left-lateral", EffectiveFriction: mu}, az)
	if sense != elastic.LeftLateral || math.Abs(tangent.X+0.5) > 1e-12 || math.Abs(tangent.Y-math.Sqrt(3)/2) > 1e-12 {
		t.Errorf("strike N30W left-lateral: tangent %v, sense %v", tangent, sense)
	}
}
