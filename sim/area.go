package sim

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"

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

// stimulation tracks the stimulated elements and map cells.
type stimulation struct {
	grid      scenarios.Grid
	threshold float64 // m of slip
	element   []bool
	at        []float64 // time each element was stimulated, s (NaN: never)
	cell      []bool
	cells     int     // number of stimulated cells
	fracArea  float64 // Σ L·h of stimulated elements, m²
	scratch   []int
}

func newStimulation(g scenarios.Grid, threshold float64, n int) *stimulation {
	st := &stimulation{grid: g, threshold: threshold, element: make([]bool, n), at: make([]float64, n), cell: make([]bool, g.Cells())}
	for i := range st.at {
		st.at[i] = math.NaN()
	}
	return st
}

// update marks elements whose slip reached the threshold by time t and
// the cells they pass through.
func (st *stimulation) update(elements []Element, slip []float64, t float64) {
	for i, d := range slip {
		if st.element[i] || d < st.threshold {
			continue
		}
		st.element[i], st.at[i] = true, t
		el := &elements[i]
		st.fracArea += el.Length * el.Height
		st.scratch = CellsAlong(st.scratch[:0], st.grid, el.P0, el.P1)
		for _, c := range st.scratch {
			if !st.cell[c] {
				st.cell[c] = true
				st.cells++
			}
		}
	}
}

// StimulatedCells returns the cells of g passed through by the elements
// for which stimulated(i) holds, as a mask in grid order: the stimulated
// area at any time, from the per-element state of a snapshot frame or from
// Result.StimulatedAt.
func StimulatedCells(g scenarios.Grid, elements []Element, stimulated func(i int) bool) []bool {
	mask := make([]bool, g.Cells())
	var scratch []int
	for i := range elements {
		if !stimulated(i) {
			continue
		}
		scratch = CellsAlong(scratch[:0], g, elements[i].P0, elements[i].P1)
		for _, c := range scratch {
			mask[c] = true
		}
	}
	return mask
}

// area returns the stimulated map area, m².
func (st *stimulation) area() float64 {
	return float64(st.cells) * st.grid.CellSize * st.grid.CellSize
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
