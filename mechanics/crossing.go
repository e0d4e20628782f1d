package mechanics

import (
	"fmt"
	"math"
)

// Crossing is what a growing hydraulic fracture does where its tip meets
// a natural fracture.
type Crossing int

const (
	// Cross: the tip re-initiates on the far side of the natural fracture
	// and the hydraulic fracture goes on in its own plane.
	Cross Crossing = iota
	// Arrest: the natural fracture slips and blunts the tip, and the fluid
	// pressure is too low to open it; the tip stops there.
	Arrest
	// Divert: the natural fracture slips and the fluid pressure exceeds
	// the stress normal to it, so the fluid opens it and the hydraulic
	// fracture continues along the natural fracture.
	Divert
)

func (c Crossing) String() string {
	switch c {
	case Cross:
		return "cross"
	case Arrest:
		return "arrest"
	case Divert:
		return "divert"
	}
	return fmt.Sprintf("Crossing(%d)", int(c))
}

// Approach is a hydraulic fracture's tip arriving at a natural fracture.
// The hydraulic fracture is taken to grow in mode I along the principal
// direction of ParallelStress (SHmax in map view), opening against
// NormalStress (Shmin).
type Approach struct {
	// Angle β between the hydraulic fracture and the natural fracture,
	// radians in (0, π/2]; π/2 is the orthogonal approach.
	Angle float64
	// ParallelStress and NormalStress are the total remote stresses along
	// and across the hydraulic fracture, Pa, compression-positive.
	ParallelStress, NormalStress float64
	// PorePressure p0 of the rock and of the natural fracture, Pa: the
	// criterion works with effective stresses S − p0.
	PorePressure float64
	// FluidPressure is the pressure of the hydraulic fracture's fluid at
	// the intersection, Pa; it decides between Arrest and Divert.
	FluidPressure float64
	// TensileStrength T0 of the rock, Pa.
	TensileStrength float64
	// Friction μ and Cohesion S0 (Pa) of the natural fracture.
	Friction, Cohesion float64
}

// Validate returns an error unless 0 < β ≤ π/2, the stresses and
// pressures are finite, T0 ≥ 0, μ > 0 and S0 ≥ 0.
func (a Approach) Validate() error {
	if !(a.Angle > 0 && a.Angle <= math.Pi/2) {
		return &InputError{Name: "approach angle", Value: a.Angle, Want: "must be in (0, π/2] radians"}
	}
	return firstError(
		finite("parallel stress", a.ParallelStress),
		finite("normal stress", a.NormalStress),
		finite("pore pressure", a.PorePressure),
		finite("fluid pressure", a.FluidPressure),
		nonNegative("tensile strength", a.TensileStrength),
		positive("friction", a.Friction),
		nonNegative("cohesion", a.Cohesion),
	)
}

// Decide returns what the hydraulic fracture does at the natural
// fracture: Cross when [Approach.Crosses]; otherwise Divert when the
// fluid pressure reaches [Approach.OpeningPressure], and Arrest when it
// does not.
func (a Approach) Decide() (Crossing, error) {
	if err := a.Validate(); err != nil {
		return Arrest, err
	}
	if a.Crosses() {
		return Cross, nil
	}
	if a.FluidPressure >= a.OpeningPressure() {
		return Divert, nil
	}
	return Arrest, nil
}

// OpeningPressure is the total normal stress on the natural fracture,
// σn = S∥ sin²β + S⊥ cos²β, Pa: the pressure that holds it open (common
// practice, no source).
func (a Approach) OpeningPressure() float64 {
	s, c := math.Sincos(a.Angle)
	return a.ParallelStress*s*s + a.NormalStress*c*c
}

