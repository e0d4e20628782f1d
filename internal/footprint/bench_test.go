package footprint

import (
	"math/rand/v2"
	"testing"
)

// benchArea times Area on n DFN-like segments (network: two sets).
func benchArea(b *testing.B, n int) {
	segs := network(rand.New(rand.NewPCG(7, 8)), n)
	b.ResetTimer()
	for b.Loop() {
		if _, err := Area(segs, 5); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkArea1e3(b *testing.B) { benchArea(b, 1_000) }
func BenchmarkArea1e4(b *testing.B) { benchArea(b, 10_000) }
func BenchmarkArea1e5(b *testing.B) { benchArea(b, 100_000) }
