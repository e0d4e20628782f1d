package dfn

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/scenarios"
)

// benchScenario returns a scenario whose mid-plane holds about the given
// number of traces: one near-vertical Fisher set (κ = 20) of discs with
// power-law radii 10–100 m (D = 2.5), P32 = 0.05 1/m, in a 30 m layer,
// and a square map sized so that the trace density 2·P32·E[r]/(π E[r²])
// (a near-vertical disc of radius r crosses a plane within r of its
// centre) gives the count.
func benchScenario(traces int) *scenarios.Scenario {
	set := testSet("bench", 0.05, 0)
	set.Orientation = scenarios.Orientation{Distribution: "fisher", Dip: rad(85), DipDirection: rad(120), Kappa: 20}
	set.Size = scenarios.Size{Distribution: "power_law", Min: 10, Max: 100, Exponent: 2.5}
	law := PowerLaw{Min: 10, Max: 100, D: 2.5}
	perArea := 2 * 0.05 * law.Moment(1) / (math.Pi * law.Moment(2))
	s := testScenario(math.Sqrt(float64(traces)/perArea), 30, set)
	s.Wells = eastWells(s.Domain.XMax-s.Domain.XMin, 4)
	return s
}

// benchmarkGenerate times Generate (fractures, traces, intersections,
// clusters, well crossings) and reports the time per trace.
func benchmarkGenerate(b *testing.B, traces int) {
	s := benchScenario(traces)
	n := mustGenerate(b, s, 0)
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		if _, err := Generate(s, i); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(n.Traces)), "ns/trace")
	b.ReportMetric(float64(len(n.Traces)), "traces")
	b.ReportMetric(float64(len(n.Intersections))/float64(len(n.Traces)), "intersections/trace")
}

func BenchmarkGenerate1e4(b *testing.B) { benchmarkGenerate(b, 1e4) }
func BenchmarkGenerate1e5(b *testing.B) { benchmarkGenerate(b, 1e5) }

// benchmarkIntersections times the grid index alone on isotropic sticks of
// unit length at density 2 per unit area (1.27 crossings per stick).
func benchmarkIntersections(b *testing.B, n int) {
	r := rand.New(rand.NewPCG(1, 2))
	side := math.Sqrt(float64(n) / 2)
	segs := make([]Segment, n)
	for i := range segs {
		c := r2.Vec{X: side * r.Float64(), Y: side * r.Float64()}
		s, co := math.Sincos(math.Pi * r.Float64())
		d := r2.Vec{X: co / 2, Y: s / 2}
		segs[i] = Segment{P0: r2.Sub(c, d), P1: r2.Add(c, d)}
	}
	for b.Loop() {
		NewIndex(segs).Intersections()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/trace")
}

func BenchmarkIntersections1e4(b *testing.B) { benchmarkIntersections(b, 1e4) }
func BenchmarkIntersections1e5(b *testing.B) { benchmarkIntersections(b, 1e5) }
