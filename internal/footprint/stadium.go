package footprint

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

// frame describes one stadium (the points within r of the segment a–b)
// as seen by a sweep along y: a is the lower end (a.Y < b.Y, or a.Y = b.Y
// and a.X ≤ b.X) and n = (−d.Y, d.X) the left unit normal of the direction
// d from a to b (d = (1, 0) for a point). Because d.Y ≥ 0, n.X ≤ 0: n
// points to the −x side.
//
// The horizontal cross-section of a stadium at height y is one interval
// [left(y), right(y)] (a stadium is convex). Its left end runs, bottom to
// top, along three pieces, split at the heights of the tangent points
// a + r·n and b + r·n where the long edge leaves the end circles:
//
//	y < a.Y + r·n.Y:            x = a.X − √(r² − (y − a.Y)²)   (arc of the circle at a)
//	a.Y + r·n.Y ≤ y < b.Y + r·n.Y:  the straight edge from a + r·n to b + r·n
//	y ≥ b.Y + r·n.Y:            x = b.X − √(r² − (y − b.Y)²)   (arc of the circle at b)
//
// and the right end likewise with −n and +√. The arcs are the left (or
// right) halves of the end circles because n.X ≤ 0 puts the tangent point
// a + r·n on the left half. For a horizontal segment the edge piece is
// empty (a.Y + r·n.Y = b.Y + r·n.Y) and the ends are the outer halves of
// the two circles, as they must be.
type frame struct {
	a, b, n r2.Vec
}

// newFrame returns the frame of the segment p–q.
func newFrame(p, q r2.Vec) frame {
	if q.Y < p.Y || (q.Y == p.Y && q.X < p.X) {
		p, q = q, p
	}
	d := r2.Sub(q, p)
	l := r2.Norm(d)
	if l == 0 {
		return frame{a: p, b: q, n: r2.Vec{X: 0, Y: 1}}
	}
	return frame{a: p, b: q, n: r2.Vec{X: -d.Y / l, Y: d.X / l}}
}

// swap exchanges x and y.
func swap(p r2.Vec) r2.Vec { return r2.Vec{X: p.Y, Y: p.X} }

// Piece kinds of an end function. The first three are the left end, the
// next three the right end (in the order they are met going up); the last
// two are the strip bounds that clip an interval.
const (
	leftArcA uint8 = iota
	leftEdge
	leftArcB
	rightArcA
	rightEdge
	rightArcB
	clipLo
	clipHi
)

// pieceAt returns the piece of the given side (0 left, 1 right) that
// holds height y. At a break height both neighbouring pieces give the same
// x, except at the flat edge of a horizontal segment (n = (0, 1)): there
// the left end is at the top, where the closed stadium's cross-section is
// the whole edge and its left end is a.X, which arc A gives (hence ≤ on
// the left); the right end is at the bottom, where arc B gives b.X.
func (f *frame) pieceAt(side int, r, y float64) uint8 {
	s := r * f.n.Y
	if side == 1 {
		s = -s
	}
	base := uint8(3 * side)
	switch {
	case y < f.a.Y+s || (side == 0 && y == f.a.Y+s):
		return base
	case y < f.b.Y+s:
		return base + 1
	}
	return base + 2
}

// value returns the x of the given piece at height y. Arcs are clamped to
// their circle's height range, edges to their ends.
func (f *frame) value(kind uint8, r, y float64) float64 {
	switch kind {
	case leftArcA:
		return f.a.X - halfChord(r, y-f.a.Y)
	case leftArcB:
		return f.b.X - halfChord(r, y-f.b.Y)
	case rightArcA:
		return f.a.X + halfChord(r, y-f.a.Y)
	case rightArcB:
		return f.b.X + halfChord(r, y-f.b.Y)
	case leftEdge:
		return edgeX(f.a, f.b, r2.Scale(r, f.n), y)
	case rightEdge:
		return edgeX(f.a, f.b, r2.Scale(-r, f.n), y)
	}
	panic("footprint: value of a clip piece")
}

// cross returns the cross-section [lo, hi] of the stadium at height y,
// which must lie in [a.Y − r, b.Y + r].
func (f *frame) cross(r, y float64) (lo, hi float64) {
	return f.value(f.pieceAt(0, r, y), r, y), f.value(f.pieceAt(1, r, y), r, y)
}

// halfChord returns √(r² − t²), the half-width of a circle of radius r at
// offset t from its centre (0 beyond the circle). (r − t)(r + t) keeps
// the relative accuracy near t = ±r that r² − t² loses.
func halfChord(r, t float64) float64 {
	t = max(-r, min(r, t))
	return math.Sqrt((r - t) * (r + t))
}

// edgeX returns the x at height y of the edge from a + o to b + o
// (clamped to its ends); a flat edge returns its lower-x end.
func edgeX(a, b, o r2.Vec, y float64) float64 {
	p, q := r2.Add(a, o), r2.Add(b, o)
	if q.Y <= p.Y {
		return min(p.X, q.X)
	}
	t := max(0, min(1, (y-p.Y)/(q.Y-p.Y)))
	return p.X + t*(q.X-p.X)
}

