package report

import (
	"fmt"
	"image/color"
	"io"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Fan is the percentile fan chart of the stimulated area of one batch
// sweep value over time: the P10–P90 band shaded, P50 as a solid line and
// the mean dashed.
type Fan struct {
	Title string
	// Convention defines the percentiles, printed under the chart, e.g.
	// "P10/P50/P90 = 10th/50th/90th percentile of 200 realizations,
	// ascending". Required: the batch defines it, not this package.
	Convention string
	Time       []float64 // Times, s, non-decreasing.
	P10        []float64 // Stimulated area at each time, m².
	P50        []float64 // m².
	P90        []float64 // m².
	Mean       []float64 // m²; nil draws no mean.
	Stages     []StageMark
}

// Fan styles.
var (
	colourBand   = color.NRGBA{86, 180, 233, 110} // Okabe–Ito sky blue, translucent.
	styleMedian  = draw.LineStyle{Color: okabeBlue, Width: 2.2}
	styleMean    = draw.LineStyle{Color: okabeBlack, Width: 1.5, Dashes: []vg.Length{6, 3}}
	styleBandRim = draw.LineStyle{Color: okabeSkyBlue, Width: 0.8}
)

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (f *Fan) WritePNG(w io.Writer, s Size) error {
	pg, err := f.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the series and the order of the percentiles.
func (f *Fan) validate() error {
	if f.Convention == "" {
		return fmt.Errorf("report: fan chart has no percentile Convention: the batch must say what P10, P50 and P90 are")
	}
	if err := checkTimes("fan", f.Time); err != nil {
		return err
	}
	n := len(f.Time)
	for _, s := range []struct {
		name string
		v    []float64
	}{{"P10", f.P10}, {"P50", f.P50}, {"P90", f.P90}} {
		if err := checkSeries("fan", s.name, s.v, n); err != nil {
			return err
		}
	}
	if f.Mean != nil {
		if err := checkSeries("fan", "Mean", f.Mean, n); err != nil {
			return err
		}
	}
	for i := range n {
		if err := checkOrdered("fan", fmt.Sprintf("at Time[%d]", i), f.P10[i], f.P50[i], f.P90[i]); err != nil {
			return err
		}
	}
	return checkStages("fan", f.Stages)
}

// checkOrdered requires P10 ≤ P50 ≤ P90.
func checkOrdered(chart, where string, p10, p50, p90 float64) error {
	if p10 > p50 || p50 > p90 {
		return fmt.Errorf("report: %s percentiles %s: P10 = %g, P50 = %g, P90 = %g: need P10 ≤ P50 ≤ P90", chart, where, p10, p50, p90)
	}
	return nil
}

// render draws the chart on a new page.
func (f *Fan) render(s Size) (*page, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, err
	}
	if err := f.validate(); err != nil {
		return nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, f.Title, f.Convention)
	factor, unit := areaUnit(maxOf(f.P90))
	p := newPlot("Time, h", "Stimulated area, "+unit)
	tMin, tMax := timeRange(f.Time)
	setTimeAxis(p, tMin, tMax)
	fromZero(&p.Y, f.P90, factor)
	p.Add(stageLines{marks: f.Stages, labels: true})

	p.Add(horizontalGrid())
	p.Add(bandPolygon(f.Time, f.P10, f.P90, factor))
	addSeries(p, f.Time, f.P50, factor, styleMedian)
	rows := []keyRow{
		{text: "P10–P90 band", symbol: bandSymbol},
		{text: "P50 (median)", symbol: lineSymbol(styleMedian)},
	}
	if f.Mean != nil {
		addSeries(p, f.Time, f.Mean, factor, styleMean)
		rows = append(rows, keyRow{text: "Mean", symbol: lineSymbol(styleMean)})
	}
	body = keyBelow(body, rows)
	p.Draw(body)
	return pg, nil
}

// bandPolygon returns the shaded band between lo and hi over times t (s),
// values times factor. A single time gives a thin vertical band.
func bandPolygon(t, lo, hi []float64, factor float64) *plotter.Polygon {
	n := len(t)
	ring := make(plotter.XYs, 0, 2*n+2)
	for i := range n {
		ring = append(ring, plotter.XY{X: t[i] / secondsPerHour, Y: hi[i] * factor})
	}
	for i := n - 1; i >= 0; i-- {
		ring = append(ring, plotter.XY{X: t[i] / secondsPerHour, Y: lo[i] * factor})
	}
	poly := &plotter.Polygon{XYs: []plotter.XYs{ring}, Color: colourBand, LineStyle: styleBandRim}
	return poly
}

// bandSymbol is the key symbol of the percentile band.
func bandSymbol(c draw.Canvas, at vg.Point) {
	r := vg.Rectangle{
		Min: vg.Point{X: at.X - keySymbolWidth/2, Y: at.Y - 5},
		Max: vg.Point{X: at.X + keySymbolWidth/2, Y: at.Y + 5},
	}
	c.SetColor(colourBand)
	c.Fill(r.Path())
	c.SetLineStyle(styleBandRim)
	c.Stroke(r.Path())
}

// horizontalGrid returns light horizontal grid lines at the y ticks.
func horizontalGrid() *plotter.Grid {
	g := plotter.NewGrid()
	g.Vertical.Color = nil
	g.Horizontal = draw.LineStyle{Color: color.NRGBA{215, 215, 215, 255}, Width: 0.5}
	return g
}
