package pipeline

import (
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"slipfront/internal/numtest"
	"slipfront/scenarios"
	"slipfront/sim"
)

// A scenario with production before the stimulation gets the depletion
// rasters in its screen and run folders, and the run's summary says what
// production left: the largest pore-pressure drop is the drawdown of the
// held fracture cells, p0 − p_wf (31.2 − 15 MPa in testdata/depleted-pad).
// GDAL reads the rasters' band descriptions when it is installed.
func TestDepletionFolders(t *testing.T) {
	s, err := scenarios.Load(filepath.Join("..", "testdata", "depleted-pad", "scenario.toml"))
	if err != nil {
		t.Fatal(err)
	}
	scr, run := t.TempDir(), t.TempDir()
	if _, err := Screen(s, Folder{Dir: scr}, Limits{}); err != nil {
		t.Fatal(err)
	}
	if _, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: run}}); err != nil {
		t.Fatal(err)
	}
	for _, dir := range []string{scr, run} {
		for _, name := range []string{DepletionFile, RotationFile, CriticalChangeFile} {
			if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
				t.Error(err)
			}
		}
		// --force may replace the folder: every file is one pipeline
		// knows it writes (stress_change.tif once was not).
		for _, name := range folderFiles(t, dir) {
			if !ours(name) {
				t.Errorf("%s holds %s, which --force would not know as its own", filepath.Base(dir), name)
			}
		}
	}
	b, err := os.ReadFile(filepath.Join(run, SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	var sum struct {
		Warnings []struct {
			Kind string `json:"kind"`
		} `json:"warnings"`
		Depletion *struct {
			Drop     float64 `json:"largest_pore_pressure_drop_MPa"`
			Produced float64 `json:"produced_volume_m3"`
		} `json:"depletion"`
	}
	if err := json.Unmarshal(b, &sum); err != nil {
		t.Fatal(err)
	}
	if sum.Depletion == nil {
		t.Fatal("summary.json has no depletion")
	}
	numtest.Rel(t, "largest pore-pressure drop, MPa", sum.Depletion.Drop, 31.2-15, 1e-9)
	// 16.2 MPa of drawdown takes SHmax (72.8 MPa less 0.72 × 16.2) below
	// Sv (65 MPa) near the parent's fractures: a normal-faulting regime.
	regime := false
	for _, w := range sum.Warnings {
		regime = regime || w.Kind == sim.WarnRegimeChanged
	}
	if !regime {
		t.Errorf("summary warnings %v: no %s", sum.Warnings, sim.WarnRegimeChanged)
	}
	if !(sum.Depletion.Produced > 0) {
		t.Errorf("produced %g m³", sum.Depletion.Produced)
	}
	r, err := LoadRun(run, 0)
	if err != nil {
		t.Fatal(err)
	}
	layer, err := r.Layer(StressLayerName)
	if err != nil {
		t.Fatal(err)
	}
	// 100 × 80 cells of 5 m, a direction every 4 cells.
	if n := len(layer.Features); n != 25*20 {
		t.Errorf("%s has %d features, want 25 × 20", StressLayerName, n)
	}
	if ogrinfo, err := exec.LookPath("ogrinfo"); err == nil {
		out, err := exec.Command(ogrinfo, "-so", filepath.Join(run, MapsFile), StressLayerName).CombinedOutput()
		if err != nil || !strings.Contains(string(out), "Feature Count: 500") || !strings.Contains(string(out), "shmax_rotation_deg: Real") {
			t.Errorf("ogrinfo %s %s: %v\n%s", MapsFile, StressLayerName, err, out)
		}
	}
	gdalinfo, err := exec.LookPath("gdalinfo")
	if err != nil {
		t.Skip("gdalinfo not installed: band descriptions not checked")
	}
	for name, desc := range map[string]string{DepletionFile: "pore_pressure_change_MPa", RotationFile: "shmax_rotation_deg",
		CriticalChangeFile: "least_critical_pressure_change_MPa"} {
		cmd := exec.Command(gdalinfo, filepath.Join(run, name))
		cmd.Env = append(os.Environ(), "GDAL_PAM_ENABLED=NO")
		out, err := cmd.CombinedOutput()
		if err != nil || !strings.Contains(string(out), "Description = "+desc) {
			t.Errorf("gdalinfo %s: %v\n%s", name, err, out)
		}
	}
}
