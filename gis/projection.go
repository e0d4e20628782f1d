package gis

import (
	"fmt"
	"math"
)

// Projection converts between geographic longitude and latitude on the
// projection's ellipsoid (degrees) and grid easting and northing in
// metres. The conversion to the CRS's own unit is the CRS's business
// (see Placement).
type Projection interface {
	// Forward returns the easting and northing (m), false origin
	// included, of longitude and latitude (degrees).
	Forward(lonDeg, latDeg float64) (easting, northing float64)
	// Inverse returns the longitude in [−180°, 180°] and the latitude
	// (degrees) of easting and northing (m).
	Inverse(easting, northing float64) (lonDeg, latDeg float64)
}

// Method is a map projection method, numbered by its EPSG code.
type Method int

// The projection methods this package implements (EPSG dataset codes;
// formulas in IOGP (2019), Geomatics Guidance Note 7-2, §3.1.1 and
// §3.5.3).
const (
	MethodLambertConic1SP    Method = 9801 // Lambert Conic Conformal (1SP)
	MethodLambertConic2SP    Method = 9802 // Lambert Conic Conformal (2SP)
	MethodTransverseMercator Method = 9807 // Transverse Mercator
)

// String returns the method's EPSG name.
func (m Method) String() string {
	switch m {
	case MethodLambertConic1SP:
		return "Lambert Conic Conformal (1SP)"
	case MethodLambertConic2SP:
		return "Lambert Conic Conformal (2SP)"
	case MethodTransverseMercator:
		return "Transverse Mercator"
	}
	return fmt.Sprintf("method %d", int(m))
}

// Conversion is a map projection method with its parameters, named as in
// IOGP Guidance Note 7-2.
type Conversion struct {
	Method Method
	// LatOrigin is the latitude of the natural origin (transverse
	// Mercator, LCC 1SP) or of the false origin (LCC 2SP), degrees.
	LatOrigin float64
	// LonOrigin is the longitude of the natural or false origin (the
	// central meridian), degrees east of Greenwich.
	LonOrigin float64
	// Scale is the scale factor at the natural origin (transverse
	// Mercator, LCC 1SP); unused by LCC 2SP.
	Scale float64
	// StdParallel1 and StdParallel2 are the standard parallels of LCC
	// 2SP, degrees.
	StdParallel1, StdParallel2 float64
	// FalseEasting and FalseNorthing are the grid coordinates of the
	// natural origin (easting and northing at the false origin for LCC
	// 2SP), m.
	FalseEasting, FalseNorthing float64
}

// NewProjection returns the projection cv on ellipsoid el. It fails for
// an unknown method and for parameters the formulas cannot take
// (latitudes beyond ±90°, a non-positive scale, LCC standard parallels
// symmetric about the equator).
func NewProjection(el Ellipsoid, cv Conversion) (Projection, error) {
	if err := el.validate(); err != nil {
		return nil, err
	}
	finite := func(vs ...float64) bool {
		for _, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return false
			}
		}
		return true
	}
	if !finite(cv.LatOrigin, cv.LonOrigin, cv.Scale, cv.StdParallel1, cv.StdParallel2, cv.FalseEasting, cv.FalseNorthing) {
		return nil, fmt.Errorf("gis: %v: parameters must be finite: %+v", cv.Method, cv)
	}
	lat := func(name string, v float64) error {
		if math.Abs(v) > 90 {
			return fmt.Errorf("gis: %v: %s %g° is beyond ±90°", cv.Method, name, v)
		}
		return nil
	}
	if err := lat("latitude of origin", cv.LatOrigin); err != nil {
		return nil, err
	}
	switch cv.Method {
	case MethodTransverseMercator, MethodLambertConic1SP:
		if !(cv.Scale > 0) {
			return nil, fmt.Errorf("gis: %v: scale factor %g must be > 0", cv.Method, cv.Scale)
		}
		if cv.Method == MethodTransverseMercator {
			return newTransverseMercator(el, cv), nil
		}
		if math.Abs(cv.LatOrigin) < minConeLatitude || math.Abs(cv.LatOrigin) > 90-minConeLatitude {
			return nil, fmt.Errorf("gis: %v: latitude of natural origin %g° must be off the equator and the poles", cv.Method, cv.LatOrigin)
		}
		return newLambertConic(el, cv), nil
	case MethodLambertConic2SP:
		for _, p := range []struct {
			name string
			v    float64
		}{{"first standard parallel", cv.StdParallel1}, {"second standard parallel", cv.StdParallel2}} {
			if err := lat(p.name, p.v); err != nil {
				return nil, err
			}
		}
		if math.Abs(cv.StdParallel1+cv.StdParallel2) < minConeLatitude || math.Abs(cv.StdParallel1) > 90-minConeLatitude || math.Abs(cv.StdParallel2) > 90-minConeLatitude {
			return nil, fmt.Errorf("gis: %v: standard parallels %g° and %g° give no cone (symmetric about the equator or at a pole)", cv.Method, cv.StdParallel1, cv.StdParallel2)
		}
		return newLambertConic(el, cv), nil
	}
	return nil, fmt.Errorf("gis: projection %v is not implemented; implemented: %v, %v, %v", cv.Method,
		MethodTransverseMercator, MethodLambertConic1SP, MethodLambertConic2SP)
}

// minConeLatitude, degrees: a Lambert cone needs n = sin φ (or the 2SP
// equivalent) away from 0 and from ±1; 1e-6° keeps both the cone constant
// and its inverse far from overflow. Common practice, no source.
const minConeLatitude = 1e-6
