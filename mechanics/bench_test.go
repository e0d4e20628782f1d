package mechanics

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/elastic"
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

// benchmarkGridResponse times one stress change on an n × n grid of 10 m
// cells in a 30 m layer, for a field depleted over the fraction share of
// the cells (a centred square), summed as how says. The response is built
// before the timer starts; the FFT's kernel spectra on the first call.
func benchmarkGridResponse(b *testing.B, n int, share float64, how Summation) {
	g := DepletionGrid{Cols: n, Rows: n, DX: 10, DY: 10}
	r, err := NewGridResponse(Layer{Poroelastic{Biot: 1, Poisson: 0.22}, 30}, g)
	if err != nil {
		b.Fatal(err)
	}
	field := make([]float64, g.Cells())
	side := int(math.Round(float64(n) * math.Sqrt(share)))
	lo := (n - side) / 2
	for row := lo; row < lo+side; row++ {
		for col := lo; col < lo+side; col++ {
			field[row*n+col] = -10e6
		}
	}
	dst := make([]StressChange, g.Cells())
	if err := r.Change(dst, field, how); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		if err := r.Change(dst, field, how); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(g.Cells()), "ns/cell")
}

func BenchmarkGridResponseFFT200(b *testing.B)   { benchmarkGridResponse(b, 200, 0.25, FFTSummation) }
func BenchmarkGridResponseFFT50(b *testing.B)    { benchmarkGridResponse(b, 50, 0.25, FFTSummation) }
func BenchmarkGridResponseDirect50(b *testing.B) { benchmarkGridResponse(b, 50, 0.25, DirectSummation) }
func BenchmarkGridResponseDirect50Sparse(b *testing.B) {
	benchmarkGridResponse(b, 50, 0.01, DirectSummation)
}
func BenchmarkGridResponseAuto200Sparse(b *testing.B) {
	benchmarkGridResponse(b, 200, 0.001, AutoSummation)
}

// benchmarkNewGridResponse times building the kernel tables of an n × n
// grid and, with fft, the kernel spectra.
func benchmarkNewGridResponse(b *testing.B, n int, fft bool) {
	g := DepletionGrid{Cols: n, Rows: n, DX: 10, DY: 10}
	field := make([]float64, g.Cells())
	field[0] = -1
	dst := make([]StressChange, g.Cells())
	for b.Loop() {
		r, err := NewGridResponse(Layer{Poroelastic{Biot: 1, Poisson: 0.22}, 30}, g)
		if err != nil {
			b.Fatal(err)
		}
		if fft {
			if err := r.Change(dst, field, FFTSummation); err != nil {
				b.Fatal(err)
			}
		}
	}
}

func BenchmarkNewGridResponse200(b *testing.B)        { benchmarkNewGridResponse(b, 200, false) }
func BenchmarkNewGridResponse200Spectra(b *testing.B) { benchmarkNewGridResponse(b, 200, true) }

// benchmarkDepletedEllipseAt times the change at points around an ellipse
// 300 × 100 m in a layer of thickness h.
func benchmarkDepletedEllipseAt(b *testing.B, h float64) {
	d, err := NewDepletedEllipse(Layer{Poroelastic{Biot: 1, Poisson: 0.22}, h},
		Ellipse{SemiMajor: 300, SemiMinor: 100, Azimuth: 1, Depletion: -10e6})
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([][2]float64, 1024)
	for i := range pts {
		pts[i] = [2]float64{600 * (rng.Float64() - 0.5), 600 * (rng.Float64() - 0.5)}
	}
	i := 0
	for b.Loop() {
		d.At(pts[i%len(pts)][0], pts[i%len(pts)][1])
		i++
	}
}

func BenchmarkDepletedEllipseAtPlaneStrain(b *testing.B) { benchmarkDepletedEllipseAt(b, math.Inf(1)) }
func BenchmarkDepletedEllipseAt30m(b *testing.B)         { benchmarkDepletedEllipseAt(b, 30) }

// BenchmarkNewContactCoupled builds the contact problem of a crossing
// network (twelve traces of sixteen 1 m elements, crossingNetwork) with
// and without CoupleCrossings: what checking its crossings costs.
func BenchmarkNewContactCoupled(b *testing.B) {
	elems, ce := crossingNetwork(0)
	op, err := elastic.NewDense(elems, testRock, elastic.Settings{PlaneStrain: true})
	if err != nil {
		b.Fatal(err)
	}
	for _, coupled := range []bool{false, true} {
		b.Run(fmt.Sprintf("coupled=%v", coupled), func(b *testing.B) {
			for b.Loop() {
				if _, err := NewContact(op, ce, ContactSettings{NearRadius: 3, DetachRadius: 0.6, ShearOnly: true, CoupleCrossings: coupled}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
