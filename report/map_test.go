package report

import (
	"bytes"
	"image"
	"image/color"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"slipfront/internal/numtest"
)

// Pixel-statistics thresholds for "not blank". A frame with axes, title
// and notes alone inks about 1 % of a 1600 × 1200 picture; a map full of
// traces well over 5 %.
const (
	minInkedMap   = 0.05
	minColoursMap = 64 // Viridis shades plus antialiasing.
	minInkedFrame = 0.004
)

func TestMapPicture(t *testing.T) {
	for _, s := range []Size{{}, {Width: 640, Height: 900}} {
		img := decodePNG(t, demoMap(400), s)
		want := s
		if want == (Size{}) {
			want = DefaultSize
		}
		checkPicture(t, img, want, minInkedMap, minColoursMap)
	}
}

// renderDecoded renders m, encodes and decodes the PNG, and returns the
// decoded image with the frame that locates map points on it.
func renderDecoded(t *testing.T, m *Map, s Size) (image.Image, mapFrame) {
	t.Helper()
	pg, f, err := m.render(s)
	if err != nil {
		t.Fatalf("render: %v", err)
	}
	return decodeImage(t, pg), f
}

// sample is one pixel of an image.
type sample struct {
	x, y int
	c    color.NRGBA
}

// sampleAlong returns the pixels under n points spread along the middle
// 60 % of the segment ab.
func sampleAlong(img image.Image, f mapFrame, a, b Point, n int) []sample {
	out := make([]sample, n)
	for i := range n {
		s := 0.2 + 0.6*float64(i)/float64(n-1)
		px, py := f.pixel(Point{a.East + s*(b.East-a.East), a.North + s*(b.North-a.North)})
		x, y := int(math.Floor(px)), int(math.Floor(py))
		out[i] = sample{x, y, nrgbaAt(img, x, y)}
	}
	return out
}

// TestMapTraceColours draws three isolated traces — value at the bottom,
// middle and top of the colour range — and one without a value, and checks
// the pixels under each trace's centre line: the trace's viridis colour, or
// grey. This checks the whole chain: value → colour → data-to-pixel
// transform → PNG.
func TestMapTraceColours(t *testing.T) {
	m := &Map{
		Extent: Extent{MinEast: 0, MaxEast: 1000, MinNorth: 0, MaxNorth: 1000},
		Colour: ColourScale{Label: "First slip time", Unit: "h", Min: 0, Max: 10},
		Traces: []Trace{
			{A: Point{200, 150}, B: Point{800, 250}, Value: 0},
			{A: Point{200, 400}, B: Point{800, 500}, Value: 5},
			{A: Point{200, 650}, B: Point{800, 750}, Value: 10},
			{A: Point{300, 850}, B: Point{700, 950}, Value: math.NaN()},
		},
	}
	img, f := renderDecoded(t, m, DefaultSize)
	// colourTol: 8-bit rounding of the interpolated colour and of the
	// renderer's coverage at the line centre (a 1.6 pt line is 3.6 px wide
	// at 160 dpi, so the centre pixel is fully covered).
	const colourTol = 2
	// minShare: a few samples may fall on the edge pixel of the line when
	// its centre lies on a pixel boundary.
	const minShare = 0.9
	for i, tr := range m.Traces {
		want := greyNoValue
		if !math.IsNaN(tr.Value) {
			want = Viridis(tr.Value / 10)
		}
		samples := sampleAlong(img, f, tr.A, tr.B, 50)
		hits := 0
		for _, s := range samples {
			if math.IsNaN(tr.Value) {
				// A 0.7 pt grey line is 1.6 px wide: no pixel need be fully
				// covered, so look for the darkest of the 3 × 3 pixels
				// around the centre line and require a neutral grey between
				// the line's grey and white.
				s.c = darkest(img, s.x, s.y)
				if isNeutral(s.c) && s.c.R >= want.R-colourTol && s.c.R <= 235 {
					hits++
				}
				continue
			}
			if near(s.c, want, colourTol) {
				hits++
			} else if testing.Verbose() {
				t.Logf("trace %d pixel (%d, %d) = %v, want %v", i, s.x, s.y, s.c, want)
			}
		}
		if share := float64(hits) / float64(len(samples)); share < minShare {
			t.Errorf("trace %d (value %g): %.0f %% of centre-line pixels have the expected colour %v, want ≥ %.0f %%",
				i, tr.Value, 100*share, want, 100*minShare)
		}
	}
}

