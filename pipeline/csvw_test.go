package pipeline

import (
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"slipfront/batch"
	"slipfront/scenarios"
	"slipfront/sim"
)

// checkCSV runs testdata/check_csv.py on dir: every CSV file under it
// must read with Python's csv module and numpy's genfromtxt(names=True),
// have the header and datatypes its folder's csv-metadata.json describes,
// and every CSV file must be described. It returns the row count of each
// file, by path relative to dir. It skips the test without Debian's
// python3 and numpy (CI installs python3-numpy).
func checkCSV(t *testing.T, dir string) map[string]int {
	t.Helper()
	const python = "/usr/bin/python3"
	if err := exec.Command(python, "-c", "import numpy").Run(); err != nil {
		t.Skipf("%s with numpy not available (%v): apt-get install python3-numpy", python, err)
	}
	out, err := exec.Command(python, filepath.Join("testdata", "check_csv.py"), dir).Output()
	if err != nil {
		t.Fatalf("check_csv.py %s: %v\n%s", dir, err, out)
	}
	var res struct {
		Tables map[string]int
		Errors []string
	}
	if err := json.Unmarshal(out, &res); err != nil {
		t.Fatalf("check_csv.py %s: %v\n%s", dir, err, out)
	}
	for _, e := range res.Errors {
		t.Errorf("%s: %s", filepath.Base(dir), e)
	}
	checkGDALCSV(t, dir, res.Tables)
	return res.Tables
}

// featureCountRE is ogrinfo's count of a layer's features.
var featureCountRE = regexp.MustCompile(`Feature Count: (\d+)`)

// checkGDALCSV reads every table with GDAL's CSV driver, when ogrinfo is
// installed, and compares its feature count with the rows Python read.
func checkGDALCSV(t *testing.T, dir string, tables map[string]int) {
	t.Helper()
	ogrinfo, err := exec.LookPath("ogrinfo")
	if err != nil {
		return
	}
	for path, rows := range tables {
		out, err := exec.Command(ogrinfo, "-ro", "-so", "-al", filepath.Join(dir, path)).CombinedOutput()
		m := featureCountRE.FindSubmatch(out)
		if err != nil || m == nil {
			t.Errorf("ogrinfo %s: %v\n%s", path, err, out)
			continue
		}
		if n, _ := strconv.Atoi(string(m[1])); n != rows {
			t.Errorf("ogrinfo %s: %d features, Python read %d rows", path, n, rows)
		}
	}
}

// sameRows fails unless got holds exactly the tables of want with their
// row counts.
func sameRows(t *testing.T, what string, got, want map[string]int) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: tables %v, want %v", what, got, want)
	}
	for name, n := range want {
		if got[name] != n {
			t.Errorf("%s: %s has %d rows, want %d", what, name, got[name], n)
		}
	}
}

// Every CSV file of a generate, screen, run and batch folder is plain CSV
// with one header row, read by Python's csv module, numpy and GDAL, and
// described by its folder's CSV on the Web metadata, with one row per
// fracture, trace, event, case, realization… A "#" comment line would
// break all three readers.
func TestCSVFilesReadAndDescribed(t *testing.T) {
	s := loadExample(t, "zipper-pad")
	gen := t.TempDir()
	net, _, err := Generate(s, Folder{Dir: gen}, Limits{})
	if err != nil {
		t.Fatal(err)
	}
	sameRows(t, "generate", checkCSV(t, gen), map[string]int{
		NetworkFracturesFile: len(net.Fractures), TracesFile: len(net.Traces)})

	scr := t.TempDir()
	sc, err := Screen(s, Folder{Dir: scr}, Limits{})
	if err != nil {
		t.Fatal(err)
	}
	sameRows(t, "screen", checkCSV(t, scr), map[string]int{ScreenTableFile: len(sc.Planes), SlipCurveFile: len(sc.Curve)})

	dir, mem := runFolder(t)
	sameRows(t, "run", checkCSV(t, dir), map[string]int{TimelineFile: len(mem.Result.Timeline), EventsFile: len(mem.Result.Events),
		RateEventsFile: len(mem.Result.RateEvents), FracturesFile: fractureCount(t, mem)})
	if len(mem.Result.Events) == 0 {
		t.Error("the run has no events: events.csv was checked empty")
	}

	out, m := singleFractureBatch(t)
	aggs := readAggregates(t, out)
	cells := 0
	want := map[string]int{batch.RealizationsName: 2 * m.Realizations, batch.PercentilesName: 2 * m.Cases[0].TimeGrid.Points,
		batch.ComparisonName: 2, batch.WarningsName: 2, batch.PairedName: m.Realizations, batch.PairedPercentilesName: 1}
	for c := range aggs {
		want[filepath.ToSlash(batch.ProbabilityGridName(c))] = len(aggs[c].Probability.Cells)
		cells += len(aggs[c].Probability.Cells)
	}
	sameRows(t, "batch", checkCSV(t, out), want)
	if cells == 0 {
		t.Error("no stimulated cell: the probability grids were checked empty")
	}
}

