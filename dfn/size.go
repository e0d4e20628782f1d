package dfn

import (
	"fmt"
	"math"
	"math/rand/v2"

	"slipfront/scenarios"
)

// SizeLaw is the distribution of a set's fracture size S (the radius of a
// disc, the strike length of a rectangle), m.
type SizeLaw interface {
	// Moment returns E[S^k], m^k, for k ≥ 0.
	Moment(k int) float64
	// Quantile returns the size s with P(S ≤ s) = p, m.
	Quantile(p float64) float64
	// RandWeighted draws from the law weighted by s^k, the density
	// s^k f(s) / E[S^k] (k = 0 is the law itself), m. The generator uses
	// k = 0..3 to draw the sizes of the fractures that can reach the
	// counting volume (see the package documentation).
	RandWeighted(r *rand.Rand, k int) float64
}

// Constant is a single size.
type Constant struct {
	Value float64 // Size, m.
}

// Moment returns Value^k.
func (c Constant) Moment(k int) float64 { return math.Pow(c.Value, float64(k)) }

// Quantile returns Value.
func (c Constant) Quantile(float64) float64 { return c.Value }

// RandWeighted returns Value.
func (c Constant) RandWeighted(*rand.Rand, int) float64 { return c.Value }

// PowerLaw is the truncated power law (Pareto) of docs/references.md §3.1 with
// density f(s) = D s_min^D s^−(D+1) / (1 − (s_min/s_max)^D) on [Min, Max]:
// D is the exponent of the complementary CDF, P(S > s) ∝ s^−D.
type PowerLaw struct {
	Min, Max float64 // Bounds, m.
	D        float64 // Exponent of P(S > s) ∝ s^−D, > 0.
}

// Moment returns E[S^k] = s_min^k · D/(D−k) · (1 − ρ^(D−k)) / (1 − ρ^D) with
// ρ = s_min/s_max, and s_min^k · D ln(1/ρ) / (1 − ρ^D) when k = D
// (docs/references.md §3.2, rewritten in ρ for accuracy).
func (p PowerLaw) Moment(k int) float64 {
	lr := math.Log(p.Min / p.Max)
	e := p.D - float64(k)
	var f float64
	if math.Abs(e) < 1e-12 {
		f = -p.D * lr
	} else {
		f = -p.D * math.Expm1(e*lr) / e
	}
	return math.Pow(p.Min, float64(k)) * f / -math.Expm1(p.D*lr)
}

// Quantile returns s_min [1 − p(1 − (s_min/s_max)^D)]^(−1/D) (Devroye 1986,
// §II.2; docs/references.md §3.2).
func (p PowerLaw) Quantile(u float64) float64 {
	return powerQuantile(p.Min, p.Max, p.D, u)
}

// RandWeighted draws from s^k f(s), which is again a truncated power law,
// with exponent D − k (of either sign; log-uniform when k = D).
func (p PowerLaw) RandWeighted(r *rand.Rand, k int) float64 {
	return powerQuantile(p.Min, p.Max, p.D-float64(k), r.Float64())
}

// powerQuantile is the inverse CDF of the density ∝ s^−(d+1) on [lo, hi]
// for any real d: s = lo·exp(−log1p(u·expm1(d·ln(lo/hi)))/d), which equals
// lo[1 − u(1 − (lo/hi)^d)]^(−1/d) and tends to lo(hi/lo)^u as d → 0.
func powerQuantile(lo, hi, d, u float64) float64 {
	lr := math.Log(lo / hi)
	if math.Abs(d) < 1e-12 {
		return lo * math.Exp(-u*lr)
	}
	s := lo * math.Exp(-math.Log1p(u*math.Expm1(d*lr))/d)
	return math.Min(hi, math.Max(lo, s))
}

// LogNormal is the log-normal law: ln S is normal with mean Mu and standard
// deviation Sigma.
type LogNormal struct {
	Mu, Sigma float64 // Of ln(S/1 m).
}

