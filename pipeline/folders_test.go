package pipeline

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"slices"
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
	net, st, err := Generate(s, Folder{Dir: gen})
	if err != nil {
		t.Fatal(err)
	}
	if len(net.Fractures) != 1 || st.Fractures != 1 {
		t.Errorf("single-fracture network has %d fractures (stats %d), want 1", len(net.Fractures), st.Fractures)
	}
	if got, want := folderFiles(t, gen), []string{CSVMetadataFile, NetworkFracturesFile, NetworkFile, TracesFile}; !slices.Equal(got, want) {
		t.Errorf("generate folder holds %v, want %v", got, want)
	}
	if _, _, err := Generate(s, Folder{Dir: gen}); !errors.Is(err, outdir.ErrExists) || !errors.Is(err, badinput.Err) {
		t.Errorf("second Generate into the same folder: error %v, want an existing-output input error", err)
	}
	if _, _, err := Generate(s, Folder{Dir: gen, Force: true}); err != nil {
		t.Errorf("Generate with Force: %v", err)
	}

	scr := t.TempDir()
	sc, err := Screen(s, Folder{Dir: scr})
	if err != nil {
		t.Fatal(err)
	}
	if len(sc.Planes) != 1 {
		t.Errorf("screening of %d planes, want 1", len(sc.Planes))
	}
	if got, want := folderFiles(t, scr), []string{CSVMetadataFile, ScreenTableFile, ScreenSummaryFile, SlipCurveFile}; !slices.Equal(got, want) {
		t.Errorf("screen folder holds %v, want %v", got, want)
	}
}

// Simulate writes the run folder that LoadRun and WriteReport read, and
// the batch runner gives the same totals as the run for realization 0.
func TestSimulateFolderAndRealization(t *testing.T) {
	dir, mem := runFolder(t)
	want := []string{CSVMetadataFile, EventsFile, FracturesFile, GrowthPictureFile, MapPictureFile, MapsFile, SnapshotFile, ScenarioFile, SummaryFile, TimelineFile}
	slices.Sort(want)
	if got := folderFiles(t, dir); !slices.Equal(got, want) {
		t.Errorf("run folder holds %v, want %v", got, want)
	}
	out, err := Realization(context.Background(), mem.Scenario, 0)
	if err != nil {
		t.Fatal(err)
	}
	if out.FinalArea != mem.Result.StimulatedArea || out.Events != len(mem.Result.Events) || out.InjectedVolume != mem.Result.Injected {
		t.Errorf("Realization(0): area %g, %d events, %g m³; Simulate: %g, %d, %g",
			out.FinalArea, out.Events, out.InjectedVolume, mem.Result.StimulatedArea, len(mem.Result.Events), mem.Result.Injected)
	}
	rep := t.TempDir()
	if err := WriteReport(context.Background(), dir, rep); err != nil {
		t.Fatal(err)
	}
	wantReport := []string{GrowthPictureFile, MapPictureFile, ReportPageFile}
	slices.Sort(wantReport)
	if got := folderFiles(t, rep); !slices.Equal(got, wantReport) {
		t.Errorf("report folder holds %v, want %v", got, wantReport)
	}
}

// An export the CRS cannot serve keeps its cause in the error chain.
func TestExportKeepsCause(t *testing.T) {
	dir, _ := runFolder(t) // the demo's CRS is a UTM zone: GeoJSON works
	err := Export(context.Background(), dir, ExportOptions{Format: "geojson", Layer: "wells", Out: filepath.Join(t.TempDir(), "w.geojson")})
	if err != nil {
		t.Fatalf("geojson of a UTM run: %v", err)
	}
	local := t.TempDir()
	s := loadExample(t, "single-fracture") // no CRS: an undefined local frame
	if _, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: local}}); err != nil {
		t.Fatal(err)
	}
	err = Export(context.Background(), local, ExportOptions{Format: "geojson", Layer: "wells", Out: filepath.Join(t.TempDir(), "w.geojson")})
	if !errors.Is(err, gis.ErrNoGeographic) || !errors.Is(err, badinput.Err) {
		t.Errorf("geojson of a run without CRS: error %v, want gis.ErrNoGeographic marked as bad input", err)
	}
}
