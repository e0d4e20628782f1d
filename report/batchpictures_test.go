package report

import (
	"bytes"
	"fmt"
	"math"
	"testing"

	"slipfront/internal/numtest"
)

// demoGrid returns an invented probability field on a 60 × 40 grid of
// 25 m cells: a Gaussian bump of height peak centred at (east, 0), zero
// below 0.02, quantised to twentieths (20 realizations).
func demoGrid(peak, east float64) (MapGrid, []float64) {
	g := MapGrid{Cols: 60, Rows: 40, CellSize: 25, XMin: -750, YMin: -500}
	v := make([]float64, g.Cols*g.Rows)
	for j := range g.Rows {
		for i := range g.Cols {
			x := g.XMin + (float64(i)+0.5)*g.CellSize - east
			y := g.YMin + (float64(j)+0.5)*g.CellSize
			p := peak * math.Exp(-(x*x/(2*300*300) + y*y/(2*150*150)))
			p = math.Round(p*20) / 20
			v[j*g.Cols+i] = p
		}
	}
	return g, v
}

// squareContour returns a square outline of half-side h about the origin.
func squareContour(label string, h float64) Contour {
	return Contour{Label: label, Polygons: []Polygon{{{{-h, -h}, {h, -h}, {h, h}, {-h, h}}}}}
}

func demoProbabilityMap() *ProbabilityMap {
	g, v := demoGrid(0.95, 0)
	return &ProbabilityMap{
		Title: "Demo batch — 5 cP — stimulation probability", Note: "Share of 20 realizations",
		Grid: g, Probability: v,
		Contours: []Contour{squareContour("10 %", 400), squareContour("50 %", 250), squareContour("90 %", 100)},
		Wells:    []Well{{Name: "Well A", Path: []Point{{-700, 0}, {700, 0}}}},
	}
}

// TestProbabilityMapCells checks the colour of cell centres: the viridis
// colour of the cell's probability, or white where it is 0.
func TestProbabilityMapCells(t *testing.T) {
	m := demoProbabilityMap()
	m.Contours, m.Wells = nil, nil // Keep the cells clear of lines.
	r := m.raster()
	pg, f, err := r.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	g := m.Grid
	checked, coloured := 0, 0
	for j := 2; j < g.Rows; j += 5 {
		for i := 3; i < g.Cols; i += 7 {
			v := m.Probability[j*g.Cols+i]
			want := white
			if v != 0 {
				want, coloured = Viridis(v), coloured+1
			}
			x, y := f.pixel(Point{g.XMin + (float64(i)+0.5)*g.CellSize, g.YMin + (float64(j)+0.5)*g.CellSize})
			// colourTol: 8-bit rounding of the colour.
			if got := nrgbaAt(img, int(x), int(y)); !near(got, want, 2) {
				t.Errorf("cell (%d, %d), p = %g: pixel %v, want %v", i, j, v, got, want)
			}
			checked++
		}
	}
	if checked == 0 || coloured == 0 || coloured == checked {
		t.Fatalf("%d cells checked, %d coloured: the check needs both kinds", checked, coloured)
	}
}

// TestProbabilityMapContours: the solid 90 % contour (a 200 m square)
// puts black pixels on its edge; without contours there are none there.
func TestProbabilityMapContours(t *testing.T) {
	m := demoProbabilityMap()
	m.Wells = nil
	pg, f, err := m.raster().render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	hits := 0
	for k := range 9 {
		x, y := f.pixel(Point{-80 + 20*float64(k), 100}) // Along the top edge.
		if d := darkest(img, int(x), int(y)); d.R < 30 && d.G < 30 && d.B < 30 {
			hits++
		}
	}
	if hits < 9 {
		t.Errorf("%d of 9 points on the solid 90 %% contour are black", hits)
	}
}

