// Package orient converts between the orientation conventions of
// structural geology and unit vectors in East-North-Up coordinates.
//
// # Conventions
//
// Coordinates are East-North-Up (x east, y north, z up). Azimuths (dip
// direction, trend) are clockwise from north; dip is 0–90° below the
// horizontal; plunge is positive downwards. All angles are radians.
//
// A plane with dip δ and dip direction α has the upward unit normal
//
//	n = (sin δ sin α, sin δ cos α, cos δ)
//
// its strike (right-hand rule) is α − 90°, and its lower-hemisphere pole has
// trend α + 180° and plunge 90° − δ.
//
// # References
//
// Allmendinger, R.W., Cardozo, N. & Fisher, D.M. (2012), Structural Geology
// Algorithms: Vectors and Tensors, Cambridge University Press, ch. 2 (which
// uses North-East-Down axes; the forms above are the ENU equivalents).
package orient

import (
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Normal returns the upward unit normal of a plane with the given dip and
// dip direction, radians.
func Normal(dip, dipDirection float64) r3.Vec {
	sd, cd := math.Sincos(dip)
	sa, ca := math.Sincos(dipDirection)
	return r3.Vec{X: sd * sa, Y: sd * ca, Z: cd}
}

// DipAndDirection returns the dip and dip direction, radians, of the plane
// with normal n (either sense; n need not be of unit length). The dip
// direction of a horizontal plane is reported as 0.
func DipAndDirection(n r3.Vec) (dip, dipDirection float64) {
	n = r3.Unit(n)
	if n.Z < 0 {
		n = r3.Scale(-1, n)
	}
	dip = math.Acos(math.Min(1, n.Z))
	h := math.Hypot(n.X, n.Y)
	if h == 0 {
		return 0, 0
	}
	return dip, Azimuth(math.Atan2(n.X, n.Y))
}

// Line returns the unit vector of a line with the given trend and plunge,
// radians; positive plunge points down.
func Line(trend, plunge float64) r3.Vec {
	st, ct := math.Sincos(trend)
	sp, cp := math.Sincos(plunge)
	return r3.Vec{X: cp * st, Y: cp * ct, Z: -sp}
}

// TrendAndPlunge returns the trend and plunge, radians, of the line along v,
// taking the sense that points down (plunge ≥ 0).
func TrendAndPlunge(v r3.Vec) (trend, plunge float64) {
	v = r3.Unit(v)
	if v.Z > 0 {
		v = r3.Scale(-1, v)
	}
	plunge = math.Asin(math.Min(1, -v.Z))
	if math.Hypot(v.X, v.Y) == 0 {
		return 0, plunge
	}
	return Azimuth(math.Atan2(v.X, v.Y)), plunge
}

// Pole returns the trend and plunge, radians, of the lower-hemisphere pole
// of a plane with the given dip and dip direction.
func Pole(dip, dipDirection float64) (trend, plunge float64) {
	return Azimuth(dipDirection + math.Pi), math.Pi/2 - dip
}

// Strike returns the horizontal unit vector along strike (right-hand rule:
// the plane dips to the right when looking along it).
func Strike(dipDirection float64) r3.Vec {
	s, c := math.Sincos(dipDirection - math.Pi/2)
	return r3.Vec{X: s, Y: c}
}

// DownDip returns the unit vector pointing down the dip of the plane.
func DownDip(dip, dipDirection float64) r3.Vec {
	sd, cd := math.Sincos(dip)
	sa, ca := math.Sincos(dipDirection)
	return r3.Vec{X: cd * sa, Y: cd * ca, Z: -sd}
}

// Azimuth wraps an angle, radians, into [0, 2π).
func Azimuth(a float64) float64 {
	a = math.Mod(a, 2*math.Pi)
	if a < 0 {
		a += 2 * math.Pi
	}
	if a >= 2*math.Pi {
		a = 0
	}
	return a
}
