package report

import (
	"fmt"
	"image/color"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// DistanceTime is the chart of event distance from the injection point
// against time (an r–t plot), with the triggering front of pore-pressure
// diffusion
//
//	r = √(4πD(t − Start))
//
// for each hydraulic diffusivity D given (Shapiro, Huenges & Borm 1997,
// Geophysical Journal International 131, F15–F18; the equation of the
// triggering front, its number in the paper not recalled). The diffusivities are the caller's choice (fitted or
// bracketing); each is printed in the key.
type DistanceTime struct {
	Title string
	Note  string // Printed under the chart, e.g. how distance is measured.
	// Events: time, distance from the injection point and magnitude.
	Events []DistanceEvent
	// SmallEvents are events below the resolution of the fractures (a
	// seismicity-rate catalogue), drawn as small dots beneath Events
	// whatever their magnitude.
	SmallEvents []DistanceEvent
	// Start is the start of injection, s: the front is drawn from it.
	Start float64
	// Diffusivities D, m²/s, > 0: one front each.
	Diffusivities []float64
	Stages        []StageMark
}

// DistanceEvent is one event on an r–t chart.
type DistanceEvent struct {
	Time      float64 // s.
	Distance  float64 // From the injection point, m, ≥ 0.
	Magnitude float64 // Moment magnitude Mw; sets the ring size.
}

// WritePNG draws the chart at size s (zero: DefaultSize) and writes it to
// w as PNG. Invalid input returns an error and writes nothing.
func (d *DistanceTime) WritePNG(w io.Writer, s Size) error {
	pg, _, err := d.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the events, the start and the diffusivities.
func (d *DistanceTime) validate() error {
	if !finite(d.Start) {
		return fmt.Errorf("report: distance–time Start = %g s: must be finite", d.Start)
	}
	for _, list := range []struct {
		name   string
		events []DistanceEvent
	}{{"Events", d.Events}, {"SmallEvents", d.SmallEvents}} {
		for i, e := range list.events {
			if !finite(e.Time) || !finite(e.Distance) || e.Distance < 0 || !finite(e.Magnitude) {
				return fmt.Errorf("report: distance–time %s[%d] = (t %g s, r %g m, Mw %g): need finite values and r ≥ 0", list.name, i, e.Time, e.Distance, e.Magnitude)
			}
		}
	}
	for i, D := range d.Diffusivities {
		if !(D > 0) || !finite(D) {
			return fmt.Errorf("report: distance–time Diffusivities[%d] = %g m²/s: must be finite and > 0", i, D)
		}
	}
	return checkStages("distance–time", d.Stages)
}

// triggeringFront returns r = √(4πD(t − start)), m, for t ≥ start, else 0
// (Shapiro, Huenges & Borm 1997, the triggering front).
func triggeringFront(D, start, t float64) float64 {
	if t <= start {
		return 0
	}
	return math.Sqrt(4 * math.Pi * D * (t - start))
}

// colourTimeEvent is the ring colour of events on time charts.
var colourTimeEvent = color.NRGBA{0, 114, 178, 170} // Okabe–Ito blue, translucent.

// render draws the chart on a new page.
func (d *DistanceTime) render(s Size) (*page, chartFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, chartFrame{}, err
	}
	if err := d.validate(); err != nil {
		return nil, chartFrame{}, err
	}
	pg := newPage(s)
	body := frame(pg.dc, d.Title, d.Note)
	p := newPlot("Time, h", "Distance from the injection point, m")
	p.Add(horizontalGrid())
	tLo, tHi, rHi := d.Start, d.Start, 0.0
	mws := make([]float64, len(d.Events))
	for i, e := range d.Events {
		tLo, tHi, rHi = math.Min(tLo, e.Time), math.Max(tHi, e.Time), math.Max(rHi, e.Distance)
		mws[i] = e.Magnitude
	}
	for _, e := range d.SmallEvents {
		tLo, tHi, rHi = math.Min(tLo, e.Time), math.Max(tHi, e.Time), math.Max(rHi, e.Distance)
	}
	lo, hi := timeRange([]float64{tLo, tHi})
	setTimeAxis(p, lo, hi)
	if rHi == 0 {
		rHi = 1
	}
	p.Y.Min, p.Y.Max, p.Y.Padding = 0, 1.1*rHi, 0
	p.Add(stageLines{marks: d.Stages, labels: true})
	levels := magnitudeLevels(mws)
	smallSty := draw.GlyphStyle{Color: fainter(colourSmallEvent, len(d.SmallEvents), floorSmallEvent), Radius: radiusSmallEvent, Shape: draw.CircleGlyph{}}
	p.Add(eventDots{events: d.SmallEvents, style: smallSty})
	p.Add(eventRings{events: d.Events, levels: levels})
	var rows []keyRow
	if len(d.SmallEvents) > 0 {
		smallSty.Color, smallSty.Radius = colourSmallEvent, 2*radiusSmallEvent
		rows = append(rows, keyRow{text: "Sub-resolution event", height: 4*radiusSmallEvent + 2, symbol: glyphSymbol(smallSty)})
	}
	for i, D := range d.Diffusivities {
		st := styleOf(i + 1) // Blue is the events'.
		p.Add(frontLine{D: D, start: d.Start, style: st.line})
		rows = append(rows, keyRow{text: fmt.Sprintf("r = √(4πDt), D = %s m²/s", formatSig(D)), symbol: lineSymbol(st.line)})
	}
	for _, mw := range levels {
		r := eventRadius(mw, levels)
		rows = append(rows, keyRow{text: "Mw " + minus(formatMagnitude(mw)), height: 2*r + 2,
			symbol: glyphSymbol(draw.GlyphStyle{Color: colourTimeEvent, Radius: r, Shape: ringGlyph{width: 1}})})
	}
	if len(rows) > 0 {
		body = keyBelow(body, rows)
	}
	p.Draw(body)
	return pg, newChartFrame(pg, p, body), nil
}

// eventRings draws events as rings sized by magnitude at (time in h,
// distance). It is a plot.Plotter.
type eventRings struct {
	events []DistanceEvent
	levels []float64
}

// Plot implements plot.Plotter.
func (er eventRings) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	sty := draw.GlyphStyle{Color: colourTimeEvent, Shape: ringGlyph{width: 1}}
	for _, e := range er.events {
		pt := vg.Point{X: tx(e.Time / secondsPerHour), Y: ty(e.Distance)}
		if c.Contains(pt) {
			sty.Radius = eventRadius(e.Magnitude, er.levels)
			c.DrawGlyphNoClip(sty, pt)
		}
	}
}

