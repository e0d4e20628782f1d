package gis

import (
	"bufio"
	"encoding/base64"
	"encoding/binary"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/spatial/r3"
)

// VTK XML PolyData layout written by WriteVTKPolygons and WriteVTKPoints
// (Kitware, "VTK File Formats", VTK User's Guide, XML formats; file
// format version 1.0, readable by VTK ≥ 6):
//
//	<?xml version="1.0"?>
//	<!-- note: CRS, origin, caution -->
//	<VTKFile type="PolyData" version="1.0" byte_order="LittleEndian" header_type="UInt64">
//	  <PolyData>
//	    <Piece NumberOfPoints="P" NumberOfVerts="V" NumberOfLines="0" NumberOfStrips="0" NumberOfPolys="C">
//	      <PointData> or <CellData>: one Float64 DataArray per field
//	      <Points>: one Float64 DataArray, 3 components (x, y, z)
//	      <Verts> or <Polys>: Int64 DataArrays "connectivity" and "offsets"
//	    </Piece>
//	  </PolyData>
//	</VTKFile>
//
// Every DataArray is format="binary": the base64 encoding (RFC 4648 §4,
// with padding) of one block made of an 8-byte little-endian byte count
// (header_type UInt64) followed by the little-endian values.
const (
	vtkVersion    = "1.0"
	vtkByteOrder  = "LittleEndian"
	vtkHeaderType = "UInt64"
	pvdVersion    = "0.1"
)

// MinDiscVertices is the fewest vertices DiscRing accepts. A regular
// n-gon inscribed in a circle has sin(2π/n)/(2π/n) of the circle's area:
// 99.4 % at n = 32, the value callers should use unless they have a
// reason (DefaultDiscVertices).
const (
	MinDiscVertices     = 8
	DefaultDiscVertices = 32
)

// VTKField is a named float attribute with one value per polygon (cell
// data) or per point (point data). NaN means no value (VTK keeps it as
// NaN, which ParaView draws in its NaN colour).
type VTKField struct {
	// Name: a letter followed by letters, digits or underscores, at most
	// 63 characters; units belong in the name ("slip_m").
	Name   string
	Values []float64
}

// VTKPolygons are planar polygons, such as fracture outlines, with one
// value per polygon of each field (written as cell data).
type VTKPolygons struct {
	// Rings holds each polygon's vertices in order, the first not
	// repeated at the end, at least 3, in local East-North-Up
	// coordinates, m (z up: z = −depth).
	Rings  [][]r3.Vec
	Fields []VTKField
}

// VTKPoints are points, such as events, each written as a vertex cell,
// with one value per point of each field (written as point data, which
// ParaView's glyph filters use for size and colour).
type VTKPoints struct {
	Points []r3.Vec // Local East-North-Up coordinates, m (z = −depth).
	Fields []VTKField
}

// WriteVTKPolygons writes p as a VTK XML PolyData file (.vtp) of polygon
// cells. Coordinates are written in the CRS of pl and its linear unit u:
// x = (East + Easting)/u, y = (North + Northing)/u (Placement.ToCRS) and
// z = Up/u (elevation relative to the depth datum, positive up), so that
// a 3-D viewer sees one unit on all three axes. The bytes depend only on
// the input.
func WriteVTKPolygons(w io.Writer, pl Placement, p VTKPolygons) error {
	npts := 0
	for i, r := range p.Rings {
		if len(r) < 3 {
			return fmt.Errorf("gis: VTK polygon %d has %d vertices: need at least 3", i, len(r))
		}
		if err := finiteVecs(fmt.Sprintf("polygon %d", i), r); err != nil {
			return err
		}
		npts += len(r)
	}
	if err := checkVTKFields(p.Fields, len(p.Rings), "polygon"); err != nil {
		return err
	}
	pts := make([]r3.Vec, 0, npts)
	conn := make([]int64, 0, npts)
	offs := make([]int64, len(p.Rings))
	for i, r := range p.Rings {
		for _, v := range r {
			conn = append(conn, int64(len(pts)))
			pts = append(pts, v)
		}
		offs[i] = int64(len(pts))
	}
	return writeVTP(w, pl, vtpPiece{points: pts, conn: conn, offsets: offs, polys: true, fields: p.Fields})
}

// WriteVTKPoints writes p as a VTK XML PolyData file (.vtp) of vertex
// cells, one per point, with the fields as point data. Coordinates are
// placed as in WriteVTKPolygons.
func WriteVTKPoints(w io.Writer, pl Placement, p VTKPoints) error {
	if err := finiteVecs("points", p.Points); err != nil {
		return err
	}
	if err := checkVTKFields(p.Fields, len(p.Points), "point"); err != nil {
		return err
	}
	conn := make([]int64, len(p.Points))
	offs := make([]int64, len(p.Points))
	for i := range conn {
		conn[i], offs[i] = int64(i), int64(i+1)
	}
	return writeVTP(w, pl, vtpPiece{points: p.Points, conn: conn, offsets: offs, fields: p.Fields})
}

