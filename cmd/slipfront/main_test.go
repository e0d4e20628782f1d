package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"

	"slipfront/scenarios"
)

// runCLI runs the command line in-process and returns the exit code and
// both outputs.
func runCLI(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(context.Background(), args, &out, &errb)
	return code, out.String(), errb.String()
}

func TestExitCodes(t *testing.T) {
	dir := t.TempDir()
	tests := []struct {
		name string
		args []string
		code int
		want string // in stderr
	}{
		{"version", []string{"version"}, exitOK, ""},
		{"unknown command", []string{"bogus"}, exitBadInput, "unknown command"},
		{"missing flag", []string{"generate", "zipper-pad"}, exitBadInput, `"out" not set`},
		{"bad override", []string{"scenario", "check", "zipper-pad", "--set", "sets[1].orientation.kappa=-3"}, exitBadInput, "--set sets[1].orientation.kappa=-3: must be within (0, 1e6]"},
		{"unknown key", []string{"scenario", "check", "zipper-pad", "--set", "rock.fricton_static=0.5"}, exitBadInput, `did you mean "friction_static"?`},
		{"missing file", []string{"scenario", "check", filepath.Join(dir, "none.toml")}, exitBadInput, "no such file"},
		{"too many fractures", []string{"generate", "zipper-pad", "--set", "numerics.max_fractures=10", "--out", filepath.Join(dir, "cap")}, exitBadInput, "max_fractures"},
		{"bare viscosity", []string{"scenario", "check", "zipper-pad", "--set", "fluids.slickwater.viscosity=20"}, exitBadInput, `needs a unit: write "20 cP" or "20 mPa.s"`},
		{"message units", []string{"scenario", "check", "zipper-pad", "--set", "schedule.pressure_cap=10MPa"}, exitBadInput, "initial pore pressure, 31.2 MPa"},
		{"unknown example", []string{"scenario", "show", "dmeo", "--out", filepath.Join(dir, "dmeo")}, exitBadInput, `no example scenario "dmeo"; examples: demo, single-fracture, zipper-pad`},
		{"force without out", []string{"scenario", "show", "zipper-pad", "--force"}, exitBadInput, "--force replaces the folder of --out"},
		{"check ok", []string{"scenario", "check", "zipper-pad"}, exitOK, "warning: zipper-pad.toml:122: fluids.linear_gel: no stage pumps this fluid"},
		{"mistyped fluid", []string{"scenario", "check", "zipper-pad", "--set", "fluids.slickwatr.viscosity=20cP"}, exitBadInput,
			`--set fluids.slickwatr.viscosity=20cP: the scenario has no fluids.slickwatr (did you mean "fluids.slickwater"?) and nothing names it`},
		{"unpumped fluid", []string{"scenario", "check", "zipper-pad", "--set", "fluids.linear_gel.viscosity=5cP"}, exitBadInput,
			"--set fluids.linear_gel.viscosity=5cP: changes nothing a run uses: no stage pumps fluids.linear_gel (the stages pump slickwater)"},
		{"declared fluid", []string{"scenario", "check", "zipper-pad", "--set", "+fluids.gel.viscosity=5cP"}, exitOK,
			"warning: --set +fluids.gel.viscosity=5cP: no stage pumps this fluid"},
		{"key of another law", []string{"scenario", "check", "zipper-pad", "--set", "sets[0].size.mean=30m"}, exitBadInput,
			"--set sets[0].size.mean=30m: changes nothing a run uses: sets[0].size.mean is read only when"},
		{"geographic CRS", []string{"run", "single-fracture", "--set", "domain.crs=EPSG:4326", "--out", filepath.Join(dir, "geo")}, exitBadInput, "projected CRS"},
		{"negative inspect time", []string{"inspect", "../../snapshot/testdata/small.snap", "--time", "-5s"}, exitBadInput, "--time"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := runCLI(t, tc.args...)
			if code != tc.code || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit %d and %q", code, stderr, tc.code, tc.want)
			}
		})
	}
}