// singleFractureBatchSets are the base scenario's overrides of
// singleFractureBatch. Constant friction (no slip weakening, so no
// nucleation length for 40 m elements to miss): the runs give the Shmin
// warning only.
var singleFractureBatchSets = []string{"numerics.element_length=40 m", "schedule.injection_pressure=43 MPa",
	"rock.friction_residual=0.6"}

// singleFractureBatch runs a batch of the single-fracture example into a
// folder with Limits.Realizations: two viscosities × two realizations, at
// an injection pressure above Shmin (42 MPa at 2000 m, 21 kPa/m), so every
// run warns once.
func singleFractureBatch(t *testing.T) (string, *batch.Manifest) {
	t.Helper()
	out := filepath.Join(t.TempDir(), "batch")
	sets, err := scenarios.ParseOverrides(singleFractureBatchSets)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := batch.ParseSweep("fluids.water.viscosity=1 cP,20 cP")
	if err != nil {
		t.Fatal(err)
	}
	load := func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
		return scenarios.LoadExample("single-fracture", append(sets, extra...)...)
	}
	if _, err := batch.Run(context.Background(), batch.Options{Load: load, Realizations: 2, Sweeps: []batch.Sweep{sw},
		Workers: 2, Out: out, Run: Limits{}.Realizations(2)}); err != nil {
		t.Fatal(err)
	}
	if err := WriteBatchMaps(context.Background(), out); err != nil {
		t.Fatal(err)
	}
	m, _, err := batch.ReadAggregates(context.Background(), out)
	if err != nil {
		t.Fatal(err)
	}
	return out, m
}

func readAggregates(t *testing.T, dir string) []batch.CaseAggregate {
	t.Helper()
	_, aggs, err := batch.ReadAggregates(context.Background(), dir)
	if err != nil {
		t.Fatal(err)
	}
	return aggs
}

// The batch runner hands the run's warnings to the batch, which counts
// them per case; the batch folder gets a probability-difference GeoTIFF
// per case against its reference, with its band described.
func TestBatchWarningsAndDifferenceRaster(t *testing.T) {
	out, m := singleFractureBatch(t)
	for _, a := range readAggregates(t, out) {
		if len(a.Warnings) != 1 || a.Warnings[0].Kind != sim.WarnBHPAboveShmin || a.Warnings[0].Warnings != m.Realizations ||
			!strings.Contains(a.Warnings[0].Example, "exceeded Shmin") {
			t.Errorf("case %d: warnings %+v, want one %s per realization", a.Case.Index, a.Warnings, sim.WarnBHPAboveShmin)
		}
	}
	name := probabilityDifferenceFile(1, 0)
	if _, err := os.Stat(filepath.Join(out, name)); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(out, probabilityDifferenceFile(0, 1))); err == nil {
		t.Error("the reference case has a difference raster against another case")
	}
	gdalinfo, err := exec.LookPath("gdalinfo")
	if err != nil {
		t.Skip("gdalinfo not installed: band description not checked")
	}
	cmd := exec.Command(gdalinfo, filepath.Join(out, name))
	cmd.Env = append(os.Environ(), "GDAL_PAM_ENABLED=NO")
	b, err := cmd.CombinedOutput()
	if err != nil || !strings.Contains(string(b), "Description = stimulation_probability_difference") || !strings.Contains(string(b), "Unit Type: 1") {
		t.Errorf("gdalinfo %s: %v\n%s", name, err, b)
	}
}

// fractureCount is the number of rows fractures.csv should have.
func fractureCount(t *testing.T, r *Run) int {
	t.Helper()
	f, err := sim.Fractures(r.Scenario, r.Network, r.Result)
	if err != nil {
		t.Fatal(err)
	}
	return len(f)
}