// TestDiverging: the scale's ends and middle are the RdBu table's (Harrower
// & Brewer 2003), and it runs from blue to red through light grey.
func TestDiverging(t *testing.T) {
	for _, tc := range []struct {
		t    float64
		want [3]uint8
	}{{0, [3]uint8{0x21, 0x66, 0xac}}, {0.5, [3]uint8{0xf7, 0xf7, 0xf7}}, {1, [3]uint8{0xb2, 0x18, 0x2b}}, {-3, [3]uint8{0x21, 0x66, 0xac}}, {math.NaN(), [3]uint8{0x21, 0x66, 0xac}}} {
		c := Diverging(tc.t)
		if c.R != tc.want[0] || c.G != tc.want[1] || c.B != tc.want[2] || c.A != 255 {
			t.Errorf("Diverging(%g) = %v, want %v", tc.t, c, tc.want)
		}
	}
	// Half-way between entries 0 and 1: the rounded mean of their channels.
	if c := Diverging(1.0 / 16); c.R != 50 || c.G != 125 || c.B != 184 {
		t.Errorf("Diverging(1/16) = %v, want {50 125 184}", c)
	}
	m := NewDivergingMap(1)
	numtest.Abs(t, "min", m.Min(), -1, 0)
	if c := m.clamped(0); c != Diverging(0.5) {
		t.Errorf("zero difference drawn %v, want the neutral %v", c, Diverging(0.5))
	}
}

func TestDifferenceMapPicture(t *testing.T) {
	g, a := demoGrid(0.9, -200)
	_, b := demoGrid(0.6, 200)
	diff := make([]float64, len(a))
	for i := range a {
		diff[i] = a[i] - b[i]
	}
	m := &DifferenceMap{Title: "Demo — 20 cP against 1 cP", Grid: g, Difference: diff, Case: "20 cP", Reference: "1 cP",
		Contours: []Contour{squareContour("≥ +0.25", 100)}}
	r := m.raster()
	pg, f, err := r.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	checkPicture(t, img, DefaultSize, minInkedMap, minColoursMap)
	// The most positive and most negative cells are red and blue.
	hi, lo := 0, 0
	for i, v := range diff {
		if v > diff[hi] {
			hi = i
		}
		if v < diff[lo] {
			lo = i
		}
	}
	for _, i := range []int{hi, lo} {
		x, y := f.pixel(Point{g.XMin + (float64(i%g.Cols)+0.5)*g.CellSize, g.YMin + (float64(i/g.Cols)+0.5)*g.CellSize})
		want := Diverging((diff[i] + 1) / 2)
		if got := nrgbaAt(img, int(x), int(y)); !near(got, want, 2) {
			t.Errorf("cell %d, difference %g: pixel %v, want %v", i, diff[i], got, want)
		}
	}
	if !(diff[hi] > 0.3 && diff[lo] < -0.3) {
		t.Fatalf("demo differences %g…%g do not reach both colours", diff[lo], diff[hi])
	}
}

func TestRasterMapErrors(t *testing.T) {
	g := MapGrid{Cols: 2, Rows: 2, CellSize: 10}
	for _, tc := range []struct {
		name string
		m    interface{ WritePNG(w *bytes.Buffer) error }
		want string
	}{
		{"short values", pw(&ProbabilityMap{Grid: g, Probability: []float64{0, 0, 0}}), "3 values for a 2 × 2 grid"},
		{"above 1", pw(&ProbabilityMap{Grid: g, Probability: []float64{0, 0, 0, 1.5}}), "column 1, row 1"},
		{"NaN probability", pw(&ProbabilityMap{Grid: g, Probability: []float64{0, math.NaN(), 0, 0}}), "value 1"},
		{"zero cell", pw(&ProbabilityMap{Grid: MapGrid{Cols: 1, Rows: 1}, Probability: []float64{0}}), "grid 1 × 1 cells of 0 m"},
		{"difference below −1", dw(&DifferenceMap{Grid: g, Difference: []float64{0, -2, 0, 0}}), "must be in [-1, 1]"},
		{"four contours", pw(&ProbabilityMap{Grid: g, Probability: make([]float64, 4), Contours: make([]Contour, 4)}), "at most 3"},
		{"short ring", pw(&ProbabilityMap{Grid: g, Probability: make([]float64, 4), Contours: []Contour{{Polygons: []Polygon{{{{0, 0}}}}}}}), "ring 0 has 1 points"},
		{"empty well", pw(&ProbabilityMap{Grid: g, Probability: make([]float64, 4), Wells: []Well{{Name: "W"}}}), "empty path"},
	} {
		t.Run(tc.name, func(t *testing.T) { checkError(t, tc.m.WritePNG, tc.want) })
	}
	// NaN is blank on a difference map.
	d := &DifferenceMap{Grid: g, Difference: []float64{math.NaN(), 0.5, -0.5, 0}}
	s := Size{Width: 640, Height: 480}
	checkPicture(t, decodePNG(t, d, s), s, minInkedFrame, 4)
}

