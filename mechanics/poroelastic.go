package mechanics

import (
	"fmt"
	"math"
)

// Poroelastic holds the poroelastic constants of a depleting layer.
type Poroelastic struct {
	// Biot is Biot's effective-stress coefficient α, 0 < α ≤ 1.
	Biot float64
	// Poisson is the drained Poisson's ratio ν, 0 < ν < 0.5.
	Poisson float64
}

// Validate returns an error unless 0 < α ≤ 1 and 0 < ν < 0.5.
func (p Poroelastic) Validate() error {
	if !(p.Biot > 0 && p.Biot <= 1) {
		return &InputError{Name: "biot_coefficient", Value: p.Biot, Want: "must be in (0, 1]"}
	}
	return poisson("poisson_ratio", p.Poisson)
}

// StressPath returns the stress-path coefficient of uniaxial strain,
//
//	A = ΔSh/ΔP = α(1 − 2ν)/(1 − ν),
//
// the change of the horizontal stress per unit change of pore pressure in
// a laterally extensive layer that cannot strain sideways under a constant
// overburden (Engelder & Fischer 1994; Zoback 2007, ch. 12;
// docs/references.md §13). It is also the strength of the depletion source
// of [Layer]: deep inside a wide depleted region the change tends to A·ΔP.
func (p Poroelastic) StressPath() float64 {
	return p.Biot * (1 - 2*p.Poisson) / (1 - p.Poisson)
}

// Uniaxial returns the stress change of a uniform pore-pressure change dp,
// Pa (negative for depletion), in a laterally infinite layer under uniaxial
// strain: ΔSxx = ΔSyy = A·dp, ΔSxy = 0 and ΔSv = 0 (compression-positive;
// see [Poroelastic.StressPath]).
func (p Poroelastic) Uniaxial(dp float64) StressChange {
	dh := p.StressPath() * dp
	return StressChange{XX: dh, YY: dh, Pore: dp}
}

// StressChange is the change of the stress state at a point of the layer's
// mid-plane, Pa, compression-positive, in East-North-Up components: a
// depletion (Pore < 0) lowers the horizontal stresses where it acts.
type StressChange struct {
	XX, YY, XY float64 // horizontal components ΔSxx (east), ΔSyy (north), ΔSxy, Pa
	// ZZ is the vertical component the depletion model gives at the
	// mid-plane, Pa. [Stress.Changed] does not apply it: the screening
	// keeps ΔSv = 0, the constant overburden of the uniaxial-strain path.
	// ZZ tends to 0 deep inside a region wide compared with the layer
	// thickness and shows where that assumption is poor (near the edges,
	// and outside, where ZZ = −(XX + YY)).
	ZZ float64
	// Pore is the pore-pressure change Δp, Pa (negative for depletion).
	Pore float64
}

// Changed returns the stress state after the change c: the total stress
// tensor plus the horizontal components of c (ΔSv = 0, the vertical
// component c.ZZ is not applied) and the pore pressure plus c.Pore. The
// tensor entries that c leaves unchanged keep their exact values, so a zero
// change returns the state unchanged, bit for bit.
//
// A state with a vertical principal axis (built by [NewAndersonian] or
// [StressAtDepth]) keeps one: its principal stresses are again SHmax, Shmin
// and Sv, with the rotated SHmax azimuth, and its faulting regime is that of
// the changed magnitudes. Other states get S1, S2, S3 from the changed
// tensor.
//
// Changed returns an error for a non-finite change, a changed horizontal
// principal stress that is not positive, or a changed pore pressure outside
// [0, S3).
func (s Stress) Changed(c StressChange) (Stress, error) {
	if err := firstError(
		finite("stress change xx", c.XX),
		finite("stress change yy", c.YY),
		finite("stress change xy", c.XY),
		finite("pore-pressure change", c.Pore),
	); err != nil {
		return Stress{}, err
	}
	n := s
	if c.XX != 0 || c.YY != 0 || c.XY != 0 {
		addNonZero(&n.t[0][0], c.XX)
		addNonZero(&n.t[1][1], c.YY)
		addNonZero(&n.t[0][1], c.XY)
		addNonZero(&n.t[1][0], c.XY)
		if s.regime == "" {
			n.principal = principalOf(n.t)
		} else {
			h := n.Horizontal()
			if err := positive("shmin after the stress change", h.Shmin); err != nil {
				return Stress{}, err
			}
			n.principal, n.regime = andersonianPrincipal(h.SHmax, h.Shmin, n.t[2][2], h.Azimuth)
		}
	}
	p := s.pore
	addNonZero(&p, c.Pore)
	if err := n.setPorePressure(p); err != nil {
		return Stress{}, fmt.Errorf("after a change of (ΔSxx, ΔSyy, ΔSxy) = (%g, %g, %g) Pa and Δp = %g Pa: %w",
			c.XX, c.YY, c.XY, c.Pore, err)
	}
	return n, nil
}

