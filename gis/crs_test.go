package gis

import (
	"errors"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"slipfront/internal/numtest"
)

func TestParseCRS(t *testing.T) {
	cases := []struct {
		in     string
		want   int
		errSub string
	}{
		{"", 0, ""},
		{"  ", 0, ""},
		{"EPSG:32614", 32614, ""},
		{"epsg:26910", 26910, ""},
		{"EPSG:2277", 2277, ""},
		{"EPSG:32039", 32039, ""},
		{"EPSG:2056", 0, "not a projected CRS this program can place"}, // oblique Mercator
		{"EPSG:999999", 0, "not a projected CRS this program can place"},
		{"EPSG:26931", 0, "32601–32660"}, // the message lists what is supported
		{"EPSG:4326", 0, "geographic"},
		{"EPSG:4269", 0, "geographic"},
		{"EPSG:abc", 0, "integer"},
		{"EPSG:0", 0, "integer"},
		{"EPSG:-3", 0, "integer"},
		{"UTM14", 0, "EPSG:<code>"},
		{"VERTCRS[\"a\",VDATUM[\"b\"]]", 0, "not a projected CRS"},
		{"ESRI:102100", 0, "EPSG:<code>"},
	}
	for _, c := range cases {
		got, err := ParseCRS(c.in)
		if c.errSub != "" {
			var we *WKTError
			named := strings.Contains(errString(err), strings.TrimSpace(c.in)) || errors.As(err, &we) // a WKT error gives line and column instead
			if err == nil || !strings.Contains(err.Error(), c.errSub) || !named {
				t.Errorf("ParseCRS(%q): error %v, want one containing %q and the input", c.in, err, c.errSub)
			}
			continue
		}
		if err != nil || got.EPSG != c.want {
			t.Errorf("ParseCRS(%q) = %v, %v; want EPSG %d", c.in, got, err, c.want)
		}
	}
}

func TestCRSNamesAndRanges(t *testing.T) {
	cases := []struct {
		code      int
		name      string
		supported bool
	}{
		{0, "undefined Cartesian", false},
		{32601, "WGS 84 / UTM zone 1N", true},
		{32660, "WGS 84 / UTM zone 60N", true},
		{32661, "EPSG:32661", false}, // UPS North, outside the UTM range
		{32701, "WGS 84 / UTM zone 1S", true},
		{32760, "WGS 84 / UTM zone 60S", true},
		{26901, "NAD83 / UTM zone 1N", true},
		{26923, "NAD83 / UTM zone 23N", true},
		{26924, "EPSG:26924", false},
		{26714, "NAD27 / UTM zone 14N", true},
		{2277, "NAD83 / Texas Central (ftUS)", true},
		{6588, "NAD83(2011) / Texas South Central (ftUS)", true},
		{2056, "EPSG:2056", false},
	}
	for _, c := range cases {
		crs := CRS{EPSG: c.code}
		if crs.Name() != c.name {
			t.Errorf("EPSG %d: Name %q, want %q", c.code, crs.Name(), c.name)
		}
		_, err := crs.Projection()
		if (err == nil) != c.supported {
			t.Errorf("EPSG %d: Projection error %v, supported %v", c.code, err, c.supported)
		}
		if err != nil && (!errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), supportedCRSs)) {
			t.Errorf("EPSG %d: error %q should wrap ErrNoGeographic and name the supported ranges", c.code, err)
		}
		if c.code != 0 && !strings.Contains(errString(err), crs.String()) && err != nil {
			t.Errorf("EPSG %d: error %q does not name the code", c.code, err)
		}
	}
}

func errString(err error) string {
	if err == nil {
		return ""
	}
	return err.Error()
}

func TestPlacement(t *testing.T) {
	pl := Placement{CRS: CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	q := pl.ToCRS(orb.Point{-12.5, 30})
	numtest.Abs(t, "easting", q[0], 499987.5, 0)
	numtest.Abs(t, "northing", q[1], 3500030, 0)
	geo, err := pl.Geographic()
	if err != nil {
		t.Fatal(err)
	}
	// cs2cs -f %.10f EPSG:32614 OGC:CRS84 <<< "500000 3500000" gives
	// -99.0000000000 31.6351862200 (PROJ 9.1.1, run on the project machine).
	ll := geo.LonLat(orb.Point{0, 0})
	numtest.Abs(t, "lon", ll[0], -99, angleTol)
	numtest.Abs(t, "lat", ll[1], 31.63518622, angleTol)
	if _, err := (Placement{}).Geographic(); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "undefined") {
		t.Errorf("undefined CRS: %v", err)
	}
}

