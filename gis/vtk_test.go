package gis

import (
	"bytes"
	"encoding/base64"
	"encoding/binary"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

// vtkSample returns two fracture outlines (a 32-gon disc dipping 60° to
// the east and a rectangle dipping 30° to the north) with three fields,
// one of them NaN for the second fracture, and three events.
func vtkSample() (VTKPolygons, VTKPoints) {
	deg := math.Pi / 180
	ring := func(dip, dipDir float64) (strike, downDip r3.Vec) {
		return orient.Strike(dipDir), orient.DownDip(dip, dipDir)
	}
	s1, d1 := ring(60*deg, 90*deg)
	s2, d2 := ring(30*deg, 0)
	polys := VTKPolygons{
		Rings: [][]r3.Vec{
			DiscRing(r3.Vec{X: 10, Y: -20, Z: -2600}, s1, d1, 40, DefaultDiscVertices),
			RectangleRing(r3.Vec{X: -50, Y: 30, Z: -2610}, s2, d2, 80, 20),
		},
		Fields: []VTKField{
			{Name: "set", Values: []float64{0, 1}},
			{Name: "max_slip_mm", Values: []float64{1.25, 0}},
			{Name: "first_slip_time_s", Values: []float64{3600.5, math.NaN()}},
		},
	}
	pts := VTKPoints{
		Points: []r3.Vec{{X: 1, Y: 2, Z: -2600}, {X: -3.5, Y: 4, Z: -2605.25}, {X: 0, Y: 0, Z: -2599}},
		Fields: []VTKField{
			{Name: "time_s", Values: []float64{10, 20, 30}},
			{Name: "magnitude_Mw", Values: []float64{-1.5, -0.25, math.NaN()}},
		},
	}
	return polys, pts
}

// vtkFile is the part of a .vtp document the Go-side test reads back.
type vtkFile struct {
	Type       string `xml:"type,attr"`
	Version    string `xml:"version,attr"`
	ByteOrder  string `xml:"byte_order,attr"`
	HeaderType string `xml:"header_type,attr"`
	Piece      struct {
		NumberOfPoints int `xml:",attr"`
		NumberOfVerts  int `xml:",attr"`
		NumberOfPolys  int `xml:",attr"`
		CellData       vtkArrays
		PointData      vtkArrays
		PointsArr      vtkArrays `xml:"Points"`
		VertsArr       vtkArrays `xml:"Verts"`
		PolysArr       vtkArrays `xml:"Polys"`
	} `xml:"PolyData>Piece"`
}

type vtkArrays struct {
	Arrays []struct {
		Type, Name, Format string `xml:",attr"`
		Components         int    `xml:"NumberOfComponents,attr"`
		Text               string `xml:",chardata"`
	} `xml:"DataArray"`
}

// decodeBlock decodes a binary DataArray: base64 of a UInt64 byte count
// and the data; it checks the count.
func decodeBlock(t *testing.T, text string) []byte {
	t.Helper()
	b, err := base64.StdEncoding.DecodeString(strings.TrimSpace(text))
	if err != nil {
		t.Fatalf("base64: %v", err)
	}
	if len(b) < 8 {
		t.Fatalf("block of %d bytes has no header", len(b))
	}
	n := binary.LittleEndian.Uint64(b)
	if n != uint64(len(b)-8) {
		t.Fatalf("header says %d bytes, block has %d", n, len(b)-8)
	}
	return b[8:]
}

// float64s and int64s decode little-endian values.
func float64s(b []byte) []float64 {
	out := make([]float64, len(b)/8)
	for i := range out {
		out[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return out
}

func int64s(b []byte) []int64 {
	out := make([]int64, len(b)/8)
	for i := range out {
		out[i] = int64(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return out
}

// sameFloat compares exactly, NaN equal to NaN: the writer stores the
// IEEE bits unchanged, so any difference is a defect.
func sameFloat(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || (math.IsNaN(a) && math.IsNaN(b))
}

func TestVTKPolygonsStructure(t *testing.T) {
	polys, _ := vtkSample()
	var buf bytes.Buffer
	if err := WriteVTKPolygons(&buf, samplePlacement, polys); err != nil {
		t.Fatal(err)
	}
	var f vtkFile
	if err := xml.Unmarshal(buf.Bytes(), &f); err != nil {
		t.Fatalf("not XML: %v", err)
	}
	if f.Type != "PolyData" || f.Version != vtkVersion || f.ByteOrder != "LittleEndian" || f.HeaderType != "UInt64" {
		t.Errorf("VTKFile attributes %+v", f)
	}
	pc := f.Piece
	wantPts := DefaultDiscVertices + 4
	if pc.NumberOfPoints != wantPts || pc.NumberOfPolys != 2 || pc.NumberOfVerts != 0 {
		t.Fatalf("piece counts: %d points, %d polys, %d verts; want %d, 2, 0", pc.NumberOfPoints, pc.NumberOfPolys, pc.NumberOfVerts, wantPts)
	}
	if len(pc.PointsArr.Arrays) != 1 || pc.PointsArr.Arrays[0].Components != 3 {
		t.Fatalf("Points: %+v", pc.PointsArr)
	}
	xyz := float64s(decodeBlock(t, pc.PointsArr.Arrays[0].Text))
	if len(xyz) != 3*wantPts {
		t.Fatalf("%d coordinates, want %d", len(xyz), 3*wantPts)
	}
	k := 0
	for _, r := range polys.Rings {
		for _, v := range r {
			want := [3]float64{v.X + samplePlacement.Easting, v.Y + samplePlacement.Northing, v.Z}
			for c := range 3 {
				if !sameFloat(xyz[3*k+c], want[c]) {
					t.Errorf("point %d component %d = %v, want %v", k, c, xyz[3*k+c], want[c])
				}
			}
			k++
		}
	}
	if len(pc.PolysArr.Arrays) != 2 {
		t.Fatalf("Polys has %d arrays, want connectivity and offsets", len(pc.PolysArr.Arrays))
	}
	conn := int64s(decodeBlock(t, pc.PolysArr.Arrays[0].Text))
	offs := int64s(decodeBlock(t, pc.PolysArr.Arrays[1].Text))
	if len(conn) != wantPts || fmt.Sprint(offs) != fmt.Sprint([]int64{DefaultDiscVertices, int64(wantPts)}) {
		t.Errorf("connectivity of %d ids, offsets %v", len(conn), offs)
	}
	for i, id := range conn {
		if id != int64(i) {
			t.Fatalf("connectivity[%d] = %d, want %d", i, id, i)
		}
	}
	if len(pc.CellData.Arrays) != len(polys.Fields) {
		t.Fatalf("%d cell arrays, want %d", len(pc.CellData.Arrays), len(polys.Fields))
	}
	for i, a := range pc.CellData.Arrays {
		got := float64s(decodeBlock(t, a.Text))
		want := polys.Fields[i].Values
		if a.Name != polys.Fields[i].Name || len(got) != len(want) {
			t.Fatalf("cell array %d: %q with %d values, want %q with %d", i, a.Name, len(got), polys.Fields[i].Name, len(want))
		}
		for j := range want {
			if !sameFloat(got[j], want[j]) {
				t.Errorf("%s[%d] = %v, want %v", a.Name, j, got[j], want[j])
			}
		}
	}
	// Deterministic bytes.
	var again bytes.Buffer
	if err := WriteVTKPolygons(&again, samplePlacement, polys); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(buf.Bytes(), again.Bytes()) {
		t.Error("two writes of the same polygons differ")
	}
}

func TestVTKPointsStructure(t *testing.T) {
	_, pts := vtkSample()
	var buf bytes.Buffer
	if err := WriteVTKPoints(&buf, Placement{}, pts); err != nil {
		t.Fatal(err)
	}
	var f vtkFile
	if err := xml.Unmarshal(buf.Bytes(), &f); err != nil {
		t.Fatal(err)
	}
	pc := f.Piece
	if pc.NumberOfPoints != 3 || pc.NumberOfVerts != 3 || pc.NumberOfPolys != 0 {
		t.Fatalf("counts %d points, %d verts, %d polys; want 3, 3, 0", pc.NumberOfPoints, pc.NumberOfVerts, pc.NumberOfPolys)
	}
	if len(pc.CellData.Arrays) != 0 || len(pc.PointData.Arrays) != 2 {
		t.Fatalf("%d cell arrays, %d point arrays; want 0 and 2", len(pc.CellData.Arrays), len(pc.PointData.Arrays))
	}
	mags := float64s(decodeBlock(t, pc.PointData.Arrays[1].Text))
	if len(mags) != 3 || mags[0] != -1.5 || mags[1] != -0.25 || !math.IsNaN(mags[2]) {
		t.Errorf("magnitudes %v, want [-1.5 -0.25 NaN]", mags)
	}
	offs := int64s(decodeBlock(t, pc.VertsArr.Arrays[1].Text))
	if fmt.Sprint(offs) != "[1 2 3]" {
		t.Errorf("vertex offsets %v, want [1 2 3]", offs)
	}
	// The undefined frame adds no offset.
	xyz := float64s(decodeBlock(t, pc.PointsArr.Arrays[0].Text))
	if xyz[3] != -3.5 || xyz[5] != -2605.25 {
		t.Errorf("second point (%v, %v, %v), want (-3.5, 4, -2605.25)", xyz[3], xyz[4], xyz[5])
	}
}

func TestDiscRing(t *testing.T) {
	deg := math.Pi / 180
	for _, tc := range []struct {
		dip, dipDir float64
		n           int
	}{{60 * deg, 90 * deg, 32}, {0, 0, 8}, {90 * deg, 215 * deg, 64}, {12 * deg, 300 * deg, 17}} {
		strike, downDip := orient.Strike(tc.dipDir), orient.DownDip(tc.dip, tc.dipDir)
		c, radius := r3.Vec{X: 5, Y: 6, Z: -100}, 25.0
		ring := DiscRing(c, strike, downDip, radius, tc.n)
		if len(ring) != tc.n {
			t.Fatalf("%d vertices, want %d", len(ring), tc.n)
		}
		normal := orient.Normal(tc.dip, tc.dipDir)
		// geomTol: a few float64 round-offs of numbers of size 100.
		const geomTol = 1e-9
		for k, v := range ring {
			d := r3.Sub(v, c)
			numtest.Abs(t, fmt.Sprintf("vertex %d distance from the centre", k), r3.Norm(d), radius, geomTol)
			numtest.Abs(t, fmt.Sprintf("vertex %d off the plane", k), r3.Dot(d, normal), 0, geomTol)
		}
		// Newell's vector of a planar polygon is twice its area times its
		// unit right-hand normal (Newell's method; Sutherland, Sproull &
		// Schumacker 1974, ACM Computing Surveys 6(1)). An inscribed
		// regular n-gon has area (n/2)·r²·sin(2π/n) (elementary geometry:
		// n isosceles triangles of apex angle 2π/n).
		nw := newell(ring)
		wantArea := float64(tc.n) / 2 * radius * radius * math.Sin(2*math.Pi/float64(tc.n))
		numtest.Rel(t, "polygon area", r3.Norm(nw)/2, wantArea, geomTol)
		if tc.dip < 89*deg {
			// The right-hand normal points up for every non-vertical plane.
			numtest.Abs(t, "normal · upward normal", r3.Dot(r3.Unit(nw), normal), 1, geomTol)
		}
	}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(fmt.Sprint(r), "gis: ") {
			t.Errorf("DiscRing with 3 vertices: panic %v, want one prefixed \"gis: \"", r)
		}
	}()
	DiscRing(r3.Vec{}, r3.Vec{X: 1}, r3.Vec{Y: 1}, 1, 3)
}

func TestRectangleRing(t *testing.T) {
	deg := math.Pi / 180
	strike, downDip := orient.Strike(40*deg), orient.DownDip(70*deg, 40*deg)
	c := r3.Vec{X: -1, Y: 2, Z: -3000}
	ring := RectangleRing(c, strike, downDip, 80, 20)
	if len(ring) != 4 {
		t.Fatalf("%d corners, want 4", len(ring))
	}
	const geomTol = 1e-9 // Round-off of numbers of size 3000.
	nw := newell(ring)
	numtest.Rel(t, "area", r3.Norm(nw)/2, 80*20, geomTol)
	numtest.Abs(t, "normal · upward normal", r3.Dot(r3.Unit(nw), orient.Normal(70*deg, 40*deg)), 1, geomTol)
	numtest.Abs(t, "first corner along strike", r3.Dot(r3.Sub(ring[0], c), strike), 40, geomTol)
	numtest.Abs(t, "first corner down dip", r3.Dot(r3.Sub(ring[0], c), downDip), 10, geomTol)
}

// newell returns Newell's normal vector of polygon p.
func newell(p []r3.Vec) r3.Vec {
	var n r3.Vec
	for i, a := range p {
		b := p[(i+1)%len(p)]
		n.X += (a.Y - b.Y) * (a.Z + b.Z)
		n.Y += (a.Z - b.Z) * (a.X + b.X)
		n.Z += (a.X - b.X) * (a.Y + b.Y)
	}
	return n
}

func TestVTKErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	tri := []r3.Vec{{}, {X: 1}, {Y: 1}}
	for _, tc := range []struct {
		name  string
		write func(io.Writer) error
		want  string
	}{
		{"two vertices", func(w io.Writer) error {
			return WriteVTKPolygons(w, Placement{}, VTKPolygons{Rings: [][]r3.Vec{tri, tri[:2]}})
		}, "polygon 1 has 2 vertices"},
		{"NaN vertex", func(w io.Writer) error {
			return WriteVTKPolygons(w, Placement{}, VTKPolygons{Rings: [][]r3.Vec{{{}, {X: 1}, {Z: nan}}}})
		}, "polygon 0 vertex 2"},
		{"short field", func(w io.Writer) error {
			return WriteVTKPolygons(w, Placement{}, VTKPolygons{Rings: [][]r3.Vec{tri}, Fields: []VTKField{{Name: "a", Values: nil}}})
		}, `"a" has 0 values for 1 polygons`},
		{"bad name", func(w io.Writer) error {
			return WriteVTKPolygons(w, Placement{}, VTKPolygons{Rings: [][]r3.Vec{tri}, Fields: []VTKField{{Name: "slip m", Values: []float64{1}}}})
		}, `"slip m"`},
		{"repeated name", func(w io.Writer) error {
			f := VTKField{Name: "a", Values: []float64{1}}
			return WriteVTKPolygons(w, Placement{}, VTKPolygons{Rings: [][]r3.Vec{tri}, Fields: []VTKField{f, f}})
		}, "repeated"},
		{"infinite value", func(w io.Writer) error {
			return WriteVTKPoints(w, Placement{}, VTKPoints{Points: tri, Fields: []VTKField{{Name: "m", Values: []float64{0, inf, 0}}}})
		}, `"m" value 1`},
		{"infinite point", func(w io.Writer) error {
			return WriteVTKPoints(w, Placement{}, VTKPoints{Points: []r3.Vec{{X: inf}}})
		}, "points vertex 0"},
		{"PVD NaN time", func(w io.Writer) error { return WritePVD(w, []PVDEntry{{Time: nan, File: "a.vtp"}}) }, "time NaN"},
		{"PVD negative part", func(w io.Writer) error { return WritePVD(w, []PVDEntry{{Part: -1, File: "a.vtp"}}) }, "part -1"},
		{"PVD absolute file", func(w io.Writer) error { return WritePVD(w, []PVDEntry{{File: "/tmp/a.vtp"}}) }, "relative path"},
		{"PVD empty file", func(w io.Writer) error { return WritePVD(w, []PVDEntry{{}}) }, "relative path"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			err := tc.write(&buf)
			if err == nil {
				t.Fatalf("no error, want one containing %q", tc.want)
			}
			if !strings.HasPrefix(err.Error(), "gis: ") || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q: want the prefix \"gis: \" and %q", err, tc.want)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes written despite the error", buf.Len())
			}
		})
	}
}