func TestTemplateAndShow(t *testing.T) {
	code, out, _ := runCLI(t, "scenario", "template")
	if code != exitOK || !strings.Contains(out, "[numerics]") || !strings.Contains(out, "Caution") {
		t.Errorf("template: exit %d, output %.200q", code, out)
	}
	code, out, stderr := runCLI(t, "scenario", "show", "zipper-pad")
	if code != exitOK || !strings.Contains(out, `name = "Zipper pad (invented)"`) {
		t.Errorf("show zipper-pad: exit %d", code)
	}
	if want := "zipper-pad.toml reads zipper-pad-faults.csv beside it; write them together with: slipfront scenario show zipper-pad --out DIR"; !strings.Contains(stderr, want) {
		t.Errorf("show zipper-pad: stderr %q, want %q", stderr, want)
	}
}

// digestLine returns the digest line of "scenario check".
func digestLine(t *testing.T, out string) string {
	t.Helper()
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(strings.TrimSpace(l), "digest") {
			return strings.TrimSpace(l)
		}
	}
	t.Fatalf("no digest line in %q", out)
	return ""
}

// "scenario show NAME --out DIR" writes a folder that checks as the
// example does (same digest), for every example; a second write needs
// --force.
func TestShowRoundTrip(t *testing.T) {
	names := scenarios.Examples()
	if len(names) < 2 {
		t.Fatalf("examples %v", names)
	}
	for _, name := range names {
		t.Run(name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "copy")
			code, _, stderr := runCLI(t, "scenario", "show", name, "--out", dir)
			if code != exitOK || !strings.Contains(stderr, "wrote "+filepath.Join(dir, name+".toml")) {
				t.Fatalf("show --out: exit %d: %s", code, stderr)
			}
			code, copied, stderr := runCLI(t, "scenario", "check", filepath.Join(dir, name+".toml"))
			if code != exitOK {
				t.Fatalf("check the copy: exit %d: %s", code, stderr)
			}
			_, embedded, _ := runCLI(t, "scenario", "check", name)
			if a, b := digestLine(t, copied), digestLine(t, embedded); a != b {
				t.Errorf("the copy checks as %q, the example as %q", a, b)
			}
			if code, _, stderr := runCLI(t, "scenario", "show", name, "--out", dir); code != exitBadInput || !strings.Contains(stderr, "--force") {
				t.Errorf("second show --out: exit %d: %s", code, stderr)
			}
			if code, _, stderr := runCLI(t, "scenario", "show", name, "--out", dir, "--force"); code != exitOK {
				t.Errorf("show --out --force: exit %d: %s", code, stderr)
			}
		})
	}
}

// TestGenerateDeterministic: same scenario and seed → byte-identical files
// (every draw is seeded by scenario seed, realization and purpose);
// another seed → a different network.
func TestGenerateDeterministic(t *testing.T) {
	dir := t.TempDir()
	read := func(sub string) map[string][]byte {
		files := map[string][]byte{}
		for _, name := range []string{"fractures.csv", "traces.csv", "network.json"} {
			b, err := os.ReadFile(filepath.Join(dir, sub, name))
			if err != nil {
				t.Fatal(err)
			}
			files[name] = b
		}
		return files
	}
	for _, sub := range []string{"a", "b"} {
		if code, _, stderr := runCLI(t, "generate", "zipper-pad", "--seed", "11", "--out", filepath.Join(dir, sub)); code != exitOK {
			t.Fatalf("generate: exit %d: %s", code, stderr)
		}
	}
	a, b := read("a"), read("b")
	for name := range a {
		if !bytes.Equal(a[name], b[name]) {
			t.Errorf("%s differs between two runs with the same seed", name)
		}
	}
	runCLI(t, "generate", "zipper-pad", "--seed", "12", "--out", filepath.Join(dir, "c"))
	if bytes.Equal(a["fractures.csv"], read("c")["fractures.csv"]) {
		t.Error("seed 12 gave the same fractures as seed 11")
	}
	// The output folder is not overwritten without --force.
	code, _, stderr := runCLI(t, "generate", "zipper-pad", "--seed", "11", "--out", filepath.Join(dir, "a"))
	if code != exitBadInput || !strings.Contains(stderr, "--force") {
		t.Errorf("rewrite without --force: exit %d, %q", code, stderr)
	}
	if code, _, _ := runCLI(t, "generate", "zipper-pad", "--seed", "11", "--force", "--out", filepath.Join(dir, "a")); code != exitOK {
		t.Errorf("rewrite with --force: exit %d", code)
	}
}

