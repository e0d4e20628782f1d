package report

import (
	"bytes"
	"math"
	"math/rand/v2"
	"testing"

	"slipfront/internal/numtest"
)

// demoDistanceTime returns invented events behind a diffusion front of
// D = 0.5 m²/s from an injection starting at 600 s, and two fronts.
func demoDistanceTime() *DistanceTime {
	rng := rand.New(rand.NewPCG(7, 8))
	d := &DistanceTime{
		Title:         "Demo scenario — event distance from the injection point",
		Start:         600,
		Diffusivities: []float64{0.5, 0.1},
		Stages:        []StageMark{{"Stage 1", 600}},
	}
	for range 300 {
		t := 600 + 4*3600*rng.Float64()
		d.Events = append(d.Events, DistanceEvent{Time: t, Distance: triggeringFront(0.5, 600, t) * rng.Float64(), Magnitude: -2 + 1.5*rng.Float64()})
	}
	return d
}

// TestTriggeringFront checks r = √(4πDt) (Shapiro, Huenges & Borm 1997,
// the triggering front) at one value computed by hand: D = 1 m²/s, t = 1/(4π) s → r = 1 m.
func TestTriggeringFront(t *testing.T) {
	const tol = 1e-15 // One rounding of √.
	numtest.Abs(t, "r", triggeringFront(1, 10, 10+1/(4*math.Pi)), 1, tol)
	numtest.Abs(t, "r before the start", triggeringFront(1, 10, 5), 0, 0)
}

// TestDistanceTimePicture finds each front's colour at its own pixel:
// the front of D = 0.5 m²/s at t − Start = 2 h, and of D = 0.1 m²/s there.
func TestDistanceTimePicture(t *testing.T) {
	d := demoDistanceTime()
	pg, f, err := d.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	tt := d.Start + 2*3600
	for i, D := range d.Diffusivities {
		want := styleOf(i + 1).line.Color.(interface{ RGBA() (r, g, b, a uint32) })
		x, y := f.pixel(tt/secondsPerHour, triggeringFront(D, d.Start, tt))
		// A 2 pt line is 4.4 px wide; a dash gap may fall on the point, so
		// look along a few pixels of the line's neighbourhood.
		found := false
		for dx := -12; dx <= 12 && !found; dx++ {
			for dy := -2; dy <= 2 && !found; dy++ {
				found = near(nrgbaAt(img, int(x)+dx, int(y)+dy), seriesColours[(i+1)%len(seriesColours)], 2)
			}
		}
		if !found {
			t.Errorf("front D = %g m²/s: no pixel of its colour %v near (%.0f, %.0f)", D, want, x, y)
		}
	}
	// The event rings are drawn: translucent blue over white.
	if n := countNear(img, blendOverWhite(colourTimeEvent), 12); n < 500 {
		t.Errorf("%d event-ring pixels, want ≥ 500", n)
	}
}

// Sub-resolution events are blue dots (as on the map) beneath the rings:
// 100 of them add pixels of their colour that the chart without them does
// not have.
func TestDistanceTimeSmallEvents(t *testing.T) {
	dot := blendOverWhite(colourSmallEvent)
	count := func(d *DistanceTime) int {
		t.Helper()
		pg, _, err := d.render(DefaultSize)
		if err != nil {
			t.Fatal(err)
		}
		return countNear(decodeImage(t, pg), dot, 3)
	}
	d := demoDistanceTime()
	without := count(d)
	for k := range 100 {
		tm := d.Start + 3600*(0.2+0.03*float64(k))
		d.SmallEvents = append(d.SmallEvents, DistanceEvent{Time: tm, Distance: 0.5 * triggeringFront(0.5, d.Start, tm), Magnitude: -1.5})
	}
	with := count(d)
	t.Logf("%d pixels of the dots' colour without them, %d with", without, with)
	if with < without+300 {
		t.Errorf("%d pixels of the dots' colour with 100 dots, %d without: want ≥ 300 more (a 1 pt dot covers about 15 px)", with, without)
	}
}

func TestDistanceTimeErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		d    DistanceTime
		want string
	}{
		{"negative distance", DistanceTime{Events: []DistanceEvent{{Distance: -1}}}, "Events[0]"},
		{"NaN small event", DistanceTime{SmallEvents: []DistanceEvent{{Time: math.NaN()}}}, "SmallEvents[0]"},
		{"zero diffusivity", DistanceTime{Diffusivities: []float64{0}}, "Diffusivities[0] = 0"},
		{"NaN start", DistanceTime{Start: math.NaN()}, "Start"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkError(t, func(w *bytes.Buffer) error { return tc.d.WritePNG(w, Size{}) }, tc.want)
		})
	}
	s := Size{Width: 640, Height: 480}
	checkPicture(t, decodePNG(t, &DistanceTime{}, s), s, minInkedFrame, 4)
}

