package gis

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"slipfront/internal/numtest"
)

func writeGeoJSONString(t *testing.T, pl Placement, l Layer, opt *GeoJSONOptions) string {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteGeoJSON(&buf, pl, l, opt); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// decimalsRE finds numbers in coordinates and bboxes.
var decimalsRE = regexp.MustCompile(`-?\d+\.(\d+)`)

func TestGeoJSONStructure(t *testing.T) {
	for _, l := range sampleLayers() {
		text := writeGeoJSONString(t, samplePlacement, l, &GeoJSONOptions{BBox: true})
		var raw map[string]any
		if err := json.Unmarshal([]byte(text), &raw); err != nil {
			t.Fatalf("%s: %v\n%s", l.Name, err, text)
		}
		// RFC 7946 §4: no "crs" member; §3.3: type FeatureCollection.
		if _, ok := raw["crs"]; ok {
			t.Errorf("%s: has a crs member", l.Name)
		}
		if raw["type"] != "FeatureCollection" || raw["name"] != l.Name {
			t.Errorf("%s: type %v, name %v", l.Name, raw["type"], raw["name"])
		}
		fc, err := decodeFeatureCollection([]byte(text))
		if err != nil {
			t.Fatalf("%s: %v", l.Name, err)
		}
		if len(fc.Features) != len(l.Features) {
			t.Fatalf("%s: %d features, want %d", l.Name, len(fc.Features), len(l.Features))
		}
		for i, f := range fc.Features {
			checkGeoJSONFeature(t, fmt.Sprintf("%s[%d]", l.Name, i), f, l.Features[i].Geometry)
		}
		// Precision: at most 7 decimals (the default) anywhere in
		// coordinates or bboxes; properties here have no long decimals.
		for _, m := range decimalsRE.FindAllStringSubmatch(text, -1) {
			if len(m[1]) > DefaultGeoJSONPrecision {
				t.Errorf("%s: number %s has more than %d decimals", l.Name, m[0], DefaultGeoJSONPrecision)
			}
		}
	}
}

// checkGeoJSONFeature compares a decoded feature with the local geometry:
// positions within [−180, 180] × [−90, 90], within rounding of
// Geographic.LonLat, polygon exteriors CCW and holes CW (RFC 7946 §3.1.6).
func checkGeoJSONFeature(t *testing.T, what string, f *gjFeature, local orb.Geometry) {
	t.Helper()
	if local == nil || isEmpty(local) {
		if f.Geometry != nil {
			t.Errorf("%s: geometry %v, want null", what, f.Geometry)
		}
		return
	}
	geo, err := samplePlacement.Geographic()
	if err != nil {
		t.Fatal(err)
	}
	want := mapGeometry(local, geo.LonLat)
	// roundTol, degrees: half a unit in the 7th decimal.
	const roundTol = 0.5e-7 + 1e-12
	gotPts, wantPts := points(f.Geometry), points(want)
	if len(gotPts) != len(wantPts) {
		t.Fatalf("%s: %d positions, want %d", what, len(gotPts), len(wantPts))
	}
	for i := range gotPts {
		if math.Abs(gotPts[i][0]) > 180 || math.Abs(gotPts[i][1]) > 90 {
			t.Errorf("%s: position %v out of range", what, gotPts[i])
		}
		numtest.Abs(t, what+" lon", gotPts[i][0], wantPts[i][0], roundTol)
		numtest.Abs(t, what+" lat", gotPts[i][1], wantPts[i][1], roundTol)
	}
	var polys []orb.Polygon
	switch g := f.Geometry.(type) {
	case orb.Polygon:
		polys = []orb.Polygon{g}
	case orb.MultiPolygon:
		polys = g
	}
	for _, p := range polys {
		for k, r := range p {
			a := signedArea(r)
			if (k == 0 && a <= 0) || (k > 0 && a >= 0) {
				t.Errorf("%s: ring %d has signed area %g: exterior must be CCW, holes CW", what, k, a)
			}
		}
	}
}

// gjCollection and gjFeature decode the GeoJSON this package writes (a
// test-only reader; orb/geojson would pull a BSON module into go.sum).
type gjCollection struct {
	Type     string
	Name     string
	BBox     []float64
	Features []*gjFeature
}

type gjFeature struct {
	Type       string
	Properties map[string]any
	BBox       []float64
	Geometry   orb.Geometry `json:"-"`
	RawGeom    *struct {
		Type        string
		Coordinates json.RawMessage
	} `json:"geometry"`
}

func decodeFeatureCollection(b []byte) (*gjCollection, error) {
	var fc gjCollection
	if err := json.Unmarshal(b, &fc); err != nil {
		return nil, err
	}
	if fc.Type != "FeatureCollection" {
		return nil, fmt.Errorf("type %q", fc.Type)
	}
	for i, f := range fc.Features {
		if f.Type != "Feature" {
			return nil, fmt.Errorf("feature %d: type %q", i, f.Type)
		}
		if f.RawGeom == nil {
			continue
		}
		var err error
		switch c := f.RawGeom.Coordinates; f.RawGeom.Type {
		case "Point":
			var p orb.Point
			err = json.Unmarshal(c, &p)
			f.Geometry = p
		case "LineString":
			var l []orb.Point
			err = json.Unmarshal(c, &l)
			f.Geometry = orb.LineString(l)
		case "Polygon":
			var rs [][]orb.Point
			err = json.Unmarshal(c, &rs)
			f.Geometry = toPolygon(rs)
		case "MultiPolygon":
			var ps [][][]orb.Point
			err = json.Unmarshal(c, &ps)
			mp := orb.MultiPolygon{}
			for _, rs := range ps {
				mp = append(mp, toPolygon(rs))
			}
			f.Geometry = mp
		default:
			err = fmt.Errorf("geometry type %q", f.RawGeom.Type)
		}
		if err != nil {
			return nil, fmt.Errorf("feature %d: %w", i, err)
		}
	}
	return &fc, nil
}

func toPolygon(rs [][]orb.Point) orb.Polygon {
	p := orb.Polygon{}
	for _, r := range rs {
		p = append(p, orb.Ring(r))
	}
	return p
}

// points lists the positions of a geometry in order.
func points(g orb.Geometry) []orb.Point {
	switch g := g.(type) {
	case orb.Point:
		return []orb.Point{g}
	case orb.LineString:
		return g
	case orb.Polygon:
		var ps []orb.Point
		for _, r := range g {
			ps = append(ps, r...)
		}
		return ps
	case orb.MultiPolygon:
		var ps []orb.Point
		for _, p := range g {
			ps = append(ps, points(p)...)
		}
		return ps
	}
	return nil
}

func TestGeoJSONProperties(t *testing.T) {
	text := writeGeoJSONString(t, samplePlacement, sampleLayers()[0], nil)
	fc, err := decodeFeatureCollection([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	p0, p1 := fc.Features[0].Properties, fc.Features[1].Properties
	if p0["time"] != "2030-01-02T03:04:05.6Z" || p0["label"] != "a" || p0["kept"] != true || p0["count"] != float64(int64(1)<<40) {
		t.Errorf("feature 0 properties %v", p0)
	}
	numtest.Abs(t, "magnitude", p0["magnitude"].(float64), -1.5, 0)
	if p1["magnitude"] != nil || p1["time"] != nil || p1["label"] != `b "quoted"` {
		t.Errorf("feature 1 properties %v (NaN and nil must be null)", p1)
	}
	if strings.Contains(text, `"bbox"`) {
		t.Errorf("bbox written without BBox option")
	}
}

func TestGeoJSONErrors(t *testing.T) {
	l := sampleLayers()[0]
	var buf bytes.Buffer
	err := WriteGeoJSON(&buf, Placement{CRS: CRS{EPSG: 2056}}, l, nil)
	if !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "EPSG:2056") || !strings.Contains(err.Error(), "32601") {
		t.Errorf("unsupported CRS: error %v", err)
	}
	err = WriteGeoJSON(&buf, Placement{CRS: CRS{EPSG: 26714}}, l, nil)
	if !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "NAD27 differs") {
		t.Errorf("NAD27: error %v", err)
	}
	if err := WriteGeoJSON(&buf, Placement{}, l, nil); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "undefined") {
		t.Errorf("undefined CRS: error %v", err)
	}
	if err := WriteGeoJSON(&buf, samplePlacement, l, &GeoJSONOptions{Precision: 13}); err == nil || !strings.Contains(err.Error(), "precision") {
		t.Errorf("precision 13: error %v", err)
	}
	bad := l
	bad.Name = "no spaces"
	if err := WriteGeoJSON(&buf, samplePlacement, bad, nil); err == nil {
		t.Errorf("bad layer name accepted")
	}
}

