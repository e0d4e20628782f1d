package gis

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// Tolerances of the WKT tests.
const (
	// wktAngleTol, degrees: WKT writers print 15 significant digits, so
	// -100.333333333333 stands for −100°20′ within 4e-13°.
	wktAngleTol = 1e-11
	// wktLengthTol, m: false eastings of 1e7 ftUS printed to 15 digits.
	wktLengthTol = 1e-6
)

// readWKT returns the text of testdata/wkt/name (made by make.sh there
// with PROJ 9.1.1's projinfo).
func readWKT(t testing.TB, name string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", "wkt", name))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// sameConversion compares two conversions within the WKT tolerances.
func sameConversion(t *testing.T, what string, got, want Conversion) {
	t.Helper()
	if got.Method != want.Method {
		t.Errorf("%s: method %v, want %v", what, got.Method, want.Method)
		return
	}
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"latitude of origin", got.LatOrigin, want.LatOrigin, wktAngleTol},
		{"longitude of origin", got.LonOrigin, want.LonOrigin, wktAngleTol},
		{"scale", got.Scale, want.Scale, 1e-15},
		{"standard parallel 1", got.StdParallel1, want.StdParallel1, wktAngleTol},
		{"standard parallel 2", got.StdParallel2, want.StdParallel2, wktAngleTol},
		{"false easting", got.FalseEasting, want.FalseEasting, wktLengthTol},
		{"false northing", got.FalseNorthing, want.FalseNorthing, wktLengthTol},
	} {
		numtest.Abs(t, what+" "+c.name, c.got, c.want, c.tol)
	}
}

// TestParseWKT reads WKT1 (GDAL and ESRI) and WKT2 (2015 and 2019) texts
// printed by projinfo and compares them with the table's definition of
// the same code, or with the PROJ string they were made from.
func TestParseWKT(t *testing.T) {
	table := func(code int) Conversion {
		e, ok := lookupEPSG(code)
		if !ok {
			t.Fatalf("EPSG:%d not in the table", code)
		}
		return e.definition().conv
	}
	ftUS := 1200.0 / 3937
	cases := []struct {
		file  string
		name  string
		epsg  int
		unit  LinearUnit
		conv  Conversion
		tie   wgs84Tie
		datum string
	}{
		{"2277.wkt1.prj", "NAD83 / Texas Central (ftUS)", 2277, USSurveyFoot, table(2277), tieMetre, "North_American_Datum_1983"},
		{"2277.wkt2.prj", "NAD83 / Texas Central (ftUS)", 2277, USSurveyFoot, table(2277), tieMetre, "North American Datum 1983"},
		{"2277.esri.prj", "NAD_1983_StatePlane_Texas_Central_FIPS_4203_Feet", 0, USSurveyFoot, table(2277), tieMetre, "D_North_American_1983"},
		{"32614.wkt2.prj", "WGS 84 / UTM zone 14N", 32614, Metre, table(32614), tieExact, "World Geodetic System 1984 ensemble"},
		{"32039.wkt1.prj", "NAD27 / Texas Central", 32039, USSurveyFoot, table(32039), tieNone, "North_American_Datum_1927"},
		{"6588.wkt2-2015.prj", "NAD83(2011) / Texas South Central (ftUS)", 6588, USSurveyFoot, table(6588), tieMetre, "NAD83 (National Spatial Reference System 2011)"},
		// Made-up CRSs: the parameters of make.sh's PROJ strings.
		{"lcc1sp-ftus.wkt2.prj", "unknown", 0, USSurveyFoot, Conversion{Method: MethodLambertConic1SP, LatOrigin: 40.5, LonOrigin: -104.5,
			Scale: 0.9999, FalseEasting: 300000, FalseNorthing: 50000}, tieNone, "Unknown based on GRS80 ellipsoid"},
		{"lcc1sp-ftus.esri.prj", "unknown", 0, USSurveyFoot, Conversion{Method: MethodLambertConic1SP, LatOrigin: 40.5, LonOrigin: -104.5,
			Scale: 0.9999, FalseEasting: 300000, FalseNorthing: 50000}, tieNone, "D_Unknown_based_on_GRS80_ellipsoid"},
		{"tm-ftus-nad83.wkt1.prj", "unknown", 0, USSurveyFoot, Conversion{Method: MethodTransverseMercator, LatOrigin: 31, LonOrigin: -103.5,
			Scale: 0.9999, FalseEasting: 200000}, tieMetre, "North_American_Datum_1983"},
		{"lcc2sp-intl-towgs84.wkt1.prj", "unknown", 0, Metre, Conversion{Method: MethodLambertConic2SP, LatOrigin: 23, LonOrigin: -96,
			Scale: 1, StdParallel1: 33, StdParallel2: 45}, tieHelmert, "Unknown based on International 1924 (Hayford 1909, 1910) ellipsoid using towgs84=0,0,0"},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			crs, err := ParseWKT(readWKT(t, c.file))
			if err != nil {
				t.Fatal(err)
			}
			d := crs.wkt
			if d.name != c.name || crs.EPSG != c.epsg || d.unit != c.unit || d.tie != c.tie || d.datumName != c.datum {
				t.Errorf("got name %q, EPSG %d, unit %+v, tie %d, datum %q\nwant %q, %d, %+v, %d, %q",
					d.name, crs.EPSG, d.unit, d.tie, d.datumName, c.name, c.epsg, c.unit, c.tie, c.datum)
			}
			sameConversion(t, c.file, d.conv, c.conv)
			if crs.Unit().Metres != c.unit.Metres || crs.Name() != c.name {
				t.Errorf("Unit %v, Name %q", crs.Unit(), crs.Name())
			}
		})
	}
	numtest.Abs(t, "US survey foot", USSurveyFoot.Metres, ftUS, 0)
}

