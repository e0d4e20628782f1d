package footprint

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/spatial/r2"
)

// chain joins the outline edges into closed rings of points (local
// coordinates, not repeating the first point). Edges meet at vertices
// with identical coordinates; where several leave one vertex (two parts of
// the region touching at a point) the ring takes the leftmost turn, so it
// goes round the smallest face and touching parts stay separate rings.
// Consecutive edges on one end function become one piece, and arcs become
// chords of angle at most step.
func chain(sw *sweep, edges []oedge, step float64) [][]r2.Vec {
	ids := make(map[r2.Vec]int32)
	vid := func(p r2.Vec) int32 {
		id, ok := ids[p]
		if !ok {
			id = int32(len(ids))
			ids[p] = id
		}
		return id
	}
	from, to := make([]int32, len(edges)), make([]int32, len(edges))
	for i, e := range edges {
		from[i], to[i] = vid(e.from), vid(e.to)
	}
	// Outgoing edges of each vertex, in edge order (CSR).
	start := make([]int32, len(ids)+1)
	for _, v := range from {
		start[v+1]++
	}
	for v := 1; v < len(start); v++ {
		start[v] += start[v-1]
	}
	out, next := make([]int32, len(edges)), append([]int32(nil), start[:len(ids)]...)
	for i, v := range from {
		out[next[v]] = int32(i)
		next[v]++
	}
	used := make([]bool, len(edges))
	var rings [][]r2.Vec
	var ring []int32
	for e0 := range edges {
		if used[e0] {
			continue
		}
		used[e0] = true
		ring = append(ring[:0], int32(e0))
		for e := int32(e0); to[e] != from[e0]; {
			e = sw.leftmost(edges, e, out[start[to[e]]:start[to[e]+1]], used)
			if e < 0 {
				ring = ring[:0] // an open chain: not a ring
				break
			}
			used[e] = true
			ring = append(ring, e)
		}
		if len(ring) > 0 {
			rings = append(rings, sw.ringPoints(edges, ring, step))
		}
	}
	return rings
}

// leftmost returns the unused edge among cand that turns most to the left
// after edge e, or −1 if none is left.
func (sw *sweep) leftmost(edges []oedge, e int32, cand []int32, used []bool) int32 {
	din := sw.direction(edges[e], true)
	best, bestTurn := int32(-1), math.Inf(-1)
	for _, c := range cand {
		if used[c] {
			continue
		}
		d := sw.direction(edges[c], false)
		if turn := math.Atan2(r2.Cross(din, d), r2.Dot(din, d)); turn > bestTurn {
			best, bestTurn = c, turn
		}
	}
	return best
}

// direction returns the unit direction of travel along e at its end (or
// start).
func (sw *sweep) direction(e oedge, atEnd bool) r2.Vec {
	if e.fn.kind == flat {
		d := r2.Sub(e.to, e.from)
		return r2.Scale(1/r2.Norm(d), d)
	}
	p := e.from
	if atEnd {
		p = e.to
	}
	return sw.st[e.fn.st].tangent(e.fn.kind, p)
}

// sameFn reports whether two edges lie on one end function.
func sameFn(a, b fnRef) bool {
	return a.kind == b.kind && (a.kind == flat || a.st == b.st)
}

// ringPoints returns the points of a ring of edges: one run of edges per
// end function, started where the function changes, with arcs cut into
// chords.
func (sw *sweep) ringPoints(edges []oedge, ring []int32, step float64) []r2.Vec {
	n := len(ring)
	first := 0
	for i := range n {
		if !sameFn(edges[ring[i]].fn, edges[ring[(i+n-1)%n]].fn) {
			first = i
			break
		}
	}
	var pts []r2.Vec
	for i := 0; i < n; {
		e := edges[ring[(first+i)%n]]
		j := i + 1
		for j < n && sameFn(edges[ring[(first+j)%n]].fn, e.fn) {
			j++
		}
		end := edges[ring[(first+j-1)%n]].to
		pts = append(pts, e.from)
		if isArc(e.fn.kind) {
			pts = sw.chords(pts, e.fn, e.from, end, step)
		}
		i = j
	}
	return dropCollinear(pts)
}

// dropCollinear removes the points of a closed ring that lie exactly on
// the line of their neighbours (r2.Cross of the two sides is 0): repeated
// points, points inside a straight run, and the tips of zero-width spikes,
// which a ring makes where it steps along a strip bound by a rounding
// step and back. Such points add no area, and a spike would make the
// ring touch itself (invalid in OGC simple features).
func dropCollinear(pts []r2.Vec) []r2.Vec {
	flat := func(a, b, c r2.Vec) bool { return r2.Cross(r2.Sub(b, a), r2.Sub(c, b)) == 0 }
	out := pts[:0]
	for _, p := range pts {
		out = append(out, p)
		for n := len(out); n >= 3 && flat(out[n-3], out[n-2], out[n-1]); n = len(out) {
			out = append(out[:n-2], out[n-1])
		}
	}
	// Across the ring's start: drop the last or the first point while it
	// is flat between its neighbours.
	for changed := true; changed && len(out) >= 3; {
		changed = false
		n := len(out)
		if flat(out[n-2], out[n-1], out[0]) {
			out, changed = out[:n-1], true
		} else if flat(out[n-1], out[0], out[1]) {
			out, changed = out[1:], true
		}
	}
	return out
}

