package footprint

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/numtest"
)

func seg(x0, y0, x1, y1 float64) dfn.Segment {
	return dfn.Segment{P0: r2.Vec{X: x0, Y: y0}, P1: r2.Vec{X: x1, Y: y1}}
}

// exactTol is the relative tolerance of a closed-form check: the sweep is
// exact up to rounding, whose bound (package documentation) is below
// 1e-13 relative for these few-segment cases; 1e-12 leaves room.
const exactTol = 1e-12

// steiner is the area of one stadium, 2rL + πr²: the Steiner formula
// A(K ⊕ rB) = A(K) + r·P(K) + πr² for a convex body K (Steiner 1840; see
// Santaló, L.A. 1976, Integral Geometry and Geometric Probability,
// Addison-Wesley, §I.1, eq. 1.8 — equation number from memory), with the
// segment as K: A(K) = 0, P(K) = 2L.
func steiner(s dfn.Segment, r float64) float64 {
	return 2*r*r2.Norm(r2.Sub(s.P1, s.P0)) + math.Pi*r*r
}

// Every closed-form case.
func TestAreaClosedForms(t *testing.T) {
	const r = 1.5
	s60 := math.Sin(math.Pi / 3)
	for _, c := range []struct {
		name string
		segs []dfn.Segment
		want float64
	}{
		// Steiner formula (see steiner).
		{"one segment", []dfn.Segment{seg(0, 0, 10, 0)}, steiner(seg(0, 0, 10, 0), r)},
		{"one oblique segment", []dfn.Segment{seg(-3, 2, 4, -5)}, steiner(seg(-3, 2, 4, -5), r)},
		{"one vertical segment", []dfn.Segment{seg(1, -2, 1, 7)}, steiner(seg(1, -2, 1, 7), r)},
		// A point is a disc: πr² (Steiner with L = 0).
		{"a point", []dfn.Segment{seg(3, 4, 3, 4)}, math.Pi * r * r},
		// Disjoint stadiums add (their centre lines are 10 m > 2r apart).
		{"two disjoint segments", []dfn.Segment{seg(0, 0, 10, 0), seg(0, 10, 5, 13)},
			steiner(seg(0, 0, 10, 0), r) + steiner(seg(0, 10, 5, 13), r)},
		// Symmetric cross of two segments of half-length a ≥ 2r at right
		// angles through their midpoints (plane geometry, derived here): a
		// point within r of both has |y| ≤ r (from the first, as |x| ≤ r ≤ a
		// holds there) and |x| ≤ r; the end discs of one lie a − r ≥ r away
		// from the other's axis, so they add nothing. The intersection is the
		// square of side 2r and, by inclusion–exclusion,
		// A = 2(4ar + πr²) − 4r².
		{"symmetric cross", []dfn.Segment{seg(-5, 0, 5, 0), seg(0, -5, 0, 5)},
			2*(4*5*r+math.Pi*r*r) - 4*r*r},
		// Oblique cross at θ = 60°: the two strips of width 2r meet in a
		// rhombus of area (2r)²/sin θ, whose far corners lie r/sin(θ/2) = 2r
		// from the crossing, inside both rectangles for a = 5 m ≥ 2r + r
		// (derived here as above).
		{"cross at 60 degrees", []dfn.Segment{seg(-5, 0, 5, 0), seg(-5*0.5, -5*s60, 5*0.5, 5*s60)},
			2*(4*5*r+math.Pi*r*r) - 4*r*r/s60},
		// Collinear overlapping segments cover what the merged one does.
		{"collinear overlap", []dfn.Segment{seg(0, 0, 6, 0), seg(4, 0, 10, 0)}, steiner(seg(0, 0, 10, 0), r)},
		{"collinear overlap, oblique, reversed", []dfn.Segment{seg(0, 0, 6, 8), seg(9, 12, 3, 4)}, steiner(seg(0, 0, 9, 12), r)},
		{"duplicate segment", []dfn.Segment{seg(1, 2, 7, 3), seg(7, 3, 1, 2)}, steiner(seg(1, 2, 7, 3), r)},
		{"collinear, touching at an end", []dfn.Segment{seg(0, 0, 4, 0), seg(4, 0, 10, 0)}, steiner(seg(0, 0, 10, 0), r)},
		// A run that folds back on itself must not be merged into its
		// shorter chord.
		{"collinear, folding back", []dfn.Segment{seg(0, 0, 10, 0), seg(10, 0, 4, 0)}, steiner(seg(0, 0, 10, 0), r)},
		{"collinear chain with a gap", []dfn.Segment{seg(0, 0, 4, 0), seg(4, 0, 6, 0), seg(6+2*r+1, 0, 20, 0)},
			steiner(seg(0, 0, 6, 0), r) + steiner(seg(6+2*r+1, 0, 20, 0), r)},
		{"segment inside another", []dfn.Segment{seg(0, 0, 10, 10), seg(2, 2, 3, 3)}, steiner(seg(0, 0, 10, 10), r)},
		{"no segments", nil, 0},
	} {
		got, err := Area(c.segs, r)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		numtest.Close(t, c.name, got, c.want, 1e-12, exactTol)
	}
}

