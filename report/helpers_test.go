package report

import (
	"bytes"
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/plot/vg"
)

// demoMap returns an invented map scene (no real place): one horizontal
// well along North = 0 with four stages of three clusters, a primary
// conduit of 60 m half-length from each cluster along SHmax (azimuth 75°),
// n random traces coloured by a first-slip time that grows with distance
// from the well's middle, events on the slipped traces and an elliptical
// outline.
func demoMap(n int) *Map {
	rng := rand.New(rand.NewPCG(1, 2))
	m := &Map{
		Title:   "Demo scenario — realization 0",
		Extent:  Extent{MinEast: -1000, MaxEast: 1000, MinNorth: -700, MaxNorth: 700},
		CRSNote: "Local frame: origin at E 500000 m, N 3500000 m of EPSG:32614 (grid north up)",
		Colour:  ColourScale{Label: "First slip time", Unit: "h", NoValue: "Never slipped"},
		Wells:   []Well{{Name: "Well A", Path: []Point{{-900, 0}, {900, 0}}}},
	}
	const strike = 75 * math.Pi / 180 // Trace and SHmax azimuth, radians from north.
	az := strike
	m.SHmax = &az
	stages := []string{"Stage 1", "Stage 2", "Stage 3", "Stage 4"}
	for i, s := range stages {
		for j := range 3 {
			at := Point{East: 600 - 400*float64(i) - 60*float64(j), North: 0}
			m.Clusters = append(m.Clusters, Cluster{At: at, Stage: s})
			d := Point{East: 60 * math.Sin(strike), North: 60 * math.Cos(strike)}
			m.Conduits = append(m.Conduits, Segment{A: Point{at.East - d.East, at.North - d.North}, B: Point{at.East + d.East, at.North + d.North}})
		}
	}
	for range n {
		c := Point{East: -1000 + 2000*rng.Float64(), North: -700 + 1400*rng.Float64()}
		half := 20 + 60*rng.Float64()
		az := strike + 0.3*rng.NormFloat64()
		d := Point{East: half * math.Sin(az), North: half * math.Cos(az)}
		t := Trace{A: Point{c.East - d.East, c.North - d.North}, B: Point{c.East + d.East, c.North + d.North}, Value: math.NaN()}
		// Slipped inside the ellipse (x/700)² + (y/300)² < 1.
		if r := math.Hypot(c.East/700, c.North/300); r < 1 {
			t.Value = 0.5 + 5*r
			m.Events = append(m.Events, Event{At: c, Magnitude: -2.3 + 2.2*rng.Float64()})
		}
		m.Traces = append(m.Traces, t)
	}
	ring := make([]Point, 0, 64)
	for k := range 64 {
		a := 2 * math.Pi * float64(k) / 64
		ring = append(ring, Point{East: 700 * math.Cos(a), North: 300 * math.Sin(a)})
	}
	m.Outline = []Polygon{{ring}}
	return m
}

// demoGrowth returns an invented growth history: four stages of 2 h with
// 1 h pauses, area growing like √t within each stage, pressure rising
// while pumping and falling between stages.
func demoGrowth() *Growth {
	g := &Growth{Title: "Demo scenario — stimulated area"}
	const stage, pause = 7200.0, 3600.0 // s
	area := 0.0
	for k := range 4 {
		t0 := float64(k) * (stage + pause)
		g.Stages = append(g.Stages, StageMark{Name: []string{"Stage 1", "Stage 2", "Stage 3", "Stage 4"}[k], Start: t0})
		base := area
		for i := 0; i <= 30; i++ {
			t := t0 + stage*float64(i)/30
			area = base + 6e4*math.Sqrt(float64(i)/30)
			g.Time = append(g.Time, t)
			g.Area = append(g.Area, area)
			g.Pressure = append(g.Pressure, 40e6+8e6*math.Sqrt(float64(i)/30))
		}
		for i := 1; i <= 10; i++ {
			g.Time = append(g.Time, t0+stage+pause*float64(i)/10)
			g.Area = append(g.Area, area)
			g.Pressure = append(g.Pressure, 40e6+8e6*math.Exp(-float64(i)/3))
		}
	}
	return g
}