// finiteVecs returns an error naming the first non-finite coordinate.
func finiteVecs(what string, vs []r3.Vec) error {
	for j, v := range vs {
		if s := v.X + v.Y + v.Z; math.IsNaN(s) || math.IsInf(s, 0) {
			return fmt.Errorf("gis: VTK %s vertex %d = (%g, %g, %g) m: coordinates must be finite", what, j, v.X, v.Y, v.Z)
		}
	}
	return nil
}

// checkVTKFields requires valid, unique names, n values per field and no
// infinite value.
func checkVTKFields(fs []VTKField, n int, per string) error {
	seen := map[string]bool{}
	for _, f := range fs {
		switch {
		case !validName(f.Name):
			return fmt.Errorf("gis: VTK field name %q: want a letter followed by letters, digits or underscores, at most %d characters", f.Name, maxNameLen)
		case seen[f.Name]:
			return fmt.Errorf("gis: VTK field name %q is repeated", f.Name)
		case len(f.Values) != n:
			return fmt.Errorf("gis: VTK field %q has %d values for %d %ss: need one per %s", f.Name, len(f.Values), n, per, per)
		}
		seen[f.Name] = true
		for i, v := range f.Values {
			if math.IsInf(v, 0) {
				return fmt.Errorf("gis: VTK field %q value %d = %g: must be finite or NaN (no value)", f.Name, i, v)
			}
		}
	}
	return nil
}

// vtpPiece is one validated PolyData piece: points, the cells'
// connectivity and end offsets, whether the cells are polygons (else
// vertices), and the fields (cell data for polygons, point data for
// vertices).
type vtpPiece struct {
	points        []r3.Vec
	conn, offsets []int64
	polys         bool
	fields        []VTKField
}

// writeVTP writes the piece as a complete .vtp document.
func writeVTP(w io.Writer, pl Placement, pc vtpPiece) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "<?xml version=\"1.0\"?>\n<!-- %s -->\n", vtkNote(pl))
	fmt.Fprintf(bw, "<VTKFile type=\"PolyData\" version=%q byte_order=%q header_type=%q>\n", vtkVersion, vtkByteOrder, vtkHeaderType)
	nverts, npolys, cells, dataTag := len(pc.offsets), 0, "Verts", "PointData"
	if pc.polys {
		nverts, npolys, cells, dataTag = 0, len(pc.offsets), "Polys", "CellData"
	}
	fmt.Fprintf(bw, "<PolyData>\n<Piece NumberOfPoints=\"%d\" NumberOfVerts=\"%d\" NumberOfLines=\"0\" NumberOfStrips=\"0\" NumberOfPolys=\"%d\">\n",
		len(pc.points), nverts, npolys)
	if len(pc.fields) > 0 {
		fmt.Fprintf(bw, "<%s Scalars=%q>\n", dataTag, pc.fields[0].Name)
		for _, f := range pc.fields {
			writeDataArray(bw, "Float64", f.Name, 1, float64Bytes(f.Values))
		}
		fmt.Fprintf(bw, "</%s>\n", dataTag)
	}
	xyz := make([]float64, 0, 3*len(pc.points))
	u := pl.CRS.Unit().Metres
	for _, p := range pc.points {
		q := pl.ToCRS([2]float64{p.X, p.Y})
		xyz = append(xyz, q[0], q[1], p.Z/u)
	}
	bw.WriteString("<Points>\n")
	writeDataArray(bw, "Float64", "Points", 3, float64Bytes(xyz))
	fmt.Fprintf(bw, "</Points>\n<%s>\n", cells)
	writeDataArray(bw, "Int64", "connectivity", 1, int64Bytes(pc.conn))
	writeDataArray(bw, "Int64", "offsets", 1, int64Bytes(pc.offsets))
	fmt.Fprintf(bw, "</%s>\n</Piece>\n</PolyData>\n</VTKFile>\n", cells)
	return bw.Flush()
}

// vtkNote is the XML comment of a .vtp file: where its coordinates are
// and the caution that the data are simulated.
func vtkNote(pl Placement) string {
	u := pl.CRS.Unit()
	return fmt.Sprintf("slipfront: coordinates in %s (%s), local origin at E %s m, N %s m; z = elevation relative to the depth datum (%s, up). Simulated data for screening and comparison only.",
		pl.CRS.Name(), u.Name, strconv.FormatFloat(pl.Easting, 'f', -1, 64), strconv.FormatFloat(pl.Northing, 'f', -1, 64), u.Name)
}