// TestMapEqualAspect checks that one metre is as long east as north.
func TestMapEqualAspect(t *testing.T) {
	for _, e := range []Extent{
		{MinEast: -1000, MaxEast: 1000, MinNorth: -700, MaxNorth: 700},
		{MinEast: 0, MaxEast: 5000, MinNorth: 0, MaxNorth: 300},  // Wide.
		{MinEast: 0, MaxEast: 200, MinNorth: -3000, MaxNorth: 0}, // Tall.
	} {
		m := demoMap(50)
		m.Extent = e
		_, f, err := m.render(Size{Width: 900, Height: 700})
		if err != nil {
			t.Fatal(err)
		}
		x0, y0 := f.pixel(Point{0, 0})
		x1, _ := f.pixel(Point{100, 0})
		_, y1 := f.pixel(Point{0, 100})
		// aspectTol: equalAspect trims the frame to an exact match; what is
		// left is float round-off.
		const aspectTol = 1e-9
		numtest.Rel(t, "pixels per 100 m north vs east", y0-y1, x1-x0, aspectTol)
		// The requested extent must be shown whole.
		if f.minE > e.MinEast+1e-9 || f.maxE < e.MaxEast-1e-9 || f.minN > e.MinNorth+1e-9 || f.maxN < e.MaxNorth-1e-9 {
			t.Errorf("shown [%g, %g] × [%g, %g] does not contain the extent %+v", f.minE, f.maxE, f.minN, f.maxN, e)
		}
	}
}

// TestMapAllNaN: no trace has a value, so no colour bar is drawn; the
// colour bar's yellow end (viridis at 1) must then appear nowhere, while it
// does appear when values exist.
func TestMapAllNaN(t *testing.T) {
	yellow := Viridis(1)
	withValues := decodePNG(t, demoMap(200), DefaultSize)
	if n := countNear(withValues, yellow, 1); n == 0 {
		t.Fatal("the viridis end colour is missing from a map with values: the check below would prove nothing")
	}
	m := demoMap(200)
	for i := range m.Traces {
		m.Traces[i].Value = math.NaN()
	}
	img := decodePNG(t, m, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedFrame, 16)
	if n := countNear(img, yellow, 1); n != 0 {
		t.Errorf("%d pixels in the viridis end colour on a map without values", n)
	}
	if n := countNear(img, greyNoValue, 0); n == 0 {
		t.Error("no grey trace pixels on a map whose traces have no value")
	}
}

