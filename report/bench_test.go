package report

import (
	"io"
	"testing"
)

// benchMap draws the demo map with n traces (about a fifth of them
// slipped, each with an event) at the default size and encodes the PNG.
func benchMap(b *testing.B, n int) {
	m := demoMap(n)
	b.ResetTimer()
	for b.Loop() {
		if err := m.WritePNG(io.Discard, Size{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkMap1e3(b *testing.B) { benchMap(b, 1000) }
func BenchmarkMap1e4(b *testing.B) { benchMap(b, 10000) }

// BenchmarkMapRender1e4 excludes the PNG encoding.
func BenchmarkMapRender1e4(b *testing.B) {
	m := demoMap(10000)
	b.ResetTimer()
	for b.Loop() {
		if _, _, err := m.render(Size{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkGrowth(b *testing.B) {
	g := demoGrowth()
	for b.Loop() {
		if err := g.WritePNG(io.Discard, Size{}); err != nil {
			b.Fatal(err)
		}
	}
}
