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

// Mohr is the three-dimensional Mohr diagram of an effective stress state:
// the three circles of the principal effective stresses, the Coulomb
// failure envelope τ = c + μσn′, every fracture as a point (σn′, τ), and,
// when Increase is set, the envelope for a pore-pressure increase Δp.
//
// Raising the pore pressure by Δp lowers every σn′ by Δp at fixed total
// stress, so a plane slips when τ ≥ c + μ(σn′ − Δp): in the coordinates of
// the initial state, the envelope moves right by Δp (Jaeger, Cook &
// Zimmerman 2007, Fundamentals of Rock Mechanics, 4th ed., Blackwell:
// effective stress and Mohr–Coulomb failure). The picture draws it
// so, leaving the circles and points where they are.
//
// The circles have centres (σi′ + σj′)/2 and radii (σi′ − σj′)/2 for the
// pairs (1, 3), (1, 2) and (2, 3); every plane's (σn′, |τ|) lies inside the
// large circle and outside the two small ones (Jaeger, Cook & Zimmerman
// 2007, the three-dimensional Mohr circle). Both axes are drawn to
// the same scale, so the circles are round.
type Mohr struct {
	Title string
	Note  string // Printed under the chart.
	// Principal are the effective principal stresses σ1′ ≥ σ2′ ≥ σ3′, Pa,
	// compression-positive: total principal stress minus pore pressure.
	Principal [3]float64
	Cohesion  float64 // c, Pa, ≥ 0.
	Friction  float64 // μ, > 0.
	// Increase is the pore-pressure increase Δp, Pa, of the shifted
	// envelope; 0 draws none.
	Increase float64
	Points   []MohrPoint
	// Groups name the point groups by index, e.g. the set names; a point
	// whose group has no name is keyed "group <index>".
	Groups []string
}

// MohrPoint is one fracture plane on the diagram.
type MohrPoint struct {
	SigmaN float64 // Effective normal stress σn′, Pa.
	Tau    float64 // Shear stress magnitude |τ|, Pa.
	Group  int     // Index into Mohr.Groups (≥ 0), e.g. the set.
}

// WritePNG draws the diagram at size s (zero: DefaultSize) and writes it
// to w as PNG. Invalid input returns an error and writes nothing.
func (m *Mohr) WritePNG(w io.Writer, s Size) error {
	pg, err := m.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks the stresses, the criterion and the points.
func (m *Mohr) validate() error {
	s := m.Principal
	if !finite(s[0]) || !finite(s[1]) || !finite(s[2]) || s[0] < s[1] || s[1] < s[2] {
		return fmt.Errorf("report: Mohr Principal = (%g, %g, %g) Pa: need finite σ1′ ≥ σ2′ ≥ σ3′", s[0], s[1], s[2])
	}
	if !(m.Cohesion >= 0) || !finite(m.Cohesion) || !(m.Friction > 0) || !finite(m.Friction) {
		return fmt.Errorf("report: Mohr Cohesion = %g Pa, Friction = %g: need finite c ≥ 0 and μ > 0", m.Cohesion, m.Friction)
	}
	if !(m.Increase >= 0) || !finite(m.Increase) {
		return fmt.Errorf("report: Mohr Increase = %g Pa: must be finite and ≥ 0", m.Increase)
	}
	for i, p := range m.Points {
		if !finite(p.SigmaN) || !finite(p.Tau) || p.Tau < 0 || p.Group < 0 {
			return fmt.Errorf("report: Mohr Points[%d] = (σn′ %g Pa, τ %g Pa, group %d): need finite values, τ ≥ 0 and group ≥ 0", i, p.SigmaN, p.Tau, p.Group)
		}
	}
	return nil
}

// mohrCircle is one Mohr circle, MPa.
type mohrCircle struct{ centre, radius float64 }

// mohrCircles draws the upper halves of the three circles. It is a
// plot.Plotter.
type mohrCircles struct{ circles [3]mohrCircle }

// circlesOf returns the circles of effective principal stresses s, Pa,
// in MPa: (1, 3), (1, 2), (2, 3).
func circlesOf(s [3]float64) mohrCircles {
	c := func(a, b float64) mohrCircle {
		return mohrCircle{centre: (a + b) / 2 * 1e-6, radius: (a - b) / 2 * 1e-6}
	}
	return mohrCircles{circles: [3]mohrCircle{c(s[0], s[2]), c(s[0], s[1]), c(s[1], s[2])}}
}

// Mohr styles. The envelopes are a dark grey that no point group uses.
var (
	colourEnvelope = color.NRGBA{90, 90, 90, 255}
	styleCircle    = draw.LineStyle{Color: okabeBlack, Width: 1.4}
	styleEnvelope  = draw.LineStyle{Color: colourEnvelope, Width: 1.8}
	styleShifted   = draw.LineStyle{Color: colourEnvelope, Width: 1.8, Dashes: []vg.Length{7, 4}}
)

// Plot implements plot.Plotter.
func (mc mohrCircles) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	const steps = 180
	for _, k := range mc.circles {
		pts := make([]vg.Point, steps+1)
		for i := range pts {
			s, co := math.Sincos(math.Pi * float64(i) / steps)
			pts[i] = vg.Point{X: tx(k.centre + k.radius*co), Y: ty(k.radius * s)}
		}
		c.StrokeLines(styleCircle, c.ClipLinesXY(pts)...)
	}
}

