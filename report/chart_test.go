package report

import (
	"bytes"
	"image/color"
	"math"
	"strings"
	"testing"
)

// Pixel-count thresholds for the charts at 1600 × 1200 px (160 dpi, so one
// point is 2.2 px).
const (
	minInkedChart = 0.02
	minColours    = 16
	// A 2 pt line (4.4 px) across most of a 1400 px data area covers
	// thousands of pixels fully; 1000 leaves a wide margin.
	minLinePixels = 1000
)

// blendOverWhite returns c (non-premultiplied alpha) composited over white,
// the colour of a translucent fill on the background.
func blendOverWhite(c color.NRGBA) color.NRGBA {
	a := float64(c.A) / 255
	mix := func(v uint8) uint8 { return uint8(math.Round(255 + a*(float64(v)-255))) }
	return color.NRGBA{mix(c.R), mix(c.G), mix(c.B), 255}
}

func TestGrowthPicture(t *testing.T) {
	g := demoGrowth()
	img := decodePNG(t, g, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	if n := countNear(img, okabeBlue, 0); n < minLinePixels {
		t.Errorf("%d pixels of the area line colour, want ≥ %d", n, minLinePixels)
	}
	// Stage lines and names are drawn in greyGuide; antialiased black text
	// yields a few pixels of that grey too, so compare with a chart
	// without stages. Four dashed lines over two panels (≈ 1000 px long,
	// 1 pt = 2.2 px wide, 4/7 inked) give thousands of pixels.
	noStages := demoGrowth()
	noStages.Stages = nil
	with, without := countNear(img, greyGuide, 0), countNear(decodePNG(t, noStages, DefaultSize), greyGuide, 0)
	if with < without+1000 {
		t.Errorf("stage-line pixels: %d with stages, %d without: want at least 1000 more", with, without)
	}
	// The pressure panel adds a black line, an axis and labels.
	noPressure := demoGrowth()
	noPressure.Pressure = nil
	black := color.NRGBA{0, 0, 0, 255}
	with, without = countNear(img, black, 0), countNear(decodePNG(t, noPressure, DefaultSize), black, 0)
	if with <= without+minLinePixels {
		t.Errorf("black pixels with the pressure panel %d, without %d: want at least %d more", with, without, minLinePixels)
	}
}

// TestGrowthDegenerate draws valid but degenerate series and checks that
// the area series is drawn where its data are, in fractions of the data
// area: the time axis spans the data (or one hour about a single time) and
// the area axis runs from zero (or the smallest value when negative) to
// 12 % above the largest value (or to 1.12 when all are equal).
func TestGrowthDegenerate(t *testing.T) {
	for _, tc := range []struct {
		name   string
		g      Growth
		probes []probe
	}{
		// 10⁴ m² draws as 10 in units of 10³ m²: a marker at 10/11.2.
		{"one time", Growth{Time: []float64{3600}, Area: []float64{1e4}},
			[]probe{{fx: 0.5, fy: 10 / 11.2, colour: okabeBlue}}},
		{"one time with pressure", Growth{Time: []float64{0}, Area: []float64{0}, Pressure: []float64{30e6}},
			[]probe{{fx: 0.5, fy: 0, colour: okabeBlue}}},
		{"all zero", Growth{Time: []float64{0, 60, 120}, Area: []float64{0, 0, 0}},
			[]probe{{fx: 0.1, fy: 0, colour: okabeBlue}, {fx: 0.5, fy: 0, colour: okabeBlue}, {fx: 0.9, fy: 0, colour: okabeBlue}}},
		// (0, 0) → (½, 1) → (½, 2) → (1, 3) on an axis to 3.36.
		{"repeated times", Growth{Time: []float64{0, 60, 60, 120}, Area: []float64{0, 1, 2, 3}},
			[]probe{{fx: 0.25, fy: 0.5 / 3.36, colour: okabeBlue}, {fx: 0.5, fy: 1.5 / 3.36, colour: okabeBlue}, {fx: 0.75, fy: 2.5 / 3.36, colour: okabeBlue}}},
		{"stages outside", Growth{Time: []float64{0, 60}, Area: []float64{0, 1}, Stages: []StageMark{{"early", -1e9}, {"late", 1e9}}},
			[]probe{{fx: 0.5, fy: 0.5 / 1.12, colour: okabeBlue}}},
		// The axis runs from −5 to 1 + 0.12·6 = 1.72: (0, 0) → (1, 6/6.72).
		{"negative area", Growth{Time: []float64{0, 60}, Area: []float64{-5, 1}},
			[]probe{{fx: 0.5, fy: 3 / 6.72, colour: okabeBlue}}},
		{"huge times", Growth{Time: []float64{0, 1e15}, Area: []float64{0, 1e12}},
			[]probe{{fx: 0.5, fy: 0.5 / 1.12, colour: okabeBlue}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			img := decodePNG(t, &tc.g, DefaultSize)
			checkPicture(t, img, DefaultSize, minInkedFrame, 4)
			checkProbes(t, img, findImageFrame(t, img, DefaultSize).at, tc.probes)
		})
	}
}

func TestGrowthErrors(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name string
		g    Growth
		want string
	}{
		{"no times", Growth{}, "no times"},
		{"short area", Growth{Time: []float64{0, 1}, Area: []float64{0}}, "Area has 1 values for 2 times"},
		{"decreasing", Growth{Time: []float64{0, 10, 5}, Area: []float64{0, 1, 2}}, "Time[2] = 5 s is before"},
		{"NaN time", Growth{Time: []float64{nan}, Area: []float64{0}}, "Time[0]"},
		{"NaN area", Growth{Time: []float64{0, 1}, Area: []float64{0, nan}}, "Area[1]"},
		{"infinite pressure", Growth{Time: []float64{0}, Area: []float64{0}, Pressure: []float64{math.Inf(1)}}, "Pressure[0]"},
		{"short pressure", Growth{Time: []float64{0, 1}, Area: []float64{0, 1}, Pressure: []float64{}}, "Pressure has 0 values"},
		{"NaN stage", Growth{Time: []float64{0}, Area: []float64{0}, Stages: []StageMark{{"S1", nan}}}, "Stages[0]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkError(t, func(w *bytes.Buffer) error { return tc.g.WritePNG(w, Size{}) }, tc.want)
		})
	}
}

