package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/palette"
)

// viridisTable is every 5th entry (indices 0, 5, …, 255) of matplotlib's
// 256-entry viridis table, sRGB components in [0, 1]; entry k sits at
// t = k/51. Source: mpl-colormaps (N. J. Smith, S. van der Walt, E. Firing),
// CC0 1.0; van der Walt & Smith (2015). The full table is in
// testdata/viridis256.txt.
var viridisTable = [...][3]float64{
	{0.267004, 0.004874, 0.329415}, // 0
	{0.273809, 0.031497, 0.358853}, // 5
	{0.278791, 0.062145, 0.386592}, // 10
	{0.281924, 0.089666, 0.412415}, // 15
	{0.283197, 0.115680, 0.436115}, // 20
	{0.282623, 0.140926, 0.457517}, // 25
	{0.280255, 0.165693, 0.476498}, // 30
	{0.276194, 0.190074, 0.493001}, // 35
	{0.270595, 0.214069, 0.507052}, // 40
	{0.263663, 0.237631, 0.518762}, // 45
	{0.255645, 0.260703, 0.528312}, // 50
	{0.246811, 0.283237, 0.535941}, // 55
	{0.237441, 0.305202, 0.541921}, // 60
	{0.227802, 0.326594, 0.546532}, // 65
	{0.218130, 0.347432, 0.550038}, // 70
	{0.208623, 0.367752, 0.552675}, // 75
	{0.199430, 0.387607, 0.554642}, // 80
	{0.190631, 0.407061, 0.556089}, // 85
	{0.182256, 0.426184, 0.557120}, // 90
	{0.174274, 0.445044, 0.557792}, // 95
	{0.166617, 0.463708, 0.558119}, // 100
	{0.159194, 0.482237, 0.558073}, // 105
	{0.151918, 0.500685, 0.557587}, // 110
	{0.144759, 0.519093, 0.556572}, // 115
	{0.137770, 0.537492, 0.554906}, // 120
	{0.131172, 0.555899, 0.552459}, // 125
	{0.125394, 0.574318, 0.549086}, // 130
	{0.121148, 0.592739, 0.544641}, // 135
	{0.119423, 0.611141, 0.538982}, // 140
	{0.121380, 0.629492, 0.531973}, // 145
	{0.128087, 0.647749, 0.523491}, // 150
	{0.140210, 0.665859, 0.513427}, // 155
	{0.157851, 0.683765, 0.501686}, // 160
	{0.180653, 0.701402, 0.488189}, // 165
	{0.208030, 0.718701, 0.472873}, // 170
	{0.239374, 0.735588, 0.455688}, // 175
	{0.274149, 0.751988, 0.436601}, // 180
	{0.311925, 0.767822, 0.415586}, // 185
	{0.352360, 0.783011, 0.392636}, // 190
	{0.395174, 0.797475, 0.367757}, // 195
	{0.440137, 0.811138, 0.340967}, // 200
	{0.487026, 0.823929, 0.312321}, // 205
	{0.535621, 0.835785, 0.281908}, // 210
	{0.585678, 0.846661, 0.249897}, // 215
	{0.636902, 0.856542, 0.216620}, // 220
	{0.688944, 0.865448, 0.182725}, // 225
	{0.741388, 0.873449, 0.149561}, // 230
	{0.793760, 0.880678, 0.120005}, // 235
	{0.845561, 0.887322, 0.099702}, // 240
	{0.896320, 0.893616, 0.096335}, // 245
	{0.945636, 0.899815, 0.112838}, // 250
	{0.993248, 0.906157, 0.143936}, // 255
}

// viridisRGB returns the viridis colour at t ∈ [0, 1] as sRGB components in
// [0, 1], interpolating the table linearly; t outside [0, 1] is clamped and
// NaN gives the t = 0 colour.
func viridisRGB(t float64) [3]float64 {
	if !(t > 0) {
		return viridisTable[0]
	}
	last := len(viridisTable) - 1
	if t >= 1 {
		return viridisTable[last]
	}
	x := t * float64(last)
	k := int(x)
	f := x - float64(k)
	a, b := viridisTable[k], viridisTable[k+1]
	return [3]float64{
		a[0] + f*(b[0]-a[0]),
		a[1] + f*(b[1]-a[1]),
		a[2] + f*(b[2]-a[2]),
	}
}

// Viridis returns the opaque viridis colour at t ∈ [0, 1] (clamped).
func Viridis(t float64) color.NRGBA {
	c := viridisRGB(t)
	return color.NRGBA{R: unitByte(c[0]), G: unitByte(c[1]), B: unitByte(c[2]), A: 255}
}

// unitByte converts a component in [0, 1] to 0–255, rounding to nearest.
func unitByte(v float64) uint8 {
	return uint8(math.Round(255 * math.Min(1, math.Max(0, v))))
}

// ColourMap is a palette.ColorMap over [Min, Max] with a continuous
// colour scale (viridis or a diverging one), for gonum/plot plotters such
// as plotter.ColorBar. Its zero value is not usable; make one with
// NewViridisMap or NewDivergingMap.
type ColourMap struct {
	min, max, alpha float64
	scale           func(t float64) color.NRGBA // Opaque colour at t ∈ [0, 1].
}

var _ palette.ColorMap = (*ColourMap)(nil)

// NewViridisMap returns an opaque viridis colour map over [min, max].
func NewViridisMap(min, max float64) *ColourMap {
	return &ColourMap{min: min, max: max, alpha: 1, scale: Viridis}
}

// At returns the colour of v, or an error when v is NaN or outside
// [Min, Max] (the palette.ColorMap contract).
func (m *ColourMap) At(v float64) (color.Color, error) {
	switch {
	case math.IsNaN(v):
		return nil, palette.ErrNaN
	case v < m.min:
		return nil, palette.ErrUnderflow
	case v > m.max:
		return nil, palette.ErrOverflow
	}
	return m.clamped(v), nil
}

// clamped returns the colour of v with v clamped to [Min, Max].
func (m *ColourMap) clamped(v float64) color.NRGBA {
	t := 0.0
	if m.max > m.min {
		t = (v - m.min) / (m.max - m.min)
	}
	c := m.scale(t)
	c.A = unitByte(m.alpha)
	return c
}

// Max returns the value drawn with the last colour.
func (m *ColourMap) Max() float64 { return m.max }

// SetMax sets the value drawn with the last colour.
func (m *ColourMap) SetMax(v float64) { m.max = v }

// Min returns the value drawn with the first colour.
func (m *ColourMap) Min() float64 { return m.min }

// SetMin sets the value drawn with the first colour.
func (m *ColourMap) SetMin(v float64) { m.min = v }

// Alpha returns the opacity, 0 (transparent) to 1 (opaque).
func (m *ColourMap) Alpha() float64 { return m.alpha }

// SetAlpha sets the opacity; it panics outside [0, 1].
func (m *ColourMap) SetAlpha(a float64) {
	if !(a >= 0 && a <= 1) {
		panic(fmt.Sprintf("report: alpha %g outside [0, 1]", a))
	}
	m.alpha = a
}

// Palette returns n colours evenly spaced from Min to Max.
func (m *ColourMap) Palette(n int) palette.Palette {
	cs := make(colours, n)
	for i := range cs {
		t := 0.0
		if n > 1 {
			t = float64(i) / float64(n-1)
		}
		c := m.scale(t)
		c.A = unitByte(m.alpha)
		cs[i] = c
	}
	return cs
}

// colours is a palette.Palette.
type colours []color.Color

// Colors returns the colours.
func (c colours) Colors() []color.Color { return c }
