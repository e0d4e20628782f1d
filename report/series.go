package report

import (
	"image/color"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// okabeReddishPurple completes the Okabe & Ito (2008) palette used here.
var okabeReddishPurple = color.NRGBA{204, 121, 167, 255}

// seriesStyle is the look of the i-th series of a chart: an Okabe–Ito
// colour, a line dash pattern and a marker shape, all three changing
// together so that series stay apart in greyscale and for colour-blind
// readers.
type seriesStyle struct {
	line  draw.LineStyle
	glyph draw.GlyphStyle
}

// Series colours, dashes and marker shapes, in the order series take them.
var (
	seriesColours = [...]color.NRGBA{okabeBlue, okabeVermillion, okabeGreen, okabeOrange, okabeReddishPurple, okabeSkyBlue}
	seriesDashes  = [...][]vg.Length{nil, {6, 3}, {2, 2}, {8, 2, 2, 2}, {3, 3}, {10, 3}}
	seriesGlyphs  = [...]draw.GlyphDrawer{draw.CircleGlyph{}, draw.BoxGlyph{}, draw.PyramidGlyph{}, draw.CrossGlyph{}, draw.RingGlyph{}, draw.SquareGlyph{}}
)

// styleOf returns the style of series i (cycling after six).
func styleOf(i int) seriesStyle {
	c := seriesColours[i%len(seriesColours)]
	return seriesStyle{
		line:  draw.LineStyle{Color: c, Width: 2, Dashes: seriesDashes[i%len(seriesDashes)]},
		glyph: draw.GlyphStyle{Color: c, Radius: 3.5, Shape: seriesGlyphs[i%len(seriesGlyphs)]},
	}
}

// keyRow returns the key row of a series: its line with a marker.
func (s seriesStyle) keyRow(text string, marker bool) keyRow {
	return keyRow{text: text, height: 2*s.glyph.Radius + 2, symbol: func(c draw.Canvas, at vg.Point) {
		lineSymbol(s.line)(c, at)
		if marker {
			c.DrawGlyphNoClip(s.glyph, at)
		}
	}}
}

// maxMarkedPoints is the most points a line carries markers on; denser
// lines are drawn plain so that the markers do not merge into a band.
const maxMarkedPoints = 40

// addLinePoints adds a line through pts, with a marker at each point when
// there are at most maxMarkedPoints, and reports whether it drew markers.
func addLinePoints(p *plot.Plot, pts plotter.XYs, s seriesStyle) bool {
	p.Add(&plotter.Line{XYs: pts, LineStyle: s.line})
	if len(pts) > maxMarkedPoints {
		return false
	}
	p.Add(&plotter.Scatter{XYs: pts, GlyphStyle: s.glyph})
	return true
}
