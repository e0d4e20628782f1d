package gis

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Ellipsoid is a reference ellipsoid of revolution.
type Ellipsoid struct {
	// SemiMajorAxis a, m.
	SemiMajorAxis float64
	// InverseFlattening 1/f, dimensionless.
	InverseFlattening float64
}

// WGS84 is the World Geodetic System 1984 ellipsoid (EPSG:7030):
// a = 6378137 m, 1/f = 298.257223563 (NIMA TR8350.2, 2000, table 3.1;
// the same values gdalsrsinfo prints for EPSG:4326).
var WGS84 = Ellipsoid{SemiMajorAxis: 6378137, InverseFlattening: 298.257223563}

// GRS80 is the Geodetic Reference System 1980 ellipsoid (EPSG:7019) of
// NAD83: a = 6378137 m, 1/f = 298.257222101 (Moritz 1980; the values
// gdalsrsinfo prints for EPSG:4269).
var GRS80 = Ellipsoid{SemiMajorAxis: 6378137, InverseFlattening: 298.257222101}

// Clarke1866 is the Clarke 1866 ellipsoid (EPSG:7008) of NAD27, defined
// by a = 6378206.4 m and b = 6356583.8 m (EPSG dataset, ellipsoid 7008).
// 1/f = a/(a − b) is computed in float64 arithmetic, 294.978698213898,
// as PROJ does and gdalsrsinfo prints for EPSG:4267; the exact quotient,
// 294.978698213906, differs by 3e-14 relative, far below any effect.
var Clarke1866 = clarke1866()

func clarke1866() Ellipsoid {
	a, b := 6378206.4, 6356583.8
	return Ellipsoid{SemiMajorAxis: a, InverseFlattening: a / (a - b)}
}

// flattening returns f, 0 for a sphere (InverseFlattening 0, the WKT
// convention).
func (el Ellipsoid) flattening() float64 {
	if el.InverseFlattening == 0 {
		return 0
	}
	return 1 / el.InverseFlattening
}

// validate checks that el is an oblate ellipsoid or a sphere.
func (el Ellipsoid) validate() error {
	a, rf := el.SemiMajorAxis, el.InverseFlattening
	if !(a > 0) || math.IsInf(a, 0) || !(rf == 0 || rf > 1) || math.IsInf(rf, 0) {
		return fmt.Errorf("gis: ellipsoid a = %g m, 1/f = %g: want a > 0 and 1/f > 1 (or 0 for a sphere)", a, rf)
	}
	return nil
}

// krugerOrder is the order of the Krüger series in n (Karney 2011, §4:
// order 6 gives errors below 5 nm within the UTM zones).
const krugerOrder = 6

// TransverseMercator is the ellipsoidal transverse Mercator projection
// evaluated with Krüger's series in the third flattening n to order 6,
// following Karney (2011), "Transverse Mercator with an accuracy of a few
// nanometers", J. Geodesy 85, 475–485, doi:10.1007/s00190-011-0445-3.
//
// Within about 3900 km of the central meridian the truncation error is a
// few nanometres (Karney 2011, fig. 1); UTM and State Plane zones keep
// points within a few hundred kilometres of it.
//
// A latitude of origin φ0 other than the equator shifts the northing by
// the projected distance of φ0 from the equator on the central meridian,
// k0·A·ξ(φ0) (Karney 2011, eq. 13 at η = 0), so that the natural origin
// maps to the false easting and northing as IOGP Guidance Note 7-2
// defines them (EPSG method 9807).
type TransverseMercator struct {
	centralMeridian float64 // λ0, radians
	scale           float64 // k0
	falseEasting    float64 // m
	falseNorthing   float64 // m, less k0·A·ξ(φ0) for a latitude of origin φ0

	e     float64                  // first eccentricity
	a1    float64                  // k0·A, m, A the rectifying radius (Karney 2011, eq. 14)
	alpha [krugerOrder + 1]float64 // α_j (eq. 35), index 0 unused
	beta  [krugerOrder + 1]float64 // β_j (eq. 36), index 0 unused
}

