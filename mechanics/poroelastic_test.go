package mechanics

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"slipfront/internal/numtest"
)

// Check values of the uniaxial-strain stress path A = α(1 − 2ν)/(1 − ν)
// (Engelder & Fischer 1994; Zoback 2007, ch. 12; docs/references.md §13:
// 0.666667, 0.6 and 0.4, printed with six decimals; the exact values are
// 2/3, 0.6 and 0.4).
func TestStressPathCheckValues(t *testing.T) {
	const tol = 1e-9 // the brief's tolerance; the formula has a few roundings
	tests := []struct {
		biot, nu, want float64
	}{
		{1, 0.25, 2.0 / 3},
		{0.8, 0.2, 0.6},
		{0.7, 0.3, 0.4},
	}
	for _, tc := range tests {
		p := Poroelastic{Biot: tc.biot, Poisson: tc.nu}
		if err := p.Validate(); err != nil {
			t.Fatal(err)
		}
		numtest.Abs(t, "A", p.StressPath(), tc.want, tol)
		dp := -10 * mpa
		c := p.Uniaxial(dp)
		numtest.Abs(t, "ΔSxx/ΔP", c.XX/dp, tc.want, tol)
		numtest.Abs(t, "ΔSyy/ΔP", c.YY/dp, tc.want, tol)
		if c.XY != 0 || c.ZZ != 0 || c.Pore != dp {
			t.Errorf("uniaxial change %+v: want ΔSxy = ΔSv = 0 and Δp = %g", c, dp)
		}
	}
}

func TestPoroelasticValidate(t *testing.T) {
	tests := []struct {
		name  string
		p     Poroelastic
		param string
	}{
		{"Biot 0", Poroelastic{Biot: 0, Poisson: 0.25}, "biot_coefficient"},
		{"Biot above 1", Poroelastic{Biot: 1.1, Poisson: 0.25}, "biot_coefficient"},
		{"Biot NaN", Poroelastic{Biot: math.NaN(), Poisson: 0.25}, "biot_coefficient"},
		{"Poisson 0.5", Poroelastic{Biot: 1, Poisson: 0.5}, "poisson_ratio"},
		{"Poisson 0", Poroelastic{Biot: 1, Poisson: 0}, "poisson_ratio"},
	}
	for _, tc := range tests {
		var ie *InputError
		if err := tc.p.Validate(); !errors.As(err, &ie) || ie.Name != tc.param {
			t.Errorf("%s: error %v, want an *InputError naming %q", tc.name, err, tc.param)
		}
	}
}

// A zero change leaves the state unchanged, bit for bit; a pure
// pore-pressure change leaves the tensor unchanged, bit for bit.
func TestChangedRoundTrip(t *testing.T) {
	general, err := NewStress([3][3]float64{{80e6, 5e6, -3e6}, {5e6, 60e6, math.Copysign(0, -1)},
		{-3e6, math.Copysign(0, -1), 70e6}}, 20e6)
	if err != nil {
		t.Fatal(err)
	}
	for name, s := range map[string]Stress{"Andersonian": workedExample(t), "general tensor": general} {
		same, err := s.Changed(StressChange{})
		if err != nil {
			t.Fatal(err)
		}
		if same != s {
			t.Errorf("%s: zero change gave %+v, want %+v", name, same, s)
		}
		assertSameBits(t, name+", zero change", same, s)
		pore, err := s.Changed(StressChange{Pore: -5 * mpa})
		if err != nil {
			t.Fatal(err)
		}
		assertSameBits(t, name+", pore change", pore, s)
		if pore.PorePressure() != s.PorePressure()-5*mpa {
			t.Errorf("%s: pore pressure %g, want %g", name, pore.PorePressure(), s.PorePressure()-5*mpa)
		}
	}
}

// assertSameBits fails unless a and b have the same tensor, bit for bit.
func assertSameBits(t *testing.T, what string, a, b Stress) {
	t.Helper()
	ta, tb := a.Tensor(), b.Tensor()
	for i := range 3 {
		for j := range 3 {
			if math.Float64bits(ta[i][j]) != math.Float64bits(tb[i][j]) {
				t.Errorf("%s: tensor[%d][%d] = %v, want %v bit for bit", what, i, j, ta[i][j], tb[i][j])
			}
		}
	}
}

// A horizontal change of an Andersonian state is the Andersonian state of
// the changed horizontal principal stresses: the same tensor (to
// round-off), principal names, axes and regime, and Sv unchanged.
func TestChangedAndersonian(t *testing.T) {
	s := workedExample(t)
	h := s.Horizontal()
	numtest.Rel(t, "SHmax", h.SHmax, 90*mpa, roundOff)
	numtest.Rel(t, "Shmin", h.Shmin, 55*mpa, roundOff)
	numtest.Abs(t, "azimuth", h.Azimuth, 60*deg, roundOff)
	tests := []struct {
		name   string
		change StressChange
		regime string
	}{
		{"uniaxial depletion", Poroelastic{Biot: 1, Poisson: 0.25}.Uniaxial(-10 * mpa), "strike-slip"},
		{"SHmax falls below Sv", StressChange{XX: -30 * mpa, YY: -15 * mpa, XY: -10 * mpa, Pore: -10 * mpa}, "normal"},
		{"both above Sv", StressChange{XX: 30 * mpa, YY: 30 * mpa, XY: -2 * mpa}, "reverse"},
	}
	for _, tc := range tests {
		got, err := s.Changed(tc.change)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		nh := h.Changed(tc.change)
		want, err := NewAndersonian(Andersonian{SHmax: nh.SHmax, Shmin: nh.Shmin, Sv: 75 * mpa,
			SHmaxAzimuth: nh.Azimuth, PorePressure: 30*mpa + tc.change.Pore})
		if err != nil {
			t.Fatal(err)
		}
		if got.Regime() != tc.regime || want.Regime() != tc.regime {
			t.Errorf("%s: regime %q (rebuilt %q), want %q", tc.name, got.Regime(), want.Regime(), tc.regime)
		}
		gt, wt := got.Tensor(), want.Tensor()
		for i := range 3 {
			for j := range 3 {
				numtest.Abs(t, tc.name+": tensor", gt[i][j], wt[i][j], roundOff*100*mpa)
			}
		}
		gp, wp := got.Principal(), want.Principal()
		for k := range 3 {
			if gp[k].Name != wp[k].Name {
				t.Errorf("%s: principal %d is %s, want %s", tc.name, k, gp[k].Name, wp[k].Name)
			}
			numtest.Rel(t, tc.name+": principal value", gp[k].Value, wp[k].Value, roundOff)
		}
		if got.Tensor()[2][2] != 75*mpa {
			t.Errorf("%s: Sv changed to %g", tc.name, got.Tensor()[2][2])
		}
	}
}

