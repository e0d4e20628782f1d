package batch

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/stat"
)

// QuantileKind is the percentile convention of every aggregate: gonum's
// stat.Empirical, Hyndman & Fan (1996) definition 1, the inverse of the
// empirical distribution function. For n sorted values x₁ ≤ … ≤ xₙ:
//
//	Q(p) = x_k,  k = ⌈n·p⌉ (k = 1 for p = 0)
//
// so a percentile is always one of the realizations' values: the smallest
// value that at least the fraction p of the realizations do not exceed.
// With 20 realizations P10 = x₂, P50 = x₁₀ and P90 = x₁₈.
const QuantileKind = stat.Empirical

// Percentiles reported: P10, P50, P90 are the 10th, 50th and 90th
// percentiles in ascending order, so P10 ≤ P50 ≤ P90: P90 is the large
// value, exceeded by about a tenth of the realizations.
var percentileLevels = [3]float64{0.10, 0.50, 0.90}

// Stats summarises one quantity over a case's realizations.
type Stats struct {
	// P10, P50 and P90 under QuantileKind; Mean; Std is the sample
	// standard deviation (n − 1 in the denominator), NaN for one value.
	P10, P50, P90, Mean, Std float64
	// Max is the largest value.
	Max float64
}

// Summarize returns the Stats of values, which it sorts in place (the
// mean and standard deviation are taken over the sorted values, so they
// do not depend on the order given). It panics on an empty slice.
func Summarize(values []float64) Stats {
	if len(values) == 0 {
		panic("batch: Summarize: no values")
	}
	slices.Sort(values)
	mean, std := stat.MeanStdDev(values, nil)
	return Stats{
		P10:  stat.Quantile(percentileLevels[0], QuantileKind, values, nil),
		P50:  stat.Quantile(percentileLevels[1], QuantileKind, values, nil),
		P90:  stat.Quantile(percentileLevels[2], QuantileKind, values, nil),
		Mean: mean, Std: std, Max: values[len(values)-1],
	}
}

const percentilesComment = `# slipfront batch: stimulated map area per case and time, over all realizations of the case.
# P10, P50, P90 are the 10th, 50th and 90th percentiles in ascending order (P10 <= P50 <= P90; P90 is the larger value),
# computed as gonum stat.Quantile with stat.Empirical (Hyndman and Fan 1996, definition 1: the value of rank ceil(n*p), always a realization's value).
# std is the sample standard deviation (n - 1 denominator), empty for a single realization. Areas in m2, time in s.
`

const comparisonComment = `# slipfront batch: one row per case. Percentiles as in percentiles.csv: P10 <= P50 <= P90 (ascending; P90 is the larger value),
# gonum stat.Quantile with stat.Empirical (Hyndman and Fan 1996, definition 1: the value of rank ceil(n*p)). max_magnitude_Mw is empty when no realization had an event.
`

