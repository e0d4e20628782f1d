package mechanics

import (
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/orient"
)

// PlaneStress is the stress resolved on one plane.
type PlaneStress struct {
	// Normal is the unit normal, turned up (n_z ≥ 0) so that it points
	// into the hanging wall.
	Normal r3.Vec
	// SigmaN is the total normal stress σn = n·S·n, Pa, compression-positive.
	SigmaN float64
	// Tau is the magnitude of the shear stress τ = |S·n − σn·n|, Pa.
	Tau float64
	// Slip is the unit direction in which the hanging wall would slip
	// relative to the footwall, ŝ = −(S·n − σn·n)/τ; zero when τ is zero.
	Slip r3.Vec
	// Dip and DipDirection of the plane, radians.
	Dip, DipDirection float64
	// Rake of Slip in the plane (Aki & Richards), radians in (−π, π]:
	// −π/2 normal, +π/2 reverse, 0 left-lateral, ±π right-lateral; zero
	// when τ is zero.
	Rake float64
}

// tauZero is the shear stress, relative to the largest principal stress
// magnitude, below which the shear direction is round-off and the plane is
// reported as free of shear (common practice, no source).
const tauZero = 1e-13

// Resolve returns the stress resolved on the plane with normal n (any
// length but zero, either sense):
//
//	t = S·n,  σn = n·t,  τ = |t − σn·n|,  ŝ = −(t − σn·n)/τ
//	rake = atan2(−ŝ·d, ŝ·s)
//
// with s and d the strike and down-dip vectors of the plane
// (docs/references.md §7.2; Jaeger, Cook & Zimmerman 2007, ch. 2). It does not
// allocate.
func (s Stress) Resolve(n r3.Vec) PlaneStress {
	n = r3.Unit(n)
	if n.Z < 0 {
		n = r3.Scale(-1, n)
	}
	t := s.Traction(n)
	sn := r3.Dot(n, t)
	shear := r3.Sub(t, r3.Scale(sn, n))
	// The subtraction leaves a normal component of the rounding of t
	// (~10⁻¹⁶·S1), which is not small against a small τ (a fuzz input:
	// τ = 5 Pa under S1 = 60 MPa left ŝ·n = 3·10⁻⁹): project it out.
	shear = r3.Sub(shear, r3.Scale(r3.Dot(shear, n), n))
	tau := r3.Norm(shear)
	dip, dipDir := orient.DipAndDirection(n)
	ps := PlaneStress{Normal: n, SigmaN: sn, Tau: tau, Dip: dip, DipDirection: dipDir}
	if tau <= tauZero*math.Max(math.Abs(s.principal[0].Value), math.Abs(s.principal[2].Value)) {
		return ps
	}
	ps.Slip = r3.Scale(-1/tau, shear)
	strike := orient.Strike(dipDir)
	down := orient.DownDip(dip, dipDir)
	ps.Rake = math.Atan2(-r3.Dot(ps.Slip, down), r3.Dot(ps.Slip, strike))
	return ps
}

// DilationTendency returns (S1 − σn)/(S1 − S3) for a plane with total
// normal stress sigmaN, Pa (Ferrill et al. 1999): 1 for the plane normal
// to S3, 0 for the plane normal to S1. In an isotropic state, where every
// plane has σn = S1 = S3, it returns 0. A resolved σn lies in [S3, S1]
// but for rounding, which the ratio would magnify where S1 − S3 is as
// small as that rounding (a fuzz input: S1 − S3 = 7·10⁻⁹ Pa gave 2), so the
// result is held to [0, 1].
func (s Stress) DilationTendency(sigmaN float64) float64 {
	s1, s3 := s.principal[0].Value, s.principal[2].Value
	if s1 == s3 {
		return 0
	}
	return math.Min(1, math.Max(0, (s1-sigmaN)/(s1-s3)))
}

// SlipTendency returns the effective slip tendency τ/(σn − p), with σn and
// τ the total normal and shear stress and p the pore pressure, Pa. Morris,
// Ferrill & Henderson (1996) defined slip tendency with the total normal
// stress, τ/σn (see [TotalSlipTendency]); with pore pressure the effective
// form is the one to compare with the friction coefficient (docs/references.md
// §7.2, common practice). It is +Inf when σn ≤ p (an open fracture).
func SlipTendency(sigmaN, tau, p float64) float64 {
	eff := sigmaN - p
	if eff <= 0 {
		return math.Inf(1)
	}
	return tau / eff
}

// TotalSlipTendency returns the slip tendency in the total-stress form of
// Morris, Ferrill & Henderson (1996), τ/σn; +Inf when σn ≤ 0.
func TotalSlipTendency(sigmaN, tau float64) float64 {
	return SlipTendency(sigmaN, tau, 0)
}

// Coulomb is the Mohr–Coulomb slip criterion of a fracture: it slips when
// τ ≥ c + μs·(σn − p) (Jaeger, Cook & Zimmerman 2007, ch. 4; docs/references.md
// §7.2).
type Coulomb struct {
	Friction float64 // static friction coefficient μs
	Cohesion float64 // cohesion c, Pa
}

// Validate returns an error unless μs > 0 and c ≥ 0.
func (c Coulomb) Validate() error {
	return firstError(
		positive("friction_static", c.Friction),
		nonNegative("cohesion", c.Cohesion),
	)
}

// Slips reports whether a plane with total normal stress sigmaN and shear
// stress tau, Pa, slips at pore pressure p, Pa: τ ≥ c + μs·(σn − p).
func (c Coulomb) Slips(sigmaN, tau, p float64) bool {
	return tau >= c.Cohesion+c.Friction*(sigmaN-p)
}

// FailureFunction returns the Coulomb failure function, Pa,
// CFF = τ − μs·(σn − p) − c; it is ≥ 0 where the plane slips.
func (c Coulomb) FailureFunction(sigmaN, tau, p float64) float64 {
	return tau - c.Friction*(sigmaN-p) - c.Cohesion
}

// CriticalPressure returns the pore pressure, Pa, at which the plane
// slips, p_c = σn − (τ − c)/μs.
func (c Coulomb) CriticalPressure(sigmaN, tau float64) float64 {
	return sigmaN - (tau-c.Cohesion)/c.Friction
}

// CriticalIncrease returns the pore-pressure increase above p, Pa, that
// brings the plane to slip, Δp_c = σn − p − (τ − c)/μs; Δp_c ≤ 0 means the
// plane is already critical at p.
func (c Coulomb) CriticalIncrease(sigmaN, tau, p float64) float64 {
	return c.CriticalPressure(sigmaN, tau) - p
}

// OptimalCriticalIncrease returns the least pore-pressure increase above
// the pore pressure of s, Pa, that brings a plane of any orientation to
// slip: that of the planes containing σ2 whose normal makes ½·atan(1/μs)
// with σ1, where the Mohr circle of S1 and S3 first touches the Coulomb
// line,
//
//	Δp_c,min = σm′ + c/μs − τm·√(1 + μs²)/μs,
//	σm′ = (S1 + S3)/2 − p,  τm = (S1 − S3)/2
//
// (the tangency of the circle and the line; Jaeger, Cook & Zimmerman 2007,
// §4.6, from memory). It is ≤ 0 where such a plane is critical already.
func (c Coulomb) OptimalCriticalIncrease(s Stress) float64 {
	pr := s.Principal()
	s1, s3 := pr[0].Value, pr[2].Value
	mean, radius := 0.5*(s1+s3)-s.PorePressure(), 0.5*(s1-s3)
	return mean + c.Cohesion/c.Friction - radius*math.Hypot(1, c.Friction)/c.Friction
}