func TestChangedErrors(t *testing.T) {
	s := workedExample(t)
	tests := []struct {
		name   string
		change StressChange
	}{
		{"NaN component", StressChange{XX: math.NaN()}},
		{"infinite pore change", StressChange{Pore: math.Inf(-1)}},
		{"pore pressure below zero", StressChange{Pore: -31 * mpa}},
		{"pore pressure above S3", StressChange{XX: -40 * mpa, YY: -40 * mpa}},
		{"tensile Shmin", StressChange{XX: -80 * mpa, YY: -80 * mpa, Pore: -30 * mpa}},
	}
	for _, tc := range tests {
		var ie *InputError
		if _, err := s.Changed(tc.change); !errors.As(err, &ie) {
			t.Errorf("%s: error %v, want an *InputError", tc.name, err)
		}
	}
}

// The principal form of the horizontal stress agrees with an
// eigen-decomposition of the 2 × 2 block (an independent route), and the
// SHmax rotation with the change of the eigenvector's azimuth.
func TestHorizontalAgainstEigen(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 200
	h := Horizontal{SHmax: 60 * mpa, Shmin: 45 * mpa, Azimuth: 75 * deg}
	changes := make([]StressChange, n)
	for i := range changes {
		changes[i] = StressChange{XX: 20 * mpa * rng.NormFloat64(), YY: 20 * mpa * rng.NormFloat64(),
			XY: 10 * mpa * rng.NormFloat64()}
	}
	dst := make([]Horizontal, n)
	rot := make([]float64, n)
	ChangedHorizontals(dst, rot, h, changes)
	xx, yy, xy := h.Components()
	for i, c := range changes {
		var eig mat.EigenSym
		if !eig.Factorize(mat.NewSymDense(2, []float64{xx + c.XX, xy + c.XY, xy + c.XY, yy + c.YY}), true) {
			t.Fatal("eigen-decomposition failed")
		}
		vals := eig.Values(nil) // ascending
		var vecs mat.Dense
		eig.VectorsTo(&vecs)
		az := math.Atan2(vecs.At(0, 1), vecs.At(1, 1)) // azimuth of the larger, east over north
		numtest.Rel(t, "SHmax", dst[i].SHmax, vals[1], roundOff)
		numtest.Abs(t, "Shmin", dst[i].Shmin, vals[0], roundOff*100*mpa)
		if d := math.Remainder(dst[i].Azimuth-az, math.Pi); math.Abs(d) > 1e-9 {
			t.Errorf("change %d: azimuth %g°, eigenvector %g°", i, dst[i].Azimuth/deg, az/deg)
		}
		if dst[i].Azimuth < 0 || dst[i].Azimuth >= math.Pi {
			t.Errorf("change %d: azimuth %g outside [0, π)", i, dst[i].Azimuth)
		}
		if d := math.Remainder(rot[i]-(az-h.Azimuth), math.Pi); math.Abs(d) > 1e-9 || math.Abs(rot[i]) > math.Pi/2 {
			t.Errorf("change %d: rotation %g°, eigenvector turned %g°", i, rot[i]/deg, (az-h.Azimuth)/deg)
		}
	}
}

// Named cases of the rotation: none for an isotropic or aligned change, a
// stress reversal (±90°) when the change swaps the horizontal stresses, and
// the sense (clockwise positive).
func TestSHmaxRotationCases(t *testing.T) {
	h := Horizontal{SHmax: 50 * mpa, Shmin: 48 * mpa, Azimuth: 90 * deg} // SHmax east
	tests := []struct {
		name   string
		change StressChange
		want   float64
	}{
		{"isotropic change", StressChange{XX: -7 * mpa, YY: -7 * mpa}, 0},
		{"aligned change", StressChange{XX: -1 * mpa}, 0},
		{"reversal", StressChange{XX: -5 * mpa}, 90 * deg},
		// Shear xy > 0 raises the normal stress along NE (azimuth 45°).
		// With d = (yy − xx)/2 = −1 MPa and xy = 1 MPa, 2θ = atan2(1, −1)
		// = 135°: SHmax turns from 90° to 67.5°, anticlockwise.
		{"shear turns SHmax towards NE", StressChange{XY: 1 * mpa}, -22.5 * deg},
	}
	for _, tc := range tests {
		after := h.Changed(tc.change)
		got := SHmaxRotation(h.Azimuth, after.Azimuth)
		if d := math.Remainder(got-tc.want, math.Pi); math.Abs(d) > 1e-12 {
			t.Errorf("%s: rotation %g°, want %g°", tc.name, got/deg, tc.want/deg)
		}
	}
}
