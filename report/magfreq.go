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

// MagnitudeFrequency is the magnitude–frequency chart of a catalogue: the
// cumulative number of events N(≥ M) on a logarithmic axis, the magnitude
// of completeness Mc, and the Gutenberg–Richter line log₁₀N = a − bM with
// the b-value given (Gutenberg & Richter 1944, Bulletin of the
// Seismological Society of America 34(4), 185–188).
//
// The b-value, its uncertainty and Mc are computed elsewhere (e.g. by the
// maximum-likelihood estimate of Aki 1965) and only drawn here. Such an
// estimate fixes the slope; the line is drawn through the observed count
// at Mc, a = log₁₀ N(≥ Mc) + b·Mc, which is the a-value the same fit
// implies (the fit is normalised to the events at or above Mc), from Mc to
// the largest magnitude.
type MagnitudeFrequency struct {
	Title string
	Note  string // Printed under the chart, e.g. the estimator used.
	// Magnitudes of the events, Mw; at least one.
	Magnitudes []float64
	// BinWidth ΔM of the cumulative counts: N(≥ M) is drawn at every
	// multiple of ΔM from the smallest to the largest magnitude; 0 means
	// 0.1.
	BinWidth float64
	// BValue b > 0 and its standard error BError ≥ 0, as estimated.
	BValue, BError float64
	// Completeness is the magnitude of completeness Mc.
	Completeness float64
}

