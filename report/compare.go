package report

import (
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Comparison is the chart of one batch result across sweep values: for
// each value a P10–P90 bar with caps, the P50 as a filled circle and,
// optionally, the mean as an open triangle.
type Comparison struct {
	Title string
	// Convention defines the percentiles, printed under the chart (see
	// Fan.Convention). Required.
	Convention string
	Sweep      string   // X-axis label: the swept quantity, e.g. "Fluid viscosity".
	Quantity   string   // Y-axis quantity, an area; empty means "Final stimulated area".
	Categories []string // Sweep values as drawn, e.g. "1 cP", "5 cP", "20 cP".
	P10        []float64
	P50        []float64
	P90        []float64 // Areas per category, m².
	Mean       []float64 // m²; nil draws no mean.
}

// Comparison styles.
var (
	styleRange  = draw.LineStyle{Color: okabeBlack, Width: 1.6}
	glyphMedian = draw.GlyphStyle{Color: okabeBlue, Radius: 5, Shape: draw.CircleGlyph{}}
	glyphMean   = draw.GlyphStyle{Color: okabeVermillion, Radius: 5.5, Shape: openTriangle{width: 1.6}}
)

const capHalfWidth = 8 // Half-width of the P10 and P90 caps, points.

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (c *Comparison) WritePNG(w io.Writer, s Size) error {
	pg, err := c.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks lengths, finiteness and percentile order.
func (c *Comparison) validate() error {
	if c.Convention == "" {
		return fmt.Errorf("report: comparison chart has no percentile Convention: the batch must say what P10, P50 and P90 are")
	}
	n := len(c.Categories)
	if n == 0 {
		return fmt.Errorf("report: comparison chart has no categories")
	}
	for _, s := range []struct {
		name string
		v    []float64
	}{{"P10", c.P10}, {"P50", c.P50}, {"P90", c.P90}} {
		if err := checkCategorySeries(s.name, s.v, n); err != nil {
			return err
		}
	}
	if c.Mean != nil {
		if err := checkCategorySeries("Mean", c.Mean, n); err != nil {
			return err
		}
	}
	for i := range n {
		if err := checkOrdered("comparison", fmt.Sprintf("of %q", c.Categories[i]), c.P10[i], c.P50[i], c.P90[i]); err != nil {
			return err
		}
	}
	return nil
}

// checkCategorySeries requires n finite values.
func checkCategorySeries(name string, v []float64, n int) error {
	if len(v) != n {
		return fmt.Errorf("report: comparison %s has %d values for %d categories: need one per category", name, len(v), n)
	}
	for i, x := range v {
		if !finite(x) {
			return fmt.Errorf("report: comparison %s[%d] = %g: must be finite", name, i, x)
		}
	}
	return nil
}

// render draws the chart on a new page.
func (c *Comparison) render(s Size) (*page, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, err
	}
	if err := c.validate(); err != nil {
		return nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, c.Title, c.Convention)
	all := append(append([]float64{}, c.P90...), c.Mean...)
	factor, unit := areaUnit(maxOf(all))
	quantity := c.Quantity
	if quantity == "" {
		quantity = "Final stimulated area"
	}
	p := newPlot(c.Sweep, quantity+", "+unit)
	p.NominalX(c.Categories...)
	p.X.Tick.Label.Font.Size = sizeLabel
	n := float64(len(c.Categories))
	p.X.Min, p.X.Max = -0.5, n-0.5
	fromZero(&p.Y, append(all, c.P10...), factor)
	p.Add(horizontalGrid())
	p.Add(rangeBars{c: c, factor: factor})
	rows := []keyRow{
		{text: "P10–P90 range", symbol: rangeSymbol, height: 16},
		{text: "P50 (median)", symbol: glyphSymbol(glyphMedian)},
	}
	if c.Mean != nil {
		rows = append(rows, keyRow{text: "Mean", symbol: glyphSymbol(glyphMean)})
	}
	body = keyBelow(body, rows)
	p.Draw(body)
	return pg, nil
}

// rangeBars draws the comparison's bars and markers. It is a plot.Plotter.
type rangeBars struct {
	c      *Comparison
	factor float64 // From m² to the drawn unit.
}

// Plot implements plot.Plotter.
func (r rangeBars) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	for i := range r.c.Categories {
		x := tx(float64(i))
		lo, hi := ty(r.c.P10[i]*r.factor), ty(r.c.P90[i]*r.factor)
		drawRangeBar(c, x, lo, hi)
		c.DrawGlyphNoClip(glyphMedian, vg.Point{X: x, Y: ty(r.c.P50[i] * r.factor)})
		if r.c.Mean != nil {
			c.DrawGlyphNoClip(glyphMean, vg.Point{X: x, Y: ty(r.c.Mean[i] * r.factor)})
		}
	}
}

// drawRangeBar draws a vertical bar from lo to hi with caps at both ends.
func drawRangeBar(c draw.Canvas, x, lo, hi vg.Length) {
	c.StrokeLine2(styleRange, x, lo, x, hi)
	c.StrokeLine2(styleRange, x-capHalfWidth, lo, x+capHalfWidth, lo)
	c.StrokeLine2(styleRange, x-capHalfWidth, hi, x+capHalfWidth, hi)
}

// rangeSymbol is the key symbol of a range bar, 16 points high.
func rangeSymbol(c draw.Canvas, at vg.Point) {
	drawRangeBar(c, at.X, at.Y-8, at.Y+8)
}

// glyphSymbol returns a key symbol: one glyph.
func glyphSymbol(g draw.GlyphStyle) func(draw.Canvas, vg.Point) {
	return func(c draw.Canvas, at vg.Point) { c.DrawGlyphNoClip(g, at) }
}

// openTriangle is an unfilled upward triangle of a given line width.
type openTriangle struct{ width vg.Length }

// DrawGlyph implements draw.GlyphDrawer.
func (g openTriangle) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: g.width})
	r := float64(sty.Radius)
	var p vg.Path
	for k := range 3 {
		a := math.Pi/2 + 2*math.Pi*float64(k)/3
		q := vg.Point{X: pt.X + vg.Length(r*math.Cos(a)), Y: pt.Y + vg.Length(r*math.Sin(a))}
		if k == 0 {
			p.Move(q)
		} else {
			p.Line(q)
		}
	}
	p.Close()
	c.Stroke(p)
}