// eventDots draws events as equal dots at (time in h, distance). It is a
// plot.Plotter.
type eventDots struct {
	events []DistanceEvent
	style  draw.GlyphStyle
}

// Plot implements plot.Plotter.
func (ed eventDots) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	for _, e := range ed.events {
		if pt := (vg.Point{X: tx(e.Time / secondsPerHour), Y: ty(e.Distance)}); c.Contains(pt) {
			c.DrawGlyphNoClip(ed.style, pt)
		}
	}
}

// frontLine draws the triggering front over the chart's time range. It is
// a plot.Plotter.
type frontLine struct {
	D, start float64 // m²/s, s.
	style    draw.LineStyle
}

// Plot implements plot.Plotter.
func (f frontLine) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	const steps = 200
	t0 := math.Max(f.start, p.X.Min*secondsPerHour)
	t1 := p.X.Max * secondsPerHour
	if t1 <= t0 {
		return
	}
	pts := make(plotter.XYs, 0, steps+1)
	for i := 0; i <= steps; i++ {
		// Denser near the start, where the front rises steeply.
		u := float64(i) / steps
		t := t0 + (t1-t0)*u*u
		pts = append(pts, plotter.XY{X: t / secondsPerHour, Y: triggeringFront(f.D, f.start, t)})
	}
	line := make([]vg.Point, len(pts))
	for i, q := range pts {
		line[i] = vg.Point{X: tx(q.X), Y: ty(q.Y)}
	}
	c.StrokeLines(f.style, c.ClipLinesXY(line)...)
}

// formatSig writes v with three significant digits (at least the units
// digit), in exponent form only below 10⁻³ or from 10⁵ on.
func formatSig(v float64) string {
	if v == 0 {
		return "0"
	}
	if a := math.Abs(v); a >= 1e-3 && a < 1e5 {
		d := max(0, 2-int(math.Floor(math.Log10(a))))
		return trimFloatDigits(v, d)
	}
	return fmt.Sprintf("%.2e", v)
}

// trimFloatDigits writes v with d decimals, trailing zeros removed.
func trimFloatDigits(v float64, d int) string {
	s := fmt.Sprintf("%.*f", d, v)
	for d > 0 && s[len(s)-1] == '0' {
		s = s[:len(s)-1]
	}
	if s[len(s)-1] == '.' {
		s = s[:len(s)-1]
	}
	return minus(s)
}