// TestMapDegenerate draws valid but sparse maps and checks that each
// feature is drawn where it is, in its colour (probes in map coordinates):
// a trace of the only value in the middle colour of viridis (the colour
// range is one unit about it), wells in their near-black, outlines in
// vermilion, an event as a light grey ring of 3.75 pt (8.3 px at 160 dpi;
// the mean of the event radii, mapdraw.go) about its epicentre; and nothing
// where nothing lies.
func TestMapDegenerate(t *testing.T) {
	ext := Extent{MinEast: 0, MaxEast: 100, MinNorth: 0, MaxNorth: 100}
	mid := Viridis(0.5)
	ring := color.NRGBA{162, 162, 162, 255} // colourEvent (96 grey at alpha 150) over white.
	const ringRadius = 8                    // Pixels: 3.75 pt at 160 dpi is 8.3 px.
	for _, tc := range []struct {
		name   string
		m      Map
		probes []probe
	}{
		{"empty with extent", Map{Extent: ext}, []probe{{fx: 50, fy: 50, colour: white}}},
		{"no traces", Map{Extent: ext, Wells: []Well{{Name: "W", Path: []Point{{10, 50}, {90, 50}}}}},
			[]probe{{fx: 30, fy: 50, colour: colourWell}, {fx: 70, fy: 50, colour: colourWell}}},
		{"no events", Map{Traces: []Trace{{A: Point{0, 0}, B: Point{10, 10}, Value: 1}}},
			[]probe{{fx: 5, fy: 5, colour: mid}}},
		{"one value", Map{Traces: []Trace{{A: Point{0, 0}, B: Point{10, 10}, Value: 3}, {A: Point{5, 0}, B: Point{5, 10}, Value: 3}}},
			[]probe{{fx: 2, fy: 2, colour: mid}, {fx: 5, fy: 8, colour: mid}}},
		{"single point fitted", Map{Events: []Event{{At: Point{3, 4}, Magnitude: -1}}},
			[]probe{{fx: 3, fy: 4, colour: white}, {fx: 3, fy: 4, colour: ring, r: ringRadius + 2}}},
		{"sub-resolution event", Map{Extent: ext, SmallEvents: []Point{{30, 40}}},
			// colourSmallEvent (0, 114, 178) at alpha 200 over white.
			[]probe{{fx: 30, fy: 40, colour: color.NRGBA{55, 144, 195, 255}}, {fx: 60, fy: 40, colour: color.NRGBA{55, 144, 195, 255}, absent: true}}},
		{"vertical well", Map{Wells: []Well{{Name: "V", Path: []Point{{0, 0}}}}},
			[]probe{{fx: 0, fy: 0, colour: colourWell}}},
		{"features outside", Map{Extent: ext, Traces: []Trace{{A: Point{-500, -500}, B: Point{-400, 900}, Value: 1}},
			Events: []Event{{At: Point{1e6, 0}, Magnitude: 0}}, Wells: []Well{{Name: "far", Path: []Point{{-1e5, 0}, {-2e5, 0}}}},
			Clusters: []Cluster{{At: Point{-900, 0}, Stage: "S"}}, Outline: []Polygon{{{{-10, -10}, {-5, -10}, {-5, -5}}}}},
			[]probe{{fx: 50, fy: 50, colour: white}, {fx: 3, fy: 50, colour: mid, absent: true}, {fx: 3, fy: 3, colour: okabeVermillion, absent: true}}},
		{"trace through", Map{Extent: ext, Traces: []Trace{{A: Point{-1e6, 50}, B: Point{1e6, 50}, Value: 1}}},
			[]probe{{fx: 5, fy: 50, colour: mid}, {fx: 50, fy: 50, colour: mid}, {fx: 95, fy: 50, colour: mid}}},
		// The dashes (6 pt on, 3 pt off) leave gaps of 7 px: a 17 px
		// window always holds part of a dash.
		{"outline with hole", Map{Outline: []Polygon{{{{0, 0}, {100, 0}, {100, 100}, {0, 100}}, {{40, 40}, {60, 40}, {60, 60}}}}},
			[]probe{{fx: 50, fy: 40, colour: okabeVermillion, r: 8}, {fx: 60, fy: 50, colour: okabeVermillion, r: 8}, {fx: 50, fy: 30, colour: white}}},
		// A point has no length to stroke: nothing is drawn.
		{"zero-length trace", Map{Extent: ext, Traces: []Trace{{A: Point{50, 50}, B: Point{50, 50}, Value: 1}}},
			[]probe{{fx: 50, fy: 50, colour: mid, absent: true}}},
		{"tiny extent", Map{Extent: Extent{0, 0.02, 0, 0.02}, Traces: []Trace{{A: Point{0, 0}, B: Point{0.01, 0.01}, Value: 1}}},
			[]probe{{fx: 0.005, fy: 0.005, colour: mid}}},
		{"huge extent", Map{Extent: Extent{-5e6, 5e6, -5e6, 5e6}, Traces: []Trace{{A: Point{0, 0}, B: Point{1e6, 1e6}, Value: 1}}},
			[]probe{{fx: 5e5, fy: 5e5, colour: mid}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			img, f := renderDecoded(t, &tc.m, DefaultSize)
			checkPicture(t, img, DefaultSize, minInkedFrame, 4)
			checkProbes(t, img, func(e, n float64) (x, y float64) { return f.pixel(Point{e, n}) }, tc.probes)
		})
	}
}

