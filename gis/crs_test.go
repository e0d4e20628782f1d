package gis

import (
	"errors"
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
		{"EPSG:2056", 2056, ""}, // any projected code is accepted
		{"EPSG:4326", 0, "geographic"},
		{"EPSG:4269", 0, "geographic"},
		{"EPSG:abc", 0, "integer"},
		{"EPSG:0", 0, "integer"},
		{"EPSG:-3", 0, "integer"},
		{"UTM14", 0, "EPSG:<code>"},
		{"ESRI:102100", 0, "EPSG:<code>"},
	}
	for _, c := range cases {
		got, err := ParseCRS(c.in)
		if c.errSub != "" {
			if err == nil || !strings.Contains(err.Error(), c.errSub) || !strings.Contains(err.Error(), strings.TrimSpace(c.in)) {
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
		if err != nil && (!errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "32601–32660") || !strings.Contains(err.Error(), "26901–26923")) {
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
	for _, s := range []string{"", "EPSG:32614", "epsg:26910", "EPSG:4326", "EPSG:", "EPSG:99999999", ":", "EPSG:+5", " EPSG:2056 "} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseCRS(s)
		if err != nil {
			return
		}
		c2, err := ParseCRS(c.String())
		if err != nil || c2 != c {
			t.Errorf("ParseCRS(%q) = %v; reparsing %q gives %v, %v", s, c, c.String(), c2, err)
		}
	})
}
