package mechanics

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
)

const (
	deg = math.Pi / 180
	mpa = 1e6
)

// Tolerances for check values printed in docs/references.md: one unit in the
// last printed digit (the printed values are rounded, our results are
// exact to round-off).
const (
	digits6MPa = 1e-6 * mpa // values printed with 6 decimals in MPa, Pa
	digits8MPa = 1e-8 * mpa // values printed with 8 decimals in MPa, Pa
	digits6Deg = 1e-6 * deg // angles printed with 6 decimals in degrees, rad
	digits3Deg = 1e-3 * deg // angles printed with 3 decimals in degrees, rad
)

// roundOff is the relative tolerance of closed forms evaluated in float64
// with a handful of operations.
const roundOff = 1e-12

// workedExample is the stress state of docs/references.md §7.4: Sv = 75 MPa,
// SHmax = 90 MPa at N060°E, Shmin = 55 MPa, p0 = 30 MPa (strike-slip).
func workedExample(t testing.TB) Stress {
	t.Helper()
	s, err := NewAndersonian(Andersonian{SHmax: 90 * mpa, Shmin: 55 * mpa, Sv: 75 * mpa,
		SHmaxAzimuth: 60 * deg, PorePressure: 30 * mpa})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// docs/references.md §7.4 step 1 (tensor from §7.1), printed with 10 decimals
// in MPa.
func TestAndersonianTensor(t *testing.T) {
	const tol = 1e-10 * mpa // one unit in the 10th printed decimal
	want := [3][3]float64{{81.25, 15.1554445662, 0}, {15.1554445662, 63.75, 0}, {0, 0, 75}}
	got := workedExample(t).Tensor()
	for i := range 3 {
		for j := range 3 {
			numtest.Abs(t, "S", got[i][j], want[i][j]*mpa, tol)
		}
	}
}

// The gradients times the depth give the magnitudes (docs/references.md §7.1);
// 3000 m with 25, 30, 55/3 and 10 kPa/m gives the docs/references.md §7.4 state.
func TestStressAtDepth(t *testing.T) {
	g := Gradients{Sv: 25e3, SHmax: 30e3, Shmin: 55e3 / 3, PorePressure: 10e3, SHmaxAzimuth: 60 * deg}
	s, err := StressAtDepth(g, 3000)
	if err != nil {
		t.Fatal(err)
	}
	ref := workedExample(t)
	for i, p := range s.Principal() {
		q := ref.Principal()[i]
		if p.Name != q.Name {
			t.Errorf("S%d is %s, want %s", i+1, p.Name, q.Name)
		}
		numtest.Rel(t, "principal value", p.Value, q.Value, roundOff)
	}
	numtest.Rel(t, "pore pressure", s.PorePressure(), 30*mpa, roundOff)
	if s.Regime() != "strike-slip" {
		t.Errorf("regime %q, want strike-slip", s.Regime())
	}
}

// Anderson's regimes: which principal stress is vertical (Zoback 2007,
// ch. 1, from memory).
func TestRegime(t *testing.T) {
	tests := []struct {
		shmax, shmin, sv float64 // MPa
		regime           string
		order            [3]string
	}{
		{60, 45, 75, "normal", [3]string{"Sv", "SHmax", "Shmin"}},
		{90, 55, 75, "strike-slip", [3]string{"SHmax", "Sv", "Shmin"}},
		{100, 80, 60, "reverse", [3]string{"SHmax", "Shmin", "Sv"}},
	}
	for _, tc := range tests {
		s, err := NewAndersonian(Andersonian{SHmax: tc.shmax * mpa, Shmin: tc.shmin * mpa, Sv: tc.sv * mpa, PorePressure: 30 * mpa})
		if err != nil {
			t.Fatal(err)
		}
		if s.Regime() != tc.regime {
			t.Errorf("%v: regime %q, want %q", tc, s.Regime(), tc.regime)
		}
		for i, p := range s.Principal() {
			if p.Name != tc.order[i] {
				t.Errorf("%v: S%d = %s, want %s", tc, i+1, p.Name, tc.order[i])
			}
		}
	}
}

// A general tensor's principal stresses are recovered by the
// eigen-decomposition: the tensor is built as R·diag(S1,S2,S3)·Rᵀ.
func TestNewStressPrincipal(t *testing.T) {
	rot := r3.NewRotation(0.7, r3.Vec{X: 1, Y: -2, Z: 0.5})
	vals := [3]float64{100 * mpa, 70 * mpa, 40 * mpa}
	var p [3]Principal
	for i, e := range []r3.Vec{{X: 1}, {Y: 1}, {Z: 1}} {
		p[i] = Principal{Value: vals[i], Axis: rot.Rotate(e)}
	}
	s, err := NewStress(tensorFrom(p), 20*mpa)
	if err != nil {
		t.Fatal(err)
	}
	const axisTol = 1e-12 // eigenvectors of well-separated eigenvalues, round-off
	for i, q := range s.Principal() {
		numtest.Rel(t, "principal value", q.Value, vals[i], roundOff)
		numtest.Abs(t, "|axis·expected|", math.Abs(r3.Dot(q.Axis, p[i].Axis)), 1, axisTol)
		if q.Name != []string{"S1", "S2", "S3"}[i] {
			t.Errorf("name %q", q.Name)
		}
	}
	if s.Regime() != "" {
		t.Errorf("general tensor has regime %q", s.Regime())
	}
}

// docs/references.md §7.3 (Jaeger, Cook & Zimmerman 2007; Zoback 2007): the
// frictional limit [√(μ²+1)+μ]² and the optimal plane angle ½·atan(1/μ).
func TestFrictionalLimitRatio(t *testing.T) {
	const tol = 1e-9 // values printed with 9 decimals
	for _, tc := range []struct{ mu, want float64 }{
		{0.6, 3.119428455},
		{0.85, 4.676148807},
		{1.0, 5.828427125},
	} {
		numtest.Abs(t, "limit", FrictionalLimitRatio(tc.mu), tc.want, tol)
	}
	numtest.Abs(t, "plane–S1 angle, μ = 0.6", OptimalAngle(0.6), 29.518122*deg, digits6Deg)
	numtest.Abs(t, "normal–S1 angle, μ = 0.6", math.Pi/2-OptimalAngle(0.6), 60.481878*deg, digits6Deg)
}

// atLimit returns a strike-slip state whose (S1−p)/(S3−p) equals the
// frictional limit for mu: Shmin = 55, p = 30, Sv = 75 MPa, SHmax from the
// limit, SHmax at N060°E.
func atLimit(t testing.TB, mu float64) Stress {
	t.Helper()
	const p, sh = 30 * mpa, 55 * mpa
	s, err := NewAndersonian(Andersonian{SHmax: p + FrictionalLimitRatio(mu)*(sh-p), Shmin: sh, Sv: 75 * mpa,
		SHmaxAzimuth: 60 * deg, PorePressure: p})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestCheckFrictionalLimit(t *testing.T) {
	const mu = 0.6
	c, err := atLimit(t, mu).CheckFrictionalLimit(mu)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "ratio at the limit", c.Ratio, c.Limit, roundOff)
	if c.Exceeded || c.Warning != "" {
		t.Errorf("a state exactly at the limit is flagged: %+v", c)
	}
	// The docs/references.md §7.4 state: (90−30)/(55−30) = 2.4 < 3.119.
	c, err = workedExample(t).CheckFrictionalLimit(mu)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "ratio", c.Ratio, 2.4, roundOff)
	if c.Exceeded {
		t.Errorf("ratio 2.4 flagged at μ = 0.6")
	}
	// SHmax = 120 MPa: (120−30)/25 = 3.6 > 3.119.
	s, err := NewAndersonian(Andersonian{SHmax: 120 * mpa, Shmin: 55 * mpa, Sv: 75 * mpa, PorePressure: 30 * mpa})
	if err != nil {
		t.Fatal(err)
	}
	c, err = s.CheckFrictionalLimit(mu)
	if err != nil {
		t.Fatal(err)
	}
	if !c.Exceeded || !strings.Contains(c.Warning, "frictional limit") {
		t.Errorf("ratio 3.6 not flagged: %+v", c)
	}
	if _, err := s.CheckFrictionalLimit(0); err == nil {
		t.Error("friction 0 accepted")
	}
}

