package dfn

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"slipfront/internal/numtest"
	"slipfront/scenarios"
)

func mustGenerate(t testing.TB, s *scenarios.Scenario, realization int) *Network {
	t.Helper()
	n, err := Generate(s, realization)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

func demoLikeScenario() *scenarios.Scenario {
	a := testSet("NE", 0.02, 0)
	a.Size = scenarios.Size{Distribution: "power_law", Min: 10, Max: 150, Exponent: 2.5}
	b := testSet("NW", 0.01, 0)
	b.Shape, b.AspectRatio = "rectangle", 0.5
	b.Orientation = scenarios.Orientation{Distribution: "fisher", Dip: rad(85), DipDirection: rad(215), Kappa: 30}
	b.Size = scenarios.Size{Distribution: "lognormal", Mean: 40, StdDev: 15}
	s := testScenario(800, 30, a, b)
	s.Wells = eastWells(800, 2)
	s.KnownFractures.Fractures = []scenarios.KnownFracture{{
		Name: "F1", X: 50, Y: -20, Depth: 2010, Dip: rad(75), DipDirection: rad(300), Length: 600, Height: 200, Line: 2,
	}}
	return s
}

// writeAll renders every output of a network.
func writeAll(t *testing.T, n *Network) []byte {
	t.Helper()
	var buf bytes.Buffer
	st := n.Stats()
	for _, w := range []func() error{
		func() error { return WriteFractures(&buf, n) },
		func() error { return WriteTraces(&buf, n) },
		func() error { return WriteNetworkJSON(&buf, n, st) },
		func() error { return WriteSummary(&buf, n, st) },
	} {
		if err := w(); err != nil {
			t.Fatal(err)
		}
	}
	return buf.Bytes()
}

// Same seed and realization → identical network and byte-identical files;
// another realization or seed → another network.
func TestGenerateDeterministic(t *testing.T) {
	s := demoLikeScenario()
	a, b := mustGenerate(t, s, 3), mustGenerate(t, s, 3)
	if a.Digest() != b.Digest() {
		t.Fatal("same seed, different digests")
	}
	if !bytes.Equal(writeAll(t, a), writeAll(t, b)) {
		t.Fatal("same seed, different files")
	}
	if len(a.Fractures) == 0 || len(a.Traces) == 0 || len(a.Intersections) == 0 || len(a.WellCrossings) == 0 {
		t.Fatalf("degenerate test network: %d fractures, %d traces, %d intersections, %d well crossings",
			len(a.Fractures), len(a.Traces), len(a.Intersections), len(a.WellCrossings))
	}
	if c := mustGenerate(t, s, 4); c.Digest() == a.Digest() {
		t.Error("realizations 3 and 4 have the same digest")
	}
	s.Seed++
	if c := mustGenerate(t, s, 3); c.Digest() == a.Digest() {
		t.Error("seeds 7 and 8 have the same digest")
	}
}

// Each set draws from its own streams: adding a set changes nothing in
// the others, and a realization does not depend on others generated
// before it.
func TestGenerateStreamsIndependent(t *testing.T) {
	s := demoLikeScenario()
	one := *s
	one.Sets = s.Sets[:1]
	one.KnownFractures.Fractures = nil
	first := mustGenerate(t, &one, 5)
	_ = mustGenerate(t, s, 0)
	both := mustGenerate(t, s, 5)
	if first.Sets[0].ExpectedCount != both.Sets[0].ExpectedCount {
		t.Fatal("expected counts differ")
	}
	for i := range first.Fractures {
		if first.Fractures[i] != both.Fractures[i] {
			t.Fatalf("fracture %d of set 0 changed when set 1 was added", i)
		}
	}
	if both.Fractures[len(first.Fractures)].Set != 1 {
		t.Fatal("set 0 has a different count when set 1 is added")
	}
}

// Every generated fracture can reach the counting volume (its centre lies
// within its extent of the box), mapped fractures come last as
// rectangles of set −1, and a count intensity gives exactly that count.
func TestGenerateLayout(t *testing.T) {
	s := demoLikeScenario()
	s.Sets[1].Intensity = scenarios.Intensity{Measure: "count", Count: 321}
	n := mustGenerate(t, s, 0)
	r := n.Region
	counts := map[int]int{}
	for _, f := range n.Fractures {
		counts[f.Set]++
		if f.Set == KnownSet {
			continue
		}
		e := f.Extent() * (1 + 1e-12)
		if f.Centre.X < r.XMin-e || f.Centre.X > r.XMax+e || f.Centre.Y < r.YMin-e || f.Centre.Y > r.YMax+e ||
			f.Centre.Z < r.ZMin()-e || f.Centre.Z > r.ZMax()+e {
			t.Fatalf("fracture %+v cannot reach the counting volume", f)
		}
		if f.Normal.Z < 0 {
			t.Fatalf("normal %v points down", f.Normal)
		}
	}
	if counts[1] != 321 {
		t.Errorf("count set has %d fractures, want 321", counts[1])
	}
	last := n.Fractures[len(n.Fractures)-1]
	if last.Set != KnownSet || last.Shape != Rectangle || last.Name != "F1" || counts[KnownSet] != 1 {
		t.Errorf("mapped fracture %+v", last)
	}
	numtest.Abs(t, "mapped centre z", last.Centre.Z, -2010, 0)
	numtest.Abs(t, "mapped area", last.Area, 600*200, 0)
	for _, tr := range n.Traces {
		if n.Fractures[tr.Fracture].Set != tr.Set {
			t.Fatal("trace set differs from its fracture's")
		}
	}
}

// docs/references.md §3.2 worked example: P32 = 0.1 1/m with (1, 100, 2.5)
// discs in a 200 m cube needs N = 0.1·8e6/14.137308 = 56 587.9 centres
// (λ·V); the expected count adds the enlargement, by hand for constant
// sizes.
func TestSetModelIntensity(t *testing.T) {
	set := testSet("A", 0.1, 0)
	set.Size = scenarios.Size{Distribution: "power_law", Min: 1, Max: 100, Exponent: 2.5}
	cube := Region{XMin: 0, XMax: 200, YMin: 0, YMax: 200, MidZ: -100, Thickness: 200}
	m, err := NewSetModel(set, cube)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "λ·V", m.Info.Density*cube.Volume(), 56587.9, 1e-6)

	c := testSet("B", 0.05, 10)
	c.Shape, c.AspectRatio = "rectangle", 0.5 // extent √(10² + 5²)/2
	r := Region{XMin: 0, XMax: 300, YMin: 0, YMax: 100, MidZ: -2000, Thickness: 20}
	m, err = NewSetModel(c, r)
	if err != nil {
		t.Fatal(err)
	}
	e := math.Hypot(10, 5) / 2
	numtest.Rel(t, "expected count", m.Info.ExpectedCount, 0.05/50*(300+2*e)*(100+2*e)*(20+2*e), 1e-12)

	// P10 → P32 through C13 (docs/references.md §2.2): uniform 1/2; a fixed
	// set dipping 30° east has its normal at 60° from a horizontal line
	// to the east, cos 60 = 1/2; Fisher through quadrature.
	for _, o := range []scenarios.Orientation{
		{Distribution: "uniform"},
		{Distribution: "fixed", Dip: rad(30), DipDirection: rad(90)},
		{Distribution: "fisher", Dip: rad(30), DipDirection: rad(90), Kappa: 20},
	} {
		p := testSet("C", 0, 10)
		p.Orientation = o
		p.Intensity = scenarios.Intensity{Measure: "p10", P10: 0.04, LineTrend: rad(90)}
		m, err := NewSetModel(p, r)
		if err != nil {
			t.Fatal(err)
		}
		law, err := NewOrientationLaw(o)
		if err != nil {
			t.Fatal(err)
		}
		want := 0.04 / C13(law, rad(90), 0)
		if o.Distribution != "fisher" {
			want = 0.08 // C13 = 1/2 in both other cases
		}
		numtest.Rel(t, o.Distribution+" P32 from P10", m.Info.P32Target, want, 1e-12)
	}
	// A line lying in a fixed set's planes has C13 = 0: error.
	p := testSet("D", 0, 10)
	p.Orientation = scenarios.Orientation{Distribution: "fixed", Dip: rad(90), DipDirection: 0}
	p.Intensity = scenarios.Intensity{Measure: "p10", P10: 0.04, LineTrend: rad(90)}
	if _, err := NewSetModel(p, r); err == nil || !strings.Contains(err.Error(), "C13") {
		t.Errorf("P10 along the planes: error %v", err)
	}
}

