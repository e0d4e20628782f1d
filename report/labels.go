package report

import (
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// labelPlacer puts label boxes inside a frame, clear of blocked boxes
// (markers, corner panels) and of the labels already placed. It is the
// greedy candidate-position method of cartographic label placement
// (Christensen, Marks & Shieber 1995, "An empirical study of algorithms
// for point-feature label placement", ACM Transactions on Graphics 14(3),
// 203–232): each label tries a fixed list of positions around its anchor
// and takes the first free one.
type labelPlacer struct {
	frame vg.Rectangle
	taken []vg.Rectangle
}

func newLabelPlacer(frame vg.Rectangle) *labelPlacer { return &labelPlacer{frame: frame} }

// block marks boxes as taken.
func (lp *labelPlacer) block(rs ...vg.Rectangle) { lp.taken = append(lp.taken, rs...) }

// place returns the first candidate inside the frame that overlaps no
// taken box; when every candidate inside the frame overlaps, the one with
// the least overlapping area. The box returned is taken. It reports false
// when no candidate fits inside the frame.
func (lp *labelPlacer) place(cands []vg.Rectangle) (vg.Rectangle, bool) {
	best, bestOverlap, found := vg.Rectangle{}, math.Inf(1), false
	for _, r := range cands {
		if !inside(r, lp.frame) {
			continue
		}
		var o float64
		for _, t := range lp.taken {
			o += overlapArea(r, t)
		}
		if o < bestOverlap {
			best, bestOverlap, found = r, o, true
		}
		if o == 0 {
			break
		}
	}
	if found {
		lp.taken = append(lp.taken, best)
	}
	return best, found
}

// labelCandidates returns boxes of size w × h around anchor, at gap and
// then at two and three times gap: above, below, right, left, then the
// four diagonals.
func labelCandidates(anchor vg.Point, w, h, gap vg.Length) []vg.Rectangle {
	out := make([]vg.Rectangle, 0, 24)
	for k := vg.Length(1); k <= 3; k++ {
		g := k * gap
		for _, min := range [...]vg.Point{
			{X: anchor.X - w/2, Y: anchor.Y + g},     // above
			{X: anchor.X - w/2, Y: anchor.Y - g - h}, // below
			{X: anchor.X + g, Y: anchor.Y - h/2},     // right
			{X: anchor.X - g - w, Y: anchor.Y - h/2}, // left
			{X: anchor.X + g, Y: anchor.Y + g},       // upper right
			{X: anchor.X - g - w, Y: anchor.Y + g},   // upper left
			{X: anchor.X + g, Y: anchor.Y - g - h},   // lower right
			{X: anchor.X - g - w, Y: anchor.Y - g - h},
		} {
			out = append(out, vg.Rectangle{Min: min, Max: vg.Point{X: min.X + w, Y: min.Y + h}})
		}
	}
	return out
}

// inside reports whether r lies within f.
func inside(r, f vg.Rectangle) bool {
	return r.Min.X >= f.Min.X && r.Min.Y >= f.Min.Y && r.Max.X <= f.Max.X && r.Max.Y <= f.Max.Y
}

// overlapArea returns the area shared by a and b, square points.
func overlapArea(a, b vg.Rectangle) float64 {
	w := math.Min(float64(a.Max.X), float64(b.Max.X)) - math.Max(float64(a.Min.X), float64(b.Min.X))
	h := math.Min(float64(a.Max.Y), float64(b.Max.Y)) - math.Max(float64(a.Min.Y), float64(b.Min.Y))
	if w <= 0 || h <= 0 {
		return 0
	}
	return w * h
}

// squareAround returns the square of half-side r centred on pt.
func squareAround(pt vg.Point, r vg.Length) vg.Rectangle {
	return vg.Rectangle{Min: vg.Point{X: pt.X - r, Y: pt.Y - r}, Max: vg.Point{X: pt.X + r, Y: pt.Y + r}}
}

// SHmax arrow layout, points.
const (
	shmaxHalfLength = 16
	shmaxHead       = 5
	shmaxPad        = 5
)

// shmaxBox returns the panel of the SHmax arrow in the upper-left corner
// of the data area c.
func shmaxBox(c draw.Canvas) vg.Rectangle {
	st := textStyle(sizeKey, true, draw.XCenter, draw.YTop)
	side := vg.Length(2*shmaxHalfLength + 2*shmaxPad)
	min := vg.Point{X: c.Min.X + 8, Y: c.Max.Y - 8 - side - st.Height("SHmax") - 2}
	return vg.Rectangle{Min: min, Max: vg.Point{X: min.X + side, Y: c.Max.Y - 8}}
}

// drawSHmaxArrow draws a double-headed arrow along azimuth (radians
// clockwise from grid north) on a translucent panel in the upper-left
// corner of the data area, labelled "SHmax", and returns the panel. The
// map has an equal aspect ratio, so the azimuth on the page equals the
// azimuth on the ground.
func drawSHmaxArrow(c draw.Canvas, azimuth float64) vg.Rectangle {
	box := shmaxBox(c)
	c.SetColor(translucentWhite)
	c.Fill(box.Path())
	st := textStyle(sizeKey, true, draw.XCenter, draw.YTop)
	c.FillText(st, vg.Point{X: (box.Min.X + box.Max.X) / 2, Y: box.Max.Y - 2}, "SHmax")
	centre := vg.Point{X: (box.Min.X + box.Max.X) / 2, Y: box.Min.Y + shmaxPad + shmaxHalfLength}
	s, co := math.Sincos(azimuth)
	d := vg.Point{X: vg.Length(s), Y: vg.Length(co)} // Unit vector along the azimuth, page frame.
	n := vg.Point{X: -d.Y, Y: d.X}
	tip := func(sign vg.Length) vg.Point { return centre.Add(d.Scale(sign * shmaxHalfLength)) }
	line := draw.LineStyle{Color: okabeBlack, Width: 1.4}
	a, b := tip(1), tip(-1)
	c.StrokeLine2(line, a.X, a.Y, b.X, b.Y)
	c.SetColor(okabeBlack)
	for _, sign := range [...]vg.Length{1, -1} {
		t := tip(sign)
		base := t.Sub(d.Scale(sign * shmaxHead * 1.6))
		var head vg.Path
		head.Move(t)
		head.Line(base.Add(n.Scale(shmaxHead / 2)))
		head.Line(base.Sub(n.Scale(shmaxHead / 2)))
		head.Close()
		c.Fill(head)
	}
	return box
}
