package pipeline

import (
	"fmt"
	"math"

	"slipfront/gis"
	"slipfront/mechanics"
	"slipfront/sim"
)

// RasterNames are the rasters of a run.
var RasterNames = []string{"first_slip_time", "pressure_increase", "cumulative_slip"}

// rasterBands describes each raster's band: its description (the
// quantity with its unit, as in the tables) and unit.
var rasterBands = map[string]struct{ description, unit string }{
	"first_slip_time":   {"first_slip_time_s", "s"},
	"pressure_increase": {"pressure_increase_MPa", "MPa"},
	"cumulative_slip":   {"cumulative_slip_mm", "mm"},
}

// Raster builds the named raster of the run's state: each cell takes the
// earliest (first_slip_time, s) or largest (pressure_increase, MPa;
// cumulative_slip, mm) value of the natural-fracture elements passing
// through it; other cells are NoData (NaN). The band carries its
// description and unit.
func (r *Run) Raster(name string) (gis.Raster, error) {
	res := r.Result
	stress, err := mechanics.StressFromScenario(r.Scenario.Stress, r.Scenario.Layer.Depth)
	if err != nil {
		return gis.Raster{}, err
	}
	p0 := stress.PorePressure()
	var value func(i int) float64
	earliest := false
	switch name {
	case "first_slip_time":
		value, earliest = func(i int) float64 { return res.FirstSlip[i] }, true
	case "pressure_increase":
		value = func(i int) float64 { return (res.Pressure[i] - p0) / 1e6 }
	case "cumulative_slip":
		value = func(i int) float64 { return res.Slip[i] * 1e3 }
	default:
		return gis.Raster{}, fmt.Errorf("no raster %q in a run; rasters: %v", name, RasterNames)
	}
	g := r.Grid()
	data := make([]float32, g.Cols*g.Rows)
	for k := range data {
		data[k] = float32(math.NaN())
	}
	var cells []int
	for i, el := range res.Elements {
		if el.Set == sim.ConduitSet {
			continue
		}
		v := value(i)
		if math.IsNaN(v) {
			continue
		}
		cells = sim.CellsAlong(cells[:0], r.Scenario.MapGrid(), el.P0, el.P1)
		for _, c := range cells {
			old := float64(data[c])
			if math.IsNaN(old) || (earliest && v < old) || (!earliest && v > old) {
				data[c] = float32(v)
			}
		}
	}
	band := rasterBands[name]
	return gis.Raster{Grid: g, Data: data, NoData: float32(math.NaN()), Description: band.description, Unit: band.unit}, nil
}

// StressChangeRaster is the Coulomb stress change of the run's final slip
// and opening at every cell centre of the map grid, MPa, on the
// scenario's receiver planes (sim.CoulombChangeMap); NaN where the field
// is singular.
func (r *Run) StressChangeRaster() (gis.Raster, error) {
	values, err := sim.CoulombChangeMap(r.Scenario, r.Result)
	if err != nil {
		return gis.Raster{}, err
	}
	data := make([]float32, len(values))
	for k, v := range values {
		data[k] = float32(v / 1e6)
	}
	return gis.Raster{Grid: r.Grid(), Data: data, NoData: float32(math.NaN()),
		Description: "coulomb_stress_change_MPa", Unit: "MPa"}, nil
}
