package report

import (
	"cmp"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Map styles, points. The stimulated traces read first: events are
// small, light and beneath them; the outline is thin.
const (
	widthTrace     = 1.6
	widthNoValue   = 0.7
	widthWell      = 3.2
	widthOutline   = 1.0
	widthConduit   = 2.0
	widthEvent     = 0.6
	radiusEventMin = 1.5 // At the smallest key magnitude.
	radiusEventMax = 6.0 // At the largest key magnitude.
	radiusCluster  = 4.0 // Half-diagonal of the cluster diamond.
)

var (
	colourWell  = color.NRGBA{26, 26, 26, 255}
	colourEvent = color.NRGBA{96, 96, 96, 150}
	// colourSmallEvent: Okabe–Ito blue, apart from the grey traces and
	// rings and from the vermillion outline.
	colourSmallEvent = color.NRGBA{0, 114, 178, 200}
	// styleConduit: dark and dashed, so it differs from the solid well
	// and from every viridis trace in greyscale too.
	styleConduit = draw.LineStyle{Color: colourWell, Width: widthConduit, Dashes: []vg.Length{5, 2.5}}
	styleOutline = draw.LineStyle{Color: okabeVermillion, Width: widthOutline}
)

// mapLayers draws the features of a Map in order: stress ticks, grey
// traces, small events, events,
// coloured traces (latest first, so the earliest lie on top), conduits,
// outlines, wells, clusters, the SHmax arrow and the labels. It is a
// plot.Plotter.
type mapLayers struct {
	m      *Map
	cmap   *ColourMap // nil when no trace has a value.
	levels []float64  // Magnitudes of the event size key.
	// placed, when not nil, receives the boxes of the labels drawn, page
	// points (for tests).
	placed *[]placedLabel
}

// Plot draws the layers on the data canvas c of p.
func (l mapLayers) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	at := func(q Point) vg.Point { return vg.Point{X: tx(q.East), Y: ty(q.North)} }
	order := traceOrder(l.m.Traces)
	split := 0
	for split < len(order) && (math.IsNaN(l.m.Traces[order[split]].Value) || l.cmap == nil) {
		split++
	}
	l.stressTicks(c, at)
	l.traces(c, at, order[:split])
	l.smallEvents(c, at)
	l.events(c, at)
	l.traces(c, at, order[split:])
	l.conduits(c, at)
	l.outlines(c, at)
	l.wells(c, at)
	l.clusters(c, at)
	lp := newLabelPlacer(c.Rectangle)
	lp.block(northArrowBox(c), scaleBarBox(c, (p.X.Max-p.X.Min)/float64(c.Max.X-c.Min.X)))
	if l.m.SHmax != nil {
		lp.block(drawSHmaxArrow(c, *l.m.SHmax))
	}
	l.labels(c, at, lp)
}

// traceOrder returns the trace indices in drawing order: no-value traces
// first, then valued traces by decreasing value.
func traceOrder(ts []Trace) []int {
	order := make([]int, len(ts))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(i, j int) int {
		vi, vj := ts[i].Value, ts[j].Value
		switch ni, nj := math.IsNaN(vi), math.IsNaN(vj); {
		case ni && nj:
			return 0
		case ni:
			return -1
		case nj:
			return 1
		}
		return cmp.Compare(vj, vi)
	})
	return order
}

// traces draws the traces of the given indices: without a value (or
// without a colour map) thin and grey, else in their colour.
func (l mapLayers) traces(c draw.Canvas, at func(Point) vg.Point, idx []int) {
	grey := draw.LineStyle{Color: greyNoValue, Width: widthNoValue}
	sty := draw.LineStyle{Width: widthTrace}
	for _, i := range idx {
		t := l.m.Traces[i]
		a, b, ok := clipSegment(c.Rectangle, at(t.A), at(t.B))
		if !ok {
			continue
		}
		if math.IsNaN(t.Value) || l.cmap == nil {
			c.StrokeLine2(grey, a.X, a.Y, b.X, b.Y)
			continue
		}
		sty.Color = l.cmap.clamped(t.Value)
		c.StrokeLine2(sty, a.X, a.Y, b.X, b.Y)
	}
}

// Stress ticks: short, thin and blue-grey, so that they read as a field
// behind the grey no-value traces rather than as fractures.
const (
	stressTickLength = 9   // points
	widthStressTick  = 0.9 // points
)

var colourStressTick = color.NRGBA{110, 135, 175, 255}