// demoMagnitudes returns n magnitudes from a Gutenberg–Richter law with
// b = 1 above Mc = −1.5 (exponential with rate b·ln 10; Aki 1965), with a
// tail of incomplete small events below Mc, rounded to 0.1.
func demoMagnitudes(n int) []float64 {
	rng := rand.New(rand.NewPCG(9, 10))
	out := make([]float64, 0, n)
	for range n {
		m := -1.5 + rng.ExpFloat64()/math.Ln10
		out = append(out, math.Round(m*10)/10)
	}
	for range n / 10 {
		out = append(out, math.Round((-2.2+0.7*rng.Float64())*10)/10)
	}
	return out
}

func TestMagnitudeCumulative(t *testing.T) {
	m := &MagnitudeFrequency{Magnitudes: []float64{-1.2, -1.0, -1.0, -0.7, 0.3}, BValue: 1, Completeness: -1.2}
	pts := m.cumulative()
	// Bins of 0.1 from −1.2 to 0.3: 16 points; N(≥ −1.2) = 5, N(≥ −1.0) =
	// 4, N(≥ −0.9) = 2, N(≥ −0.7) = 2, N(≥ −0.6) = 1, N(≥ 0.3) = 1.
	if len(pts) != 16 {
		t.Fatalf("%d points, want 16", len(pts))
	}
	for _, c := range []struct {
		i    int
		m, n float64
	}{{0, -1.2, 5}, {1, -1.1, 4}, {2, -1.0, 4}, {3, -0.9, 2}, {5, -0.7, 2}, {6, -0.6, 1}, {15, 0.3, 1}} {
		numtest.Abs(t, "bin magnitude", pts[c.i].X, c.m, 1e-12)
		if pts[c.i].Y != c.n {
			t.Errorf("N(≥ %g) = %g, want %g", c.m, pts[c.i].Y, c.n)
		}
	}
	if n := countAt(pts, -1.0, 0.1); n != 4 {
		t.Errorf("count at Mc = −1.0: %g, want 4", n)
	}
}

// TestMagnitudeFrequencyPicture: the cumulative counts are blue markers
// at their (M, N) pixels, and the Gutenberg–Richter line passes through
// its own pixel half a unit above Mc.
func TestMagnitudeFrequencyPicture(t *testing.T) {
	m := &MagnitudeFrequency{Title: "Demo — magnitude–frequency", Magnitudes: demoMagnitudes(2000), BValue: 1.0, BError: 0.02, Completeness: -1.5}
	pg, f, err := m.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	pts := m.cumulative()
	hits := 0
	for _, q := range pts {
		x, y := f.pixel(q.X, q.Y)
		if near(nrgbaAt(img, int(x), int(y)), okabeBlue, 2) {
			hits++
		}
	}
	// The red line crosses some markers; most centres are blue.
	if len(pts) == 0 || hits < len(pts)*3/4 {
		t.Errorf("%d of %d cumulative-count markers are blue at their centres", hits, len(pts))
	}
	nc := countAt(pts, m.Completeness, 0.1)
	mm := m.Completeness + 0.5
	x, y := f.pixel(mm, nc*math.Pow(10, -m.BValue*0.5))
	if d := darkest(img, int(x), int(y)); !near(d, okabeVermillion, 40) {
		t.Errorf("Gutenberg–Richter line at M = %g: pixel %v, want near %v", mm, d, okabeVermillion)
	}
}

func TestMagnitudeFrequencyErrors(t *testing.T) {
	ok := func() MagnitudeFrequency {
		return MagnitudeFrequency{Magnitudes: []float64{-1, 0}, BValue: 1, BError: 0.1, Completeness: -1}
	}
	for _, tc := range []struct {
		name string
		edit func(m *MagnitudeFrequency)
		want string
	}{
		{"no magnitudes", func(m *MagnitudeFrequency) { m.Magnitudes = nil }, "no magnitudes"},
		{"NaN magnitude", func(m *MagnitudeFrequency) { m.Magnitudes[1] = math.NaN() }, "Magnitudes[1]"},
		{"zero b", func(m *MagnitudeFrequency) { m.BValue = 0 }, "b = 0"},
		{"negative error", func(m *MagnitudeFrequency) { m.BError = -1 }, "error ≥ 0"},
		{"tiny bins", func(m *MagnitudeFrequency) { m.BinWidth = 1e-9 }, "BinWidth"},
		{"NaN Mc", func(m *MagnitudeFrequency) { m.Completeness = math.NaN() }, "Completeness"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := ok()
			tc.edit(&m)
			checkError(t, func(w *bytes.Buffer) error { return m.WritePNG(w, Size{}) }, tc.want)
		})
	}
	// One event, Mc above it: no line, still a chart.
	s := Size{Width: 640, Height: 480}
	one := MagnitudeFrequency{Magnitudes: []float64{-1}, BValue: 1, Completeness: 0}
	checkPicture(t, decodePNG(t, &one, s), s, minInkedFrame, 4)
}