func TestGeoJSONPrecisionOption(t *testing.T) {
	l := Layer{Name: "p", Geometry: Point, Features: []Feature{{Geometry: orb.Point{1.234, 5.678}}}}
	for _, prec := range []int{1, 3, 9} {
		text := writeGeoJSONString(t, samplePlacement, l, &GeoJSONOptions{Precision: prec})
		maxDec := 0
		for _, m := range decimalsRE.FindAllStringSubmatch(text, -1) {
			maxDec = max(maxDec, len(m[1]))
		}
		if maxDec != prec {
			t.Errorf("precision %d: longest decimals %d in %s", prec, maxDec, text)
		}
	}
}

// TestGeoJSONOGRInfo: GDAL opens every layer as EPSG:4326 with the right
// geometry type and count and prints nothing on stderr.
func TestGeoJSONOGRInfo(t *testing.T) {
	ogrinfo := needTool(t, "ogrinfo")
	for _, l := range sampleLayers() {
		path := tempPath(t, l.Name+".geojson")
		if err := os.WriteFile(path, []byte(writeGeoJSONString(t, samplePlacement, l, &GeoJSONOptions{BBox: true})), 0o644); err != nil {
			t.Fatal(err)
		}
		out := runTool(t, nil, ogrinfo, "-so", "-al", path)
		for _, want := range []string{
			"Feature Count: " + strconv.Itoa(len(l.Features)) + "\n",
			`ID["EPSG",4326]]` + "\n",
			"Data axis to CRS axis mapping: 2,1\n",
		} {
			if !strings.Contains(out, want) {
				t.Errorf("%s: ogrinfo output lacks %q:\n%s", l.Name, want, out)
			}
		}
	}
}