// checkError fails unless write returns an error with the package prefix
// and want, having written nothing.
func checkError(t *testing.T, write func(w *bytes.Buffer) error, want string) {
	t.Helper()
	var buf bytes.Buffer
	err := write(&buf)
	if err == nil {
		t.Fatalf("no error, want one containing %q", want)
	}
	if !strings.HasPrefix(err.Error(), "report: ") || !strings.Contains(err.Error(), want) {
		t.Errorf("error %q: want the prefix \"report: \" and %q", err, want)
	}
	if buf.Len() != 0 {
		t.Errorf("%d bytes written despite the error", buf.Len())
	}
}

func TestFanPicture(t *testing.T) {
	img := decodePNG(t, demoFan(), DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	// The P10–P90 band fills about a third of the data area in the demo;
	// its translucent colour over white must cover at least a tenth of the
	// picture. bandTol: 8-bit rounding of alpha compositing.
	const bandTol = 2
	band := blendOverWhite(colourBand)
	total := DefaultSize.Width * DefaultSize.Height
	if n := countNear(img, band, bandTol); n < total/10 {
		t.Errorf("%d band pixels (%v), want ≥ %d", n, band, total/10)
	}
	if n := countNear(img, okabeBlue, 0); n < minLinePixels {
		t.Errorf("%d median-line pixels, want ≥ %d", n, minLinePixels)
	}
}

// TestFanDegenerate checks that the median of degenerate fans is drawn
// where its data are (axes as in TestGrowthDegenerate, the area axis to
// 12 % above the largest P90).
func TestFanDegenerate(t *testing.T) {
	conv := "P10/P50/P90 of 3 realizations"
	for _, tc := range []struct {
		name   string
		f      Fan
		probes []probe
	}{
		{"one time", Fan{Convention: conv, Time: []float64{0}, P10: []float64{1}, P50: []float64{2}, P90: []float64{3}},
			[]probe{{fx: 0.5, fy: 2 / 3.36, colour: okabeBlue}}},
		{"no spread", Fan{Convention: conv, Time: []float64{0, 1}, P10: []float64{2, 2}, P50: []float64{2, 2}, P90: []float64{2, 2}},
			[]probe{{fx: 0.2, fy: 2 / 2.24, colour: okabeBlue}, {fx: 0.8, fy: 2 / 2.24, colour: okabeBlue}}},
		// The dashed mean (6 pt on, 3 pt off: a 20 px period at 160 dpi)
		// lies over the median, which shows in the gaps: a 17 px window
		// always holds part of one.
		{"all zero with mean", Fan{Convention: conv, Time: []float64{0, 1}, P10: []float64{0, 0}, P50: []float64{0, 0}, P90: []float64{0, 0}, Mean: []float64{0, 0}},
			[]probe{{fx: 0.2, fy: 0, colour: okabeBlue, r: 8}, {fx: 0.8, fy: 0, colour: okabeBlue, r: 8}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			img := decodePNG(t, &tc.f, DefaultSize)
			checkPicture(t, img, DefaultSize, minInkedFrame, 4)
			checkProbes(t, img, findImageFrame(t, img, DefaultSize).at, tc.probes)
		})
	}
}

func TestFanErrors(t *testing.T) {
	ok := func() Fan {
		return Fan{Convention: "c", Time: []float64{0, 1}, P10: []float64{0, 1}, P50: []float64{0, 2}, P90: []float64{0, 3}}
	}
	for _, tc := range []struct {
		name string
		edit func(f *Fan)
		want string
	}{
		{"no convention", func(f *Fan) { f.Convention = "" }, "Convention"},
		{"no times", func(f *Fan) { f.Time = nil }, "no times"},
		{"short P50", func(f *Fan) { f.P50 = f.P50[:1] }, "P50 has 1 values"},
		{"unordered", func(f *Fan) { f.P10[1] = 2.5 }, "P10 ≤ P50 ≤ P90"},
		{"P90 below P50", func(f *Fan) { f.P90[1] = 1.5 }, "at Time[1]"},
		{"NaN mean", func(f *Fan) { f.Mean = []float64{0, math.NaN()} }, "Mean[1]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f := ok()
			tc.edit(&f)
			checkError(t, func(w *bytes.Buffer) error { return f.WritePNG(w, Size{}) }, tc.want)
		})
	}
}

