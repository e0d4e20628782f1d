package pipeline

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/internal/orient"
	"slipfront/mechanics"
	"slipfront/report"
	"slipfront/scenarios"
)

// folderScenario reads the resolved scenario of a generate or screen
// folder.
func folderScenario(dir, kind string) (*scenarios.Scenario, error) {
	s, err := readScenario(filepath.Join(dir, ScenarioFile))
	if errors.Is(err, fs.ErrNotExist) {
		return nil, badinput.Errorf("%s: the %s folder has no %s (written by slipfront since pictures were added): run %s again",
			dir, kind, ScenarioFile, kind)
	}
	return s, err
}

// writeScreenReport screens realization 0 of the folder's scenario again,
// checks the result against the folder's screen table, and writes the
// screening's pictures and page.
func writeScreenReport(dir, out string) error {
	s, err := folderScenario(dir, "screen")
	if err != nil {
		return err
	}
	net, sc, d, err := screen(s)
	if err != nil {
		return err
	}
	ticks, err := stressTicks(s, d)
	if err != nil {
		return err
	}
	if err := sameAsFile(dir, ScreenTableFile, sc.WriteCSV); err != nil {
		return err
	}
	p := basePage(s.Name+" — stress screening", s)
	p.Facts = stressFacts(sc)
	if sc.Limit.Warning != "" {
		p.Notes = append(p.Notes, sc.Limit.Warning)
	}
	p.Tables = []report.Table{shareTable(sc)}
	return writePage(out, p, screenPictures(s, net, sc, ticks))
}

// sameAsFile refuses a folder whose file name differs from what write
// writes: a folder edited or mixed with another scenario's.
func sameAsFile(dir, name string, write func(io.Writer) error) error {
	got, err := os.ReadFile(filepath.Join(dir, name))
	if err != nil {
		return err
	}
	var want bytes.Buffer
	if err := write(&want); err != nil {
		return err
	}
	if !bytes.Equal(got, want.Bytes()) {
		return badinput.Errorf("%s: %s differs from what its %s gives: the folder was changed or mixes two scenarios", dir, name, ScenarioFile)
	}
	return nil
}

// stressFacts are the stress state, the criterion and the frictional
// limit of a screening.
func stressFacts(sc *mechanics.Screening) [][2]string {
	st := sc.Stress
	var facts [][2]string
	for k, p := range st.Principal() {
		trend, plunge := orient.TrendAndPlunge(p.Axis)
		facts = append(facts, [2]string{fmt.Sprintf("S%d (%s)", k+1, p.Name),
			fmt.Sprintf("%.2f MPa, trend %s°, plunge %s°", p.Value/1e6, degrees1(trend), degrees1(plunge))})
	}
	regime := st.Regime()
	if regime == "" {
		regime = "-"
	}
	l := sc.Limit
	verdict := "within the limit"
	if l.Exceeded {
		verdict = "exceeds the limit"
	}
	return append(facts,
		[2]string{"pore pressure", fmt.Sprintf("%.2f MPa", st.PorePressure()/1e6)},
		[2]string{"faulting regime", regime},
		[2]string{"friction, cohesion", fmt.Sprintf("%.2f, %.2f MPa", sc.Criterion.Friction, sc.Criterion.Cohesion/1e6)},
		[2]string{"frictional limit", fmt.Sprintf("(S1 − p)/(S3 − p) = %.3f, limit %.3f: %s", l.Ratio, l.Limit, verdict)},
		[2]string{"fractures screened", fmt.Sprint(len(sc.Planes))},
	)
}

// degrees1 writes an angle, radians, in degrees with one decimal, without
// the sign of a round-off below the last decimal ("0.0", not "-0.0").
func degrees1(a float64) string {
	d := math.Round(a*180/math.Pi*10) / 10
	if d == 0 {
		d = 0 // Drops the sign of −0.
	}
	return fmt.Sprintf("%.1f", d)
}

// shareTable is the share of fractures and of trace length that slip at
// the screening's pressure increases, per set and in total.
func shareTable(sc *mechanics.Screening) report.Table {
	t := report.Table{Caption: "Share of fractures (and of trace length) that slip at a pore-pressure increase of",
		Header: []string{"set", "fractures"}}
	for _, dp := range sc.Increases {
		t.Header = append(t.Header, fmt.Sprintf("%g MPa", dp/1e6))
	}
	for _, sh := range append(append([]mechanics.Shares(nil), sc.Sets...), sc.Total) {
		row := []string{sh.Name, fmt.Sprint(sh.Fractures)}
		for k := range sc.Increases {
			row = append(row, fmt.Sprintf("%.1f %% (%.1f %%)", 100*sh.FractureShare[k], 100*sh.TraceLengthShare[k]))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// writeGenerateReport generates realization 0 of the folder's scenario
// again, checks it against the folder's network.json, and writes the
// network's pictures and page with its statistics.
func writeGenerateReport(dir, out string) error {
	s, err := folderScenario(dir, "generate")
	if err != nil {
		return err
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		return err
	}
	var recorded dfn.NetworkJSON
	if err := readFile(filepath.Join(dir, NetworkFile), func(r io.Reader) error { return json.NewDecoder(r).Decode(&recorded) }); err != nil {
		return fmt.Errorf("%s: %w", NetworkFile, err)
	}
	if d := net.Digest(); recorded.Digest != d {
		return badinput.Errorf("%s: %s records network %.12s…, but its %s generates %.12s…: the folder mixes two scenarios",
			dir, NetworkFile, recorded.Digest, ScenarioFile, d)
	}
	ps, err := networkPictures(s, net)
	if err != nil {
		return err
	}
	st := net.Stats()
	p := basePage(s.Name+" — fracture network", s)
	p.Facts = [][2]string{
		{"seed, realization", fmt.Sprintf("%d, %d", net.Seed, net.Realization)}, {"network digest", net.Digest()},
		{"fractures, traces", fmt.Sprintf("%d, %d", st.Fractures, st.Traces)},
		{"P32 (counting volume)", fmt.Sprintf("%.4g 1/m", st.P32)}, {"P21 (mid-plane)", fmt.Sprintf("%.4g 1/m", st.P21)},
		{"intersections", fmt.Sprintf("%d (%.3g per trace)", st.Intersections, st.MeanIntersectionsPerTrace)},
		{"clusters", fmt.Sprintf("%d; the largest holds %.1f %% of the trace length", st.Clusters, 100*st.LargestClusterFraction)},
	}
	sets := report.Table{Caption: "Sets", Header: []string{"set", "fractures", "traces", "P32 target 1/m", "P32 1/m", "P21 1/m", "κ estimate"}}
	for _, ss := range st.Sets {
		sets.Rows = append(sets.Rows, []string{ss.Name, fmt.Sprint(ss.Count), fmt.Sprint(ss.Traces), optional(ss.P32Target, "%.4g"),
			fmt.Sprintf("%.4g", ss.P32), fmt.Sprintf("%.4g", ss.P21), optional(ss.KappaEstimate, "%.3g")})
	}
	wells := report.Table{Caption: "Wells", Header: []string{"well", "path length m", "crossings", "P10 1/m", "traces crossed"}}
	for _, w := range st.Wells {
		wells.Rows = append(wells.Rows, []string{w.Name, fmt.Sprintf("%.0f", w.PathLength), fmt.Sprint(w.Crossings),
			fmt.Sprintf("%.4g", w.P10), fmt.Sprint(w.CrossedTraces)})
	}
	p.Tables = []report.Table{sets, wells}
	return writePage(out, p, ps)
}

// optional formats v, or "-" for NaN.
func optional(v float64, format string) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf(format, v)
}
