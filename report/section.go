package report

import (
	"fmt"
	"image/color"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Point3 is a position in local coordinates with depth, m.
type Point3 struct {
	East, North float64 // Local easting and northing, m.
	Depth       float64 // True vertical depth, m, positive down.
}

// CrossSection is a vertical section along a well: the events and the
// fracture outlines projected on the vertical plane through From and To
// (map view, e.g. the heel and the toe of a horizontal well), with the
// distance along From→To across and depth positive down.
//
// A point p is drawn at s = (p − From)·u across, u the unit map vector
// from From to To, and at its depth; its distance off the plane is
// (p − From)·n, n = u turned 90° clockwise (orthogonal projection). The
// axes have independent scales; the vertical exaggeration is printed under
// the chart.
type CrossSection struct {
	Title    string
	Note     string
	From, To Point // Ends of the section line, map view, m.
	// HalfWidth leaves out what lies farther than this from the plane, m
	// (a fracture when no vertex is that close and it does not cross the
	// plane); 0 keeps everything.
	HalfWidth float64
	Wells     []SectionWell
	Fractures []SectionFracture
	Events    []SectionEvent
	// Colour names the quantity of SectionFracture.Value (see
	// ColourScale).
	Colour ColourScale
	// LayerTop and LayerBottom are the depths of the simulated layer's
	// top and base, m, drawn as dashed lines; both zero draws none.
	LayerTop, LayerBottom float64
}

// SectionWell is a well path in 3-D.
type SectionWell struct {
	Name string
	Path []Point3 // At least two points.
}

// SectionFracture is a fracture outline in 3-D (the vertices of its disc
// or rectangle) with a colour value.
type SectionFracture struct {
	Outline []Point3 // At least three vertices.
	Value   float64  // In Colour.Unit; NaN for none (grey).
}

// SectionEvent is an event hypocentre.
type SectionEvent struct {
	At        Point3
	Magnitude float64 // Mw.
}

// WritePNG draws the section at size s (zero: DefaultSize) and writes it
// to w as PNG. Invalid input returns an error and writes nothing.
func (x *CrossSection) WritePNG(w io.Writer, s Size) error {
	pg, _, err := x.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks every coordinate and value.
func (x *CrossSection) validate() error {
	if err := checkPoint("From", 0, "section", x.From); err != nil {
		return err
	}
	if err := checkPoint("To", 0, "section", x.To); err != nil {
		return err
	}
	if x.From == x.To {
		return fmt.Errorf("report: cross-section From = To = (%g, %g) m: the section line needs two distinct ends", x.From.East, x.From.North)
	}
	if !(x.HalfWidth >= 0) || !finite(x.HalfWidth) {
		return fmt.Errorf("report: cross-section HalfWidth = %g m: must be finite and ≥ 0", x.HalfWidth)
	}
	if !finite(x.LayerTop) || !finite(x.LayerBottom) || x.LayerBottom < x.LayerTop {
		return fmt.Errorf("report: cross-section layer %g–%g m: need finite depths, top ≤ bottom", x.LayerTop, x.LayerBottom)
	}
	check := func(what string, i int, ps []Point3, need int) error {
		if len(ps) < need {
			return fmt.Errorf("report: cross-section %s[%d] has %d points: need at least %d", what, i, len(ps), need)
		}
		for j, p := range ps {
			if !finite(p.East) || !finite(p.North) || !finite(p.Depth) {
				return fmt.Errorf("report: cross-section %s[%d] point %d = (%g, %g, %g) m: must be finite", what, i, j, p.East, p.North, p.Depth)
			}
		}
		return nil
	}
	for i, w := range x.Wells {
		if err := check("Wells", i, w.Path, 2); err != nil {
			return err
		}
	}
	for i, f := range x.Fractures {
		if err := check("Fractures", i, f.Outline, 3); err != nil {
			return err
		}
		if math.IsInf(f.Value, 0) {
			return fmt.Errorf("report: cross-section Fractures[%d].Value = %g: must be finite or NaN (no value)", i, f.Value)
		}
	}
	for i, e := range x.Events {
		if err := check("Events", i, []Point3{e.At}, 1); err != nil {
			return err
		}
		if !finite(e.Magnitude) {
			return fmt.Errorf("report: cross-section Events[%d].Magnitude = %g: must be finite", i, e.Magnitude)
		}
	}
	return checkColourRange("cross-section", x.Colour)
}

// project returns the distance along the section and the distance off its
// plane of p, m.
func (x *CrossSection) project(p Point3) (along, off float64) {
	ux, uy := x.To.East-x.From.East, x.To.North-x.From.North
	l := math.Hypot(ux, uy)
	ux, uy = ux/l, uy/l
	dx, dy := p.East-x.From.East, p.North-x.From.North
	return dx*ux + dy*uy, dx*uy - dy*ux
}

// near reports whether the points lie within HalfWidth of the plane or on
// both sides of it.
func (x *CrossSection) near(ps []Point3) bool {
	if x.HalfWidth == 0 {
		return true
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range ps {
		_, off := x.project(p)
		if math.Abs(off) <= x.HalfWidth {
			return true
		}
		lo, hi = math.Min(lo, off), math.Max(hi, off)
	}
	return lo < 0 && hi > 0
}

// sectionPlot holds what the section draws, in (along, depth) metres.
type sectionPlot struct {
	wells     [][]vg.Point // Unscaled data points: X along, Y depth.
	wellNames []string
	fractures [][]vg.Point
	values    []float64
	events    []vg.Point
	mags      []float64
}

// content projects everything kept onto the section plane.
func (x *CrossSection) content() sectionPlot {
	var sp sectionPlot
	proj := func(ps []Point3) []vg.Point {
		out := make([]vg.Point, len(ps))
		for i, p := range ps {
			a, _ := x.project(p)
			out[i] = vg.Point{X: vg.Length(a), Y: vg.Length(p.Depth)}
		}
		return out
	}
	for _, w := range x.Wells {
		sp.wells, sp.wellNames = append(sp.wells, proj(w.Path)), append(sp.wellNames, w.Name)
	}
	for _, f := range x.Fractures {
		if x.near(f.Outline) {
			sp.fractures, sp.values = append(sp.fractures, proj(f.Outline)), append(sp.values, f.Value)
		}
	}
	for _, e := range x.Events {
		if x.near([]Point3{e.At}) {
			sp.events, sp.mags = append(sp.events, proj([]Point3{e.At})[0]), append(sp.mags, e.Magnitude)
		}
	}
	return sp
}

// render draws the section on a new page.
func (x *CrossSection) render(s Size) (*page, chartFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, chartFrame{}, err
	}
	if err := x.validate(); err != nil {
		return nil, chartFrame{}, err
	}
	sp := x.content()
	layers := sectionLayers{x: x, sp: sp, levels: magnitudeLevels(sp.mags)}
	if lo, hi, ok := valueRange(x.Colour, func(yield func(float64) bool) {
		for _, v := range sp.values {
			if !yield(v) {
				return
			}
		}
	}); ok {
		layers.cmap = NewViridisMap(lo, hi)
	}
	pg := newPage(s)
	p := newPlot("Distance along the section, m", "Depth (TVD), m")
	p.Y.Scale = plot.InvertedScale{Normalizer: plot.LinearScale{}}
	b := sp.bounds(x)
	p.X.Min, p.X.Max, p.X.Padding = b.MinEast, b.MaxEast, 0
	p.Y.Min, p.Y.Max, p.Y.Padding = b.MinNorth, b.MaxNorth, 0
	p.Add(layers)
	note := fmt.Sprintf("Projected on the vertical plane through (%s, %s) → (%s, %s) m, local frame",
		formatSig(x.From.East), formatSig(x.From.North), formatSig(x.To.East), formatSig(x.To.North))
	mainArea, sideArea := splitSide(frame(pg.dc, x.Title, x.Note, note))
	p.Draw(mainArea)
	d := p.DataCanvas(mainArea)
	ve := (float64(d.Max.Y-d.Min.Y) / (p.Y.Max - p.Y.Min)) / (float64(d.Max.X-d.Min.X) / (p.X.Max - p.X.Min))
	var cmap palette.ColorMap
	if layers.cmap != nil {
		cmap = layers.cmap
	}
	drawColourPanel(sideArea, cmap, x.Colour.axisLabel(), []string{"Vertical exaggeration ×" + formatSig(ve)}, layers.keyRows())
	return pg, newChartFrame(pg, p, mainArea), nil
}

// splitSide splits a page body into a main area and a side panel on the
// right, 150–220 points wide, 12 points apart.
func splitSide(body draw.Canvas) (mainArea, side draw.Canvas) {
	const gap = 12 // Points.
	w := vg.Length(math.Min(220, math.Max(150, 0.22*float64(body.Max.X-body.Min.X))))
	mainArea, side = body, body
	mainArea.Max.X -= w + gap
	side.Min.X = side.Max.X - w
	return mainArea, side
}

// bounds returns the range of the drawn content with a 5 % margin: East
// for distance along, North for depth.
func (sp sectionPlot) bounds(x *CrossSection) Extent {
	b := Extent{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	add := func(q vg.Point) {
		b.MinEast, b.MaxEast = math.Min(b.MinEast, float64(q.X)), math.Max(b.MaxEast, float64(q.X))
		b.MinNorth, b.MaxNorth = math.Min(b.MinNorth, float64(q.Y)), math.Max(b.MaxNorth, float64(q.Y))
	}
	for _, ps := range append(append([][]vg.Point{}, sp.wells...), sp.fractures...) {
		for _, q := range ps {
			add(q)
		}
	}
	for _, q := range sp.events {
		add(q)
	}
	a, _ := x.project(Point3{East: x.To.East, North: x.To.North})
	add(vg.Point{X: 0, Y: vg.Length(b.MinNorth)})
	add(vg.Point{X: vg.Length(a), Y: vg.Length(b.MinNorth)})
	if x.LayerTop != 0 || x.LayerBottom != 0 {
		add(vg.Point{Y: vg.Length(x.LayerTop)})
		add(vg.Point{Y: vg.Length(x.LayerBottom)})
	}
	if math.IsInf(b.MinNorth, 1) || b.MaxNorth-b.MinNorth < 1 {
		c := 0.0
		if !math.IsInf(b.MinNorth, 1) {
			c = (b.MinNorth + b.MaxNorth) / 2
		}
		b.MinNorth, b.MaxNorth = c-1, c+1
	}
	padE, padN := 0.05*(b.MaxEast-b.MinEast), 0.05*(b.MaxNorth-b.MinNorth)
	return Extent{b.MinEast - padE, b.MaxEast + padE, b.MinNorth - padN, b.MaxNorth + padN}
}

// sectionFillAlpha is the opacity of a projected fracture's fill, /255:
// light enough that overlapping fractures and events stay visible.
const sectionFillAlpha = 70

// Section styles.
var (
	colourSectionEvent = color.NRGBA{0, 0, 0, 150}
	styleLayer         = draw.LineStyle{Color: greyGuide, Width: 1, Dashes: []vg.Length{6, 3}}
)

// sectionLayers draws the section: layer lines, fracture outlines (filled
// translucent in their colour), events and wells. It is a plot.Plotter.
type sectionLayers struct {
	x      *CrossSection
	sp     sectionPlot
	cmap   *ColourMap
	levels []float64
}

// Plot implements plot.Plotter.
func (l sectionLayers) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	at := func(q vg.Point) vg.Point { return vg.Point{X: tx(float64(q.X)), Y: ty(float64(q.Y))} }
	if l.x.LayerTop != 0 || l.x.LayerBottom != 0 {
		for _, d := range [...]float64{l.x.LayerTop, l.x.LayerBottom} {
			y := ty(d)
			c.StrokeLine2(styleLayer, c.Min.X, y, c.Max.X, y)
		}
	}
	for i, ring := range l.sp.fractures {
		col := color.NRGBA(greyNoValue)
		if l.cmap != nil && !math.IsNaN(l.sp.values[i]) {
			col = l.cmap.clamped(l.sp.values[i])
		}
		pts := make([]vg.Point, len(ring)+1)
		for j, q := range ring {
			pts[j] = at(q)
		}
		pts[len(ring)] = pts[0]
		fill := col
		fill.A = sectionFillAlpha
		c.FillPolygon(fill, c.ClipPolygonXY(pts))
		c.StrokeLines(draw.LineStyle{Color: col, Width: 1.2}, c.ClipLinesXY(pts)...)
	}
	sty := draw.GlyphStyle{Color: colourSectionEvent, Shape: ringGlyph{width: widthEvent + 0.3}}
	for i, q := range l.sp.events {
		if pt := at(q); c.Contains(pt) {
			sty.Radius = eventRadius(l.sp.mags[i], l.levels)
			c.DrawGlyphNoClip(sty, pt)
		}
	}
	wellSty := draw.LineStyle{Color: colourWell, Width: widthWell}
	nameSty := textStyle(sizeTag, true, draw.XLeft, draw.YBottom)
	for i, w := range l.sp.wells {
		pts := make([]vg.Point, len(w))
		for j, q := range w {
			pts[j] = at(q)
		}
		c.StrokeLines(wellSty, c.ClipLinesXY(pts)...)
		if l.sp.wellNames[i] != "" && c.Contains(pts[0]) {
			haloText(c, nameSty, vg.Point{X: pts[0].X + 4, Y: pts[0].Y + 6}, l.sp.wellNames[i])
		}
	}
}

// fractureSymbol is the key symbol of a projected fracture: a translucent
// patch with an outline, in the middle colour of the scale.
func fractureSymbol(c draw.Canvas, at vg.Point) {
	r := vg.Rectangle{Min: vg.Point{X: at.X - keySymbolWidth/2, Y: at.Y - 5}, Max: vg.Point{X: at.X + keySymbolWidth/2, Y: at.Y + 5}}
	col := Viridis(0.5)
	fill := col
	fill.A = sectionFillAlpha
	c.SetColor(fill)
	c.Fill(r.Path())
	c.SetLineStyle(draw.LineStyle{Color: col, Width: 1.2})
	c.Stroke(r.Path())
}

// keyRows returns the section's key.
func (l sectionLayers) keyRows() []keyRow {
	var rows []keyRow
	if len(l.x.Wells) > 0 {
		rows = append(rows, keyRow{text: "Well path", symbol: lineSymbol(draw.LineStyle{Color: colourWell, Width: widthWell})})
	}
	if l.x.LayerTop != 0 || l.x.LayerBottom != 0 {
		rows = append(rows, keyRow{text: "Layer top and base", symbol: lineSymbol(styleLayer)})
	}
	if len(l.sp.fractures) > 0 {
		rows = append(rows, keyRow{text: "Fracture extent (projected)", symbol: fractureSymbol})
	}
	if len(l.levels) > 0 {
		rows = append(rows, keyRow{text: "Synthetic events"})
		for _, mw := range l.levels {
			r := eventRadius(mw, l.levels)
			rows = append(rows, keyRow{text: "Mw " + minus(formatMagnitude(mw)), height: 2*r + 2,
				symbol: glyphSymbol(draw.GlyphStyle{Color: colourSectionEvent, Radius: r, Shape: ringGlyph{width: widthEvent + 0.3}})})
		}
	}
	return rows
}
