package gis

import (
	"bufio"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// Tolerances of the projection tests.
const (
	// angleTol, degrees: cs2cs prints 10 decimals (±5e-11°); 1e-9° is
	// about 0.1 mm on the ground, the accuracy the brief asks for.
	angleTol = 1e-9
	// lengthTol, m: 1 mm, well below what a map needs, against PROJ.
	lengthTol = 1e-3
	// roundTripTol, m: Karney (2011, §4) bounds the order-6 series error by
	// 5 nm and double rounding at 1e7 m is ~2e-9 m; 1 µm leaves margin.
	roundTripTol = 1e-6
)

// cs2csPoint is one line of testdata/tm_cs2cs.txt.
type cs2csPoint struct {
	epsg              int
	easting, northing float64 // m
	lonDeg, latDeg    float64 // degrees
}

// readCS2CS reads the reference points computed by PROJ 9.1.1's cs2cs
// (testdata/tm_cs2cs.sh documents the command).
func readCS2CS(t *testing.T) []cs2csPoint {
	t.Helper()
	f, err := os.Open("testdata/tm_cs2cs.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var pts []cs2csPoint
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		fs := strings.Fields(line)
		if len(fs) != 5 {
			t.Fatalf("tm_cs2cs.txt: bad line %q", line)
		}
		var v [5]float64
		for i, s := range fs {
			if v[i], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("tm_cs2cs.txt: %q: %v", line, err)
			}
		}
		pts = append(pts, cs2csPoint{int(v[0]), v[1], v[2], v[3], v[4]})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if len(pts) < 100 {
		t.Fatalf("tm_cs2cs.txt has %d points, want at least 100", len(pts))
	}
	return pts
}

// lonDiff returns a−b reduced to [−180°, 180°].
func lonDiff(a, b float64) float64 { return math.Remainder(a-b, 360) }

func TestTransverseMercatorInverseVsCS2CS(t *testing.T) {
	for _, p := range readCS2CS(t) {
		tm, err := CRS{EPSG: p.epsg}.Projection()
		if err != nil {
			t.Fatal(err)
		}
		lon, lat := tm.Inverse(p.easting, p.northing)
		what := "EPSG:" + strconv.Itoa(p.epsg) + " " + strconv.FormatFloat(p.easting, 'f', -1, 64) + " " + strconv.FormatFloat(p.northing, 'f', -1, 64)
		numtest.Abs(t, what+" lon−ref", lonDiff(lon, p.lonDeg), 0, angleTol)
		numtest.Abs(t, what+" lat", lat, p.latDeg, angleTol)
	}
}

func TestTransverseMercatorForwardVsCS2CS(t *testing.T) {
	for _, p := range readCS2CS(t) {
		tm, err := CRS{EPSG: p.epsg}.Projection()
		if err != nil {
			t.Fatal(err)
		}
		e, n := tm.Forward(p.lonDeg, p.latDeg)
		what := "EPSG:" + strconv.Itoa(p.epsg) + " " + strconv.FormatFloat(p.lonDeg, 'f', -1, 64) + " " + strconv.FormatFloat(p.latDeg, 'f', -1, 64)
		numtest.Abs(t, what+" easting", e, p.easting, lengthTol)
		numtest.Abs(t, what+" northing", n, p.northing, lengthTol)
	}
}

func TestTransverseMercatorRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, code := range []int{32614, 32701, 32760, 26901, 26923} {
		tm, err := CRS{EPSG: code}.Projection()
		if err != nil {
			t.Fatal(err)
		}
		for range 500 {
			// Eastings 100–900 km (to ~9° from the central meridian at the
			// equator), northings across the zone's range.
			e := 100e3 + 800e3*rng.Float64()
			n := 9.3e6 * rng.Float64()
			if code >= 32701 && code <= 32760 {
				n = 1e6 + 9e6*rng.Float64()
			}
			lon, lat := tm.Inverse(e, n)
			e2, n2 := tm.Forward(lon, lat)
			numtest.Abs(t, "round-trip easting", e2, e, roundTripTol)
			numtest.Abs(t, "round-trip northing", n2, n, roundTripTol)
		}
	}
}

func TestTransverseMercatorCentralMeridianExact(t *testing.T) {
	// On the equator at the central meridian the projection gives exactly
	// the false origin (definition of the projection; Karney 2011, eq. 13).
	tm, err := CRS{EPSG: 32714}.Projection()
	if err != nil {
		t.Fatal(err)
	}
	e, n := tm.Forward(-99, 0)
	// UTM false easting 500 000 m and southern false northing 10 000 000 m
	// (NGA.SIG.0012_2.0.0_UTMUPS, 2014, §2).
	numtest.Abs(t, "easting", e, 500000, 1e-9)
	numtest.Abs(t, "northing", n, 10000000, 1e-9)
}

func BenchmarkTransverseMercatorInverse(b *testing.B) {
	tm := NewTransverseMercator(WGS84, -99, 0.9996, 500000, 0)
	var s float64
	for i := 0; b.Loop(); i++ {
		lon, lat := tm.Inverse(500000+float64(i%1000), 3500000)
		s += lon + lat
	}
	_ = s
}

func BenchmarkTransverseMercatorForward(b *testing.B) {
	tm := NewTransverseMercator(WGS84, -99, 0.9996, 500000, 0)
	var s float64
	for i := 0; b.Loop(); i++ {
		e, n := tm.Forward(-99+float64(i%1000)*1e-3, 31.6)
		s += e + n
	}
	_ = s
}
