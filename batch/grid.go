package batch

import (
	"fmt"
	"math"

	"slipfront/scenarios"
)

// MaxGridCells caps the cells of a stimulated-area map grid (a 10 m cell
// covers 33.5 km × 33.5 km), so a cell size typed in the wrong unit fails
// with a clear error instead of exhausting memory.
const MaxGridCells = 1 << 25

// MaxTimePoints caps the points of a time grid.
const MaxTimePoints = 1 << 20

// gridSlack is the relative tolerance taken off a quotient before it is
// rounded up, so that 1600 m / 10 m computed as 160.00000000000003 gives
// 160 cells, not 161.
const gridSlack = 1e-9

// ceilCount returns ceil(v) after taking a relative sliver off v.
func ceilCount(v float64) float64 {
	return math.Ceil(v - gridSlack*math.Max(1, math.Abs(v)))
}

// Grid is the map grid of a scenario's stimulated area: square cells of
// CellSize starting at the south-west corner (XMin, YMin) of the domain, in
// local East-North metres.
//
//	Cols = ceil((x_max − x_min) / cell_size), Rows = ceil((y_max − y_min) / cell_size)
//	index = row·Cols + col, row 0 at the south edge, col 0 at the west edge
//
// When the domain is not a whole number of cells, the last column and row
// extend beyond x_max and y_max.
type Grid struct {
	// XMin and YMin: the south-west corner of cell 0, local m.
	XMin float64 `json:"x_min_m"`
	YMin float64 `json:"y_min_m"`
	// CellSize: the side of a cell, m.
	CellSize float64 `json:"cell_size_m"`
	// Cols (west to east) and Rows (south to north).
	Cols int `json:"cols"`
	Rows int `json:"rows"`
	// CRS ("EPSG:<code>", or "" for an undefined local frame) and the
	// place of local (0, 0) in it, m, for GIS export.
	CRS            string  `json:"crs"`
	OriginEasting  float64 `json:"origin_easting_m"`
	OriginNorthing float64 `json:"origin_northing_m"`
}

// GridFor returns the stimulated-area map grid of a scenario: its domain
// and numerics.cell_size. It fails when the grid would have more than
// MaxGridCells cells.
func GridFor(s *scenarios.Scenario) (Grid, error) {
	d, size := s.Domain, s.Numerics.CellSize
	if !(size > 0) || !(d.XMax > d.XMin) || !(d.YMax > d.YMin) {
		return Grid{}, inputErrorf("map grid: need x_max > x_min, y_max > y_min and cell_size > 0; got x %g..%g m, y %g..%g m, cell %g m",
			d.XMin, d.XMax, d.YMin, d.YMax, size)
	}
	cols := ceilCount((d.XMax - d.XMin) / size)
	rows := ceilCount((d.YMax - d.YMin) / size)
	if cols*rows > MaxGridCells {
		return Grid{}, inputErrorf("map grid: numerics.cell_size = %g m gives %.0f × %.0f cells over the domain; at most %d allowed, use a larger cell",
			size, cols, rows, MaxGridCells)
	}
	return Grid{
		XMin: d.XMin, YMin: d.YMin, CellSize: size, Cols: int(cols), Rows: int(rows),
		CRS: d.CRS, OriginEasting: d.OriginEasting, OriginNorthing: d.OriginNorthing,
	}, nil
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

// valid checks a grid read from a file.
func (g Grid) valid() error {
	switch {
	case !finite(g.XMin) || !finite(g.YMin):
		return fmt.Errorf("grid corner (%g, %g) is not finite", g.XMin, g.YMin)
	case !(g.CellSize > 0) || !finite(g.CellSize):
		return fmt.Errorf("grid cell size %g m: must be > 0", g.CellSize)
	case g.Cols < 1 || g.Rows < 1 || g.Cols > MaxGridCells || g.Rows > MaxGridCells/g.Cols:
		return fmt.Errorf("grid of %d × %d cells: want 1 to %d cells", g.Cols, g.Rows, MaxGridCells)
	case !finite(g.OriginEasting) || !finite(g.OriginNorthing):
		return fmt.Errorf("grid origin (%g, %g) is not finite", g.OriginEasting, g.OriginNorthing)
	}
	return nil
}

// TimeGrid is the fixed time grid on which a case's stimulated-area curves
// are stored and compared: t_k = k·Interval for k = 0 … Points−1, seconds
// from the start of pumping.
type TimeGrid struct {
	// Interval between points, s (the scenario's numerics.output_interval).
	Interval float64 `json:"interval_s"`
	// Points = K + 1, K = ceil(nominal schedule length / Interval).
	Points int `json:"points"`
}

// TimeGridFor returns the time grid of a scenario: numerics.output_interval
// apart, up to the first point at or after the end of the nominal schedule
// (ScheduleLength). A run that lasts longer than planned is sampled only up
// to there.
func TimeGridFor(s *scenarios.Scenario) (TimeGrid, error) {
	dt, length := s.Numerics.OutputInterval, ScheduleLength(s)
	if !(dt > 0) || !(length >= 0) || !finite(length) {
		return TimeGrid{}, inputErrorf("time grid: need output_interval > 0 and a finite schedule; got %g s and %g s", dt, length)
	}
	k := ceilCount(length / dt)
	if k+1 > MaxTimePoints {
		return TimeGrid{}, inputErrorf("time grid: numerics.output_interval = %g s over a %g s schedule gives %.0f points; at most %d allowed",
			dt, length, k+1, MaxTimePoints)
	}
	return TimeGrid{Interval: dt, Points: int(k) + 1}, nil
}

// ScheduleLength is the nominal length of the scenario's pumping schedule,
// s: every stage's NominalLength plus its shut-in, in pumping order.
func ScheduleLength(s *scenarios.Scenario) float64 {
	var t float64
	for _, st := range s.PumpingOrder() {
		t += st.NominalLength() + st.ShutIn
	}
	return t
}

// Time returns t_k, s.
func (g TimeGrid) Time(k int) float64 { return float64(k) * g.Interval }

// valid checks a time grid read from a file.
func (g TimeGrid) valid() error {
	if !(g.Interval > 0) || !finite(g.Interval) || g.Points < 1 || g.Points > MaxTimePoints {
		return fmt.Errorf("time grid of %d points %g s apart: want 1 to %d points and an interval > 0", g.Points, g.Interval, MaxTimePoints)
	}
	return nil
}

// Resample fills dst (length g.Points, allocated when too short) with the
// curve (times, values) at the grid's times by linear interpolation; before
// the first sample it holds the first value and after the last sample the
// last value. times must be non-decreasing; at repeated times the later
// value wins. It panics when the lengths differ or the curve is empty.
func (g TimeGrid) Resample(dst, times, values []float64) []float64 {
	if len(times) != len(values) || len(times) == 0 {
		panic("batch: Resample: empty curve or length mismatch")
	}
	if cap(dst) < g.Points {
		dst = make([]float64, g.Points)
	}
	dst = dst[:g.Points]
	j := 0 // times[j] ≤ t < times[j+1] once t passes times[0]
	last := len(times) - 1
	for k := range dst {
		t := g.Time(k)
		for j < last && times[j+1] <= t {
			j++
		}
		switch {
		case t < times[0]:
			dst[k] = values[0]
		case j == last:
			dst[k] = values[last]
		default: // times[j] ≤ t < times[j+1], so the span is positive
			t0, t1 := times[j], times[j+1]
			w := (t - t0) / (t1 - t0)
			dst[k] = values[j] + w*(values[j+1]-values[j])
		}
	}
	return dst
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