// TestMapErrors: bad input returns an error that names the problem.
func TestMapErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	ext := Extent{MinEast: 0, MaxEast: 100, MinNorth: 0, MaxNorth: 100}
	tr := []Trace{{A: Point{0, 0}, B: Point{1, 1}, Value: 1}}
	for _, tc := range []struct {
		name string
		m    Map
		s    Size
		want string
	}{
		{"nothing to fit", Map{}, Size{}, "no features"},
		{"zero-area extent", Map{Extent: Extent{MinEast: 5, MaxEast: 5, MinNorth: 0, MaxNorth: 10}}, Size{}, "MinEast < MaxEast"},
		{"inverted extent", Map{Extent: Extent{MinEast: 0, MaxEast: 10, MinNorth: 10, MaxNorth: 0}}, Size{}, "MinNorth < MaxNorth"},
		{"NaN extent", Map{Extent: Extent{MinEast: nan, MaxEast: 10, MinNorth: 0, MaxNorth: 10}}, Size{}, "finite"},
		{"too small extent", Map{Extent: Extent{0, 1e-4, 0, 1}}, Size{}, "each side"},
		{"fitted too large", Map{Traces: []Trace{{A: Point{-1e9, 0}, B: Point{1e9, 0}, Value: 1}}}, Size{}, "fitted"},
		{"NaN trace end", Map{Extent: ext, Traces: []Trace{{A: Point{nan, 0}, B: Point{1, 1}}}}, Size{}, "Traces[0].A"},
		{"infinite value", Map{Extent: ext, Traces: []Trace{{A: Point{0, 0}, B: Point{1, 1}, Value: inf}}}, Size{}, "Traces[0].Value"},
		{"empty well", Map{Extent: ext, Wells: []Well{{Name: "W"}}}, Size{}, "empty path"},
		{"infinite well point", Map{Extent: ext, Wells: []Well{{Path: []Point{{0, 0}, {inf, 0}}}}}, Size{}, "Path[1]"},
		{"NaN cluster", Map{Extent: ext, Clusters: []Cluster{{At: Point{0, nan}}}}, Size{}, "Clusters[0]"},
		{"NaN magnitude", Map{Extent: ext, Events: []Event{{Magnitude: nan}}}, Size{}, "Magnitude"},
		{"NaN small event", Map{Extent: ext, SmallEvents: []Point{{0, 0}, {nan, 1}}}, Size{}, "SmallEvents[1] ="},
		{"short ring", Map{Extent: ext, Outline: []Polygon{{{{0, 0}, {1, 1}}}}}, Size{}, "at least 3"},
		{"NaN stress tick", Map{Extent: ext, StressTicks: []StressTick{{At: Point{nan, 0}}}}, Size{}, "StressTicks[0].At"},
		{"infinite tick azimuth", Map{Extent: ext, StressTicks: []StressTick{{At: Point{1, 1}, Azimuth: inf}}}, Size{}, "StressTicks[0].Azimuth"},
		{"colour range inverted", Map{Extent: ext, Traces: tr, Colour: ColourScale{Min: 5, Max: 1}}, Size{}, "Min < Max"},
		{"size too small", Map{Extent: ext}, Size{Width: 100, Height: 100}, "picture size"},
		{"size too large", Map{Extent: ext}, Size{Width: 20000, Height: 1000}, "picture size"},
		{"negative size", Map{Extent: ext}, Size{Width: -1600, Height: 1200}, "picture size"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			err := tc.m.WritePNG(&buf, tc.s)
			if err == nil {
				t.Fatalf("no error, want one containing %q", tc.want)
			}
			if !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), "report: ") {
				t.Errorf("error %q: want the prefix \"report: \" and %q", err, tc.want)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes written despite the error", buf.Len())
			}
		})
	}
}

func TestMagnitudeLevels(t *testing.T) {
	for _, tc := range []struct {
		mws  []float64
		want []float64
	}{
		{nil, nil},
		{[]float64{-1.5, -0.2}, []float64{-2, -1, 0}},
		{[]float64{-1}, []float64{-1}},
		{[]float64{-3, 2}, []float64{-3, -1, 1, 3}}, // Range 5: step 2.
		{[]float64{0.1, 0.4}, []float64{0, 1}},
	} {
		m := &Map{}
		for _, mw := range tc.mws {
			m.Events = append(m.Events, Event{Magnitude: mw})
		}
		got := m.magnitudeLevels()
		if len(got) != len(tc.want) {
			t.Errorf("levels of %v = %v, want %v", tc.mws, got, tc.want)
			continue
		}
		for i := range got {
			numtest.Abs(t, "level", got[i], tc.want[i], 0)
		}
	}
	if r := eventRadius(-5, []float64{-2, 0}); r != radiusEventMin {
		t.Errorf("radius below the key = %v, want the smallest %v", r, vg.Length(radiusEventMin))
	}
	if r := eventRadius(-1, []float64{-2, 0}); math.Abs(float64(r)-(radiusEventMin+radiusEventMax)/2) > 1e-12 {
		t.Errorf("radius half-way = %v, want %v", r, (radiusEventMin+radiusEventMax)/2)
	}
	if s := formatMagnitude(math.Copysign(0, -1)); s != "0" {
		t.Errorf("formatMagnitude(−0) = %q, want \"0\"", s)
	}
}

