package report

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// FanPanels are the percentile fans of every case of a batch as small
// multiples on one shared pair of axes (same time and area ranges in
// every panel), so that bands compare at a glance. Each panel shows its
// case's P10–P90 band and P50, and the other cases' P50 as thin grey
// lines for reference.
type FanPanels struct {
	Title string
	// Convention defines the percentiles (see Fan.Convention). Required.
	Convention string
	Cases      []FanCase
}

// FanCase is one case of FanPanels.
type FanCase struct {
	Label         string    // e.g. "20 cP".
	Time          []float64 // s, non-decreasing.
	P10, P50, P90 []float64 // Stimulated area, m².
}

// styleOtherMedian draws the other cases' medians.
var styleOtherMedian = draw.LineStyle{Color: color.NRGBA{150, 150, 150, 255}, Width: 1}

// WritePNG draws the panels at size s (zero: DefaultSize) and writes them
// to w as PNG. Invalid input returns an error and writes nothing.
func (f *FanPanels) WritePNG(w io.Writer, s Size) error {
	pg, _, err := f.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// MaxFanPanels is the most cases FanPanels draws on one page.
const MaxFanPanels = 12

// validate checks each case as a Fan.
func (f *FanPanels) validate() error {
	if n := len(f.Cases); n == 0 || n > MaxFanPanels {
		return fmt.Errorf("report: fan panels have %d cases: need 1 to %d", n, MaxFanPanels)
	}
	for i, c := range f.Cases {
		fan := Fan{Convention: f.Convention, Time: c.Time, P10: c.P10, P50: c.P50, P90: c.P90}
		if err := fan.validate(); err != nil {
			return fmt.Errorf("%w (Cases[%d], %q)", err, i, c.Label)
		}
	}
	return nil
}

// render draws the panels on a new page and returns the frame of each.
func (f *FanPanels) render(s Size) (*page, []chartFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, nil, err
	}
	if err := f.validate(); err != nil {
		return nil, nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, f.Title, f.Convention)
	body = keyBelow(body, []keyRow{
		{text: "P10–P90 band", symbol: bandSymbol},
		{text: "P50 (median)", symbol: lineSymbol(styleMedian)},
		{text: "P50 of the other cases", symbol: lineSymbol(styleOtherMedian)},
	})
	var times, p90 []float64
	for _, c := range f.Cases {
		times, p90 = append(times, c.Time...), append(p90, c.P90...)
	}
	factor, unit := areaUnit(maxOf(p90))
	tMin, tMax := timeRange([]float64{slices.Min(times), slices.Max(times)})
	n := len(f.Cases)
	cols := int(math.Ceil(math.Sqrt(float64(n))))
	rows := (n + cols - 1) / cols
	const gap = 10 // Between panels, points.
	w := (body.Max.X - body.Min.X - gap*vg.Length(cols-1)) / vg.Length(cols)
	h := (body.Max.Y - body.Min.Y - gap*vg.Length(rows-1)) / vg.Length(rows)
	plots := make([]*plot.Plot, n)
	areas := make([]draw.Canvas, n)
	for i := range f.Cases {
		col, row := i%cols, i/cols
		p := f.panel(i, panelAxes{tMin: tMin, tMax: tMax, p90: p90, factor: factor})
		if i+cols >= n { // No panel below.
			p.X.Label.Text = "Time, h"
		}
		if col == 0 {
			p.Y.Label.Text = "Stimulated area, " + unit
		}
		a := body
		a.Min.X = body.Min.X + vg.Length(col)*(w+gap)
		a.Max.X = a.Min.X + w
		a.Max.Y = body.Max.Y - vg.Length(row)*(h+gap)
		a.Min.Y = a.Max.Y - h
		plots[i], areas[i] = p, a
	}
	// Align the data areas of each column and of each row, so that the
	// panels share their axes exactly.
	for col := range cols {
		var ps []*plot.Plot
		var cs []*draw.Canvas
		for i := col; i < n; i += cols {
			ps, cs = append(ps, plots[i]), append(cs, &areas[i])
		}
		alignX(ps, cs)
	}
	for row := range rows {
		lo, hi := row*cols, min(n, (row+1)*cols)
		cs := make([]*draw.Canvas, 0, hi-lo)
		for i := lo; i < hi; i++ {
			cs = append(cs, &areas[i])
		}
		alignY(plots[lo:hi], cs)
	}
	frames := make([]chartFrame, n)
	for i, p := range plots {
		p.Draw(areas[i])
		frames[i] = newChartFrame(pg, p, areas[i])
	}
	return pg, frames, nil
}

// panelAxes are the ranges every fan panel shares.
type panelAxes struct {
	tMin, tMax float64   // Time range, h.
	p90        []float64 // Every case's P90, m², for the area range.
	factor     float64   // From m² to the drawn unit.
}

// panel returns the plot of case i: the other cases' medians in grey, its
// band and median, and its name.
func (f *FanPanels) panel(i int, ax panelAxes) *plot.Plot {
	c := f.Cases[i]
	p := newPlot("", "")
	setTimeAxis(p, ax.tMin, ax.tMax)
	fromZero(&p.Y, ax.p90, ax.factor)
	p.Add(horizontalGrid())
	for j, o := range f.Cases {
		if j != i {
			addSeries(p, o.Time, o.P50, ax.factor, styleOtherMedian)
		}
	}
	p.Add(bandPolygon(c.Time, c.P10, c.P90, ax.factor))
	addSeries(p, c.Time, c.P50, ax.factor, styleMedian)
	p.Add(panelLabel(c.Label))
	return p
}

