package orient

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
)

const deg = math.Pi / 180

// Tolerances: the conversions are closed forms, so round-off only.
const (
	vecTol   = 1e-6  // docs/references.md §1.5 prints 6 decimals
	angleTol = 1e-11 // radians, ≈ 1e-9 deg as docs/references.md §1.5 asks
)

// Check values: docs/references.md §1.5 table (standard relations of structural
// geology; Allmendinger, Cardozo & Fisher 2012, ch. 2).
func TestNormalAndPole(t *testing.T) {
	tests := []struct {
		dip, dipDir          float64 // degrees
		n                    r3.Vec
		poleTrend, polePlung float64 // degrees
	}{
		{60, 90, r3.Vec{X: 0.866025, Y: 0, Z: 0.5}, 270, 30},
		{30, 225, r3.Vec{X: -0.353553, Y: -0.353553, Z: 0.866025}, 45, 60},
		{90, 0, r3.Vec{X: 0, Y: 1, Z: 0}, 180, 0},
		{80, 120, r3.Vec{X: 0.852869, Y: -0.492404, Z: 0.173648}, 300, 10},
	}
	for _, tc := range tests {
		n := Normal(tc.dip*deg, tc.dipDir*deg)
		numtest.Abs(t, "n.X", n.X, tc.n.X, vecTol)
		numtest.Abs(t, "n.Y", n.Y, tc.n.Y, vecTol)
		numtest.Abs(t, "n.Z", n.Z, tc.n.Z, vecTol)
		tr, pl := Pole(tc.dip*deg, tc.dipDir*deg)
		numtest.Abs(t, "pole trend", tr, tc.poleTrend*deg, angleTol)
		numtest.Abs(t, "pole plunge", pl, tc.polePlung*deg, angleTol)
		// The pole is the downward normal.
		p := Line(tr, pl)
		numtest.Abs(t, "pole·n", r3.Dot(p, n), -1, vecTol)
	}
}

func TestRoundTrips(t *testing.T) {
	for dip := 1.0; dip <= 90; dip += 7 {
		for dd := 0.0; dd < 360; dd += 13 {
			d, a := DipAndDirection(Normal(dip*deg, dd*deg))
			numtest.Abs(t, "dip", d, dip*deg, angleTol)
			if dip < 90 {
				numtest.Abs(t, "dip direction", a, dd*deg, angleTol)
			}
			// The downward normal gives the same plane.
			d2, a2 := DipAndDirection(r3.Scale(-1, Normal(dip*deg, dd*deg)))
			numtest.Abs(t, "dip of -n", d2, dip*deg, angleTol)
			if dip < 90 {
				numtest.Abs(t, "dip direction of -n", a2, dd*deg, angleTol)
			}
			tr, pl := TrendAndPlunge(Line(dd*deg, (dip-1)*deg))
			numtest.Abs(t, "plunge", pl, (dip-1)*deg, angleTol)
			if dip < 91 && dip-1 < 90 {
				numtest.Abs(t, "trend", tr, dd*deg, angleTol)
			}
		}
	}
}

// n = d × s (docs/references.md §1.5): strike, down-dip and normal form a
// right-handed frame.
func TestFrame(t *testing.T) {
	for _, c := range [][2]float64{{80, 120}, {30, 225}, {60, 90}, {45, 0}} {
		dip, dd := c[0]*deg, c[1]*deg
		s, d, n := Strike(dd), DownDip(dip, dd), Normal(dip, dd)
		x := r3.Cross(d, s)
		numtest.Abs(t, "(d×s).X", x.X, n.X, 1e-12)
		numtest.Abs(t, "(d×s).Y", x.Y, n.Y, 1e-12)
		numtest.Abs(t, "(d×s).Z", x.Z, n.Z, 1e-12)
		numtest.Abs(t, "s·n", r3.Dot(s, n), 0, 1e-12)
		numtest.Abs(t, "d·n", r3.Dot(d, n), 0, 1e-12)
	}
}

func TestAzimuth(t *testing.T) {
	for _, c := range [][2]float64{{-90, 270}, {360, 0}, {725, 5}, {0, 0}} {
		numtest.Abs(t, "azimuth", Azimuth(c[0]*deg), c[1]*deg, 1e-12)
	}
}

func ExampleNormal() {
	n := Normal(80*math.Pi/180, 120*math.Pi/180)
	fmt.Printf("%.6f %.6f %.6f\n", n.X, n.Y, n.Z)
	// Output: 0.852869 -0.492404 0.173648
}
