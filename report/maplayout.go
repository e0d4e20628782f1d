package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// mapFrame is where a map's data area ended up on its page.
type mapFrame struct {
	pg                     *page
	data                   draw.Canvas // Data area, page points.
	minE, maxE, minN, maxN float64     // Shown range, m.
}

// pixel returns the image coordinates of a map point (see page.pixel).
func (f mapFrame) pixel(q Point) (x, y float64) {
	return f.pg.pixel(vg.Point{
		X: f.data.X((q.East - f.minE) / (f.maxE - f.minE)),
		Y: f.data.Y((q.North - f.minN) / (f.maxN - f.minN)),
	})
}

// render draws the map on a new page.
func (m *Map) render(s Size) (*page, mapFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, mapFrame{}, err
	}
	if err := m.validate(); err != nil {
		return nil, mapFrame{}, err
	}
	ext, err := m.extent()
	if err != nil {
		return nil, mapFrame{}, err
	}
	layers := mapLayers{m: m, levels: m.magnitudeLevels()}
	if lo, hi, ok := m.colourRange(); ok {
		layers.cmap = NewViridisMap(lo, hi)
	}
	pg, f := renderMapPage(s, mapSpec{title: m.Title, note: m.CRSNote, extent: ext, layers: layers,
		side: func(c draw.Canvas) { m.drawSidePanel(c, layers) }})
	return pg, f, nil
}

// mapSpec is what every map picture hands to renderMapPage: the words
// around it, the area shown, what is drawn on the data area and what in
// the side panel.
type mapSpec struct {
	title, note string
	extent      Extent
	layers      plot.Plotter
	side        func(c draw.Canvas)
}

// renderMapPage lays out a map on a new page of size s (resolved): title,
// notes, the data area at an equal aspect ratio with its frame, a scale
// bar and a north arrow, and a side panel on the right.
func renderMapPage(s Size, spec mapSpec) (*page, mapFrame) {
	pg := newPage(s)
	mapArea, sideArea := splitSide(frame(pg.dc, spec.title, spec.note))

	p := newPlot("Easting (local), m", "Northing (local), m")
	p.X.Padding, p.Y.Padding = 0, 0
	p.Add(spec.layers)
	p.X.Min, p.X.Max = spec.extent.MinEast, spec.extent.MaxEast
	p.Y.Min, p.Y.Max = spec.extent.MinNorth, spec.extent.MaxNorth
	area := equalAspect(p, mapArea)
	p.Draw(area)
	data := p.DataCanvas(area)
	data.SetLineStyle(draw.LineStyle{Color: okabeBlack, Width: widthAxis})
	data.Stroke(data.Rectangle.Path())
	drawScaleBar(data, (p.X.Max-p.X.Min)/float64(data.Max.X-data.Min.X))
	drawNorthArrow(data)

	spec.side(sideArea)
	return pg, mapFrame{pg: pg, data: data, minE: p.X.Min, maxE: p.X.Max, minN: p.Y.Min, maxN: p.Y.Max}
}

// equalAspect widens p's axis ranges (keeping their centres) until one
// metre is as long on both axes of p's data area within area, then trims
// area so that the match is exact, and returns the trimmed area.
func equalAspect(p *plot.Plot, area draw.Canvas) draw.Canvas {
	const tol = 1e-4 // Relative mismatch of the two scales accepted, before trimming.
	for range 8 {
		sx, sy := scales(p, area)
		if math.Abs(sx-sy) <= tol*math.Max(sx, sy) {
			break
		}
		if sx > sy { // Too wide for the x range: show more metres east-west.
			grow(&p.X, sx/sy)
		} else {
			grow(&p.Y, sy/sx)
		}
	}
	// Axis sizes no longer change (the ranges are fixed), so trimming the
	// area trims the data area by the same length.
	sx, sy := scales(p, area)
	d := p.DataCanvas(area)
	if sx > sy {
		excess := (d.Max.X - d.Min.X) * vg.Length(1-sy/sx)
		area.Min.X += excess / 2
		area.Max.X -= excess / 2
	} else {
		excess := (d.Max.Y - d.Min.Y) * vg.Length(1-sx/sy)
		area.Min.Y += excess / 2
		area.Max.Y -= excess / 2
	}
	return area
}

// scales returns the lengths of one metre along x and y in p's data area
// within area, points per metre.
func scales(p *plot.Plot, area draw.Canvas) (sx, sy float64) {
	d := p.DataCanvas(area)
	return float64(d.Max.X-d.Min.X) / (p.X.Max - p.X.Min), float64(d.Max.Y-d.Min.Y) / (p.Y.Max - p.Y.Min)
}

