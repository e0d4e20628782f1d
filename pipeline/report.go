package pipeline

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"

	"slipfront/batch"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/report"
	"slipfront/sim"
)

// WriteReport writes the pictures and an index.html of the run or batch
// folder dir into the folder out (as a whole, like every folder; see
// Folder). A stopped run's partial folder gets its map, drawn from the
// recovered frames, and its notes.
func WriteReport(ctx context.Context, dir string, out Folder) error {
	var write func(string) error
	switch {
	case IsRunDir(dir):
		write = func(to string) error { return writeRunReport(dir, to) }
	case isBatchDir(dir):
		write = func(to string) error { return writeBatchReport(ctx, dir, to) }
	default:
		return badinput.Errorf("%s is neither a run folder (%s, %s) nor a batch folder (%s)", dir, ScenarioFile, SnapshotFile, batch.ManifestName)
	}
	st, err := out.begin()
	if err != nil {
		return err
	}
	if err := write(st.Dir); err != nil {
		return errors.Join(err, st.Abandon())
	}
	return st.Commit()
}

func writeRunReport(dir, out string) error {
	r, err := LoadRun(dir, math.NaN())
	if err != nil {
		return err
	}
	warnings := r.Notes
	if r.Complete {
		if _, err := openRunFolder(dir, r.Scenario, TimelineFile, SummaryFile); err != nil {
			return err
		}
		if err := readFile(filepath.Join(dir, TimelineFile), func(f io.Reader) (err error) {
			r.Result.Timeline, err = sim.ReadTimeline(f, TimelineFile, r.Scenario)
			return err
		}); err != nil {
			return err
		}
		var runWarnings []sim.Warning
		if err := readFile(filepath.Join(dir, SummaryFile), func(f io.Reader) (err error) {
			r.Result.Stages, runWarnings, err = sim.ReadSummary(f, SummaryFile)
			return err
		}); err != nil {
			return err
		}
		warnings = append(warnings, warningNotes(runWarnings)...)
	}
	if err := writeRunPictures(out, r); err != nil {
		return err
	}
	page := r.page(warnings)
	return outdir.WriteFile(out, ReportPageFile, page.WriteHTML)
}

func readFile(path string, read func(io.Reader) error) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	return read(f)
}

// page is the HTML page of a run.
func (r *Run) page(warnings []string) *report.Page {
	s, res := r.Scenario, r.Result
	var last sim.Sample
	if n := len(res.Timeline); n > 0 {
		last = res.Timeline[n-1]
	}
	maxMw := sim.MaxMagnitude(res.Events)
	p := &report.Page{
		Title: s.Name + " — run",
		Facts: [][2]string{
			{"scenario digest", s.Digest}, {"seed, realization", fmt.Sprintf("%d, %d", s.Seed, r.Network.Realization)},
			{"duration", fmt.Sprintf("%.2f h", r.Time/3600)}, {"injected", fmt.Sprintf("%.1f m³", last.Injected)},
			{"stimulated map area", fmt.Sprintf("%.0f m²", last.StimulatedArea)},
			{"stimulated fracture area", fmt.Sprintf("%.0f m²", last.FractureArea)},
			{"events", fmt.Sprintf("%d (largest Mw %s)", len(res.Events), optionalMw(maxMw))},
		},
		Notes:  warnings,
		Images: []report.Image{{File: MapPictureFile, Caption: "Traces by first-slip time, events, stimulated area"}},
	}
	if len(res.Timeline) > 0 {
		p.Images = append(p.Images, report.Image{File: GrowthPictureFile, Caption: "Stimulated area and bottom-hole pressure over time"})
	}
	t := report.Table{Caption: "Stages in pumping order", Header: []string{"stage", "injected m³", "peak BHP MPa", "new area m²", "events", "max Mw"}}
	for _, st := range res.Stages {
		t.Rows = append(t.Rows, []string{st.Name, fmt.Sprintf("%.1f", st.Injected), fmt.Sprintf("%.2f", st.PeakBHP/1e6),
			fmt.Sprintf("%.0f", st.NewArea), fmt.Sprint(st.Events), optionalMw(st.MaxMagnitude)})
	}
	p.Tables = []report.Table{t}
	return p
}