func TestScreen(t *testing.T) {
	dir := t.TempDir()
	code, out, stderr := runCLI(t, "screen", "zipper-pad", "--out", dir)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(out, "strike-slip") || !strings.Contains(out, "Caution") {
		t.Errorf("summary lacks the regime or the caution:\n%s", out)
	}
	csv, err := os.ReadFile(filepath.Join(dir, "screen.csv"))
	if err != nil {
		t.Fatal(err)
	}
	const header = "fracture_id,set,dip_deg,dip_direction_deg,sigma_n_MPa,tau_MPa,slip_tendency,dilation_tendency,critical_dp_MPa"
	if !strings.HasPrefix(string(csv), header) {
		t.Errorf("screen.csv header %.120q, want it to start with %q", csv, header)
	}
	for _, name := range []string{"screen.json", "slip-vs-dp.csv"} {
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Error(err)
		}
	}
}

// quickRun are overrides that make the zipper pad fast enough for tests.
var quickRun = []string{"--set", "schedule.volume=30 bbl", "--set", "numerics.element_length=30 m"}

var (
	quickPadOnce sync.Once
	quickPadDir  string
	quickPadErr  string
)

// runQuickPad runs the quick zipper pad once into a shared folder and returns
// it; tests only read it.
func runQuickPad(t *testing.T) string {
	t.Helper()
	quickPadOnce.Do(func() {
		dir, err := os.MkdirTemp("", "slipfront-quick-demo-")
		if err != nil {
			quickPadErr = err.Error()
			return
		}
		quickPadDir = filepath.Join(dir, "run")
		code, out, stderr := runCLI(t, append([]string{"run", "zipper-pad", "--out", quickPadDir}, quickRun...)...)
		switch {
		case code != exitOK:
			quickPadErr = fmt.Sprintf("run: exit %d: %s", code, stderr)
		case !strings.Contains(out, "W2:3") || !strings.Contains(out, "Caution"):
			quickPadErr = "stage table lacks a stage or the caution:\n" + out
		case strings.Count(stderr, "\nsimulating: ") < 9 || !strings.Contains(stderr, "h simulated), "):
			// stderr is no terminal here, as in a Slurm log: a line per tenth.
			quickPadErr = "no progress line per tenth of the run on stderr:\n" + stderr
		case !strings.Contains(stderr, "network: ") || strings.Contains(stderr, " 1 fractures"):
			quickPadErr = "status lines:\n" + stderr
		}
	})
	if quickPadErr != "" {
		t.Fatal(quickPadErr)
	}
	return quickPadDir
}

func TestMain(m *testing.M) {
	code := m.Run()
	if quickPadDir != "" {
		os.RemoveAll(filepath.Dir(quickPadDir))
	}
	os.Exit(code)
}

func TestRunOutputs(t *testing.T) {
	dir := runQuickPad(t)
	for _, name := range []string{"summary.json", "timeline.csv", "events.csv", "fractures.csv", "run.snap", "maps.gpkg", "map.png", "growth.png", "scenario.json"} {
		info, err := os.Stat(filepath.Join(dir, name))
		if err != nil || info.Size() == 0 {
			t.Errorf("%s missing or empty: %v", name, err)
		}
	}
	timeline, _ := os.ReadFile(filepath.Join(dir, "timeline.csv"))
	if !strings.HasPrefix(string(timeline), "time_s,stage,rate_m3_s,injected_volume_m3,bhp_MPa,stimulated_area_m2,") {
		t.Errorf("timeline header %.100q", timeline)
	}
	code, out, _ := runCLI(t, "inspect", filepath.Join(dir, "run.snap"))
	if code != exitOK || !strings.Contains(out, "compression") {
		t.Errorf("inspect: exit %d\n%s", code, out)
	}
	code, out, _ = runCLI(t, "inspect", filepath.Join(dir, "run.snap"), "--time", "1h", "--csv")
	if code != exitOK || !strings.HasPrefix(out, "element_id,fracture_id,x0_m,y0_m,x1_m,y1_m,pressure_MPa,aperture_mm,slip_mm,coulomb_change_MPa,state") {
		t.Errorf("inspect --csv: exit %d\n%.200s", code, out)
	}
	if code, _, stderr := runCLI(t, "inspect", filepath.Join(dir, "run.snap"), "--time", "99h"); code != exitBadInput || !strings.Contains(stderr, "holds frames from") {
		t.Errorf("time beyond the run: exit %d, %s", code, stderr)
	}
}

