package footprint

import (
	"math/rand/v2"
	"testing"

	"slipfront/dfn"
)

// benchRadius is the benchmarks' r, m: about half the mean trace spacing
// of the network (a trace density of 25 m per 225 m², spacing ≈ 9 m).
const benchRadius = 5.0

// bench times run on n DFN-like segments (network: two sets).
func bench(b *testing.B, n int, run func(segs []dfn.Segment) error) {
	segs := network(rand.New(rand.NewPCG(7, 8)), n)
	b.ResetTimer()
	for b.Loop() {
		if err := run(segs); err != nil {
			b.Fatal(err)
		}
	}
}

func area(segs []dfn.Segment) error {
	_, err := Area(segs, benchRadius)
	return err
}

func outline(segs []dfn.Segment) error {
	_, err := Outline(segs, benchRadius, OutlineOptions{})
	return err
}

func BenchmarkArea1e3(b *testing.B)    { bench(b, 1_000, area) }
func BenchmarkArea1e4(b *testing.B)    { bench(b, 10_000, area) }
func BenchmarkArea1e5(b *testing.B)    { bench(b, 100_000, area) }
func BenchmarkOutline1e3(b *testing.B) { bench(b, 1_000, outline) }
func BenchmarkOutline1e4(b *testing.B) { bench(b, 10_000, outline) }
func BenchmarkOutline1e5(b *testing.B) { bench(b, 100_000, outline) }

func envelope(segs []dfn.Segment) error {
	_, _, err := EnvelopeArea(segs, benchRadius)
	return err
}

func BenchmarkEnvelope1e4(b *testing.B) { bench(b, 10_000, envelope) }
func BenchmarkEnvelope1e5(b *testing.B) { bench(b, 100_000, envelope) }
