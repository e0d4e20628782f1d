package pipeline

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"slipfront/batch"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/report"
	"slipfront/sim"
)

// WriteReport writes the pictures of the generate, screen, run or batch
// folder dir and an index.html that gathers them into the folder out (as
// a whole, like every folder; see Folder). The page is self-contained:
// the pictures, also written beside it, are embedded. A stopped run's
// partial folder gets its map, drawn from the recovered frames, and its
// notes.
func WriteReport(ctx context.Context, dir string, out Folder) error {
	var write func(string) error
	switch {
	case IsRunDir(dir):
		write = func(to string) error { return writeRunReport(dir, to) }
	case isBatchDir(dir):
		write = func(to string) error { return writeBatchReport(ctx, dir, to) }
	case exists(dir, ScreenSummaryFile):
		write = func(to string) error { return writeScreenReport(dir, to) }
	case exists(dir, NetworkFile):
		write = func(to string) error { return writeGenerateReport(dir, to) }
	default:
		return badinput.Errorf("%s is not a folder of slipfront: a run folder holds %s and %s, a batch folder %s, "+
			"a screen folder %s, a generate folder %s", dir, ScenarioFile, SnapshotFile, batch.ManifestName, ScreenSummaryFile, NetworkFile)
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

// writePage writes the pictures into dir and the page with them embedded
// as ReportPageFile.
func writePage(dir string, p *report.Page, ps []picture) error {
	if err := writePictures(dir, ps); err != nil {
		return err
	}
	p.Images = images(ps)
	for i := range p.Images {
		b, err := os.ReadFile(filepath.Join(dir, p.Images[i].File))
		if err != nil {
			return err
		}
		p.Images[i].Data = b
	}
	return outdir.WriteFile(dir, ReportPageFile, p.WriteHTML)
}

func writeRunReport(dir, out string) error {
	r, err := LoadRun(dir, math.NaN())
	if err != nil {
		return err
	}
	warnings := r.Notes
	var sum sim.Summary
	if r.Complete {
		if _, _, err := openRunFolder(dir, r.Scenario, TimelineFile, SummaryFile); err != nil {
			return err
		}
		if err := readFile(filepath.Join(dir, TimelineFile), func(f io.Reader) (err error) {
			r.Result.Timeline, err = sim.ReadTimeline(f, TimelineFile, r.Scenario)
			return err
		}); err != nil {
			return err
		}
		if err := readFile(filepath.Join(dir, SummaryFile), func(f io.Reader) (err error) {
			sum, err = sim.ReadSummary(f, SummaryFile)
			return err
		}); err != nil {
			return err
		}
		r.Result.Stages = sum.Stages
		warnings = append(warnings, warningNotes(sum.Warnings)...)
	}
	ps, notes, err := r.runPictures()
	if err != nil {
		return err
	}
	return writePage(out, r.page(append(warnings, notes...), sum.Growth), ps)
}

func readFile(path string, read func(io.Reader) error) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	return read(f)
}

// page is the HTML page of a run, with what its fractures did when they
// grew (growth nil otherwise).
func (r *Run) page(warnings []string, growth *sim.GrowthSummary) *report.Page {
	s, res := r.Scenario, r.Result
	var last sim.Sample
	if n := len(res.Timeline); n > 0 {
		last = res.Timeline[n-1]
	}
	maxMw := sim.MaxMagnitude(res.Events)
	p := basePage(s.Name+" — run", s)
	p.Facts = [][2]string{
		{"scenario digest", s.Digest}, {"seed, realization", fmt.Sprintf("%d, %d", s.Seed, r.Network.Realization)},
		{"duration", fmt.Sprintf("%.2f h", r.Time/3600)}, {"injected", fmt.Sprintf("%.1f m³", last.Injected)},
		{"stimulated area", fmt.Sprintf("%.0f m²", last.StimulatedArea)},
		{"stimulated fracture area", fmt.Sprintf("%.0f m²", last.FractureArea)},
		{"events", fmt.Sprintf("%d (largest Mw %s)", len(res.Events), optionalMw(maxMw))},
	}
	p.Notes = warnings
	t := report.Table{Caption: "Stages in pumping order", Header: []string{"stage", "injected m³", "peak BHP MPa", "new area m²", "events", "max Mw"}}
	if growth != nil {
		p.Facts = append(p.Facts,
			[2]string{"growing fractures", fmt.Sprintf("%d, %s", growth.Fractures, growth.HalfLengths())},
			[2]string{"meetings with natural fractures", growth.Meetings()})
		if paths := growth.Paths(); paths != "" {
			p.Facts = append(p.Facts, [2]string{"fracture paths", paths})
		}
		t.Header = append(t.Header, "held in the fractures m³", "held in natural fractures m³")
	}
	rate := s.SeismicityRate.Active()
	if rate {
		t.Header = append(t.Header, "sub-resolution events drawn (expected)")
	}
	for _, st := range res.Stages {
		row := []string{st.Name, fmt.Sprintf("%.1f", st.Injected), fmt.Sprintf("%.2f", st.PeakBHP/1e6),
			fmt.Sprintf("%.0f", st.NewArea), fmt.Sprint(st.Events), optionalMw(st.MaxMagnitude)}
		if growth != nil { // at the end of the stage's pumping, all stages so far
			row = append(row, fmt.Sprintf("%.1f", st.HeldConduits), fmt.Sprintf("%.2f", st.HeldNatural))
		}
		if rate {
			row = append(row, fmt.Sprintf("%d (%.0f)", st.RateEvents, st.RateExpected))
		}
		t.Rows = append(t.Rows, row)
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

func optionalMw(v float64) string { return optional(v, "%.2f") }

func writeBatchReport(ctx context.Context, dir, out string) error {
	m, aggs, err := batch.ReadAggregates(ctx, dir)
	if err != nil {
		return err
	}
	s, err := batch.ReadScenario(dir, m)
	if err != nil {
		return err
	}
	ps, notes, err := batchPictures(m, aggs, s)
	if err != nil {
		return err
	}
	p := &report.Page{
		Title: m.Scenario.Name + " — batch", Program: programName, Date: scenarioDate(m.Scenario.Start),
		Facts: [][2]string{{"scenario digest", m.Scenario.Digest}, {"seed", fmt.Sprint(m.Scenario.Seed)},
			{"cases × realizations", fmt.Sprintf("%d × %d", len(m.Cases), m.Realizations)}, {"percentiles", batch.PercentileConvention},
			{"batch written by", "slipfront " + m.ProgramVersion}},
		Notes:  append(WarningLines(batch.TotalWarnings(aggs)), notes...),
		Inputs: []report.Table{manifestTable(m)},
	}
	if s != nil {
		p.Inputs = append(p.Inputs, InputsTable(s))
	}
	t := report.Table{Caption: "Cases", Header: []string{"case", "q10 area m²", "q50 area m²", "q90 area m²", "mean events", "max Mw", "q50 peak BHP MPa", "warnings"}}
	for i := range aggs {
		a := &aggs[i]
		warnings, _ := a.WarningTotals()
		t.Rows = append(t.Rows, []string{caseTitle(a), fmt.Sprintf("%.0f", a.Final.P10), fmt.Sprintf("%.0f", a.Final.P50),
			fmt.Sprintf("%.0f", a.Final.P90), fmt.Sprintf("%.1f", a.Events.Mean), optionalMw(a.MaxMagnitude),
			fmt.Sprintf("%.2f", a.PeakPressure.P50/1e6), fmt.Sprint(warnings)})
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
	return writePage(out, p, ps)
}

// manifestTable is what a batch was computed from: its scenario's name
// and digest, its sweeps and realizations.
func manifestTable(m *batch.Manifest) report.Table {
	t := report.Table{Caption: "Batch manifest (" + batch.ManifestName + ")", Header: []string{"key", "value"},
		Rows: [][]string{{"scenario", m.Scenario.Name}, {"scenario digest", m.Scenario.Digest},
			{"seed", fmt.Sprint(m.Scenario.Seed)}, {"schedule.start", m.Scenario.Start},
			{"realizations per case", fmt.Sprint(m.Realizations)}}}
	for _, sw := range m.Sweeps {
		t.Rows = append(t.Rows, []string{"sweep " + sw.Key, strings.Join(sw.Values, ", ") + " (reference " + sw.Reference + ")"})
	}
	return t
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
