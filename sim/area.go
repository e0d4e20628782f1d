package sim

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/footprint"
	"slipfront/scenarios"
)

// CellsAlong appends to dst the index of every cell of g that the segment
// a–b passes through, in order from a, each once, skipping cells outside
// the grid. It walks the grid lines the segment crosses (Amanatides & Woo
// 1987), so the cost is proportional to the cells visited.
func CellsAlong(dst []int, g scenarios.Grid, a, b r2.Vec) []int {
	x0, y0 := (a.X-g.XMin)/g.CellSize, (a.Y-g.YMin)/g.CellSize
	x1, y1 := (b.X-g.XMin)/g.CellSize, (b.Y-g.YMin)/g.CellSize
	i, j := int(math.Floor(x0)), int(math.Floor(y0))
	iEnd, jEnd := int(math.Floor(x1)), int(math.Floor(y1))
	stepI, tMaxX, tDeltaX := walk(x0, x1)
	stepJ, tMaxY, tDeltaY := walk(y0, y1)
	for n := abs(iEnd-i) + abs(jEnd-j) + 1; n > 0; n-- {
		if i >= 0 && i < g.Cols && j >= 0 && j < g.Rows {
			dst = append(dst, j*g.Cols+i)
		}
		if tMaxX < tMaxY {
			i += stepI
			tMaxX += tDeltaX
		} else {
			j += stepJ
			tMaxY += tDeltaY
		}
	}
	return dst
}

// walk returns the step direction along one axis, the parameter t in
// [0, 1] of the first grid-line crossing and the parameter between
// crossings.
func walk(u0, u1 float64) (step int, tMax, tDelta float64) {
	d := u1 - u0
	switch {
	case d > 0:
		return 1, (math.Floor(u0) + 1 - u0) / d, 1 / d
	case d < 0:
		return -1, (u0 - math.Floor(u0)) / -d, 1 / -d
	}
	return 0, math.Inf(1), math.Inf(1)
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// stimulation tracks the stimulated elements, the map cells they pass
// through (for pictures, rasters and probability maps) and the stimulated
// area (the exact area within reach of them; no grid).
type stimulation struct {
	grid      scenarios.Grid
	threshold float64 // m of slip
	reach     float64 // m
	elements  []Element
	element   []bool
	at        []float64 // time each element was stimulated, s (NaN: never)
	cell      []bool
	fracArea  float64 // Σ L·h of stimulated elements, m²
	scratch   []int
	// mapArea is the stimulated area of the elements marked so far, valid
	// unless stale.
	mapArea float64
	stale   bool
}

func newStimulation(g scenarios.Grid, threshold, reach float64, elements []Element) *stimulation {
	n := len(elements)
	st := &stimulation{grid: g, threshold: threshold, reach: reach, elements: elements,
		element: make([]bool, n), at: make([]float64, n), cell: make([]bool, g.Cells())}
	for i := range st.at {
		st.at[i] = math.NaN()
	}
	return st
}

// update marks elements whose slip reached the threshold by time t and
// the cells they pass through.
func (st *stimulation) update(slip []float64, t float64) {
	for i, d := range slip {
		if st.element[i] || d < st.threshold {
			continue
		}
		st.element[i], st.at[i], st.stale = true, t, true
		el := &st.elements[i]
		st.fracArea += el.Length * el.Height
		st.scratch = CellsAlong(st.scratch[:0], st.grid, el.P0, el.P1)
		for _, c := range st.scratch {
			st.cell[c] = true
		}
	}
}

// area returns the stimulated area, m² (see StimulatedArea).
func (st *stimulation) area() float64 {
	if st.stale {
		st.mapArea = StimulatedArea(st.elements, func(i int) bool { return st.element[i] }, st.reach)
		st.stale = false
	}
	return st.mapArea
}

// StimulatedArea returns the stimulated area, m²: the exact map area of
// the region within reach (m, numerics.stimulated_reach) of the elements
// for which stimulated(i) holds, each overlap counted once (the union of
// the elements' stadiums, internal/footprint). No display grid enters it.
// It panics if the geometry is outside what footprint.Area accepts, which
// validated scenarios cannot produce (domain within ±1e7 m, reach ≥
// 0.1 m, so reach ≥ footprint.MinRadiusRatio × every coordinate).
func StimulatedArea(elements []Element, stimulated func(i int) bool, reach float64) float64 {
	a, err := footprint.Area(stimulatedSegments(elements, stimulated), reach)
	if err != nil {
		panic(fmt.Sprintf("sim: stimulated area: %v", err))
	}
	return a
}

// StimulatedOutline returns the outline of the region whose area
// StimulatedArea returns, as polygons in the elements' local metres, arcs
// as chords of sagitta at most sagitta (m).
func StimulatedOutline(elements []Element, stimulated func(i int) bool, reach, sagitta float64) (orb.MultiPolygon, error) {
	return footprint.Outline(stimulatedSegments(elements, stimulated), reach, footprint.OutlineOptions{Sagitta: sagitta})
}

// stimulatedSegments lists the stimulated elements in element order, so
// the elements of one trace come in runs that footprint merges.
func stimulatedSegments(elements []Element, stimulated func(i int) bool) []dfn.Segment {
	var segs []dfn.Segment
	for i := range elements {
		if stimulated(i) {
			segs = append(segs, dfn.Segment{P0: elements[i].P0, P1: elements[i].P1})
		}
	}
	return segs
}

// cellList returns the stimulated cell indices in increasing order.
func (st *stimulation) cellList() []int {
	var out []int
	for c, on := range st.cell {
		if on {
			out = append(out, c)
		}
	}
	return out
}
