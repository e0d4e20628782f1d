package elastic

import (
	"math"
	"testing"

	"slipfront/internal/numtest"
)

// TestHeightFactor checks Olson's (2004) factor F = 1 − d^β/[d² +
// (h/α)²]^{β/2} with β = 2.3, α = 1 (constants from memory) at tabulated
// ratios d/h (values computed from the formula, to the 7 decimals
// given), its limits F(0) = 1 and F ≈ (β/2)(h/d)² far away, and that it
// falls monotonically.
func TestHeightFactor(t *testing.T) {
	for _, tc := range []struct{ dh, want float64 }{
		{0, 1}, {0.5, 0.8428970}, {1, 0.5493748}, {2, 0.2263340}, {5, 0.0441018},
	} {
		numtest.Abs(t, "F", HeightFactor(tc.dh*20, 20, OlsonAlpha, OlsonBeta), tc.want, 5e-8)
	}
	d := 1e4
	numtest.Rel(t, "F far away", HeightFactor(d, 1, OlsonAlpha, OlsonBeta), OlsonBeta/2/(d*d), 1e-7)
	prev := 1.0
	for d := 0.01; d < 100; d *= 1.1 {
		f := HeightFactor(d, 1, OlsonAlpha, OlsonBeta)
		if !(f < prev && f > 0) {
			t.Fatalf("F(%g) = %g after %g: want decreasing and positive", d, f, prev)
		}
		prev = f
	}
}

// longCrackLimit is the opening at the centre of a long crack (c ≫ h)
// under net pressure p with the corrected kernel, over (1−ν)ph/G:
// π/I(β), I(β) = (√π/2) Γ((β−1)/2)/Γ(β/2) (derived for this project from
// the corrected kernel, not published).
func longCrackLimit(beta float64) float64 {
	lg := func(x float64) float64 { v, _ := math.Lgamma(x); return v }
	return math.Pi / (math.Sqrt(math.Pi) / 2 * math.Exp(lg((beta-1)/2)-lg(beta/2)))
}

// TestHeightCorrectedCrack reproduces the opening at the centre of a
// pressurised crack of height h = 1 m with the corrected kernel (N = 100
// equal elements, p = 1 MPa, G = 30 GPa, ν = 0.25) for c/h = 0.5 … 10,
// as w/((1−ν)ph/G) — values derived by an independent script of the
// same formulation (not published; 6 decimals given) — and checks that a
// longer crack approaches the derived limit π/I(β) ≈ 2.3884718: about
// 2.4 times the plane-strain width (1−ν)ph/G of a cross-section of
// height h, a caution on absolute widths (see the package doc).
func TestHeightCorrectedCrack(t *testing.T) {
	numtest.Abs(t, "π/I(2.3)", longCrackLimit(OlsonBeta), 2.3884718, 5e-8)
	numtest.Abs(t, "I(2.3)", math.Pi/longCrackLimit(OlsonBeta), 1.3153150, 5e-8)
	const h = 1.0
	scale := (1 - rock.PoissonRatio) * pressure * h / rock.ShearModulus
	for _, tc := range []struct{ ch, want float64 }{
		{0.5, 0.939426}, {1, 1.578817}, {2, 2.129667}, {10, 2.353157},
	} {
		const n = 100
		el := straightCrack(n, tc.ch*h, 0, h)
		_, w := solveTractions(t, mustDense(t, el, Settings{}), constant(n, 0), constant(n, pressure))
		numtest.Abs(t, "w_centre/((1−ν)ph/G)", w[n/2]/scale, tc.want, 5e-7)
	}
	const n = 800
	el := straightCrack(n, 40*h, 0, h)
	_, w := solveTractions(t, mustDense(t, el, Settings{}), constant(n, 0), constant(n, pressure))
	// c/h = 40 with elements of 0.1 h: within 1 % of the limit.
	numtest.Rel(t, "w_centre at c/h = 40 vs limit", w[n/2]/scale, longCrackLimit(OlsonBeta), 0.01)
}
