package gis

import (
	"fmt"
	"math"
	"math/bits"
	"slices"

	"github.com/paulmach/orb"
)

// Directions of grid edges, counter-clockwise from east: turning left is
// d+1, turning right d+3 (mod 4).
const (
	dirEast = iota
	dirNorth
	dirWest
	dirSouth
)

// Outline returns the boundary of the union of the grid cells where mask
// is true (mask in grid order, index j·Cols + i, row 0 the south row) as
// polygons in local coordinates: exterior rings counter-clockwise, holes
// clockwise, vertices only where the boundary turns (collinear edges
// merged), each ring starting at its lowest, then westernmost vertex and
// closed. A mask with no true cell gives an empty MultiPolygon.
//
// Cells are connected through their sides only (4-connectivity). Two
// cells that share only a corner belong to different polygons, which
// touch at that point; likewise two background regions that meet at a
// corner give two rings touching at one point. No ring passes through a
// vertex twice, so every ring is simple and the result is valid in the
// OGC Simple Features sense (rings of one polygon and different polygons
// may touch at isolated points).
//
// The total area of the result equals the number of true cells times
// CellArea. Polygons are ordered by the position of their first vertex
// (south to north, then west to east), as are the holes of each polygon.
func Outline(g Grid, mask []bool) (orb.MultiPolygon, error) {
	if err := g.validate(len(mask)); err != nil {
		return nil, err
	}
	t := newTracer(g, mask)
	return t.polygons(), nil
}

// ThresholdOutline returns the Outline of the cells whose value is at
// least level (NaN cells are outside).
func ThresholdOutline(g Grid, values []float64, level float64) (orb.MultiPolygon, error) {
	if math.IsNaN(level) {
		return nil, fmt.Errorf("gis: threshold level is NaN")
	}
	if err := g.validate(len(values)); err != nil {
		return nil, err
	}
	mask := make([]bool, len(values))
	for k, v := range values {
		mask[k] = v >= level
	}
	return Outline(g, mask)
}

// ContourLayer returns a MULTIPOLYGON layer with one feature per level:
// the ThresholdOutline of values at that level, with fields "level" (the
// level) and "area_m2" (the outlined area, m²). For probability grids,
// levels 0.1, 0.5 and 0.9 give the 10/50/90 % outlines.
func ContourLayer(name, description string, g Grid, values []float64, levels []float64) (Layer, error) {
	l := Layer{
		Name: name, Description: description, Geometry: MultiPolygon,
		Fields: []Field{{"level", Real}, {"area_m2", Real}},
	}
	for _, level := range levels {
		if math.IsNaN(level) || math.IsInf(level, 0) {
			return Layer{}, fmt.Errorf("gis: contour layer %q: level %v is not finite", name, level)
		}
		mp, err := ThresholdOutline(g, values, level)
		if err != nil {
			return Layer{}, fmt.Errorf("gis: contour layer %q: %w", name, err)
		}
		l.Features = append(l.Features, Feature{Geometry: mp, Values: []any{level, multiPolygonArea(mp)}})
	}
	return l, l.validate()
}

// multiPolygonArea returns the area of mp, m² (shell areas minus holes).
func multiPolygonArea(mp orb.MultiPolygon) float64 {
	var a float64
	for _, p := range mp {
		for _, r := range p {
			a += signedArea(r)
		}
	}
	return a
}

// tracer follows the boundary edges of a cell mask.
type tracer struct {
	g    Grid
	mask []bool
	nvx  int     // vertices per row, Cols+1
	out  []uint8 // per vertex: bit d set if a boundary edge leaves in direction d
	used []uint8 // per vertex: bit d set once that edge is part of a ring
}

