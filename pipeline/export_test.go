package pipeline

import (
	"context"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb/planar"

	"slipfront/dfn"
	"slipfront/gis"
	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// smallPad cuts the zipper pad down for the tests of folders and pictures: 30 bbl
// stages on 30 m elements, and a slip-weakening distance of 0.5 mm so that
// it ruptures often enough for a magnitude–frequency chart (114 events;
// the zipper pad's own 3 mm slips aseismically). Those elements do
// not resolve the nucleation length, so the number of its events is set
// by the mesh: these tests check how events are written and read, not how
// many there are.
var smallPad = []string{"schedule.volume=30 bbl", "numerics.element_length=30 m", "rock.slip_weakening_distance=0.5 mm"}

// runFolder simulates a small zipper pad into a folder with Simulate, as the run
// command does, and returns the in-memory run too.
func runFolder(t *testing.T) (string, *Run) {
	t.Helper()
	ov, err := scenarios.ParseOverrides(smallPad)
	if err != nil {
		t.Fatal(err)
	}
	s, err := scenarios.LoadExample("zipper-pad", ov...)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	res, err := Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: dir}})
	if err != nil {
		t.Fatal(err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	return dir, &Run{Scenario: s, Network: net, Result: res, Time: res.Duration, OutlineTimes: res.FrameTimes}
}

// A run folder read back gives the same maps as the run in memory: the
// same features, and rasters equal to float32 precision (the snapshot
// stores float32) — except first-slip times, which the folder knows only
// to the output interval.
func TestLoadRunMatchesMemory(t *testing.T) {
	dir, mem := runFolder(t)
	if !IsRunDir(dir) {
		t.Fatal("IsRunDir")
	}
	got, err := LoadRun(dir, math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	memLayers, err := mem.Layers()
	if err != nil {
		t.Fatal(err)
	}
	gotLayers, err := got.Layers()
	if err != nil {
		t.Fatal(err)
	}
	for i := range memLayers {
		if len(memLayers[i].Features) != len(gotLayers[i].Features) {
			t.Errorf("layer %s: %d features in memory, %d read back", memLayers[i].Name, len(memLayers[i].Features), len(gotLayers[i].Features))
		}
	}
	for _, name := range []string{"pressure_increase", "cumulative_slip"} {
		a, err := mem.Raster(name)
		if err != nil {
			t.Fatal(err)
		}
		b, err := got.Raster(name)
		if err != nil {
			t.Fatal(err)
		}
		for k := range a.Data {
			x, y := float64(a.Data[k]), float64(b.Data[k])
			if math.IsNaN(x) != math.IsNaN(y) {
				t.Fatalf("%s: cell %d NoData in one only", name, k)
			}
			if !math.IsNaN(x) {
				// float32 storage: pressures near 50 MPa are stored to
				// 4 Pa (2⁻²³ relative), i.e. 4e-6 MPa of increase.
				numtest.Close(t, name, y, x, 4e-6, 1e-6)
			}
		}
	}
	first, err := got.Raster("first_slip_time")
	if err != nil {
		t.Fatal(err)
	}
	want, _ := mem.Raster("first_slip_time")
	if first.Description != "first_slip_time_s" || first.Unit != "s" {
		t.Errorf("first_slip_time band %q in %q, want first_slip_time_s in s", first.Description, first.Unit)
	}
	// The folder knows a first slip to the frame after it: frames come at
	// the first step end at or after each output time, so the widest gap
	// between frames bounds the difference.
	var gap float64
	for i := 1; i < len(mem.Result.FrameTimes); i++ {
		gap = math.Max(gap, mem.Result.FrameTimes[i]-mem.Result.FrameTimes[i-1])
	}
	if interval := mem.Scenario.Numerics.OutputInterval; !(gap >= interval) || gap > interval+mem.Scenario.Numerics.TimeStepMax {
		t.Fatalf("frames up to %g s apart: want between one output interval (%g s) and that plus the longest step", gap, interval)
	}
	// roundTol: both rasters hold float32 times up to the run's duration,
	// each rounded to half a unit in the last place (2⁻²⁴ relative).
	roundTol := 2 * mem.Result.Duration * 0x1p-24
	for k := range want.Data {
		if d := float64(first.Data[k] - want.Data[k]); d < -roundTol || d > gap+roundTol {
			t.Fatalf("cell %d: first slip %.6g s read back, %.6g s in memory: not within the frame gap %g s", k, first.Data[k], want.Data[k], gap)
		}
	}
	// The sub-resolution events of the run (the zipper pad's [seismicity_rate])
	// are read back, and the map draws them.
	m, err := got.MapPicture()
	if err != nil {
		t.Fatal(err)
	}
	if n := len(mem.Result.RateEvents); n == 0 || len(got.Result.RateEvents) != n || len(m.SmallEvents) != n {
		t.Errorf("%d sub-resolution events run, %d read back, %d on the map", n, len(got.Result.RateEvents), len(m.SmallEvents))
	}
	if _, err := LoadRun(dir, 1e9); err == nil {
		t.Error("a time beyond the run was accepted")
	}
}

// The stimulated outlines grow with time, each feature's area is the exact
// stimulated area at its time, and its polygons are inscribed in that
// region: their planar area is at most the exact area and short of it by
// the circular segments its chords cut off (sagitta 1e-3 of the reach;
// internal/footprint.Outline), well under 1 %.
func TestOutlinesGrow(t *testing.T) {
	_, mem := runFolder(t)
	l, err := mem.outlineLayer()
	if err != nil {
		t.Fatal(err)
	}
	col := slices.IndexFunc(l.Fields, func(f gis.Field) bool { return f.Name == "stimulated_area_m2" })
	if col < 0 || len(l.Features) == 0 {
		t.Fatalf("no stimulated_area_m2 field (%v) or no outline (%d)", l.Fields, len(l.Features))
	}
	prev := 0.0
	for _, f := range l.Features {
		area := f.Values[col].(float64)
		if area < prev {
			t.Fatalf("outline area fell from %g to %g m²", prev, area)
		}
		poly := planar.Area(f.Geometry)
		if !(poly <= area*(1+1e-9) && poly >= area*(1-1e-2)) {
			t.Fatalf("outline polygons cover %g m², the feature says %g m²", poly, area)
		}
		prev = area
	}
	numtest.Rel(t, "final outline area", prev, mem.Result.StimulatedArea, 1e-12)
}

// A folder whose scenario.json is not the run's own is refused, not drawn.
func TestLoadRunRefusesMixedFolder(t *testing.T) {
	dir, _ := runFolder(t)
	other, err := scenarios.LoadExample("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	if err := outdir.WriteFile(dir, ScenarioFile, func(w io.Writer) error { return scenarios.WriteResolved(w, other) }); err != nil {
		t.Fatal(err)
	}
	_, err = LoadRun(dir, math.NaN())
	if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "mixes two runs") {
		t.Errorf("error %v", err)
	}
}

// A complete folder whose snapshot was damaged after the run (a byte
// flipped inside one frame) is still read, from its intact frames, with a
// note; another run's snapshot in its place is refused.
func TestLoadRunDamagedSnapshot(t *testing.T) {
	dir, mem := runFolder(t)
	snap := filepath.Join(dir, SnapshotFile)
	rd, err := snapshot.Open(snap)
	if err != nil {
		t.Fatal(err)
	}
	frames := rd.Frames()
	rd.Close()
	if len(frames) < 3 {
		t.Fatalf("%d frames: too few to damage one in the middle", len(frames))
	}
	b, err := os.ReadFile(snap)
	if err != nil {
		t.Fatal(err)
	}
	mid := frames[len(frames)/2]
	b[mid.Offset+mid.Size/2] ^= 0xff
	if err := os.WriteFile(snap, b, 0o644); err != nil {
		t.Fatal(err)
	}
	r, err := LoadRun(dir, math.NaN())
	if err != nil {
		t.Fatalf("damaged snapshot refused: %v", err)
	}
	if !slices.ContainsFunc(r.Notes, func(n string) bool { return strings.Contains(n, "damaged after the run") }) {
		t.Errorf("notes %q do not tell of the damage", r.Notes)
	}
	if r.Time != mem.Result.Duration {
		t.Errorf("state at %g s, want the last frame at %g s", r.Time, mem.Result.Duration)
	}

	// Another run's snapshot is a swap.
	single, err := scenarios.LoadExample("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	other := t.TempDir()
	if _, err := Simulate(context.Background(), single, SimulateOptions{Out: Folder{Dir: other}}); err != nil {
		t.Fatal(err)
	}
	swapped, err := os.ReadFile(filepath.Join(other, SnapshotFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(snap, swapped, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := LoadRun(dir, math.NaN()); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "mixes two runs") {
		t.Errorf("another realization's snapshot: error %v", err)
	}
}