func TestComparisonPicture(t *testing.T) {
	c := demoComparison()
	img := decodePNG(t, c, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart/2, minColours)
	// Three filled P50 circles of radius 5 pt (11 px): ≈ 380 px each.
	if n := countNear(img, okabeBlue, 0); n < 600 {
		t.Errorf("%d median-marker pixels, want ≥ 600", n)
	}
	if n := countNear(img, okabeVermillion, 0); n < 50 {
		t.Errorf("%d mean-marker pixels, want ≥ 50", n)
	}
	c.Mean = nil
	if n := countNear(decodePNG(t, c, DefaultSize), okabeVermillion, 0); n != 0 {
		t.Errorf("%d mean-marker pixels without a mean, want 0", n)
	}
}

// TestComparisonDegenerate: one category whose percentiles are all zero
// draws its median marker at the bottom of the area axis, in the middle of
// the category axis (which is padded equally on both sides).
func TestComparisonDegenerate(t *testing.T) {
	c := Comparison{Convention: "c", Categories: []string{"only"}, P10: []float64{0}, P50: []float64{0}, P90: []float64{0}}
	img := decodePNG(t, &c, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedFrame, 4)
	checkProbes(t, img, findImageFrame(t, img, DefaultSize).at, []probe{{fx: 0.5, fy: 0, colour: okabeBlue}})
}

func TestComparisonErrors(t *testing.T) {
	ok := func() Comparison {
		return Comparison{Convention: "c", Categories: []string{"a", "b"}, P10: []float64{1, 1}, P50: []float64{2, 2}, P90: []float64{3, 3}}
	}
	for _, tc := range []struct {
		name string
		edit func(c *Comparison)
		want string
	}{
		{"no convention", func(c *Comparison) { c.Convention = "" }, "Convention"},
		{"no categories", func(c *Comparison) { c.Categories = nil }, "no categories"},
		{"short P90", func(c *Comparison) { c.P90 = c.P90[:1] }, "P90 has 1 values for 2 categories"},
		{"unordered", func(c *Comparison) { c.P50[1] = 4 }, `of "b"`},
		{"infinite", func(c *Comparison) { c.P10[0] = math.Inf(-1) }, "P10[0]"},
		{"short mean", func(c *Comparison) { c.Mean = []float64{1} }, "Mean has 1 values"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := ok()
			tc.edit(&c)
			checkError(t, func(w *bytes.Buffer) error { return c.WritePNG(w, Size{}) }, tc.want)
		})
	}
}