// TestParseWKTUnimplementedMethod: a CRS whose method has no projection
// here still places coordinates (its unit is known) but has no
// longitude and latitude.
func TestParseWKTUnimplementedMethod(t *testing.T) {
	c, err := ParseWKT(readWKT(t, "2056.wkt2.prj"))
	if err != nil {
		t.Fatal(err)
	}
	if c.EPSG != 2056 || c.Unit() != Metre || c.wkt.conv.Method != 0 || c.wkt.methodName != "Hotine Oblique Mercator (variant B)" {
		t.Errorf("EPSG %d, unit %v, method %v %q", c.EPSG, c.Unit(), c.wkt.conv.Method, c.wkt.methodName)
	}
	if _, err := c.Projection(); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "Hotine") {
		t.Errorf("Projection: %v", err)
	}
	// The EPSG method code decides over the name: 9808 is transverse
	// Mercator (south orientated), which is not implemented.
	so, err := ParseWKT(strings.Replace(readWKT(t, "2277.wkt2.prj"), `METHOD["Lambert Conic Conformal (2SP)",
            ID["EPSG",9802]]`, `METHOD["Transverse Mercator",
            ID["EPSG",9808]]`, 1))
	if err != nil || so.wkt.conv.Method != 0 {
		t.Errorf("method code 9808: %v, %v", err, so.wkt)
	}
	q := Placement{CRS: c, Easting: 2.6e6, Northing: 1.2e6}.ToCRS([2]float64{10, 20})
	if q[0] != 2600010 || q[1] != 1200020 {
		t.Errorf("ToCRS %v", q)
	}
}

// TestParseWKTErrors: each bad text is refused with a message that says
// what is wrong and where.
func TestParseWKTErrors(t *testing.T) {
	good := readWKT(t, "tm-ftus-nad83.wkt1.prj")
	cases := []struct {
		name, text string
		line, col  int
		msg        string
	}{
		{"empty", "", 1, 1, "want a keyword"},
		{"not WKT", "EPSG:2277", 1, 5, "want '[' or '('"},
		{"geographic", readWKT(t, "4326.wkt2.prj"), 1, 1, "geographic CRS"},
		{"unclosed", `PROJCS["a",GEOGCS["b"`, 1, 22, "GEOGCS is not closed"},
		{"unclosed text", "PROJCS[\"a,\n1]", 1, 8, "quoted text is not closed"},
		{"mismatched bracket", `PROJCS["a")`, 1, 11, "want ',' or ']'"},
		{"bad number", `PROJCS["a",1e999]`, 1, 12, "not a finite number"},
		{"trailing", good + "x", 22, 1, "after the end"},
		{"no unit", strings.Replace(good, `UNIT["US survey foot",0.304800609601219,`, `XUNIT["US survey foot",0.304800609601219,`, 1), 1, 1, "no linear UNIT"},
		{"zero unit", strings.Replace(good, `UNIT["US survey foot",0.304800609601219,`, `UNIT["US survey foot",0,`, 1), 17, 5, "factor > 0"},
		{"west axis", strings.Replace(good, `AXIS["Easting",EAST]`, `AXIS["Westing",WEST]`, 1), 19, 5, "east and north"},
		{"unknown parameter", strings.Replace(good, `"scale_factor"`, `"azimuth"`, 1), 14, 5, `parameter "azimuth"`},
		{"2SP without parallels", strings.Replace(readWKT(t, "lcc2sp-intl-towgs84.wkt1.prj"), `PARAMETER["standard_parallel_2",45],`, ``, 1), 10, 5, "both standard parallels"},
		{"no datum", `PROJCS["a",GEOGCS["b",PRIMEM["Greenwich",0]],UNIT["metre",1]]`, 1, 12, "no DATUM"},
		{"bad ellipsoid", strings.Replace(good, "6378137,298.257222101", "6378137,0.5", 1), 4, 13, "1/f"},
		{"deep", strings.Repeat("A[", 40) + "1" + strings.Repeat("]", 40), 1, 65, "nested deeper"},
		{"unknown root", `VERTCRS["a",VDATUM["b"]]`, 1, 1, "not a projected CRS"},
	}
	for _, c := range cases {
		_, err := ParseWKT(c.text)
		var we *WKTError
		if !errors.As(err, &we) {
			t.Errorf("%s: error %v, want a *WKTError", c.name, err)
			continue
		}
		if we.Line != c.line || we.Column != c.col || !strings.Contains(we.Msg, c.msg) {
			t.Errorf("%s: %v; want line %d, column %d, %q", c.name, err, c.line, c.col, c.msg)
		}
	}
}