// Bad radius or coordinates are errors that name the value and the range.
func TestAreaErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		segs []dfn.Segment
		r    float64
	}{
		{"zero radius", []dfn.Segment{seg(0, 0, 1, 0)}, 0},
		{"negative radius", []dfn.Segment{seg(0, 0, 1, 0)}, -2},
		{"NaN radius", []dfn.Segment{seg(0, 0, 1, 0)}, math.NaN()},
		{"infinite radius", []dfn.Segment{seg(0, 0, 1, 0)}, math.Inf(1)},
		{"NaN coordinate", []dfn.Segment{seg(0, math.NaN(), 1, 0)}, 1},
		{"infinite coordinate", []dfn.Segment{seg(0, 0, math.Inf(-1), 0)}, 1},
		{"coordinate too large", []dfn.Segment{seg(0, 0, 2e12, 0)}, 1},
		{"radius too small for the coordinates", []dfn.Segment{seg(5e6, 0, 5e6+1, 0)}, 1e-6},
	} {
		if _, err := Area(c.segs, c.r); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}

// network returns n DFN-like segments in a square: two sets striking
// about 30° and 120° (±10°, normal), lengths uniform in 5–45 m, centres
// uniform, in a square sized for about the same trace density at any n.
func network(rng *rand.Rand, n int) []dfn.Segment {
	side := 15 * math.Sqrt(float64(n))
	segs := make([]dfn.Segment, n)
	for i := range segs {
		c := r2.Vec{X: rng.Float64() * side, Y: rng.Float64() * side}
		th := (30 + 90*float64(i%2) + 10*rng.NormFloat64()) * math.Pi / 180
		h := r2.Scale((5+40*rng.Float64())/2, r2.Vec{X: math.Sin(th), Y: math.Cos(th)})
		segs[i] = dfn.Segment{P0: r2.Sub(c, h), P1: r2.Add(c, h)}
	}
	return segs
}

// distToSegment is the distance from p to segment s (plane geometry).
func distToSegment(p r2.Vec, s dfn.Segment) float64 {
	d := r2.Sub(s.P1, s.P0)
	t := 0.0
	if l2 := r2.Dot(d, d); l2 > 0 {
		t = math.Max(0, math.Min(1, r2.Dot(r2.Sub(p, s.P0), d)/l2))
	}
	return r2.Norm(r2.Sub(p, r2.Add(s.P0, r2.Scale(t, d))))
}

// The sweep against a Monte Carlo estimate: N uniform points in the
// bounding box grown by r, the fraction p within r of a segment; the
// estimate p·A_box has the binomial standard error A_box·√(p(1−p)/N)
// (common practice, no source). 4σ keeps a false failure below 1e-4.
func TestAreaMonteCarlo(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	segs := network(rng, 60)
	const r, n = 4.0, 400_000
	got, err := Area(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := r2.Vec{X: math.Inf(1), Y: math.Inf(1)}, r2.Vec{X: math.Inf(-1), Y: math.Inf(-1)}
	for _, s := range segs {
		for _, p := range []r2.Vec{s.P0, s.P1} {
			lo = r2.Vec{X: math.Min(lo.X, p.X-r), Y: math.Min(lo.Y, p.Y-r)}
			hi = r2.Vec{X: math.Max(hi.X, p.X+r), Y: math.Max(hi.Y, p.Y+r)}
		}
	}
	in := 0
	for range n {
		p := r2.Vec{X: lo.X + rng.Float64()*(hi.X-lo.X), Y: lo.Y + rng.Float64()*(hi.Y-lo.Y)}
		for _, s := range segs {
			if distToSegment(p, s) <= r {
				in++
				break
			}
		}
	}
	box := (hi.X - lo.X) * (hi.Y - lo.Y)
	frac := float64(in) / n
	if in == 0 || in == n {
		t.Fatalf("Monte Carlo fraction %g: the test box is wrong", frac)
	}
	sigma := box * math.Sqrt(frac*(1-frac)/n)
	numtest.Abs(t, "area against Monte Carlo", got, frac*box, 4*sigma)
}