// pw and dw adapt the maps' WritePNG to checkError.
type writerFunc func(w *bytes.Buffer) error

func (f writerFunc) WritePNG(w *bytes.Buffer) error { return f(w) }

func pw(m *ProbabilityMap) writerFunc {
	return func(w *bytes.Buffer) error { return m.WritePNG(w, Size{}) }
}

func dw(m *DifferenceMap) writerFunc {
	return func(w *bytes.Buffer) error { return m.WritePNG(w, Size{}) }
}

func demoFanPanels(n int) *FanPanels {
	f := &FanPanels{Title: "Demo batch — stimulated area by case", Convention: "P10/P50/P90 = 10th/50th/90th percentile of 50 realizations, ascending"}
	for k := range n {
		c := FanCase{Label: fmt.Sprintf("%d cP", []int{1, 5, 20, 50, 100}[k%5])}
		for i := 0; i <= 40; i++ {
			a := 2e5 / float64(k+1) * math.Sqrt(float64(i)/40)
			c.Time = append(c.Time, float64(i)*360)
			c.P10, c.P50, c.P90 = append(c.P10, 0.6*a), append(c.P50, a), append(c.P90, 1.5*a)
		}
		f.Cases = append(f.Cases, c)
	}
	return f
}

// TestFanPanelsSharedAxes: every panel has the same data ranges, and
// panels in one column (row) share their left and right (top and bottom)
// edges; each panel's median is blue at its own pixel.
func TestFanPanelsSharedAxes(t *testing.T) {
	f := demoFanPanels(5) // 3 columns × 2 rows, one slot empty.
	pg, frames, err := f.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	if len(frames) != 5 {
		t.Fatalf("%d panels, want 5", len(frames))
	}
	img := decodeImage(t, pg)
	const edgeTol = 1e-6 // Points: alignX and alignY trim to exact edges.
	for i, fr := range frames {
		p0 := frames[0].p
		numtest.Abs(t, fmt.Sprintf("panel %d x max", i), fr.p.X.Max, p0.X.Max, 0)
		numtest.Abs(t, fmt.Sprintf("panel %d y max", i), fr.p.Y.Max, p0.Y.Max, 0)
		if above := i - 3; above >= 0 {
			numtest.Abs(t, fmt.Sprintf("panel %d left edge", i), float64(fr.data.Min.X), float64(frames[above].data.Min.X), edgeTol)
		}
		if i%3 > 0 {
			numtest.Abs(t, fmt.Sprintf("panel %d bottom edge", i), float64(fr.data.Min.Y), float64(frames[i-1].data.Min.Y), edgeTol)
		}
		c := f.Cases[i]
		factor, _ := areaUnit(2e5 * 1.5)
		k := 30
		x, y := fr.pixel(c.Time[k]/secondsPerHour, c.P50[k]*factor)
		if d := nrgbaAt(img, int(x), int(y)); !near(d, okabeBlue, 2) {
			t.Errorf("panel %d median at (%.0f, %.0f): %v, want %v", i, x, y, d, okabeBlue)
		}
	}
}

