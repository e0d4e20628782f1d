package pipeline

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"slipfront/batch"
	"slipfront/gis"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
)

// Convention is the percentile convention printed on batch charts; the
// tables' _q10, _q50 and _q90 columns are the same percentiles
// (batch.PercentileConvention).
func Convention(realizations int) string {
	return fmt.Sprintf("P10/P50/P90 = 10th/50th/90th percentiles of %d realizations, ascending (P90 the high case; empirical: the value of rank ceil(n·p))", realizations)
}

// ContourLevels are the probability contours of a batch's map layer.
var ContourLevels = []float64{0.1, 0.5, 0.9}

// ProbabilityRaster returns case c's stimulation probability on its grid
// (share of realizations, 0–1); cells never stimulated hold 0.
func ProbabilityRaster(a *batch.CaseAggregate) (gis.Raster, gis.Placement, error) {
	return probabilityRaster(a.Probability, nil, "stimulation_probability")
}

// ProbabilityDifferenceRaster returns the stimulation probability of case
// a minus that of its reference case ref on their grid (−1 to 1): where
// the swept value makes stimulation more (> 0) or less (< 0) likely on
// the same networks.
func ProbabilityDifferenceRaster(a, ref *batch.CaseAggregate) (gis.Raster, gis.Placement, error) {
	if a.Probability.Grid != ref.Probability.Grid {
		return gis.Raster{}, gis.Placement{}, badinput.Errorf("cases %d and %d have different map grids: no probability difference",
			a.Case.Index, ref.Case.Index)
	}
	return probabilityRaster(a.Probability, ref.Probability, "stimulation_probability_difference")
}

// probabilityRaster returns p, minus ref when it is not nil, as a
// dimensionless band named description.
func probabilityRaster(p, ref *batch.ProbabilityGrid, description string) (gis.Raster, gis.Placement, error) {
	g := p.Grid
	crs, err := gis.ParseCRS(g.CRS)
	if err != nil {
		return gis.Raster{}, gis.Placement{}, err
	}
	dense := p.Dense()
	if ref != nil {
		for i, v := range ref.Dense() {
			dense[i] -= v
		}
	}
	data := make([]float32, len(dense))
	for i, v := range dense {
		data[i] = float32(v)
	}
	r := gis.Raster{Grid: gis.Grid{Cols: g.Cols, Rows: g.Rows, CellSize: g.CellSize, XMin: g.XMin, YMin: g.YMin},
		Data: data, NoData: float32(math.NaN()), Description: description, Unit: "1"}
	return r, gis.Placement{CRS: crs, Easting: g.OriginEasting, Northing: g.OriginNorthing}, nil
}

// ProbabilityLayers returns the 10/50/90 % contours of every case, one
// layer per case named probability_<case>, with fields
// stimulation_probability (the contour's level) and area_m2 (the map
// area where the probability is at least that).
func ProbabilityLayers(aggs []batch.CaseAggregate) ([]gis.Layer, gis.Placement, error) {
	var layers []gis.Layer
	var pl gis.Placement
	for i := range aggs {
		a := &aggs[i]
		r, p, err := ProbabilityRaster(a)
		if err != nil {
			return nil, pl, err
		}
		pl = p
		values := make([]float64, len(r.Data))
		for k, v := range r.Data {
			values[k] = float64(v)
		}
		l, err := gis.ContourLayer(fmt.Sprintf("probability_%04d", a.Case.Index),
			"stimulation probability contours, case "+a.Case.Label, r.Grid, values, ContourLevels)
		if err != nil {
			return nil, pl, err
		}
		l.Fields[0].Name = "stimulation_probability" // the contour's level

		layers = append(layers, l)
	}
	return withCaution(layers), pl, nil
}

// batchLayers are the GeoPackage layers of the batch folder dir: the
// probability contours of every case (ProbabilityLayers) and, when the
// folder keeps its base scenario (batch.ReadScenario, returned too; nil
// without), the wells.
func batchLayers(dir string, m *batch.Manifest, aggs []batch.CaseAggregate) ([]gis.Layer, gis.Placement, *scenarios.Scenario, error) {
	layers, pl, err := ProbabilityLayers(aggs)
	if err != nil {
		return nil, pl, nil, err
	}
	s, err := batch.ReadScenario(dir, m)
	if err != nil || s == nil {
		return layers, pl, nil, err
	}
	return append(layers, withCaution([]gis.Layer{wellLayer(s)})...), pl, s, nil
}

// WriteBatchMaps writes into a complete batch folder: maps.gpkg with the
// probability contours and the wells (batchLayers), one probability GeoTIFF per case, one probability
// difference GeoTIFF per pairing of a case with its reference case
// (batch.Manifest.Pairings; none where a sweep changes the map grid), and
// the pictures of batchPictures: the comparison chart, the fans on shared
// axes, one fan chart, probability map and difference map per case and
// pairing, and the paired ratios.
func WriteBatchMaps(ctx context.Context, dir string) error {
	m, aggs, err := batch.ReadAggregates(ctx, dir)
	if err != nil {
		return err
	}
	layers, pl, s, err := batchLayers(dir, m, aggs)
	if err != nil {
		return err
	}
	if err := writeGeoPackage(ctx, filepath.Join(dir, MapsFile), pl, layers, scheduleStart(m.Scenario.Start)); err != nil {
		return err
	}
	for i := range aggs {
		a := &aggs[i]
		r, pl, err := ProbabilityRaster(a)
		if err != nil {
			return err
		}
		if err := outdir.WriteFile(dir, probabilityRasterFile(a.Case.Index), func(w io.Writer) error {
			return gis.WriteGeoTIFF(w, pl, r)
		}); err != nil {
			return err
		}
	}
	for _, p := range m.Pairings() {
		if m.Cases[p.Case].Grid != m.Cases[p.Reference].Grid {
			continue // a swept grid: cells do not correspond
		}
		r, pl, err := ProbabilityDifferenceRaster(&aggs[p.Case], &aggs[p.Reference])
		if err != nil {
			return err
		}
		if err := outdir.WriteFile(dir, probabilityDifferenceFile(p.Case, p.Reference), func(w io.Writer) error {
			return gis.WriteGeoTIFF(w, pl, r)
		}); err != nil {
			return err
		}
	}
	ps, _, err := batchPictures(m, aggs, s)
	if err != nil {
		return err
	}
	return writePictures(dir, ps)
}

// caseTitle is the case's sweep values, or "all realizations".
func caseTitle(a *batch.CaseAggregate) string {
	if len(a.Case.Values) == 0 {
		return "all realizations"
	}
	return strings.Join(a.Case.Values, ", ")
}

func sweepLabel(m *batch.Manifest) string {
	if len(m.Sweeps) == 0 {
		return "Case"
	}
	keys := make([]string, len(m.Sweeps))
	for i, s := range m.Sweeps {
		keys[i] = s.Key
	}
	return strings.Join(keys, " × ")
}
