// Package numtest holds the numeric assertions shared by slipfront's tests.
//
// Every comparison is within a named tolerance (gonum's
// scalar.EqualWithinAbsOrRel); exact float equality is never used for
// computed values.
package numtest

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// Close fails the test when got and want differ by more than absTol and
// by more than relTol relative to the larger magnitude.
func Close(t testing.TB, what string, got, want, absTol, relTol float64) {
	t.Helper()
	if math.IsNaN(got) || !scalar.EqualWithinAbsOrRel(got, want, absTol, relTol) {
		t.Errorf("%s = %.15g, want %.15g (abs tol %g, rel tol %g)", what, got, want, absTol, relTol)
	}
}

// Rel fails the test when got and want differ by more than relTol
// relative to the larger magnitude.
func Rel(t testing.TB, what string, got, want, relTol float64) {
	t.Helper()
	Close(t, what, got, want, 0, relTol)
}

// Abs fails the test when got and want differ by more than absTol.
func Abs(t testing.TB, what string, got, want, absTol float64) {
	t.Helper()
	Close(t, what, got, want, absTol, 0)
}