// The cap is checked before any work, names the set, the expected count
// and the cap, and matches ErrTooManyFractures.
func TestGenerateCap(t *testing.T) {
	s := testScenario(1e5, 1e3, testSet("dense", 10, 1), testSet("light", 1e-6, 10))
	_, err := Generate(s, 0) // ~3e10 expected: would take hours if not refused first
	var ce *CapError
	if !errors.As(err, &ce) || !errors.Is(err, ErrTooManyFractures) {
		t.Fatalf("error %v, want a *CapError", err)
	}
	for _, want := range []string{`"dense"`, "2000000", "max_fractures"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("message %q lacks %s", err, want)
		}
	}
	if ce.Cap != 2_000_000 || ce.Set != "dense" || !(ce.Total > 1e10) {
		t.Errorf("cap error %+v", ce)
	}
	s = testScenario(100, 10, testSet("a", 0.01, 5))
	s.Numerics.MaxFractures = 1
	if _, err := Generate(s, 0); !errors.Is(err, ErrTooManyFractures) {
		t.Errorf("small cap: error %v", err)
	}
}

func TestGenerateBadInput(t *testing.T) {
	for _, c := range []struct {
		name string
		edit func(s *scenarios.Scenario)
		want string
	}{
		{"negative kappa", func(s *scenarios.Scenario) { s.Sets[0].Orientation.Kappa = -3 }, `sets[0] ("a"): orientation.kappa = -3`},
		{"dip above 90", func(s *scenarios.Scenario) { s.Sets[0].Orientation.Dip = rad(95) }, "orientation.dip = 95"},
		{"inverted sizes", func(s *scenarios.Scenario) {
			s.Sets[0].Size = scenarios.Size{Distribution: "power_law", Min: 50, Max: 10, Exponent: 2}
		}, "size.max = 10 m: must exceed size.min = 50 m"},
		{"empty map", func(s *scenarios.Scenario) { s.Domain.XMax = s.Domain.XMin }, "domain.x_max"},
		{"zero thickness", func(s *scenarios.Scenario) { s.Layer.Thickness = 0 }, "layer.thickness"},
		{"one-point well", func(s *scenarios.Scenario) { s.Wells = []scenarios.Well{{Name: "W", Path: []scenarios.Point{{}}}} }, `wells[0] ("W")`},
		{"bad known fracture", func(s *scenarios.Scenario) {
			s.KnownFractures = scenarios.KnownFractures{File: "faults.csv", Fractures: []scenarios.KnownFracture{{Name: "F", Dip: rad(30), Length: -1, Height: 5, Line: 3}}}
		}, `faults.csv:3: known fracture 0 ("F"): length = -1 m`},
	} {
		s := testScenario(100, 10, testSet("a", 0.01, 5))
		c.edit(s)
		_, err := Generate(s, 0)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want it to contain %q", c.name, err, c.want)
		}
	}
	if _, err := Generate(testScenario(100, 10), -1); err == nil {
		t.Error("negative realization: no error")
	}
}

