package dfn

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

func seg(x0, y0, x1, y1 float64) Segment {
	return Segment{P0: r2.Vec{X: x0, Y: y0}, P1: r2.Vec{X: x1, Y: y1}}
}

// Every case of IntersectSegments, by hand (common practice, no source:
// plane geometry).
func TestIntersectSegmentsCases(t *testing.T) {
	const tiny = GeomTol / 10
	for _, c := range []struct {
		name   string
		a, b   Segment
		ok     bool
		x, y   float64
		s, tPa float64
	}{
		{"proper crossing", seg(0, 0, 2, 2), seg(0, 2, 2, 0), true, 1, 1, 0.5, 0.5},
		{"proper crossing off centre", seg(0, 0, 4, 0), seg(1, -1, 1, 3), true, 1, 0, 0.25, 0.25},
		{"T-junction: end of b on interior of a", seg(0, 0, 4, 0), seg(2, 0, 2, 5), true, 2, 0, 0.5, 0},
		{"T-junction: end of a on interior of b", seg(2, 5, 2, 0), seg(0, 0, 4, 0), true, 2, 0, 1, 0.5},
		{"T-junction within tolerance", seg(0, 0, 4, 0), seg(2, tiny, 2, 5), true, 2, 0, 0.5, 0},
		{"shared end points", seg(0, 0, 1, 1), seg(1, 1, 2, 0), true, 1, 1, 1, 0},
		{"collinear overlap", seg(0, 0, 4, 0), seg(2, 0, 6, 0), true, 3, 0, 0.75, 0.25},
		{"collinear, b inside a", seg(0, 0, 10, 0), seg(6, 0, 4, 0), true, 5, 0, 0.5, 0.5},
		{"collinear identical", seg(1, 1, 3, 3), seg(1, 1, 3, 3), true, 2, 2, 0.5, 0.5},
		{"collinear touching at ends", seg(0, 0, 1, 0), seg(1, 0, 3, 0), true, 1, 0, 1, 0},
		{"collinear disjoint", seg(0, 0, 1, 0), seg(2, 0, 3, 0), false, 0, 0, 0, 0},
		{"collinear disjoint, overlapping boxes", seg(0, 0, 1, 1), seg(1.5, 1.5, 3, 3), false, 0, 0, 0, 0},
		{"parallel apart", seg(0, 0, 4, 0), seg(0, 1, 4, 1), false, 0, 0, 0, 0},
		{"parallel within tolerance is collinear", seg(0, 0, 4, 0), seg(2, tiny, 6, tiny), true, 3, 0, 0.75, 0.25},
		{"bounding boxes apart", seg(0, 0, 1, 1), seg(2, 0, 3, 1), false, 0, 0, 0, 0},
		{"boxes overlap, lines cross outside", seg(0, 0, 2, 2), seg(3, 0, 1.6, 1.4), false, 0, 0, 0, 0},
		{"near miss beyond tolerance", seg(0, 0, 4, 0), seg(2, 1e-6, 2, 5), false, 0, 0, 0, 0},
		{"end on the other's line, outside it", seg(0, 0, 4, 0), seg(5, 0, 5, 3), false, 0, 0, 0, 0},
		{"point on segment", seg(2, 0, 2, 0), seg(0, 0, 4, 0), true, 2, 0, 0, 0.5},
		{"segment through point", seg(0, 0, 4, 0), seg(1, 0, 1, 0), true, 1, 0, 0.25, 0},
		{"point off segment", seg(2, 1, 2, 1), seg(0, 0, 4, 0), false, 0, 0, 0, 0},
		{"two equal points", seg(2, 1, 2, 1), seg(2, 1, 2, 1), true, 2, 1, 0, 0},
		{"two different points", seg(2, 1, 2, 1), seg(2, 2, 2, 2), false, 0, 0, 0, 0},
	} {
		x, ok := IntersectSegments(c.a, c.b)
		if ok != c.ok {
			t.Errorf("%s: ok = %v, want %v", c.name, ok, c.ok)
			continue
		}
		if !ok {
			continue
		}
		const tol = 1e-12 // a few ulps of the coordinates
		numtest.Abs(t, c.name+": x", x.Point.X, c.x, tol)
		numtest.Abs(t, c.name+": y", x.Point.Y, c.y, tol)
		numtest.Abs(t, c.name+": S", x.S, c.s, tol)
		numtest.Abs(t, c.name+": T", x.T, c.tPa, tol)
		// Argument order only swaps S and T.
		y, ok2 := IntersectSegments(c.b, c.a)
		if !ok2 {
			t.Errorf("%s: not symmetric", c.name)
			continue
		}
		numtest.Abs(t, c.name+": swapped S", y.S, c.tPa, tol)
		numtest.Abs(t, c.name+": swapped T", y.T, c.s, tol)
	}
}

// FuzzIntersectSegments checks that the predicate is symmetric and that a
// reported crossing lies on both segments.
func FuzzIntersectSegments(f *testing.F) {
	f.Add(0.0, 0.0, 2.0, 2.0, 0.0, 2.0, 2.0, 0.0)
	f.Add(0.0, 0.0, 4.0, 0.0, 2.0, 0.0, 6.0, 0.0)
	f.Add(0.0, 0.0, 4.0, 0.0, 2.0, 0.0, 2.0, 5.0)
	f.Add(1.0, 1.0, 1.0, 1.0, 0.0, 0.0, 2.0, 2.0)
	f.Add(0.0, 0.0, 1e5, 1.0, 5e4, 0.5, 5e4, 3.0)
	f.Fuzz(func(t *testing.T, ax, ay, bx, by, cx, cy, dx, dy float64) {
		for _, v := range []float64{ax, ay, bx, by, cx, cy, dx, dy} {
			if math.IsNaN(v) || math.Abs(v) > 1e5 {
				t.Skip()
			}
		}
		a, b := seg(ax, ay, bx, by), seg(cx, cy, dx, dy)
		x, ok := IntersectSegments(a, b)
		y, ok2 := IntersectSegments(b, a)
		if ok != ok2 {
			t.Fatalf("asymmetric: %v %v", ok, ok2)
		}
		if !ok {
			return
		}
		if x.S < 0 || x.S > 1 || x.T < 0 || x.T > 1 || y.S != x.T || y.T != x.S {
			t.Fatalf("parameters %v, swapped %v", x, y)
		}
		// The point is within the tolerance of each segment, allowing for
		// rounding at coordinates up to 1e5 m and for nearly parallel
		// segments, whose crossing point is ill-conditioned along them.
		for _, s := range []Segment{a, b} {
			d := pointSegmentDistance(x.Point, s)
			if d > 1e-6 {
				t.Fatalf("point %v is %g m from %v", x.Point, d, s)
			}
		}
	})
}

func pointSegmentDistance(p r2.Vec, s Segment) float64 {
	d := r2.Sub(s.P1, s.P0)
	l2 := r2.Dot(d, d)
	if l2 == 0 {
		return r2.Norm(r2.Sub(p, s.P0))
	}
	t := math.Max(0, math.Min(1, r2.Dot(r2.Sub(p, s.P0), d)/l2))
	return r2.Norm(r2.Sub(p, r2.Add(s.P0, r2.Scale(t, d))))
}