// NewLogNormal returns the log-normal law whose size has the given mean
// and standard deviation, m: σ² = ln(1 + sd²/mean²), μ = ln(mean) − σ²/2
// (the moments of the log-normal law, e.g. Johnson, Kotz & Balakrishnan
// 1994, Continuous Univariate Distributions vol. 1, ch. 14; from memory).
func NewLogNormal(mean, sd float64) LogNormal {
	s2 := math.Log1p(sd * sd / (mean * mean))
	return LogNormal{Mu: math.Log(mean) - s2/2, Sigma: math.Sqrt(s2)}
}

// Moment returns E[S^k] = exp(kμ + k²σ²/2).
func (l LogNormal) Moment(k int) float64 {
	kf := float64(k)
	return math.Exp(kf*l.Mu + kf*kf*l.Sigma*l.Sigma/2)
}

// Quantile returns exp(μ + σ√2 erfinv(2p − 1)).
func (l LogNormal) Quantile(p float64) float64 {
	return math.Exp(l.Mu + l.Sigma*math.Sqrt2*math.Erfinv(2*p-1))
}

// RandWeighted draws from s^k f(s), the log-normal law with μ + kσ².
func (l LogNormal) RandWeighted(r *rand.Rand, k int) float64 {
	return math.Exp(l.Mu + float64(k)*l.Sigma*l.Sigma + l.Sigma*r.NormFloat64())
}

// Exponential is the exponential law of the given mean.
type Exponential struct {
	Mean float64 // Mean size, m.
}

// Moment returns E[S^k] = k!·mean^k.
func (e Exponential) Moment(k int) float64 {
	g, _ := math.Lgamma(float64(k) + 1)
	return math.Exp(g) * math.Pow(e.Mean, float64(k))
}

// Quantile returns −mean·ln(1 − p).
func (e Exponential) Quantile(p float64) float64 { return -e.Mean * math.Log1p(-p) }

// RandWeighted draws from s^k f(s), the gamma law of shape k + 1 and scale
// mean: the sum of k + 1 exponential draws.
func (e Exponential) RandWeighted(r *rand.Rand, k int) float64 {
	var s float64
	for range k + 1 {
		s += r.ExpFloat64()
	}
	return e.Mean * s
}

// NewSizeLaw returns the law described by a scenario size block.
func NewSizeLaw(sz scenarios.Size) (SizeLaw, error) {
	pos := func(key string, v float64) error {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("size.%s = %g m: must be > 0 and finite", key, v)
		}
		return nil
	}
	switch sz.Distribution {
	case "constant":
		if err := pos("value", sz.Value); err != nil {
			return nil, err
		}
		return Constant{Value: sz.Value}, nil
	case "power_law":
		for _, c := range []struct {
			key string
			v   float64
		}{{"min", sz.Min}, {"max", sz.Max}} {
			if err := pos(c.key, c.v); err != nil {
				return nil, err
			}
		}
		if !(sz.Max > sz.Min) {
			return nil, fmt.Errorf("size.max = %g m: must exceed size.min = %g m", sz.Max, sz.Min)
		}
		if !(sz.Exponent > 0) || math.IsInf(sz.Exponent, 0) {
			return nil, fmt.Errorf("size.exponent = %g: must be > 0 and finite", sz.Exponent)
		}
		return PowerLaw{Min: sz.Min, Max: sz.Max, D: sz.Exponent}, nil
	case "lognormal":
		if err := pos("mean", sz.Mean); err != nil {
			return nil, err
		}
		if err := pos("std_dev", sz.StdDev); err != nil {
			return nil, err
		}
		return NewLogNormal(sz.Mean, sz.StdDev), nil
	case "exponential":
		if err := pos("mean", sz.Mean); err != nil {
			return nil, err
		}
		return Exponential{Mean: sz.Mean}, nil
	}
	return nil, fmt.Errorf("size.distribution = %q: must be constant, power_law, lognormal or exponential", sz.Distribution)
}