// A viscosity sweep through the command line: one process and merged
// shards give the same bytes, and the maps and charts are written (the
// batch package tests workers, resume, Slurm and the rest). The
// single-fracture example keeps it quick.
func TestBatchAndMerge(t *testing.T) {
	dir := t.TempDir()
	base := func(out string, extra ...string) []string {
		a := []string{"batch", "single-fracture", "--realizations", "2", "--set", "numerics.element_length=40 m",
			"--out", filepath.Join(dir, out)}
		return append(a, extra...)
	}
	args := func(out string, extra ...string) []string {
		return base(out, append([]string{"--sweep", "fluids.water.viscosity=1cP,20cP"}, extra...)...)
	}
	if code, _, stderr := runCLI(t, args("one", "--workers", "1")...); code != exitOK {
		t.Fatalf("batch: exit %d: %s", code, stderr)
	}
	for _, sh := range []string{"0/2", "1/2"} {
		if code, _, stderr := runCLI(t, args("s"+sh[:1], "--shard", sh)...); code != exitOK {
			t.Fatalf("shard %s: exit %d: %s", sh, code, stderr)
		}
	}
	code, out, stderr := runCLI(t, "merge", filepath.Join(dir, "s1"), filepath.Join(dir, "s0"), "--out", filepath.Join(dir, "merged"))
	if code != exitOK || !strings.Contains(out, "viscosity=20cP") {
		t.Fatalf("merge: exit %d: %s\n%s", code, stderr, out)
	}
	// merge takes --force as every command does: it replaces an earlier
	// merged folder.
	code, _, stderr = runCLI(t, "merge", filepath.Join(dir, "s1"), filepath.Join(dir, "s0"), "--out", filepath.Join(dir, "merged"))
	if code != exitBadInput || !strings.Contains(stderr, "use --force") {
		t.Errorf("merge into an earlier merge: exit %d: %s", code, stderr)
	}
	if code, _, stderr := runCLI(t, "merge", filepath.Join(dir, "s1"), filepath.Join(dir, "s0"), "--out", filepath.Join(dir, "merged"), "--force"); code != exitOK {
		t.Fatalf("merge --force: exit %d: %s", code, stderr)
	}
	// 20 cP diffuses 20 times slower than 1 cP (D = e²/(12μc_f)), so the
	// same injection stimulates less: compare the P50 final areas.
	f, err := os.Open(filepath.Join(dir, "merged", "comparison.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil || len(rows) != 3 {
		t.Fatalf("comparison.csv: %v, %d rows", err, len(rows))
	}
	col := slices.Index(rows[0], "stimulated_area_m2_q50")
	thin, _ := strconv.ParseFloat(rows[1][col], 64)
	thick, _ := strconv.ParseFloat(rows[2][col], 64)
	if !(thin > thick) {
		t.Errorf("P50 final area %g m² at 1 cP, %g m² at 20 cP: want less at 20 cP", thin, thick)
	}
	for _, name := range []string{"realizations.csv", "percentiles.csv", "comparison.csv", "warnings.csv", "paired.csv",
		"paired-percentiles.csv", "summary.json", "csv-metadata.json", "probability/case-0001.csv"} {
		a, _ := os.ReadFile(filepath.Join(dir, "one", name))
		b, _ := os.ReadFile(filepath.Join(dir, "merged", name))
		if len(a) == 0 || !bytes.Equal(a, b) {
			t.Errorf("%s differs between one process and merged shards", name)
		}
	}
	for _, name := range []string{"maps.gpkg", "probability_0000.tif", "fan_0001.png", "comparison.png"} {
		if _, err := os.Stat(filepath.Join(dir, "merged", name)); err != nil {
			t.Error(err)
		}
	}
	if code, _, stderr := runCLI(t, "report", filepath.Join(dir, "merged"), "--out", filepath.Join(dir, "report")); code != exitOK {
		t.Errorf("report: exit %d: %s", code, stderr)
	}
	if page, _ := os.ReadFile(filepath.Join(dir, "report", "index.html")); !strings.Contains(string(page), "fan_0001.png") {
		t.Error("the batch report does not show the second case's fan chart")
	}
	bad := []struct {
		args []string
		want string
	}{
		{args("x", "--shard", "2/2"), "shard"},
		{base("y", "--sweep", "rock.frction=0.5,0.6"), `did you mean "friction_`},
		{base("z", "--sweep", "fluids.water.viscosity=1cP,-2cP"), "must be within [0.01, 1e6] cP"},
	}
	for _, tc := range bad {
		if code, _, stderr := runCLI(t, tc.args...); code != exitBadInput || !strings.Contains(stderr, tc.want) {
			t.Errorf("%v: exit %d, %s", tc.args[len(tc.args)-2:], code, stderr)
		}
	}
}

// Every export format from a run folder; GDAL reads them back in the
// scenario's CRS when it is installed (CI installs gdal-bin).
func TestExportRun(t *testing.T) {
	dir := runQuickPad(t)
	out := t.TempDir()
	files := map[string][]string{
		"all.gpkg":        {"--format", "gpkg"},
		"area.geojson":    {"--format", "geojson", "--layer", "stimulated_area", "--time", "1h"},
		"first-slip.tif":  {"--format", "geotiff", "--layer", "first_slip_time"},
		"events.xml":      {"--format", "quakeml"},
		"slip.tif":        {"--format", "geotiff", "--layer", "cumulative_slip"},
		"fractures.gpkg":  {"--format", "gpkg", "--layer", "fractures"},
		"pressure-1h.tif": {"--format", "geotiff", "--layer", "pressure_increase", "--time", "60 min"},
	}
	for name, args := range files {
		code, _, stderr := runCLI(t, append([]string{"export", dir, "--out", filepath.Join(out, name)}, args...)...)
		if code != exitOK {
			t.Errorf("%s: exit %d: %s", name, code, stderr)
		}
	}
	bad := []struct {
		args []string
		want string
	}{
		{[]string{"--format", "shp"}, "format"},
		{[]string{"--format", "geojson", "--layer", "nope"}, `no layer "nope" in a run; layers: fractures, conduits, stimulated_area`},
		{[]string{"--format", "geotiff", "--layer", "first_slip_time", "--time", "99h"}, "outside the run"},
		{[]string{"--format", "quakeml", "--out", filepath.Join(out, "events.xml")}, "--force"},
	}
	for _, tc := range bad {
		args := append([]string{"export", dir}, tc.args...)
		if !slices.Contains(tc.args, "--out") {
			args = append(args, "--out", filepath.Join(out, "bad"))
		}
		if code, _, stderr := runCLI(t, args...); code != exitBadInput || !strings.Contains(stderr, tc.want) {
			t.Errorf("%v: exit %d, %s", tc.args, code, stderr)
		}
	}
	// The report of the run folder: pictures and a page naming them.
	rep := filepath.Join(out, "report")
	if code, _, stderr := runCLI(t, "report", dir, "--out", rep); code != exitOK {
		t.Fatalf("report: exit %d: %s", code, stderr)
	}
	page, _ := os.ReadFile(filepath.Join(rep, "index.html"))
	for _, want := range []string{"<code>map.png</code>", "<code>growth.png</code>", "W2:3", "screening and comparison tool"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("index.html lacks %q", want)
		}
	}
	for _, name := range []string{"map.png", "growth.png"} {
		if _, err := os.Stat(filepath.Join(rep, name)); err != nil {
			t.Error(err)
		}
	}
	if _, err := exec.LookPath("ogrinfo"); err != nil {
		t.Skip("GDAL not installed: interop checks skipped")
	}
	cmd := exec.Command("ogrinfo", "-so", filepath.Join(out, "all.gpkg"), "stimulated_area")
	b, err := cmd.CombinedOutput()
	if err != nil || !strings.Contains(string(b), `ID["EPSG",32614]`) || !strings.Contains(string(b), "Multi Polygon") {
		t.Errorf("ogrinfo: %v\n%s", err, b)
	}
	cmd = exec.Command("gdalinfo", filepath.Join(out, "first-slip.tif"))
	cmd.Env = append(os.Environ(), "GDAL_PAM_ENABLED=NO")
	b, err = cmd.CombinedOutput()
	if err != nil || !strings.Contains(string(b), `ID["EPSG",32614]`) || !strings.Contains(string(b), "Size is 160, 100") {
		t.Errorf("gdalinfo: %v\n%s", err, b)
	}
}

