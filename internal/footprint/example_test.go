package footprint_test

import (
	"fmt"
	"math"

	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/footprint"
)

// The area within 2 m of one 10 m segment is 2rL + πr² (Steiner).
func ExampleArea() {
	segs := []dfn.Segment{{P0: r2.Vec{X: 0, Y: 0}, P1: r2.Vec{X: 10, Y: 0}}}
	a, err := footprint.Area(segs, 2)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("area %.6f m², Steiner %.6f m²\n", a, 2*2*10+math.Pi*2*2)
	// Output:
	// area 52.566371 m², Steiner 52.566371 m²
}

// Four fractures around a 30 m square leave an unstimulated 20 m square
// hole in the middle; the exact area is the 40 m square with corners
// rounded to r = 5 m, 1600 − (4 − π)·25, less the hole.
func ExampleOutline() {
	c := []r2.Vec{{X: 0, Y: 0}, {X: 30, Y: 0}, {X: 30, Y: 30}, {X: 0, Y: 30}}
	var segs []dfn.Segment
	for i := range c {
		segs = append(segs, dfn.Segment{P0: c[i], P1: c[(i+1)%len(c)]})
	}
	mp, err := footprint.Outline(segs, 5, footprint.OutlineOptions{Sagitta: 0.01})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := footprint.Area(segs, 5)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d polygon with %d hole; hole %.0f m²; outline area %.1f m², exact %.1f m²\n",
		len(mp), len(mp[0])-1, math.Abs(planar.Area(mp[0][1])), planar.Area(mp), a)
	// Output:
	// 1 polygon with 1 hole; hole 400 m²; outline area 1178.3 m², exact 1178.5 m²
}

// Two fractures in an L: the union counts the rock within r of them, the
// two stadiums (2rL + πr² each) less their overlap, the shared disc at the
// corner and the r × r corner square's part outside it; the envelope also
// counts the bay between them: the 30-40-50 triangle grown by r,
// 600 + 5·120 + 25π m² (Steiner formula).
func ExampleEnvelopeArea() {
	segs := []dfn.Segment{
		{P0: r2.Vec{X: 0, Y: 0}, P1: r2.Vec{X: 40, Y: 0}},
		{P0: r2.Vec{X: 0, Y: 0}, P1: r2.Vec{X: 0, Y: 30}},
	}
	u, err := footprint.Area(segs, 5)
	if err != nil {
		fmt.Println(err)
		return
	}
	e, groups, err := footprint.EnvelopeArea(segs, 5)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("union %.1f m², envelope %.1f m² in %d group\n", u, e, groups)
	// Output:
	// union 773.2 m², envelope 1278.5 m² in 1 group
}