// arcIntegral returns ∫ √(r² − (y − c)²) dy over [y0, y1] with
// t = y − c: the antiderivative is F(t) = ½(t·s + r²·asin(t/r)),
// s = √(r² − t²), since F′ = ½(s − t²/s + r²/s) = ½(s + s) = s (derived
// here). The difference of the asin terms is taken as one atan2 of the
// angle between the two radii, so a thin slab keeps its relative
// accuracy:
//
//	asin(t1/r) − asin(t0/r) = atan2(t1·s0 − t0·s1, s0·s1 + t0·t1),  s = √(r² − t²).
func arcIntegral(r, t0, t1 float64) float64 {
	t0 = max(-r, min(r, t0))
	t1 = max(-r, min(r, t1))
	s0, s1 := halfChord(r, t0), halfChord(r, t1)
	dphi := math.Atan2(t1*s0-t0*s1, s0*s1+t0*t1)
	return 0.5 * (t1*s1 - t0*s0 + r*r*dphi)
}

// integral returns ∫ (x(y) − x0) dy over [y0, y1] for a stadium piece:
// exact for an edge (x is linear in y, so the midpoint rule is exact) and
// closed-form for an arc (arcIntegral).
func (f *frame) integral(kind uint8, r, y0, y1, x0 float64) float64 {
	h := y1 - y0
	switch kind {
	case leftArcA:
		return (f.a.X-x0)*h - arcIntegral(r, y0-f.a.Y, y1-f.a.Y)
	case leftArcB:
		return (f.b.X-x0)*h - arcIntegral(r, y0-f.b.Y, y1-f.b.Y)
	case rightArcA:
		return (f.a.X-x0)*h + arcIntegral(r, y0-f.a.Y, y1-f.a.Y)
	case rightArcB:
		return (f.b.X-x0)*h + arcIntegral(r, y0-f.b.Y, y1-f.b.Y)
	}
	return (f.value(kind, r, 0.5*(y0+y1)) - x0) * h
}

// stadium is one segment's region in the sweep: its frame and extent.
type stadium struct {
	frame
	// Bounding box of the stadium.
	xmin, xmax, ymin, ymax float64
	// vert is the frame with x and y swapped, for vertical cross-sections.
	vert frame
}

func newStadium(p, q r2.Vec, r float64) stadium {
	f := newFrame(p, q)
	v := newFrame(swap(p), swap(q))
	return stadium{
		frame: f, vert: v,
		xmin: v.a.Y - r, xmax: v.b.Y + r,
		ymin: f.a.Y - r, ymax: f.b.Y + r,
	}
}

// column returns the vertical cross-section [lo, hi] of the stadium at x,
// clamped to its x-range.
func (s *stadium) column(r, x float64) (lo, hi float64) {
	x = max(s.xmin, min(s.xmax, x))
	return s.vert.cross(r, x)
}

// keyPoints appends the stadium's extreme points (bottom, top, leftmost,
// rightmost: the first four, which bound its extent in a strip) and then
// the four tangent points where its end functions change piece.
func (s *stadium) keyPoints(dst []r2.Vec, r float64) []r2.Vec {
	f := &s.frame
	rn := r2.Scale(r, f.n)
	return append(dst,
		r2.Vec{X: f.a.X, Y: s.ymin}, r2.Vec{X: f.b.X, Y: s.ymax},
		r2.Vec{X: s.xmin, Y: s.vert.a.X}, r2.Vec{X: s.xmax, Y: s.vert.b.X},
		r2.Add(f.a, rn), r2.Add(f.b, rn), r2.Sub(f.a, rn), r2.Sub(f.b, rn))
}

// tangent returns the unit direction of travel at p along a piece walked
// with the region on its left: right ends upward, left ends downward, so
// every arc is walked counter-clockwise about its centre.
func (f *frame) tangent(kind uint8, p r2.Vec) r2.Vec {
	d := r2.Vec{X: f.n.Y, Y: -f.n.X}
	switch kind {
	case leftEdge:
		return r2.Scale(-1, d)
	case rightEdge:
		return d
	}
	c := f.a
	if kind == leftArcB || kind == rightArcB {
		c = f.b
	}
	v := r2.Sub(p, c)
	if n := r2.Norm(v); n > 0 {
		return r2.Vec{X: -v.Y / n, Y: v.X / n}
	}
	return r2.Vec{X: 1}
}

// centre returns the circle centre of an arc piece.
func (f *frame) centre(kind uint8) r2.Vec {
	if kind == leftArcB || kind == rightArcB {
		return f.b
	}
	return f.a
}

// isArc reports whether kind is an arc piece.
func isArc(kind uint8) bool {
	return kind == leftArcA || kind == leftArcB || kind == rightArcA || kind == rightArcB
}
