package gis

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// TestGuidanceNoteExamples checks the worked examples of IOGP Guidance
// Note 7-2 (values from memory, each confirmed here with PROJ 9.1.1's
// cs2cs to the printed 0.01 unit; cs2cs's own values are the reference).
func TestGuidanceNoteExamples(t *testing.T) {
	cases := []struct {
		name     string
		el       Ellipsoid
		cv       Conversion
		lon, lat float64 // degrees
		e, n     float64 // m
	}{
		// LCC 2SP: NAD27 / Texas South Central (EPSG:32040), 28°30′N 96°W:
		// 2963503.91 ftUS, 254759.80 ftUS; cs2cs -f %.4f EPSG:4267
		// EPSG:32040 gives 2963503.9128 254759.8006.
		{"LCC 2SP", Clarke1866, Conversion{Method: MethodLambertConic2SP, LatOrigin: 27 + 50.0/60, LonOrigin: -99,
			StdParallel1: 28 + 23.0/60, StdParallel2: 30 + 17.0/60, FalseEasting: 2000000 * 1200.0 / 3937},
			-96, 28.5, 2963503.9128 * 1200.0 / 3937, 254759.8006 * 1200.0 / 3937},
		// Transverse Mercator with a latitude of origin: OSGB 1936 /
		// British National Grid (EPSG:27700) on Airy 1830, 50°30′N 0°30′E:
		// 577274.99, 69740.50 (the note's series); cs2cs -f %.4f EPSG:4277
		// EPSG:27700 gives 577274.9838 69740.4923.
		{"TM", Ellipsoid{SemiMajorAxis: 6377563.396, InverseFlattening: 299.3249646}, Conversion{Method: MethodTransverseMercator,
			LatOrigin: 49, LonOrigin: -2, Scale: 0.9996012717, FalseEasting: 400000, FalseNorthing: -100000},
			0.5, 50.5, 577274.9838, 69740.4923},
	}
	// cs2cs prints 1e-4 of the unit: 0.1 mm.
	const tol = 1e-4
	for _, c := range cases {
		p, err := NewProjection(c.el, c.cv)
		if err != nil {
			t.Fatal(err)
		}
		e, n := p.Forward(c.lon, c.lat)
		numtest.Abs(t, c.name+" easting", e, c.e, tol)
		numtest.Abs(t, c.name+" northing", n, c.n, tol)
		lon, lat := p.Inverse(c.e, c.n)
		numtest.Abs(t, c.name+" longitude", lon, c.lon, angleTol*10) // 1e-8° ≈ 1 mm, from the 0.1 mm print
		numtest.Abs(t, c.name+" latitude", lat, c.lat, angleTol*10)
	}
}

// TestLambertConicRoundTrip: Inverse undoes Forward to roundTripTol over a
// State Plane zone and well beyond it, for a cone in each hemisphere and
// both methods.
func TestLambertConicRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	cases := []Conversion{
		{Method: MethodLambertConic2SP, LatOrigin: 29 + 2.0/3, LonOrigin: -100 - 1.0/3, StdParallel1: 30 + 7.0/60, StdParallel2: 31 + 53.0/60, FalseEasting: 700000, FalseNorthing: 3000000},
		{Method: MethodLambertConic2SP, LatOrigin: -50, LonOrigin: 20, StdParallel1: -40, StdParallel2: -60, FalseEasting: 1e6, FalseNorthing: 1e6},
		{Method: MethodLambertConic2SP, LatOrigin: 45, LonOrigin: 0, StdParallel1: 45, StdParallel2: 45},
		{Method: MethodLambertConic1SP, LatOrigin: 18, LonOrigin: -77, Scale: 1, FalseEasting: 750000, FalseNorthing: 650000},
		{Method: MethodLambertConic1SP, LatOrigin: -35, LonOrigin: 150, Scale: 0.9999},
	}
	for _, cv := range cases {
		p, err := NewProjection(GRS80, cv)
		if err != nil {
			t.Fatal(err)
		}
		base := cv.LatOrigin
		if cv.Method == MethodLambertConic2SP {
			base = (cv.StdParallel1 + cv.StdParallel2) / 2
		}
		for range 500 {
			lon := cv.LonOrigin + 20*(2*rng.Float64()-1)
			lat := base + 15*(2*rng.Float64()-1)
			e, n := p.Forward(lon, lat)
			lon2, lat2 := p.Inverse(e, n)
			e2, n2 := p.Forward(lon2, lat2)
			numtest.Abs(t, "round-trip easting", e2, e, roundTripTol)
			numtest.Abs(t, "round-trip northing", n2, n, roundTripTol)
			numtest.Abs(t, "round-trip longitude", lonDiff(lon2, lon), 0, angleTol)
			numtest.Abs(t, "round-trip latitude", lat2, lat, angleTol)
		}
	}
}