// grow widens the axis range by factor f about its centre.
func grow(a *plot.Axis, f float64) {
	c, h := (a.Min+a.Max)/2, (a.Max-a.Min)/2*f
	a.Min, a.Max = c-h, c+h
}

// niceLength returns the largest 1, 2 or 5 × 10ⁿ not above v (v > 0).
func niceLength(v float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(v)))
	for _, f := range [...]float64{5, 2, 1} {
		if f*p <= v {
			return f * p
		}
	}
	return p
}

// lengthLabel writes a length in metres, in km when it is a whole number
// of kilometres.
func lengthLabel(l float64) string {
	if l >= 1000 && math.Mod(l, 1000) == 0 {
		return fmt.Sprintf("%g km", l/1000)
	}
	return fmt.Sprintf("%g m", l)
}

// Scale-bar layout, points.
const (
	scaleBarHeight = 4
	scaleBarPad    = 5
	scaleBarInset  = 12 // From the data area's lower-left corner.
)

// scaleBarLayout returns the scale bar's round length, m, its length on
// the page, its label and its panel, in the lower left corner of the data
// area c; metresPerPoint is the map scale.
func scaleBarLayout(c draw.Canvas, metresPerPoint float64) (length float64, barLen vg.Length, label string, box vg.Rectangle) {
	width := float64(c.Max.X - c.Min.X)
	length = niceLength(0.2 * width * metresPerPoint)
	barLen = vg.Length(length / metresPerPoint)
	label = lengthLabel(length)
	st := textStyle(sizeKey, false, draw.XCenter, draw.YBottom)
	x0, y0 := c.Min.X+scaleBarInset, c.Min.Y+scaleBarInset
	box = vg.Rectangle{
		Min: vg.Point{X: x0 - scaleBarPad, Y: y0 - scaleBarPad},
		Max: vg.Point{X: x0 + barLen + scaleBarPad, Y: y0 + scaleBarHeight + 3 + st.Height(label) + scaleBarPad},
	}
	return length, barLen, label, box
}

// scaleBarBox returns the panel of the scale bar.
func scaleBarBox(c draw.Canvas, metresPerPoint float64) vg.Rectangle {
	_, _, _, box := scaleBarLayout(c, metresPerPoint)
	return box
}

// drawScaleBar draws a two-part scale bar of a round length, about a fifth
// of the frame width, in the lower left corner of the data area;
// metresPerPoint is the map scale.
func drawScaleBar(c draw.Canvas, metresPerPoint float64) {
	_, barLen, label, box := scaleBarLayout(c, metresPerPoint)
	st := textStyle(sizeKey, false, draw.XCenter, draw.YBottom)
	x0, y0 := c.Min.X+scaleBarInset, c.Min.Y+scaleBarInset
	c.SetColor(translucentWhite)
	c.Fill(box.Path())
	half := barLen / 2
	left := vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x0 + half, Y: y0 + scaleBarHeight}}
	right := vg.Rectangle{Min: vg.Point{X: x0 + half, Y: y0}, Max: vg.Point{X: x0 + barLen, Y: y0 + scaleBarHeight}}
	c.SetColor(okabeBlack)
	c.Fill(left.Path())
	c.SetColor(white)
	c.Fill(right.Path())
	c.SetLineStyle(draw.LineStyle{Color: okabeBlack, Width: 0.8})
	c.Stroke(vg.Rectangle{Min: left.Min, Max: right.Max}.Path())
	c.FillText(st, vg.Point{X: x0 + half, Y: y0 + scaleBarHeight + 3}, label)
}

// translucentWhite backs the scale bar and the north arrow.
var translucentWhite = color.NRGBA{255, 255, 255, 215}

// North-arrow layout, points.
const (
	northHeadW, northHeadH, northShaft, northPad = 9, 11, 12, 4
	northInset                                   = 22 // Arrow axis from the right edge.
)

// northArrowGeometry returns the arrow's axis x, the top of its "N", its
// tip and the base of its head, and its panel, in the upper right corner
// of the data area c.
func northArrowGeometry(c draw.Canvas) (x, top, tip, base vg.Length, box vg.Rectangle) {
	st := textStyle(sizeLabel, true, draw.XCenter, draw.YTop)
	x = c.Max.X - northInset
	top = c.Max.Y - 8
	tip = top - st.Height("N") - 2
	base = tip - northHeadH
	box = vg.Rectangle{
		Min: vg.Point{X: x - northHeadW/2 - northPad, Y: base - northShaft - northPad},
		Max: vg.Point{X: x + northHeadW/2 + northPad, Y: top + northPad},
	}
	return x, top, tip, base, box
}