func newTracer(g Grid, mask []bool) *tracer {
	nvx := g.Cols + 1
	t := &tracer{g: g, mask: mask, nvx: nvx,
		out:  make([]uint8, nvx*(g.Rows+1)),
		used: make([]uint8, nvx*(g.Rows+1)),
	}
	// Boundary edges run with the true cell on their left, so outer
	// boundaries go counter-clockwise and inner ones clockwise.
	for j := range g.Rows {
		for i := range g.Cols {
			if !t.cell(i, j) {
				continue
			}
			v := j*nvx + i // south-west corner of cell (i, j)
			if !t.cell(i, j-1) {
				t.out[v] |= 1 << dirEast
			}
			if !t.cell(i+1, j) {
				t.out[v+1] |= 1 << dirNorth
			}
			if !t.cell(i, j+1) {
				t.out[v+nvx+1] |= 1 << dirWest
			}
			if !t.cell(i-1, j) {
				t.out[v+nvx] |= 1 << dirSouth
			}
		}
	}
	return t
}

// cell reports whether cell (i, j) is inside the grid and true.
func (t *tracer) cell(i, j int) bool {
	return i >= 0 && j >= 0 && i < t.g.Cols && j < t.g.Rows && t.mask[j*t.g.Cols+i]
}

// step returns the vertex one edge from v in direction d.
func (t *tracer) step(v, d int) int {
	switch d {
	case dirEast:
		return v + 1
	case dirNorth:
		return v + t.nvx
	case dirWest:
		return v - 1
	}
	return v - t.nvx
}

// next chooses the edge leaving vertex v after arriving in direction d:
// left turn first, then straight, then right. At a saddle vertex (two
// edges leave) the left turn keeps to the same cell, which separates
// diagonal neighbours.
func (t *tracer) next(v, d int) int {
	for _, nd := range [3]int{(d + 1) & 3, d, (d + 3) & 3} {
		if t.out[v]&(1<<nd) != 0 {
			return nd
		}
	}
	panic("gis: outline boundary edge has no successor")
}

// trace follows the ring that starts with edge (v0, d0) and returns its
// vertices (without repeating the first), marking the edges used.
func (t *tracer) trace(v0, d0 int) []int {
	ring := []int{v0}
	v, d := v0, d0
	for {
		t.used[v] |= 1 << d
		v = t.step(v, d)
		d = t.next(v, d)
		if v == v0 && d == d0 {
			return ring
		}
		ring = append(ring, v)
	}
}

// rings traces every boundary ring and splits those that pass through a
// saddle vertex twice.
func (t *tracer) rings() [][]int {
	var out [][]int
	for v := range t.out {
		for d := range 4 {
			if t.out[v]&^t.used[v]&(1<<d) != 0 {
				out = append(out, t.split(t.trace(v, d))...)
			}
		}
	}
	return out
}

// split cuts a ring at every vertex it visits twice (only saddle vertices,
// which have two outgoing edges, can repeat) into simple rings.
func (t *tracer) split(ring []int) [][]int {
	var done [][]int
	stack := [][]int{ring}
	for len(stack) > 0 {
		r := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		p, q := t.repeat(r)
		if p < 0 {
			done = append(done, r)
			continue
		}
		a := slices.Clone(r[p:q])
		b := append(slices.Clone(r[q:]), r[:p]...)
		stack = append(stack, a, b)
	}
	return done
}

// repeat returns the first pair of positions p < q with r[p] == r[q], or
// −1, −1.
func (t *tracer) repeat(r []int) (int, int) {
	var seen map[int]int
	for k, v := range r {
		if bits.OnesCount8(t.out[v]) < 2 {
			continue
		}
		if seen == nil {
			seen = map[int]int{}
		}
		if p, ok := seen[v]; ok {
			return p, k
		}
		seen[v] = k
	}
	return -1, -1
}

// leftCell returns the index of the true cell on the left of the first
// edge of a traced ring (consecutive vertices one edge apart).
func (t *tracer) leftCell(r []int) int {
	v, w := r[0], r[1%len(r)]
	i, j := v%t.nvx, v/t.nvx
	switch w - v {
	case 1: // east: the cell north of the edge
	case t.nvx: // north: the cell west of the edge
		i--
	case -1: // west: the cell south of the edge
		i, j = i-1, j-1
	default: // south: the cell east of the edge
		j--
	}
	return j*t.g.Cols + i
}