// NewTransverseMercator returns the projection on ellipsoid el with the
// given central meridian (degrees), scale factor on the central meridian
// and false easting and northing (m). The latitude of origin is the
// equator, as in UTM; NewProjection takes any latitude of origin.
func NewTransverseMercator(el Ellipsoid, centralMeridianDeg, scale, falseEasting, falseNorthing float64) *TransverseMercator {
	return newTransverseMercator(el, Conversion{Method: MethodTransverseMercator, LonOrigin: centralMeridianDeg, Scale: scale,
		FalseEasting: falseEasting, FalseNorthing: falseNorthing})
}

func newTransverseMercator(el Ellipsoid, cv Conversion) *TransverseMercator {
	f := el.flattening()
	n := f / (2 - f) // third flattening
	e2 := f * (2 - f)
	tm := &TransverseMercator{
		centralMeridian: cv.LonOrigin * math.Pi / 180,
		scale:           cv.Scale,
		falseEasting:    cv.FalseEasting,
		falseNorthing:   cv.FalseNorthing,
		e:               math.Sqrt(e2),
	}
	n2 := n * n
	n3, n4, n5, n6 := n2*n, n2*n2, n2*n2*n, n2*n2*n2
	// Rectifying radius A = a/(1+n)·(1 + n²/4 + n⁴/64 + n⁶/256)
	// (Karney 2011, eq. 14).
	tm.a1 = cv.Scale * el.SemiMajorAxis / (1 + n) * (1 + n2/4 + n4/64 + n6/256)
	// Forward coefficients α_j (Karney 2011, eq. 35).
	tm.alpha[1] = n/2 - 2*n2/3 + 5*n3/16 + 41*n4/180 - 127*n5/288 + 7891*n6/37800
	tm.alpha[2] = 13*n2/48 - 3*n3/5 + 557*n4/1440 + 281*n5/630 - 1983433*n6/1935360
	tm.alpha[3] = 61*n3/240 - 103*n4/140 + 15061*n5/26880 + 167603*n6/181440
	tm.alpha[4] = 49561*n4/161280 - 179*n5/168 + 6601661*n6/7257600
	tm.alpha[5] = 34729*n5/80640 - 3418889*n6/1995840
	tm.alpha[6] = 212378941 * n6 / 319334400
	// Inverse coefficients β_j (Karney 2011, eq. 36).
	tm.beta[1] = n/2 - 2*n2/3 + 37*n3/96 - n4/360 - 81*n5/512 + 96199*n6/604800
	tm.beta[2] = n2/48 + n3/15 - 437*n4/1440 + 46*n5/105 - 1118711*n6/3870720
	tm.beta[3] = 17*n3/480 - 37*n4/840 - 209*n5/4480 + 5569*n6/90720
	tm.beta[4] = 4397*n4/161280 - 11*n5/504 - 830251*n6/7257600
	tm.beta[5] = 4583*n5/161280 - 108847*n6/3991680
	tm.beta[6] = 20648693 * n6 / 638668800
	if cv.LatOrigin != 0 {
		// Northing of the natural origin before the shift: y(λ0, φ0).
		_, y0 := tm.Forward(cv.LonOrigin, cv.LatOrigin)
		tm.falseNorthing -= y0 - cv.FalseNorthing
	}
	return tm
}

// Forward projects geographic longitude and latitude (degrees) to easting
// and northing (m), including the false easting and northing.
//
// With τ = tan φ, the conformal latitude φ' has
// τ' = τ√(1+σ²) − σ√(1+τ²), σ = sinh(e·atanh(eτ/√(1+τ²))) (Karney 2011,
// eqs. 7–9). The spherical transverse Mercator coordinates are
// ξ' = atan2(τ', cos λ), η' = asinh(sin λ/√(τ'²+cos²λ)) (eq. 10), and the
// series ξ = ξ' + Σ α_j sin 2jξ' cosh 2jη', η = η' + Σ α_j cos 2jξ' sinh 2jη'
// (eq. 11) give x = k0·A·η, y = k0·A·ξ (eq. 13).
func (tm *TransverseMercator) Forward(lonDeg, latDeg float64) (easting, northing float64) {
	lambda := remainderPi(lonDeg*math.Pi/180 - tm.centralMeridian)
	phi := latDeg * math.Pi / 180
	tau := math.Tan(phi)
	taup := conformalTau(tau, tm.e)
	sl, cl := math.Sincos(lambda)
	xip := math.Atan2(taup, cl)
	etap := math.Asinh(sl / math.Hypot(taup, cl))
	z := krugerSeries(complex(xip, etap), &tm.alpha, 1)
	return tm.falseEasting + tm.a1*imag(z), tm.falseNorthing + tm.a1*real(z)
}