// TestNewProjectionErrors: parameters the formulas cannot take are
// refused with the reason.
func TestNewProjectionErrors(t *testing.T) {
	cases := []struct {
		name string
		el   Ellipsoid
		cv   Conversion
		want string
	}{
		{"unknown method", WGS84, Conversion{Method: 9804, Scale: 1}, "not implemented"},
		{"zero scale", WGS84, Conversion{Method: MethodTransverseMercator}, "scale factor"},
		{"latitude", WGS84, Conversion{Method: MethodTransverseMercator, Scale: 1, LatOrigin: 91}, "beyond ±90°"},
		{"1SP on the equator", WGS84, Conversion{Method: MethodLambertConic1SP, Scale: 1}, "off the equator"},
		{"2SP symmetric", WGS84, Conversion{Method: MethodLambertConic2SP, StdParallel1: 30, StdParallel2: -30}, "no cone"},
		{"2SP at a pole", WGS84, Conversion{Method: MethodLambertConic2SP, StdParallel1: 90, StdParallel2: 60}, "no cone"},
		{"NaN", WGS84, Conversion{Method: MethodTransverseMercator, Scale: 1, FalseEasting: math.NaN()}, "finite"},
		{"bad ellipsoid", Ellipsoid{SemiMajorAxis: 6e6, InverseFlattening: 0.5}, Conversion{Method: MethodTransverseMercator, Scale: 1}, "1/f"},
	}
	for _, c := range cases {
		if _, err := NewProjection(c.el, c.cv); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
}

// TestHelmertIdentity: a zero shift between WGS 84 and itself returns
// the point (geocentric round trip within 1e-12°, 0.1 µm).
func TestHelmertIdentity(t *testing.T) {
	h := newHelmert([]float64{0, 0, 0})
	for _, p := range [][2]float64{{-100.5, 30.2}, {179.9, -89.5}, {0, 0}, {45, 60}} {
		lon, lat := h.toWGS84(WGS84, p[0], p[1])
		numtest.Abs(t, "longitude", lon, p[0], 1e-12)
		numtest.Abs(t, "latitude", lat, p[1], 1e-12)
	}
}

func BenchmarkLambertConicForward(b *testing.B) { benchmarkProjection(b, CRS{EPSG: 2277}, true) }
func BenchmarkLambertConicInverse(b *testing.B) { benchmarkProjection(b, CRS{EPSG: 2277}, false) }

// benchmarkProjection times one conversion of a point of the CRS's zone.
func benchmarkProjection(b *testing.B, c CRS, forward bool) {
	p, err := c.Projection()
	if err != nil {
		b.Fatal(err)
	}
	var s float64
	for i := 0; b.Loop(); i++ {
		d := float64(i%1000) * 1e-3
		if forward {
			e, n := p.Forward(-100+d, 31)
			s += e + n
		} else {
			lon, lat := p.Inverse(700000+1e3*d, 3100000)
			s += lon + lat
		}
	}
	_ = s
}
