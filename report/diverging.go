package report

import (
	"image/color"
	"math"
)

// divergingTable is ColorBrewer's 9-class "RdBu" scheme, reversed so that
// it runs from blue (negative) through a near-white grey to red
// (positive): #2166ac #4393c3 #92c5de #d1e5f0 #f7f7f7 #fddbc7 #f4a582
// #d6604d #b2182b (Harrower & Brewer 2003; colorbrewer2.org marks it
// colour-blind safe; Tol 2021 recommends the same colours as "BuRd" for
// diverging data). The hex values are from memory and match the scheme as
// widely reproduced. Entry k sits at t = k/8.
var divergingTable = [...][3]uint8{
	{0x21, 0x66, 0xac},
	{0x43, 0x93, 0xc3},
	{0x92, 0xc5, 0xde},
	{0xd1, 0xe5, 0xf0},
	{0xf7, 0xf7, 0xf7},
	{0xfd, 0xdb, 0xc7},
	{0xf4, 0xa5, 0x82},
	{0xd6, 0x60, 0x4d},
	{0xb2, 0x18, 0x2b},
}

// Diverging returns the opaque colour of the diverging scale at t ∈ [0, 1]
// (clamped; NaN gives the t = 0 colour), interpolating the table linearly
// in sRGB. t = 0.5 is the neutral middle.
func Diverging(t float64) color.NRGBA {
	if !(t > 0) {
		t = 0
	}
	last := len(divergingTable) - 1
	x := math.Min(t, 1) * float64(last)
	k := min(int(x), last-1)
	f := x - float64(k)
	a, b := divergingTable[k], divergingTable[k+1]
	mix := func(p, q uint8) uint8 { return uint8(math.Round(float64(p) + f*(float64(q)-float64(p)))) }
	return color.NRGBA{R: mix(a[0], b[0]), G: mix(a[1], b[1]), B: mix(a[2], b[2]), A: 255}
}

// NewDivergingMap returns an opaque diverging colour map over
// [−bound, bound], neutral at zero (bound > 0).
func NewDivergingMap(bound float64) *ColourMap {
	return &ColourMap{min: -bound, max: bound, alpha: 1, scale: Diverging}
}
