package mechanics

import "math"

// MagnitudeOffset is the constant c of Mw = (2/3)(log10 M0 − c) with M0 in
// N·m. slipfront uses the IASPEI (2013) standard value 9.1. Hanks &
// Kanamori (1979) wrote M = (2/3)·log10 M0 − 10.7 with M0 in dyne·cm;
// converted to N·m (1 N·m = 10⁷ dyne·cm) that is c = 9.05, which gives
// magnitudes larger by 0.0333 (docs/references.md §8.2).
const MagnitudeOffset = 9.1

// Moment returns the seismic moment M0 = G·A·D, N·m, of slip D, m, on an
// area A, m², in rock of shear modulus G, Pa (Aki 1966).
func Moment(shearModulus, area, slip float64) float64 {
	return shearModulus * area * slip
}

// MomentMagnitude returns Mw = (2/3)(log10 M0 − 9.1) for the seismic
// moment M0, N·m (IASPEI 2013, the standard form of Hanks & Kanamori 1979).
// It is −Inf for M0 = 0.
func MomentMagnitude(m0 float64) float64 {
	return 2.0 / 3.0 * (math.Log10(m0) - MagnitudeOffset)
}

// MomentFromMagnitude returns the seismic moment M0 = 10^(1.5·Mw + 9.1),
// N·m, the inverse of MomentMagnitude.
func MomentFromMagnitude(mw float64) float64 {
	return math.Pow(10, 1.5*mw+MagnitudeOffset)
}