// demoFan returns an invented fan: percentiles of an area growing like √t.
func demoFan() *Fan {
	f := &Fan{
		Title:      "Demo batch — viscosity 5 cP — stimulated area",
		Convention: "P10/P50/P90 = 10th/50th/90th percentile of 50 realizations, ascending",
		Stages:     []StageMark{{"Stage 1", 0}, {"Stage 2", 3 * 3600}},
	}
	for i := 0; i <= 60; i++ {
		t := float64(i) * 360
		a := 2e5 * math.Sqrt(float64(i)/60)
		f.Time = append(f.Time, t)
		f.P10 = append(f.P10, 0.6*a)
		f.P50 = append(f.P50, a)
		f.P90 = append(f.P90, 1.5*a)
		f.Mean = append(f.Mean, 1.05*a)
	}
	return f
}

// demoComparison returns an invented comparison over three viscosities.
func demoComparison() *Comparison {
	return &Comparison{
		Title:      "Demo batch — final stimulated area by fluid viscosity",
		Convention: "P10/P50/P90 = 10th/50th/90th percentile of 50 realizations, ascending",
		Sweep:      "Fluid viscosity",
		Categories: []string{"1 cP", "5 cP", "20 cP"},
		P10:        []float64{1.2e5, 0.9e5, 0.5e5},
		P50:        []float64{2.0e5, 1.5e5, 0.9e5},
		P90:        []float64{3.1e5, 2.4e5, 1.6e5},
		Mean:       []float64{2.1e5, 1.6e5, 1.0e5},
	}
}

