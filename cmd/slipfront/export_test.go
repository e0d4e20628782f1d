package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The export command takes the format in any case, writes to standard
// output with --out - (and no status line there), and writes a VTK
// folder; the report command reads a screen folder.
func TestExportStdoutVTKAndScreenReport(t *testing.T) {
	dir := runQuickPad(t)
	code, out, stderr := runCLI(t, "export", dir, "--format", "GeoJSON", "--layer", "wells", "--out", "-")
	if code != exitOK || !strings.HasPrefix(out, `{"type":"FeatureCollection"`) || strings.Contains(stderr, "wrote") {
		t.Errorf("geojson to stdout: exit %d, stdout %.60q, stderr %q", code, out, stderr)
	}
	vtk := filepath.Join(t.TempDir(), "vtk")
	if code, _, stderr := runCLI(t, "export", dir, "--format", "vtk", "--time", "1h", "--out", vtk); code != exitOK {
		t.Fatalf("vtk: exit %d: %s", code, stderr)
	}
	for _, name := range []string{"run.pvd", "fractures_0000.vtp", "events_0000.vtp"} {
		if _, err := os.Stat(filepath.Join(vtk, name)); err != nil {
			t.Error(err)
		}
	}
	if code, _, stderr := runCLI(t, "export", dir, "--format", "vtk", "--out", "-"); code != exitBadInput || !strings.Contains(stderr, "folder") {
		t.Errorf("vtk to stdout: exit %d, %s", code, stderr)
	}
	scr := filepath.Join(t.TempDir(), "screen")
	if code, _, stderr := runCLI(t, "screen", "zipper-pad", "--out", scr); code != exitOK {
		t.Fatalf("screen: exit %d: %s", code, stderr)
	}
	rep := filepath.Join(t.TempDir(), "report")
	if code, _, stderr := runCLI(t, "report", scr, "--out", rep); code != exitOK {
		t.Fatalf("report of a screen folder: exit %d: %s", code, stderr)
	}
	page, err := os.ReadFile(filepath.Join(rep, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"<code>mohr.png</code>", "Inputs", "stress.shmax_gradient"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("screen report lacks %q", want)
		}
	}
	if code, _, stderr := runCLI(t, "report", t.TempDir(), "--out", filepath.Join(t.TempDir(), "r")); code != exitBadInput || !strings.Contains(stderr, "not a folder of slipfront") {
		t.Errorf("report of an empty folder: exit %d, %s", code, stderr)
	}
}