func TestFanPanelsErrors(t *testing.T) {
	ok := demoFanPanels(2)
	bad := *ok
	bad.Cases = append([]FanCase{}, ok.Cases...)
	bad.Cases[1].P10 = bad.Cases[1].P10[:3]
	checkError(t, func(w *bytes.Buffer) error { return bad.WritePNG(w, Size{}) }, `Cases[1], "5 cP"`)
	none := FanPanels{Convention: "c"}
	checkError(t, func(w *bytes.Buffer) error { return none.WritePNG(w, Size{}) }, "0 cases")
	noConv := *ok
	noConv.Convention = ""
	checkError(t, func(w *bytes.Buffer) error { return noConv.WritePNG(w, Size{}) }, "Convention")
}

// TestECDF: the empirical distribution function rises by 1/n at each
// sorted value (e.g. Wasserman 2004, All of Statistics, §7.1).
func TestECDF(t *testing.T) {
	pts := ecdf([]float64{3, 1, 2, 2})
	want := [][2]float64{{1, 0}, {1, 25}, {2, 25}, {2, 50}, {2, 50}, {2, 75}, {3, 75}, {3, 100}}
	if len(pts) != len(want) {
		t.Fatalf("%d steps, want %d", len(pts), len(want))
	}
	for i, w := range want {
		if pts[i].X != w[0] || pts[i].Y != w[1] {
			t.Errorf("step %d = (%g, %g), want (%g, %g)", i, pts[i].X, pts[i].Y, w[0], w[1])
		}
	}
}

func demoRatios() *RatioDistribution {
	r := &RatioDistribution{Title: "Demo batch — paired ratios", Quantity: "Final stimulated area", Reference: "1 cP"}
	for k, label := range []string{"5 cP", "20 cP"} {
		s := RatioSeries{Label: label}
		for i := range 50 {
			s.Ratios = append(s.Ratios, math.Exp(-0.3*float64(k+1)+0.4*math.Sin(float64(i))))
		}
		r.Cases = append(r.Cases, s)
	}
	return r
}

// TestRatioDistributionPicture: each case's ECDF passes through its
// median's pixel in its colour, and the ratio-1 line is drawn.
func TestRatioDistributionPicture(t *testing.T) {
	r := demoRatios()
	pg, f, err := r.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	for i, c := range r.Cases {
		pts := ecdf(c.Ratios)
		q := pts[len(pts)/2] // The rise at the median: a vertical step.
		x, y := f.pixel(q.X, q.Y-1)
		found := false
		for dx := -3; dx <= 3 && !found; dx++ {
			for dy := -8; dy <= 8 && !found; dy++ {
				found = near(nrgbaAt(img, int(x)+dx, int(y)+dy), seriesColours[i], 2)
			}
		}
		if !found {
			t.Errorf("case %q: no pixel of its colour near the median step (%.0f, %.0f)", c.Label, x, y)
		}
	}
	x, y := f.pixel(1, 50)
	if d := darkest(img, int(x), int(y)); !near(d, greyGuide, 40) {
		t.Errorf("ratio-1 line at (%.0f, %.0f): %v, want near %v", x, y, d, greyGuide)
	}
}

func TestRatioDistributionErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		r    RatioDistribution
		want string
	}{
		{"no cases", RatioDistribution{}, "no cases"},
		{"no ratios", RatioDistribution{Cases: []RatioSeries{{Label: "a"}}}, `Cases[0] ("a") has no ratios`},
		{"zero ratio", RatioDistribution{Cases: []RatioSeries{{Label: "a", Ratios: []float64{1, 0}}}}, "Ratios[1] = 0"},
		{"infinite ratio", RatioDistribution{Cases: []RatioSeries{{Label: "a", Ratios: []float64{math.Inf(1)}}}}, "Ratios[0]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkError(t, func(w *bytes.Buffer) error { return tc.r.WritePNG(w, Size{}) }, tc.want)
		})
	}
	s := Size{Width: 640, Height: 480}
	one := RatioDistribution{Cases: []RatioSeries{{Label: "a", Ratios: []float64{1}}}}
	checkPicture(t, decodePNG(t, &one, s), s, minInkedFrame, 4)
}
