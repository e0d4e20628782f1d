package dfn

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

func rad(d float64) float64 { return d * math.Pi / 180 }

// Fisher (1953): E[cos θ] = coth κ − 1/κ; Var[cos θ] = 1/κ² − 1/sinh²κ
// (docs/references.md §1.3, tolerance 5·sqrt(Var/N) as recommended there).
func TestFisherMeanCos(t *testing.T) {
	for _, c := range []struct {
		kappa, meanCos float64 // docs/references.md §1.3 table
	}{
		{5, 0.8000908040},
		{20, 0.95},
		{100, 0.99},
	} {
		numtest.Abs(t, "FisherMeanCos", FisherMeanCos(c.kappa), c.meanCos, 1e-9)
		mean := orient.Normal(rad(60), rad(120))
		f := NewFisher(mean, c.kappa)
		r := rand.New(rand.NewPCG(1, 2))
		const n = 200_000
		var sum float64
		for range n {
			x := f.Rand(r)
			numtest.Abs(t, "|x|", r3.Norm(x), 1, 1e-12)
			sum += r3.Dot(x, mean)
		}
		variance := 1/(c.kappa*c.kappa) - 1/math.Pow(math.Sinh(c.kappa), 2)
		numtest.Abs(t, "sample mean cos θ", sum/n, c.meanCos, 5*math.Sqrt(variance/n))
	}
}

// Closed-form cone angles θ_P (docs/references.md §1.3 table, in degrees to
// 5 decimals, so the tolerance is the table's rounding, 1e-5 deg), and
// the sampled fraction inside each cone (binomial, 5 SE).
func TestFisherQuantiles(t *testing.T) {
	ps := []float64{0.5, 1 - 1/math.E, 0.95, 0.99}
	for _, c := range []struct {
		kappa  float64
		angles []float64 // θ50, θ63, θ95, θ99, degrees
	}{
		{5, []float64{30.52816, 36.86841, 66.35767, 85.41932}},
		{20, []float64{15.12856, 18.19487, 31.76511, 39.66932}},
		{100, []float64{6.74997, 8.10961, 14.05981, 17.45587}},
	} {
		for i, p := range ps {
			got := math.Acos(FisherCosQuantile(p, c.kappa)) * 180 / math.Pi
			numtest.Abs(t, "θ_P", got, c.angles[i], 1e-5)
		}
		f := NewFisher(r3.Vec{Z: 1}, c.kappa)
		r := rand.New(rand.NewPCG(1, 2))
		const n = 100_000
		var inside [4]int
		for range n {
			w := f.Rand(r).Z
			for i, p := range ps {
				if w >= FisherCosQuantile(p, c.kappa) {
					inside[i]++
				}
			}
		}
		for i, p := range ps {
			numtest.Abs(t, "fraction inside θ_P", float64(inside[i])/n, p, 5*math.Sqrt(p*(1-p)/n))
		}
	}
}

// The expm1/log1p sampler stays finite for any κ (docs/references.md §1.2: the
// naive form fails at U = 0 once κ ≳ 370).
func TestFisherLargeKappa(t *testing.T) {
	for _, kappa := range []float64{1e-8, 0.5, 400, 1e4, 1e8} {
		numtest.Abs(t, "cos θ at p=0", FisherCosQuantile(0, kappa), 1, 0)
		w := FisherCosQuantile(0.999999999, kappa)
		if math.IsNaN(w) || w < -1 || w > 1 {
			t.Errorf("κ=%g: cos θ = %g", kappa, w)
		}
		f := NewFisher(r3.Vec{X: 1}, kappa)
		r := rand.New(rand.NewPCG(1, 2))
		for range 1000 {
			x := f.Rand(r)
			if math.IsNaN(x.X) || x.X < -1-1e-12 || x.X > 1+1e-12 {
				t.Fatalf("κ=%g: sample %v", kappa, x)
			}
		}
	}
	// κ → 0 is the uniform law: E[cos θ] → κ/3 (series of the Langevin
	// function, Fisher 1953).
	numtest.Rel(t, "FisherMeanCos(1e-6)", FisherMeanCos(1e-6), 1e-6/3, 1e-9)
}

// docs/references.md §1.4 check set: (0,0,1) plus four vectors at 10° from z
// toward ±E and ±N; R = 4.9392310120488325, (N−1)/(N−R) = 65.82304782
// (tolerance 1e-8 relative, as given there). Flipping some of them (axial
// data) must not change the estimate.
func TestKappaEstimateCheckSet(t *testing.T) {
	s, c := math.Sincos(rad(10))
	vs := []r3.Vec{{Z: 1}, {X: s, Z: c}, {X: -s, Z: c}, {Y: s, Z: c}, {Y: -s, Z: c}}
	k, r := KappaEstimate(vs)
	numtest.Rel(t, "R", r, 4.9392310120488325, 1e-12)
	numtest.Rel(t, "κ̂", k, 65.82304782, 1e-8)
	vs[1], vs[3] = r3.Scale(-1, vs[1]), r3.Scale(-1, vs[3])
	k, _ = KappaEstimate(vs)
	numtest.Rel(t, "κ̂ with flipped poles", k, 65.82304782, 1e-8)

	if k, _ := KappaEstimate(vs[:1]); !math.IsNaN(k) {
		t.Errorf("κ̂ of one pole = %g, want NaN", k)
	}
	if k, _ := KappaEstimate([]r3.Vec{{Z: 1}, {Z: 1}}); !math.IsInf(k, 1) {
		t.Errorf("κ̂ of parallel poles = %g, want +Inf", k)
	}
}