func TestWritePVD(t *testing.T) {
	var buf bytes.Buffer
	err := WritePVD(&buf, []PVDEntry{{Time: 0, File: "fractures_0000.vtp"}, {Time: 0, Part: 1, File: "events_0000.vtp"}, {Time: 1800.5, File: "a&b.vtp"}})
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Type string `xml:"type,attr"`
		Sets []struct {
			Time float64 `xml:"timestep,attr"`
			Part int     `xml:"part,attr"`
			File string  `xml:"file,attr"`
		} `xml:"Collection>DataSet"`
	}
	if err := xml.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Type != "Collection" || len(doc.Sets) != 3 {
		t.Fatalf("type %q with %d datasets, want Collection with 3", doc.Type, len(doc.Sets))
	}
	if s := doc.Sets[2]; s.Time != 1800.5 || s.File != "a&b.vtp" || doc.Sets[1].Part != 1 {
		t.Errorf("datasets %+v", doc.Sets)
	}
}

// vtkPython is Debian's interpreter with python3-vtk9.
const vtkPython = "/usr/bin/python3"

// needVTKPython skips the test unless the VTK Python bindings are
// installed (CI installs python3-vtk9).
func needVTKPython(t *testing.T) {
	t.Helper()
	if _, err := os.Stat(vtkPython); err != nil {
		t.Skip("/usr/bin/python3 not installed")
	}
	if err := exec.Command(vtkPython, "-c", "import vtk").Run(); err != nil {
		t.Skip("python3-vtk9 not installed")
	}
}

