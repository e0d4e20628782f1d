package gis

import (
	"context"
	"database/sql"
	"fmt"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"slipfront/internal/numtest"
)

// coordTol, m: CRS coordinates are sums of local coordinates and origin
// offsets of ~1e7 m, exact to double rounding (~2e-9 m).
const coordTol = 1e-6

func writeSample(t *testing.T, pl Placement) (string, []Layer) {
	t.Helper()
	path := tempPath(t, "maps.gpkg")
	layers := sampleLayers()
	if err := WriteGeoPackage(context.Background(), path, pl, layers, &GeoPackageOptions{LastChange: testTime}); err != nil {
		t.Fatal(err)
	}
	return path, layers
}

func openGPKG(t *testing.T, path string) *sql.DB {
	t.Helper()
	db, err := sql.Open("sqlite", path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

func queryInt(t *testing.T, db *sql.DB, q string, args ...any) int64 {
	t.Helper()
	var v int64
	if err := db.QueryRow(q, args...).Scan(&v); err != nil {
		t.Fatalf("%s: %v", q, err)
	}
	return v
}

func TestGeoPackageFileHeader(t *testing.T) {
	path, _ := writeSample(t, samplePlacement)
	db := openGPKG(t, path)
	// OGC 12-128r18 Req 2 (application_id "GPKG") and Req 3 (user_version
	// 10300 for version 1.3.0).
	if got := queryInt(t, db, "PRAGMA application_id"); got != 0x47504B47 {
		t.Errorf("application_id = %#x, want 0x47504B47", got)
	}
	if got := queryInt(t, db, "PRAGMA user_version"); got != 10300 {
		t.Errorf("user_version = %d, want 10300", got)
	}
	// Req 11: rows -1, 0, 4326; plus the layer CRS.
	for _, id := range []int{-1, 0, 4326, 32614} {
		if n := queryInt(t, db, "SELECT count(*) FROM gpkg_spatial_ref_sys WHERE srs_id = ?", id); n != 1 {
			t.Errorf("gpkg_spatial_ref_sys has %d rows with srs_id %d, want 1", n, id)
		}
	}
	var def string
	if err := db.QueryRow("SELECT definition FROM gpkg_spatial_ref_sys WHERE srs_id = 32614").Scan(&def); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(def, `PROJCS["WGS 84 / UTM zone 14N"`) || !strings.HasSuffix(def, `AUTHORITY["EPSG","32614"]]`) {
		t.Errorf("definition of 32614 = %s", def)
	}
}

func TestGeoPackageContentsAndColumns(t *testing.T) {
	path, layers := writeSample(t, samplePlacement)
	db := openGPKG(t, path)
	for _, l := range layers {
		var typ string
		var srs int
		err := db.QueryRow("SELECT geometry_type_name, srs_id FROM gpkg_geometry_columns WHERE table_name = ? AND column_name = 'geom'", l.Name).Scan(&typ, &srs)
		if err != nil {
			t.Fatalf("%s: %v", l.Name, err)
		}
		if typ != l.Geometry.String() || typ != strings.ToUpper(typ) || srs != 32614 {
			t.Errorf("%s: geometry column (%s, %d), want (%s, 32614) in upper case", l.Name, typ, srs, l.Geometry)
		}
		if n := queryInt(t, db, fmt.Sprintf(`SELECT count(*) FROM "%s"`, l.Name)); n != int64(len(l.Features)) {
			t.Errorf("%s: %d rows, want %d", l.Name, n, len(l.Features))
		}
		var minX, minY, maxX, maxY sql.NullFloat64
		var lastChange string
		err = db.QueryRow("SELECT min_x, min_y, max_x, max_y, CAST(last_change AS TEXT) FROM gpkg_contents WHERE table_name = ? AND data_type = 'features'", l.Name).Scan(&minX, &minY, &maxX, &maxY, &lastChange)
		if err != nil {
			t.Fatalf("%s: %v", l.Name, err)
		}
		if lastChange != "2030-01-02T03:04:05.600Z" {
			t.Errorf("%s: last_change %q", l.Name, lastChange)
		}
		want, ok := layerBound(l)
		if !ok {
			if minX.Valid || maxY.Valid {
				t.Errorf("%s: extent of a layer without geometry should be NULL", l.Name)
			}
			continue
		}
		want = orb.Bound{Min: samplePlacement.ToCRS(want.Min), Max: samplePlacement.ToCRS(want.Max)}
		numtest.Abs(t, l.Name+" min_x", minX.Float64, want.Min[0], coordTol)
		numtest.Abs(t, l.Name+" min_y", minY.Float64, want.Min[1], coordTol)
		numtest.Abs(t, l.Name+" max_x", maxX.Float64, want.Max[0], coordTol)
		numtest.Abs(t, l.Name+" max_y", maxY.Float64, want.Max[1], coordTol)
	}
}

// layerBound returns the local bounds of all features of l.
func layerBound(l Layer) (orb.Bound, bool) {
	var b orb.Bound
	any := false
	for _, ft := range l.Features {
		if gb, ok := bounds(ft.Geometry); ok {
			if !any {
				b = gb
			} else {
				b = b.Union(gb)
			}
			any = true
		}
	}
	return b, any
}

// TestGeoPackageGeometryHeader decodes every blob: the envelope must be in
// the order minx, maxx, miny, maxy (OGC 12-128r18 §2.1.3.1.1; GDAL does not
// notice a wrong order: it re-reads the geometry), match its bounds, and
// the srs_id must equal the column's (Req 33).
func TestGeoPackageGeometryHeader(t *testing.T) {
	path, layers := writeSample(t, samplePlacement)
	db := openGPKG(t, path)
	for _, l := range layers {
		rows, err := db.Query(fmt.Sprintf(`SELECT fid, geom FROM "%s" ORDER BY fid`, l.Name))
		if err != nil {
			t.Fatal(err)
		}
		i := 0
		for rows.Next() {
			var fid int
			var blob []byte
			if err := rows.Scan(&fid, &blob); err != nil {
				t.Fatal(err)
			}
			checkBlob(t, fmt.Sprintf("%s fid %d", l.Name, fid), blob, l.Features[i].Geometry)
			i++
		}
		rows.Close()
		if i != len(l.Features) {
			t.Errorf("%s: read %d features, want %d", l.Name, i, len(l.Features))
		}
	}
}

func checkBlob(t *testing.T, what string, blob []byte, local orb.Geometry) {
	t.Helper()
	if local == nil || isEmpty(local) {
		if blob != nil {
			t.Errorf("%s: geometry is nil or empty but the blob is %d bytes", what, len(blob))
		}
		return
	}
	h, g, err := decodeGPKGGeometry(blob)
	if err != nil {
		t.Fatalf("%s: %v", what, err)
	}
	if h.srsID != 32614 {
		t.Errorf("%s: srs_id %d, want 32614", what, h.srsID)
	}
	want := mapGeometry(local, samplePlacement.ToCRS)
	if !orb.Equal(g, want) {
		t.Errorf("%s: geometry %v, want %v", what, g, want)
	}
	wb, _ := bounds(want)
	switch {
	case local.GeoJSONType() == "Point":
		if h.envelope != nil {
			t.Errorf("%s: point with an envelope", what)
		}
	default:
		if len(h.envelope) != 4 {
			t.Fatalf("%s: no envelope, flags %#x", what, h.flags)
		}
		numtest.Abs(t, what+" envelope minx", h.envelope[0], wb.Min[0], 0)
		numtest.Abs(t, what+" envelope maxx", h.envelope[1], wb.Max[0], 0)
		numtest.Abs(t, what+" envelope miny", h.envelope[2], wb.Min[1], 0)
		numtest.Abs(t, what+" envelope maxy", h.envelope[3], wb.Max[1], 0)
	}
}

func TestGeoPackageWindingAndValues(t *testing.T) {
	path, _ := writeSample(t, samplePlacement)
	db := openGPKG(t, path)
	var blob []byte
	if err := db.QueryRow(`SELECT geom FROM areas`).Scan(&blob); err != nil {
		t.Fatal(err)
	}
	_, g, err := decodeGPKGGeometry(blob)
	if err != nil {
		t.Fatal(err)
	}
	p := g.(orb.Polygon)
	if signedArea(p[0]) <= 0 || signedArea(p[1]) >= 0 {
		t.Errorf("winding: exterior area %g (want > 0), hole %g (want < 0)", signedArea(p[0]), signedArea(p[1]))
	}
	var stage int
	var mag sql.NullFloat64
	var tm sql.NullString
	var label string
	var kept bool
	var count int64
	if err := db.QueryRow(`SELECT stage, magnitude, CAST(time AS TEXT), label, kept, count FROM events WHERE fid = 1`).Scan(&stage, &mag, &tm, &label, &kept, &count); err != nil {
		t.Fatal(err)
	}
	if stage != 1 || !mag.Valid || label != "a" || !kept || count != 1<<40 || tm.String != "2030-01-02T03:04:05.600Z" {
		t.Errorf("row 1 = %d %v %v %q %v %d", stage, mag, tm, label, kept, count)
	}
	numtest.Abs(t, "magnitude", mag.Float64, -1.5, 0)
	if err := db.QueryRow(`SELECT magnitude, CAST(time AS TEXT) FROM events WHERE fid = 2`).Scan(&mag, &tm); err != nil {
		t.Fatal(err)
	}
	if mag.Valid || tm.Valid {
		t.Errorf("NaN real and nil time should be NULL, got %v %v", mag, tm)
	}
}

func TestGeoPackageUndefinedCRS(t *testing.T) {
	path, _ := writeSample(t, Placement{})
	db := openGPKG(t, path)
	if n := queryInt(t, db, "SELECT count(*) FROM gpkg_geometry_columns WHERE srs_id = -1"); n != 5 {
		t.Errorf("%d layers with srs_id -1, want 5", n)
	}
	if n := queryInt(t, db, "SELECT count(*) FROM gpkg_spatial_ref_sys"); n != 3 {
		t.Errorf("%d srs rows, want 3", n)
	}
}

func TestGeoPackageBadInput(t *testing.T) {
	good := func() []Layer { return sampleLayers()[:1] }
	cases := []struct {
		name   string
		edit   func([]Layer) []Layer
		substr string
	}{
		{"layer name with space", func(l []Layer) []Layer { l[0].Name = "my layer"; return l }, "layer name"},
		{"layer name with digit first", func(l []Layer) []Layer { l[0].Name = "1a"; return l }, "layer name"},
		{"reserved prefix", func(l []Layer) []Layer { l[0].Name = "gpkg_x"; return l }, "reserved"},
		{"duplicate layer", func(l []Layer) []Layer { return append(l, l[0]) }, "repeated"},
		{"field name", func(l []Layer) []Layer { l[0].Fields[0].Name = "a-b"; return l }, "field name"},
		{"reserved field", func(l []Layer) []Layer { l[0].Fields[0].Name = "FID"; return l }, "reserved"},
		{"duplicate field", func(l []Layer) []Layer { l[0].Fields[1].Name = "Stage"; return l }, "repeated"},
		{"value count", func(l []Layer) []Layer { l[0].Features[0].Values = l[0].Features[0].Values[:2]; return l }, "values for"},
		{"value type", func(l []Layer) []Layer { l[0].Features[0].Values[3] = 5; return l }, "does not fit"},
		{"int32 range", func(l []Layer) []Layer { l[0].Features[0].Values[0] = int64(1) << 40; return l }, "int32 range"},
		{"infinite real", func(l []Layer) []Layer { l[0].Features[0].Values[1] = math.Inf(1); return l }, "not finite"},
		{"geometry type", func(l []Layer) []Layer { l[0].Features[0].Geometry = orb.LineString{{0, 0}, {1, 1}}; return l }, "geometry is"},
		{"NaN coordinate", func(l []Layer) []Layer { l[0].Features[0].Geometry = orb.Point{math.NaN(), 0}; return l }, "not finite"},
		{"open ring", func([]Layer) []Layer {
			return []Layer{{Name: "a", Geometry: Polygon, Features: []Feature{{Geometry: orb.Polygon{{{0, 0}, {1, 0}, {1, 1}, {0, 1}}}}}}}
		}, "not closed"},
		{"short line", func([]Layer) []Layer {
			return []Layer{{Name: "a", Geometry: LineString, Features: []Feature{{Geometry: orb.LineString{{0, 0}}}}}}
		}, "at least 2"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := tempPath(t, "x.gpkg")
			err := WriteGeoPackage(context.Background(), path, samplePlacement, c.edit(good()), nil)
			if err == nil || !strings.Contains(err.Error(), c.substr) {
				t.Fatalf("error %v, want one containing %q", err, c.substr)
			}
			if _, err := os.Stat(path); !os.IsNotExist(err) {
				t.Errorf("file left behind after a validation error")
			}
		})
	}
	t.Run("existing file", func(t *testing.T) {
		path := tempPath(t, "x.gpkg")
		if err := os.WriteFile(path, []byte("keep"), 0o644); err != nil {
			t.Fatal(err)
		}
		err := WriteGeoPackage(context.Background(), path, samplePlacement, good(), nil)
		if err == nil || !strings.Contains(err.Error(), "exists") {
			t.Fatalf("error %v, want 'exists'", err)
		}
		if b, _ := os.ReadFile(path); string(b) != "keep" {
			t.Errorf("existing file was changed")
		}
	})
}

// mustWKT parses a WKT test file.
func mustWKT(t *testing.T, name string) CRS {
	t.Helper()
	c, err := ParseWKT(readWKT(t, name))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestGeoPackageOGRInfo checks with GDAL that every layer opens with the
// right CRS (EPSG code, or the WKT's name and unit), geometry type and
// feature count and that GDAL prints nothing on stderr.
func TestGeoPackageOGRInfo(t *testing.T) {
	ogrinfo := needTool(t, "ogrinfo")
	const ftUS = 1200.0 / 3937
	cases := []struct {
		name string
		pl   Placement
		want []string // in ogrinfo's CRS description
	}{
		{"UTM 14N", samplePlacement, []string{`ID["EPSG",32614]]` + "\n"}},
		{"NAD83 UTM", Placement{CRS: CRS{EPSG: 26914}}, []string{`ID["EPSG",26914]]` + "\n"}},
		{"UTM 60S", Placement{CRS: CRS{EPSG: 32760}}, []string{`ID["EPSG",32760]]` + "\n"}},
		{"State Plane ftUS", Placement{CRS: CRS{EPSG: 2277}, Easting: 2.3e6 * ftUS, Northing: 1e7 * ftUS},
			[]string{`ID["EPSG",2277]]` + "\n", `LENGTHUNIT["US survey foot",0.304800609601219`}},
		{"WKT2 with ID", Placement{CRS: mustWKT(t, "2277.wkt2.prj")}, []string{`ID["EPSG",2277]]` + "\n"}},
		{"WKT1 without ID", Placement{CRS: mustWKT(t, "tm-ftus-nad83.wkt1.prj")},
			[]string{`PROJCRS["unknown"`, `METHOD["Transverse Mercator"`, `LENGTHUNIT["US survey foot",0.304800609601219`}},
		{"WKT2 oblique Mercator", Placement{CRS: mustWKT(t, "2056.wkt2.prj"), Easting: 2.6e6, Northing: 1.2e6}, []string{`ID["EPSG",2056]]` + "\n"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path, layers := writeSample(t, c.pl)
			for _, l := range layers {
				out := runTool(t, nil, ogrinfo, "-so", path, l.Name)
				wantGeom := map[GeometryType]string{Point: "Point", LineString: "Line String", Polygon: "Polygon", MultiPolygon: "Multi Polygon"}[l.Geometry]
				for _, want := range append([]string{
					"Geometry: " + wantGeom + "\n",
					"Feature Count: " + strconv.Itoa(len(l.Features)) + "\n",
				}, c.want...) {
					if !strings.Contains(out, want) {
						t.Errorf("layer %s: ogrinfo output lacks %q:\n%s", l.Name, want, out)
					}
				}
			}
		})
	}
}

// TestGeoPackageSRSRows: the srs row of each kind of CRS, and the
// feature coordinates in the CRS unit.
func TestGeoPackageSRSRows(t *testing.T) {
	const ftUS = 1200.0 / 3937
	noID := mustWKT(t, "tm-ftus-nad83.wkt1.prj")
	withID := mustWKT(t, "2277.wkt2.prj")
	cases := []struct {
		name string
		pl   Placement
		id   int
		org  string
		def  string
		minX float64 // CRS unit
	}{
		{"code", Placement{CRS: CRS{EPSG: 2277}, Easting: 2.3e6 * ftUS}, 2277, "EPSG", mustLookup(t, 2277).wkt1(), 2.3e6 - 200/ftUS},
		{"WKT with ID", Placement{CRS: withID}, 2277, "EPSG", withID.String(), -200 / ftUS},
		{"WKT without ID", Placement{CRS: noID}, srsIDUserDefined, "NONE", noID.String(), -200 / ftUS},
	}
	for _, c := range cases {
		path := tempPath(t, "m.gpkg")
		l := Layer{Name: "p", Geometry: Point, Features: []Feature{{Geometry: orb.Point{-200, 5}}}}
		if err := WriteGeoPackage(context.Background(), path, c.pl, []Layer{l}, nil); err != nil {
			t.Fatal(err)
		}
		db := openGPKG(t, path)
		var id, orgID int
		var org, def string
		var minX float64
		err := db.QueryRow(`SELECT s.srs_id, s.organization, s.organization_coordsys_id, s.definition, c.min_x
		  FROM gpkg_contents c JOIN gpkg_spatial_ref_sys s ON s.srs_id = c.srs_id WHERE c.table_name = 'p'`).Scan(&id, &org, &orgID, &def, &minX)
		if err != nil {
			t.Fatal(err)
		}
		if id != c.id || orgID != c.id || org != c.org || def != c.def {
			t.Errorf("%s: srs %d %s %d %q", c.name, id, org, orgID, def)
		}
		numtest.Abs(t, c.name+" min_x", minX, c.minX, 1e-9)
	}
}

func mustLookup(t *testing.T, code int) *epsgCRS {
	t.Helper()
	e, ok := lookupEPSG(code)
	if !ok {
		t.Fatalf("EPSG:%d not in the table", code)
	}
	return e
}

// TestGeoPackageOGRInfoUndefined: GDAL 3.6 reads a layer in the undefined
// Cartesian SRS (srs_id -1) as ENGCRS["Undefined Cartesian SRS", …] with
// east/north metre axes.
func TestGeoPackageOGRInfoUndefined(t *testing.T) {
	ogrinfo := needTool(t, "ogrinfo")
	path, _ := writeSample(t, Placement{})
	out := runTool(t, nil, ogrinfo, "-so", path, "traces")
	if !strings.Contains(out, `ENGCRS["Undefined Cartesian SRS"`) || !strings.Contains(out, "Feature Count: 3") {
		t.Errorf("ogrinfo output:\n%s", out)
	}
}

// TestGeoPackageValidator runs GDAL's GeoPackage conformance checker
// (validate_gpkg of python3-gdal); it prints nothing and exits 0 on a
// valid file.
func TestGeoPackageValidator(t *testing.T) {
	needGDALPython(t)
	for _, pl := range []Placement{samplePlacement, {}, {CRS: CRS{EPSG: 2277}}, {CRS: mustWKT(t, "tm-ftus-nad83.wkt1.prj")}} {
		path, _ := writeSample(t, pl)
		out := runTool(t, nil, debianPython, "-m", "osgeo_utils.samples.validate_gpkg", "--extra", "--warning-as-error", path)
		if strings.TrimSpace(out) != "" {
			t.Errorf("%v: validate_gpkg printed:\n%s", pl.CRS, out)
		}
	}
}

// wkt1Sample is a sample of table codes whose WKT1 is compared with GDAL's:
// UTM on each datum, State Plane zones of both methods in metres, feet and
// US survey feet on NAD83 and its realizations and on NAD27, LCC 1SP, and
// the first and last codes of the table.
var wkt1Sample = []int{32601, 32614, 32660, 32701, 32733, 32760, 26901, 26914, 26923, 26714, 2222, 2277, 2278, 32039,
	32139, 26980, 2205, 6588, 2839, 3465, 3761, 3373, 7565, 7624, 6922, 32161}

// TestWKTMatchesGDAL compares the WKT1 definitions with gdalsrsinfo's.
func TestWKTMatchesGDAL(t *testing.T) {
	gdalsrsinfo := needTool(t, "gdalsrsinfo")
	codes := append([]int{epsgTable[0].code, epsgTable[len(epsgTable)-1].code}, wkt1Sample...)
	for _, code := range codes {
		want := strings.TrimSpace(runTool(t, nil, gdalsrsinfo, "-o", "wkt1", "--single-line", "EPSG:"+strconv.Itoa(code)))
		e, ok := lookupEPSG(code)
		if !ok {
			t.Fatalf("EPSG:%d is not in the table", code)
		}
		if got := e.wkt1(); got != want {
			t.Errorf("EPSG:%d\n got %s\nwant %s", code, got, want)
		}
	}
	want := strings.TrimSpace(runTool(t, nil, gdalsrsinfo, "-o", "wkt1", "--single-line", "EPSG:4326"))
	if wktWGS84Geographic != want {
		t.Errorf("EPSG:4326\n got %s\nwant %s", wktWGS84Geographic, want)
	}
}

func TestCRSNameMatchesWKT(t *testing.T) {
	re := regexp.MustCompile(`^PROJCS\["([^"]+)"`)
	for _, code := range wkt1Sample {
		c := CRS{EPSG: code}
		e, _ := lookupEPSG(code)
		m := re.FindStringSubmatch(e.wkt1())
		if m == nil || m[1] != c.Name() {
			t.Errorf("EPSG:%d: Name %q, WKT %q", code, c.Name(), e.wkt1())
		}
	}
}

func BenchmarkWriteGeoPackage1e4(b *testing.B) { benchmarkWriteGeoPackage(b, 1e4) }

// benchmarkWriteGeoPackage writes n line features with two fields.
func benchmarkWriteGeoPackage(b *testing.B, n int) {
	l := Layer{Name: "traces", Geometry: LineString, Fields: []Field{{"set", Int32}, {"slip_m", Real}}}
	for i := range n {
		x := float64(i % 100)
		y := float64(i / 100)
		l.Features = append(l.Features, Feature{Geometry: orb.LineString{{x, y}, {x + 3, y + 2}}, Values: []any{i % 3, 1e-3 * x}})
	}
	dir := b.TempDir()
	i := 0
	for b.Loop() {
		path := fmt.Sprintf("%s/%d.gpkg", dir, i)
		i++
		if err := WriteGeoPackage(context.Background(), path, samplePlacement, []Layer{l}, nil); err != nil {
			b.Fatal(err)
		}
	}
}