// aggregate reads every result of a complete batch in (case,
// realization) order and writes realizations.csv, percentiles.csv,
// comparison.csv and one probability grid per case into dir.
func aggregate(ctx context.Context, dir string, m *Manifest, hooks *Hooks) error {
	var realBuf, pctBuf, cmpBuf bytes.Buffer
	realCSV, pctCSV, cmpCSV := csv.NewWriter(&realBuf), csv.NewWriter(&pctBuf), csv.NewWriter(&cmpBuf)
	pctBuf.WriteString(percentilesComment)
	cmpBuf.WriteString(comparisonComment)
	keys := make([]string, len(m.Sweeps))
	for i, s := range m.Sweeps {
		keys[i] = s.Key
	}
	head := func(cols ...string) []string { return append(append([]string{"case"}, keys...), cols...) }
	realCSV.Write(head("realization", "network_digest", "final_area_m2", "fracture_area_m2", "events",
		"max_magnitude_Mw", "peak_bhp_MPa", "injected_volume_m3"))
	pctCSV.Write(head("time_s", "p10_area_m2", "p50_area_m2", "p90_area_m2", "mean_area_m2", "std_area_m2"))
	cmpCSV.Write(head("realizations", "p10_final_area_m2", "p50_final_area_m2", "p90_final_area_m2", "mean_final_area_m2",
		"p10_fracture_area_m2", "p50_fracture_area_m2", "p90_fracture_area_m2", "mean_events", "max_magnitude_Mw",
		"p50_peak_bhp_MPa", "max_peak_bhp_MPa", "mean_injected_volume_m3"))

	grids := make([][]byte, len(m.Cases))
	for c := range m.Cases {
		if err := ctx.Err(); err != nil {
			return fmt.Errorf("batch: aggregating interrupted: %w", err)
		}
		cs, err := readCase(dir, m, c, hooks, realCSV)
		if err != nil {
			return fmt.Errorf("batch: aggregating: %w", err)
		}
		a := cs.aggregate(m.Cases[c])
		writePercentiles(pctCSV, &a)
		writeComparison(cmpCSV, &a)
		var b bytes.Buffer
		if err := WriteProbabilityGrid(&b, cs.grid); err != nil {
			return err
		}
		grids[c] = b.Bytes()
	}
	for _, w := range []*csv.Writer{realCSV, pctCSV, cmpCSV} {
		w.Flush()
		if err := w.Error(); err != nil {
			return fmt.Errorf("batch: aggregating: %w", err)
		}
	}
	for c, b := range grids {
		if err := writeBytesAtomic(dir, ProbabilityGridName(c), b); err != nil {
			return err
		}
	}
	for _, f := range []struct {
		name string
		b    []byte
	}{{RealizationsName, realBuf.Bytes()}, {PercentilesName, pctBuf.Bytes()}, {ComparisonName, cmpBuf.Bytes()}} {
		if err := writeBytesAtomic(dir, f.name, f.b); err != nil {
			return err
		}
	}
	return nil
}

// caseStats gathers one case's results.
type caseStats struct {
	area                               [][]float64 // [realization][time]
	final, fracture, events, peak, vol []float64
	maxMw                              float64 // NaN when no events
	grid                               *ProbabilityGrid
}

// readCase reads case c's results in realization order, writing their
// rows to realCSV when it is not nil.
func readCase(dir string, m *Manifest, c int, hooks *Hooks, realCSV *csv.Writer) (*caseStats, error) {
	mc := &m.Cases[c]
	n := m.Realizations
	cs := &caseStats{
		area: make([][]float64, n), final: make([]float64, n), fracture: make([]float64, n),
		events: make([]float64, n), peak: make([]float64, n), vol: make([]float64, n), maxMw: math.NaN(),
	}
	counts := make([]int32, mc.Grid.Cells())
	for r := range n {
		res, err := readResultFile(dir, c, r, mc, hooks)
		if err != nil {
			return nil, err
		}
		if realCSV != nil {
			row := append([]string{strconv.Itoa(c)}, mc.Values...)
			realCSV.Write(append(row, strconv.Itoa(r), res.NetworkDigest, formatFloat(res.FinalArea),
				formatFloat(res.FractureArea), strconv.Itoa(res.Events), formatOptional(res.MaxMagnitude),
				formatFloat(res.PeakPressure/1e6), formatFloat(res.InjectedVolume)))
		}
		cs.area[r] = res.Area
		cs.final[r], cs.fracture[r], cs.events[r] = res.FinalArea, res.FractureArea, float64(res.Events)
		cs.peak[r], cs.vol[r] = res.PeakPressure, res.InjectedVolume
		if res.Events > 0 && !(res.MaxMagnitude <= cs.maxMw) {
			cs.maxMw = res.MaxMagnitude
		}
		for _, i := range res.Cells {
			counts[i]++
		}
	}
	cs.grid = &ProbabilityGrid{Case: c, Label: mc.Label, Realizations: n, Grid: mc.Grid}
	for i, k := range counts {
		if k > 0 {
			cs.grid.Cells = append(cs.grid.Cells, CellCount{Index: i, Count: int(k)})
		}
	}
	return cs, nil
}

