package pipeline

import (
	"bytes"
	"context"
	"encoding/json"
	"encoding/xml"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/sim"
	"slipfront/snapshot"
)

// exportVTKFolder exports the shared run as VTK at every frame time.
func exportVTKFolder(t *testing.T) (string, *Run) {
	t.Helper()
	dir, r := sharedRun(t)
	out := filepath.Join(t.TempDir(), "vtk")
	if _, err := Export(context.Background(), dir, ExportOptions{Format: "vtk", Out: out, Time: math.NaN()}); err != nil {
		t.Fatal(err)
	}
	return out, r
}

// pvd is a ParaView collection as read back.
type pvd struct {
	DataSets []struct {
		Time float64 `xml:"timestep,attr"`
		Part int     `xml:"part,attr"`
		File string  `xml:"file,attr"`
	} `xml:"Collection>DataSet"`
}

// The VTK folder holds one fractures file and one events file per
// snapshot frame, listed in time order by the collection, and nothing
// else.
func TestExportVTKFolder(t *testing.T) {
	out, r := exportVTKFolder(t)
	b, err := os.ReadFile(filepath.Join(out, VTKCollectionFile))
	if err != nil {
		t.Fatal(err)
	}
	var c pvd
	if err := xml.Unmarshal(b, &c); err != nil {
		t.Fatal(err)
	}
	frames := len(r.OutlineTimes)
	if frames < 2 || len(c.DataSets) != 2*frames {
		t.Fatalf("collection of %d datasets for %d frames", len(c.DataSets), frames)
	}
	want := []string{VTKCollectionFile}
	for k, tk := range r.OutlineTimes {
		f, e := c.DataSets[2*k], c.DataSets[2*k+1]
		if f.Time != tk || e.Time != tk || f.Part != 0 || e.Part != 1 || f.File != vtkFracturesFile(k) || e.File != vtkEventsFile(k) {
			t.Errorf("frame %d at %g s: datasets %+v, %+v", k, tk, f, e)
		}
		want = append(want, f.File, e.File)
	}
	slices.Sort(want)
	if got := folderFiles(t, out); !slices.Equal(got, want) {
		t.Errorf("VTK folder holds %v, want %v", got, want)
	}
}

// vtkRead is what the python3-vtk9 script prints of a .vtp file.
type vtkRead struct {
	Polys, Verts int
	Points       [][3]float64
	Offsets      []int
	Data         map[string][]*float64 // NaN as null.
}

// readVTK reads a .vtp file with VTK's own XML reader (Debian's
// python3-vtk9), or skips the test when it is not installed (CI installs
// it).
func readVTK(t *testing.T, path string) vtkRead {
	t.Helper()
	const python = "/usr/bin/python3"
	if _, err := os.Stat(python); err != nil {
		t.Skip("/usr/bin/python3 not installed")
	}
	if err := exec.Command(python, "-c", "import vtk").Run(); err != nil {
		t.Skip("python3-vtk9 not installed")
	}
	const script = `
import json, math, sys, vtk
from vtk.util.numpy_support import vtk_to_numpy
r = vtk.vtkXMLPolyDataReader()
r.SetFileName(sys.argv[1])
r.Update()
if r.GetErrorCode():
    sys.exit("vtk could not read " + sys.argv[1])
p = r.GetOutput()
cells = p.GetPolys() if p.GetNumberOfPolys() else p.GetVerts()
data = p.GetCellData() if p.GetNumberOfPolys() else p.GetPointData()
def nan(v):
    return None if math.isnan(v) else v
out = {
  "Polys": p.GetNumberOfPolys(), "Verts": p.GetNumberOfVerts(),
  "Points": [list(p.GetPoint(i)) for i in range(p.GetNumberOfPoints())],
  "Offsets": [int(v) for v in vtk_to_numpy(cells.GetOffsetsArray())][1:] if cells.GetNumberOfCells() else [],
  "Data": {data.GetArrayName(i): [nan(float(v)) for v in vtk_to_numpy(data.GetArray(i))] for i in range(data.GetNumberOfArrays())},
}
json.dump(out, sys.stdout)
`
	cmd := exec.Command(python, "-c", script, path)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	b, err := cmd.Output()
	if err != nil {
		t.Fatalf("python3-vtk9 on %s: %v\n%s", path, err, stderr.String())
	}
	var v vtkRead
	if err := json.Unmarshal(b, &v); err != nil {
		t.Fatal(err)
	}
	return v
}

// sameValues compares a field read back with ours: float64 written in
// binary and printed by Python with a round-tripping repr, so exactly;
// NaN as null.
func sameValues(t *testing.T, what string, got []*float64, want []float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d values read, %d written", what, len(got), len(want))
		return
	}
	for i, w := range want {
		switch g := got[i]; {
		case g == nil && math.IsNaN(w):
		case g == nil || *g != w:
			t.Errorf("%s[%d] = %v read, %g written", what, i, g, w)
			return
		}
	}
}

