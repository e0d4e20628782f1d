package hfref

import (
	"fmt"
	"math"
)

// Solution is the state of a fracture at one time.
type Solution struct {
	// HalfLength ℓ of the fracture (each wing), m.
	HalfLength float64
	// InletWidth w(0, t), the opening at the injection point, m.
	InletWidth float64
	// NetPressure at the injection point, Pa.
	NetPressure float64
}

// KGD is a plane-strain hydraulic fracture driven by a Newtonian fluid
// injected at a constant rate into an impermeable elastic rock.
type KGD struct {
	// PlaneModulus E′ = E/(1 − ν²), Pa.
	PlaneModulus float64
	// Viscosity μ of the fluid, Pa·s.
	Viscosity float64
	// Toughness K_Ic of the rock, Pa·√m.
	Toughness float64
	// Rate Q injected into both wings, per unit height, m²/s.
	Rate float64
}

// Regime is the propagation regime of a KGD fracture.
type Regime int

const (
	// ViscosityDominated: 𝒦 ≤ 1, the M-vertex solution applies.
	ViscosityDominated Regime = iota
	// Transition: 1 < 𝒦 < 4, neither limit holds.
	Transition
	// ToughnessDominated: 𝒦 ≥ 4, the K-vertex solution applies.
	ToughnessDominated
)

func (r Regime) String() string {
	switch r {
	case ViscosityDominated:
		return "viscosity-dominated"
	case Transition:
		return "transition"
	case ToughnessDominated:
		return "toughness-dominated"
	}
	return fmt.Sprintf("Regime(%d)", int(r))
}

// Regime bounds on 𝒦 (Detournay 2004, from memory).
const (
	ViscosityBound = 1.0
	ToughnessBound = 4.0
)

// DimensionlessToughness returns 𝒦 = K′·(E′³ μ′ Q)^(−1/4) (Detournay 2004),
// with K′ = 4√(2/π)·K_Ic and μ′ = 12μ. For a KGD fracture at constant rate
// it does not change with time: the one number that places the fracture
// between the viscosity-dominated (𝒦 → 0) and the toughness-dominated
// (𝒦 → ∞) limit.
func (k KGD) DimensionlessToughness() float64 {
	kp := 4 * math.Sqrt(2/math.Pi) * k.Toughness
	return kp * math.Pow(k.PlaneModulus*k.PlaneModulus*k.PlaneModulus*12*k.Viscosity*k.Rate, -0.25)
}

// Regime returns the regime that 𝒦 places the fracture in.
func (k KGD) Regime() Regime {
	switch kk := k.DimensionlessToughness(); {
	case kk <= ViscosityBound:
		return ViscosityDominated
	case kk >= ToughnessBound:
		return ToughnessDominated
	}
	return Transition
}

// GammaK0 is the K-vertex length prefactor 2/π^(2/3) = 0.9324 of
// ℓ = γ_k0 (E′Qt/K′)^(2/3) (derived in ToughnessDominated; Garagash 2006
// prints 0.9324, from memory).
var GammaK0 = 2 / math.Pow(math.Pi, 2.0/3)

// ToughnessDominated returns the K-vertex solution at time t (s): the
// fluid is inviscid, the net pressure p uniform, and the fracture an
// elliptical crack (Sneddon 1946) w(x) = (4p/E′)√(ℓ² − x²) whose volume
// 2πpℓ²/E′ is the injected Qt and whose tip is at the toughness,
// K_I = p√(πℓ) = K_Ic. Eliminating p,
//
//	ℓ = (E′Qt / (2√π K_Ic))^(2/3) = γ_k0 (E′Qt/K′)^(2/3),
//	p = K_Ic/√(πℓ),  w(0) = 4pℓ/E′.
//
// Exact for a zero-viscosity fluid; within a few percent for 𝒦 ≥ 4.
func (k KGD) ToughnessDominated(t float64) Solution {
	l := math.Pow(k.PlaneModulus*k.Rate*t/(2*math.Sqrt(math.Pi)*k.Toughness), 2.0/3)
	p := k.Toughness / math.Sqrt(math.Pi*l)
	return Solution{HalfLength: l, InletWidth: 4 * p * l / k.PlaneModulus, NetPressure: p}
}

// M-vertex prefactors of Adachi & Detournay (2002), as quoted from them in
// secondary sources (not seen in the paper): ℓ = γ_m0 (E′Q³t⁴/μ′)^(1/6),
// w(0)² = cw·(μ′Q/E′)^(1/2)·ℓ and w(0)·p(0) = cp·(μ′QE′)^(1/2).
const (
	GammaM0 = 0.6152
	cw      = 2.1
	cp      = 0.62
)

// ViscosityDominated returns the M-vertex solution at time t (s): zero
// toughness, the energy spent in viscous flow (Spence & Sharp 1985;
// Adachi & Detournay 2002), with μ′ = 12μ:
//
//	ℓ = 0.6152 (E′Q³t⁴/μ′)^(1/6)
//	w(0) = √(2.1 (μ′Q/E′)^(1/2) ℓ) = 1.137 (μ′/E′)^(1/6) Q^(1/2) t^(1/3)
//	p(0) = 0.62 (μ′QE′)^(1/2) / w(0) = 0.546 (μ′E′²/t)^(1/3)
//
// (prefactors as quoted from Adachi & Detournay 2002; see the package
// documentation). Valid for 𝒦 ≤ 1.
func (k KGD) ViscosityDominated(t float64) Solution {
	ep, mup, q := k.PlaneModulus, 12*k.Viscosity, k.Rate
	l := GammaM0 * math.Pow(ep*q*q*q*t*t*t*t/mup, 1.0/6)
	w := math.Sqrt(cw * math.Sqrt(mup*q/ep) * l)
	return Solution{HalfLength: l, InletWidth: w, NetPressure: cp * math.Sqrt(mup*q*ep) / w}
}
