package batch

import (
	"fmt"
	"math"

	"slipfront/scenarios"
)

// Grid is the stimulated-area map grid of a case (scenarios.Grid) with the
// CRS and origin that place it on a map.
type Grid struct {
	scenarios.Grid
	// CRS ("EPSG:<code>", a one-line WKT text, or "" for an undefined
	// local frame: scenarios.Domain.CRSSpec) and the place of local
	// (0, 0) in it, m, for GIS export.
	CRS            string  `json:"crs"`
	OriginEasting  float64 `json:"origin_easting_m"`
	OriginNorthing float64 `json:"origin_northing_m"`
}

// GridFor returns the stimulated-area map grid of a scenario: its domain
// and numerics.cell_size. It fails when the grid would have more than
// MaxGridCells cells.
func GridFor(s *scenarios.Scenario) (Grid, error) {
	g := s.MapGrid()
	if !(g.CellSize > 0) || float64(g.Cols)*float64(g.Rows) > scenarios.MaxGridCells {
		return Grid{}, inputErrorf("map grid: numerics.cell_size = %g m gives %d × %d cells over the domain; at most %d allowed",
			g.CellSize, g.Cols, g.Rows, scenarios.MaxGridCells)
	}
	d := s.Domain
	return Grid{Grid: g, CRS: d.CRSSpec(), OriginEasting: d.OriginEasting, OriginNorthing: d.OriginNorthing}, nil
}

// valid checks a grid read from a file.
func (g Grid) valid() error {
	switch {
	case !finite(g.XMin) || !finite(g.YMin):
		return fmt.Errorf("grid corner (%g, %g) is not finite", g.XMin, g.YMin)
	case !(g.CellSize > 0) || !finite(g.CellSize):
		return fmt.Errorf("grid cell size %g m: must be > 0", g.CellSize)
	case g.Cols < 1 || g.Rows < 1 || g.Cols > scenarios.MaxGridCells || g.Rows > scenarios.MaxGridCells/g.Cols:
		return fmt.Errorf("grid of %d × %d cells: want 1 to %d cells", g.Cols, g.Rows, scenarios.MaxGridCells)
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
	dt, length := s.Numerics.OutputInterval, s.ScheduleLength()
	if !(dt > 0) || !(length >= 0) || !finite(length) {
		return TimeGrid{}, inputErrorf("time grid: need output_interval > 0 and a finite schedule; got %g s and %g s", dt, length)
	}
	if points := s.OutputPoints(); points > scenarios.MaxOutputPoints {
		return TimeGrid{}, inputErrorf("time grid: numerics.output_interval = %g s over a %g s schedule gives %d points; at most %d allowed",
			dt, length, points, scenarios.MaxOutputPoints)
	}
	return TimeGrid{Interval: dt, Points: s.OutputPoints()}, nil
}

// Time returns t_k, s.
func (g TimeGrid) Time(k int) float64 { return float64(k) * g.Interval }

// valid checks a time grid read from a file.
func (g TimeGrid) valid() error {
	if !(g.Interval > 0) || !finite(g.Interval) || g.Points < 1 || g.Points > scenarios.MaxOutputPoints {
		return fmt.Errorf("time grid of %d points %g s apart: want 1 to %d points and an interval > 0", g.Points, g.Interval, scenarios.MaxOutputPoints)
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
