package report

import (
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// StageMark is the start of a stage on a time chart: a dashed vertical
// line with the stage's name beside it.
type StageMark struct {
	Name  string  // Drawn beside the line.
	Start float64 // Start time, s.
}

// Growth is the chart of the stimulated area of a run over time, with the
// stage boundaries and, optionally, a lower panel of bottom-hole pressure
// on the same time axis (gonum/plot has no secondary axis; a second panel
// reads better anyway).
type Growth struct {
	Title  string
	Time   []float64   // Times, s, non-decreasing.
	Area   []float64   // Stimulated area at each time, m².
	Stages []StageMark // Stage starts; may be empty.
	// Pressure is the bottom-hole pressure at each time, Pa; nil draws no
	// lower panel.
	Pressure []float64
}

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (g *Growth) WritePNG(w io.Writer, s Size) error {
	pg, err := g.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the series.
func (g *Growth) validate() error {
	if err := checkTimes("growth", g.Time); err != nil {
		return err
	}
	if err := checkSeries("growth", "Area", g.Area, len(g.Time)); err != nil {
		return err
	}
	if g.Pressure != nil {
		if err := checkSeries("growth", "Pressure", g.Pressure, len(g.Time)); err != nil {
			return err
		}
	}
	return checkStages("growth", g.Stages)
}

// render draws the chart on a new page.
func (g *Growth) render(s Size) (*page, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, err
	}
	if err := g.validate(); err != nil {
		return nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, g.Title)
	factor, unit := areaUnit(maxOf(g.Area))
	top := newPlot("Time, h", "Stimulated area, "+unit)
	top.Add(horizontalGrid())
	addSeries(top, g.Time, g.Area, factor, draw.LineStyle{Color: okabeBlue, Width: 2})
	tMin, tMax := timeRange(g.Time)
	setTimeAxis(top, tMin, tMax)
	fromZero(&top.Y, g.Area, factor)
	top.Add(stageLines{marks: g.Stages, labels: true})
	if g.Pressure == nil {
		top.Draw(body)
		return pg, nil
	}
	low := newPlot("Time, h", "Bottom-hole pressure, MPa")
	low.Add(horizontalGrid())
	addSeries(low, g.Time, g.Pressure, 1e-6, draw.LineStyle{Color: okabeBlack, Width: 1.5})
	setTimeAxis(low, tMin, tMax)
	low.Add(stageLines{marks: g.Stages})
	top.X.Label.Text = ""
	top.X.Tick.Marker = unlabelled{top.X.Tick.Marker}
	const gap = 8 // Between the panels, points.
	split := body.Min.Y + 0.34*(body.Max.Y-body.Min.Y)
	upper, lower := body, body
	upper.Min.Y = split + gap
	lower.Max.Y = split
	alignX([]*plot.Plot{top, low}, []*draw.Canvas{&upper, &lower})
	top.Draw(upper)
	low.Draw(lower)
	return pg, nil
}

// addSeries adds the series (times in s, values times factor) as a line,
// or as a marker when there is a single point.
func addSeries(p *plot.Plot, t, v []float64, factor float64, sty draw.LineStyle) {
	pts := make(plotter.XYs, len(t))
	for i := range t {
		pts[i].X = t[i] / secondsPerHour
		pts[i].Y = v[i] * factor
	}
	if len(pts) == 1 {
		sc := &plotter.Scatter{XYs: pts, GlyphStyle: draw.GlyphStyle{Color: sty.Color, Radius: 4, Shape: draw.CircleGlyph{}}}
		p.Add(sc)
		return
	}
	p.Add(&plotter.Line{XYs: pts, LineStyle: sty})
}

// timeRange returns the time axis range, h: the series' range, or one
// hour about a single time.
func timeRange(t []float64) (lo, hi float64) {
	lo, hi = t[0]/secondsPerHour, t[len(t)-1]/secondsPerHour
	if hi <= lo {
		lo, hi = lo-0.5, hi+0.5
	}
	return lo, hi
}

// setTimeAxis sets the x range of a time chart, h.
func setTimeAxis(p *plot.Plot, lo, hi float64) {
	p.X.Min, p.X.Max = lo, hi
	p.X.Padding = 0
}

// fromZero sets a y axis for non-negative quantities: from zero (or the
// smallest value when negative) to 12 % above the largest, so that the
// legend and stage names have room.
func fromZero(a *plot.Axis, v []float64, factor float64) {
	lo, hi := 0.0, 0.0
	for _, x := range v {
		lo, hi = math.Min(lo, x*factor), math.Max(hi, x*factor)
	}
	if hi == lo {
		hi = lo + 1
	}
	a.Min, a.Max = lo, hi+0.12*(hi-lo)
	a.Padding = 0
}

// alignX trims the canvases so that the plots' data areas share their left
// and right edges (the widest axes decide). Two passes absorb the small
// change of tick-label padding that trimming can cause.
func alignX(ps []*plot.Plot, cs []*draw.Canvas) {
	for range 2 {
		left, right := vg.Length(math.Inf(-1)), vg.Length(math.Inf(1))
		for i, p := range ps {
			d := p.DataCanvas(*cs[i])
			left, right = max(left, d.Min.X), min(right, d.Max.X)
		}
		for i, p := range ps {
			d := p.DataCanvas(*cs[i])
			cs[i].Min.X += left - d.Min.X
			cs[i].Max.X -= d.Max.X - right
		}
	}
}

// alignY trims the canvases so that the plots' data areas share their top
// and bottom edges, as alignX does for left and right.
func alignY(ps []*plot.Plot, cs []*draw.Canvas) {
	for range 2 {
		bottom, top := vg.Length(math.Inf(-1)), vg.Length(math.Inf(1))
		for i, p := range ps {
			d := p.DataCanvas(*cs[i])
			bottom, top = max(bottom, d.Min.Y), min(top, d.Max.Y)
		}
		for i, p := range ps {
			d := p.DataCanvas(*cs[i])
			cs[i].Min.Y += bottom - d.Min.Y
			cs[i].Max.Y -= d.Max.Y - top
		}
	}
}

// unlabelled drops the labels of another ticker's ticks.
type unlabelled struct{ plot.Ticker }

// Ticks implements plot.Ticker.
func (u unlabelled) Ticks(min, max float64) []plot.Tick {
	ts := u.Ticker.Ticks(min, max)
	for i := range ts {
		ts[i].Label = ""
	}
	return ts
}

// stageLines draws the stage starts as dashed vertical lines, with the
// names written upwards beside them when labels is set.
type stageLines struct {
	marks  []StageMark
	labels bool
}

// Plot implements plot.Plotter.
func (s stageLines) Plot(c draw.Canvas, p *plot.Plot) {
	tx, _ := p.Transforms(&c)
	line := draw.LineStyle{Color: greyGuide, Width: 1, Dashes: []vg.Length{4, 3}}
	st := textStyle(sizeTag, false, draw.XRight, draw.YTop)
	st.Rotation = math.Pi / 2
	st.Color = greyGuide
	const slack = 0.5 // Lines this close outside the frame are still drawn, points.
	for _, m := range s.marks {
		x := tx(m.Start / secondsPerHour)
		if x < c.Min.X-slack || x > c.Max.X+slack {
			continue
		}
		c.StrokeLine2(line, x, c.Min.Y, x, c.Max.Y)
		if s.labels && m.Name != "" {
			haloText(c, st, vg.Point{X: x + 3, Y: c.Max.Y - 4}, m.Name)
		}
	}
}

// checkTimes requires a non-empty, finite, non-decreasing time series.
func checkTimes(chart string, t []float64) error {
	if len(t) == 0 {
		return fmt.Errorf("report: %s chart has no times", chart)
	}
	for i, v := range t {
		if !finite(v) {
			return fmt.Errorf("report: %s Time[%d] = %g s: must be finite", chart, i, v)
		}
		if i > 0 && v < t[i-1] {
			return fmt.Errorf("report: %s Time[%d] = %g s is before Time[%d] = %g s: times must not decrease", chart, i, v, i-1, t[i-1])
		}
	}
	return nil
}

// checkSeries requires n finite values.
func checkSeries(chart, name string, v []float64, n int) error {
	if len(v) != n {
		return fmt.Errorf("report: %s %s has %d values for %d times: need one per time", chart, name, len(v), n)
	}
	for i, x := range v {
		if !finite(x) {
			return fmt.Errorf("report: %s %s[%d] = %g: must be finite", chart, name, i, x)
		}
	}
	return nil
}

// checkStages requires finite stage starts.
func checkStages(chart string, ms []StageMark) error {
	for i, m := range ms {
		if !finite(m.Start) {
			return fmt.Errorf("report: %s Stages[%d] (%q) Start = %g s: must be finite", chart, i, m.Name, m.Start)
		}
	}
	return nil
}

// maxOf returns the largest value of v (v not empty).
func maxOf(v []float64) float64 {
	m := math.Inf(-1)
	for _, x := range v {
		m = math.Max(m, x)
	}
	return m
}
