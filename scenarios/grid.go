package scenarios

import "math"

// MaxGridCells caps the cells of the map grid (with 10 m cells, a square
// 57.9 km on a side), so a cell size typed in the wrong unit fails with a
// clear error instead of exhausting memory.
const MaxGridCells = 1 << 25

// MaxDepletionCells caps the cells of the depletion grid (about
// 1000 × 1000): the drainage's Cholesky factor holds about 44 entries per
// cell on a square grid (flow.MaxDrainageCells, the same cap) and the
// stress response about 200 bytes per cell (mechanics.GridResponse).
const MaxDepletionCells = 1 << 20

// MaxOutputPoints caps the output times of a schedule (frames, timeline
// rows, batch time grids), for the same reason.
const MaxOutputPoints = 1 << 20

// Grid is the map grid on which stimulated area and probabilities are
// counted: Cols × Rows square cells of CellSize metres whose south-west
// corner is (XMin, YMin) in local East-North coordinates.
//
//	Cols = ⌈(x_max − x_min) / cell_size⌉, Rows = ⌈(y_max − y_min) / cell_size⌉
//	index = row·Cols + col, row 0 at the south edge, col 0 at the west edge
//
// When the domain is not a whole number of cells, the last column and row
// reach past x_max and y_max.
type Grid struct {
	// XMin and YMin: the south-west corner of cell 0, local m.
	XMin float64 `json:"x_min_m"`
	YMin float64 `json:"y_min_m"`
	// CellSize: the side of a cell, m.
	CellSize float64 `json:"cell_size_m"`
	// Cols (west to east) and Rows (south to north).
	Cols int `json:"cols"`
	Rows int `json:"rows"`
}

// gridSlack is the relative tolerance taken off a quotient before it is
// rounded up, so that 1600 m / 10 m computed as 160.00000000000003 gives
// 160 cells, not 161.
const gridSlack = 1e-9

// ceilCount returns ⌈v⌉ after taking a relative sliver off v.
func ceilCount(v float64) float64 {
	return math.Ceil(v - gridSlack*math.Max(1, math.Abs(v)))
}

// MapGrid returns the grid of the scenario's map area with the numerics
// cell size. The scenario must be valid (validation keeps the cell count
// within MaxGridCells, see gridCells).
func (s *Scenario) MapGrid() Grid {
	d, c := s.Domain, s.Numerics.CellSize
	cols, rows := gridCells(d, c)
	return Grid{Cols: int(cols), Rows: int(rows), CellSize: c, XMin: d.XMin, YMin: d.YMin}
}

// DepletionGrid returns the grid of the scenario's map area with the
// depletion cell size, on which production depletes the layer and its
// stress change is computed. The scenario must be valid.
func (s *Scenario) DepletionGrid() Grid {
	d, c := s.Domain, s.Depletion.CellSize
	cols, rows := gridCells(d, c)
	return Grid{Cols: int(cols), Rows: int(rows), CellSize: c, XMin: d.XMin, YMin: d.YMin}
}

// gridCells returns the columns and rows of the map grid as floats, so that
// a huge domain or a tiny cell is caught before conversion to int.
func gridCells(d Domain, cell float64) (cols, rows float64) {
	return math.Max(1, ceilCount((d.XMax-d.XMin)/cell)), math.Max(1, ceilCount((d.YMax-d.YMin)/cell))
}

// Cells returns the number of cells, Cols·Rows.
func (g Grid) Cells() int { return g.Cols * g.Rows }

// Index returns the index of the cell in column col and row row.
func (g Grid) Index(col, row int) int { return row*g.Cols + col }

// ColRow returns the column and row of cell index i.
func (g Grid) ColRow(i int) (col, row int) { return i % g.Cols, i / g.Cols }

// Centre returns the local coordinates of the centre of cell index i, m.
func (g Grid) Centre(i int) (x, y float64) {
	col, row := g.ColRow(i)
	return g.XMin + (float64(col)+0.5)*g.CellSize, g.YMin + (float64(row)+0.5)*g.CellSize
}

// CellAt returns the index of the cell holding the local point (x, y), m.
// A point on the east or north edge of the grid belongs to the last column
// or row; ok is false outside the grid.
func (g Grid) CellAt(x, y float64) (index int, ok bool) {
	fc := math.Floor((x - g.XMin) / g.CellSize)
	fr := math.Floor((y - g.YMin) / g.CellSize)
	if fc == float64(g.Cols) && x == g.XMin+float64(g.Cols)*g.CellSize {
		fc--
	}
	if fr == float64(g.Rows) && y == g.YMin+float64(g.Rows)*g.CellSize {
		fr--
	}
	if !(fc >= 0 && fc < float64(g.Cols) && fr >= 0 && fr < float64(g.Rows)) {
		return 0, false
	}
	return g.Index(int(fc), int(fr)), true
}

// ScheduleLength is the nominal length of the pumping schedule, s: every
// stage's NominalLength plus its shut-in, in pumping order.
func (s *Scenario) ScheduleLength() float64 {
	var t float64
	for _, st := range s.PumpingOrder() {
		t += st.NominalLength() + st.ShutIn
	}
	return t
}

// OutputPoints is the number of output times k·numerics.output_interval,
// k = 0, 1, …, up to the first at or after the end of the nominal schedule.
func (s *Scenario) OutputPoints() int {
	return int(ceilCount(s.ScheduleLength()/s.Numerics.OutputInterval)) + 1
}