func TestStageCentroids(t *testing.T) {
	got := stageCentroids([]Cluster{
		{At: Point{0, 0}, Stage: "B"}, {At: Point{10, 2}, Stage: "A"}, {At: Point{20, 0}, Stage: "B"},
		{At: Point{5, 5}}, // No stage: not labelled.
	})
	if len(got) != 2 || got[0].name != "B" || got[1].name != "A" {
		t.Fatalf("stages = %+v, want B then A (first appearance)", got)
	}
	numtest.Abs(t, "B east", got[0].at.East, 10, 1e-12)
	numtest.Abs(t, "A north", got[1].at.North, 2, 1e-12)
}

func TestTraceOrder(t *testing.T) {
	nan := math.NaN()
	ts := []Trace{{Value: 1}, {Value: nan}, {Value: 3}, {Value: 2}, {Value: nan}}
	got := traceOrder(ts)
	want := []int{1, 4, 2, 3, 0} // No value first (input order), then by decreasing value.
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("order = %v, want %v", got, want)
		}
	}
}

// darkest returns the darkest pixel (least R+G+B) of the 3 × 3 block
// around (x, y).
func darkest(img image.Image, x, y int) color.NRGBA {
	best := nrgbaAt(img, x, y)
	for dy := -1; dy <= 1; dy++ {
		for dx := -1; dx <= 1; dx++ {
			c := nrgbaAt(img, x+dx, y+dy)
			if int(c.R)+int(c.G)+int(c.B) < int(best.R)+int(best.G)+int(best.B) {
				best = c
			}
		}
	}
	return best
}

// isNeutral reports whether c is a grey: its channels differ by at most one
// 8-bit level.
func isNeutral(c color.NRGBA) bool {
	return near(c, color.NRGBA{c.R, c.R, c.R, c.A}, 1)
}

func TestEventColour(t *testing.T) {
	if c := eventColour(10); c != colourEvent {
		t.Errorf("few events: %v, want the key colour %v", c, colourEvent)
	}
	// 800 events: alpha 150·√(200/800) = 75.
	if c := eventColour(800); c.A != 75 {
		t.Errorf("800 events: alpha %d, want 75", c.A)
	}
	if c := eventColour(1e7); c.A != 40 {
		t.Errorf("10⁷ events: alpha %d, want the floor 40", c.A)
	}
}

// TestMapLabelsClear places the well and stage labels of the demo map and
// checks that each lies inside the data area, clear of every cluster
// marker and of the other labels.
func TestMapLabelsClear(t *testing.T) {
	m := demoMap(400)
	ext, err := m.extent()
	if err != nil {
		t.Fatal(err)
	}
	var placed []placedLabel
	layers := mapLayers{m: m, levels: m.magnitudeLevels(), cmap: NewViridisMap(0, 6), placed: &placed}
	_, f := renderMapPage(DefaultSize, mapSpec{extent: ext, layers: layers, side: func(draw.Canvas) {}})
	wantLabels := 1 + 4 // One well, four stages.
	if len(placed) != wantLabels {
		t.Fatalf("%d labels placed, want %d: %+v", len(placed), wantLabels, placed)
	}
	at := func(q Point) vg.Point {
		return vg.Point{
			X: f.data.X((q.East - f.minE) / (f.maxE - f.minE)),
			Y: f.data.Y((q.North - f.minN) / (f.maxN - f.minN)),
		}
	}
	for i, a := range placed {
		if !inside(a.box, f.data.Rectangle) {
			t.Errorf("label %q at %v is not inside the data area %v", a.text, a.box, f.data.Rectangle)
		}
		for _, c := range m.Clusters {
			if o := overlapArea(a.box, squareAround(at(c.At), radiusCluster)); o > 0 {
				t.Errorf("label %q overlaps the cluster marker at %v by %.1f pt²", a.text, c.At, o)
			}
		}
		for _, b := range placed[i+1:] {
			if o := overlapArea(a.box, b.box); o > 0 {
				t.Errorf("labels %q and %q overlap by %.1f pt²", a.text, b.text, o)
			}
		}
	}
}