// addNonZero adds d to *v unless d is zero, so that an unchanged entry
// keeps its bits (−0 + 0 would give +0).
func addNonZero(v *float64, d float64) {
	if d != 0 {
		*v += d
	}
}

// Horizontal is a horizontal stress state in principal form.
type Horizontal struct {
	SHmax float64 // larger horizontal principal stress, Pa
	Shmin float64 // smaller horizontal principal stress, Pa
	// Azimuth of SHmax, radians clockwise from north, in [0, π). An
	// isotropic state (SHmax = Shmin) has azimuth 0.
	Azimuth float64
}

// Horizontal returns the principal form of the horizontal block of the
// stress tensor (for an Andersonian state: its SHmax, Shmin and azimuth).
func (s Stress) Horizontal() Horizontal {
	return horizontalOf(s.t[0][0], s.t[1][1], s.t[0][1])
}

// horizontalOf returns the principal form of the horizontal stress with
// components xx (east), yy (north) and xy. The normal stress along azimuth
// θ is S(θ) = m + d·cos 2θ + xy·sin 2θ with m = (xx + yy)/2 and
// d = (yy − xx)/2 (Jaeger, Cook & Zimmerman 2007, ch. 2), largest at
// 2θ = atan2(xy, d), with value m + √(d² + xy²).
func horizontalOf(xx, yy, xy float64) Horizontal {
	m, d := (xx+yy)/2, (yy-xx)/2
	r := math.Hypot(d, xy)
	az := 0.5 * math.Atan2(xy, d)
	if az < 0 {
		az += math.Pi
	}
	return Horizontal{SHmax: m + r, Shmin: m - r, Azimuth: az}
}

// Components returns the East-North components of h, Pa:
// xx = SHmax·sin²θ + Shmin·cos²θ, yy = SHmax·cos²θ + Shmin·sin²θ and
// xy = (SHmax − Shmin)·sin θ·cos θ, with θ the SHmax azimuth.
func (h Horizontal) Components() (xx, yy, xy float64) {
	sin, cos := math.Sincos(h.Azimuth)
	return h.SHmax*sin*sin + h.Shmin*cos*cos, h.SHmax*cos*cos + h.Shmin*sin*sin, (h.SHmax - h.Shmin) * sin * cos
}

// Changed returns the horizontal principal stresses after the change c
// (its horizontal components; c.ZZ and c.Pore play no part).
func (h Horizontal) Changed(c StressChange) Horizontal {
	xx, yy, xy := h.Components()
	return horizontalOf(xx+c.XX, yy+c.YY, xy+c.XY)
}

// SHmaxRotation returns the rotation of SHmax from the azimuth before to
// the azimuth after, radians in [−π/2, π/2]: positive clockwise (seen from
// above). Azimuths are axial, so a rotation of ±π/2 is a swap of SHmax and
// Shmin, the stress reversal that depletion can cause.
func SHmaxRotation(before, after float64) float64 {
	return math.Remainder(after-before, math.Pi)
}

// ChangedHorizontals writes, for every change c[i], the horizontal
// principal stresses of h after it to dst[i] and the rotation of SHmax to
// rotation[i], radians (see [SHmaxRotation]). The slices must have the
// length of c; it does not allocate.
func ChangedHorizontals(dst []Horizontal, rotation []float64, h Horizontal, c []StressChange) {
	if len(dst) != len(c) || len(rotation) != len(c) {
		panic("mechanics: ChangedHorizontals: slice lengths differ")
	}
	xx, yy, xy := h.Components()
	for i := range c {
		dst[i] = horizontalOf(xx+c[i].XX, yy+c[i].YY, xy+c[i].XY)
		rotation[i] = SHmaxRotation(h.Azimuth, dst[i].Azimuth)
	}
}