// mohrEnvelope draws τ = c + μ(σn′ − shift), MPa, where τ ≥ 0. It is a
// plot.Plotter.
type mohrEnvelope struct {
	cohesion, friction, shift float64 // MPa, –, MPa.
	style                     draw.LineStyle
}

// Plot implements plot.Plotter.
func (e mohrEnvelope) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	x0 := math.Max(p.X.Min, e.shift-e.cohesion/e.friction) // τ = 0 there.
	x1 := p.X.Max
	if x1 <= x0 {
		return
	}
	tau := func(x float64) float64 { return e.cohesion + e.friction*(x-e.shift) }
	pts := []vg.Point{{X: tx(x0), Y: ty(tau(x0))}, {X: tx(x1), Y: ty(tau(x1))}}
	c.StrokeLines(e.style, c.ClipLinesXY(pts)...)
}

// mohrPlot is the diagram's plot content, kept apart from the page so that
// tests read back the circles and envelopes drawn.
type mohrPlot struct {
	circles   mohrCircles
	envelopes []mohrEnvelope
	groups    [][]int // Point indices by group, groups in ascending index.
	groupIDs  []int
}

// content returns what the diagram draws, in MPa.
func (m *Mohr) content() mohrPlot {
	mp := mohrPlot{circles: circlesOf(m.Principal)}
	c, mu := m.Cohesion*1e-6, m.Friction
	mp.envelopes = []mohrEnvelope{{cohesion: c, friction: mu, style: styleEnvelope}}
	if m.Increase > 0 {
		mp.envelopes = append(mp.envelopes, mohrEnvelope{cohesion: c, friction: mu, shift: m.Increase * 1e-6, style: styleShifted})
	}
	index := map[int]int{}
	for i, p := range m.Points {
		k, ok := index[p.Group]
		if !ok {
			k = len(mp.groups)
			index[p.Group] = k
			mp.groups = append(mp.groups, nil)
			mp.groupIDs = append(mp.groupIDs, p.Group)
		}
		mp.groups[k] = append(mp.groups[k], i)
	}
	return mp
}

// render draws the diagram on a new page.
func (m *Mohr) render(s Size) (*page, error) {
	s, err := s.resolve()
	if err != nil {
		return nil, err
	}
	if err := m.validate(); err != nil {
		return nil, err
	}
	pg := newPage(s)
	body := frame(pg.dc, m.Title, m.Note)
	mp := m.content()
	p := newPlot("Effective normal stress σn′, MPa", "Shear stress τ, MPa")
	big := mp.circles.circles[0]
	lo := math.Min(0, big.centre-big.radius)
	hi := math.Max(big.centre+big.radius, 1e-6*m.Increase)
	for _, pt := range m.Points {
		lo, hi = math.Min(lo, pt.SigmaN*1e-6), math.Max(hi, pt.SigmaN*1e-6)
	}
	if hi <= lo {
		hi = lo + 1
	}
	pad := 0.06 * (hi - lo)
	p.X.Min, p.X.Max, p.X.Padding = lo-pad, hi+pad, 0
	top := math.Max(big.radius, 0.5*(hi-lo))
	for _, pt := range m.Points {
		top = math.Max(top, pt.Tau*1e-6)
	}
	p.Y.Min, p.Y.Max, p.Y.Padding = 0, 1.15*top, 0
	p.Add(mp.circles)
	for _, e := range mp.envelopes {
		p.Add(e)
	}
	rows := []keyRow{
		{text: "Mohr circles", symbol: lineSymbol(styleCircle)},
		{text: fmt.Sprintf("τ = c + μσn′, c = %s MPa, μ = %s", trimFloatDigits(m.Cohesion*1e-6, 3), trimFloatDigits(m.Friction, 3)), symbol: lineSymbol(styleEnvelope)},
	}
	if m.Increase > 0 {
		rows = append(rows, keyRow{text: fmt.Sprintf("After Δp = %s MPa", trimFloatDigits(m.Increase*1e-6, 3)), symbol: lineSymbol(styleShifted)})
	}
	for k, idx := range mp.groups {
		pts := make(plotter.XYs, len(idx))
		for j, i := range idx {
			pts[j] = plotter.XY{X: m.Points[i].SigmaN * 1e-6, Y: m.Points[i].Tau * 1e-6}
		}
		st := styleOf(k)
		st.glyph.Radius = 2.6
		p.Add(&plotter.Scatter{XYs: pts, GlyphStyle: st.glyph})
		rows = append(rows, keyRow{text: m.groupName(mp.groupIDs[k]), symbol: glyphSymbol(st.glyph)})
	}
	body = keyBelow(body, rows)
	area := equalAspect(p, body)
	// equalAspect widens about the centre; keep τ = 0 at the bottom (the
	// span, and so the scale, is unchanged).
	p.Y.Min, p.Y.Max = 0, p.Y.Max-p.Y.Min
	p.Draw(area)
	return pg, nil
}

// groupName returns the name of point group g.
func (m *Mohr) groupName(g int) string {
	if g < len(m.Groups) && m.Groups[g] != "" {
		return m.Groups[g]
	}
	return fmt.Sprintf("group %d", g)
}
