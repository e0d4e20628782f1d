package report

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/plot/vg"

	"slipfront/internal/numtest"
)

// exact: these helpers return round numbers built from powers of ten;
// 1e-12 relative absorbs the round-off of math.Pow.
const exact = 1e-12

func TestNiceLength(t *testing.T) {
	for _, tc := range []struct{ in, want float64 }{
		{1, 1}, {1.9, 1}, {2, 2}, {4.99, 2}, {5, 5}, {9.9, 5}, {10, 10},
		{380, 200}, {400, 200}, {730, 500}, {0.037, 0.02}, {12345, 10000},
	} {
		numtest.Rel(t, fmt.Sprintf("niceLength(%g)", tc.in), niceLength(tc.in), tc.want, exact)
	}
}

func TestNiceStep(t *testing.T) {
	for _, tc := range []struct{ in, want float64 }{
		{1, 1}, {1.1, 2}, {2, 2}, {2.1, 5}, {5, 5}, {5.1, 10}, {308, 500}, {0.0031, 0.005},
	} {
		numtest.Rel(t, fmt.Sprintf("niceStep(%g)", tc.in), niceStep(tc.in), tc.want, exact)
	}
}

func TestNiceTicks(t *testing.T) {
	ticks := niceTicks{n: 6}.Ticks(-1000, 1000) // Raw step 333 → 500.
	var labels []string
	for _, tk := range ticks {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	want := []string{"−1000", "−500", "0", "500", "1000"}
	if fmt.Sprint(labels) != fmt.Sprint(want) {
		t.Errorf("labels = %q, want %q", labels, want)
	}
	if got := len(ticks) - len(labels); got != 4 {
		t.Errorf("%d unlabelled half-way ticks, want 4", got)
	}
	if ts := (niceTicks{n: 5}).Ticks(0.12, 0.34); len(ts) == 0 || ts[0].Label != "0.15" {
		t.Errorf("ticks of [0.12, 0.34] = %v, want the first labelled 0.15 (step 0.05)", ts)
	}
	if ts := (niceTicks{n: 5}).Ticks(3, 3); ts != nil {
		t.Errorf("ticks of an empty range = %v, want none", ts)
	}
	// A range one ulp wide (a fuzz finding: min/step ≈ 3·10¹⁶, where k++
	// no longer advanced and the loop never ended) has no ticks.
	if ts := (niceTicks{n: 5}).Ticks(10.0/3, math.Nextafter(10.0/3, 4)); ts != nil {
		t.Errorf("ticks of a one-ulp range = %v, want none", ts)
	}
	if got := tickLabel(3e9, 0); got != "3e+09" {
		t.Errorf("tickLabel(3e9) = %q, want exponent form", got)
	}
}

func TestLengthLabel(t *testing.T) {
	for _, tc := range []struct {
		in   float64
		want string
	}{{200, "200 m"}, {1000, "1 km"}, {2000, "2 km"}, {0.5, "0.5 m"}, {1500, "1500 m"}} {
		if got := lengthLabel(tc.in); got != tc.want {
			t.Errorf("lengthLabel(%g) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestAreaUnit(t *testing.T) {
	for _, tc := range []struct {
		max    float64
		factor float64
		unit   string
	}{{0, 1, "m²"}, {9999, 1, "m²"}, {1e4, 1e-3, "10³ m²"}, {5e6, 1e-3, "10³ m²"}, {2e7, 1e-6, "km²"}} {
		f, u := areaUnit(tc.max)
		if u != tc.unit {
			t.Errorf("areaUnit(%g) unit = %q, want %q", tc.max, u, tc.unit)
		}
		numtest.Rel(t, "factor", f, tc.factor, exact)
	}
}

// TestClipSegment checks Liang–Barsky clipping on the cases of Liang &
// Barsky (1984): inside, crossing one or two edges, outside, parallel to
// an edge inside and outside, and a point.
func TestClipSegment(t *testing.T) {
	r := vg.Rectangle{Min: vg.Point{X: 0, Y: 0}, Max: vg.Point{X: 10, Y: 10}}
	p := func(x, y vg.Length) vg.Point { return vg.Point{X: x, Y: y} }
	for _, tc := range []struct {
		name   string
		a, b   vg.Point
		ok     bool
		ca, cb vg.Point
	}{
		{"inside", p(1, 1), p(9, 5), true, p(1, 1), p(9, 5)},
		{"crosses right edge", p(5, 5), p(15, 5), true, p(5, 5), p(10, 5)},
		{"crosses two edges", p(-5, 2), p(5, 12), true, p(0, 7), p(3, 10)},
		{"touches a corner", p(-5, 5), p(5, 15), true, p(0, 10), p(0, 10)},
		{"diagonal through", p(-5, -5), p(15, 15), true, p(0, 0), p(10, 10)},
		{"outside", p(11, 0), p(20, 10), false, vg.Point{}, vg.Point{}},
		{"parallel outside", p(-1, 0), p(-1, 10), false, vg.Point{}, vg.Point{}},
		{"parallel inside", p(3, -5), p(3, 20), true, p(3, 0), p(3, 10)},
		{"point inside", p(4, 4), p(4, 4), true, p(4, 4), p(4, 4)},
		{"point outside", p(-4, 4), p(-4, 4), false, vg.Point{}, vg.Point{}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ca, cb, ok := clipSegment(r, tc.a, tc.b)
			if ok != tc.ok {
				t.Fatalf("ok = %v, want %v", ok, tc.ok)
			}
			if !ok {
				return
			}
			// clipTol: the clipped ends come from t·(b − a) in float64.
			const clipTol = 1e-12
			numtest.Abs(t, "a.X", float64(ca.X), float64(tc.ca.X), clipTol)
			numtest.Abs(t, "a.Y", float64(ca.Y), float64(tc.ca.Y), clipTol)
			numtest.Abs(t, "b.X", float64(cb.X), float64(tc.cb.X), clipTol)
			numtest.Abs(t, "b.Y", float64(cb.Y), float64(tc.cb.Y), clipTol)
		})
	}
}

func TestSizeResolve(t *testing.T) {
	if s, err := (Size{}).resolve(); err != nil || s != DefaultSize {
		t.Errorf("zero Size resolves to %v, %v; want %v", s, err, DefaultSize)
	}
	for _, s := range []Size{{MinWidth, MinHeight}, {MaxSide, MaxSide}} {
		if _, err := s.resolve(); err != nil {
			t.Errorf("%v: %v", s, err)
		}
	}
	for _, s := range []Size{{MinWidth - 1, MinHeight}, {MinWidth, MinHeight - 1}, {MaxSide + 1, 600}, {800, 0}} {
		if _, err := s.resolve(); err == nil {
			t.Errorf("%v accepted", s)
		}
	}
	// The page has exactly the requested pixels.
	pg := newPage(Size{Width: 1000, Height: 333})
	if b := pg.image().Bounds(); b.Dx() != 1000 || b.Dy() != 333 {
		t.Errorf("page is %v, want 1000×333", b)
	}
}