// Inverse returns the geographic longitude and latitude (degrees) of
// easting and northing (m). Longitude is in [−180°, 180°].
//
// ξ' = ξ − Σ β_j sin 2jξ cosh 2jη, η' = η − Σ β_j cos 2jξ sinh 2jη
// (Karney 2011, eq. 11 inverted with eq. 36), then
// τ' = sin ξ'/√(sinh²η' + cos²ξ'), λ = atan2(sinh η', cos ξ') (eq. 18), and
// τ is found from τ' by Newton's method (eqs. 19–21).
func (tm *TransverseMercator) Inverse(easting, northing float64) (lonDeg, latDeg float64) {
	xi := (northing - tm.falseNorthing) / tm.a1
	eta := (easting - tm.falseEasting) / tm.a1
	zp := krugerSeries(complex(xi, eta), &tm.beta, -1)
	xip, etap := real(zp), imag(zp)
	sxip, cxip := math.Sincos(xip)
	shetap := math.Sinh(etap)
	taup := sxip / math.Hypot(shetap, cxip)
	lambda := math.Atan2(shetap, cxip)
	tau := tauFromConformal(taup, tm.e)
	lon := remainderPi(lambda+tm.centralMeridian) * 180 / math.Pi
	return lon, math.Atan(tau) * 180 / math.Pi
}

// krugerSeries returns ζ + sign·Σ_{j=1..6} c_j sin(2jζ) for complex
// ζ = ξ + iη. Its real and imaginary parts are the sums
// ξ ± Σ c_j sin 2jξ cosh 2jη and η ± Σ c_j cos 2jξ sinh 2jη of Karney
// (2011, eq. 11), evaluated with Clenshaw's recurrence
// b_j = c_j + 2cos(2ζ)·b_{j+1} − b_{j+2}, Σ = b_1·sin 2ζ (Karney 2011, §5),
// so that one complex sine and cosine replace six of each.
func krugerSeries(z complex128, c *[krugerOrder + 1]float64, sign float64) complex128 {
	s, co := cmplx.Sin(2*z), cmplx.Cos(2*z)
	two := 2 * co
	var b1, b2 complex128
	for j := krugerOrder; j >= 1; j-- {
		b1, b2 = complex(c[j], 0)+two*b1-b2, b1
	}
	return z + complex(sign, 0)*b1*s
}

// conformalTau returns τ' = tan φ' for τ = tan φ on an ellipsoid of
// eccentricity e (Karney 2011, eqs. 7–9). The conformal latitude φ' is
// also the Gudermannian of the isometric latitude ψ: τ' = sinh ψ.
func conformalTau(tau, e float64) float64 {
	tau1 := math.Hypot(1, tau)
	sig := math.Sinh(e * math.Atanh(e*tau/tau1))
	return tau*math.Hypot(1, sig) - sig*tau1
}

// tauFromConformal solves τ'(τ) = taup for τ by Newton's method with
// dτ'/dτ = (1−e²)√(1+τ'²)√(1+τ²)/(1+(1−e²)τ²) (Karney 2011, eqs. 19–21),
// starting from τ = τ'/(1−e²). Two or three steps reach full double
// precision; the loop is capped at 10.
func tauFromConformal(taup, e float64) float64 {
	const tol = 1e-15 // relative step at which τ is converged
	e2m := 1 - e*e
	tau := taup / e2m
	for range 10 {
		tp := conformalTau(tau, e)
		dtau := (taup - tp) / (e2m * math.Hypot(1, tp) * math.Hypot(1, tau) / (1 + e2m*tau*tau))
		tau += dtau
		if math.Abs(dtau) <= tol*math.Max(1, math.Abs(tau)) {
			break
		}
	}
	return tau
}

// remainderPi reduces an angle in radians to [−π, π].
func remainderPi(x float64) float64 {
	return math.Remainder(x, 2*math.Pi)
}