// vtkDump is what testdata/vtk_dump.py prints for a .vtp file.
type vtkDump struct {
	Points    [][3]float64          `json:"points"`
	Verts     [][]int               `json:"verts"`
	Polys     [][]int               `json:"polys"`
	CellData  map[string][]*float64 `json:"cell_data"`
	PointData map[string][]*float64 `json:"point_data"`
}

func dumpVTK(t *testing.T, kind, path string, out any) {
	t.Helper()
	text := runTool(t, nil, vtkPython, filepath.Join("testdata", "vtk_dump.py"), kind, path)
	if err := json.Unmarshal([]byte(text), out); err != nil {
		t.Fatalf("vtk_dump output %q: %v", text, err)
	}
}

// compareVTKFields compares fields read back by VTK with ours; null is NaN.
func compareVTKFields(t *testing.T, got map[string][]*float64, want []VTKField) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("VTK read %d arrays, want %d", len(got), len(want))
	}
	for _, f := range want {
		g, ok := got[f.Name]
		if !ok || len(g) != len(f.Values) {
			t.Errorf("array %q: read %d values, want %d", f.Name, len(g), len(f.Values))
			continue
		}
		for i, v := range f.Values {
			if (g[i] == nil) != math.IsNaN(v) || (g[i] != nil && *g[i] != v) {
				t.Errorf("%s[%d] read as %v, want %v", f.Name, i, g[i], v)
			}
		}
	}
}

