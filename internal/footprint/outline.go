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
	tol := 8*math.Sqrt(epsilon*r*reg.scale) + 64*epsilon*reg.scale
	var edges []oedge
	var ws workspace
	for k := range len(reg.sw.lines) - 1 {
		edges = reg.sw.stripOutline(edges, k, &ws, tol)
	}
	rings := chain(reg.sw, edges, 2*math.Acos(1-s/r))
	return assemble(rings, reg.origin, tol), nil
}

// corner is a cell of a slab with its lower corners once known.
type corner struct {
	cell
	bl, br r2.Vec
}

// stripOutline appends the outline edges of strip k: the left and right
// ends of every cell that are not strip bounds, and the horizontal edges
// where the union's cross-section changes at a break height.
func (sw *sweep) stripOutline(dst []oedge, k int, ws *workspace, tol float64) []oedge {
	var prev, cur []corner
	var top float64
	sw.run(k, ws, tol, func(y0, y1 float64, cells []cell) {
		cur = cur[:0]
		for _, c := range cells {
			cur = append(cur, corner{cell: c})
		}
		dst = sw.line(dst, k, y0, prev, cur, tol)
		prev, cur = cur, prev
		top = y1
	})
	return sw.line(dst, k, top, prev, nil, tol)
}

// line handles the break height y between the cells below (whose lower
// corners are known) and above (whose lower corners it sets). The ends of
// both are evaluated at y, snapped to the strip bounds within tol and
// clustered along the line within tol, so that the two sides, and the
// neighbouring strip, name each vertex by the same coordinates. Where only
// one side covers a stretch of the line, that stretch is a horizontal edge;
// the cells below end here, so their sides become edges.
func (sw *sweep) line(dst []oedge, k int, y float64, below, above []corner, tol float64) []oedge {
	x0, x1 := sw.lines[k], sw.lines[k+1]
	type mark struct {
		x   float64
		ref *r2.Vec // the corner that takes the clustered vertex
		cov int     // +1/−1 below, +2/−2 above: coverage starts / stops
	}
	var marks []mark
	var tl, tr []r2.Vec // top corners of the cells below
	tl, tr = make([]r2.Vec, len(below)), make([]r2.Vec, len(below))
	for i := range below {
		marks = append(marks, mark{sw.snap(below[i].lo, y, x0, x1, tol), &tl[i], 1},
			mark{sw.snap(below[i].hi, y, x0, x1, tol), &tr[i], -1})
	}
	for i := range above {
		marks = append(marks, mark{sw.snap(above[i].lo, y, x0, x1, tol), &above[i].bl, 2},
			mark{sw.snap(above[i].hi, y, x0, x1, tol), &above[i].br, -2})
	}
	slices.SortStableFunc(marks, func(a, b mark) int { return cmpFloat(a.x, b.x) })
	// Clusters of marks closer than tol, each with its vertex.
	type cluster struct {
		end int // one past its last mark
		v   r2.Vec
	}
	var cl []cluster
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
		cl = append(cl, cluster{end: j, v: r2.Vec{X: rep, Y: y}})
		i = j
	}
	var nb, na int // cells below / above covering the stretch after a cluster
	i := 0
	for ci, c := range cl {
		for _, m := range marks[i:c.end] {
			*m.ref = c.v
			switch m.cov {
			case 1, -1:
				nb += m.cov
			default:
				na += m.cov / 2
			}
		}
		i = c.end
		if ci+1 < len(cl) && (nb > 0) != (na > 0) {
			v, w := c.v, cl[ci+1].v
			if nb > 0 { // region below only: the edge runs leftward
				v, w = w, v
			}
			dst = append(dst, oedge{from: v, to: w, fn: fnRef{st: -1, kind: flat}})
		}
	}
	for i, c := range below {
		if c.hi.kind != clipHi && c.br != tr[i] {
			dst = append(dst, oedge{from: c.br, to: tr[i], fn: c.hi})
		}
		if c.lo.kind != clipLo && tl[i] != c.bl {
			dst = append(dst, oedge{from: tl[i], to: c.bl, fn: c.lo})
		}
	}
	return dst
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