// Crosses reports whether the tip re-initiates across the natural
// fracture before the natural fracture slips, the mechanism of Renshaw &
// Pollard (1995), extended to non-orthogonal approach as Gu et al. (2012)
// do.
//
// In the tip frame (x along the hydraulic fracture, tension-positive σ)
// the stress is the effective remote stress plus the mode-I near-tip
// field of Irwin (1957), k = K_I/√(2πr):
//
//	σxx = σxx⁰ + k cos(θ/2)[1 − sin(θ/2) sin(3θ/2)]
//	σyy = σyy⁰ + k cos(θ/2)[1 + sin(θ/2) sin(3θ/2)]
//	σxy =        k sin(θ/2) cos(θ/2) cos(3θ/2)
//
// evaluated on the natural fracture, the line through the tip at θ = β
// and θ = β − π. A crack starts across the interface where the stress
// along it, σtt, first reaches T0, at k* = min over both sides of
// (T0 − σtt⁰)/F_tt(θ). The hydraulic fracture crosses if at k* neither
// side slips: |τ| < S0 − μσn on both (σn, τ the traction on the
// interface); as |τ| − S0 + μσn is convex in k and the interface is
// stable at k = 0, it then did not slip at any smaller k either. A
// natural fracture that slips under the remote stresses alone is never
// crossed.
//
// At β = π/2 the field on the interface is F_tt = 3√2/4 = 1.06,
// F_nn = |F_nt| = √2/4 = 0.35, and the condition (S0 = 0) is exactly
// Renshaw & Pollard's criterion
//
//	−σxx⁰/(T0 − σyy⁰) > (0.35 + 0.35/μ)/1.06 = (1 + 1/μ)/3
//
// ([OrthogonalCrossingRatio]). For β < π/2 this is our formulation of the
// extension, which reduces to it at π/2; the text of Gu et al. (2012) was
// not seen, so its outcome curves are not reproduced number by number.
func (a Approach) Crosses() bool {
	sxx := -(a.ParallelStress - a.PorePressure) // tension-positive effective
	syy := -(a.NormalStress - a.PorePressure)
	sb, cb := math.Sincos(a.Angle)
	t := [2]float64{cb, sb}  // along the interface
	n := [2]float64{-sb, cb} // its normal
	traction := func(xx, yy, xy float64) (tt, nn, nt float64) {
		tt = t[0]*t[0]*xx + 2*t[0]*t[1]*xy + t[1]*t[1]*yy
		nn = n[0]*n[0]*xx + 2*n[0]*n[1]*xy + n[1]*n[1]*yy
		nt = t[0]*n[0]*xx + (t[0]*n[1]+t[1]*n[0])*xy + t[1]*n[1]*yy
		return tt, nn, nt
	}
	tt0, nn0, nt0 := traction(sxx, syy, 0)
	if math.Abs(nt0)-a.Cohesion+a.Friction*nn0 >= 0 {
		return false // the natural fracture slips already
	}
	var ftt, fnn, fnt [2]float64
	kStar := math.Inf(1)
	for i, th := range [2]float64{a.Angle, a.Angle - math.Pi} {
		fxx, fyy, fxy := nearTipModeI(th)
		ftt[i], fnn[i], fnt[i] = traction(fxx, fyy, fxy)
		if ftt[i] > 0 {
			kStar = math.Min(kStar, (a.TensileStrength-tt0)/ftt[i])
		}
	}
	if math.IsInf(kStar, 1) {
		return false
	}
	kStar = math.Max(kStar, 0) // σtt⁰ ≥ T0: the rock fails at once
	for i := range 2 {
		if math.Abs(nt0+kStar*fnt[i])-a.Cohesion+a.Friction*(nn0+kStar*fnn[i]) >= 0 {
			return false
		}
	}
	return true
}

// nearTipModeI returns the angular functions of the mode-I near-tip
// stress field (Irwin 1957; Williams 1957) at polar angle θ from the crack
// plane ahead of the tip: σij = K_I/√(2πr)·f_ij(θ).
func nearTipModeI(th float64) (fxx, fyy, fxy float64) {
	s, c := math.Sincos(th / 2)
	s3, c3 := math.Sincos(1.5 * th)
	return c * (1 - s*s3), c * (1 + s*s3), s * c * c3
}

// OrthogonalCrossingRatio returns the critical ratio of Renshaw & Pollard
// (1995) for a frictional interface (no cohesion) met at a right angle:
// the hydraulic fracture crosses when the effective compression across
// the interface, −σxx⁰ = S∥ − p0, exceeds this ratio times T0 − σyy⁰ =
// T0 + S⊥ − p0. Renshaw & Pollard print it as (0.35 + 0.35/μ)/1.06; the
// constants are √2/4 and 3√2/4 of the near-tip field at θ = ±90° (see
// [Approach.Crosses]), so the exact value is (1 + 1/μ)/3.
func OrthogonalCrossingRatio(mu float64) float64 {
	return (1 + 1/mu) / 3
}