// northArrowBox returns the panel of the north arrow.
func northArrowBox(c draw.Canvas) vg.Rectangle {
	_, _, _, _, box := northArrowGeometry(c)
	return box
}

// drawNorthArrow draws a half-filled arrow with an "N" in the upper right
// corner of the data area, pointing to grid north (+North).
func drawNorthArrow(c draw.Canvas) {
	const headW, headH, shaft = northHeadW, northHeadH, northShaft
	x, top, tip, base, box := northArrowGeometry(c)
	st := textStyle(sizeLabel, true, draw.XCenter, draw.YTop)
	c.SetColor(translucentWhite)
	c.Fill(box.Path())
	c.FillText(st, vg.Point{X: x, Y: top}, "N")
	var leftHalf, whole vg.Path
	leftHalf.Move(vg.Point{X: x, Y: tip})
	leftHalf.Line(vg.Point{X: x - headW/2, Y: base})
	leftHalf.Line(vg.Point{X: x, Y: base + headH/4})
	leftHalf.Close()
	whole.Move(vg.Point{X: x, Y: tip})
	whole.Line(vg.Point{X: x - headW/2, Y: base})
	whole.Line(vg.Point{X: x, Y: base + headH/4})
	whole.Line(vg.Point{X: x + headW/2, Y: base})
	whole.Close()
	c.SetColor(white)
	c.Fill(whole)
	c.SetColor(okabeBlack)
	c.Fill(leftHalf)
	c.SetLineStyle(draw.LineStyle{Color: okabeBlack, Width: 0.8})
	c.Stroke(whole)
	c.StrokeLine2(draw.LineStyle{Color: okabeBlack, Width: 1.2}, x, base+headH/4, x, base-shaft)
}

// drawSidePanel draws the colour bar (or a note when no trace has a value)
// and the key of the map's symbols.
func (m *Map) drawSidePanel(c draw.Canvas, l mapLayers) {
	var notes []string
	if l.cmap == nil && len(m.Traces) > 0 {
		notes = []string{"No trace has a value:", "all are drawn grey."}
	}
	var cmap palette.ColorMap
	if l.cmap != nil {
		cmap = l.cmap
	}
	drawColourPanel(c, cmap, m.Colour.axisLabel(), notes, m.keyRows(l))
}

// drawColourPanel draws, from the top of c down: a vertical colour bar of
// cmap over 42 % of the height (nothing when cmap is nil), the note lines,
// then the key rows.
func drawColourPanel(c draw.Canvas, cmap palette.ColorMap, label string, notes []string, rows []keyRow) {
	height := c.Max.Y - c.Min.Y
	top := c.Max.Y
	if cmap != nil {
		barArea := c
		barArea.Min.Y = c.Max.Y - 0.42*height
		drawColourBar(barArea, cmap, label)
		top = barArea.Min.Y - 14
	}
	if len(notes) > 0 {
		st := textStyle(sizeKey, false, draw.XLeft, draw.YTop)
		for _, n := range notes {
			c.FillText(st, vg.Point{X: c.Min.X, Y: top}, n)
			top -= st.FontExtents().Height
		}
		top -= 14
	}
	c.Max.Y = top
	drawKey(c, rows)
}

// axisLabel returns "Label, Unit" for the colour bar.
func (s ColourScale) axisLabel() string {
	label := s.Label
	if label == "" {
		label = "Value"
	}
	if s.Unit == "" {
		return label
	}
	return label + ", " + s.Unit
}

// drawColourBar draws a vertical colour bar with its axis and label at the
// left of area.
func drawColourBar(area draw.Canvas, cmap palette.ColorMap, label string) {
	const barWidth = 16 // Points.
	p := newPlot("", label)
	p.HideX()
	p.X.Padding, p.Y.Padding = 0, 0
	p.Add(&plotter.ColorBar{ColorMap: cmap, Vertical: true})
	d := p.DataCanvas(area)
	area.Max.X = d.Min.X + barWidth
	p.Draw(area)
	d = p.DataCanvas(area)
	d.SetLineStyle(draw.LineStyle{Color: okabeBlack, Width: widthAxis})
	d.Stroke(d.Rectangle.Path())
}
