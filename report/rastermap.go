package report

import (
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// MapGrid is a regular grid of square cells in the local East-North
// frame: cell (i, j), i from the west and j from the SOUTH, covers
// [XMin + i·CellSize, XMin + (i+1)·CellSize] × [YMin + j·CellSize, …]; its
// value is at index j·Cols + i.
type MapGrid struct {
	Cols, Rows int
	CellSize   float64 // m.
	XMin, YMin float64 // South-west corner, m.
}

// Contour is one labelled set of outlines on a raster map, e.g. the cells
// where the probability is at least 50 %.
type Contour struct {
	Label    string // Key text, e.g. "50 %".
	Polygons []Polygon
}

// ProbabilityMap is the stimulation probability of one batch case on the
// map grid: the share of realizations in which each cell was stimulated,
// on a fixed 0–1 viridis scale, with labelled contours (e.g. 10, 50 and
// 90 %) and the wells. Cells of probability 0 are left blank.
type ProbabilityMap struct {
	Title   string
	CRSNote string // See Map.CRSNote.
	// Note is printed under the map, e.g. "Share of 200 realizations".
	Note string
	// Extent shown; the zero Extent shows the whole grid.
	Extent      Extent
	Grid        MapGrid
	Probability []float64 // Per cell, 0–1.
	// Contours are drawn in order with increasing weight: the first
	// dotted, the second dashed, the third solid (e.g. 10, 50, 90 %).
	Contours []Contour
	Wells    []Well
}

// DifferenceMap is the difference of two cases' stimulation
// probabilities, P(case) − P(reference), on a diverging scale from −1
// (blue) to +1 (red), neutral at 0. The diverging colours alone do not
// survive greyscale printing (both ends are dark), so the contours —
// e.g. where the difference is ≥ +0.25 and ≤ −0.25 — carry the sign in
// line style as well.
type DifferenceMap struct {
	Title   string
	CRSNote string
	Note    string
	Extent  Extent
	Grid    MapGrid
	// Difference per cell, in [−1, 1]; NaN leaves a cell blank.
	Difference []float64
	// Case and Reference name the two cases, e.g. "20 cP" and "1 cP".
	Case, Reference string
	Contours        []Contour
	Wells           []Well
}

// maxContours is the number of contour line styles.
const maxContours = 3

// Contour line styles: increasing weight with the index.
var contourStyles = [maxContours]draw.LineStyle{
	{Color: okabeBlack, Width: 1.1, Dashes: []vg.Length{1.5, 2}},
	{Color: okabeBlack, Width: 1.5, Dashes: []vg.Length{6, 3}},
	{Color: okabeBlack, Width: 2.0},
}

// WritePNG draws the map at size s (zero: DefaultSize) and writes it to w
// as PNG. Invalid input returns an error and writes nothing.
func (m *ProbabilityMap) WritePNG(w io.Writer, s Size) error {
	pg, _, err := m.raster().render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// WritePNG draws the map at size s (zero: DefaultSize) and writes it to w
// as PNG. Invalid input returns an error and writes nothing.
func (m *DifferenceMap) WritePNG(w io.Writer, s Size) error {
	pg, _, err := m.raster().render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// rasterMap is what both raster maps draw.
type rasterMap struct {
	kind                 string // "probability" or "difference", for errors.
	title, crsNote, note string
	extent               Extent
	grid                 MapGrid
	values               []float64
	lo, hi               float64 // Allowed value range.
	cmap                 *ColourMap
	label                string // Colour-bar label.
	blank                func(v float64) bool
	contours             []Contour
	wells                []Well
	notes                []string // Side-panel notes.
}

func (m *ProbabilityMap) raster() *rasterMap {
	return &rasterMap{kind: "probability", title: m.Title, crsNote: m.CRSNote, note: m.Note, extent: m.Extent,
		grid: m.Grid, values: m.Probability, lo: 0, hi: 1, cmap: NewViridisMap(0, 1),
		label: "Stimulation probability", blank: func(v float64) bool { return v == 0 },
		contours: m.Contours, wells: m.Wells, notes: []string{"Blank: never stimulated"}}
}

func (m *DifferenceMap) raster() *rasterMap {
	return &rasterMap{kind: "difference", title: m.Title, crsNote: m.CRSNote, note: m.Note, extent: m.Extent,
		grid: m.Grid, values: m.Difference, lo: -1, hi: 1, cmap: NewDivergingMap(1),
		label: "Probability difference", blank: math.IsNaN, contours: m.Contours, wells: m.Wells,
		notes: []string{"P(" + m.Case + ") − P(" + m.Reference + ")", "red: " + m.Case + " more likely", "blue: " + m.Reference + " more likely"}}
}

// validate checks the grid, the values, the contours and the wells.
func (r *rasterMap) validate() error {
	g := r.grid
	if g.Cols < 1 || g.Rows < 1 || !(g.CellSize > 0) || !finite(g.CellSize) || !finite(g.XMin) || !finite(g.YMin) {
		return fmt.Errorf("report: %s map grid %d × %d cells of %g m at (%g, %g): need ≥ 1 × 1 cells of a finite size > 0 at a finite corner",
			r.kind, g.Cols, g.Rows, g.CellSize, g.XMin, g.YMin)
	}
	if len(r.values) != g.Cols*g.Rows {
		return fmt.Errorf("report: %s map has %d values for a %d × %d grid: need one per cell", r.kind, len(r.values), g.Cols, g.Rows)
	}
	for i, v := range r.values {
		if !(v >= r.lo && v <= r.hi) && !(math.IsNaN(v) && r.blank(v)) {
			return fmt.Errorf("report: %s map value %d (column %d, row %d) = %g: must be in [%g, %g]", r.kind, i, i%g.Cols, i/g.Cols, v, r.lo, r.hi)
		}
	}
	if len(r.contours) > maxContours {
		return fmt.Errorf("report: %s map has %d contours: at most %d", r.kind, len(r.contours), maxContours)
	}
	for i, c := range r.contours {
		for j, poly := range c.Polygons {
			for k, ring := range poly {
				if len(ring) < 3 {
					return fmt.Errorf("report: %s map Contours[%d] polygon %d ring %d has %d points: need at least 3", r.kind, i, j, k, len(ring))
				}
				for _, p := range ring {
					if err := checkPoint("Contours", i, fmt.Sprintf("polygon %d", j), p); err != nil {
						return err
					}
				}
			}
		}
	}
	wells := Map{Wells: r.wells}
	return wells.validate()
}

// render draws the map on a new page.
func (r *rasterMap) render(s Size) (*page, mapFrame, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, mapFrame{}, err
	}
	if err := r.validate(); err != nil {
		return nil, mapFrame{}, err
	}
	ext := r.extent
	if ext == (Extent{}) {
		g := r.grid
		ext = Extent{g.XMin, g.XMin + float64(g.Cols)*g.CellSize, g.YMin, g.YMin + float64(g.Rows)*g.CellSize}
	}
	if err := checkExtent(ext); err != nil {
		return nil, mapFrame{}, err
	}
	var rows []keyRow
	for i, c := range r.contours {
		rows = append(rows, keyRow{text: c.Label, symbol: lineSymbol(contourStyles[i])})
	}
	if len(r.wells) > 0 {
		rows = append(rows, keyRow{text: "Well path", symbol: lineSymbol(draw.LineStyle{Color: colourWell, Width: widthWell})})
	}
	pg, f := renderMapPage(s, mapSpec{title: r.title, note: joinNotes(r.note, r.crsNote), extent: ext, layers: rasterLayers{r: r},
		side: func(c draw.Canvas) { drawColourPanel(c, r.cmap, r.label, r.notes, rows) }})
	return pg, f, nil
}

// joinNotes joins the non-empty notes with "; ".
func joinNotes(a, b string) string {
	switch {
	case a == "":
		return b
	case b == "":
		return a
	}
	return a + "; " + b
}

// rasterLayers draws the cells, the contours and the wells with their
// labels. It is a plot.Plotter.
type rasterLayers struct{ r *rasterMap }

// Plot implements plot.Plotter.
func (l rasterLayers) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	r, g := l.r, l.r.grid
	// Runs of equal value along each row are filled as one rectangle.
	for j := range g.Rows {
		y0, y1 := ty(g.YMin+float64(j)*g.CellSize), ty(g.YMin+float64(j+1)*g.CellSize)
		for i := 0; i < g.Cols; {
			v := r.values[j*g.Cols+i]
			k := i + 1
			for k < g.Cols && sameValue(r.values[j*g.Cols+k], v) {
				k++
			}
			if !r.blank(v) {
				// seam: opaque cells overlap their east and north
				// neighbours slightly, so antialiasing leaves no light seams.
				const seam = 0.4 // Points.
				rect := vg.Rectangle{
					Min: vg.Point{X: tx(g.XMin + float64(i)*g.CellSize), Y: y0},
					Max: vg.Point{X: tx(g.XMin+float64(k)*g.CellSize) + seam, Y: y1 + seam},
				}
				if clipped, ok := intersectRect(rect, c.Rectangle); ok {
					c.SetColor(r.cmap.clamped(v))
					c.Fill(clipped.Path())
				}
			}
			i = k
		}
	}
	at := func(q Point) vg.Point { return vg.Point{X: tx(q.East), Y: ty(q.North)} }
	for i, ct := range r.contours {
		for _, poly := range ct.Polygons {
			for _, ring := range poly {
				pts := make([]vg.Point, 0, len(ring)+1)
				for _, q := range ring {
					pts = append(pts, at(q))
				}
				pts = append(pts, pts[0])
				c.StrokeLines(contourStyles[i], c.ClipLinesXY(pts)...)
			}
		}
	}
	mapLayers{m: &Map{Wells: r.wells}}.Plot(c, p)
}

// sameValue reports whether a and b are equal or both NaN.
func sameValue(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

// intersectRect returns the part of a inside b, and false when empty.
func intersectRect(a, b vg.Rectangle) (vg.Rectangle, bool) {
	r := vg.Rectangle{
		Min: vg.Point{X: max(a.Min.X, b.Min.X), Y: max(a.Min.Y, b.Min.Y)},
		Max: vg.Point{X: min(a.Max.X, b.Max.X), Y: min(a.Max.Y, b.Max.Y)},
	}
	return r, r.Max.X > r.Min.X && r.Max.Y > r.Min.Y
}