// stressTicks draws every stress tick as a grey segment along its SHmax
// azimuth (east = sin, north = cos; page up is north), centred on its
// point, when the point lies inside the map.
func (l mapLayers) stressTicks(c draw.Canvas, at func(Point) vg.Point) {
	sty := draw.LineStyle{Color: colourStressTick, Width: widthStressTick}
	for _, t := range l.m.StressTicks {
		p := at(t.At)
		if !c.Contains(p) {
			continue
		}
		sin, cos := math.Sincos(t.Azimuth)
		d := vg.Point{X: stressTickLength / 2 * vg.Length(sin), Y: stressTickLength / 2 * vg.Length(cos)}
		c.StrokeLine2(sty, p.X-d.X, p.Y-d.Y, p.X+d.X, p.Y+d.Y)
	}
}

func (l mapLayers) conduits(c draw.Canvas, at func(Point) vg.Point) {
	for _, s := range l.m.Conduits {
		if a, b, ok := clipSegment(c.Rectangle, at(s.A), at(s.B)); ok {
			c.StrokeLine2(styleConduit, a.X, a.Y, b.X, b.Y)
		}
	}
}

// eventColour returns the circle colour for a catalogue of n events: the
// key's colour up to fewEvents, then fainter as 1/√n (down to an alpha of
// 40/255) so that dense catalogues do not hide the traces.
func eventColour(n int) color.NRGBA { return fainter(colourEvent, n, 40) }

// fainter returns colour c for n marks: c up to fewEvents, then fainter as
// 1/√n, down to an alpha of floor/255.
func fainter(c color.NRGBA, n int, floor uint8) color.NRGBA {
	const fewEvents = 200
	if n > fewEvents {
		c.A = uint8(math.Max(float64(floor), float64(c.A)*math.Sqrt(fewEvents/float64(n))))
	}
	return c
}

// floorSmallEvent is the least alpha of the sub-resolution dots, higher
// than the rings' because a dot is a tenth of a ring's area.
const floorSmallEvent = 90

// radiusSmallEvent is the dot radius of a sub-resolution event, points.
const radiusSmallEvent = 1.0

func (l mapLayers) smallEvents(c draw.Canvas, at func(Point) vg.Point) {
	sty := draw.GlyphStyle{Color: fainter(colourSmallEvent, len(l.m.SmallEvents), floorSmallEvent), Radius: radiusSmallEvent, Shape: draw.CircleGlyph{}}
	for _, p := range l.m.SmallEvents {
		if pt := at(p); c.Contains(pt) {
			c.DrawGlyphNoClip(sty, pt)
		}
	}
}

// eventRadius returns the circle radius of magnitude mw, points: linear in
// Mw from radiusEventMin at the first key level to radiusEventMax at the
// last, clamped.
func eventRadius(mw float64, levels []float64) vg.Length {
	if len(levels) < 2 {
		return (radiusEventMin + radiusEventMax) / 2
	}
	lo, hi := levels[0], levels[len(levels)-1]
	f := math.Min(1, math.Max(0, (mw-lo)/(hi-lo)))
	return vg.Length(radiusEventMin + f*(radiusEventMax-radiusEventMin))
}

func (l mapLayers) events(c draw.Canvas, at func(Point) vg.Point) {
	sty := draw.GlyphStyle{Color: eventColour(len(l.m.Events)), Shape: ringGlyph{width: widthEvent}}
	for _, e := range l.m.Events {
		pt := at(e.At)
		if !c.Contains(pt) {
			continue
		}
		sty.Radius = eventRadius(e.Magnitude, l.levels)
		c.DrawGlyphNoClip(sty, pt)
	}
}

func (l mapLayers) outlines(c draw.Canvas, at func(Point) vg.Point) {
	sty := styleOutline
	for _, poly := range l.m.Outline {
		for _, ring := range poly {
			pts := make([]vg.Point, 0, len(ring)+1)
			for _, q := range ring {
				pts = append(pts, at(q))
			}
			if ring[0] != ring[len(ring)-1] {
				pts = append(pts, pts[0])
			}
			c.StrokeLines(sty, c.ClipLinesXY(pts)...)
		}
	}
}

func (l mapLayers) wells(c draw.Canvas, at func(Point) vg.Point) {
	sty := draw.LineStyle{Color: colourWell, Width: widthWell}
	for _, w := range l.m.Wells {
		if len(w.Path) == 1 {
			if pt := at(w.Path[0]); c.Contains(pt) {
				c.DrawGlyphNoClip(draw.GlyphStyle{Color: colourWell, Radius: widthWell, Shape: draw.CircleGlyph{}}, pt)
			}
			continue
		}
		pts := make([]vg.Point, len(w.Path))
		for i, q := range w.Path {
			pts[i] = at(q)
		}
		c.StrokeLines(sty, c.ClipLinesXY(pts)...)
	}
}

func (l mapLayers) clusters(c draw.Canvas, at func(Point) vg.Point) {
	for _, cl := range l.m.Clusters {
		if pt := at(cl.At); c.Contains(pt) {
			drawDiamond(c, pt, radiusCluster)
		}
	}
}