// VTK itself reads our fractures and events back: the polygon and point
// counts, every vertex in the scenario's CRS with the origin applied, and
// every field value equal to what the run holds at that time.
func TestVTKReadByVTK(t *testing.T) {
	out, r := exportVTKFolder(t)
	k := len(r.OutlineTimes) - 1
	tk := r.OutlineTimes[k]
	rd, err := snapshot.Open(filepath.Join(sharedRunDir, SnapshotFile))
	if err != nil {
		t.Fatal(err)
	}
	defer rd.Close()
	fr, err := r.vtkPolygons()
	if err != nil {
		t.Fatal(err)
	}
	res, _, err := sim.Replay(rd.Reader, tk)
	if err != nil {
		t.Fatal(err)
	}
	polys, err := fr.at(r, res)
	if err != nil {
		t.Fatal(err)
	}
	pl, err := r.Placement()
	if err != nil {
		t.Fatal(err)
	}

	got := readVTK(t, filepath.Join(out, vtkFracturesFile(k)))
	if got.Polys != len(polys.Rings) || got.Verts != 0 || len(polys.Rings) == 0 {
		t.Fatalf("%d polygons and %d vertices read, %d polygons written", got.Polys, got.Verts, len(polys.Rings))
	}
	var want [][3]float64
	var offsets []int
	for _, ring := range polys.Rings {
		for _, p := range ring {
			q := pl.ToCRS([2]float64{p.X, p.Y})
			want = append(want, [3]float64{q[0], q[1], p.Z})
		}
		offsets = append(offsets, len(want))
	}
	if !slices.Equal(got.Offsets, offsets) {
		t.Errorf("polygon ends read %v…, written %v…", got.Offsets[:min(4, len(got.Offsets))], offsets[:4])
	}
	if !slices.Equal(got.Points, want) { // Binary float64 both ways: exact.
		t.Errorf("vertices differ: first read %v, written %v", got.Points[0], want[0])
	}
	for _, f := range polys.Fields {
		sameValues(t, "fractures "+f.Name, got.Data[f.Name], f.Values)
	}
	if len(got.Data) != len(VTKFractureFields) {
		t.Errorf("fields read %v, want %v", keys(got.Data), VTKFractureFields)
	}
	slipped := 0
	for _, v := range got.Data["max_slip_mm"] {
		if v != nil && *v > 0 {
			slipped++
		}
	}
	if slipped == 0 {
		t.Error("no fracture slipped at the last frame: the slip field was checked on zeros")
	}

	events := r.vtkEvents(tk)
	ev := readVTK(t, filepath.Join(out, vtkEventsFile(k)))
	if ev.Verts != len(r.Result.Events) || len(events.Points) != len(r.Result.Events) || ev.Verts == 0 {
		t.Fatalf("%d event vertices read, %d written, the run has %d events", ev.Verts, len(events.Points), len(r.Result.Events))
	}
	for i, p := range events.Points {
		q := pl.ToCRS([2]float64{p.X, p.Y})
		if ev.Points[i] != [3]float64{q[0], q[1], p.Z} {
			t.Fatalf("event %d read at %v, written at (%g, %g, %g)", i, ev.Points[i], q[0], q[1], p.Z)
		}
	}
	for _, f := range events.Fields {
		sameValues(t, "events "+f.Name, ev.Data[f.Name], f.Values)
	}
	first := readVTK(t, filepath.Join(out, vtkEventsFile(0)))
	if first.Verts >= ev.Verts {
		t.Errorf("%d events at the first frame, %d at the last: want the catalogue to grow", first.Verts, ev.Verts)
	}
}

func keys(m map[string][]*float64) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

// Export takes the format in any letter case, writes single files to
// standard output, and keeps the VTK folder whole: one time with --time,
// refused on stdout, on a batch and over an existing folder without
// Force.
func TestExportOptions(t *testing.T) {
	dir, r := sharedRun(t)
	ctx := context.Background()
	var b bytes.Buffer
	if _, err := Export(ctx, dir, ExportOptions{Format: "GeoJSON", Layer: "wells", Out: StdoutName, Stdout: &b, Time: math.NaN()}); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(b.String(), `{"type":"FeatureCollection","name":"wells"`) {
		t.Errorf("geojson on stdout starts %.60q", b.String())
	}
	b.Reset()
	if _, err := Export(ctx, dir, ExportOptions{Format: "GPKG", Layer: "wells", Out: StdoutName, Stdout: &b, Time: math.NaN()}); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(b.Bytes(), []byte("SQLite format 3\x00")) { // SQLite file format, §1.3: the header string.
		t.Errorf("gpkg on stdout starts %.16q", b.Bytes())
	}

	one := filepath.Join(t.TempDir(), "one")
	tk := r.OutlineTimes[1]
	if _, err := Export(ctx, dir, ExportOptions{Format: "Vtk", Out: one, Time: tk}); err != nil {
		t.Fatal(err)
	}
	if got, want := folderFiles(t, one), []string{vtkEventsFile(0), vtkFracturesFile(0), VTKCollectionFile}; !slices.Equal(got, want) {
		t.Errorf("VTK folder at one time holds %v, want %v", got, want)
	}
	b2, err := os.ReadFile(filepath.Join(one, VTKCollectionFile))
	if err != nil {
		t.Fatal(err)
	}
	if want := fmt.Sprintf(`timestep="%g"`, tk); !bytes.Contains(b2, []byte(want)) {
		t.Errorf("collection lacks %s:\n%s", want, b2)
	}
	bad := []struct {
		name string
		o    ExportOptions
		dir  string
		want error
	}{
		{"vtk to stdout", ExportOptions{Format: "vtk", Out: StdoutName, Stdout: &b}, dir, badinput.Err},
		{"existing folder", ExportOptions{Format: "vtk", Out: one}, dir, outdir.ErrExists},
		{"unknown format", ExportOptions{Format: "shp", Out: filepath.Join(t.TempDir(), "x")}, dir, badinput.Err},
	}
	for _, c := range bad {
		c.o.Time = math.NaN()
		if _, err := Export(ctx, c.dir, c.o); !errors.Is(err, c.want) || !errors.Is(err, badinput.Err) {
			t.Errorf("%s: error %v, want %v (bad input)", c.name, err, c.want)
		}
	}
	if _, err := Export(ctx, dir, ExportOptions{Format: "vtk", Out: one, Force: true, Time: math.NaN()}); err != nil {
		t.Errorf("vtk over its own folder with Force: %v", err)
	}
}
