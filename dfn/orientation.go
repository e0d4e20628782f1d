package dfn

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/orient"
	"slipfront/scenarios"
)

// OrientationLaw is the distribution of a set's fracture normals.
type OrientationLaw interface {
	// Rand draws a unit vector in the sense the law defines it (a Fisher
	// draw scatters about the mean pole as given; a uniform draw covers the
	// whole sphere). The generator flips it upward.
	Rand(r *rand.Rand) r3.Vec
	// C13 returns E|n·l|, the factor of P10 = C13·P32 along a line of unit
	// direction l (Dershowitz & Herda 1992; docs/references.md §2.2).
	C13(l r3.Vec) float64
}

// Fisher is the Fisher (von Mises–Fisher on the sphere) distribution of
// poles about a mean pole with concentration κ (Fisher 1953). Make one with
// NewFisher.
type Fisher struct {
	mean   r3.Vec
	kappa  float64
	e1, e2 r3.Vec // orthonormal pair perpendicular to mean
}

// NewFisher returns the Fisher law about the mean pole (need not be of unit
// length; its sense is kept) with concentration kappa > 0. It panics if
// kappa is not positive and finite or mean is zero (programmer error;
// NewOrientationLaw validates user input).
func NewFisher(mean r3.Vec, kappa float64) *Fisher {
	if !(kappa > 0) || math.IsInf(kappa, 0) || r3.Norm(mean) == 0 {
		panic("dfn: invalid Fisher parameters")
	}
	m := r3.Unit(mean)
	// e1 = normalize(a × μ) with a the coordinate axis least aligned with μ
	// (docs/references.md §1.2).
	a := r3.Vec{X: 1}
	if math.Abs(m.Y) < math.Abs(m.X) && math.Abs(m.Y) <= math.Abs(m.Z) {
		a = r3.Vec{Y: 1}
	} else if math.Abs(m.Z) < math.Abs(m.X) && math.Abs(m.Z) < math.Abs(m.Y) {
		a = r3.Vec{Z: 1}
	}
	e1 := r3.Unit(r3.Cross(a, m))
	return &Fisher{mean: m, kappa: kappa, e1: e1, e2: r3.Cross(m, e1)}
}

// Mean returns the unit mean pole.
func (f *Fisher) Mean() r3.Vec { return f.mean }

// Kappa returns the concentration κ.
func (f *Fisher) Kappa() float64 { return f.kappa }

// Rand draws a pole by the exact inverse-CDF sampler of Wood (1994) for the
// sphere (docs/references.md §1.2): cos θ = FisherCosQuantile(V, κ) with V
// uniform on [0, 1), azimuth φ uniform on [0, 2π).
func (f *Fisher) Rand(r *rand.Rand) r3.Vec {
	w := FisherCosQuantile(r.Float64(), f.kappa)
	s := math.Sqrt(math.Max(0, 1-w*w))
	sp, cp := math.Sincos(2 * math.Pi * r.Float64())
	return r3.Vec{
		X: w*f.mean.X + s*(cp*f.e1.X+sp*f.e2.X),
		Y: w*f.mean.Y + s*(cp*f.e1.Y+sp*f.e2.Y),
		Z: w*f.mean.Z + s*(cp*f.e1.Z+sp*f.e2.Z),
	}
}

// FisherCosQuantile returns cos θ_P, the cosine of the half-angle of the
// cone about the mean pole that holds the fraction p ∈ [0, 1] of a Fisher
// distribution with concentration κ > 0:
//
//	cos θ_P = 1 + log1p(p · expm1(−2κ)) / κ
//
// (docs/references.md §1.2–1.3, from F(θ) = (1 − e^{−κ(1−cos θ)})/(1 − e^{−2κ}));
// the expm1/log1p form is stable for every κ.
func FisherCosQuantile(p, kappa float64) float64 {
	return math.Max(-1, 1+math.Log1p(p*math.Expm1(-2*kappa))/kappa)
}

// FisherMeanCos returns E[cos θ] = coth κ − 1/κ, the Langevin function
// (Fisher 1953; docs/references.md §1.3).
func FisherMeanCos(kappa float64) float64 {
	if kappa < 1e-4 {
		// Series κ/3 − κ³/45 avoids the cancellation of coth κ − 1/κ.
		return kappa/3 - kappa*kappa*kappa/45
	}
	return 1/math.Tanh(kappa) - 1/kappa
}

// c13Nodes is the Gauss–Legendre order per panel of Fisher.C13.
const c13Nodes = 64

