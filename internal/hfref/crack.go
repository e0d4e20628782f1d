package hfref

import "math/cmplx"

// CrackStress returns the stress change, per unit pressure, at (x, y)
// around a 2-D crack of half-length c on the x axis (|x| < c, y = 0)
// opened by a uniform internal pressure, in plane strain: σxx, σyy, σxy
// divided by the pressure, compression-positive as the pressure is. It is
// Westergaard's (1939) mode-I solution with Z = z/√(z² − c²) − 1 (the
// Sneddon 1946 crack; from memory, checked in elastic's tests against the
// closed forms on the axis x = 0):
//
//	σxx = −(Re Z − y·Im Z′),  σyy = −(Re Z + y·Im Z′),  σxy = y·Re Z′
//
// with √(z² − c²) = √(z − c)·√(z + c), cut along the crack. On the crack
// itself σyy = 1 (the pressure's own traction); near its tips the stress
// is singular.
func CrackStress(x, y, c float64) (sxx, syy, sxy float64) {
	z := complex(x, y)
	cc := complex(c, 0)
	root := cmplx.Sqrt(z-cc) * cmplx.Sqrt(z+cc)
	zz := z/root - 1
	dz := -cc * cc / (root * root * root)
	return -(real(zz) - y*imag(dz)), -(real(zz) + y*imag(dz)), y * real(dz)
}