// writeDataArray writes one binary DataArray: base64 of the UInt64 byte
// count and the data, as one block.
func writeDataArray(bw *bufio.Writer, typ, name string, comps int, data []byte) {
	fmt.Fprintf(bw, "<DataArray type=%q Name=%q NumberOfComponents=\"%d\" format=\"binary\">\n", typ, name, comps)
	block := make([]byte, 8, 8+len(data))
	binary.LittleEndian.PutUint64(block, uint64(len(data)))
	block = append(block, data...)
	enc := base64.NewEncoder(base64.StdEncoding, bw)
	enc.Write(block) // bufio.Writer errors are sticky and reported by Flush.
	enc.Close()
	bw.WriteString("\n</DataArray>\n")
}

func float64Bytes(v []float64) []byte {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
	}
	return b
}

func int64Bytes(v []int64) []byte {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(b[8*i:], uint64(x))
	}
	return b
}

// PVDEntry is one dataset of a VTK collection: a file shown at a time.
type PVDEntry struct {
	Time float64 // Snapshot time, s.
	// Part tells datasets at one time apart, e.g. 0 fractures, 1 events.
	Part int
	// File is the dataset's path relative to the .pvd file.
	File string
}

// WritePVD writes a ParaView collection file (.pvd): a VTKFile of type
// Collection listing each entry as a DataSet with its timestep, part and
// file, in the given order. Times must be finite, parts ≥ 0 and files
// non-empty relative paths.
func WritePVD(w io.Writer, entries []PVDEntry) error {
	for i, e := range entries {
		switch {
		case math.IsNaN(e.Time) || math.IsInf(e.Time, 0):
			return fmt.Errorf("gis: PVD entry %d (%q): time %g s must be finite", i, e.File, e.Time)
		case e.Part < 0:
			return fmt.Errorf("gis: PVD entry %d (%q): part %d must be ≥ 0", i, e.File, e.Part)
		case e.File == "" || strings.HasPrefix(e.File, "/") || strings.ContainsAny(e.File, "\\\x00"):
			return fmt.Errorf("gis: PVD entry %d: file %q: want a non-empty relative path with '/' separators", i, e.File)
		}
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "<?xml version=\"1.0\"?>\n<VTKFile type=\"Collection\" version=%q byte_order=%q>\n<Collection>\n", pvdVersion, vtkByteOrder)
	for _, e := range entries {
		bw.WriteString("<DataSet timestep=\"")
		bw.WriteString(strconv.FormatFloat(e.Time, 'g', -1, 64))
		fmt.Fprintf(bw, "\" group=\"\" part=\"%d\" file=\"", e.Part)
		xml.EscapeText(bw, []byte(e.File))
		bw.WriteString("\"/>\n")
	}
	bw.WriteString("</Collection>\n</VTKFile>\n")
	return bw.Flush()
}

// DiscRing returns n vertices on the rim of a disc of the given radius,
// m, about centre, in the plane spanned by the unit vectors strike and
// downDip (a fracture's strike and down-dip directions). The first vertex
// lies along strike; the order turns from strike towards up-dip, so the
// polygon's right-hand normal strike × (−downDip) points up for a plane
// dipping down to the right of strike (right-hand rule). It panics for
// n < MinDiscVertices.
func DiscRing(centre, strike, downDip r3.Vec, radius float64, n int) []r3.Vec {
	if n < MinDiscVertices {
		panic(fmt.Sprintf("gis: DiscRing with %d vertices, need at least %d", n, MinDiscVertices))
	}
	out := make([]r3.Vec, n)
	for k := range out {
		s, c := math.Sincos(2 * math.Pi * float64(k) / float64(n))
		out[k] = r3.Add(centre, r3.Add(r3.Scale(radius*c, strike), r3.Scale(-radius*s, downDip)))
	}
	return out
}

// RectangleRing returns the 4 corners of a rectangle of the given length
// along strike and height down dip, m, centred on centre, in the order
// and sense of DiscRing (strike end first, then up-dip).
func RectangleRing(centre, strike, downDip r3.Vec, length, height float64) []r3.Vec {
	a, b := r3.Scale(length/2, strike), r3.Scale(-height/2, downDip) // b points up dip.
	return []r3.Vec{
		r3.Add(centre, r3.Sub(a, b)),
		r3.Add(centre, r3.Add(a, b)),
		r3.Sub(centre, r3.Sub(a, b)),
		r3.Sub(centre, r3.Add(a, b)),
	}
}
