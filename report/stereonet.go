package report

import (
	"cmp"
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r3"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"slipfront/internal/orient"
)

// Stereonet is a lower-hemisphere equal-area projection (Schmidt net) of
// fracture poles coloured by a value, with the principal stress axes
// marked: the standard picture of structural geology (Allmendinger,
// Cardozo & Fisher 2012).
//
// A line of trend φ and plunge ψ lies at the angle θ = 90° − ψ from the
// centre of the net (the vertical) and is drawn at the radius
//
//	r = √2 · sin(θ/2)
//
// along the azimuth φ, on a net of unit radius: the polar Lambert
// azimuthal equal-area projection, ρ = 2R·sin(c/2) (Snyder 1987, Map
// Projections — A Working Manual, USGS Professional Paper 1395), with
// R = 1/√2 so that the horizontal (θ = 90°) falls on the unit circle. Equal solid angles of the hemisphere cover equal areas of the
// net, so pole densities can be read by eye.
type Stereonet struct {
	Title string
	// Note is printed under the net, e.g. "812 fractures, realization 0".
	Note   string
	Planes []NetPlane
	// Colour names the quantity of NetPlane.Value (e.g. "Slip
	// tendency", or "Δp_c" in "MPa") and its range; see ColourScale.
	Colour ColourScale
	// Axes are up to three principal stress axes, S1 first, drawn as a
	// filled square, triangle and circle.
	Axes []StressAxis
	// Graticule draws the great and small circles of the net every 10°.
	Graticule bool
}

// NetPlane is one fracture plane.
type NetPlane struct {
	// Dip, radians in [0, π/2], and dip direction, radians clockwise from
	// north.
	Dip, DipDirection float64
	// Value, in Colour.Unit; NaN means no value (a grey pole).
	Value float64
}

// StressAxis is a principal stress direction.
type StressAxis struct {
	Name string // e.g. "S1" or "SHmax".
	// Axis is the direction in East-North-Up coordinates, any length but
	// zero, either sense (the lower-hemisphere end is drawn).
	Axis r3.Vec
}

// equalArea returns the position on a unit-radius lower-hemisphere
// equal-area net of the line of the given trend and plunge (radians,
// plunge ≥ 0 down): x east, y north.
func equalArea(trend, plunge float64) (x, y float64) {
	theta := math.Pi/2 - plunge
	r := math.Sqrt2 * math.Sin(theta/2)
	s, c := math.Sincos(trend)
	return r * s, r * c
}

// netPole returns the net position of the lower-hemisphere pole of plane
// p.
func netPole(p NetPlane) (x, y float64) {
	return equalArea(orient.Pole(p.Dip, p.DipDirection))
}

