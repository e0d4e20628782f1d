package footprint

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
)

// DefaultSagitta is the default largest sagitta of the outline's chords,
// as a fraction of the radius: 1e-3·r takes 70 chords per full circle and
// loses at most 0.07 % of r per metre of arc.
const DefaultSagitta = 1e-3

// OutlineOptions sets how the outline's arcs become chords.
type OutlineOptions struct {
	// Sagitta is the largest distance, m, between an arc of the boundary
	// and the chord that replaces it, in (0, r]. Zero means
	// DefaultSagitta·r.
	Sagitta float64
}

// flat marks a horizontal outline edge (a fnRef kind after clipHi).
const flat = clipHi + 1

// oedge is a directed piece of the outline, region on its left, from one
// vertex to another along one end function (or flat).
type oedge struct {
	from, to r2.Vec
	fn       fnRef
}

// Outline returns the boundary of the union of the stadiums (the region
// whose area Area returns) as polygons with holes, in the segments'
// coordinates: outer rings counter-clockwise, holes clockwise, each ring
// closed (RFC 7946 §3.1.6 winding). Every vertex lies on the exact
// boundary and every circular arc becomes chords of sagitta at most
// opt.Sagitta, so the polygons are inscribed: their area is below Area by
// at most ⅔·Sagitta per metre of arc on the boundary (a circular segment
// of chord c and sagitta s has area < ⅔·c·s), and by nothing along the
// straight edges. Vertices closer than a merge distance of about
// 8·√(ε·r·L) (ε = 2⁻⁵³, L the extent of the segments; micrometres for
// kilometre maps) are joined, and so are gaps narrower than it. Polygons
// come in a deterministic order (left to right by strip, then bottom to
// top); a hole belongs to the smallest outer ring around it.
func Outline(segs []dfn.Segment, r float64, opt OutlineOptions) (orb.MultiPolygon, error) {
	reg, err := prepare(segs, r)
	if err != nil {
		return nil, err
	}
	s := opt.Sagitta
	if s == 0 {
		s = DefaultSagitta * r
	}
	if !(s > 0 && s <= r) {
		return nil, fmt.Errorf("footprint: sagitta = %g m: must be in (0, %g] (the radius)", opt.Sagitta, r)
	}
	tol := reg.mergeDistance()
	// Strips in parallel, their edges joined in strip order.
	parts := make([][]oedge, len(reg.sw.lines)-1)
	reg.sw.eachStrip(func(k int, ws *workspace) {
		var o outliner
		parts[k] = reg.sw.stripOutline(nil, k, ws, &o, tol)
	})
	edges := slices.Concat(parts...)
	rings := chain(reg.sw, edges, 2*math.Acos(1-s/r))
	return assemble(rings, reg.toMap, tol), nil
}

// corner is a cell of a slab with the open ends of its side edges: rs is
// where its right edge (walked upward) starts, le where its left edge
// (walked downward) ends. Both are lower corners of the cell, or of a
// cell below on the same end functions that it continues.
type corner struct {
	cell
	rs, le r2.Vec
}

// mark is one end of a cell on a break height.
type mark struct {
	x     float64
	cell  int  // index in below or above
	above bool // a cell above the line (else below)
	hi    bool // its right end (else left)
}

// outliner is the scratch memory of one strip's outline.
type outliner struct {
	marks      []mark
	ends       []int    // one past the last mark of each cluster
	verts      []r2.Vec // the vertex of each cluster
	prev, cur  []corner
	topL, topR []r2.Vec // upper corners of the cells below the line
}

// stripOutline appends the outline edges of strip k: the left and right
// ends of every cell that are not strip bounds, and the horizontal edges
// where the union's cross-section changes at a break height.
func (sw *sweep) stripOutline(dst []oedge, k int, ws *workspace, o *outliner, tol float64) []oedge {
	o.prev, o.cur = o.prev[:0], o.cur[:0]
	var top float64
	sw.run(k, ws, tol, func(y0, y1 float64, cells []cell) {
		o.cur = o.cur[:0]
		for _, c := range cells {
			o.cur = append(o.cur, corner{cell: c})
		}
		dst = sw.line(dst, k, y0, o, tol)
		o.prev, o.cur = o.cur, o.prev
		top = y1
	})
	o.cur = o.cur[:0]
	return sw.line(dst, k, top, o, tol)
}