// TestPlacementUnit: in a US survey foot CRS the origin (m) and local
// metres become US survey feet, 1 ftUS = 1200/3937 m exactly (NIST SP 811,
// 2008, B.6 footnote), and longitude and latitude do not depend on the unit.
func TestPlacementUnit(t *testing.T) {
	const ftUS = 1200.0 / 3937
	// The origin of the issue: E 2 300 000 ftUS, N 10 000 000 ftUS of
	// NAD83 / Texas Central (ftUS), given in metres.
	pl := Placement{CRS: CRS{EPSG: 2277}, Easting: 2300000 * ftUS, Northing: 10000000 * ftUS}
	q := pl.ToCRS(orb.Point{1000, -500}) // local metres
	// Round-off of a few 1e-10 ftUS: 1e-8 ftUS leaves margin.
	numtest.Abs(t, "easting, ftUS", q[0], 2300000+1000/ftUS, 1e-8)
	numtest.Abs(t, "northing, ftUS", q[1], 10000000-500/ftUS, 1e-8)
	if u := pl.CRS.Unit(); u != USSurveyFoot {
		t.Errorf("unit %+v", u)
	}
	geo, err := pl.Geographic()
	if err != nil {
		t.Fatal(err)
	}
	// cs2cs -f %.10f EPSG:2277 EPSG:4269 <<< "2300000 10000000" gives
	// 30.0997053776 -100.3225292991 (PROJ 9.1.1; NAD83 taken as WGS 84).
	ll := geo.LonLat(orb.Point{0, 0})
	numtest.Abs(t, "lon", ll[0], -100.3225292991, angleTol)
	numtest.Abs(t, "lat", ll[1], 30.0997053776, angleTol)
}

// TestGeographicRefusals: NAD27 and a datum with no relation to WGS 84
// give no longitude and latitude, with the reason.
func TestGeographicRefusals(t *testing.T) {
	if _, err := (Placement{CRS: CRS{EPSG: 32039}}).Geographic(); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "NAD27 differs") {
		t.Errorf("NAD27: %v", err)
	}
	c, err := ParseWKT(readWKT(t, "lcc1sp-ftus.wkt2.prj"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := (Placement{CRS: c}).Geographic(); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "Unknown based on GRS80") {
		t.Errorf("unknown datum: %v", err)
	}
}

// TestSupportedCRSsMessage checks what the message of unknown codes says:
// both ends of every range it names are in the table, 26931 is not, and
// the count is the table's.
func TestSupportedCRSsMessage(t *testing.T) {
	for _, r := range [][2]int{{32601, 32660}, {32701, 32760}, {26901, 26923}, {26701, 26722}, {26929, 26998}, {32100, 32161}, {2222, 2289}, {32001, 32058}} {
		for _, code := range r {
			if _, ok := lookupEPSG(code); !ok {
				t.Errorf("EPSG:%d is named in the message but not in the table", code)
			}
			if !strings.Contains(supportedCRSs, strconv.Itoa(code)) {
				t.Errorf("the message does not name %d", code)
			}
		}
	}
	if _, ok := lookupEPSG(26931); ok {
		t.Error("EPSG:26931 is in the table though the message excludes it")
	}
	if !strings.Contains(supportedCRSs, strconv.Itoa(len(epsgTable))+" codes") {
		t.Errorf("the message does not give the table size %d", len(epsgTable))
	}
}

// TestEPSGTableSorted: lookupEPSG searches by code, so the table must be
// sorted without repeats, and every entry must be complete.
func TestEPSGTableSorted(t *testing.T) {
	if len(epsgTable) < 2000 {
		t.Fatalf("%d entries; the generator wrote 2104", len(epsgTable))
	}
	for i, e := range epsgTable {
		if i > 0 && e.code <= epsgTable[i-1].code {
			t.Errorf("entry %d: code %d after %d", i, e.code, epsgTable[i-1].code)
		}
		if e.base == nil || e.unit.Metres == 0 || e.name == "" || e.method == 0 {
			t.Errorf("EPSG:%d: incomplete entry %+v", e.code, e)
		}
	}
}

// TestNAD83AsWGS84 documents the datum approximation: NAD83 / UTM zone
// 14N coordinates are converted on GRS80 and reported as WGS 84; the
// ellipsoids differ only in 1/f (298.257222101 vs 298.257223563), which
// moves a point by well under 1 mm, so the datum shift itself (~1–2 m,
// ignored) is the whole approximation.
func TestNAD83AsWGS84(t *testing.T) {
	nad, err := CRS{EPSG: 26914}.Projection()
	if err != nil {
		t.Fatal(err)
	}
	wgs, err := CRS{EPSG: 32614}.Projection()
	if err != nil {
		t.Fatal(err)
	}
	lon1, lat1 := nad.Inverse(712345.678, 4123456.789)
	lon2, lat2 := wgs.Inverse(712345.678, 4123456.789)
	// 1e-8° ≈ 1 mm: the ellipsoid difference stays below it here.
	numtest.Abs(t, "lon difference", lon1, lon2, 1e-8)
	numtest.Abs(t, "lat difference", lat1, lat2, 1e-8)
}

// FuzzParseCRS: whatever parses prints back to a string that parses to the
// same CRS, and nothing panics.
func FuzzParseCRS(f *testing.F) {
	for _, s := range []string{"", "EPSG:32614", "epsg:26910", "EPSG:4326", "EPSG:", "EPSG:99999999", ":", "EPSG:+5", " EPSG:2277 ", "PROJCS[\"x\"]"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseCRS(s)
		if err != nil {
			return
		}
		c2, err := ParseCRS(c.String())
		if err != nil || !c2.Equal(c) {
			t.Errorf("ParseCRS(%q) = %v; reparsing %q gives %v, %v", s, c, c.String(), c2, err)
		}
	})
}