// A plane at the optimal angle in a state exactly at the frictional limit
// is critical at the initial pore pressure, Δp_c = 0, and every other plane
// needs a positive increase (Jaeger, Cook & Zimmerman 2007; Zoback 2007;
// docs/references.md §7.3).
func TestOptimalPlaneAtLimitIsCritical(t *testing.T) {
	for _, mu := range []float64{0.4, 0.6, 0.85, 1.0} {
		s := atLimit(t, mu)
		c := Coulomb{Friction: mu}
		// SHmax at azimuth 60°: the vertical plane's normal is at
		// 90° − OptimalAngle from SHmax, on either side.
		beta := math.Pi/2 - OptimalAngle(mu)
		const dpTol = 1e-6 * mpa // 1e-12 relative to stresses of ~1e8 Pa
		for _, az := range []float64{60*deg + beta, 60*deg - beta} {
			r := s.Resolve(r3.Vec{X: math.Sin(az), Y: math.Cos(az)})
			numtest.Abs(t, "Δp_c of the optimal plane", c.CriticalIncrease(r.SigmaN, r.Tau, s.PorePressure()), 0, dpTol)
		}
		for _, off := range []float64{-5, -1, 1, 5} {
			az := 60*deg + beta + off*deg
			r := s.Resolve(r3.Vec{X: math.Sin(az), Y: math.Cos(az)})
			if dp := c.CriticalIncrease(r.SigmaN, r.Tau, s.PorePressure()); dp <= dpTol {
				t.Errorf("μ = %g: plane %g° off optimal has Δp_c = %g Pa, want > 0", mu, off, dp)
			}
		}
		// Planes out of the S1–S3 plane are further from failure.
		n := r3.Vec{X: math.Sin(60*deg + beta), Y: math.Cos(60*deg + beta), Z: 0.3}
		r := s.Resolve(n)
		if dp := c.CriticalIncrease(r.SigmaN, r.Tau, s.PorePressure()); dp <= dpTol {
			t.Errorf("μ = %g: tilted plane has Δp_c = %g Pa, want > 0", mu, dp)
		}
	}
}
