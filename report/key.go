package report

import (
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// keyRow is one row of a hand-drawn key: a symbol drawn centred in the
// symbol column, and its text. A row without a symbol is a heading.
type keyRow struct {
	text   string
	symbol func(c draw.Canvas, centre vg.Point)
	height vg.Length // Symbol height, points; the row is at least one text line.
}

// Key layout, points.
const (
	keySymbolWidth = 28
	keyTextGap     = 6
	keyRowGap      = 4
)

// drawKey draws rows from the top of c downwards, stopping at its bottom.
func drawKey(c draw.Canvas, rows []keyRow) {
	textSty := textStyle(sizeKey, false, draw.XLeft, draw.YCenter)
	headSty := textStyle(sizeKey, true, draw.XLeft, draw.YCenter)
	lineHeight := textSty.FontExtents().Height
	y := c.Max.Y
	for _, r := range rows {
		h := vg.Length(math.Max(float64(lineHeight), float64(r.height)))
		if y-h < c.Min.Y {
			return
		}
		mid := y - h/2
		if r.symbol == nil {
			c.FillText(headSty, vg.Point{X: c.Min.X, Y: mid}, r.text)
		} else {
			r.symbol(c, vg.Point{X: c.Min.X + keySymbolWidth/2, Y: mid})
			c.FillText(textSty, vg.Point{X: c.Min.X + keySymbolWidth + keyTextGap, Y: mid}, r.text)
		}
		y -= h + keyRowGap
	}
}

// lineSymbol returns a key symbol: a horizontal line in style sty.
func lineSymbol(sty draw.LineStyle) func(draw.Canvas, vg.Point) {
	return func(c draw.Canvas, at vg.Point) {
		c.StrokeLine2(sty, at.X-keySymbolWidth/2, at.Y, at.X+keySymbolWidth/2, at.Y)
	}
}

// keyRows returns the key of the map's symbols, only for what is drawn.
func (m *Map) keyRows(l mapLayers) []keyRow {
	var rows []keyRow
	hasNoValue := false
	for _, t := range m.Traces {
		if math.IsNaN(t.Value) || l.cmap == nil {
			hasNoValue = true
			break
		}
	}
	if hasNoValue {
		label := m.Colour.NoValue
		if label == "" {
			label = "No value"
		}
		rows = append(rows, keyRow{text: label, symbol: lineSymbol(draw.LineStyle{Color: greyNoValue, Width: widthNoValue})})
	}
	if len(m.Wells) > 0 {
		rows = append(rows, keyRow{text: "Well path", symbol: lineSymbol(draw.LineStyle{Color: colourWell, Width: widthWell})})
	}
	if len(m.Conduits) > 0 {
		rows = append(rows, keyRow{text: "Primary conduit", symbol: lineSymbol(styleConduit)})
	}
	if len(m.StressTicks) > 0 {
		rows = append(rows, keyRow{text: "Local SHmax", symbol: lineSymbol(draw.LineStyle{Color: colourStressTick, Width: widthStressTick})})
	}
	if len(m.Clusters) > 0 {
		rows = append(rows, keyRow{text: "Perforation cluster", height: 2 * radiusCluster,
			symbol: func(c draw.Canvas, at vg.Point) { drawDiamond(c, at, radiusCluster) }})
	}
	if len(m.Outline) > 0 {
		rows = append(rows, keyRow{text: "Stimulated-area outline",
			symbol: lineSymbol(styleOutline)})
	}
	if len(m.SmallEvents) > 0 {
		rows = append(rows, keyRow{text: "Sub-resolution event", height: 4*radiusSmallEvent + 2,
			symbol: func(c draw.Canvas, at vg.Point) {
				c.DrawGlyphNoClip(draw.GlyphStyle{Color: colourSmallEvent, Radius: 2 * radiusSmallEvent, Shape: draw.CircleGlyph{}}, at)
			}})
	}
	if len(l.levels) > 0 {
		rows = append(rows, keyRow{text: "Synthetic events"})
		for _, mw := range l.levels {
			r := eventRadius(mw, l.levels)
			rows = append(rows, keyRow{text: "Mw " + minus(formatMagnitude(mw)), height: 2*r + 2,
				symbol: func(c draw.Canvas, at vg.Point) {
					c.DrawGlyphNoClip(draw.GlyphStyle{Color: colourEvent, Radius: r, Shape: ringGlyph{width: widthEvent}}, at)
				}})
		}
	}
	return rows
}

// keyBelow draws the rows side by side at the bottom of c, each line
// centred, wrapping to further lines when they do not fit the width, and
// returns the canvas above them.
func keyBelow(c draw.Canvas, rows []keyRow) draw.Canvas {
	st := textStyle(sizeKey, false, draw.XLeft, draw.YCenter)
	const rowGap = 24 // Between entries, points.
	width := func(r keyRow) vg.Length { return keySymbolWidth + keyTextGap + st.Width(r.text) }
	// Split into lines, top line first.
	var lines [][]keyRow
	var lineWidth vg.Length
	for _, r := range rows {
		w := width(r)
		if n := len(lines); n > 0 && lineWidth+rowGap+w <= c.Max.X-c.Min.X {
			lines[n-1] = append(lines[n-1], r)
			lineWidth += rowGap + w
			continue
		}
		lines = append(lines, []keyRow{r})
		lineWidth = w
	}
	y := c.Min.Y
	for i := len(lines) - 1; i >= 0; i-- {
		var total, height vg.Length
		for j, r := range lines[i] {
			total += width(r)
			if j > 0 {
				total += rowGap
			}
			height = max(height, r.height, st.FontExtents().Height)
		}
		x := c.Center().X - total/2
		mid := y + height/2
		for _, r := range lines[i] {
			r.symbol(c, vg.Point{X: x + keySymbolWidth/2, Y: mid})
			x += keySymbolWidth + keyTextGap
			c.FillText(st, vg.Point{X: x, Y: mid}, r.text)
			x += st.Width(r.text) + rowGap
		}
		y += height + keyRowGap
	}
	c.Min.Y = y + 8 - keyRowGap
	return c
}
