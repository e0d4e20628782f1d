package mechanics

import (
	"math"
)

// Layer is the map-view model of the stress change that a pore-pressure
// change causes in one layer: a layer of thickness h, uniformly changed
// across it by Δp(x, y), in a homogeneous, isotropic, linear elastic whole
// space, with the stress change evaluated on the layer's mid-plane.
//
// A pore-pressure change Δp would let the rock strain freely by
// ε* = αΔp/(3K) = α(1 − 2ν)Δp/E in every direction (Biot 1941); the rock
// around resists, as it resists a thermal or transformation strain
// (Goodier 1937; Eshelby 1957). A point of such strain is a centre of
// dilatation, the nucleus of strain of Geertsma (1973) and Segall (1989);
// summed over the thickness it is a vertical line source of height h.
// Goodier's displacement potential gives the stress of a region Ω changed
// by Δp through the Newtonian potential ψ(x) = ∫_Ω dV′/|x − x′|:
//
//	ΔS_ij = (A/4π)·Δp·(ψ_ij + 4π·χ_Ω·δ_ij)     (compression-positive)
//
// with ψ_ij = ∂²ψ/∂x_i∂x_j, χ_Ω = 1 inside Ω and 0 outside, and
// A = α(1 − 2ν)/(1 − ν) ([Poroelastic.StressPath]); the elastic moduli
// cancel. On the mid-plane the horizontal part is a convolution,
//
//	ΔS_ij(x) = A·[Δp(x)·δ_ij + (1/4π) ∫ Δp(x′) ∂_i∂_j g(|x − x′|) dA′]
//	g(ρ) = ∫ dz/√(ρ² + z²) over |z| < h/2 = 2·asinh(h/(2ρ))
//
// with g the potential of the vertical line at its mid-height. The
// vertical component is ΔSzz = 2A·Δp(x) − ΔSxx − ΔSyy, and ΔSxz = ΔSyz = 0
// on the mid-plane by symmetry.
//
// The strength of the source is fixed by poroelasticity; nothing is
// calibrated. Deep inside a region wide compared with h, ψ_ij → 0 and the
// change tends to the uniaxial-strain value A·Δp in every horizontal
// direction, with ΔSzz → 0 (the limit Segall & Fitzgerald (1998) give for a
// thin ellipsoidal reservoir). In the opposite limit, a region narrow
// compared with h (Thickness = +Inf), the model is Eshelby's elliptic
// cylinder in plane strain: inside an ellipse with semi-axis a along x and
// b along y, ΔSxx = A·Δp·a/(a + b) and ΔSyy = A·Δp·b/(a + b). Outside the
// region the change decays, as 1/r² in the plane-strain limit and 1/r³ at
// distances r ≫ h, and leaves the mean stress unchanged
// (ΔSxx + ΔSyy + ΔSzz = 0). Where the change is uneven the horizontal
// principal directions rotate.
//
// Why a layer and not a two-dimensional inclusion in map view: the uniaxial
// strain of a wide reservoir comes from the rock above and below, which
// holds the layer's base and top; a map-view inclusion (plane strain or
// plane stress) has no such restraint, so inside it the change does not
// depend on the region's size, and across an elongated region it stays far
// below A·Δp however wide the region is. The layer has both limits, with
// the layer thickness (a scenario input) as the length that separates them.
// It is the map-view reduction of the nucleus-of-strain and inclusion
// models of Segall (1989, 1992) and Segall & Fitzgerald (1998).
//
// Left out: the free surface (a whole space; Segall (1989) keeps it, and it
// matters where the region is not small compared with its depth); any
// contrast of elastic properties between the layer and the rock around
// (Segall & Fitzgerald 1998; Rudnicki 2011); variation of Δp across the
// thickness and other layers; time (drained, isothermal, linear
// poroelasticity: the stress follows the pressure at once); and inelastic
// compaction.
type Layer struct {
	Poroelastic
	// Thickness h of the layer, m; math.Inf(1) gives the plane-strain
	// limit.
	Thickness float64
}

// Validate returns an error for invalid poroelastic constants or a
// thickness that is not > 0 (+Inf is allowed).
func (l Layer) Validate() error {
	if err := l.Poroelastic.Validate(); err != nil {
		return err
	}
	if !(l.Thickness > 0) {
		return &InputError{Name: "thickness", Value: l.Thickness, Want: "must be > 0 (+Inf for the plane-strain limit)"}
	}
	return nil
}

// Ellipse is a uniformly depleted elliptical region in map view (a circle
// when the semi-axes are equal).
type Ellipse struct {
	X, Y      float64 // centre, m east and north of the origin
	SemiMajor float64 // semi-axis a along Azimuth, m
	SemiMinor float64 // semi-axis b across it, m, 0 < b ≤ a
	// Azimuth of the major axis, radians clockwise from north.
	Azimuth float64
	// Depletion is the pore-pressure change Δp inside, Pa (negative for
	// depletion).
	Depletion float64
}

