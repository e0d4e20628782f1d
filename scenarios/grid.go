package scenarios

import "math"

// Grid is the map grid on which stimulated area and probabilities are
// counted: Cols × Rows square cells of CellSize metres whose south-west
// corner is (XMin, YMin) in local coordinates. Cell (col, row) has index
// row·Cols + col; row 0 is the southernmost row.
type Grid struct {
	Cols, Rows int
	CellSize   float64
	XMin, YMin float64
}

// MapGrid returns the grid of the scenario's map area with the numerics
// cell size. The last column and row may reach past the map's east and
// north edges.
func (s *Scenario) MapGrid() Grid {
	d, c := s.Domain, s.Numerics.CellSize
	return Grid{
		Cols:     max(1, int(math.Ceil((d.XMax-d.XMin)/c-1e-9))),
		Rows:     max(1, int(math.Ceil((d.YMax-d.YMin)/c-1e-9))),
		CellSize: c, XMin: d.XMin, YMin: d.YMin,
	}
}

// Len returns the number of cells.
func (g Grid) Len() int { return g.Cols * g.Rows }

// CellCentre returns the centre of cell index k, local metres.
func (g Grid) CellCentre(k int) (x, y float64) {
	col, row := k%g.Cols, k/g.Cols
	return g.XMin + (float64(col)+0.5)*g.CellSize, g.YMin + (float64(row)+0.5)*g.CellSize
}