// decodePNG renders w at size s and decodes the PNG, failing the test on
// any error.
func decodePNG(t testing.TB, w interface {
	WritePNG(io.Writer, Size) error
}, s Size) image.Image {
	t.Helper()
	var buf bytes.Buffer
	if err := w.WritePNG(&buf, s); err != nil {
		t.Fatalf("WritePNG: %v", err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatalf("png.Decode: %v", err)
	}
	return img
}

// decodeImage encodes a drawn page as PNG and decodes it, failing the test
// on any error: the pixels a reader of the file sees.
func decodeImage(t testing.TB, pg *page) image.Image {
	t.Helper()
	var buf bytes.Buffer
	if err := pg.writePNG(&buf); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	return img
}

// nrgbaAt returns the colour of pixel (x, y) as 8-bit NRGBA.
func nrgbaAt(img image.Image, x, y int) color.NRGBA {
	return color.NRGBAModel.Convert(img.At(x, y)).(color.NRGBA)
}

// toNRGBA returns img as *image.NRGBA, converting when needed.
func toNRGBA(img image.Image) *image.NRGBA {
	if n, ok := img.(*image.NRGBA); ok {
		return n
	}
	b := img.Bounds()
	n := image.NewNRGBA(b)
	draw.Draw(n, b, img, b.Min, draw.Src)
	return n
}

// eachPixel calls fn with every pixel's colour.
func eachPixel(img image.Image, fn func(c color.NRGBA)) {
	n := toNRGBA(img)
	for i := 0; i+3 < len(n.Pix); i += 4 {
		fn(color.NRGBA{n.Pix[i], n.Pix[i+1], n.Pix[i+2], n.Pix[i+3]})
	}
}

// pixelStats returns the share of pixels that are not the white background
// and the number of distinct colours.
func pixelStats(img image.Image) (inked float64, distinct int) {
	seen := map[color.NRGBA]struct{}{}
	n, total := 0, 0
	eachPixel(img, func(c color.NRGBA) {
		total++
		if c != (color.NRGBA{255, 255, 255, 255}) {
			n++
			seen[c] = struct{}{}
		}
	})
	return float64(n) / float64(total), len(seen) + 1 // + white.
}

// countNear returns the number of pixels within tol (per 8-bit channel) of
// want.
func countNear(img image.Image, want color.NRGBA, tol int) int {
	n := 0
	eachPixel(img, func(c color.NRGBA) {
		if near(c, want, tol) {
			n++
		}
	})
	return n
}

// near reports whether a and b differ by at most tol in every channel.
func near(a, b color.NRGBA, tol int) bool {
	d := func(p, q uint8) int { return max(int(p)-int(q), int(q)-int(p)) }
	return d(a.R, b.R) <= tol && d(a.G, b.G) <= tol && d(a.B, b.B) <= tol && d(a.A, b.A) <= tol
}

// checkPicture fails the test unless img has size s, at least minInked of
// its pixels drawn and at least minColours distinct colours.
func checkPicture(t *testing.T, img image.Image, s Size, minInked float64, minColours int) {
	t.Helper()
	if b := img.Bounds(); b.Dx() != s.Width || b.Dy() != s.Height {
		t.Errorf("size = %d×%d px, want %d×%d", b.Dx(), b.Dy(), s.Width, s.Height)
	}
	inked, distinct := pixelStats(img)
	if inked < minInked {
		t.Errorf("drawn share = %.4f, want ≥ %.4f (picture nearly blank)", inked, minInked)
	}
	if distinct < minColours {
		t.Errorf("distinct colours = %d, want ≥ %d", distinct, minColours)
	}
}

// colourWithin reports whether a pixel within r pixels (a square) of
// (x, y) is within tol of c in every channel.
func colourWithin(img image.Image, x, y float64, r int, c color.NRGBA, tol int) bool {
	cx, cy := int(math.Floor(x)), int(math.Floor(y))
	b := img.Bounds()
	for py := cy - r; py <= cy+r; py++ {
		for px := cx - r; px <= cx+r; px++ {
			if image.Pt(px, py).In(b) && near(nrgbaAt(img, px, py), c, tol) {
				return true
			}
		}
	}
	return false
}

// imageFrame is where a chart's data area lies on its picture, in image
// pixels (y down).
type imageFrame struct {
	x0, x1        float64 // Left and right edges.
	yTop, yBottom float64 // Top and bottom edges.
}

// at returns the pixel of the point at fractions (fx, fy) of the data
// area's width and height, from its lower left corner.
func (f imageFrame) at(fx, fy float64) (x, y float64) {
	return f.x0 + fx*(f.x1-f.x0), f.yBottom - fy*(f.yBottom-f.yTop)
}

// findImageFrame locates the data area of a chart drawn at size s from the
// picture itself. The y axis is the longest vertical run of dark pixels
// (gaps of up to two pixels are bridged: grid lines cross it); the charts
// set no y padding (fromZero), so the run spans the data area's height,
// and its column is the data area's left edge for the time charts (no x
// padding) or the left edge of the padded area for the comparison. The
// right edge is the page's right margin. With two panels the upper, taller
// one is found.
func findImageFrame(t *testing.T, img image.Image, s Size) imageFrame {
	t.Helper()
	dark := func(x, y int) bool {
		c := nrgbaAt(img, x, y)
		return max(c.R, c.G, c.B) <= 100
	}
	b := img.Bounds()
	bestLen, bestX, bestTop := 0, 0, 0
	for x := b.Min.X; x < b.Min.X+b.Dx()/2; x++ {
		top, gap := -1, 0
		for y := b.Min.Y; y < b.Max.Y; y++ {
			if dark(x, y) {
				if top < 0 {
					top = y
				}
				gap = 0
				if n := y - top + 1; n > bestLen {
					bestLen, bestX, bestTop = n, x, top
				}
				continue
			}
			if gap++; gap > 2 {
				top = -1
			}
		}
	}
	// The y axis of a chart spans most of the picture's height.
	if bestLen < s.Height/4 {
		t.Fatalf("no y axis found: the longest dark vertical run is %d px", bestLen)
	}
	pg := newPage(s)
	right := float64(s.Width) - vg.Length(margin).Dots(pg.dpi)
	return imageFrame{x0: float64(bestX) + 0.5, x1: right, yTop: float64(bestTop), yBottom: float64(bestTop + bestLen)}
}

// probe is a place on a picture that must (or must not) show a colour.
type probe struct {
	fx, fy float64     // Position, fractions of the data area (chart) or map coordinates.
	colour color.NRGBA // Expected colour.
	absent bool        // The colour must not be there.
	r      int         // Search radius, pixels; 0 means probeRadius.
}

// checkProbes fails the test unless every probe's colour is within
// probeRadius pixels of its position (or, for an absent probe, nowhere
// that near): the data were drawn where they are. probeRadius covers the
// locating error of the frame (one pixel) and a line's antialiased edge;
// probeTol the 8-bit rounding of the renderer's colours.
func checkProbes(t *testing.T, img image.Image, at func(fx, fy float64) (x, y float64), probes []probe) {
	t.Helper()
	const probeRadius, probeTol = 3, 2
	if len(probes) == 0 {
		t.Fatal("no probe: the picture would not be checked for its data")
	}
	for _, p := range probes {
		x, y := at(p.fx, p.fy)
		r := p.r
		if r == 0 {
			r = probeRadius
		}
		if got := colourWithin(img, x, y, r, p.colour, probeTol); got == p.absent {
			what := "missing"
			if p.absent {
				what = "present"
			}
			t.Errorf("colour %v %s near (%g, %g), pixel (%.0f, %.0f)", p.colour, what, p.fx, p.fy, x, y)
		}
	}
}