// C13 returns E|n·l| for a Fisher set by quadrature. With ψ the angle
// between l and the mean pole, w = cos θ, a = w cos ψ and b = sin θ sin ψ,
// the average over the azimuth is E_φ|a + b cos φ| = |a| when |a| ≥ b and
// (2/π)(√(b² − a²) + a·asin(a/b)) otherwise. The outer integral over the
// probability p of θ runs in three panels split at the kinks w = ±sin ψ,
// each mapped by p = p0 + (p1 − p0)(1 − cos t)/2 to smooth the kinks, and
// Gauss–Legendre in t. Check values: docs/references.md §2.2 (κ = 20).
func (f *Fisher) C13(l r3.Vec) float64 {
	cosPsi := math.Min(1, math.Abs(r3.Dot(f.mean, r3.Unit(l))))
	sinPsi := math.Sqrt(math.Max(0, 1-cosPsi*cosPsi))
	cdf := func(w float64) float64 { // P(cos Θ ≥ w)
		return math.Expm1(-f.kappa*(1-w)) / math.Expm1(-2*f.kappa)
	}
	h := func(p float64) float64 {
		w := FisherCosQuantile(p, f.kappa)
		a := w * cosPsi
		b := math.Sqrt(math.Max(0, 1-w*w)) * sinPsi
		if math.Abs(a) >= b {
			return math.Abs(a)
		}
		return 2 / math.Pi * (math.Sqrt(b*b-a*a) + a*math.Asin(a/b))
	}
	edges := [4]float64{0, cdf(sinPsi), cdf(-sinPsi), 1}
	var sum float64
	for i := range 3 {
		p0, p1 := edges[i], edges[i+1]
		if !(p1 > p0) {
			continue
		}
		g := func(t float64) float64 {
			return h(p0+(p1-p0)*(1-math.Cos(t))/2) * (p1 - p0) * math.Sin(t) / 2
		}
		sum += quad.Fixed(g, 0, math.Pi, c13Nodes, quad.Legendre{}, 0)
	}
	return sum
}

// UniformSphere is the uniform (isotropic) distribution on the sphere.
type UniformSphere struct{}

// Rand draws a uniform unit vector: z uniform on [−1, 1), azimuth uniform
// (Archimedes' hat-box theorem; the κ = 0 case of docs/references.md §1.2).
func (UniformSphere) Rand(r *rand.Rand) r3.Vec {
	z := 2*r.Float64() - 1
	s := math.Sqrt(math.Max(0, 1-z*z))
	sp, cp := math.Sincos(2 * math.Pi * r.Float64())
	return r3.Vec{X: s * cp, Y: s * sp, Z: z}
}

// C13 returns 1/2 for any line (docs/references.md §2.2).
func (UniformSphere) C13(r3.Vec) float64 { return 0.5 }

// FixedNormal gives every fracture the same unit normal.
type FixedNormal struct {
	Normal r3.Vec // unit normal
}

// Rand returns the fixed normal.
func (f FixedNormal) Rand(*rand.Rand) r3.Vec { return f.Normal }

// C13 returns |n·l| = |cos ψ| (docs/references.md §2.2).
func (f FixedNormal) C13(l r3.Vec) float64 {
	return math.Abs(r3.Dot(f.Normal, r3.Unit(l)))
}

// NewOrientationLaw returns the law described by a scenario orientation.
// The mean pole of a Fisher law and the fixed normal are the upward normal
// of the plane (Dip, DipDirection).
func NewOrientationLaw(o scenarios.Orientation) (OrientationLaw, error) {
	if !(o.Dip >= 0 && o.Dip <= math.Pi/2) {
		return nil, fmt.Errorf("orientation.dip = %g deg: must be in [0, 90]", o.Dip*180/math.Pi)
	}
	if math.IsNaN(o.DipDirection) || math.IsInf(o.DipDirection, 0) {
		return nil, fmt.Errorf("orientation.dip_direction = %g: must be finite", o.DipDirection)
	}
	n := orient.Normal(o.Dip, o.DipDirection)
	switch o.Distribution {
	case "fisher":
		if !(o.Kappa > 0) || math.IsInf(o.Kappa, 0) {
			return nil, fmt.Errorf("orientation.kappa = %g: must be > 0 and finite", o.Kappa)
		}
		return NewFisher(n, o.Kappa), nil
	case "uniform":
		return UniformSphere{}, nil
	case "fixed":
		return FixedNormal{Normal: n}, nil
	}
	return nil, fmt.Errorf("orientation.distribution = %q: must be fisher, uniform or fixed", o.Distribution)
}

// KappaEstimate returns the concentration estimate κ̂ = (N − 1)/(N − R)
// (Fisher 1953; docs/references.md §1.4) of axial unit vectors and the resultant
// length R. Poles are axial, so each vector is first flipped into the
// hemisphere of a provisional mean: the principal eigenvector of the
// orientation tensor Σ x xᵀ. κ̂ is NaN for fewer than two vectors and +Inf
// when all are parallel.
func KappaEstimate(poles []r3.Vec) (kappa, resultant float64) {
	if len(poles) == 0 {
		return math.NaN(), 0
	}
	var t [9]float64
	for _, p := range poles {
		p = r3.Unit(p)
		v := [3]float64{p.X, p.Y, p.Z}
		for i := range 3 {
			for j := range 3 {
				t[3*i+j] += v[i] * v[j]
			}
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(mat.NewSymDense(3, t[:]), true) {
		return math.NaN(), 0
	}
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	m := r3.Vec{X: vecs.At(0, 2), Y: vecs.At(1, 2), Z: vecs.At(2, 2)} // largest eigenvalue last
	var sum r3.Vec
	for _, p := range poles {
		p = r3.Unit(p)
		if r3.Dot(p, m) < 0 {
			p = r3.Scale(-1, p)
		}
		sum = r3.Add(sum, p)
	}
	n := float64(len(poles))
	resultant = r3.Norm(sum)
	if len(poles) < 2 {
		return math.NaN(), resultant
	}
	if n-resultant <= 0 {
		return math.Inf(1), resultant
	}
	return (n - 1) / (n - resultant), resultant
}