// run and inspect work on every embedded example, as the README promises.
func TestEveryExampleRunsAndInspects(t *testing.T) {
	for _, name := range scenarios.Examples() {
		t.Run(name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), name)
			code, _, stderr := runCLI(t, "run", name, "--out", dir, "--set", "numerics.element_length=30 m", "--set", "schedule.volume=20 bbl")
			if code != exitOK {
				t.Fatalf("run %s: exit %d: %s", name, code, stderr)
			}
			code, out, stderr := runCLI(t, "inspect", filepath.Join(dir, "run.snap"), "--csv")
			if code != exitOK || strings.Count(out, "\n") < 2 {
				t.Errorf("inspect %s: exit %d: %s", name, code, stderr)
			}
		})
	}
}

// Unsafe input of every kind ends with exit 2, a message naming what to
// change, and no output folder (not even a partial one) left behind, so
// that the corrected command needs no --force.
func TestUnsafeInputs(t *testing.T) {
	dir := t.TempDir()
	afile := filepath.Join(dir, "afile")
	if err := os.WriteFile(afile, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"space in a unit", []string{"run", "single-fracture", "--set", "layer.depth=2000 m m", "--out", out}, `the unit "m m" has a space inside`},
		{"absurd rate", []string{"run", "single-fracture", "--set", "schedule.rate=1e300 m3/s", "--out", out}, "schedule.rate=1e300 m3/s: must be within (0, 10] m3/s"},
		{"too many steps", []string{"run", "single-fracture", "--set", "numerics.time_step_initial=1e-6 s", "--set", "numerics.time_step_min=1e-6 s",
			"--set", "numerics.time_step_max=1e-6 s", "--out", out}, "numerics.max_steps"},
		{"device as scenario", []string{"run", "/dev/zero", "--out", out}, "not a regular file (a device)"},
		{"output is a file", []string{"run", "single-fracture", "--out", afile}, "is a file, not a folder"},
		{"empty output", []string{"run", "single-fracture", "--out", ""}, "no output folder"},
		{"network beyond memory", []string{"generate", "zipper-pad", "--memory-limit", "1MB", "--out", out}, "more than the memory limit of 1 MB"},
		{"a set of 1.9 million fractures", []string{"run", "zipper-pad", "--set", "sets[0].intensity.measure=count", "--set", "sets[0].intensity.count=1900000",
			"--memory-limit", "256MB", "--out", out}, "more than the memory limit of 256 MB: lower sets[0].intensity.count = 1900000 (the densest set)"},
		{"run beyond memory", []string{"run", "single-fracture", "--set", "numerics.element_length=1 cm", "--memory-limit", "50MB", "--out", out},
			"the simulation would take about"},
		{"bad memory limit", []string{"run", "single-fracture", "--memory-limit", "lots", "--out", out}, "--memory-limit lots"},
		{"mistyped sweep fluid", []string{"batch", "single-fracture", "-n", "2", "--sweep", "fluids.watr.viscosity=1cP,20cP", "--out", out},
			"--sweep fluids.watr.viscosity: value \"1cP\": --set fluids.watr.viscosity=1cP: the scenario has no fluids.watr"},
		{"sweep of the base value", []string{"batch", "single-fracture", "-n", "2", "--sweep", "fluids.water.viscosity=1cP", "--out", out},
			"--sweep fluids.water.viscosity changes nothing a run uses"},
		{"realizations beyond any batch", []string{"batch", "single-fracture", "--realizations", "1000000000000", "--out", out}, "--realizations 1000000000000: must be 1 to 1000000"},
		{"negative realization", []string{"run", "single-fracture", "--realization", "-1", "--out", out}, "realization -1: must be ≥ 0"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := runCLI(t, tc.args...)
			if code != exitBadInput || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit 2 and %q", code, stderr, tc.want)
			}
			for _, left := range []string{out, out + ".partial"} {
				if _, err := os.Stat(left); !os.IsNotExist(err) {
					t.Errorf("%s left behind (%v)", left, err)
					os.RemoveAll(left)
				}
			}
		})
	}
}