// line handles the break height y between the cells below (o.prev) and
// above (o.cur). The ends of both are evaluated at y, snapped to the strip
// bounds within tol and clustered along the line within tol, so that the
// two sides, and the neighbouring strip, name each vertex by the same
// coordinates. Where only one side covers a stretch of the line, that
// stretch is a horizontal edge. A side edge of a cell below goes on in the
// cell above when both lie on one end function and nothing else meets
// their vertex; otherwise it ends here and is appended.
func (sw *sweep) line(dst []oedge, k int, y float64, o *outliner, tol float64) []oedge {
	x0, x1 := sw.lines[k], sw.lines[k+1]
	below, above := o.prev, o.cur
	o.marks = o.marks[:0]
	for i, c := range below {
		o.marks = append(o.marks, mark{sw.snap(c.lo, y, x0, x1, tol), i, false, false},
			mark{sw.snap(c.hi, y, x0, x1, tol), i, false, true})
	}
	for i, c := range above {
		o.marks = append(o.marks, mark{sw.snap(c.lo, y, x0, x1, tol), i, true, false},
			mark{sw.snap(c.hi, y, x0, x1, tol), i, true, true})
	}
	marks := o.marks
	slices.SortStableFunc(marks, func(a, b mark) int { return cmpFloat(a.x, b.x) })
	o.ends, o.verts = o.ends[:0], o.verts[:0]
	for i := 0; i < len(marks); {
		j, rep := i+1, marks[i].x
		for j < len(marks) && marks[j].x-marks[j-1].x <= tol {
			j++
		}
		for _, m := range marks[i:j] {
			if m.x == x0 || m.x == x1 {
				rep = m.x
			}
		}
		o.ends, o.verts = append(o.ends, j), append(o.verts, r2.Vec{X: rep, Y: y})
		i = j
	}
	o.topL, o.topR = resize(o.topL, len(below)), resize(o.topR, len(below))
	var nb, na int // cells below / above covering the stretch after a cluster
	i := 0
	for ci, end := range o.ends {
		v := o.verts[ci]
		group := marks[i:end]
		for _, m := range group {
			switch {
			case !m.above && m.hi:
				o.topR[m.cell] = v
				nb--
			case !m.above:
				o.topL[m.cell] = v
				nb++
			case m.hi:
				above[m.cell].rs = v
				na--
			default:
				above[m.cell].le = v
				na++
			}
		}
		if len(group) == 2 {
			carry(group, below, above, o)
		}
		i = end
		if ci+1 < len(o.ends) && (nb > 0) != (na > 0) {
			from, to := v, o.verts[ci+1]
			if nb > 0 { // region below only: the edge runs leftward
				from, to = to, from
			}
			dst = append(dst, oedge{from: from, to: to, fn: fnRef{st: -1, kind: flat}})
		}
	}
	for i, c := range below {
		if c.hi.kind != clipHi && c.rs != o.topR[i] {
			dst = append(dst, oedge{from: c.rs, to: o.topR[i], fn: c.hi})
		}
		if c.lo.kind != clipLo && o.topL[i] != c.le {
			dst = append(dst, oedge{from: o.topL[i], to: c.le, fn: c.lo})
		}
	}
	return dst
}

// carry continues a side edge of a cell below in the cell above when the
// two marks of a vertex are that side of both on one end function: the
// edge's open end moves up (and the cell below's edge becomes empty).
func carry(group []mark, below, above []corner, o *outliner) {
	b, a := group[0], group[1]
	if b.above {
		b, a = a, b
	}
	if b.above || !a.above || a.hi != b.hi {
		return
	}
	lo, up := &below[b.cell], &above[a.cell]
	switch {
	case a.hi && sameFn(lo.hi, up.hi) && lo.hi.kind != clipHi:
		up.rs, o.topR[b.cell] = lo.rs, lo.rs
	case !a.hi && sameFn(lo.lo, up.lo) && lo.lo.kind != clipLo:
		up.le, o.topL[b.cell] = lo.le, lo.le
	}
}

// resize returns s with length n (contents unspecified).
func resize(s []r2.Vec, n int) []r2.Vec {
	if cap(s) < n {
		return make([]r2.Vec, n)
	}
	return s[:n]
}

// snap returns end function f at y, set to the strip bound it lies within
// tol of.
func (sw *sweep) snap(f fnRef, y, x0, x1, tol float64) float64 {
	x := sw.at(f, y, x0, x1)
	switch {
	case x-x0 <= tol:
		return x0
	case x1-x <= tol:
		return x1
	}
	return x
}
