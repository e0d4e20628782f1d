package pipeline

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"slipfront/gis"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
)

// folderFiles lists the names in dir, without the hidden temporary files
// of an unfinished write (there must be none).
func folderFiles(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	slices.Sort(names)
	return names
}

func loadExample(t *testing.T, name string, sets ...string) *scenarios.Scenario {
	t.Helper()
	ov, err := scenarios.ParseOverrides(sets)
	if err != nil {
		t.Fatal(err)
	}
	s, err := scenarios.LoadExample(name, ov...)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Generate and Screen write exactly their folders' files, and refuse a
// non-empty folder without Force.
func TestGenerateAndScreenFolders(t *testing.T) {
	s := loadExample(t, "single-fracture")
	gen := t.TempDir()
	net, st, err := Generate(s, Folder{Dir: gen}, Limits{})
	if err != nil {
		t.Fatal(err)
	}
	if len(net.Fractures) != 1 || st.Fractures != 1 {
		t.Errorf("single-fracture network has %d fractures (stats %d), want 1", len(net.Fractures), st.Fractures)
	}
	if got, want := folderFiles(t, gen), []string{CSVMetadataFile, NetworkFracturesFile, NetworkFile, ScenarioFile, TracesFile}; !slices.Equal(got, want) {
		t.Errorf("generate folder holds %v, want %v", got, want)
	}
	if _, _, err := Generate(s, Folder{Dir: gen}, Limits{}); !errors.Is(err, outdir.ErrExists) || !errors.Is(err, badinput.Err) {
		t.Errorf("second Generate into the same folder: error %v, want an existing-output input error", err)
	}
	if _, _, err := Generate(s, Folder{Dir: gen, Force: true}, Limits{}); err != nil {
		t.Errorf("Generate with Force: %v", err)
	}

	scr := t.TempDir()
	sc, err := Screen(s, Folder{Dir: scr}, Limits{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sc.Planes) != 1 {
		t.Errorf("screening of %d planes, want 1", len(sc.Planes))
	}
	want := []string{CSVMetadataFile, CriticalMapFile, MohrPictureFile, ScenarioFile, ScreenTableFile, ScreenSummaryFile,
		SlipSharesPictureFile, SlipCurveFile, CriticalNetFile, SlipTendencyNetFile}
	slices.Sort(want)
	if got := folderFiles(t, scr); !slices.Equal(got, want) {
		t.Errorf("screen folder holds %v, want %v", got, want)
	}
	checkFolderReports(t, gen, scr)
}

// checkFolderReports reports on the generate and screen folders: their
// pictures and the page, byte-identical twice; then swaps or removes
// their scenario, which the report refuses.
func checkFolderReports(t *testing.T, gen, scr string) {
	t.Helper()
	for _, c := range []struct {
		dir  string
		want []string
	}{
		{gen, []string{NetworkMapFile, PolesPictureFile, ReportPageFile}},
		{scr, []string{CriticalMapFile, MohrPictureFile, SlipSharesPictureFile, CriticalNetFile, SlipTendencyNetFile, ReportPageFile}},
	} {
		rep := t.TempDir()
		if err := WriteReport(context.Background(), c.dir, Folder{Dir: rep}); err != nil {
			t.Fatal(err)
		}
		slices.Sort(c.want)
		if got := folderFiles(t, rep); !slices.Equal(got, c.want) {
			t.Errorf("report of %s holds %v, want %v", c.dir, got, c.want)
		}
		// The same folder gives the same page: no clock time in it.
		again := t.TempDir()
		if err := WriteReport(context.Background(), c.dir, Folder{Dir: again}); err != nil {
			t.Fatal(err)
		}
		a, err := os.ReadFile(filepath.Join(rep, ReportPageFile))
		if err != nil {
			t.Fatal(err)
		}
		b, err := os.ReadFile(filepath.Join(again, ReportPageFile))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a, b) {
			t.Errorf("two reports of %s differ", c.dir)
		}
	}
	// A generate folder whose scenario was swapped is refused.
	other := loadExample(t, "zipper-pad")
	if err := writeFiles(gen, scenarioWriter(other)); err != nil {
		t.Fatal(err)
	}
	if err := WriteReport(context.Background(), gen, Folder{Dir: t.TempDir()}); !errors.Is(err, badinput.Err) ||
		!strings.Contains(err.Error(), "mixes two scenarios") {
		t.Errorf("report of a generate folder with another scenario: %v", err)
	}
	if err := writeFiles(scr, scenarioWriter(other)); err != nil {
		t.Fatal(err)
	}
	if err := WriteReport(context.Background(), scr, Folder{Dir: t.TempDir()}); !errors.Is(err, badinput.Err) ||
		!strings.Contains(err.Error(), "mixes two scenarios") {
		t.Errorf("report of a screen folder with another scenario: %v", err)
	}
	if err := os.Remove(filepath.Join(scr, ScenarioFile)); err != nil {
		t.Fatal(err)
	}
	if err := WriteReport(context.Background(), scr, Folder{Dir: t.TempDir()}); !errors.Is(err, badinput.Err) ||
		!strings.Contains(err.Error(), "run screen again") {
		t.Errorf("report of a screen folder without its scenario: %v", err)
	}
}

// Simulate writes the run folder that LoadRun and WriteReport read, and
// the batch runner gives the same totals as the run for realization 0.
func TestSimulateFolderAndRealization(t *testing.T) {
	dir, mem := runFolder(t)
	// The zipper pad's two wells have a section each.
	pictures := []string{DistanceTimeFile, GrowthPictureFile, MagnitudeFrequencyFile, MapPictureFile, sectionPictureFile(0), sectionPictureFile(1)}
	want := append([]string{ContentsFile, CSVMetadataFile, EventsFile, FracturesFile, MapsFile, RateEventsFile, SnapshotFile, ScenarioFile, StressChangeFile, SummaryFile, TimelineFile},
		pictures...)
	slices.Sort(want)
	if got := folderFiles(t, dir); !slices.Equal(got, want) {
		t.Errorf("run folder holds %v, want %v", got, want)
	}
	out, err := Limits{}.Realizations(1)(context.Background(), mem.Scenario, 0)
	if err != nil {
		t.Fatal(err)
	}
	if out.FinalArea != mem.Result.StimulatedArea || out.Events != len(mem.Result.Events) || out.InjectedVolume != mem.Result.Injected {
		t.Errorf("Realization(0): area %g, %d events, %g m³; Simulate: %g, %d, %g",
			out.FinalArea, out.Events, out.InjectedVolume, mem.Result.StimulatedArea, len(mem.Result.Events), mem.Result.Injected)
	}
	rep := t.TempDir()
	if err := WriteReport(context.Background(), dir, Folder{Dir: rep}); err != nil {
		t.Fatal(err)
	}
	wantReport := append([]string{ReportPageFile}, pictures...)
	slices.Sort(wantReport)
	if got := folderFiles(t, rep); !slices.Equal(got, wantReport) {
		t.Errorf("report folder holds %v, want %v", got, wantReport)
	}
}

// An export the CRS cannot serve keeps its cause in the error chain.
func TestExportKeepsCause(t *testing.T) {
	dir, _ := runFolder(t) // the zipper pad's CRS is a UTM zone: GeoJSON works
	_, err := Export(context.Background(), dir, ExportOptions{Format: "geojson", Layer: "wells", Out: filepath.Join(t.TempDir(), "w.geojson")})
	if err != nil {
		t.Fatalf("geojson of a UTM run: %v", err)
	}
	local := t.TempDir()
	s := loadExample(t, "single-fracture") // no CRS: an undefined local frame
	if _, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: local}}); err != nil {
		t.Fatal(err)
	}
	_, err = Export(context.Background(), local, ExportOptions{Format: "geojson", Layer: "wells", Out: filepath.Join(t.TempDir(), "w.geojson")})
	if !errors.Is(err, gis.ErrNoGeographic) || !errors.Is(err, badinput.Err) {
		t.Errorf("geojson of a run without CRS: error %v, want gis.ErrNoGeographic marked as bad input", err)
	}
}