// warningNotes are the warnings' messages, for a page.
func warningNotes(warnings []sim.Warning) []string {
	var notes []string
	for _, w := range warnings {
		notes = append(notes, w.Message)
	}
	return notes
}

func optionalMw(v float64) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf("%.2f", v)
}

func writeBatchReport(ctx context.Context, dir, out string) error {
	m, aggs, err := batch.ReadAggregates(ctx, dir)
	if err != nil {
		return err
	}
	if err := writeBatchCharts(out, m, aggs); err != nil {
		return err
	}
	p := &report.Page{
		Title: m.Scenario.Name + " — batch",
		Facts: [][2]string{{"scenario digest", m.Scenario.Digest}, {"seed", fmt.Sprint(m.Scenario.Seed)},
			{"cases × realizations", fmt.Sprintf("%d × %d", len(m.Cases), m.Realizations)}, {"percentiles", batch.PercentileConvention}},
		Notes:  WarningLines(batch.TotalWarnings(aggs)),
		Images: []report.Image{{File: ComparisonPictureFile, Caption: "Final stimulated area by case"}},
	}
	t := report.Table{Caption: "Cases", Header: []string{"case", "q10 area m²", "q50 area m²", "q90 area m²", "mean events", "max Mw", "q50 peak BHP MPa", "warnings"}}
	for i := range aggs {
		a := &aggs[i]
		warnings, _ := a.WarningTotals()
		t.Rows = append(t.Rows, []string{caseTitle(a), fmt.Sprintf("%.0f", a.Final.P10), fmt.Sprintf("%.0f", a.Final.P50),
			fmt.Sprintf("%.0f", a.Final.P90), fmt.Sprintf("%.1f", a.Events.Mean), optionalMw(a.MaxMagnitude),
			fmt.Sprintf("%.2f", a.PeakPressure.P50/1e6), fmt.Sprint(warnings)})
		p.Images = append(p.Images, report.Image{File: fanPictureFile(a.Case.Index), Caption: "Stimulated area over time, " + caseTitle(a)})
	}
	p.Tables = []report.Table{t}
	if paired := batch.Paired(m, aggs); len(paired) > 0 {
		pt := report.Table{Caption: "Paired comparison with the reference case (same networks): q50 [q10–q90] over the realizations",
			Header: PairedHeader}
		for _, ps := range paired {
			pt.Rows = append(pt.Rows, PairedRow(m, ps))
		}
		p.Tables = append(p.Tables, pt)
	}
	return outdir.WriteFile(out, ReportPageFile, p.WriteHTML)
}

// WarningLines describes warning counts for people: one line per kind
// with the count, the realizations and an example message.
func WarningLines(counts []batch.WarningCount) []string {
	var lines []string
	for _, c := range counts {
		lines = append(lines, fmt.Sprintf("%d × %s in %d realizations, e.g. %s", c.Warnings, c.Kind, c.Realizations, c.Example))
	}
	return lines
}

// PairedHeader heads the rows of PairedRow.
var PairedHeader = []string{"case", "against", "area ratio", "fracture area ratio", "events ratio", "ΔMw"}

// PairedRow is a short row of a pairing for people: the case, its
// reference, and q50 [q10–q90] of the area, fracture-area and events
// ratios and of the difference of the largest magnitude.
func PairedRow(m *batch.Manifest, ps batch.PairedSummary) []string {
	sw := m.Sweeps[ps.Sweep]
	row := []string{m.Cases[ps.Case].Label, sw.Key + "=" + sw.Reference}
	for _, name := range []string{"stimulated_area_ratio", "stimulated_fracture_area_ratio", "events_ratio", "max_magnitude_Mw_difference"} {
		cell := "-"
		for _, st := range ps.Stats {
			if st.Name == name && st.Count > 0 {
				cell = fmt.Sprintf("%.3g [%.3g–%.3g]", st.P50, st.P10, st.P90)
			}
		}
		row = append(row, cell)
	}
	return row
}
