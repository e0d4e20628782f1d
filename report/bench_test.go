package report

import (
	"io"
	"math"
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

// benchStereonet draws n poles with the graticule and encodes the PNG.
func benchStereonet(b *testing.B, n int) {
	net := demoStereonet(n)
	b.ResetTimer()
	for b.Loop() {
		if err := net.WritePNG(io.Discard, Size{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkStereonet1e3(b *testing.B) { benchStereonet(b, 1000) }
func BenchmarkStereonet1e4(b *testing.B) { benchStereonet(b, 10000) }

// benchProbabilityMap draws a probability map of a cols × rows grid with
// three contours.
func benchProbabilityMap(b *testing.B, cols, rows int) {
	m := demoProbabilityMap()
	g := MapGrid{Cols: cols, Rows: rows, CellSize: 1500 / float64(cols), XMin: -750, YMin: -500}
	m.Grid, m.Probability = g, make([]float64, cols*rows)
	for j := range rows {
		for i := range cols {
			x, y := (float64(i)/float64(cols)-0.5)*3, (float64(j)/float64(rows)-0.5)*3
			m.Probability[j*cols+i] = math.Round(20*math.Exp(-(x*x+y*y))) / 20
		}
	}
	b.ResetTimer()
	for b.Loop() {
		if err := m.WritePNG(io.Discard, Size{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkProbabilityMap150x100(b *testing.B) { benchProbabilityMap(b, 150, 100) }
func BenchmarkProbabilityMap600x400(b *testing.B) { benchProbabilityMap(b, 600, 400) }
