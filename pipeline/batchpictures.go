package pipeline

import (
	"fmt"

	"github.com/paulmach/orb"

	"slipfront/batch"
	"slipfront/gis"
	"slipfront/report"
	"slipfront/scenarios"
)

// DifferenceLevel is the probability difference whose contours (≥ +level
// and ≤ −level) carry the sign on a difference map: a quarter of the
// realizations, large enough to stand out of the sampling noise of a few
// dozen realizations (common practice, no source).
const DifferenceLevel = 0.25

// batchPictures are the pictures of a complete batch: the comparison of
// the final areas, every case's fans on shared axes, each case's fan, its
// probability map and, against its reference case, its difference map,
// and the distribution of the paired area ratios. The maps show the wells
// of s, the batch's base scenario, when it is known (see batch.ReadScenario).
func batchPictures(m *batch.Manifest, aggs []batch.CaseAggregate, s *scenarios.Scenario) ([]picture, []string, error) {
	conv := Convention(m.Realizations)
	var notes []string
	var wells []report.Well
	if s != nil {
		wells = mapWells(s)
	} else {
		notes = append(notes, "The batch folder holds no "+batch.ScenarioName+" (written before batches kept their scenario): its maps show no wells.")
	}
	ps := []picture{{ComparisonPictureFile, "Final stimulated area by case: how much the swept value moves the P10–P90 range.", comparisonChart(m, aggs)}}
	if len(aggs) <= report.MaxFanPanels {
		panels := &report.FanPanels{Title: m.Scenario.Name + " — stimulated area over time, every case on shared axes", Convention: conv}
		for i := range aggs {
			a := &aggs[i]
			fc := report.FanCase{Label: caseTitle(a), Time: a.Times}
			for _, s := range a.Area {
				fc.P10, fc.P50, fc.P90 = append(fc.P10, s.P10), append(fc.P50, s.P50), append(fc.P90, s.P90)
			}
			panels.Cases = append(panels.Cases, fc)
		}
		ps = append(ps, picture{FanPanelsPictureFile, "Fans on shared axes: whether the cases' growth bands separate or overlap.", panels})
	} else {
		notes = append(notes, fmt.Sprintf("%d cases: more than %d, so no shared-axes fan chart; see each case's fan.", len(aggs), report.MaxFanPanels))
	}
	for i := range aggs {
		a := &aggs[i]
		ps = append(ps, picture{fanPictureFile(a.Case.Index), "Fan, " + caseTitle(a) + ": the P10–P90 band and P50 of the stimulated area over time.",
			fanChart(m, a, conv)})
		pm, err := probabilityMap(m, a)
		if err != nil {
			return nil, nil, err
		}
		pm.Wells = wells
		ps = append(ps, picture{probabilityPictureFile(a.Case.Index), "Probability map, " + caseTitle(a) +
			": where stimulation is likely (share of realizations), with the 10, 50 and 90 % contours.", pm})
	}
	for _, p := range m.Pairings() {
		if m.Cases[p.Case].Grid != m.Cases[p.Reference].Grid {
			notes = append(notes, fmt.Sprintf("No difference map of %s against %s: their map grids differ.", m.Cases[p.Case].Label, m.Cases[p.Reference].Label))
			continue
		}
		dm, err := differenceMap(m, &aggs[p.Case], &aggs[p.Reference])
		if err != nil {
			return nil, nil, err
		}
		dm.Wells = wells
		ps = append(ps, picture{differencePictureFile(p.Case, p.Reference), fmt.Sprintf("Difference map, %s minus %s: "+
			"where the swept value makes stimulation more (red, dashed contour) or less (blue, dotted) likely on the same networks.",
			caseTitle(&aggs[p.Case]), caseTitle(&aggs[p.Reference])), dm})
	}
	if rd, note := ratioChart(m, aggs); rd != nil {
		ps = append(ps, picture{PairedRatiosFile, "Paired ratios: the distribution over the realizations of each case's final area " +
			"divided by its reference case's on the same network (right of 1: larger).", rd})
		if note != "" {
			notes = append(notes, note)
		}
	}
	return ps, notes, nil
}

// comparisonChart compares the final stimulated area across cases.
func comparisonChart(m *batch.Manifest, aggs []batch.CaseAggregate) *report.Comparison {
	cmp := &report.Comparison{Title: m.Scenario.Name + " — final stimulated area by case", Convention: Convention(m.Realizations),
		Sweep: sweepLabel(m)}
	for i := range aggs {
		a := &aggs[i]
		cmp.Categories = append(cmp.Categories, caseTitle(a))
		cmp.P10, cmp.P50, cmp.P90 = append(cmp.P10, a.Final.P10), append(cmp.P50, a.Final.P50), append(cmp.P90, a.Final.P90)
		cmp.Mean = append(cmp.Mean, a.Final.Mean)
	}
	return cmp
}

// fanChart is case a's percentile fan of the stimulated area.
func fanChart(m *batch.Manifest, a *batch.CaseAggregate, conv string) *report.Fan {
	fan := &report.Fan{Title: fmt.Sprintf("%s — stimulated area, %s", m.Scenario.Name, caseTitle(a)), Convention: conv, Time: a.Times}
	for _, s := range a.Area {
		fan.P10, fan.P50, fan.P90, fan.Mean = append(fan.P10, s.P10), append(fan.P50, s.P50), append(fan.P90, s.P90), append(fan.Mean, s.Mean)
	}
	return fan
}