// chords appends the inner points of the arc of fn from p to q, walked
// counter-clockwise, cut into equal chords of angle at most step. An arc
// of one end function spans at most half a circle, so a turn computed
// above 3π/2 is a rounding of a vanishing arc.
func (sw *sweep) chords(dst []r2.Vec, fn fnRef, p, q r2.Vec, step float64) []r2.Vec {
	c := sw.st[fn.st].centre(fn.kind)
	u, v := r2.Sub(p, c), r2.Sub(q, c)
	turn := math.Atan2(r2.Cross(u, v), r2.Dot(u, v))
	if turn < 0 {
		turn += 2 * math.Pi
	}
	if turn > 1.5*math.Pi {
		return dst
	}
	n := math.Ceil(turn / step)
	th := math.Atan2(u.Y, u.X)
	for k := 1.0; k < n; k++ {
		s, co := math.Sincos(th + k*turn/n)
		dst = append(dst, r2.Vec{X: c.X + sw.r*co, Y: c.Y + sw.r*s})
	}
	return dst
}

// ring is one closed ring with its signed area, bounding box and, once
// built, its band index.
type ring struct {
	pts    []r2.Vec
	area   float64
	lo, hi r2.Vec
	bands  [][]int32 // sides (by first point) crossing each horizontal band
}

// assemble sorts the rings into polygons: counter-clockwise rings are
// outer rings, clockwise ones holes of the smallest outer ring that holds
// them (tested at the middle of the hole's longest side, which no other
// ring touches). Rings thinner on average than tol (area ≤ tol·perimeter)
// are slivers of the vertex merging and are dropped. Points go back to
// map coordinates by toMap.
func assemble(rings [][]r2.Vec, toMap func(r2.Vec) r2.Vec, tol float64) orb.MultiPolygon {
	var shells, holes []ring
	for _, pts := range rings {
		if len(pts) < 3 {
			continue
		}
		rg := ring{pts: pts, lo: pts[0], hi: pts[0]}
		per := 0.0
		for i, p := range pts {
			q := pts[(i+1)%len(pts)]
			rg.area += 0.5 * r2.Cross(p, q)
			per += r2.Norm(r2.Sub(q, p))
			rg.lo = r2.Vec{X: min(rg.lo.X, p.X), Y: min(rg.lo.Y, p.Y)}
			rg.hi = r2.Vec{X: max(rg.hi.X, p.X), Y: max(rg.hi.Y, p.Y)}
		}
		switch {
		case math.Abs(rg.area) <= tol*per:
		case rg.area > 0:
			shells = append(shells, rg)
		default:
			holes = append(holes, rg)
		}
	}
	mp := make(orb.MultiPolygon, len(shells))
	for i, s := range shells {
		mp[i] = orb.Polygon{toOrb(s.pts, toMap)}
	}
	for _, h := range holes {
		p := probe(h.pts)
		best := -1
		for i := range shells {
			s := &shells[i]
			if p.X < s.lo.X || p.X > s.hi.X || p.Y < s.lo.Y || p.Y > s.hi.Y || !s.contains(p) {
				continue
			}
			if best < 0 || s.area < shells[best].area {
				best = i
			}
		}
		if best >= 0 {
			mp[best] = append(mp[best], toOrb(h.pts, toMap))
		}
	}
	return mp
}

// contains reports whether p lies inside the ring, by the parity of the
// ring's crossings of the ray from p towards +x (the crossing-number test;
// O'Rourke, J. 1998, Computational Geometry in C, 2nd ed., §7.4, from
// memory). Only the sides in p's horizontal band are tested: the ring's
// sides are indexed into about one band per 8 sides on first use, so
// testing many holes against one large outer ring stays linear.
func (rg *ring) contains(p r2.Vec) bool {
	n := len(rg.pts)
	if rg.bands == nil {
		rg.bands = make([][]int32, max(1, n/8))
		for i, a := range rg.pts {
			b := rg.pts[(i+1)%n]
			k0, k1 := rg.band(min(a.Y, b.Y)), rg.band(max(a.Y, b.Y))
			for k := k0; k <= k1; k++ {
				rg.bands[k] = append(rg.bands[k], int32(i))
			}
		}
	}
	in := false
	for _, i := range rg.bands[rg.band(p.Y)] {
		a, b := rg.pts[i], rg.pts[(int(i)+1)%n]
		if (a.Y > p.Y) != (b.Y > p.Y) && p.X < a.X+(p.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y) {
			in = !in
		}
	}
	return in
}

// band returns the band of height y (clamped to the ring's).
func (rg *ring) band(y float64) int {
	nb := len(rg.bands)
	h := (rg.hi.Y - rg.lo.Y) / float64(nb)
	if !(h > 0) {
		return 0
	}
	return max(0, min(nb-1, int((y-rg.lo.Y)/h)))
}

// probe returns the middle of the longest side of a ring.
func probe(pts []r2.Vec) r2.Vec {
	var best r2.Vec
	longest := -1.0
	for i, p := range pts {
		q := pts[(i+1)%len(pts)]
		if l := r2.Norm(r2.Sub(q, p)); l > longest {
			best, longest = r2.Scale(0.5, r2.Add(p, q)), l
		}
	}
	return best
}

// toOrb returns the ring as a closed orb.Ring in map coordinates.
// Points that become equal (a vanishing arc's chord point on a vertex, or
// points closer than the rounding of large coordinates) are kept once.
func toOrb(pts []r2.Vec, toMap func(r2.Vec) r2.Vec) orb.Ring {
	out := make(orb.Ring, 0, len(pts)+1)
	for _, p := range pts {
		q := toMap(p)
		out = append(out, orb.Point{q.X, q.Y})
	}
	out = slices.Compact(out)
	for len(out) > 1 && out[len(out)-1] == out[0] {
		out = out[:len(out)-1]
	}
	return append(out, out[0])
}
