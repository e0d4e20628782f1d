package mechanics

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
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

// CountNearPairs returns the number of ordered pairs of distinct elements
// whose centres lie within radius of each other: about what a Contact of
// that NearRadius stores for its near field (all but the few detached
// pairs), known before it is built.
func CountNearPairs(elems []elastic.Element, radius float64) int {
	centres := make([]r2.Vec, len(elems))
	for i, e := range elems {
		centres[i] = e.Centre()
	}
	g := newCentreGrid(centres, radius)
	r2max := radius * radius
	n := 0
	for j, c := range centres {
		g.visit(c, func(i int) {
			if d := r2.Sub(centres[i], c); i != j && r2.Dot(d, d) <= r2max {
				n++
			}
		})
	}
	return n
}