// mapGrid is a batch grid as a report grid.
func mapGrid(g gis.Grid) report.MapGrid {
	return report.MapGrid{Cols: g.Cols, Rows: g.Rows, CellSize: g.CellSize, XMin: g.XMin, YMin: g.YMin}
}

// contour outlines the cells whose value is at least level.
func contour(label string, g gis.Grid, values []float64, level float64) (report.Contour, error) {
	mp, err := gis.ThresholdOutline(g, values, level)
	if err != nil {
		return report.Contour{}, err
	}
	return report.Contour{Label: label, Polygons: reportPolygons(mp)}, nil
}

// reportPolygons converts map polygons.
func reportPolygons(mp orb.MultiPolygon) []report.Polygon {
	var out []report.Polygon
	for _, poly := range mp {
		var p report.Polygon
		for _, ring := range poly {
			var pr []report.Point
			for _, q := range ring {
				pr = append(pr, rp(q[0], q[1]))
			}
			p = append(p, pr)
		}
		out = append(out, p)
	}
	return out
}

// rasterValues are a raster's cells as float64.
func rasterValues(r gis.Raster) []float64 {
	v := make([]float64, len(r.Data))
	for i, x := range r.Data {
		v[i] = float64(x)
	}
	return v
}

// probabilityMap is case a's stimulation probability with its 10, 50 and
// 90 % contours (ContourLevels).
func probabilityMap(m *batch.Manifest, a *batch.CaseAggregate) (*report.ProbabilityMap, error) {
	r, _, err := ProbabilityRaster(a)
	if err != nil {
		return nil, err
	}
	pm := &report.ProbabilityMap{Title: fmt.Sprintf("%s — stimulation probability, %s", m.Scenario.Name, caseTitle(a)),
		Note: fmt.Sprintf("Share of %d realizations in which each %g m cell was stimulated", a.Realizations, r.Grid.CellSize),
		Grid: mapGrid(r.Grid), Probability: rasterValues(r)}
	for _, level := range ContourLevels {
		c, err := contour(fmt.Sprintf("%.0f %%", 100*level), r.Grid, pm.Probability, level)
		if err != nil {
			return nil, err
		}
		pm.Contours = append(pm.Contours, c)
	}
	return pm, nil
}

// differenceMap is case a's probability minus its reference ref's with
// the ±DifferenceLevel contours.
func differenceMap(m *batch.Manifest, a, ref *batch.CaseAggregate) (*report.DifferenceMap, error) {
	r, _, err := ProbabilityDifferenceRaster(a, ref)
	if err != nil {
		return nil, err
	}
	v := rasterValues(r)
	neg := make([]float64, len(v))
	for i, x := range v {
		neg[i] = -x
	}
	dm := &report.DifferenceMap{Title: fmt.Sprintf("%s — stimulation probability, %s minus %s", m.Scenario.Name, caseTitle(a), caseTitle(ref)),
		Note: fmt.Sprintf("Same %d networks in both cases", a.Realizations),
		Grid: mapGrid(r.Grid), Difference: v, Case: caseTitle(a), Reference: caseTitle(ref)}
	less, err := contour(fmt.Sprintf("≤ −%g", DifferenceLevel), r.Grid, neg, DifferenceLevel)
	if err != nil {
		return nil, err
	}
	more, err := contour(fmt.Sprintf("≥ +%g", DifferenceLevel), r.Grid, v, DifferenceLevel)
	if err != nil {
		return nil, err
	}
	dm.Contours = []report.Contour{less, more} // Dotted, dashed.
	return dm, nil
}

// ratioChart is the distribution of the paired ratios of the final
// stimulated area, one line per pairing, or nil when the batch has no
// pairing or no ratio is defined; the note counts the pairs left out (a
// zero area in either case).
func ratioChart(m *batch.Manifest, aggs []batch.CaseAggregate) (*report.RatioDistribution, string) {
	pairings := m.Pairings()
	if len(pairings) == 0 {
		return nil, ""
	}
	rd := &report.RatioDistribution{Title: m.Scenario.Name + " — final stimulated area against the reference case, same networks",
		Quantity: "Final stimulated area", Reference: "reference case"}
	if len(m.Sweeps) == 1 {
		rd.Reference = m.Cases[pairings[0].Reference].Label
	}
	dropped := 0
	for _, p := range pairings {
		se := report.RatioSeries{Label: m.Cases[p.Case].Label}
		if len(m.Sweeps) > 1 {
			se.Label += " / " + m.Cases[p.Reference].Label
		}
		for r, res := range aggs[p.Case].Results {
			a, b := res.FinalArea, aggs[p.Reference].Results[r].FinalArea
			if a > 0 && b > 0 {
				se.Ratios = append(se.Ratios, a/b)
			} else {
				dropped++
			}
		}
		if len(se.Ratios) > 0 {
			rd.Cases = append(rd.Cases, se)
		}
	}
	if len(rd.Cases) == 0 {
		return nil, ""
	}
	if dropped > 0 {
		rd.Note = fmt.Sprintf("%d pairs left out: a zero final area in either case has no ratio.", dropped)
	}
	return rd, rd.Note
}