// DefaultBinWidth is the magnitude bin of the cumulative counts when
// BinWidth is zero: 0.1, the usual resolution of catalogue magnitudes
// (common practice, no source).
const DefaultBinWidth = 0.1

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (m *MagnitudeFrequency) WritePNG(w io.Writer, s Size) error {
	pg, _, err := m.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// minCount is the bottom of the count axis: half an event, so that a
// count of one is inside it.
const minCount = 0.5

// maxMagnitudeBins bounds the number of cumulative-count points.
const maxMagnitudeBins = 10000

// validate checks the catalogue and the fit values.
func (m *MagnitudeFrequency) validate() error {
	if len(m.Magnitudes) == 0 {
		return fmt.Errorf("report: magnitude–frequency chart has no magnitudes")
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, mw := range m.Magnitudes {
		if !finite(mw) {
			return fmt.Errorf("report: magnitude–frequency Magnitudes[%d] = %g: must be finite", i, mw)
		}
		lo, hi = math.Min(lo, mw), math.Max(hi, mw)
	}
	if w := m.binWidth(); !(w > 0) || !finite(w) || (hi-lo)/w > maxMagnitudeBins {
		return fmt.Errorf("report: magnitude–frequency BinWidth = %g: need > 0 and at most %d bins over the magnitudes %g to %g", w, maxMagnitudeBins, lo, hi)
	}
	if !(m.BValue > 0) || !finite(m.BValue) || !(m.BError >= 0) || !finite(m.BError) {
		return fmt.Errorf("report: magnitude–frequency b = %g ± %g: need finite b > 0 and an error ≥ 0", m.BValue, m.BError)
	}
	if !finite(m.Completeness) {
		return fmt.Errorf("report: magnitude–frequency Completeness = %g: must be finite", m.Completeness)
	}
	return nil
}

func (m *MagnitudeFrequency) binWidth() float64 {
	if m.BinWidth == 0 {
		return DefaultBinWidth
	}
	return m.BinWidth
}

// cumulative returns N(≥ M) at M = k·ΔM for every k from the bin of the
// smallest magnitude to that of the largest, where N ≥ 1. A magnitude
// within 10⁻⁹·ΔM below a bin edge counts in that bin, so that magnitudes
// written with ΔM's resolution (e.g. −1.2 as −1.2000000000000002) fall in
// their own bin.
func (m *MagnitudeFrequency) cumulative() plotter.XYs {
	w := m.binWidth()
	const edgeTol = 1e-9
	k0, k1 := math.Inf(1), math.Inf(-1)
	for _, mw := range m.Magnitudes {
		k := math.Floor(mw/w + edgeTol)
		k0, k1 = math.Min(k0, k), math.Max(k1, k)
	}
	counts := make([]float64, int(k1-k0)+1)
	for _, mw := range m.Magnitudes {
		counts[int(math.Floor(mw/w+edgeTol)-k0)]++
	}
	pts := make(plotter.XYs, len(counts))
	n := 0.0
	for i := len(counts) - 1; i >= 0; i-- {
		n += counts[i]
		pts[i] = plotter.XY{X: (k0 + float64(i)) * w, Y: n}
	}
	return pts
}

// countAt returns N(≥ mc) read from the cumulative points (the first
// point at or above mc), or 0 when mc is above them all.
func countAt(pts plotter.XYs, mc, w float64) float64 {
	for _, q := range pts {
		if q.X >= mc-1e-9*w {
			return q.Y
		}
	}
	return 0
}

// Magnitude–frequency styles.
var (
	glyphCumulative = draw.GlyphStyle{Color: okabeBlue, Radius: 3.5, Shape: draw.CircleGlyph{}}
	styleGR         = draw.LineStyle{Color: okabeVermillion, Width: 2}
	styleMc         = draw.LineStyle{Color: greyGuide, Width: 1.2, Dashes: []vg.Length{5, 3}}
)

// render draws the chart on a new page.
func (m *MagnitudeFrequency) render(s Size) (*page, chartFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, chartFrame{}, err
	}
	if err := m.validate(); err != nil {
		return nil, chartFrame{}, err
	}
	pg := newPage(s)
	body := frame(pg.dc, m.Title, m.Note)
	p := newPlot("Moment magnitude Mw", "Number of events N(≥ Mw)")
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = plot.LogTicks{Prec: -1}
	pts := m.cumulative()
	w := m.binWidth()
	lo, hi := pts[0].X, pts[len(pts)-1].X
	lo, hi = math.Min(lo, m.Completeness)-w, math.Max(hi, m.Completeness)+w
	p.Add(&plotter.Scatter{XYs: pts, GlyphStyle: glyphCumulative})
	rows := []keyRow{{text: "Cumulative count", symbol: glyphSymbol(glyphCumulative)}}
	if nc := countAt(pts, m.Completeness, w); nc > 0 {
		a := math.Log10(nc) + m.BValue*m.Completeness
		// To the largest magnitude, or to where the line leaves the axis
		// at N = minCount (log scales cannot take N ≤ 0).
		top := math.Min(pts[len(pts)-1].X, m.Completeness+math.Log10(nc/minCount)/m.BValue)
		line := plotter.XYs{{X: m.Completeness, Y: nc}, {X: top, Y: math.Pow(10, a-m.BValue*top)}}
		p.Add(&plotter.Line{XYs: line, LineStyle: styleGR})
		rows = append(rows, keyRow{text: fmt.Sprintf("log₁₀N = a − bM, b = %s ± %s, a = %s",
			trimFloatDigits(m.BValue, 2), trimFloatDigits(m.BError, 2), trimFloatDigits(a, 2)), symbol: lineSymbol(styleGR)})
	}
	p.Add(verticalLine{x: m.Completeness, style: styleMc})
	// Ranges last: plot.Add widens them to the data, and the line may
	// reach counts far below one.
	p.X.Min, p.X.Max, p.X.Padding = lo, hi, 0
	p.Y.Min, p.Y.Max, p.Y.Padding = minCount, math.Pow(10, math.Ceil(math.Log10(pts[0].Y)+0.3)), 0
	rows = append(rows, keyRow{text: "Mc = " + trimFloatDigits(m.Completeness, 2), symbol: lineSymbol(styleMc)})
	body = keyBelow(body, rows)
	p.Draw(body)
	return pg, newChartFrame(pg, p, body), nil
}

// verticalLine draws a full-height line at x. It is a plot.Plotter.
type verticalLine struct {
	x     float64
	style draw.LineStyle
}

// Plot implements plot.Plotter.
func (v verticalLine) Plot(c draw.Canvas, p *plot.Plot) {
	tx, _ := p.Transforms(&c)
	if x := tx(v.x); x >= c.Min.X && x <= c.Max.X {
		c.StrokeLine2(v.style, x, c.Min.Y, x, c.Max.Y)
	}
}