// TestCompactWKT: the one-line form parses to the same CRS and keeps
// quoted text as is.
func TestCompactWKT(t *testing.T) {
	for _, f := range []string{"2277.wkt1.prj", "2277.wkt2.prj", "lcc1sp-ftus.wkt2.prj"} {
		src := readWKT(t, f)
		one := compactWKT(src)
		if strings.ContainsAny(one, "\n\r\t") || !strings.Contains(one, `"NAD83 / Texas Central (ftUS)"`) && strings.HasPrefix(f, "2277") {
			t.Errorf("%s: compact form %q", f, one)
		}
		a, err := ParseWKT(src)
		if err != nil {
			t.Fatal(err)
		}
		b, err := ParseCRS(one)
		if err != nil {
			t.Fatal(err)
		}
		if !a.Equal(b) || *a.wkt != *b.wkt {
			t.Errorf("%s: the compact text parses differently", f)
		}
	}
	if got := compactWKT("A[\"x\ty \"\"q\"\"\",\n 1 ]"); got != `A["x y ""q""",1]` {
		t.Errorf("compactWKT: %q", got)
	}
}

// TestWKTVersusCS2CS is the interop check of the WKT reader: PROJ's cs2cs
// reads the same file and converts grid points to longitude and latitude.
// Where the datum is tied to WGS 84 our Placement.Geographic must agree
// within angleTol with cs2cs to the geographic CRS we write as WGS 84:
// WGS 84 itself, a TOWGS84 shift to it, or the NAD83 realization itself
// (TestNAD83AsWGS84Magnitude measures that approximation). Otherwise
// cs2cs goes to the base geographic CRS and our projection must agree
// both ways (angleTol inverse, lengthTol forward).
func TestWKTVersusCS2CS(t *testing.T) {
	cs2cs := needTool(t, "cs2cs")
	cases := []struct {
		file, geog string
		viaWGS84   bool
	}{
		{"2277.wkt1.prj", "EPSG:4269", true},
		{"2277.wkt2.prj", "EPSG:4269", true},
		{"2277.esri.prj", "EPSG:4269", true},
		{"32614.wkt2.prj", "EPSG:4326", true},
		{"6588.wkt2-2015.prj", "EPSG:6318", true},
		{"tm-ftus-nad83.wkt1.prj", "EPSG:4269", true},
		{"lcc2sp-intl-towgs84.wkt1.prj", "EPSG:4326", true},
		{"32039.wkt1.prj", "EPSG:4267", false},
		// No datum in common with EPSG:4326: cs2cs applies no shift.
		{"lcc1sp-ftus.wkt2.prj", "EPSG:4326", false},
		{"lcc1sp-ftus.esri.prj", "EPSG:4326", false},
	}
	for _, tc := range cases {
		text := readWKT(t, tc.file)
		c, err := ParseWKT(text)
		if err != nil {
			t.Fatal(err)
		}
		proj, err := c.Projection()
		if err != nil {
			t.Fatal(err)
		}
		var geo *Geographic
		if tc.viaWGS84 {
			if geo, err = (Placement{CRS: c}).Geographic(); err != nil {
				t.Fatal(err)
			}
		}
		u := c.Unit().Metres
		cv := c.wkt.conv
		var in strings.Builder
		var pts [][2]float64 // m
		for i := -2; i <= 2; i++ {
			for j := -2; j <= 2; j++ {
				p := [2]float64{cv.FalseEasting + float64(i)*1e5, cv.FalseNorthing + float64(j)*1e5 + 3e5}
				pts = append(pts, p)
				fmt.Fprintf(&in, "%.6f %.6f\n", p[0]/u, p[1]/u)
			}
		}
		out := execWithStdin(t, in.String(), cs2cs, "-f", "%.10f", text, tc.geog)
		lines := strings.Split(strings.TrimSpace(out), "\n")
		if len(lines) != len(pts) {
			t.Fatalf("%s: cs2cs printed %d lines for %d points", tc.file, len(lines), len(pts))
		}
		for k, line := range lines {
			f := strings.Fields(line)
			lat, err1 := strconv.ParseFloat(f[0], 64)
			lon, err2 := strconv.ParseFloat(f[1], 64)
			if err1 != nil || err2 != nil {
				t.Fatalf("%s: cs2cs line %q", tc.file, line)
			}
			// The points were printed with 6 decimals of the CRS unit.
			e := math.Round(pts[k][0]/u*1e6) / 1e6 * u
			n := math.Round(pts[k][1]/u*1e6) / 1e6 * u
			what := fmt.Sprintf("%s point (%.0f, %.0f) m", tc.file, e, n)
			if tc.viaWGS84 {
				ll := geo.LonLat([2]float64{e, n})
				numtest.Abs(t, what+" WGS 84 longitude", lonDiff(ll[0], lon), 0, angleTol)
				numtest.Abs(t, what+" WGS 84 latitude", ll[1], lat, angleTol)
				continue
			}
			gotLon, gotLat := proj.Inverse(e, n)
			numtest.Abs(t, what+" longitude", lonDiff(gotLon, lon), 0, angleTol)
			numtest.Abs(t, what+" latitude", gotLat, lat, angleTol)
			fe, fn := proj.Forward(lon, lat)
			numtest.Abs(t, what+" easting, m", fe-e, 0, lengthTol)
			numtest.Abs(t, what+" northing, m", fn-n, 0, lengthTol)
		}
	}
}