// demoSection returns a horizontal well at 2600 m from (−600, 0) to
// (600, 0), fractures as vertical squares across it and events near it.
func demoSection() *CrossSection {
	x := &CrossSection{
		Title:     "Demo scenario — section along the well",
		From:      Point{-600, 0},
		To:        Point{600, 0},
		HalfWidth: 100,
		Wells:     []SectionWell{{Name: "Well A", Path: []Point3{{-600, 0, 2600}, {600, 0, 2600}}}},
		Colour:    ColourScale{Label: "Max slip", Unit: "mm", Min: 0, Max: 2},
		LayerTop:  2570, LayerBottom: 2630,
	}
	for k := range 8 {
		e := -500 + 140*float64(k)
		// A fracture striking N–S, vertical, 60 m wide and 40 m high.
		x.Fractures = append(x.Fractures, SectionFracture{
			Outline: []Point3{{e, -30, 2580}, {e, 30, 2580}, {e, 30, 2620}, {e, -30, 2620}},
			Value:   float64(k) / 4,
		})
		x.Events = append(x.Events, SectionEvent{At: Point3{e, 10, 2600 + 5*float64(k%3)}, Magnitude: -1.5 + 0.2*float64(k)})
	}
	// One far away: left out by HalfWidth.
	x.Events = append(x.Events, SectionEvent{At: Point3{0, 500, 2600}, Magnitude: 0})
	return x
}

func TestSectionProjection(t *testing.T) {
	// Section from (0, 0) to (3, 4): u = (0.6, 0.8); the point (4, 3) lies
	// 4·0.6 + 3·0.8 = 4.8 m along and 4·0.8 − 3·0.6 = 1.4 m off (to the
	// right of the direction of travel).
	x := &CrossSection{From: Point{0, 0}, To: Point{3, 4}}
	along, off := x.project(Point3{East: 4, North: 3, Depth: 100})
	const tol = 1e-12 // A few roundings of numbers of size 5.
	numtest.Abs(t, "along", along, 4.8, tol)
	numtest.Abs(t, "off", off, 1.4, tol)

	s := demoSection()
	sp := s.content()
	if len(sp.fractures) != 8 || len(sp.events) != 8 {
		t.Errorf("%d fractures and %d events kept, want 8 and 8 (one event 500 m off the plane left out)", len(sp.fractures), len(sp.events))
	}
	// A fracture crossing the plane is kept even when no vertex is near.
	s.HalfWidth = 1
	if n := len(s.content().fractures); n != 8 {
		t.Errorf("%d fractures kept with a 1 m half-width, want all 8 (they cross the plane)", n)
	}
}

// TestSectionPicture: each fracture's outline is drawn in its colour at
// the pixel of its projected edge, and depth grows downwards.
func TestSectionPicture(t *testing.T) {
	x := demoSection()
	pg, f, err := x.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	_, yTop := f.pixel(0, 2580)
	_, yBase := f.pixel(0, 2620)
	if !(yBase > yTop) {
		t.Errorf("depth 2620 m at pixel row %.0f is not below 2580 m at %.0f", yBase, yTop)
	}
	for k, fr := range x.Fractures {
		// The top edge at mid-height between the fracture's two ends seen
		// edge-on: a vertical N–S square projects to a vertical segment.
		along, _ := x.project(fr.Outline[0])
		px, py := f.pixel(along, 2600)
		if d := darkest(img, int(px), int(py)); !near(d, Viridis(fr.Value/2), 40) && !near(d, colourWell, 40) {
			t.Errorf("fracture %d at pixel (%.0f, %.0f): %v, want its colour %v", k, px, py, d, Viridis(fr.Value/2))
		}
	}
}

func TestSectionErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		x    CrossSection
		want string
	}{
		{"same ends", CrossSection{}, "two distinct ends"},
		{"short well", CrossSection{To: Point{1, 0}, Wells: []SectionWell{{Path: []Point3{{}}}}}, "Wells[0] has 1 points"},
		{"short outline", CrossSection{To: Point{1, 0}, Fractures: []SectionFracture{{Outline: []Point3{{}, {}}}}}, "Fractures[0] has 2 points"},
		{"NaN event", CrossSection{To: Point{1, 0}, Events: []SectionEvent{{At: Point3{Depth: math.NaN()}}}}, "Events[0]"},
		{"negative half-width", CrossSection{To: Point{1, 0}, HalfWidth: -1}, "HalfWidth"},
		{"inverted layer", CrossSection{To: Point{1, 0}, LayerTop: 10, LayerBottom: 5}, "top ≤ bottom"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkError(t, func(w *bytes.Buffer) error { return tc.x.WritePNG(w, Size{}) }, tc.want)
		})
	}
	s := Size{Width: 640, Height: 480}
	checkPicture(t, decodePNG(t, &CrossSection{To: Point{100, 0}}, s), s, minInkedFrame, 4)
}
