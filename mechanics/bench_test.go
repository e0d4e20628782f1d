package mechanics

import (
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