// TestMapConduitsAndSHmax: the conduits add dark dashed pixels along
// their path and the SHmax arrow adds black pixels in the upper-left
// corner; without them, those pixels are not there.
func TestMapConduitsAndSHmax(t *testing.T) {
	m := demoMap(200)
	img, f := renderDecoded(t, m, DefaultSize)
	bare := demoMap(200)
	bare.Conduits, bare.SHmax = nil, nil
	imgBare, _ := renderDecoded(t, bare, DefaultSize)
	// Dark pixels under the middle of each conduit, off the well line
	// (the points at ±40 m along the conduit, 10 m off the well).
	hits, tried := 0, 0
	for _, c := range m.Conduits {
		for _, s := range []float64{0.1, 0.9} {
			q := Point{c.A.East + s*(c.B.East-c.A.East), c.A.North + s*(c.B.North-c.A.North)}
			x, y := f.pixel(q)
			tried++
			if d := darkest(img, int(x), int(y)); int(d.R)+int(d.G)+int(d.B) < 3*80 {
				hits++
			}
		}
	}
	// A dash of 5 pt in 7.5: about two thirds of the samples fall on ink.
	if tried == 0 || hits < tried/3 {
		t.Errorf("%d of %d conduit samples are dark, want at least a third", hits, tried)
	}
	box := shmaxBox(f.data)
	count := func(img image.Image) int {
		n := 0
		for y := int(f.pg.height) - int(box.Max.Y.Dots(f.pg.dpi)); y < int(f.pg.height)-int(box.Min.Y.Dots(f.pg.dpi)); y++ {
			for x := int(box.Min.X.Dots(f.pg.dpi)); x < int(box.Max.X.Dots(f.pg.dpi)); x++ {
				if c := nrgbaAt(img, x, y); c.R < 40 && c.G < 40 && c.B < 40 {
					n++
				}
			}
		}
		return n
	}
	// The arrow: a 1.4 pt line 32 pt long (≈ 3 × 70 px) and two heads,
	// plus the bold label.
	const minArrowPixels = 150
	if with, without := count(img), count(imgBare); with < without+minArrowPixels {
		t.Errorf("black pixels in the SHmax panel: %d with the arrow, %d without; want at least %d more", with, without, minArrowPixels)
	}
}

// Stress ticks draw blue-grey pixels along their azimuth and none across
// it: an east-west tick (azimuth 90°) inks the pixels 3 pt east and west
// of its point, not those 3 pt north and south.
func TestMapStressTicks(t *testing.T) {
	ext := Extent{MinEast: 0, MaxEast: 100, MinNorth: 0, MaxNorth: 100}
	m := &Map{Extent: ext, StressTicks: []StressTick{{At: Point{50, 50}, Azimuth: math.Pi / 2}}}
	img, f := renderDecoded(t, m, DefaultSize)
	x, y := f.pixel(Point{50, 50})
	pt := 3 * f.pg.dpi / 72 // 3 points in pixels
	inked := func(dx, dy float64) bool {
		c := nrgbaAt(img, int(x+dx), int(y+dy))
		return c == colourStressTick
	}
	if !inked(pt, 0) || !inked(-pt, 0) {
		t.Error("no tick ink 3 pt east or west of the point of an east-west tick")
	}
	if inked(0, pt) || inked(0, -pt) {
		t.Error("tick ink 3 pt north or south of the point of an east-west tick")
	}
}

func TestLabelPlacer(t *testing.T) {
	frame := vg.Rectangle{Max: vg.Point{X: 100, Y: 100}}
	lp := newLabelPlacer(frame)
	lp.block(squareAround(vg.Point{X: 50, Y: 60}, 5)) // A marker above the anchor.
	cands := labelCandidates(vg.Point{X: 50, Y: 50}, 20, 8, 4)
	if len(cands) != 24 {
		t.Fatalf("%d candidates, want 24", len(cands))
	}
	got, ok := lp.place(cands)
	// Above (y 54–62) overlaps the marker (55–65); below is free.
	want := vg.Rectangle{Min: vg.Point{X: 40, Y: 38}, Max: vg.Point{X: 60, Y: 46}}
	if !ok || got != want {
		t.Errorf("placed at %v (%v), want below the anchor %v", got, ok, want)
	}
	// The second label at the same anchor goes elsewhere.
	if got2, ok := lp.place(cands); !ok || overlapArea(got2, got) > 0 {
		t.Errorf("second label at %v overlaps the first at %v", got2, got)
	}
	// Nothing fits in a frame smaller than the label.
	if _, ok := newLabelPlacer(vg.Rectangle{Max: vg.Point{X: 10, Y: 10}}).place(cands); ok {
		t.Error("a label larger than the frame was placed")
	}
	if a := overlapArea(squareAround(vg.Point{}, 1), squareAround(vg.Point{X: 1, Y: 1}, 1)); a != 1 {
		t.Errorf("overlap of two unit-offset 2×2 squares = %v, want 1", a)
	}
}