// The P32 target is met in expectation for every size law and shape: the
// mean realized P32 inside the counting volume over M realizations is
// within 5 standard errors (sd/√M of the realizations) of the target
// (docs/references.md §3.2: N = P32·V/E[A], with no edge bias by
// construction).
func TestP32TargetInExpectation(t *testing.T) {
	for _, c := range []struct {
		name  string
		shape string
		size  scenarios.Size
	}{
		{"disc power law", "disc", scenarios.Size{Distribution: "power_law", Min: 5, Max: 80, Exponent: 2.2}},
		{"rectangle lognormal", "rectangle", scenarios.Size{Distribution: "lognormal", Mean: 25, StdDev: 12}},
		{"disc exponential", "disc", scenarios.Size{Distribution: "exponential", Mean: 12}},
		{"rectangle constant", "rectangle", scenarios.Size{Distribution: "constant", Value: 30}},
	} {
		set := testSet("s", 0.05, 0)
		set.Shape, set.AspectRatio, set.Size = c.shape, 0.6, c.size
		set.Orientation = scenarios.Orientation{Distribution: "fisher", Dip: rad(70), DipDirection: rad(40), Kappa: 8}
		s := testScenario(600, 20, set) // ~2000 fractures a realization
		const m = 100                   // tolerance ≈ 2 % of the target
		var vals []float64
		for k := range m {
			vals = append(vals, mustGenerate(t, s, k).Stats().Sets[0].P32)
		}
		mean, sd := meanSD(vals)
		numtest.Abs(t, c.name+": mean P32", mean, 0.05, 5*sd/math.Sqrt(m))
	}
}

func meanSD(v []float64) (mean, sd float64) {
	for _, x := range v {
		mean += x
	}
	mean /= float64(len(v))
	for _, x := range v {
		sd += (x - mean) * (x - mean)
	}
	return mean, math.Sqrt(sd / float64(len(v)-1))
}

// Estimate knows the zipper pad network's size before it is drawn: the expected
// fracture count, the trace length within the scatter of one realization,
// and an upper estimate of the intersections.
func TestEstimateZipperPad(t *testing.T) {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		t.Fatal(err)
	}
	e, err := Estimate(s)
	if err != nil {
		t.Fatal(err)
	}
	var length float64
	var fractures, intersections int
	const realizations = 4
	for r := range realizations {
		net, err := Generate(s, r)
		if err != nil {
			t.Fatal(err)
		}
		fractures += len(net.Fractures)
		intersections += len(net.Intersections)
		for _, tr := range net.Traces {
			length += tr.Length
		}
	}
	mean := func(v float64) float64 { return v / realizations }
	// Poisson counts of about 5 400 fractures scatter by √5400 ≈ 1.4 %;
	// four realizations by 0.7 %: 3 % is over four standard errors.
	numtest.Rel(t, "expected fractures", mean(float64(fractures)), e.Fractures, 0.03)
	// The trace length is an estimate through P21 ≤ P32 over an enlarged
	// map (the zipper pad's sets are near-vertical, so the bound is tight).
	numtest.Rel(t, "trace length", mean(length), e.TraceLength, 0.15)
	if got := mean(float64(intersections)); got > e.Intersections {
		t.Errorf("%.0f intersections on average, more than the upper estimate %.0f", got, e.Intersections)
	}
	if e.Bytes <= 0 {
		t.Errorf("estimated %g bytes", e.Bytes)
	}
}
