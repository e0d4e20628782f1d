package report

import (
	"bytes"
	"image/png"
	"io"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// fuzzSize is the smallest accepted picture, to keep each fuzz run cheap.
var fuzzSize = Size{Width: MinWidth, Height: MinHeight}

// encodeFast makes the fuzz targets encode without compression: the
// property checked is the drawing's, and deflate would take half the time.
func encodeFast(f *testing.F) {
	saved := pngEncoder
	pngEncoder = &png.Encoder{CompressionLevel: png.NoCompression}
	f.Cleanup(func() { pngEncoder = saved })
}

// checkFuzzOutput requires that a successful write produced a decodable
// PNG of fuzzSize.
func checkFuzzOutput(t *testing.T, err error, buf *bytes.Buffer) {
	t.Helper()
	if err != nil {
		if buf.Len() != 0 {
			t.Fatalf("error %v after writing %d bytes", err, buf.Len())
		}
		return
	}
	cfg, err := png.DecodeConfig(buf)
	if err != nil {
		t.Fatalf("output is not a PNG: %v", err)
	}
	if cfg.Width != fuzzSize.Width || cfg.Height != fuzzSize.Height {
		t.Fatalf("PNG is %d×%d, want %d×%d", cfg.Width, cfg.Height, fuzzSize.Width, fuzzSize.Height)
	}
}

// FuzzMap draws maps from arbitrary numbers: any input must give either an
// error or a valid PNG, never a panic.
func FuzzMap(f *testing.F) {
	encodeFast(f)
	nan, inf := math.NaN(), math.Inf(1)
	f.Add(0.0, 0.0, 100.0, 100.0, 1.0, -1.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(-5.0, 3.0, 5.0, 3.0, nan, 2.0, -10.0, 10.0, -10.0, 10.0)
	f.Add(1e300, -1e300, 1e-300, 0.0, 5.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(0.0, 0.0, 0.0, 0.0, inf, nan, 0.0, 1.0, 0.0, 1.0)
	f.Add(0.0, 0.0, 1.0, 1.0, 0.5, -9.0, 0.0, 0.01, 0.0, 1e7)
	f.Add(1e6, 1e6, -1e6, -1e6, 1e12, 9.5, -1e3, 1e3, -2.0, 2.0)
	f.Fuzz(func(t *testing.T, ax, ay, bx, by, value, mw, minE, maxE, minN, maxN float64) {
		m := &Map{
			Extent:   Extent{MinEast: minE, MaxEast: maxE, MinNorth: minN, MaxNorth: maxN},
			Colour:   ColourScale{Label: "v", Unit: "u"},
			Traces:   []Trace{{A: Point{ax, ay}, B: Point{bx, by}, Value: value}, {A: Point{bx, ay}, B: Point{ax, by}, Value: value / 2}},
			Wells:    []Well{{Name: "W", Path: []Point{{ax, ay}, {bx, by}}}},
			Clusters: []Cluster{{At: Point{(ax + bx) / 2, (ay + by) / 2}, Stage: "S"}},
			Events:   []Event{{At: Point{ax, by}, Magnitude: mw}},
			Outline:  []Polygon{{{{ax, ay}, {bx, ay}, {bx, by}}}},
		}
		var buf bytes.Buffer
		checkFuzzOutput(t, m.WritePNG(&buf, fuzzSize), &buf)
	})
}

// FuzzCharts draws the three charts from arbitrary numbers.
func FuzzCharts(f *testing.F) {
	encodeFast(f)
	f.Add(0.0, 3600.0, 0.0, 1e5, 1e6, 2e6)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(-1e300, 1e300, -1.0, 1e300, math.NaN(), 5.0)
	f.Add(10.0, 5.0, 1.0, 2.0, 3.0, 4.0)
	f.Add(0.0, 1e-300, 1e-300, 2e-300, 3e-300, 4e-300)
	f.Fuzz(func(t *testing.T, t0, t1, a0, a1, a2, p float64) {
		times := []float64{t0, t1}
		g := &Growth{Time: times, Area: []float64{a0, a1}, Pressure: []float64{p, a2}, Stages: []StageMark{{"S", t1}}}
		var buf bytes.Buffer
		checkFuzzOutput(t, g.WritePNG(&buf, fuzzSize), &buf)

		fan := &Fan{Convention: "c", Time: times, P10: []float64{a0, a0}, P50: []float64{a1, a1}, P90: []float64{a2, a2}, Mean: []float64{p, p}}
		buf.Reset()
		checkFuzzOutput(t, fan.WritePNG(&buf, fuzzSize), &buf)

		c := &Comparison{Convention: "c", Categories: []string{"x", "y"}, P10: []float64{a0, a0}, P50: []float64{a1, a1}, P90: []float64{a2, a2}, Mean: []float64{p, p}}
		buf.Reset()
		checkFuzzOutput(t, c.WritePNG(&buf, fuzzSize), &buf)
	})
}

// FuzzScreeningAndRunCharts draws the stereonet, the Mohr diagram, the
// distance–time and magnitude–frequency charts and a cross-section from
// arbitrary numbers: any input must give either an error or a valid PNG,
// never a panic.
func FuzzScreeningAndRunCharts(f *testing.F) {
	encodeFast(f)
	f.Add(1.0, 2.0, 40e6, 25e6, 18e6, 0.6, 600.0, 0.5, -1.5, 0.1)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(math.NaN(), 1e300, -1.0, 1e300, math.Inf(1), 1e-300, -1e300, 1e-300, 9.9, 1e-9)
	f.Add(1.5707963267948966, 7.0, 1e9, 1e9, 1e9, 100.0, 1e15, 1e9, -9.0, 5.0)
	f.Fuzz(func(t *testing.T, dip, dipDir, s1, s2, s3, mu, tm, d, mw, bin float64) {
		pics := []interface{ WritePNG(io.Writer, Size) error }{
			&Stereonet{Planes: []NetPlane{{Dip: dip, DipDirection: dipDir, Value: mu}, {Dip: dip / 2, DipDirection: -dipDir, Value: s1}},
				Axes: []StressAxis{{Name: "S1", Axis: r3.Vec{X: dip, Y: dipDir, Z: 1}}}, Graticule: true},
			&Mohr{Principal: [3]float64{s1, s2, s3}, Friction: mu, Increase: d, Points: []MohrPoint{{SigmaN: s2, Tau: s3, Group: 1}}},
			&DistanceTime{Start: tm / 2, Diffusivities: []float64{d}, Events: []DistanceEvent{{Time: tm, Distance: d, Magnitude: mw}}},
			&MagnitudeFrequency{Magnitudes: []float64{mw, mw + bin, dip}, BinWidth: bin, BValue: mu, BError: d, Completeness: mw},
			&CrossSection{To: Point{dip, dipDir}, HalfWidth: d, Events: []SectionEvent{{At: Point3{s1, s2, s3}, Magnitude: mw}},
				Fractures: []SectionFracture{{Outline: []Point3{{0, 0, s3}, {dip, 0, s3}, {dip, dipDir, s1}}, Value: mu}}},
		}
		for _, p := range pics {
			var buf bytes.Buffer
			checkFuzzOutput(t, p.WritePNG(&buf, fuzzSize), &buf)
		}
	})
}

// FuzzBatchPictures draws the raster maps, the fan panels and the ratio
// distribution from arbitrary numbers.
func FuzzBatchPictures(f *testing.F) {
	encodeFast(f)
	f.Add(0.5, 10.0, 0.0, 0.0, 3600.0, 1e5, 0.8)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(math.NaN(), 1e-300, 1e300, -1e300, math.Inf(-1), -1.0, 1e300)
	f.Fuzz(func(t *testing.T, p, cell, x0, y0, tm, a, ratio float64) {
		g := MapGrid{Cols: 2, Rows: 2, CellSize: cell, XMin: x0, YMin: y0}
		ring := []Point{{x0, y0}, {x0 + cell, y0}, {x0, y0 + cell}}
		pics := []interface{ WritePNG(io.Writer, Size) error }{
			&ProbabilityMap{Grid: g, Probability: []float64{p, 0, 1, p / 2}, Contours: []Contour{{Polygons: []Polygon{{ring}}}}},
			&DifferenceMap{Grid: g, Difference: []float64{p, -p, math.NaN(), 0}},
			&FanPanels{Convention: "c", Cases: []FanCase{{Time: []float64{0, tm}, P10: []float64{0, a / 2}, P50: []float64{0, a}, P90: []float64{0, 2 * a}}}},
			&RatioDistribution{Cases: []RatioSeries{{Ratios: []float64{ratio, 1 / ratio}}}},
		}
		for _, pic := range pics {
			var buf bytes.Buffer
			checkFuzzOutput(t, pic.WritePNG(&buf, fuzzSize), &buf)
		}
	})
}