// drawDiamond draws the cluster marker: a white diamond outlined in black.
func drawDiamond(c draw.Canvas, pt vg.Point, r vg.Length) {
	var path vg.Path
	path.Move(vg.Point{X: pt.X, Y: pt.Y + r})
	path.Line(vg.Point{X: pt.X + r, Y: pt.Y})
	path.Line(vg.Point{X: pt.X, Y: pt.Y - r})
	path.Line(vg.Point{X: pt.X - r, Y: pt.Y})
	path.Close()
	c.SetColor(white)
	c.Fill(path)
	c.SetLineStyle(draw.LineStyle{Color: okabeBlack, Width: 0.9})
	c.Stroke(path)
}

// placedLabel is a label drawn on a map and its box, page points.
type placedLabel struct {
	text string
	box  vg.Rectangle
}

// labels writes well names near the first path point inside the frame
// and each stage's name near the centroid of its clusters, each at the
// first place clear of the cluster markers, the events, the corner boxes
// and the labels already placed.
func (l mapLayers) labels(c draw.Canvas, at func(Point) vg.Point, lp *labelPlacer) {
	for _, cl := range l.m.Clusters {
		if pt := at(cl.At); c.Contains(pt) {
			lp.block(squareAround(pt, radiusCluster+1))
		}
	}
	for _, e := range l.m.Events {
		if pt := at(e.At); c.Contains(pt) {
			lp.block(squareAround(pt, eventRadius(e.Magnitude, l.levels)))
		}
	}
	put := func(st text.Style, anchor vg.Point, gap vg.Length, s string) {
		box, ok := lp.place(labelCandidates(anchor, st.Width(s), st.Height(s), gap))
		if !ok {
			return
		}
		haloText(c, st, box.Min, s)
		if l.placed != nil {
			*l.placed = append(*l.placed, placedLabel{text: s, box: box})
		}
	}
	wellSty := textStyle(sizeTag, true, draw.XLeft, draw.YBottom)
	for _, w := range l.m.Wells {
		if w.Name == "" {
			continue
		}
		for _, q := range w.Path {
			if pt := at(q); c.Contains(pt) {
				put(wellSty, pt, 5, w.Name)
				break
			}
		}
	}
	stageSty := textStyle(sizeTag, false, draw.XLeft, draw.YBottom)
	for _, s := range stageCentroids(l.m.Clusters) {
		if pt := at(s.at); c.Contains(pt) {
			put(stageSty, pt, radiusCluster+3, s.name)
		}
	}
}

// stageLabel is a stage name and the centroid of its clusters.
type stageLabel struct {
	name string
	at   Point
}

// stageCentroids returns each named stage once, in order of first
// appearance, at the mean position of its clusters.
func stageCentroids(cs []Cluster) []stageLabel {
	var out []stageLabel
	index := map[string]int{}
	counts := []float64{}
	for _, c := range cs {
		if c.Stage == "" {
			continue
		}
		i, ok := index[c.Stage]
		if !ok {
			i = len(out)
			index[c.Stage] = i
			out = append(out, stageLabel{name: c.Stage})
			counts = append(counts, 0)
		}
		out[i].at.East += c.At.East
		out[i].at.North += c.At.North
		counts[i]++
	}
	for i := range out {
		out[i].at.East /= counts[i]
		out[i].at.North /= counts[i]
	}
	return out
}

// ringGlyph is an unfilled circle of a given line width.
type ringGlyph struct{ width vg.Length }

// DrawGlyph implements draw.GlyphDrawer.
func (g ringGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: g.width})
	var p vg.Path
	p.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
	p.Arc(pt, sty.Radius, 0, 2*math.Pi)
	p.Close()
	c.Stroke(p)
}

// clipSegment clips the segment ab to the rectangle r (Liang & Barsky
// 1984, "A new concept and method for line clipping", ACM TOG 3(1)) and
// reports whether any part of it is inside.
func clipSegment(r vg.Rectangle, a, b vg.Point) (vg.Point, vg.Point, bool) {
	t0, t1 := 0.0, 1.0
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	// Each pair is (p, q) of the inequality t·p ≤ q for one edge.
	edges := [4][2]float64{
		{-dx, float64(a.X - r.Min.X)},
		{dx, float64(r.Max.X - a.X)},
		{-dy, float64(a.Y - r.Min.Y)},
		{dy, float64(r.Max.Y - a.Y)},
	}
	for _, e := range edges {
		p, q := e[0], e[1]
		if p == 0 {
			if q < 0 {
				return a, b, false // Parallel to this edge and outside it.
			}
			continue
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return a, b, false
		}
	}
	at := func(t float64) vg.Point {
		return vg.Point{X: a.X + vg.Length(t*dx), Y: a.Y + vg.Length(t*dy)}
	}
	return at(t0), at(t1), true
}
