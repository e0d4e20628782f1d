package mechanics

import "math"

// SlipFrontFactor returns λ, the position of the slip front of a
// plane-strain fault of constant friction under a line source held at a
// pressure Δp above the initial pore pressure, in units of the diffusion
// length √(4αt): the front a = λ√(4αt) is where the stress intensity
// vanishes,
//
//	T = (μσn′ − τ0)/(μΔp) = (2/π) ∫₀^{π/2} erfc(λ sin θ) dθ
//
// (Bhattacharya & Viesca 2019; Viesca 2021; docs/references.md §15). T must
// lie in (0, 1): at T ≥ 1 the fault does not slip and as T → 0 the front
// runs ahead without bound. λ is found by bisection to 1e-12, the integral
// by the midpoint rule on 4000 intervals (error below 1e-7 in T); NaN for
// T outside (0, 1).
func SlipFrontFactor(T float64) float64 {
	if !(T > 0 && T < 1) {
		return math.NaN()
	}
	lo, hi := 0.0, 1.0
	for frontIntegral(hi) > T {
		hi *= 2
	}
	for hi-lo > 1e-12*hi {
		if mid := (lo + hi) / 2; frontIntegral(mid) > T {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// frontIntegral is (2/π) ∫₀^{π/2} erfc(λ sin θ) dθ, which falls from 1 at
// λ = 0 towards 0.
func frontIntegral(lambda float64) float64 {
	const m = 4000
	var s float64
	for k := range m {
		s += math.Erfc(lambda * math.Sin((float64(k)+0.5)*math.Pi/2/m))
	}
	return s / m
}
