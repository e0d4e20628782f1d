package gis

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// interopTol, m: the brief's 1 cm between where GDAL + PROJ put a point
// and where this package does. The reading chain loses far less: cs2cs
// prints 1e-10° (0.01 mm), ogrinfo 15 significant digits (1e-8 ftUS at
// 1e7 ftUS).
const interopTol = 0.01

// groundDistance returns the distance, m, between two nearby points given
// in degrees, on a sphere of the mean Earth radius (6371 km, IUGG; from
// memory): enough for comparing points centimetres apart.
func groundDistance(lon1, lat1, lon2, lat2 float64) float64 {
	const r = 6371e3
	rad := math.Pi / 180
	dn := (lat2 - lat1) * rad * r
	de := lonDiff(lon2, lon1) * rad * r * math.Cos(lat1*rad)
	return math.Hypot(de, dn)
}

// layerSRSWKT returns the WKT of a layer's CRS as `ogrinfo -so` prints it.
func layerSRSWKT(t *testing.T, out string) string {
	t.Helper()
	m := regexp.MustCompile(`(?s)Layer SRS WKT:\n(.*?)\nData axis to CRS axis mapping`).FindStringSubmatch(out)
	if m == nil {
		t.Fatalf("no Layer SRS WKT in ogrinfo output:\n%s", out)
	}
	return m[1]
}

// cs2csLonLat converts map points of a NAD83 CRS given as WKT to NAD83
// longitude and latitude with PROJ; this package writes those as WGS 84
// (TestNAD83AsWGS84Magnitude measures the difference).
func cs2csLonLat(t *testing.T, crsWKT string, pts ...orb.Point) []orb.Point {
	t.Helper()
	var in strings.Builder
	for _, p := range pts {
		in.WriteString(strconv.FormatFloat(p[0], 'f', -1, 64) + " " + strconv.FormatFloat(p[1], 'f', -1, 64) + "\n")
	}
	out := execWithStdin(t, in.String(), needTool(t, "cs2cs"), "-f", "%.10f", crsWKT, "EPSG:4269")
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != len(pts) {
		t.Fatalf("cs2cs printed %q for %d points", out, len(pts))
	}
	ll := make([]orb.Point, len(lines))
	for i, line := range lines {
		f := strings.Fields(line)
		lat, err1 := strconv.ParseFloat(f[0], 64)
		lon, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("cs2cs line %q", line)
		}
		ll[i] = orb.Point{lon, lat}
	}
	return ll
}

// TestStatePlaneFeetInterop is the end-to-end check of placement in a US
// survey foot CRS: a known local point written to a GeoPackage is read
// back by ogrinfo in the CRS GDAL sees there, converted by cs2cs, and must
// land within interopTol of this package's longitude and latitude of the
// same point; a GeoTIFF of 10 m cells must have pixels of 10 m in ftUS in
// gdalinfo, and its cell centres must land right too. It runs for an EPSG
// code and for a WKT CRS without one (GDAL then reads the WKT from the
// GeoPackage and the user-defined GeoKeys from the GeoTIFF).
func TestStatePlaneFeetInterop(t *testing.T) {
	ogrinfo := needTool(t, "ogrinfo")
	gdalinfo := needTool(t, "gdalinfo")
	needTool(t, "cs2cs")
	const ftUS = 1200.0 / 3937
	cases := []struct {
		name string
		crs  CRS
		e0   float64 // origin, ftUS
		n0   float64
	}{
		{"EPSG:2277", CRS{EPSG: 2277}, 2300000, 10000000},
		{"WKT TM ftUS, no ID", mustWKT(t, "tm-ftus-nad83.wkt1.prj"), 650000, 180000},
	}
	local := orb.Point{1234.5, -678.9} // m
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			pl := Placement{CRS: c.crs, Easting: c.e0 * ftUS, Northing: c.n0 * ftUS}
			geo, err := pl.Geographic()
			if err != nil {
				t.Fatal(err)
			}
			want := geo.LonLat(local)

			// GeoPackage: the point in ftUS, and in the right place.
			path := tempPath(t, "well.gpkg")
			l := Layer{Name: "well", Geometry: Point, Features: []Feature{{Geometry: local}}}
			if err := WriteGeoPackage(context.Background(), path, pl, []Layer{l}, nil); err != nil {
				t.Fatal(err)
			}
			out := runTool(t, nil, ogrinfo, "-al", path)
			m := regexp.MustCompile(`POINT \(([-0-9.e+]+) ([-0-9.e+]+)\)`).FindStringSubmatch(out)
			if m == nil {
				t.Fatalf("no POINT in ogrinfo output:\n%s", out)
			}
			x, _ := strconv.ParseFloat(m[1], 64)
			y, _ := strconv.ParseFloat(m[2], 64)
			if d := math.Hypot(x-(c.e0+local[0]/ftUS), y-(c.n0+local[1]/ftUS)) * ftUS; d > interopTol {
				t.Errorf("ogrinfo reads (%v, %v) ftUS, %.3g m from origin + local/ftUS", x, y, d)
			}
			got := cs2csLonLat(t, layerSRSWKT(t, out), orb.Point{x, y})[0]
			if d := groundDistance(got[0], got[1], want[0], want[1]); d > interopTol {
				t.Errorf("GDAL + PROJ put the point at %v, %.3g m from this package's %v", got, d, want)
			}

			// GeoTIFF: pixel size in ftUS and cell centres in place.
			r := Raster{Grid: Grid{Cols: 4, Rows: 3, CellSize: 10, XMin: 1200, YMin: -700}, Data: make([]float32, 12), NoData: -1}
			tif := tempPath(t, "cells.tif")
			if err := os.WriteFile(tif, writeTIFFBytes(t, pl, r), 0o644); err != nil {
				t.Fatal(err)
			}
			var info gdalInfo
			if err := json.Unmarshal([]byte(runTool(t, []string{"GDAL_PAM_ENABLED=NO"}, gdalinfo, "-json", tif)), &info); err != nil {
				t.Fatal(err)
			}
			gt := info.GeoTransform
			// GDAL prints the geotransform with 17 significant digits.
			if math.Abs(gt[1]-10/ftUS) > 1e-9 || math.Abs(gt[5]+10/ftUS) > 1e-9 {
				t.Errorf("pixel size (%v, %v), want ±%v ftUS", gt[1], gt[5], 10/ftUS)
			}
			if !strings.Contains(info.CoordinateSystem.WKT, `LENGTHUNIT["US survey foot",0.304800609601219`) {
				t.Errorf("GeoTIFF CRS not in US survey feet:\n%s", info.CoordinateSystem.WKT)
			}
			var centres, locals []orb.Point
			for _, ij := range [][2]int{{0, 0}, {3, 2}} {
				i, j := ij[0], ij[1]
				// gdalinfo's geotransform, from the north-west corner down.
				centres = append(centres, orb.Point{gt[0] + (float64(i)+0.5)*gt[1], gt[3] + (float64(r.Rows-1-j)+0.5)*gt[5]})
				c := r.corner(i, j)
				locals = append(locals, orb.Point{c[0] + 5, c[1] + 5})
			}
			for k, got := range cs2csLonLat(t, info.CoordinateSystem.WKT, centres...) {
				want := geo.LonLat(locals[k])
				if d := groundDistance(got[0], got[1], want[0], want[1]); d > interopTol {
					t.Errorf("cell centre %v: GDAL + PROJ put it at %v, %.3g m from this package's %v", locals[k], got, d, want)
				}
			}
		})
	}
}
