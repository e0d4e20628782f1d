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