// TestVTKInterop reads our files back with VTK's own readers
// (vtkXMLPolyDataReader, vtkXMLCollectionReader) through its Python
// bindings: counts, coordinates and values must equal ours exactly (the
// data are binary IEEE doubles).
func TestVTKInterop(t *testing.T) {
	needVTKPython(t)
	dir := t.TempDir()
	polys, pts := vtkSample()
	write := func(name string, fn func(io.Writer) error) string {
		var buf bytes.Buffer
		if err := fn(&buf); err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	fracPath := write("fractures_0.vtp", func(w io.Writer) error { return WriteVTKPolygons(w, samplePlacement, polys) })
	eventPath := write("events_0.vtp", func(w io.Writer) error { return WriteVTKPoints(w, samplePlacement, pts) })

	var fr vtkDump
	dumpVTK(t, "vtp", fracPath, &fr)
	if len(fr.Polys) != 2 || len(fr.Verts) != 0 {
		t.Fatalf("VTK read %d polygons and %d vertices, want 2 and 0", len(fr.Polys), len(fr.Verts))
	}
	k := 0
	for i, r := range polys.Rings {
		if len(fr.Polys[i]) != len(r) {
			t.Fatalf("polygon %d has %d vertices in VTK, want %d", i, len(fr.Polys[i]), len(r))
		}
		for j, v := range r {
			got := fr.Points[fr.Polys[i][j]]
			want := [3]float64{v.X + samplePlacement.Easting, v.Y + samplePlacement.Northing, v.Z}
			if got != want {
				t.Errorf("polygon %d vertex %d read as %v, want %v", i, j, got, want)
			}
			k++
		}
	}
	if len(fr.Points) != k {
		t.Errorf("VTK read %d points, want %d", len(fr.Points), k)
	}
	compareVTKFields(t, fr.CellData, polys.Fields)

	var ev vtkDump
	dumpVTK(t, "vtp", eventPath, &ev)
	if len(ev.Verts) != len(pts.Points) || len(ev.Polys) != 0 {
		t.Fatalf("VTK read %d vertices and %d polygons, want %d and 0", len(ev.Verts), len(ev.Polys), len(pts.Points))
	}
	for i, v := range pts.Points {
		if len(ev.Verts[i]) != 1 {
			t.Fatalf("vertex cell %d has %d points", i, len(ev.Verts[i]))
		}
		want := [3]float64{v.X + samplePlacement.Easting, v.Y + samplePlacement.Northing, v.Z}
		if got := ev.Points[ev.Verts[i][0]]; got != want {
			t.Errorf("event %d read as %v, want %v", i, got, want)
		}
	}
	compareVTKFields(t, ev.PointData, pts.Fields)

	// A collection of two times, each with the fractures and the events.
	write("fractures_1.vtp", func(w io.Writer) error { return WriteVTKPolygons(w, samplePlacement, polys) })
	write("events_1.vtp", func(w io.Writer) error { return WriteVTKPoints(w, samplePlacement, pts) })
	pvd := write("run.pvd", func(w io.Writer) error {
		return WritePVD(w, []PVDEntry{
			{Time: 0, Part: 0, File: "fractures_0.vtp"}, {Time: 0, Part: 1, File: "events_0.vtp"},
			{Time: 3600, Part: 0, File: "fractures_1.vtp"}, {Time: 3600, Part: 1, File: "events_1.vtp"},
		})
	})
	var col struct {
		Times  []float64 `json:"times"`
		Blocks []int     `json:"blocks"`
	}
	dumpVTK(t, "pvd", pvd, &col)
	if fmt.Sprint(col.Times) != "[0 3600]" || fmt.Sprint(col.Blocks) != "[2 2]" {
		t.Errorf("collection read as times %v with %v datasets, want [0 3600] with [2 2]", col.Times, col.Blocks)
	}
}

// benchVTKPolygons writes n 32-gon discs with four fields.
func benchVTKPolygons(b *testing.B, n int) {
	polys := VTKPolygons{Rings: make([][]r3.Vec, n)}
	vals := make([]float64, n)
	for i := range n {
		c := r3.Vec{X: float64(i % 100), Y: float64(i / 100), Z: -2600}
		polys.Rings[i] = DiscRing(c, r3.Vec{Y: 1}, r3.Vec{X: 0.5, Z: -math.Sqrt(0.75)}, 20, DefaultDiscVertices)
		vals[i] = float64(i)
	}
	for _, name := range []string{"set", "max_slip_mm", "first_slip_time_s", "critical_dp_MPa"} {
		polys.Fields = append(polys.Fields, VTKField{Name: name, Values: vals})
	}
	b.ResetTimer()
	for b.Loop() {
		if err := WriteVTKPolygons(io.Discard, samplePlacement, polys); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWriteVTKPolygons1e3(b *testing.B) { benchVTKPolygons(b, 1000) }
func BenchmarkWriteVTKPolygons1e4(b *testing.B) { benchVTKPolygons(b, 10000) }

// In a CRS in US survey feet all three coordinates are in feet: x and y
// through Placement.ToCRS, z = elevation / (1200/3937 m) (NIST SP 811
// B.8: foot (U.S. survey) = 1200/3937 m, the ratio from memory), so a
// 3-D viewer is not stretched vertically.
func TestVTKFootCRS(t *testing.T) {
	pl := Placement{CRS: CRS{EPSG: 2277}, Easting: 701000, Northing: 2120000} // NAD83 / Texas Central (ftUS), origin in m
	var buf bytes.Buffer
	pts := VTKPoints{Points: []r3.Vec{{X: 100, Y: -50, Z: -2600}}}
	if err := WriteVTKPoints(&buf, pl, pts); err != nil {
		t.Fatal(err)
	}
	var f vtkFile
	if err := xml.Unmarshal(buf.Bytes(), &f); err != nil {
		t.Fatal(err)
	}
	xyz := float64s(decodeBlock(t, f.Piece.PointsArr.Arrays[0].Text))
	const ftUS = 1200.0 / 3937
	want := [3]float64{(100 + 701000) / ftUS, (-50 + 2120000) / ftUS, -2600 / ftUS}
	// The table's unit length and one division each: a few ulps.
	const tol = 4 * 0x1p-52
	for c := range 3 {
		if math.Abs(xyz[c]-want[c]) > tol*math.Abs(want[c]) {
			t.Errorf("component %d = %v ftUS, want %v", c, xyz[c], want[c])
		}
	}
	if !bytes.Contains(buf.Bytes(), []byte("z = elevation relative to the depth datum (US survey foot, up)")) {
		t.Errorf("the note does not name the unit of z:\n%.400s", buf.Bytes())
	}
}