// errStopped stands for a process killed part way.
var errStopped = errors.New("stopped")

// A run stopped part way leaves only its partial folder; export and report
// use its recovered frames and say so, and the same command needs --force
// to discard it.
func TestStoppedRunPartialFolder(t *testing.T) {
	s := loadExample(t, "single-fracture")
	dir := filepath.Join(t.TempDir(), "run")
	steps := 0
	stop := func(float64, float64) {
		if steps++; steps == 40 {
			panic(errStopped) // as if the process were killed: nothing after this runs
		}
	}
	func() {
		defer func() {
			if v := recover(); v != errStopped {
				t.Fatalf("the run did not stop as planned: %v", v)
			}
		}()
		Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: dir}, Progress: stop})
	}()
	if _, err := os.Stat(dir); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("the stopped run left its final folder (%v)", err)
	}
	partial := dir + outdir.PartialSuffix
	if got := folderFiles(t, partial); !slices.Equal(got, []string{SnapshotFile, ScenarioFile}) {
		t.Fatalf("partial folder holds %v", got)
	}
	r, err := LoadRun(partial, math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	if r.Complete || len(r.Notes) == 0 || len(r.Result.Events) != 0 || r.Time <= 0 {
		t.Errorf("partial folder read as complete %v, notes %q, %d events, time %g s", r.Complete, r.Notes, len(r.Result.Events), r.Time)
	}
	notes, err := Export(context.Background(), partial, ExportOptions{Format: "gpkg", Out: filepath.Join(t.TempDir(), "p.gpkg"), Time: math.NaN()})
	if err != nil || len(notes) == 0 {
		t.Errorf("export of the partial folder: notes %q, error %v", notes, err)
	}
	if err := WriteReport(context.Background(), partial, Folder{Dir: filepath.Join(t.TempDir(), "rep")}); err != nil {
		t.Errorf("report of the partial folder: %v", err)
	}
	_, err = Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: dir}})
	if !errors.Is(err, outdir.ErrPartialExists) || !errors.Is(err, badinput.Err) {
		t.Errorf("rerun beside a partial folder: error %v, want ErrPartialExists", err)
	}
	// Stopped before the snapshot held anything (during the set-up): an
	// input error that says so, not a failure.
	if err := os.WriteFile(filepath.Join(partial, SnapshotFile), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := LoadRun(partial, math.NaN()); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "stopped before") {
		t.Errorf("partial folder with an empty snapshot: error %v", err)
	}
}

