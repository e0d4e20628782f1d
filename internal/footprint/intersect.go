package footprint

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"
)

// The crossings of two stadium boundaries are where the order of their end
// functions can change, so the sweep needs every one of them as a break
// height. A reported point that is not a true crossing only splits a slab
// in two, which costs time but not accuracy; a near-miss left out would
// leave two nearly equal functions in the wrong order over part of a slab,
// an error of the size of the thin lens between them. So the tests below
// err on the side of reporting: tangencies and near-tangencies within the
// relative slack nearSlack count as crossings.
const nearSlack = 1e-9

// boundaryCrossings appends the crossings of the boundaries of stadiums
// s and t (radius r): their long edges with each other, edges with the
// end circles, and the end circles with each other. The end circles are
// intersected whole, and the points that are not within onBoundary·r of
// both boundaries (those on the inner half of a circle, inside its own
// stadium) are dropped.
func boundaryCrossings(dst []r2.Vec, s, t *stadium, r float64) []r2.Vec {
	if segmentsApart(&s.frame, &t.frame, 2*r*(1+nearSlack)) {
		return dst // disjoint stadiums: no crossing
	}
	n := len(dst)
	dst = allCrossings(dst, s, t, r)
	tol := 2 * onBoundary * r * r // |d² − r²| ≈ 2r·|d − r|
	kept := slices.DeleteFunc(dst[n:], func(p r2.Vec) bool {
		return math.Abs(s.dist2(p)-r*r) > tol || math.Abs(t.dist2(p)-r*r) > tol
	})
	return dst[:n+len(kept)]
}

// onBoundary is the relative distance from a stadium's boundary within
// which a crossing counts as on it: generous, since a point kept in error
// only adds a break height.
const onBoundary = 1e-6

// dist2 returns the squared distance from p to the stadium's segment.
func (f *frame) dist2(p r2.Vec) float64 {
	d := r2.Sub(f.b, f.a)
	t := 0.0
	if l2 := r2.Dot(d, d); l2 > 0 {
		t = max(0, min(1, r2.Dot(r2.Sub(p, f.a), d)/l2))
	}
	v := r2.Sub(p, r2.Add(f.a, r2.Scale(t, d)))
	return r2.Dot(v, v)
}

// segmentsApart reports whether the segments of f and g are more than d
// apart. Segments that do not cross are closest at an end of one of them
// (plane geometry), so the distance is the least of the four end-to-
// segment distances; crossing segments are never apart.
func segmentsApart(f, g *frame, d float64) bool {
	d2 := d * d
	if f.dist2(g.a) <= d2 || f.dist2(g.b) <= d2 || g.dist2(f.a) <= d2 || g.dist2(f.b) <= d2 {
		return false
	}
	u, v := r2.Sub(f.b, f.a), r2.Sub(g.b, g.a)
	s1, s2 := r2.Cross(u, r2.Sub(g.a, f.a)), r2.Cross(u, r2.Sub(g.b, f.a))
	s3, s4 := r2.Cross(v, r2.Sub(f.a, g.a)), r2.Cross(v, r2.Sub(f.b, g.a))
	return !(s1*s2 <= 0 && s3*s4 <= 0)
}

// allCrossings appends every crossing of the stadiums' edges and whole end
// circles.
func allCrossings(dst []r2.Vec, s, t *stadium, r float64) []r2.Vec {
	se, ns := s.edges(r)
	te, nt := t.edges(r)
	sc, ms := s.circles()
	tc, mt := t.circles()
	for _, e := range se[:ns] {
		for _, g := range te[:nt] {
			dst = segmentsCross(dst, e[0], e[1], g[0], g[1])
		}
		for _, c := range tc[:mt] {
			dst = segmentCircle(dst, e[0], e[1], c, r)
		}
	}
	for _, c := range sc[:ms] {
		for _, g := range te[:nt] {
			dst = segmentCircle(dst, g[0], g[1], c, r)
		}
		for _, k := range tc[:mt] {
			dst = circlesCross(dst, c, k, r)
		}
	}
	return dst
}

