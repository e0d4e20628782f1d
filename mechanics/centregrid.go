package mechanics

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/spatial/r2"
)

// centreGrid buckets points in square cells of a given side, so that the
// points within that distance of any point are found in its 3 × 3 cells.
type centreGrid struct {
	side  float64
	cells map[[2]int64][]int
}

func newCentreGrid(points []r2.Vec, side float64) *centreGrid {
	g := &centreGrid{side: side, cells: map[[2]int64][]int{}}
	for i, p := range points {
		k := g.cell(p)
		g.cells[k] = append(g.cells[k], i)
	}
	return g
}

func (g *centreGrid) cell(p r2.Vec) [2]int64 {
	return [2]int64{int64(math.Floor(p.X / g.side)), int64(math.Floor(p.Y / g.side))}
}

// visit calls f with every point in the 3 × 3 cells about p, in
// ascending index order.
func (g *centreGrid) visit(p r2.Vec, f func(i int)) {
	c := g.cell(p)
	var found []int
	for dx := int64(-1); dx <= 1; dx++ {
		for dy := int64(-1); dy <= 1; dy++ {
			found = append(found, g.cells[[2]int64{c[0] + dx, c[1] + dy}]...)
		}
	}
	sort.Ints(found)
	for _, i := range found {
		f(i)
	}
}