// WritePNG draws the net at size s (zero: DefaultSize) and writes it to w
// as PNG. Invalid input returns an error and writes nothing.
func (n *Stereonet) WritePNG(w io.Writer, s Size) error {
	pg, _, err := n.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the planes, the axes and the colour range.
func (n *Stereonet) validate() error {
	for i, p := range n.Planes {
		if !(p.Dip >= 0 && p.Dip <= math.Pi/2) || !finite(p.DipDirection) {
			return fmt.Errorf("report: stereonet Planes[%d]: dip %g rad, dip direction %g rad: need a dip in [0, π/2] and a finite dip direction", i, p.Dip, p.DipDirection)
		}
		if math.IsInf(p.Value, 0) {
			return fmt.Errorf("report: stereonet Planes[%d].Value = %g: must be finite or NaN (no value)", i, p.Value)
		}
	}
	if len(n.Axes) > len(axisGlyphs) {
		return fmt.Errorf("report: stereonet has %d stress axes: at most %d", len(n.Axes), len(axisGlyphs))
	}
	for i, a := range n.Axes {
		if v := a.Axis; !finite(v.X+v.Y+v.Z) || r3.Norm(v) == 0 {
			return fmt.Errorf("report: stereonet Axes[%d] (%q) = (%g, %g, %g): must be finite and non-zero", i, a.Name, v.X, v.Y, v.Z)
		}
	}
	return checkColourRange("stereonet", n.Colour)
}

// checkColourRange requires Min < Max, both finite, unless both are zero.
func checkColourRange(picture string, c ColourScale) error {
	if c.Min == 0 && c.Max == 0 {
		return nil
	}
	if !finite(c.Min) || !finite(c.Max) || !(c.Max > c.Min) {
		return fmt.Errorf("report: %s Colour range [%g, %g]: need finite Min < Max (or both zero for the data range)", picture, c.Min, c.Max)
	}
	return nil
}

// valueRange returns the colour range: c's when set, else the range of
// the finite values (a unit-wide range about a single value), and false
// when no value is finite.
func valueRange(c ColourScale, values func(yield func(float64) bool)) (lo, hi float64, ok bool) {
	if c.Min != 0 || c.Max != 0 {
		return c.Min, c.Max, true
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for v := range values {
		if !math.IsNaN(v) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi {
		return 0, 0, false
	}
	if lo == hi {
		lo, hi = lo-0.5, hi+0.5
	}
	return lo, hi, true
}

// netFrame is where the net ended up on its page: its centre and radius,
// page points.
type netFrame struct {
	pg     *page
	centre vg.Point
	radius vg.Length
}

// at returns the page point of net position (x, y).
func (f netFrame) at(x, y float64) vg.Point {
	return vg.Point{X: f.centre.X + vg.Length(x)*f.radius, Y: f.centre.Y + vg.Length(y)*f.radius}
}

// pixel returns the image coordinates of net position (x, y).
func (f netFrame) pixel(x, y float64) (px, py float64) { return f.pg.pixel(f.at(x, y)) }

// Stereonet styles.
var (
	radiusPole   = vg.Length(3.6)
	colourNet    = okabeBlack
	colourGrid   = color.NRGBA{200, 200, 200, 255}
	styleNetRim  = draw.LineStyle{Color: colourNet, Width: 1.2}
	styleGrid    = draw.LineStyle{Color: colourGrid, Width: 0.4}
	stylePoleRim = draw.LineStyle{Color: color.NRGBA{40, 40, 40, 255}, Width: 0.4}
	// axisGlyphs mark S1, S2 and S3: square, triangle, circle.
	axisGlyphs = [...]draw.GlyphDrawer{draw.BoxGlyph{}, draw.PyramidGlyph{}, draw.CircleGlyph{}}
)

// render draws the net on a new page.
func (n *Stereonet) render(s Size) (*page, netFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, netFrame{}, err
	}
	if err := n.validate(); err != nil {
		return nil, netFrame{}, err
	}
	pg := newPage(s)
	body := frame(pg.dc, n.Title, n.Note, "Lower hemisphere, equal area (Schmidt net); poles to planes")
	netArea, sideArea := splitSide(body)
	const labelRoom = 18 // Around the net for the N tick and its letter, points.
	r := min(netArea.Max.X-netArea.Min.X, netArea.Max.Y-netArea.Min.Y)/2 - labelRoom
	f := netFrame{pg: pg, centre: netArea.Center(), radius: r}

	var cmap *ColourMap
	if lo, hi, ok := valueRange(n.Colour, func(yield func(float64) bool) {
		for _, p := range n.Planes {
			if !yield(p.Value) {
				return
			}
		}
	}); ok {
		cmap = NewViridisMap(lo, hi)
	}
	c := pg.dc
	if n.Graticule {
		drawGraticule(c, f)
	}
	n.drawPoles(c, f, cmap)
	drawNetRim(c, f)
	n.drawAxes(c, f)

	var pc palette.ColorMap
	if cmap != nil {
		pc = cmap
	}
	drawColourPanel(sideArea, pc, n.Colour.axisLabel(), nil, n.keyRows(cmap))
	return pg, f, nil
}

// drawPoles draws every pole: those without a value first, in grey, then
// by increasing value so that the highest lie on top.
func (n *Stereonet) drawPoles(c draw.Canvas, f netFrame, cmap *ColourMap) {
	order := make([]int, len(n.Planes))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(i, j int) int {
		vi, vj := n.Planes[i].Value, n.Planes[j].Value
		if ni, nj := math.IsNaN(vi), math.IsNaN(vj); ni || nj {
			return -cmp.Compare(b2i(ni), b2i(nj))
		}
		return cmp.Compare(vi, vj)
	})
	for _, i := range order {
		p := n.Planes[i]
		col := color.Color(greyNoValue)
		if cmap != nil && !math.IsNaN(p.Value) {
			col = cmap.clamped(p.Value)
		}
		x, y := netPole(p)
		drawPole(c, f.at(x, y), col)
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// drawPole draws one pole: a filled circle with a thin dark rim.
func drawPole(c draw.Canvas, pt vg.Point, col color.Color) {
	var p vg.Path
	p.Move(vg.Point{X: pt.X + radiusPole, Y: pt.Y})
	p.Arc(pt, radiusPole, 0, 2*math.Pi)
	p.Close()
	c.SetColor(col)
	c.Fill(p)
	c.SetLineStyle(stylePoleRim)
	c.Stroke(p)
}

// drawNetRim draws the primitive circle, a centre cross and the north
// tick with its "N".
func drawNetRim(c draw.Canvas, f netFrame) {
	var rim vg.Path
	rim.Move(f.at(1, 0))
	rim.Arc(f.centre, f.radius, 0, 2*math.Pi)
	rim.Close()
	c.SetLineStyle(styleNetRim)
	c.Stroke(rim)
	const cross, tick = 4, 7 // Points.
	thin := draw.LineStyle{Color: colourNet, Width: 0.8}
	c.StrokeLine2(thin, f.centre.X-cross, f.centre.Y, f.centre.X+cross, f.centre.Y)
	c.StrokeLine2(thin, f.centre.X, f.centre.Y-cross, f.centre.X, f.centre.Y+cross)
	top := f.at(0, 1)
	c.StrokeLine2(styleNetRim, top.X, top.Y, top.X, top.Y+tick)
	c.FillText(textStyle(sizeLabel, true, draw.XCenter, draw.YBottom), vg.Point{X: top.X, Y: top.Y + tick + 1}, "N")
}

// drawGraticule draws the great circles of planes striking north–south
// with dips of 10°, 20°, … 80° to the east and west, and the small
// circles about the north–south axis every 10°: the Schmidt net.
func drawGraticule(c draw.Canvas, f netFrame) {
	const steps = 90
	deg := math.Pi / 180
	line := func(v r3.Vec) vg.Point { return f.at(equalArea(orient.TrendAndPlunge(v))) }
	for k := 1; k <= 8; k++ {
		a := float64(k) * 10 * deg
		for _, dipDir := range [...]float64{math.Pi / 2, 3 * math.Pi / 2} {
			// The great circle: lines cos φ·strike + sin φ·downDip, φ ∈ [0, π].
			strike, down := orient.Strike(dipDir), orient.DownDip(a, dipDir)
			pts := make([]vg.Point, steps+1)
			for i := range pts {
				s, co := math.Sincos(math.Pi * float64(i) / steps)
				pts[i] = line(r3.Add(r3.Scale(co, strike), r3.Scale(s, down)))
			}
			c.StrokeLines(styleGrid, pts)
		}
		for _, north := range [...]float64{1, -1} {
			// The small circle at angle a from the horizontal north (or
			// south) axis, lower half.
			pts := make([]vg.Point, steps+1)
			for i := range pts {
				s, co := math.Sincos(math.Pi * float64(i) / steps)
				pts[i] = line(r3.Vec{X: math.Sin(a) * co, Y: north * math.Cos(a), Z: -math.Sin(a) * s})
			}
			c.StrokeLines(styleGrid, pts)
		}
	}
}

// drawAxes marks the principal stress axes with their glyphs and names.
func (n *Stereonet) drawAxes(c draw.Canvas, f netFrame) {
	st := textStyle(sizeTag, true, draw.XLeft, draw.YBottom)
	for i, a := range n.Axes {
		x, y := equalArea(orient.TrendAndPlunge(a.Axis))
		pt := f.at(x, y)
		drawAxisGlyph(c, i, pt)
		haloText(c, st, vg.Point{X: pt.X + 7, Y: pt.Y + 5}, a.Name)
	}
}

// drawAxisGlyph draws axis i's marker: black, with a white rim so that
// it stands out over coloured poles.
func drawAxisGlyph(c draw.Canvas, i int, pt vg.Point) {
	c.DrawGlyphNoClip(draw.GlyphStyle{Color: white, Radius: 7.5, Shape: axisGlyphs[i]}, pt)
	c.DrawGlyphNoClip(draw.GlyphStyle{Color: okabeBlack, Radius: 5.5, Shape: axisGlyphs[i]}, pt)
}

// keyRows returns the key: the stress axes, and the grey pole when some
// plane has no value.
func (n *Stereonet) keyRows(cmap *ColourMap) []keyRow {
	var rows []keyRow
	for i, a := range n.Axes {
		rows = append(rows, keyRow{text: a.Name + " axis", height: 16,
			symbol: func(c draw.Canvas, at vg.Point) { drawAxisGlyph(c, i, at) }})
	}
	for _, p := range n.Planes {
		if cmap == nil || math.IsNaN(p.Value) {
			label := n.Colour.NoValue
			if label == "" {
				label = "No value"
			}
			rows = append(rows, keyRow{text: label, symbol: func(c draw.Canvas, at vg.Point) { drawPole(c, at, greyNoValue) }})
			break
		}
	}
	return rows
}
