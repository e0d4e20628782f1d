package mechanics

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

// fixturePlanes are four planes in the docs/references.md §7.4 state with known
// critical increases: 80/120 (9.008093 MPa), the optimal vertical plane
// (38.486114 − 30 = 8.486114 MPa), the vertical plane 90/120.5
// (8.486121 MPa) and a horizontal plane (σn = Sv = 75 MPa, τ = 0, so
// Δp_c = 75 − 30 = 45 MPa).
func fixturePlanes() []Plane {
	optimal := 60*deg + math.Pi/2 - OptimalAngle(0.6)
	return []Plane{
		{ID: 1, Set: 0, Normal: orient.Normal(80*deg, 120*deg), Area: 100, TraceLength: 10},
		{ID: 2, Set: 0, Normal: orient.Normal(90*deg, optimal), Area: 200, TraceLength: 20},
		{ID: 3, Set: 1, Normal: orient.Normal(90*deg, 120.5*deg), Area: 300, TraceLength: 30},
		{ID: 4, Set: 1, Normal: r3.Vec{Z: 1}, Area: 400, TraceLength: 0},
	}
}

func TestScreenPlaneResults(t *testing.T) {
	s := workedExample(t)
	sc, err := Screen(fixturePlanes(), s, Coulomb{Friction: 0.6}, ScreenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{9.008093, 8.486114, 8.486121, 45} // MPa, docs/references.md §7.4
	for i, r := range sc.Planes {
		numtest.Abs(t, "Δp_c", r.CriticalIncrease, want[i]*mpa, digits6MPa)
		if r.ID != i+1 {
			t.Errorf("plane %d has id %d", i, r.ID)
		}
	}
	r := sc.Planes[0]
	numtest.Abs(t, "σn", r.SigmaN, 64.089229*mpa, digits6MPa)
	numtest.Abs(t, "τ", r.Tau, 15.048682*mpa, digits6MPa)
	numtest.Abs(t, "slip tendency", r.SlipTendency, 0.441450, 1e-6)
	numtest.Abs(t, "total slip tendency", r.TotalSlipTendency, 0.234808, 1e-6)
	numtest.Abs(t, "rake", r.Rake, -172.655*deg, digits3Deg)
	numtest.Abs(t, "dip direction", r.DipDirection, 120*deg, digits6Deg)
	// Dilation tendency (90 − 64.089229)/(90 − 55) (Ferrill et al. 1999).
	numtest.Abs(t, "dilation tendency", r.DilationTendency, (90-64.089229)/35, 1e-6/35)
}

// Shares at chosen increases, counted by hand from the fixture's Δp_c.
func TestScreenShares(t *testing.T) {
	s := workedExample(t)
	incs := []float64{8.4861e6, 8.4862e6, 9.01e6, 50e6}
	sc, err := Screen(fixturePlanes(), s, Coulomb{Friction: 0.6}, ScreenOptions{Increases: incs, SetNames: map[int]string{0: "NE set"}})
	if err != nil {
		t.Fatal(err)
	}
	type want struct {
		name                string
		n                   int
		count, length, area []float64
	}
	wants := []want{
		{"NE set", 2, []float64{0, 0.5, 1, 1}, []float64{0, 20.0 / 30, 1, 1}, []float64{0, 200.0 / 300, 1, 1}},
		{"set 1", 2, []float64{0, 0.5, 0.5, 1}, []float64{0, 1, 1, 1}, []float64{0, 300.0 / 700, 300.0 / 700, 1}},
		{"all", 4, []float64{0, 0.5, 0.75, 1}, []float64{0, 50.0 / 60, 1, 1}, []float64{0, 0.5, 0.6, 1}},
	}
	got := append(append([]Shares(nil), sc.Sets...), sc.Total)
	if len(got) != len(wants) {
		t.Fatalf("%d share rows, want %d", len(got), len(wants))
	}
	for i, w := range wants {
		g := got[i]
		if g.Name != w.name || g.Fractures != w.n {
			t.Errorf("row %d: %q with %d fractures, want %q with %d", i, g.Name, g.Fractures, w.name, w.n)
		}
		for k := range incs {
			numtest.Abs(t, w.name+" count share", g.FractureShare[k], w.count[k], roundOff)
			numtest.Abs(t, w.name+" trace-length share", g.TraceLengthShare[k], w.length[k], roundOff)
			numtest.Abs(t, w.name+" area share", g.AreaShare[k], w.area[k], roundOff)
		}
	}
	if sc.Total.Set != -1 || sc.Sets[1].Set != 1 {
		t.Errorf("set indices %d, %d", sc.Total.Set, sc.Sets[1].Set)
	}
}

// The curve: 0.25 MPa steps up to the first step at or beyond the largest
// Δp_c (45 MPa), non-decreasing, ending with every fracture slipping.
func TestScreenCurve(t *testing.T) {
	s := workedExample(t)
	sc, err := Screen(fixturePlanes(), s, Coulomb{Friction: 0.6}, ScreenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sc.Curve) != 181 || sc.CurveStep != DefaultCurveStep {
		t.Fatalf("curve has %d points with step %g, want 181 with 0.25 MPa", len(sc.Curve), sc.CurveStep)
	}
	for k, p := range sc.Curve {
		numtest.Abs(t, "increase", p.Increase, float64(k)*0.25e6, 0)
		if k > 0 && p.AreaShare < sc.Curve[k-1].AreaShare {
			t.Errorf("area share falls at %g Pa", p.Increase)
		}
	}
	// Slipping area by hand (fixture Δp_c): 8.5 MPa: planes 2, 3 (500 m²);
	// 9.0 MPa: still 500 (plane 1 needs 9.008); 9.25: 600; 45: 1000.
	for _, tc := range []struct {
		k    int
		area float64
	}{{0, 0}, {33, 0}, {34, 500}, {36, 500}, {37, 600}, {179, 600}, {180, 1000}} {
		numtest.Abs(t, "slipping area", sc.Curve[tc.k].SlippingArea, tc.area, 0)
		numtest.Abs(t, "area share", sc.Curve[tc.k].AreaShare, tc.area/1000, roundOff)
	}
	last := sc.Curve[180]
	numtest.Abs(t, "final fracture share", last.FractureShare, 1, 0)
	numtest.Abs(t, "final trace share", last.TraceLengthShare, 1, 0)
}

// A tiny step is doubled until the curve fits in 2001 points.
func TestScreenCurveStepDoubling(t *testing.T) {
	s := workedExample(t)
	sc, err := Screen(fixturePlanes(), s, Coulomb{Friction: 0.6}, ScreenOptions{CurveStep: 1})
	if err != nil {
		t.Fatal(err)
	}
	n := len(sc.Curve)
	if n > maxCurvePoints || n < maxCurvePoints/2 {
		t.Errorf("%d curve points, want in (%d, %d]", n, maxCurvePoints/2, maxCurvePoints)
	}
	if last := sc.Curve[n-1].Increase; last < 45e6 || sc.Curve[n-2].Increase >= 45e6-digits6MPa {
		t.Errorf("curve ends at %g Pa, want the first step at or beyond 45 MPa", last)
	}
	// The step is a power of two (in Pa) since it doubled from 1 Pa.
	if _, e := math.Frexp(sc.CurveStep); math.Ldexp(1, e-1) != sc.CurveStep {
		t.Errorf("step %g is not 1 Pa doubled", sc.CurveStep)
	}
}

// Shares of a random population against a brute-force count per set.
func TestScreenSharesBruteForce(t *testing.T) {
	s := workedExample(t)
	rng := rand.New(rand.NewPCG(1, 2))
	planes := make([]Plane, 500)
	for i := range planes {
		planes[i] = Plane{ID: i, Set: rng.IntN(3),
			Normal:      r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()},
			Area:        1 + 100*rng.Float64(),
			TraceLength: 20 * rng.Float64()}
	}
	c := Coulomb{Friction: 0.6, Cohesion: 0.5e6}
	sc, err := Screen(planes, s, c, ScreenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, sh := range append(append([]Shares(nil), sc.Sets...), sc.Total) {
		for k, dp := range sc.Increases {
			var n, tot int
			var slipL, totL float64
			for _, p := range planes {
				if sh.Set != -1 && p.Set != sh.Set {
					continue
				}
				tot++
				totL += p.TraceLength
				r := s.Resolve(p.Normal)
				if r.Tau >= c.Cohesion+c.Friction*(r.SigmaN-s.PorePressure()-dp) {
					n++
					slipL += p.TraceLength
				}
			}
			if sh.Fractures != tot {
				t.Errorf("%s: %d fractures, want %d", sh.Name, sh.Fractures, tot)
			}
			numtest.Abs(t, sh.Name+" count share", sh.FractureShare[k], float64(n)/float64(tot), roundOff)
			numtest.Abs(t, sh.Name+" trace share", sh.TraceLengthShare[k], slipL/totL, 1e-9)
		}
	}
}

func TestScreenErrors(t *testing.T) {
	s := workedExample(t)
	good := fixturePlanes()
	tests := []struct {
		name   string
		edit   func([]Plane)
		c      Coulomb
		opt    ScreenOptions
		substr string
	}{
		{"zero normal", func(p []Plane) { p[1].Normal = r3.Vec{} }, Coulomb{Friction: 0.6}, ScreenOptions{}, "fracture 2"},
		{"NaN normal", func(p []Plane) { p[0].Normal.X = math.NaN() }, Coulomb{Friction: 0.6}, ScreenOptions{}, "normal"},
		{"zero area", func(p []Plane) { p[2].Area = 0 }, Coulomb{Friction: 0.6}, ScreenOptions{}, "area"},
		{"negative trace", func(p []Plane) { p[3].TraceLength = -1 }, Coulomb{Friction: 0.6}, ScreenOptions{}, "trace length"},
		{"friction 0", func([]Plane) {}, Coulomb{Friction: 0}, ScreenOptions{}, "friction_static"},
		{"negative cohesion", func([]Plane) {}, Coulomb{Friction: 0.6, Cohesion: -1}, ScreenOptions{}, "cohesion"},
		{"descending increases", func([]Plane) {}, Coulomb{Friction: 0.6}, ScreenOptions{Increases: []float64{2e6, 1e6}}, "ascending"},
		{"negative increase", func([]Plane) {}, Coulomb{Friction: 0.6}, ScreenOptions{Increases: []float64{-1}}, "pressure increase"},
		{"negative step", func([]Plane) {}, Coulomb{Friction: 0.6}, ScreenOptions{CurveStep: -1}, "curve step"},
	}
	for _, tc := range tests {
		planes := append([]Plane(nil), good...)
		tc.edit(planes)
		_, err := Screen(planes, s, tc.c, tc.opt)
		if err == nil || !strings.Contains(err.Error(), tc.substr) {
			t.Errorf("%s: error %v, want one mentioning %q", tc.name, err, tc.substr)
		}
	}
}

// No planes: zero shares, a one-point curve, no division by zero.
func TestScreenEmpty(t *testing.T) {
	sc, err := Screen(nil, workedExample(t), Coulomb{Friction: 0.6}, ScreenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sc.Sets) != 0 || sc.Total.Fractures != 0 || len(sc.Curve) != 1 {
		t.Fatalf("empty screening: %d sets, %d fractures, %d curve points", len(sc.Sets), sc.Total.Fractures, len(sc.Curve))
	}
	for _, v := range sc.Total.FractureShare {
		if v != 0 {
			t.Errorf("share %g of nothing", v)
		}
	}
}