// FuzzParseWKT: nothing panics, and whatever parses prints (String) to a
// text that parses to the same CRS with the same unit and projection.
func FuzzParseWKT(f *testing.F) {
	entries, err := os.ReadDir(filepath.Join("testdata", "wkt"))
	if err != nil {
		f.Fatal(err)
	}
	for _, e := range entries {
		if strings.HasSuffix(e.Name(), ".prj") {
			f.Add(readWKT(f, e.Name()))
		}
	}
	f.Add(`PROJCS["a",GEOGCS["b",DATUM["c",SPHEROID["d",6378137,0]],UNIT["degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],UNIT["foot",0.3048]]`)
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseWKT(s)
		if err != nil {
			var we *WKTError
			if !errors.As(err, &we) || we.Line < 1 || we.Column < 1 {
				t.Fatalf("error %v is not a positioned *WKTError", err)
			}
			return
		}
		c2, err := ParseCRS(c.String())
		if err != nil {
			t.Fatalf("reparsing %q: %v", c.String(), err)
		}
		if !c.Equal(c2) || c.Unit() != c2.Unit() || c.Name() != c2.Name() || c.wkt.conv != c2.wkt.conv && !hasNaN(c.wkt.conv) {
			t.Fatalf("reparsing changed the CRS: %+v vs %+v", *c.wkt, *c2.wkt)
		}
		if !(c.Unit().Metres > 0) {
			t.Fatalf("unit %v", c.Unit())
		}
	})
}

func hasNaN(cv Conversion) bool {
	for _, v := range []float64{cv.LatOrigin, cv.LonOrigin, cv.Scale, cv.StdParallel1, cv.StdParallel2, cv.FalseEasting, cv.FalseNorthing} {
		if math.IsNaN(v) {
			return true
		}
	}
	return false
}

// BenchmarkParseWKT reads a WKT2 State Plane definition (41 lines).
func BenchmarkParseWKT(b *testing.B) {
	text := readWKT(b, "2277.wkt2.prj")
	b.SetBytes(int64(len(text)))
	for b.Loop() {
		if _, err := ParseWKT(text); err != nil {
			b.Fatal(err)
		}
	}
}