// TestGeoJSONVersusCS2CS writes 100 random points with 9 decimals
// (1e-9° ≈ 0.1 mm) and compares them with PROJ's cs2cs to 1 mm, in the
// geographic CRS of each datum: WGS 84, or NAD83 and NAD83(2011), whose
// coordinates this package writes as WGS 84 (see Geographic and
// TestNAD83AsWGS84Magnitude).
func TestGeoJSONVersusCS2CS(t *testing.T) {
	cs2cs := needTool(t, "cs2cs")
	rng := rand.New(rand.NewPCG(1, 2))
	const ftUS = 1200.0 / 3937
	cases := []struct {
		pl       Placement
		geog     string
		latFirst bool // EPSG geographic CRSs print latitude first
	}{
		{samplePlacement, "OGC:CRS84", false},
		{Placement{CRS: CRS{EPSG: 32733}, Easting: 300000, Northing: 7000000}, "OGC:CRS84", false},
		{Placement{CRS: CRS{EPSG: 2277}, Easting: 2.3e6 * ftUS, Northing: 1e7 * ftUS}, "EPSG:4269", true},
		{Placement{CRS: CRS{EPSG: 6588}, Easting: 2e6 * ftUS, Northing: 13.2e6 * ftUS}, "EPSG:6318", true},
		{Placement{CRS: mustWKT(t, "tm-ftus-nad83.wkt1.prj"), Easting: 2e5, Northing: 1e5}, "EPSG:4269", true},
	}
	for _, c := range cases {
		pl := c.pl
		l := Layer{Name: "pts", Geometry: Point}
		var in strings.Builder
		for range 100 {
			p := orb.Point{2e4 * (rng.Float64() - 0.5), 2e4 * (rng.Float64() - 0.5)}
			l.Features = append(l.Features, Feature{Geometry: p})
			q := pl.ToCRS(p)
			fmt.Fprintf(&in, "%.6f %.6f\n", q[0], q[1])
		}
		text := writeGeoJSONString(t, pl, l, &GeoJSONOptions{Precision: 9})
		fc, err := decodeFeatureCollection([]byte(text))
		if err != nil {
			t.Fatal(err)
		}
		cmd := execWithStdin(t, in.String(), cs2cs, "-f", "%.10f", pl.CRS.String(), c.geog)
		lines := strings.Split(strings.TrimSpace(cmd), "\n")
		if len(lines) != 100 {
			t.Fatalf("cs2cs printed %d lines", len(lines))
		}
		for i, line := range lines {
			fs := strings.Fields(line)
			if len(fs) < 2 {
				t.Fatalf("cs2cs line %d: %q", i, line)
			}
			lon, err := strconv.ParseFloat(fs[0], 64)
			if err != nil {
				t.Fatal(err)
			}
			lat, err := strconv.ParseFloat(fs[1], 64)
			if err != nil {
				t.Fatal(err)
			}
			if c.latFirst {
				lon, lat = lat, lon
			}
			got := fc.Features[i].Geometry.(orb.Point)
			// Metres per degree: ~111.32 km of latitude, times cos φ for
			// longitude (spherical approximation, adequate for a 1 mm check).
			const mPerDeg = 111320.0
			dy := (got[1] - lat) * mPerDeg
			dx := lonDiff(got[0], lon) * mPerDeg * math.Cos(lat*math.Pi/180)
			numtest.Abs(t, fmt.Sprintf("%s point %d east offset (m)", pl.CRS.Name(), i), dx, 0, lengthTol)
			numtest.Abs(t, fmt.Sprintf("%s point %d north offset (m)", pl.CRS.Name(), i), dy, 0, lengthTol)
		}
	}
}

