package gis

import "math"

// LambertConic is the ellipsoidal Lambert conic conformal projection with
// one standard parallel and a scale factor (EPSG method 9801) or two
// standard parallels (EPSG method 9802), in the closed form of IOGP
// (2019), Geomatics Guidance Note 7-2, "Lambert Conic Conformal" (section
// 3.1.1; section number from memory):
//
//	m = cos φ/√(1 − e² sin² φ),  t = tan(π/4 − φ/2)/[(1 − e sin φ)/(1 + e sin φ)]^(e/2)
//	2SP: n = (ln m1 − ln m2)/(ln t1 − ln t2), F = m1/(n t1ⁿ), r = a F tⁿ
//	1SP: n = sin φ0, F = m0/(n t0ⁿ), r = a k0 F tⁿ
//	θ = n(λ − λ0),  E = FE + r sin θ,  N = FN + r_O − r cos θ
//
// where r_O is r at the latitude of the (false or natural) origin. The
// code writes t through the isometric latitude ψ, t = e^(−ψ), with
// sinh ψ = tan φ' the conformal latitude of Karney (2011, eqs. 7–9), so
// that the inverse reuses Karney's Newton iteration for φ instead of the
// Guidance Note's fixed-point iteration; both solve the same equation.
// In terms of τ = tan φ, m = 1/√(1 + (1 − e²)τ²).
//
// The formulas are exact (no series), so the only error is rounding:
// about 1e-9 m at the radii of a State Plane cone.
type LambertConic struct {
	e         float64 // first eccentricity
	n         float64 // cone constant
	akF       float64 // a·k0·F, m (k0 = 1 for 2SP)
	rOrigin   float64 // r at the latitude of origin, m
	lon0      float64 // λ0, radians
	east0     float64 // false easting, m
	north0    float64 // false northing, m
	signOfCon float64 // sign of n: +1 for a cone opening south (northern hemisphere)
}

// newLambertConic returns the projection; NewProjection has checked the
// parameters.
func newLambertConic(el Ellipsoid, cv Conversion) *LambertConic {
	f := el.flattening()
	e := math.Sqrt(f * (2 - f))
	rad := math.Pi / 180
	lc := &LambertConic{e: e, lon0: cv.LonOrigin * rad, east0: cv.FalseEasting, north0: cv.FalseNorthing}
	var mRef, psiRef, k0 float64
	if cv.Method == MethodLambertConic1SP {
		phi0 := cv.LatOrigin * rad
		lc.n = math.Sin(phi0)
		mRef, psiRef, k0 = lc.m(phi0), lc.psi(phi0), cv.Scale
	} else {
		phi1, phi2 := cv.StdParallel1*rad, cv.StdParallel2*rad
		m1, m2 := lc.m(phi1), lc.m(phi2)
		psi1, psi2 := lc.psi(phi1), lc.psi(phi2)
		if phi1 == phi2 {
			lc.n = math.Sin(phi1) // the limit of the 2SP constant
		} else {
			lc.n = (math.Log(m1) - math.Log(m2)) / (psi2 - psi1) // ln t = −ψ
		}
		mRef, psiRef, k0 = m1, psi1, 1
	}
	// F = m/(n tⁿ) = m e^(nψ)/n.
	lc.akF = el.SemiMajorAxis * k0 * mRef * math.Exp(lc.n*psiRef) / lc.n
	lc.rOrigin = lc.radius(lc.psi(cv.LatOrigin * rad))
	lc.signOfCon = math.Copysign(1, lc.n)
	return lc
}

// m returns cos φ/√(1 − e² sin² φ).
func (lc *LambertConic) m(phi float64) float64 {
	s, c := math.Sincos(phi)
	return c / math.Sqrt(1-lc.e*lc.e*s*s)
}

// psi returns the isometric latitude ψ = asinh(tan φ') of latitude φ.
func (lc *LambertConic) psi(phi float64) float64 {
	return math.Asinh(conformalTau(math.Tan(phi), lc.e))
}

// radius returns r = a k0 F tⁿ = a k0 F e^(−nψ), m.
func (lc *LambertConic) radius(psi float64) float64 {
	return lc.akF * math.Exp(-lc.n*psi)
}

// Forward returns the easting and northing (m) of longitude and latitude
// (degrees).
func (lc *LambertConic) Forward(lonDeg, latDeg float64) (easting, northing float64) {
	rad := math.Pi / 180
	r := lc.radius(lc.psi(latDeg * rad))
	s, c := math.Sincos(lc.n * remainderPi(lonDeg*rad-lc.lon0))
	return lc.east0 + r*s, lc.north0 + lc.rOrigin - r*c
}

// Inverse returns the longitude and latitude (degrees) of easting and
// northing (m):
//
//	r' = ±√((E − FE)² + (r_O − (N − FN))²) with the sign of n,
//	θ' = atan2(±(E − FE), ±(r_O − (N − FN))),  t' = (r'/(a k0 F))^(1/n),
//	λ = θ'/n + λ0,  and φ from ψ = −ln t'
//
// (IOGP Guidance Note 7-2, Lambert Conic Conformal, reverse case).
func (lc *LambertConic) Inverse(easting, northing float64) (lonDeg, latDeg float64) {
	dx := lc.signOfCon * (easting - lc.east0)
	dy := lc.signOfCon * (lc.rOrigin - (northing - lc.north0))
	r := lc.signOfCon * math.Hypot(dx, dy)
	theta := math.Atan2(dx, dy)
	psi := -math.Log(r/lc.akF) / lc.n
	tau := tauFromConformal(math.Sinh(psi), lc.e)
	deg := 180 / math.Pi
	return remainderPi(theta/lc.n+lc.lon0) * deg, math.Atan(tau) * deg
}
