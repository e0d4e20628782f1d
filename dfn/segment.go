package dfn

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

// GeomTol is the distance, m, within which two map-view points or a point
// and a line count as coincident in the trace predicates. Coordinates are
// at most ~10⁵ m, where float64 spacing is ~10⁻¹¹ m, so 1 nm is far above
// rounding and far below any physical length (common practice, no source).
const GeomTol = 1e-9

// Crossing is where two segments meet: the point and its positions along
// each as fractions of their length from P0.
type Crossing struct {
	Point r2.Vec
	S, T  float64 // along the first and the second segment
}

// IntersectSegments returns where a and b meet, if they do. Cases, in the
// order they are decided:
//
//   - bounding boxes farther apart than GeomTol: no crossing;
//   - a segment shorter than GeomTol is a point: it meets the other where
//     that point lies within GeomTol of it;
//   - collinear (both ends of one within GeomTol of the other's line):
//     if the projections overlap (touching ends included), the crossing is
//     the midpoint of the overlap; otherwise none;
//   - otherwise, with the signed distances of a's ends from b's line and of
//     b's ends from a's line (an end within GeomTol counts as on the line),
//     the segments meet when neither pair has both ends strictly on one
//     side: a proper crossing, an end on the other's interior (T-junction)
//     or shared ends. An end on the line is the crossing itself (S or T
//     exactly 0 or 1).
//
// The point is computed on a; results are deterministic for a given
// argument order.
func IntersectSegments(a, b Segment) (Crossing, bool) {
	if math.Max(a.P0.X, a.P1.X) < math.Min(b.P0.X, b.P1.X)-GeomTol ||
		math.Max(b.P0.X, b.P1.X) < math.Min(a.P0.X, a.P1.X)-GeomTol ||
		math.Max(a.P0.Y, a.P1.Y) < math.Min(b.P0.Y, b.P1.Y)-GeomTol ||
		math.Max(b.P0.Y, b.P1.Y) < math.Min(a.P0.Y, a.P1.Y)-GeomTol {
		return Crossing{}, false
	}
	da, db := r2.Sub(a.P1, a.P0), r2.Sub(b.P1, b.P0)
	la, lb := r2.Norm(da), r2.Norm(db)
	switch {
	case la <= GeomTol && lb <= GeomTol:
		if r2.Norm(r2.Sub(a.P0, b.P0)) <= GeomTol {
			return Crossing{Point: a.P0}, true
		}
		return Crossing{}, false
	case la <= GeomTol:
		t, ok := pointOnSegment(a.P0, b, db, lb)
		return Crossing{Point: a.P0, T: t}, ok
	case lb <= GeomTol:
		s, ok := pointOnSegment(b.P0, a, da, la)
		return Crossing{Point: r2.Add(a.P0, r2.Scale(s, da)), S: s}, ok
	}
	// Signed distances from the other segment's line.
	d1 := r2.Cross(db, r2.Sub(a.P0, b.P0)) / lb
	d2 := r2.Cross(db, r2.Sub(a.P1, b.P0)) / lb
	d3 := r2.Cross(da, r2.Sub(b.P0, a.P0)) / la
	d4 := r2.Cross(da, r2.Sub(b.P1, a.P0)) / la
	s1, s2, s3, s4 := side(d1), side(d2), side(d3), side(d4)
	if (s1 == 0 && s2 == 0) || (s3 == 0 && s4 == 0) {
		return collinearCrossing(a, b, da, db, la, lb)
	}
	if s1*s2 > 0 || s3*s4 > 0 {
		return Crossing{}, false
	}
	s := lineParam(d1, d2, s1, s2)
	t := lineParam(d3, d4, s3, s4)
	return Crossing{Point: r2.Add(a.P0, r2.Scale(s, da)), S: s, T: t}, true
}

// side classifies a signed distance: −1, 0 (within GeomTol) or +1.
func side(d float64) int {
	switch {
	case d > GeomTol:
		return 1
	case d < -GeomTol:
		return -1
	}
	return 0
}

// lineParam returns where, as a fraction from the first end, a segment
// whose ends are at signed distances d0 and d1 from a line meets it.
func lineParam(d0, d1 float64, s0, s1 int) float64 {
	switch {
	case s0 == 0:
		return 0
	case s1 == 0:
		return 1
	}
	return d0 / (d0 - d1)
}

// pointOnSegment reports whether p lies within GeomTol of segment s (of
// direction d and length l > GeomTol) and its position along s.
func pointOnSegment(p r2.Vec, s Segment, d r2.Vec, l float64) (float64, bool) {
	t := r2.Dot(r2.Sub(p, s.P0), d) / (l * l)
	t = math.Max(0, math.Min(1, t))
	q := r2.Add(s.P0, r2.Scale(t, d))
	return t, r2.Norm(r2.Sub(p, q)) <= GeomTol
}

// collinearCrossing handles two collinear segments: both are projected on
// the longer one's direction; if the projections overlap within GeomTol
// the crossing is the midpoint of the overlap.
func collinearCrossing(a, b Segment, da, db r2.Vec, la, lb float64) (Crossing, bool) {
	dir := r2.Scale(1/la, da)
	if lb > la {
		dir = r2.Scale(1/lb, db)
	}
	pa0, pa1 := r2.Dot(a.P0, dir), r2.Dot(a.P1, dir)
	pb0, pb1 := r2.Dot(b.P0, dir), r2.Dot(b.P1, dir)
	lo := math.Max(math.Min(pa0, pa1), math.Min(pb0, pb1))
	hi := math.Min(math.Max(pa0, pa1), math.Max(pb0, pb1))
	if hi < lo-GeomTol {
		return Crossing{}, false
	}
	m := (lo + hi) / 2
	s := math.Max(0, math.Min(1, (m-pa0)/(pa1-pa0)))
	t := math.Max(0, math.Min(1, (m-pb0)/(pb1-pb0)))
	return Crossing{Point: r2.Add(a.P0, r2.Scale(s, da)), S: s, T: t}, true
}