// DepletedEllipse is the stress change around a uniformly depleted ellipse
// in a [Layer]. Build it with [NewDepletedEllipse].
type DepletedEllipse struct {
	e    Ellipse
	c    float64 // half-thickness h/2, m; +Inf in the plane-strain limit
	path float64 // stress-path coefficient A
	// major and minor are the unit vectors of the axes, East-North.
	major, minor [2]float64
}

// NewDepletedEllipse returns the stress change of the depleted ellipse e in
// the layer l, or an error for invalid constants or geometry.
func NewDepletedEllipse(l Layer, e Ellipse) (*DepletedEllipse, error) {
	if err := firstError(
		l.Validate(),
		finite("ellipse x", e.X),
		finite("ellipse y", e.Y),
		positive("ellipse semi-minor axis", e.SemiMinor),
		finite("ellipse azimuth", e.Azimuth),
		finite("ellipse depletion", e.Depletion),
	); err != nil {
		return nil, err
	}
	if !(e.SemiMajor >= e.SemiMinor) || math.IsInf(e.SemiMajor, 0) {
		return nil, &InputError{Name: "ellipse semi-major axis", Value: e.SemiMajor,
			Want: "must be finite and ≥ the semi-minor axis"}
	}
	sin, cos := math.Sincos(e.Azimuth)
	return &DepletedEllipse{e: e, c: l.Thickness / 2, path: l.StressPath(),
		major: [2]float64{sin, cos}, minor: [2]float64{cos, -sin}}, nil
}

// At returns the stress change at the map point (x, y), m, on the layer's
// mid-plane. Points on the boundary count as inside.
//
// In the ellipse's frame (ξ along the major axis, η along the minor), ψ_ij
// is the plane-strain potential of the elliptic cylinder in closed form
// plus, for a finite thickness, a boundary integral (see thicknessCorrection).
// The plane-strain part (Kellogg 1929, ch. VII; Mura 1987, §11, with the
// third semi-axis infinite) is, inside,
//
//	ψ_ξξ = −4πb/(a + b),  ψ_ηη = −4πa/(a + b),  ψ_ξη = 0
//
// and outside, with λ > 0 the root of ξ²/(a² + λ) + η²/(b² + λ) = 1,
// P = √(a² + λ), Q = √(b² + λ) and T = ξ²/P⁴ + η²/Q⁴,
//
//	ψ_ξξ = −2πab·[2/(P(P + Q)) − 2ξ²/(P⁴·PQ·T)]
//	ψ_ηη = −2πab·[2/(Q(P + Q)) − 2η²/(Q⁴·PQ·T)]
//	ψ_ξη = 4πab·ξη/(P²Q²·PQ·T)
//
// The plane-strain limit costs a few hundred nanoseconds a point; a finite
// thickness adds the quadrature, which needs more nodes the closer the
// point is to the boundary and the thinner the layer (about 8πa/h nodes
// within h of the boundary; 26 µs a point on average around an ellipse of
// 300 × 100 m in a 30 m layer).
func (d *DepletedEllipse) At(x, y float64) StressChange {
	dx, dy := x-d.e.X, y-d.e.Y
	xi := dx*d.major[0] + dy*d.major[1]
	eta := dx*d.minor[0] + dy*d.minor[1]
	a, b := d.e.SemiMajor, d.e.SemiMinor
	inside := xi*xi/(a*a)+eta*eta/(b*b) <= 1
	pxx, pyy, pxy := ellipticCylinder(a, b, xi, eta, inside)
	if !math.IsInf(d.c, 1) {
		cxx, cyy, cxy := thicknessCorrection(a, b, d.c, xi, eta)
		pxx, pyy, pxy = pxx+cxx, pyy+cyy, pxy+cxy
	}
	dp := d.e.Depletion
	local := 0.0
	if inside {
		local = d.path * dp
	}
	k := d.path * dp / (4 * math.Pi)
	lxx, lyy, lxy := local+k*pxx, local+k*pyy, k*pxy
	// Rotate to East-North: S = Σ L_ab·u_a·u_bᵀ with u the axis vectors.
	u, v := d.major, d.minor
	c := StressChange{
		XX: lxx*u[0]*u[0] + lyy*v[0]*v[0] + 2*lxy*u[0]*v[0],
		YY: lxx*u[1]*u[1] + lyy*v[1]*v[1] + 2*lxy*u[1]*v[1],
		XY: lxx*u[0]*u[1] + lyy*v[0]*v[1] + lxy*(u[0]*v[1]+u[1]*v[0]),
	}
	if inside {
		c.Pore = dp
	}
	c.ZZ = 2*local - c.XX - c.YY
	return c
}