// panelLabel writes a panel's case name in its upper-left corner. It is a
// plot.Plotter.
type panelLabel string

// Plot implements plot.Plotter.
func (l panelLabel) Plot(c draw.Canvas, _ *plot.Plot) {
	st := textStyle(sizeLabel, true, draw.XLeft, draw.YTop)
	haloText(c, st, vg.Point{X: c.Min.X + 6, Y: c.Max.Y - 4}, string(l))
}

// RatioDistribution is the distribution of paired ratios of a headline
// number: for each realization, the case's value divided by the reference
// case's value in the same realization (common random numbers: the same
// fracture network), drawn as an empirical cumulative distribution
// function on a logarithmic ratio axis, one line per case, with a line at
// ratio 1. The ratios come from the batch; this package only sorts them
// for drawing.
type RatioDistribution struct {
	Title string
	Note  string // e.g. how many pairs were dropped because a value was 0.
	// Quantity names the headline number, e.g. "Final stimulated area".
	Quantity string
	// Reference names the reference case, e.g. "1 cP".
	Reference string
	Cases     []RatioSeries
}

// RatioSeries is the paired ratios of one case against the reference.
type RatioSeries struct {
	Label  string
	Ratios []float64 // Finite, > 0; at least one.
}

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (r *RatioDistribution) WritePNG(w io.Writer, s Size) error {
	pg, _, err := r.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the series.
func (r *RatioDistribution) validate() error {
	if len(r.Cases) == 0 {
		return fmt.Errorf("report: ratio distribution has no cases")
	}
	for i, c := range r.Cases {
		if len(c.Ratios) == 0 {
			return fmt.Errorf("report: ratio distribution Cases[%d] (%q) has no ratios", i, c.Label)
		}
		for k, v := range c.Ratios {
			if !(v > 0) || !finite(v) {
				return fmt.Errorf("report: ratio distribution Cases[%d] (%q) Ratios[%d] = %g: must be finite and > 0 (drop pairs with a zero and say so in Note)", i, c.Label, k, v)
			}
		}
	}
	return nil
}

// ecdf returns the steps of the empirical distribution function of v:
// at the i-th smallest value (1-based) it rises from (i−1)/n to i/n, in %.
func ecdf(v []float64) plotter.XYs {
	s := slices.Sorted(slices.Values(v))
	n := float64(len(s))
	pts := make(plotter.XYs, 0, 2*len(s))
	for i, x := range s {
		pts = append(pts, plotter.XY{X: x, Y: 100 * float64(i) / n}, plotter.XY{X: x, Y: 100 * float64(i+1) / n})
	}
	return pts
}

// render draws the chart on a new page.
func (r *RatioDistribution) render(s Size) (*page, chartFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, chartFrame{}, err
	}
	if err := r.validate(); err != nil {
		return nil, chartFrame{}, err
	}
	pg := newPage(s)
	body := frame(pg.dc, r.Title, r.Note)
	quantity := r.Quantity
	if quantity == "" {
		quantity = "Headline value"
	}
	p := newPlot(fmt.Sprintf("Ratio of %s, case / %s, same realization", lowerFirst(quantity), r.Reference), "Cumulative share of pairs, %")
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	lo, hi := 1.0, 1.0
	var rows []keyRow
	for i, c := range r.Cases {
		lo, hi = math.Min(lo, slices.Min(c.Ratios)), math.Max(hi, slices.Max(c.Ratios))
		st := styleOf(i)
		p.Add(&plotter.Line{XYs: ecdf(c.Ratios), LineStyle: st.line})
		rows = append(rows, keyRow{text: fmt.Sprintf("%s (%d pairs)", c.Label, len(c.Ratios)), symbol: lineSymbol(st.line)})
	}
	// Whole decades around the data, so that the log ticks have labels.
	p.X.Min, p.X.Max = math.Pow(10, math.Floor(math.Log10(lo))), math.Pow(10, math.Ceil(math.Log10(hi)))
	if p.X.Max/p.X.Min < 10 {
		p.X.Min, p.X.Max = p.X.Min/math.Sqrt(10), p.X.Max*math.Sqrt(10)
	}
	p.Y.Min, p.Y.Max, p.Y.Padding = 0, 100, 0
	p.Add(horizontalGrid())
	p.Add(verticalLine{x: 1, style: styleMc})
	rows = append(rows, keyRow{text: "Ratio 1 (no change)", symbol: lineSymbol(styleMc)})
	body = keyBelow(body, rows)
	p.Draw(body)
	return pg, newChartFrame(pg, p, body), nil
}

// lowerFirst lowers an ASCII first letter ("Final area" → "final area").
func lowerFirst(s string) string {
	if s != "" && s[0] >= 'A' && s[0] <= 'Z' {
		return string(s[0]+'a'-'A') + s[1:]
	}
	return s
}