// TestNAD83AsWGS84Magnitude checks the documented size of taking NAD83
// coordinates as WGS 84: PROJ 9.1.1's cs2cs transformation to WGS 84
// (OGC:CRS84) moves points of the Texas zones by under nad83Tol.
func TestNAD83AsWGS84Magnitude(t *testing.T) {
	needTool(t, "cs2cs")
	// nad83Tol, m: the 1–2 m the package documentation states (NOAA NGS;
	// from memory). PROJ gives about 1 m here.
	const nad83Tol = 2
	const ftUS = 1200.0 / 3937
	for _, pl := range []Placement{{CRS: CRS{EPSG: 2277}, Easting: 2.3e6 * ftUS, Northing: 1e7 * ftUS},
		{CRS: CRS{EPSG: 6588}, Easting: 2e6 * ftUS, Northing: 13.2e6 * ftUS}} {
		geo, err := pl.Geographic()
		if err != nil {
			t.Fatal(err)
		}
		q := pl.ToCRS(orb.Point{0, 0})
		out := execWithStdin(t, fmt.Sprintf("%.6f %.6f\n", q[0], q[1]), needTool(t, "cs2cs"), "-f", "%.10f", pl.CRS.String(), "OGC:CRS84")
		fs := strings.Fields(out)
		lon, err1 := strconv.ParseFloat(fs[0], 64)
		lat, err2 := strconv.ParseFloat(fs[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("cs2cs printed %q", out)
		}
		ll := geo.LonLat(orb.Point{0, 0})
		d := groundDistance(ll[0], ll[1], lon, lat)
		if d > nad83Tol {
			t.Errorf("%s: %.2f m from PROJ's WGS 84, more than the documented %g m", pl.CRS.Name(), d, float64(nad83Tol))
		}
		t.Logf("%s: NAD83 taken as WGS 84 is %.2f m from PROJ's transformation", pl.CRS.Name(), d)
	}
}

func BenchmarkWriteGeoJSON1e4(b *testing.B) { benchmarkWriteGeoJSON(b, 1e4) }

func benchmarkWriteGeoJSON(b *testing.B, n int) {
	l := Layer{Name: "traces", Geometry: LineString, Fields: []Field{{"set", Int32}, {"slip_m", Real}}}
	for i := range n {
		x, y := float64(i%100), float64(i/100)
		l.Features = append(l.Features, Feature{Geometry: orb.LineString{{x, y}, {x + 3, y + 2}}, Values: []any{i % 3, 1e-3 * x}})
	}
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := WriteGeoJSON(&buf, samplePlacement, l, nil); err != nil {
			b.Fatal(err)
		}
	}
}