// polygons assembles the rings into polygons: each 4-connected component
// of true cells has one counter-clockwise shell and any number of
// clockwise holes.
func (t *tracer) polygons() orb.MultiPolygon {
	labels := t.components()
	type poly struct {
		shell []int
		holes [][]int
	}
	byLabel := map[int]*poly{}
	var order []int
	for _, raw := range t.rings() {
		lab := labels[t.leftCell(raw)]
		r := t.corners(raw)
		p := byLabel[lab]
		if p == nil {
			p = &poly{}
			byLabel[lab] = p
			order = append(order, lab)
		}
		if t.area2(r) > 0 {
			if p.shell != nil {
				panic("gis: outline component with two shells")
			}
			p.shell = r
		} else {
			p.holes = append(p.holes, r)
		}
	}
	slices.SortFunc(order, func(a, b int) int { return byLabel[a].shell[0] - byLabel[b].shell[0] })
	mp := orb.MultiPolygon{}
	for _, lab := range order {
		p := byLabel[lab]
		if p.shell == nil {
			panic("gis: outline component without a shell")
		}
		slices.SortFunc(p.holes, func(a, b []int) int { return a[0] - b[0] })
		poly := orb.Polygon{t.ring(p.shell)}
		for _, h := range p.holes {
			poly = append(poly, t.ring(h))
		}
		mp = append(mp, poly)
	}
	return mp
}

// corners drops the vertices where the ring goes straight on and rotates
// it to start at its lowest (smallest index: south, then west) vertex.
func (t *tracer) corners(r []int) []int {
	n := len(r)
	out := make([]int, 0, n)
	for k, v := range r {
		prev, next := r[(k+n-1)%n], r[(k+1)%n]
		if v-prev != next-v {
			out = append(out, v)
		}
	}
	m := slices.Index(out, slices.Min(out))
	return append(out[m:], out[:m]...)
}

// area2 returns twice the signed area of a ring in vertex units.
func (t *tracer) area2(r []int) int64 {
	var s int64
	for k, v := range r {
		w := r[(k+1)%len(r)]
		x0, y0 := int64(v%t.nvx), int64(v/t.nvx)
		x1, y1 := int64(w%t.nvx), int64(w/t.nvx)
		s += x0*y1 - x1*y0
	}
	return s
}

// ring converts vertex indices to a closed ring in local coordinates.
func (t *tracer) ring(r []int) orb.Ring {
	out := make(orb.Ring, 0, len(r)+1)
	for _, v := range r {
		out = append(out, orb.Point(t.g.corner(v%t.nvx, v/t.nvx)))
	}
	return append(out, out[0])
}

// components labels the 4-connected components of true cells with
// union-find; labels[k] is the root cell of cell k (−1 for false cells).
func (t *tracer) components() []int {
	parent := make([]int, len(t.mask))
	for k, in := range t.mask {
		parent[k] = -1
		if in {
			parent[k] = k
		}
	}
	find := func(k int) int {
		for parent[k] != k {
			parent[k] = parent[parent[k]] // path halving
			k = parent[k]
		}
		return k
	}
	union := func(a, b int) {
		ra, rb := find(a), find(b)
		if ra != rb {
			parent[max(ra, rb)] = min(ra, rb)
		}
	}
	c := t.g.Cols
	for k, in := range t.mask {
		if !in {
			continue
		}
		if k%c > 0 && t.mask[k-1] {
			union(k, k-1)
		}
		if k >= c && t.mask[k-c] {
			union(k, k-c)
		}
	}
	for k := range parent {
		if parent[k] >= 0 {
			parent[k] = find(k)
		}
	}
	return parent
}
