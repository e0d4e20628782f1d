package footprint

import (
	"cmp"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/unionfind"
)

// EnvelopeArea returns the area, m², of the envelope of the region within
// r of the segments, for comparison with Area: the stadiums are grouped
// into connected parts, each part is replaced by the convex hull of its
// segments grown by r, and parts whose grown hulls overlap are joined and
// hulled again until none do. It is at least Area, and it also counts the
// unstimulated rock in the bays between fractures. Each grown hull H ⊕ rB
// of a convex polygon H has area A(H) + r·P(H) + πr² (Steiner formula, as
// for one stadium). The groups are also returned, as the number of
// disjoint envelopes.
func EnvelopeArea(segs []dfn.Segment, r float64) (area float64, groups int, err error) {
	reg, err := prepare(segs, r)
	if err != nil {
		return 0, 0, err
	}
	hulls := reg.sw.groupHulls()
	var sum neumaier
	for _, h := range hulls {
		a, p := polygonAreaPerimeter(h)
		sum.add(a + r*p + math.Pi*r*r)
	}
	return sum.value(), len(hulls), nil
}

// groupHulls returns the convex hulls of the connected groups of
// stadiums, joined until no two grown hulls overlap.
func (sw *sweep) groupHulls() [][]r2.Vec {
	n := len(sw.st)
	if n == 0 {
		return nil
	}
	// Stadiums touch when their segments are within 2r: found by the
	// same sweep over each strip's entries as the crossings.
	f := unionfind.New(n)
	var order, open []entry
	for s := range len(sw.lines) - 1 {
		order = append(order[:0], sw.ent[sw.start[s]:sw.start[s+1]]...)
		slices.SortFunc(order, func(a, b entry) int { return cmpFloat(a.lo, b.lo) })
		open = open[:0]
		for _, e := range order {
			open = slices.DeleteFunc(open, func(a entry) bool { return a.hi < e.lo })
			for _, a := range open {
				if !segmentsApart(&sw.st[a.st].frame, &sw.st[e.st].frame, 2*sw.r) {
					f.Union(a.st, e.st)
				}
			}
			open = append(open, e)
		}
	}
	labels, k := f.Labels()
	pts := make([][]r2.Vec, k)
	for i, l := range labels {
		pts[l] = append(pts[l], sw.st[i].a, sw.st[i].b)
	}
	hulls := make([][]r2.Vec, k)
	for i := range pts {
		hulls[i] = convexHull(pts[i])
	}
	// Join groups whose grown hulls overlap, until none do: each pass
	// sorts the hulls by their left end and compares a hull only with
	// those starting before its right end + 2r.
	d := 2 * sw.r
	for joined := true; joined; {
		joined = false
		slices.SortStableFunc(hulls, func(a, b []r2.Vec) int { return cmpFloat(hullBox(a)[0].X, hullBox(b)[0].X) })
		for i := 0; i < len(hulls); i++ {
			bi := hullBox(hulls[i])
			for j := i + 1; j < len(hulls); j++ {
				bj := hullBox(hulls[j])
				if bj[0].X > bi[1].X+d {
					break
				}
				if bj[0].Y > bi[1].Y+d || bi[0].Y > bj[1].Y+d || polygonsDist(hulls[i], hulls[j]) > d {
					continue
				}
				hulls[i] = convexHull(append(hulls[i], hulls[j]...))
				hulls = slices.Delete(hulls, j, j+1)
				bi, joined = hullBox(hulls[i]), true
				j = i
			}
		}
	}
	return hulls
}

// hullBox returns the lower-left and upper-right corners of the bounding
// box of pts.
func hullBox(pts []r2.Vec) [2]r2.Vec {
	b := [2]r2.Vec{pts[0], pts[0]}
	for _, p := range pts[1:] {
		b[0] = r2.Vec{X: min(b[0].X, p.X), Y: min(b[0].Y, p.Y)}
		b[1] = r2.Vec{X: max(b[1].X, p.X), Y: max(b[1].Y, p.Y)}
	}
	return b
}

// convexHull returns the convex hull of pts, counter-clockwise, without
// collinear points (Andrew, A.M. 1979, "Another efficient algorithm for
// convex hulls in two dimensions", Inf. Process. Lett. 9(5), 216–219: the
// monotone chain, from memory). One or two points are returned as they
// are (distinct ones).
func convexHull(pts []r2.Vec) []r2.Vec {
	p := slices.Clone(pts)
	slices.SortFunc(p, func(a, b r2.Vec) int {
		return cmp.Or(cmpFloat(a.X, b.X), cmpFloat(a.Y, b.Y))
	})
	p = slices.Compact(p)
	if len(p) < 3 {
		return p
	}
	h := make([]r2.Vec, 0, 2*len(p))
	for pass := range 2 {
		start := len(h)
		for _, q := range p {
			for len(h) >= start+2 && r2.Cross(r2.Sub(h[len(h)-1], h[len(h)-2]), r2.Sub(q, h[len(h)-1])) <= 0 {
				h = h[:len(h)-1]
			}
			h = append(h, q)
		}
		h = h[:len(h)-1] // the last point starts the other chain
		if pass == 0 {
			slices.Reverse(p)
		}
	}
	return h
}

// polygonAreaPerimeter returns the area and perimeter of a convex polygon
// (counter-clockwise); a segment (two points) has perimeter twice its
// length, a point none.
func polygonAreaPerimeter(h []r2.Vec) (area, perimeter float64) {
	if len(h) < 2 {
		return 0, 0
	}
	for i, p := range h {
		q := h[(i+1)%len(h)]
		area += 0.5 * r2.Cross(p, q)
		perimeter += r2.Norm(r2.Sub(q, p))
	}
	return area, perimeter
}

// polygonsDist returns the distance between two convex polygons (points
// and segments included): 0 if one holds a vertex of the other or their
// sides cross, else the least distance from a vertex of one to a side of
// the other.
func polygonsDist(p, q []r2.Vec) float64 {
	if inConvex(p[0], q) || inConvex(q[0], p) {
		return 0
	}
	d := math.Inf(1)
	for _, pair := range [2][2][]r2.Vec{{p, q}, {q, p}} {
		a, b := pair[0], pair[1]
		for i := range b {
			side := newFrame(b[i], b[(i+1)%len(b)])
			for _, v := range a {
				d = min(d, side.dist2(v))
			}
		}
	}
	for i := range p {
		for j := range q {
			var pts []r2.Vec
			pts = segmentsCross(pts, p[i], p[(i+1)%len(p)], q[j], q[(j+1)%len(q)])
			if len(pts) > 0 {
				return 0
			}
		}
	}
	return math.Sqrt(d)
}

// inConvex reports whether v lies inside or on the convex polygon h
// (counter-clockwise, at least three points).
func inConvex(v r2.Vec, h []r2.Vec) bool {
	if len(h) < 3 {
		return false
	}
	for i, p := range h {
		if r2.Cross(r2.Sub(h[(i+1)%len(h)], p), r2.Sub(v, p)) < 0 {
			return false
		}
	}
	return true
}