// ellipticCylinder returns ψ_ξξ, ψ_ηη and ψ_ξη of the unit-density
// elliptic cylinder with semi-axes a along ξ and b along η at (ξ, η) (see
// [DepletedEllipse.At] for the formulas).
func ellipticCylinder(a, b, xi, eta float64, inside bool) (pxx, pyy, pxy float64) {
	if inside {
		return -4 * math.Pi * b / (a + b), -4 * math.Pi * a / (a + b), 0
	}
	// λ² + βλ + γ = 0 with β = a² + b² − ξ² − η², γ = a²b² − ξ²b² − η²a² < 0
	// outside; the positive root, in the form without cancellation.
	beta := a*a + b*b - xi*xi - eta*eta
	gamma := a*a*b*b - xi*xi*b*b - eta*eta*a*a
	disc := math.Sqrt(beta*beta - 4*gamma)
	var lam float64
	if beta < 0 {
		lam = (disc - beta) / 2
	} else {
		lam = -2 * gamma / (beta + disc)
	}
	p2, q2 := a*a+lam, b*b+lam
	p, q := math.Sqrt(p2), math.Sqrt(q2)
	t := xi*xi/(p2*p2) + eta*eta/(q2*q2)
	pq := p * q
	ab := 2 * math.Pi * a * b
	pxx = -ab * (2/(p*(p+q)) - 2*xi*xi/(p2*p2*pq*t))
	pyy = -ab * (2/(q*(p+q)) - 2*eta*eta/(q2*q2*pq*t))
	pxy = 2 * ab * xi * eta / (p2 * q2 * pq * t)
	return pxx, pyy, pxy
}

// Quadrature limits of thicknessCorrection.
const (
	// correctionTol is the absolute change of ψ_ij between two successive
	// trapezoidal sums at which the finer is accepted; since the sums
	// converge geometrically, its error is far below (ψ_ij is of order 4π).
	correctionTol = 1e-12
	minNodes      = 64      // nodes of the first sum
	maxNodes      = 1 << 24 // nodes beyond which the sum is returned as it is
)

// thicknessCorrection returns the part of ψ_ij that a finite half-thickness
// c adds to the plane-strain potential of the elliptic cylinder with
// semi-axes a along ξ and b along η, at (ξ, η).
//
// By the divergence theorem the horizontal Hessian of the layer potential
// is a boundary integral, ψ_ij(x) = ∮ n_i ∂_j g(x′ − x) ds′, with
// ∂_j g(X) = g′(ρ)·X_j/ρ; the distributional part at x′ = x is included
// because ∂_j g is integrable. The plane-strain kernel has g′/ρ = −2/ρ², the
// layer's −h/(ρ²√(ρ² + c²)); their difference
//
//	D(ρ) = 2/(s·(s + c)),  s = √(ρ² + c²)
//
// is smooth (D(0) = 1/c²), so the correction ∮ n_i X_j D(ρ) ds′ is the
// integral of a smooth periodic function of the boundary parameter t,
// x′ = (a cos t, b sin t), n ds′ = (b cos t, a sin t) dt, for which the
// trapezoidal rule converges geometrically (Trefethen & Weideman 2014).
// The integrand's narrowest feature is the peak of D near the closest
// boundary point, of width about √(c² + d²) at a distance d; so the first
// sum has nodes at most half the larger of c and b·|F − 1| apart along
// the boundary (F² = ξ²/a² + η²/b²; b·|F − 1| ≤ d), and the node count
// then doubles until two sums agree to correctionTol.
func thicknessCorrection(a, b, c, xi, eta float64) (pxx, pyy, pxy float64) {
	f := math.Sqrt(xi*xi/(a*a) + eta*eta/(b*b))
	scale := math.Max(c, b*math.Abs(f-1))
	n := minNodes
	for n < maxNodes && 2*math.Pi*a/float64(n) > scale/2 {
		n *= 2
	}
	sum := func(n, first, step int) (sxx, syy, sxy float64) {
		h := 2 * math.Pi / float64(n)
		for k := first; k < n; k += step {
			sin, cos := math.Sincos(float64(k) * h)
			x, y := a*cos-xi, b*sin-eta
			s := math.Sqrt(x*x + y*y + c*c)
			w := 2 / (s * (s + c))
			nx, ny := b*cos*w, a*sin*w
			sxx += nx * x
			syy += ny * y
			sxy += nx * y
		}
		return sxx * h, syy * h, sxy * h
	}
	pxx, pyy, pxy = sum(n, 0, 1)
	for n < maxNodes {
		// The sum with 2n nodes is half the n-node sum plus the new nodes.
		oxx, oyy, oxy := sum(2*n, 1, 2)
		nxx, nyy, nxy := pxx/2+oxx, pyy/2+oyy, pxy/2+oxy
		done := math.Abs(nxx-pxx) <= correctionTol && math.Abs(nyy-pyy) <= correctionTol &&
			math.Abs(nxy-pxy) <= correctionTol
		pxx, pyy, pxy, n = nxx, nyy, nxy, 2*n
		if done {
			break
		}
	}
	return pxx, pyy, pxy
}
