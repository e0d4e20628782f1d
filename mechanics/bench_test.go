package mechanics

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// benchPlanes returns n random planes in three sets.
func benchPlanes(n int) []Plane {
	rng := rand.New(rand.NewPCG(1, 2))
	planes := make([]Plane, n)
	for i := range planes {
		planes[i] = Plane{ID: i, Set: i % 3,
			Normal:      r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()},
			Area:        1 + 1000*rng.Float64(),
			TraceLength: 50 * rng.Float64()}
	}
	return planes
}

// benchmarkScreenPlanes times the per-plane resolution (no aggregates).
func benchmarkScreenPlanes(b *testing.B, n int) {
	s := workedExample(b)
	planes := benchPlanes(n)
	dst := make([]PlaneResult, n)
	c := Coulomb{Friction: 0.6}
	b.ResetTimer()
	for b.Loop() {
		if err := ScreenPlanes(dst, planes, s, c); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/plane")
}

// benchmarkScreen times the whole screening: resolution, shares and curve.
func benchmarkScreen(b *testing.B, n int) {
	s := workedExample(b)
	planes := benchPlanes(n)
	c := Coulomb{Friction: 0.6}
	b.ResetTimer()
	for b.Loop() {
		if _, err := Screen(planes, s, c, ScreenOptions{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/plane")
}

func BenchmarkScreenPlanes1e4(b *testing.B) { benchmarkScreenPlanes(b, 1e4) }
func BenchmarkScreenPlanes1e6(b *testing.B) { benchmarkScreenPlanes(b, 1e6) }
func BenchmarkScreen1e4(b *testing.B)       { benchmarkScreen(b, 1e4) }
func BenchmarkScreen1e6(b *testing.B)       { benchmarkScreen(b, 1e6) }

// BenchmarkApertureEvaluate times one aperture evaluation (the flow
// solver calls it per element and iteration).
func BenchmarkApertureEvaluate(b *testing.B) {
	m := ApertureModel{ZeroStress: 5e-4, ClosureStress: 20e6, DilationAngle: 0.04, DilationSlipLimit: 5e-3,
		ShearModulus: 15e9, PoissonRatio: 0.25}
	patch := Patch{Length: 10, Height: 40}
	var sink float64
	p := 30e6
	for b.Loop() {
		e, d := m.Evaluate(60e6, p, 1e-3, patch)
		sink += e + d
		p += 1
	}
	_ = sink
}

// BenchmarkSeismicityAdvance times one exact constant-rate step of the
// seismicity-rate model (the time loop calls it per cell and step).
func BenchmarkSeismicityAdvance(b *testing.B) {
	m := SeismicityRate{BackgroundRate: 1e-5, StressingRate: 1e-3, ASigma: 5e4}
	g, rate := m.SteadyState(), 2.0
	var sink float64
	for b.Loop() {
		var n float64
		g, n = m.Advance(g, rate, 60)
		sink += n
		rate = -rate
	}
	_ = sink
}

// benchmarkBValue times the b-value of a Gutenberg–Richter catalogue of n
// events.
func benchmarkBValue(b *testing.B, n int) {
	r := rand.New(rand.NewPCG(1, 2))
	gr := GutenbergRichter{B: 1, Min: 0, Max: math.Inf(1)}
	mags := make([]float64, n)
	for i := range mags {
		mags[i] = gr.Rand(r)
	}
	b.ResetTimer()
	for b.Loop() {
		if _, err := BValue(mags, BValueOptions{Completeness: 0.5}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBValue1e4(b *testing.B) { benchmarkBValue(b, 1e4) }
func BenchmarkBValue1e6(b *testing.B) { benchmarkBValue(b, 1e6) }

// benchmarkSeismicitySample times drawing the events of one interval with
// about n expected events.
func benchmarkSeismicitySample(b *testing.B, n float64) {
	m := SeismicityRate{BackgroundRate: n / 3600, StressingRate: 1e-3, ASigma: 5e4}
	iv := RateInterval{Duration: 3600, StressingRate: m.StressingRate, Gamma: m.SteadyState()}
	sizes := GutenbergRichter{B: 1, Min: -2, Max: 3}
	r := rand.New(rand.NewPCG(1, 2))
	var dst []CatalogEvent
	for b.Loop() {
		dst = m.Sample(dst[:0], r, iv, sizes)
	}
}

func BenchmarkSeismicitySample10(b *testing.B)   { benchmarkSeismicitySample(b, 10) }
func BenchmarkSeismicitySample1000(b *testing.B) { benchmarkSeismicitySample(b, 1000) }
