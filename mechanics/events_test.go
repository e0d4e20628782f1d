package mechanics

import (
	"math"
	"testing"

	"slipfront/internal/numtest"
)

// docs/references.md §8.2 check values: Mw = (2/3)(log10 M0 − 9.1) (IASPEI
// 2013) and the Hanks & Kanamori (1979) form M = (2/3)·log10 M0 − 10.7
// with M0 in dyne·cm, whose N·m constant is 9.05.
func TestMomentMagnitude(t *testing.T) {
	const magTol = 1e-6 // printed with 6 decimals
	for _, tc := range []struct{ m0, mw, mwHK float64 }{
		{2.285714e6, -1.827319, -1.793985},
		{2.285714e9, 0.172681, 0.206015},
		{6.857143e12, 2.490762, 2.524095},
		{2.285714e16, 4.839348, 4.872681},
	} {
		numtest.Abs(t, "Mw", MomentMagnitude(tc.m0), tc.mw, magTol)
		// Hanks & Kanamori (1979) in their own units: 1 N·m = 1e7 dyne·cm.
		hk := 2.0/3*math.Log10(tc.m0*1e7) - 10.7
		numtest.Abs(t, "Mw (HK79)", hk, tc.mwHK, magTol)
		// The two differ by (2/3)·0.05 = 0.0333.
		numtest.Abs(t, "HK79 − IASPEI", hk-MomentMagnitude(tc.m0), 0.05*2/3, 1e-12)
	}
	// Inverse: Mw = −1 … 3 (docs/references.md §8.2, 6 significant digits).
	const printed6 = 1e-5
	for i, want := range []float64{3.98107e7, 1.25893e9, 3.98107e10, 1.25893e12, 3.98107e13} {
		mw := float64(i - 1)
		numtest.Rel(t, "M0", MomentFromMagnitude(mw), want, printed6)
		numtest.Abs(t, "round trip", MomentMagnitude(MomentFromMagnitude(mw)), mw, 1e-12)
	}
	if !math.IsInf(MomentMagnitude(0), -1) {
		t.Error("Mw(0) is not −Inf")
	}
}

// M0 = G·A·D (Aki 1966): docs/references.md §8.2, G = 30 GPa, a circle of
// radius 10 m slipping 2.425218e−4 m has M0 = 2.285714e9 N·m.
func TestMoment(t *testing.T) {
	numtest.Rel(t, "M0", Moment(30e9, math.Pi*100, 2.425218e-4), 2.285714e9, 1e-6)
	numtest.Rel(t, "M0 linear", Moment(2, 3, 5), 30, 0)
}