// The estimator recovers κ from N upward-flipped poles of a set whose mean
// pole is horizontal (so half the draws are flipped). For large κ,
// 1 − cos θ is exponential with mean 1/κ (from F in docs/references.md §1.1),
// so N − R is nearly Gamma(N, 1/κ) and κ̂ has relative SD ≈ 1/√N; the
// tolerance is 5/√N, plus the estimator's own bias 1 − κ(1 − A(κ)) at
// small κ.
func TestKappaEstimateRecovers(t *testing.T) {
	mean := orient.Normal(rad(90), rad(45))
	for _, kappa := range []float64{5, 20, 100} {
		f := NewFisher(mean, kappa)
		r := rand.New(rand.NewPCG(1, 2))
		const n = 5000
		vs := make([]r3.Vec, n)
		for i := range vs {
			vs[i] = upward(f.Rand(r))
		}
		got, _ := KappaEstimate(vs)
		bias := math.Abs(1 - kappa*(1-FisherMeanCos(kappa)))
		numtest.Rel(t, "κ̂", got, kappa, 5/math.Sqrt(n)+bias)
	}
}

// Uniform vectors: E[R²] = N, so the mean resultant length R/N → 0 as
// 1/√N; R²/N·3 is χ² with 3 degrees of freedom, so R/N < 5/√N fails with
// probability P(χ²₃ > 75) < 1e-15.
func TestUniformResultant(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	const n = 100_000
	var sum r3.Vec
	var zAbs float64
	for range n {
		x := UniformSphere{}.Rand(r)
		numtest.Abs(t, "|x|", r3.Norm(x), 1, 1e-12)
		sum = r3.Add(sum, x)
		zAbs += math.Abs(x.Z)
	}
	if rbar := r3.Norm(sum) / n; rbar > 5/math.Sqrt(n) {
		t.Errorf("uniform mean resultant length = %g, want < %g", rbar, 5/math.Sqrt(n))
	}
	// E|z| = 1/2 (Archimedes: z is uniform on [−1, 1]); SD of |z| = 1/√12.
	numtest.Abs(t, "E|z|", zAbs/n, 0.5, 5/math.Sqrt(12*n))
}

// C13 = E|n·l| (Dershowitz & Herda 1992; docs/references.md §2.2).
func TestC13(t *testing.T) {
	mean := orient.Normal(rad(70), rad(200))
	// A line at angle ψ from the mean pole, in the plane of the pole and
	// its strike.
	lineAt := func(psi float64) r3.Vec {
		s := orient.Strike(rad(200))
		sp, cp := math.Sincos(psi)
		return r3.Add(r3.Scale(cp, mean), r3.Scale(sp, s))
	}
	f := NewFisher(mean, 20)
	// κ = 20 values (docs/references.md §2.2, 6 decimals: tolerance 5e-7 for
	// the rounding plus 1e-7 for the quadrature).
	for _, c := range []struct{ psi, want float64 }{
		{0, 0.950000}, {30, 0.822725}, {60, 0.476860}, {90, 0.175012},
	} {
		numtest.Abs(t, "Fisher κ=20 C13", f.C13(lineAt(rad(c.psi))), c.want, 6e-7)
	}
	// E[n] = A(κ)μ (Fisher 1953), so C13 = A(κ)cos ψ exactly while no
	// pole lies beyond 90° from l; at κ = 1e4, ψ = 45° that has
	// probability e^(−2929).
	big := NewFisher(mean, 1e4)
	numtest.Rel(t, "Fisher κ=1e4 C13", big.C13(lineAt(rad(45))), FisherMeanCos(1e4)*math.Cos(rad(45)), 1e-10)
	// Isotropic: 1/2; single orientation: |cos ψ|.
	numtest.Abs(t, "uniform C13", UniformSphere{}.C13(r3.Vec{X: 1}), 0.5, 0)
	numtest.Abs(t, "fixed C13", FixedNormal{Normal: mean}.C13(lineAt(rad(60))), 0.5, 1e-12)

	// Monte Carlo of the κ = 5 factor at ψ = 75° (the Fisher quadrature
	// where the poles straddle the plane ⟂ l), 5 SE.
	small := NewFisher(mean, 5)
	l := lineAt(rad(75))
	r := rand.New(rand.NewPCG(1, 2))
	const n = 200_000
	var sum, sum2 float64
	for range n {
		v := math.Abs(r3.Dot(small.Rand(r), l))
		sum += v
		sum2 += v * v
	}
	m := sum / n
	numtest.Abs(t, "Fisher κ=5 C13 vs Monte Carlo", small.C13(l), m, 5*math.Sqrt((sum2/n-m*m)/n))
}

func TestNewOrientationLawErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		dist string
		dip  float64
		k    float64
	}{
		{"negative kappa", "fisher", 0.5, -3},
		{"zero kappa", "fisher", 0.5, 0},
		{"dip above 90", "fixed", 2, 1},
		{"unknown law", "bingham", 0.5, 1},
	} {
		o := defaultOrientation()
		o.Distribution, o.Dip, o.Kappa = c.dist, c.dip, c.k
		if _, err := NewOrientationLaw(o); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}
