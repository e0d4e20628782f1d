package gis

import "math"

// helmert is a seven-parameter datum shift to WGS 84 in the position
// vector convention (EPSG method 9606), the meaning of WKT1's
// TOWGS84[tx, ty, tz, rx, ry, rz, ds] (OGC 01-009 §7.2; PROJ's +towgs84):
//
//	X_t = M(X_s − rz·Y_s + ry·Z_s) + tx
//	Y_t = M(rz·X_s + Y_s − rx·Z_s) + ty
//	Z_t = M(−ry·X_s + rx·Y_s + Z_s) + tz,   M = 1 + ds·10⁻⁶
//
// on geocentric coordinates (IOGP (2019), Geomatics Guidance Note 7-2,
// "Helmert 7-parameter transformation", position vector convention).
type helmert struct {
	tx, ty, tz float64 // m
	rx, ry, rz float64 // radians (TOWGS84 gives arc-seconds)
	m          float64 // 1 + ds·10⁻⁶
}

// arcSecond is one second of arc in radians.
const arcSecond = math.Pi / (180 * 3600)

// newHelmert reads TOWGS84 values (3 or 7 of them).
func newHelmert(v []float64) helmert {
	var p [7]float64
	copy(p[:], v)
	return helmert{tx: p[0], ty: p[1], tz: p[2], rx: p[3] * arcSecond, ry: p[4] * arcSecond, rz: p[5] * arcSecond, m: 1 + p[6]*1e-6}
}

// apply transforms geocentric (x, y, z), m.
func (h helmert) apply(x, y, z float64) (float64, float64, float64) {
	return h.m*(x-h.rz*y+h.ry*z) + h.tx, h.m*(h.rz*x+y-h.rx*z) + h.ty, h.m*(-h.ry*x+h.rx*y+z) + h.tz
}

// toWGS84 converts longitude and latitude (degrees, on the ground: height
// 0) on ellipsoid el to WGS 84 through h: geodetic to geocentric on el,
// the Helmert transformation, geocentric to geodetic on WGS 84 (IOGP
// Guidance Note 7-2, "Geographic/geocentric conversions"). The height
// change (metres at most) moves latitude and longitude by far less than
// a millimetre, so the output is taken at the new height.
func (h helmert) toWGS84(el Ellipsoid, lonDeg, latDeg float64) (float64, float64) {
	rad := math.Pi / 180
	x, y, z := geocentric(el, lonDeg*rad, latDeg*rad)
	x, y, z = h.apply(x, y, z)
	lon, lat := geodetic(WGS84, x, y, z)
	return lon / rad, lat / rad
}

// geocentric returns the geocentric coordinates (m) of a point at height
// 0: ν = a/√(1 − e² sin²φ), X = ν cos φ cos λ, Y = ν cos φ sin λ,
// Z = (1 − e²)ν sin φ.
func geocentric(el Ellipsoid, lon, lat float64) (x, y, z float64) {
	f := el.flattening()
	e2 := f * (2 - f)
	sl, cl := math.Sincos(lon)
	sp, cp := math.Sincos(lat)
	nu := el.SemiMajorAxis / math.Sqrt(1-e2*sp*sp)
	return nu * cp * cl, nu * cp * sl, (1 - e2) * nu * sp
}

// geodetic returns longitude and latitude (radians) of geocentric (x, y,
// z) on el by the fixed-point iteration φ ← atan2(Z + e²ν sin φ, p),
// p = √(X² + Y²), which contracts by a factor of about e² per step near
// the surface; 10 steps reach 1e-16 rad.
func geodetic(el Ellipsoid, x, y, z float64) (lon, lat float64) {
	f := el.flattening()
	e2 := f * (2 - f)
	p := math.Hypot(x, y)
	lat = math.Atan2(z, p*(1-e2))
	for range 10 {
		s := math.Sin(lat)
		nu := el.SemiMajorAxis / math.Sqrt(1-e2*s*s)
		lat = math.Atan2(z+e2*nu*s, p)
	}
	return math.Atan2(y, x), lat
}