// A complete folder whose file was swapped for another run's is refused.
func TestMixedFileRefused(t *testing.T) {
	dir, _ := runFolder(t)
	other := t.TempDir()
	s := loadExample(t, "single-fracture")
	if _, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: other, Force: true}}); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(other, EventsFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, EventsFile), b, 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = LoadRun(dir, math.NaN())
	if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "events.csv differs from the file the run wrote") {
		t.Errorf("mixed folder: error %v", err)
	}
}

// The report page of a run whose fractures grow says what they grew to,
// where they met natural fractures, and where each stage's fluid was; a
// run without growth has none of it (the zipper pad).
func TestReportGrowth(t *testing.T) {
	s, err := scenarios.Load(filepath.Join("..", "testdata", "kgd-toughness", "scenario.toml"))
	if err != nil {
		t.Fatal(err)
	}
	grown := filepath.Join(t.TempDir(), "run")
	res, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: grown}})
	if err != nil {
		t.Fatal(err)
	}
	plain, _ := runFolder(t)
	for _, c := range []struct {
		dir  string
		want []string
	}{
		{grown, []string{"growing fractures", "1, half-length mean", "meetings with natural fractures", "0 crossed, 0 arrested, 0 diverted",
			"held in the fractures m³", fmt.Sprintf("<td>%.1f</td>", res.Stages[0].HeldConduits)}},
		{plain, nil},
	} {
		_, page := reportPage(t, c.dir)
		for _, want := range c.want {
			if !strings.Contains(page, want) {
				t.Errorf("%s: report page without %q", c.dir, want)
			}
		}
		if c.want == nil && strings.Contains(page, "growing fractures") {
			t.Errorf("%s: report page of a run without growth speaks of growing fractures", c.dir)
		}
	}
}

// The report page's stage table gives each stage's sub-resolution events
// (the zipper pad has a [seismicity_rate] table), as summary.json holds
// them.
func TestReportStageSubResolution(t *testing.T) {
	dir, run := runFolder(t)
	_, page := reportPage(t, dir)
	if !strings.Contains(page, "sub-resolution events drawn (expected)") {
		t.Error("report page without the stages' sub-resolution events")
	}
	for _, st := range run.Result.Stages {
		if cell := fmt.Sprintf("<td>%d (%.0f)</td>", st.RateEvents, st.RateExpected); !strings.Contains(page, cell) || !(st.RateExpected > 0) {
			t.Errorf("stage %s: report page without %q", st.Name, cell)
		}
	}
}

// reportPage writes the report of folder dir into a new folder and
// returns that folder and its page.
func reportPage(t *testing.T, dir string) (rep, page string) {
	t.Helper()
	rep = filepath.Join(t.TempDir(), "report")
	if err := WriteReport(context.Background(), dir, Folder{Dir: rep}); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(rep, ReportPageFile))
	if err != nil {
		t.Fatal(err)
	}
	return rep, string(b)
}