// edges returns the two long edges and their number (none for a point).
func (s *stadium) edges(r float64) (e [2][2]r2.Vec, n int) {
	f := &s.frame
	if f.a == f.b {
		return e, 0
	}
	rn := r2.Scale(r, f.n)
	e[0] = [2]r2.Vec{r2.Add(f.a, rn), r2.Add(f.b, rn)}
	e[1] = [2]r2.Vec{r2.Sub(f.a, rn), r2.Sub(f.b, rn)}
	return e, 2
}

// circles returns the end-circle centres and their number (one for a
// point).
func (s *stadium) circles() (c [2]r2.Vec, n int) {
	if s.a == s.b {
		return [2]r2.Vec{s.a}, 1
	}
	return [2]r2.Vec{s.a, s.b}, 2
}

// segmentsCross appends the crossing of segments p0–p1 and q0–q1, if they
// cross within nearSlack of their parameter ranges. Parallel segments
// (|sin| below 1e-14) are skipped: where parallel edges overlap their end
// functions coincide, and the overlap ends at tangent points that are break
// heights already.
func segmentsCross(dst []r2.Vec, p0, p1, q0, q1 r2.Vec) []r2.Vec {
	u, v, w := r2.Sub(p1, p0), r2.Sub(q1, q0), r2.Sub(q0, p0)
	den := r2.Cross(u, v)
	if math.Abs(den) <= 1e-14*r2.Norm(u)*r2.Norm(v) {
		return dst
	}
	a, b := r2.Cross(w, v)/den, r2.Cross(w, u)/den
	if a < -nearSlack || a > 1+nearSlack || b < -nearSlack || b > 1+nearSlack {
		return dst
	}
	return append(dst, r2.Add(p0, r2.Scale(a, u)))
}

// segmentCircle appends the points where segment p0–p1 meets the circle of
// centre c and radius r: the roots t of |p0 + t·u − c|² = r², i.e.
// A t² + 2B t + C = 0 with A = u·u, B = f·u, C = f·f − r², f = p0 − c.
// The roots are taken in the cancellation-free form q = −(B + sgn(B)·√D),
// t = q/A, t = C/q (Press et al. 2007, Numerical Recipes, 3rd ed., §5.6,
// section from memory);
// a discriminant D = B² − AC down to −nearSlack·(B² + |AC|) is a tangency.
func segmentCircle(dst []r2.Vec, p0, p1, c r2.Vec, r float64) []r2.Vec {
	u, f := r2.Sub(p1, p0), r2.Sub(p0, c)
	a, b, cc := r2.Dot(u, u), r2.Dot(f, u), r2.Dot(f, f)-r*r
	if a == 0 {
		return dst
	}
	disc := b*b - a*cc
	if disc < -nearSlack*(b*b+math.Abs(a*cc)) {
		return dst
	}
	q := -(b + math.Copysign(math.Sqrt(max(0, disc)), b))
	roots := [2]float64{q / a, math.NaN()}
	if q != 0 {
		roots[1] = cc / q
	}
	for _, t := range roots {
		if t >= -nearSlack && t <= 1+nearSlack {
			dst = append(dst, r2.Add(p0, r2.Scale(t, u)))
		}
	}
	return dst
}

// circlesCross appends the crossings of two circles of equal radius r:
// they lie on the perpendicular bisector of the centres, at ±h from the
// midpoint with h² = r² − d²/4. Equal centres are the same circle (no
// crossings); centres up to 2r·(1 + nearSlack) apart touch.
func circlesCross(dst []r2.Vec, c, k r2.Vec, r float64) []r2.Vec {
	dv := r2.Sub(k, c)
	d2 := r2.Dot(dv, dv)
	if d2 == 0 || d2 > 4*r*r*(1+nearSlack) {
		return dst
	}
	m := r2.Scale(0.5, r2.Add(c, k))
	h := math.Sqrt(max(0, r*r-d2/4) / d2)
	off := r2.Vec{X: -dv.Y * h, Y: dv.X * h}
	return append(dst, r2.Add(m, off), r2.Sub(m, off))
}