// sameFolders compares every file below a and b byte for byte.
func sameFolders(t *testing.T, a, b string) {
	t.Helper()
	var names []string
	err := filepath.WalkDir(a, func(path string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, err := filepath.Rel(a, path)
		names = append(names, rel)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(names) < 5 {
		t.Fatalf("%s holds only %v: nothing to compare", a, names)
	}
	for _, rel := range names {
		x, err := os.ReadFile(filepath.Join(a, rel))
		if err != nil {
			t.Fatal(err)
		}
		y, err := os.ReadFile(filepath.Join(b, rel))
		if err != nil {
			t.Errorf("%s: %v", rel, err)
			continue
		}
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between %s and %s", rel, a, b)
		}
	}
}

// The same inputs give the same bytes in every output file (maps.gpkg
// included: its timestamps come from the scenario, not the clock), for
// runs and for batches on one or two workers or as merged shards.
func TestByteIdenticalOutputs(t *testing.T) {
	dir := t.TempDir()
	for _, out := range []string{"r1", "r2"} {
		if code, _, stderr := runCLI(t, "run", "single-fracture", "--set", "numerics.element_length=40 m", "--out", filepath.Join(dir, out)); code != exitOK {
			t.Fatalf("run: exit %d: %s", code, stderr)
		}
	}
	sameFolders(t, filepath.Join(dir, "r1"), filepath.Join(dir, "r2"))

	batchArgs := func(out string, extra ...string) []string {
		return append([]string{"batch", "single-fracture", "--realizations", "3", "--set", "numerics.element_length=40 m",
			"--sweep", "fluids.water.viscosity=1cP,20cP", "--out", filepath.Join(dir, out)}, extra...)
	}
	for _, run := range [][]string{batchArgs("w1", "--workers", "1"), batchArgs("w2", "--workers", "2"),
		batchArgs("s0", "--shard", "0/2"), batchArgs("s1", "--shard", "1/2")} {
		if code, _, stderr := runCLI(t, run...); code != exitOK {
			t.Fatalf("%v: exit %d: %s", run, code, stderr)
		}
	}
	if code, _, stderr := runCLI(t, "merge", filepath.Join(dir, "s0"), filepath.Join(dir, "s1"), "--out", filepath.Join(dir, "merged")); code != exitOK {
		t.Fatalf("merge: exit %d: %s", code, stderr)
	}
	sameFolders(t, filepath.Join(dir, "w1"), filepath.Join(dir, "w2"))
	sameFolders(t, filepath.Join(dir, "w1"), filepath.Join(dir, "merged"))
}

// "slipfront --version" prints what "slipfront version" prints.
func TestVersionFlag(t *testing.T) {
	code, flag, _ := runCLI(t, "--version")
	_, cmd, _ := runCLI(t, "version")
	if code != exitOK || flag != cmd || !strings.HasPrefix(flag, "slipfront ") {
		t.Errorf("--version: exit %d, %q; version: %q", code, flag, cmd)
	}
}

// inspect on a folder says so with exit 2 and points to the snapshot of a
// run folder.
func TestInspectFolder(t *testing.T) {
	root := t.TempDir()
	snap, err := os.ReadFile("../../snapshot/testdata/small.snap")
	if err != nil {
		t.Fatal(err)
	}
	dirs := map[string]string{"run": "run.snap", "run.partial": "run.snap", "batch": "manifest.json", "other": ""}
	for dir, file := range dirs {
		if err := os.MkdirAll(filepath.Join(root, dir), 0o755); err != nil {
			t.Fatal(err)
		}
		if file != "" {
			if err := os.WriteFile(filepath.Join(root, dir, file), snap, 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
	tests := []struct{ dir, want string }{
		{"run", "run is a folder (a run folder), not a snapshot file; inspect its snapshot with: slipfront inspect " + filepath.Join(root, "run", "run.snap")},
		{"run.partial", "(the partial folder of a stopped run), not a snapshot file; inspect its snapshot with: slipfront inspect " + filepath.Join(root, "run.partial", "run.snap")},
		{"batch", "batch is a folder (a batch folder, which keeps no snapshots), not a snapshot file"},
		{"other", "other is a folder, not a snapshot file"},
	}
	for _, tc := range tests {
		code, out, stderr := runCLI(t, "inspect", filepath.Join(root, tc.dir))
		if code != exitBadInput || out != "" || !strings.Contains(stderr, tc.want) {
			t.Errorf("inspect %s: exit %d, stdout %q, stderr %q; want exit 2 and %q", tc.dir, code, out, stderr, tc.want)
		}
	}
	if code, out, stderr := runCLI(t, "inspect", filepath.Join(root, "run", "run.snap")); code != exitOK || !strings.Contains(out, "frames") {
		t.Errorf("inspect the pointed snapshot: exit %d: %s", code, stderr)
	}
}
