package mechanics

import "math"

// TipElementCorrection is the factor √(2/π) ≈ 0.798 by which the stress
// intensity read from the opening of a constant displacement-discontinuity
// tip element must be multiplied.
//
// A crack's opening near its tip follows the plane-strain asymptote
//
//	Δu(r) = (4(1−ν)/G)·K·√(r/(2π))
//
// (Irwin 1957; the Williams 1957 field), so K = (G/(4(1−ν)))·√(2π/r)·Δu.
// Read at the centre of a constant tip element of half-length a (r = a)
// the element's uniform discontinuity is not the asymptote's value there:
// the element carries the opening of the whole tip segment, and on a
// Sneddon (1946) crack it overestimates the exact opening at its centre by
// a ratio of 1.2699, 1.2614, 1.2573, 1.2553 for 10, 20, 40, 80 elements
// (Crouch & Starfield 1983, ch. 5, constant elements; docs/references.md
// §9.2). The ratio converges at first order; Richardson extrapolation
// of the 80- and 160-element values gives 1.253307, and we take its limit to be √(π/2) = 1.253314 (a numerical
// finding, not a proof). Dividing by it gives
//
//	K = √(2/π)·(G/(4(1−ν)))·√(2π/a)·Δu_tip = G·Δu_tip / (2(1−ν)·√a),
//
// which is within 0.2% of p√(πc) on a Sneddon crack of 80 elements and
// converges at first order in a/c (TestTipIntensitySneddon).
var TipElementCorrection = math.Sqrt(2 / math.Pi)

// TipIntensity returns the stress intensity factor K (Pa·√m) at the tip
// of a 2-D crack in plane strain from the displacement discontinuity
// jump (m) of its constant tip element of half-length a (m), in a rock of
// shear modulus g (Pa) and Poisson's ratio nu:
//
//	K = √(2/π)·(G/(4(1−ν)))·√(2π/a)·jump = G·jump / (2(1−ν)·√a)
//
// (see [TipElementCorrection] for the derivation and the correction). The
// same formula gives K_I from the opening and K_II from the slip, in the
// tip frame: x points out of the crack through the tip, y to its left,
// and the jump is the displacement of the +y face minus that of the −y
// face (opening: along y, positive when open; slip: along x, positive
// when the +y face moves towards the tip's front), the sign convention of
// the Williams (1957) field.
func TipIntensity(jump, a, g, nu float64) float64 {
	if !(a > 0) {
		panic("mechanics: tip element half-length must be > 0")
	}
	return g * jump / (2 * (1 - nu) * math.Sqrt(a))
}

// KinkAngle returns the direction θ (radians, in (−π/2, π/2), positive
// towards the tip frame's +y) in which a crack tip with stress intensity
// factors kI and kII (Pa·√m) grows by the maximum circumferential stress
// criterion of Erdogan & Sih (1963): θ is the root of
//
//	K_I sin θ + K_II (3 cos θ − 1) = 0
//
// at which σ_θθ is largest. With t = tan(θ/2) the condition is the
// quadratic 2K_II t² − K_I t − K_II = 0, whose root of the maximum,
// t = (K_I − √(K_I² + 8K_II²))/(4K_II), is evaluated in the cancellation-
// free form t = −2K_II/(K_I + √(K_I² + 8K_II²)). Pure mode I gives θ = 0,
// pure mode II θ = ∓2·atan(1/√2) = ∓70.53° for K_II ≷ 0. The criterion
// assumes an open tip; for K_I < 0 with K_II = 0 it returns 0.
func KinkAngle(kI, kII float64) float64 {
	den := kI + math.Hypot(kI, math.Sqrt(8)*kII)
	if den == 0 {
		return 0
	}
	return 2 * math.Atan(-2*kII/den)
}

// EquivalentIntensity returns the mode-I-equivalent stress intensity
// K_eq = cos(θ/2)·[K_I cos²(θ/2) − (3/2)K_II sin θ], Pa·√m: the
// circumferential stress σ_θθ·√(2πr) in the direction θ of [KinkAngle]
// (Erdogan & Sih 1963). A tip grows when K_eq ≥ K_Ic. For pure mode II
// K_eq = (2/√3)·|K_II|, so a crack in shear grows at |K_II| = (√3/2)·K_Ic.
func EquivalentIntensity(kI, kII float64) float64 {
	th := KinkAngle(kI, kII)
	c := math.Cos(th / 2)
	return c * (kI*c*c - 1.5*kII*math.Sin(th))
}
