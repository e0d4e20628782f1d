package pipeline

import (
	"io"
	"math"

	"slipfront/gis"
	"slipfront/mechanics"
	"slipfront/report"
	"slipfront/scenarios"
	"slipfront/sim"
)

// Depletion returns what production left before the run (nil for none):
// the run's own, or for a run read back from a folder, computed again from
// its scenario (it depends on the scenario alone) and kept.
func (r *Run) Depletion() (*sim.Depletion, error) {
	if r.Result.Depletion == nil {
		d, err := sim.Deplete(r.Scenario)
		if err != nil {
			return nil, err
		}
		r.Result.Depletion = d
	}
	return r.Result.Depletion, nil
}

// ticksAcross is about how many SHmax directions the maps and the
// stress_directions layer show across the map after production.
const ticksAcross = 25

// shmaxLattice returns, on a lattice of about ticksAcross cells across the
// depletion grid of d, each cell's index and the azimuth of SHmax there
// after production, radians; its spacing, m.
func shmaxLattice(s *scenarios.Scenario, d *sim.Depletion) (cells []int, azimuths []float64, spacing float64, err error) {
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return nil, nil, 0, err
	}
	g := d.Grid
	step := max(1, (max(g.Cols, g.Rows)+ticksAcross-1)/ticksAcross)
	for row := step / 2; row < g.Rows; row += step {
		for col := step / 2; col < g.Cols; col += step {
			k := g.Index(col, row)
			cells = append(cells, k)
			azimuths = append(azimuths, stress.Horizontal().Changed(d.Change[k]).Azimuth)
		}
	}
	return cells, azimuths, float64(step) * g.CellSize, nil
}

// stressTicks returns the SHmax directions after the production d for a
// map picture (none for nil).
func stressTicks(s *scenarios.Scenario, d *sim.Depletion) ([]report.StressTick, error) {
	if d == nil {
		return nil, nil
	}
	cells, azimuths, _, err := shmaxLattice(s, d)
	if err != nil {
		return nil, err
	}
	ticks := make([]report.StressTick, len(cells))
	for i, k := range cells {
		x, y := d.Grid.Centre(k)
		ticks[i] = report.StressTick{At: report.Point{East: x, North: y}, Azimuth: azimuths[i]}
	}
	return ticks, nil
}

// StressLayerName is the layer of SHmax directions after production, in a
// run's maps when the scenario has a [depletion] table.
const StressLayerName = "stress_directions"

// stressLayer returns the SHmax directions after the production d as
// segments 0.8 lattice spacings long centred on their cells, with the
// depletion's values there.
func stressLayer(s *scenarios.Scenario, d *sim.Depletion) (gis.Layer, error) {
	l := gis.Layer{Name: StressLayerName, Description: "SHmax after the parent wells' production, with the depletion there",
		Geometry: gis.LineString, Fields: []gis.Field{
			{Name: "shmax_azimuth_deg", Type: gis.Real}, {Name: "shmax_rotation_deg", Type: gis.Real},
			{Name: "pore_pressure_change_MPa", Type: gis.Real}, {Name: "least_critical_pressure_change_MPa", Type: gis.Real},
		}}
	cells, azimuths, spacing, err := shmaxLattice(s, d)
	if err != nil {
		return l, err
	}
	for i, k := range cells {
		x, y := d.Grid.Centre(k)
		sin, cos := math.Sincos(azimuths[i])
		h := 0.4 * spacing
		l.Features = append(l.Features, gis.Feature{
			Geometry: line(pt(x-h*sin, y-h*cos), pt(x+h*sin, y+h*cos)),
			Values: []any{azimuths[i] * 180 / math.Pi, d.Rotation[k] * 180 / math.Pi,
				d.Change[k].Pore / 1e6, d.CriticalChange[k] / 1e6},
		})
	}
	return l, nil
}

// depletionRasters returns the rasters of the depletion d on its own grid
// (depletion.cell_size), by file name: the pore-pressure change, MPa
// (negative where production drew it down); the rotation of SHmax,
// degrees, positive clockwise seen from above (±90° where SHmax and Shmin
// swapped); and the change of the least critical pressure increase of any
// plane, MPa (positive where the rock moved away from slip).
func depletionRasters(d *sim.Depletion) map[string]gis.Raster {
	g := gis.Grid{Cols: d.Grid.Cols, Rows: d.Grid.Rows, CellSize: d.Grid.CellSize, XMin: d.Grid.XMin, YMin: d.Grid.YMin}
	raster := func(description, unit string, value func(k int) float64) gis.Raster {
		r := gis.Raster{Grid: g, Data: make([]float32, g.Cols*g.Rows), NoData: float32(math.NaN()),
			Description: description, Unit: unit}
		for k := range r.Data {
			r.Data[k] = float32(value(k))
		}
		return r
	}
	return map[string]gis.Raster{
		DepletionFile: raster("pore_pressure_change_MPa", "MPa", func(k int) float64 { return d.Change[k].Pore / 1e6 }),
		RotationFile:  raster("shmax_rotation_deg", "deg", func(k int) float64 { return d.Rotation[k] * 180 / math.Pi }),
		CriticalChangeFile: raster("least_critical_pressure_change_MPa", "MPa",
			func(k int) float64 { return d.CriticalChange[k] / 1e6 }),
	}
}

// writeDepletionRasters writes DepletionFile, RotationFile and
// CriticalChangeFile into dir, placed by pl; nothing when d is nil (no
// production).
func writeDepletionRasters(dir string, pl gis.Placement, d *sim.Depletion) error {
	if d == nil {
		return nil
	}
	rasters := depletionRasters(d)
	for _, name := range []string{DepletionFile, RotationFile, CriticalChangeFile} {
		r := rasters[name]
		if err := writeFiles(dir, namedWriter{name, func(w io.Writer) error { return gis.WriteGeoTIFF(w, pl, r) }}); err != nil {
			return err
		}
	}
	return nil
}
