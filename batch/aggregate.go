package batch

import (
	"context"
	"fmt"
	"math"
	"slices"

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

// Percentiles reported: P10, P50, P90 (the tables' _q10, _q50, _q90
// columns) are the 10th, 50th and 90th percentiles in ascending order, so
// P10 ≤ P50 ≤ P90: P90 is the high case, exceeded by about a tenth of the
// realizations.
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

// aggregate reads every result of a complete batch in (case,
// realization) order and writes the batch's tables, probability grids,
// CSV metadata and summary into dir (see the package documentation).
func aggregate(ctx context.Context, dir string, m *Manifest, hooks *Hooks) error {
	aggs, err := readAggregates(ctx, dir, m, hooks)
	if err != nil {
		return fmt.Errorf("batch: aggregating: %w", err)
	}
	files, err := renderAggregates(m, aggs)
	if err != nil {
		return fmt.Errorf("batch: aggregating: %w", err)
	}
	for _, f := range files {
		if err := writeBytesAtomic(dir, f.name, f.data); err != nil {
			return err
		}
	}
	return nil
}

// readAggregates reads every case's results in (case, realization) order
// and sums them up.
func readAggregates(ctx context.Context, dir string, m *Manifest, hooks *Hooks) ([]CaseAggregate, error) {
	out := make([]CaseAggregate, len(m.Cases))
	for c := range m.Cases {
		if err := ctx.Err(); err != nil {
			return nil, fmt.Errorf("interrupted: %w", err)
		}
		cs, err := readCase(dir, m, c, hooks)
		if err != nil {
			return nil, err
		}
		out[c] = cs.aggregate(m.Cases[c])
	}
	return out, nil
}

// caseStats gathers one case's results.
type caseStats struct {
	results                            []*Result
	final, fracture, events, peak, vol []float64
	maxMw                              float64 // NaN when no events
	grid                               *ProbabilityGrid
}

// readCase reads case c's results in realization order.
func readCase(dir string, m *Manifest, c int, hooks *Hooks) (*caseStats, error) {
	mc := &m.Cases[c]
	n := m.Realizations
	cs := &caseStats{
		results: make([]*Result, n), final: make([]float64, n), fracture: make([]float64, n),
		events: make([]float64, n), peak: make([]float64, n), vol: make([]float64, n), maxMw: math.NaN(),
	}
	counts := make([]int32, mc.Grid.Cells())
	for r := range n {
		res, err := readResultFile(dir, c, r, mc, hooks)
		if err != nil {
			return nil, err
		}
		cs.final[r], cs.fracture[r], cs.events[r] = res.FinalArea, res.FractureArea, float64(res.Events)
		cs.peak[r], cs.vol[r] = res.PeakPressure, res.InjectedVolume
		if res.Events > 0 && !(res.MaxMagnitude <= cs.maxMw) {
			cs.maxMw = res.MaxMagnitude
		}
		for _, i := range res.Cells {
			counts[i]++
		}
		res.Cells = nil // counted; the aggregates keep the rest
		cs.results[r] = res
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
		PeakPressure: Summarize(cs.peak), InjectedVolume: Summarize(cs.vol),
		Results: cs.results, Warnings: CountWarnings(cs.results)}
	at := make([]float64, len(cs.results))
	for k := range mc.TimeGrid.Points {
		for r, res := range cs.results {
			at[r] = res.Area[k]
		}
		a.Times = append(a.Times, mc.TimeGrid.Time(k))
		a.Area = append(a.Area, Summarize(at))
	}
	for _, res := range cs.results {
		res.Area = nil // summarised
	}
	return a
}

// formatOptional is formatFloat, with NaN written as an empty field.
func formatOptional(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	return formatFloat(v)
}

// CaseAggregate is what a complete batch found for one case: the numbers
// of its tables and its probability grid.
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
	// Results are the case's realizations in order, without their area
	// curves and cells (summarised above).
	Results []*Result
	// Warnings of the case's realizations, counted by kind.
	Warnings []WarningCount
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
	aggs, err := readAggregates(ctx, dir, m, nil)
	if err != nil {
		return nil, nil, err
	}
	return m, aggs, nil
}
