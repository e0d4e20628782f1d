package gis

import (
	"fmt"
	"math"
)

// Grid is a regular grid of square cells in the local East-North frame.
//
// Cell (i, j), i = 0..Cols−1 from west to east and j = 0..Rows−1 from
// SOUTH to north, covers [XMin + i·CellSize, XMin + (i+1)·CellSize] ×
// [YMin + j·CellSize, YMin + (j+1)·CellSize]; its value is at index
// j·Cols + i of a grid-ordered slice. (Files that store the north row
// first, such as GeoTIFF, are flipped by their writer.)
type Grid struct {
	Cols, Rows int
	// CellSize is the side of a square cell, m.
	CellSize float64
	// XMin and YMin are the local coordinates of the south-west corner of
	// cell (0, 0), m.
	XMin, YMin float64
}

// maxGridCells bounds Cols·Rows so that indices and byte sizes stay far
// from overflow; common practice, no source.
const maxGridCells = 1 << 31

// validate checks the grid's shape and that n values fill it.
func (g Grid) validate(n int) error {
	switch {
	case g.Cols < 1 || g.Rows < 1:
		return fmt.Errorf("gis: grid of %d×%d cells: need at least 1×1", g.Cols, g.Rows)
	case int64(g.Cols)*int64(g.Rows) > maxGridCells:
		return fmt.Errorf("gis: grid of %d×%d cells: more than %d cells", g.Cols, g.Rows, int64(maxGridCells))
	case !(g.CellSize > 0) || math.IsInf(g.CellSize, 0):
		return fmt.Errorf("gis: grid cell size %g m: must be positive and finite", g.CellSize)
	case math.IsNaN(g.XMin) || math.IsInf(g.XMin, 0) || math.IsNaN(g.YMin) || math.IsInf(g.YMin, 0):
		return fmt.Errorf("gis: grid corner (%g, %g) m: must be finite", g.XMin, g.YMin)
	case n != g.Cols*g.Rows:
		return fmt.Errorf("gis: grid of %d×%d cells has %d values, want %d", g.Cols, g.Rows, n, g.Cols*g.Rows)
	}
	return nil
}

// CellArea returns the area of one cell, m².
func (g Grid) CellArea() float64 { return g.CellSize * g.CellSize }

// corner returns the local coordinates of grid vertex (i, j), i = 0..Cols,
// j = 0..Rows, m.
func (g Grid) corner(i, j int) [2]float64 {
	return [2]float64{g.XMin + float64(i)*g.CellSize, g.YMin + float64(j)*g.CellSize}
}