// aggregate sums up the case's realizations.
func (cs *caseStats) aggregate(mc ManifestCase) CaseAggregate {
	a := CaseAggregate{Case: mc, Realizations: len(cs.final), MaxMagnitude: cs.maxMw, Probability: cs.grid,
		Final: Summarize(cs.final), Fracture: Summarize(cs.fracture), Events: Summarize(cs.events),
		PeakPressure: Summarize(cs.peak), InjectedVolume: Summarize(cs.vol)}
	at := make([]float64, len(cs.area))
	for k := range mc.TimeGrid.Points {
		for r := range cs.area {
			at[r] = cs.area[r][k]
		}
		a.Times = append(a.Times, mc.TimeGrid.Time(k))
		a.Area = append(a.Area, Summarize(at))
	}
	return a
}

func writePercentiles(w *csv.Writer, a *CaseAggregate) {
	for k, s := range a.Area {
		row := append([]string{strconv.Itoa(a.Case.Index)}, a.Case.Values...)
		w.Write(append(row, formatFloat(a.Times[k]), formatFloat(s.P10), formatFloat(s.P50),
			formatFloat(s.P90), formatFloat(s.Mean), formatOptional(s.Std)))
	}
}

func writeComparison(w *csv.Writer, a *CaseAggregate) {
	final, frac := a.Final, a.Fracture
	row := append([]string{strconv.Itoa(a.Case.Index)}, a.Case.Values...)
	w.Write(append(row, strconv.Itoa(a.Realizations),
		formatFloat(final.P10), formatFloat(final.P50), formatFloat(final.P90), formatFloat(final.Mean),
		formatFloat(frac.P10), formatFloat(frac.P50), formatFloat(frac.P90),
		formatFloat(a.Events.Mean), formatOptional(a.MaxMagnitude),
		formatFloat(a.PeakPressure.P50/1e6), formatFloat(a.PeakPressure.Max/1e6), formatFloat(a.InjectedVolume.Mean)))
}

// formatOptional is formatFloat, with NaN written as an empty field.
func formatOptional(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	return formatFloat(v)
}

// CaseAggregate is what a complete batch found for one case: the numbers
// of percentiles.csv, comparison.csv and the case's probability grid.
type CaseAggregate struct {
	Case         ManifestCase
	Realizations int
	// Times of the case's time grid, s, and the stimulated area over the
	// realizations at each, m².
	Times []float64
	Area  []Stats
	// Final and Fracture stimulated areas, m²; Events; PeakPressure, Pa;
	// InjectedVolume, m³.
	Final, Fracture, Events, PeakPressure, InjectedVolume Stats
	// MaxMagnitude over all realizations; NaN when none had an event.
	MaxMagnitude float64
	Probability  *ProbabilityGrid
}

// ReadAggregates reads every result of the complete batch folder dir (a
// whole batch or a merge of all its shards) and returns its manifest and
// the aggregates of every case, for pictures and maps.
func ReadAggregates(ctx context.Context, dir string) (*Manifest, []CaseAggregate, error) {
	m, err := readManifestFile(dir)
	if err != nil {
		return nil, nil, err
	}
	if m.Shard.Count > 1 {
		return nil, nil, inputErrorf("%s holds shard %d/%d of a batch: merge the shards first", dir, m.Shard.Index, m.Shard.Count)
	}
	out := make([]CaseAggregate, len(m.Cases))
	for c := range m.Cases {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		cs, err := readCase(dir, m, c, nil, nil)
		if err != nil {
			return nil, nil, err
		}
		out[c] = cs.aggregate(m.Cases[c])
	}
	return m, out, nil
}
