package footprint

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/numtest"
)

// The envelope in closed form: a convex polygon H grown by r has area
// A(H) + r·P(H) + πr² (Steiner formula, see steiner).
func TestEnvelopeArea(t *testing.T) {
	const r = 1.0
	for _, c := range []struct {
		name   string
		segs   []dfn.Segment
		want   float64
		groups int
	}{
		{"one segment", []dfn.Segment{seg(0, 0, 10, 0)}, steiner(seg(0, 0, 10, 0), r), 1},
		{"a point", []dfn.Segment{seg(2, 2, 2, 2)}, math.Pi, 1},
		// Two segments 10 m apart (> 2r): two envelopes, the sum.
		{"two apart", []dfn.Segment{seg(0, 0, 10, 0), seg(0, 10, 10, 10)}, 2 * steiner(seg(0, 0, 10, 0), r), 2},
		// An L of two 10 m legs: the hull is the right triangle of area 50
		// and perimeter 20 + 10√2.
		{"L shape", []dfn.Segment{seg(0, 0, 10, 0), seg(0, 0, 0, 10)}, 50 + r*(20+10*math.Sqrt2) + math.Pi, 1},
		// A short segment in the bay of the L, apart from both legs: its
		// own group, but inside the L's hull, so the groups are joined.
		{"segment in the bay of an L", []dfn.Segment{seg(0, 0, 10, 0), seg(0, 0, 0, 10), seg(3, 3, 4, 3)},
			50 + r*(20+10*math.Sqrt2) + math.Pi, 1},
	} {
		got, groups, err := EnvelopeArea(c.segs, r)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		numtest.Rel(t, c.name, got, c.want, exactTol)
		if groups != c.groups {
			t.Errorf("%s: %d groups, want %d", c.name, groups, c.groups)
		}
	}
}

// The envelope contains the union, so its area is at least Area's, and
// at most the area of one hull around everything (common practice, no
// source: containment).
func TestEnvelopeBounds(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(19, 20)), 300)
	const r = 2.0
	u, err := Area(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	e, groups, err := EnvelopeArea(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	pts := make([]r2.Vec, 0, 2*len(segs))
	for _, s := range segs {
		pts = append(pts, s.P0, s.P1)
	}
	a, p := polygonAreaPerimeter(convexHull(pts))
	all := a + r*p + math.Pi*r*r
	if groups < 2 || !(e >= u*(1-exactTol) && e <= all*(1+exactTol)) {
		t.Errorf("envelope %g m² in %d groups, want in [%g, %g] and more than one group", e, groups, u, all)
	}
}
