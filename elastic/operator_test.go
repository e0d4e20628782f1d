package elastic

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// work returns Σ_i W_i (Δσn^A_i w^B_i − Δτ^A_i s^B_i): the work of the
// tractions of loading A on the discontinuities of loading B, (−Δτ, Δσn)
// being the work-conjugate of (s, w); W_i is the element's area, or its
// length in plane strain. It also returns the sum of the magnitudes of
// the terms, the scale of its round-off.
func work(m *model, tauA, snA, sB, wB []float64) (sum, scale float64) {
	for i := range tauA {
		term := m.weight(i) * (snA[i]*wB[i] - tauA[i]*sB[i])
		sum += term
		scale += math.Abs(m.weight(i) * snA[i] * wB[i])
		scale += math.Abs(m.weight(i) * tauA[i] * sB[i])
	}
	return sum, scale
}

// apply returns the tractions of op for slip s and opening w.
func apply(op Operator, s, w []float64) (tau, sn []float64) {
	tau, sn = make([]float64, len(s)), make([]float64, len(s))
	op.MulVecTo(tau, sn, s, w)
	return tau, sn
}

// TestReciprocity checks the Maxwell–Betti reciprocal theorem (Betti
// 1872) on a random DFN-like network with varied heights: the work of
// loading A's tractions on loading B's discontinuities equals that of B
// on A, to 1e-10 relative, with and without the height correction. It
// also shows that the raw collocation coefficients are not reciprocal
// (so the test can fail), which is why the operator averages them.
func TestReciprocity(t *testing.T) {
	el := dfnElements(networkSettings{elements: 400, seed: 3, varied: true})
	r := rand.New(rand.NewPCG(1, 2))
	sA, wA := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	sB, wB := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	for _, s := range []Settings{{}, {PlaneStrain: true}} {
		d := mustDense(t, el, s)
		rs, _ := s.resolved()
		m := newModel(el, rock, rs)
		tauA, snA := apply(d, sA, wA)
		tauB, snB := apply(d, sB, wB)
		ab, scale := work(m, tauA, snA, sB, wB)
		ba, _ := work(m, tauB, snB, sA, wA)
		const tol = 1e-10 // round-off of sums of N² terms, relative to their magnitudes
		numtest.Abs(t, "work of A on B − work of B on A", ab-ba, 0, tol*scale)

		raw := &Dense{n: len(el), a: make([]Block, len(el)*len(el)), workers: 1}
		for i := range el {
			for j := range el {
				b := m.k.collocation(&m.geo[i], &m.geo[j])
				f := 1.0
				if !m.plain && i != j {
					gi, gj := &m.geo[i], &m.geo[j]
					f = HeightFactor(r2.Norm(r2.Sub(gi.c, gj.c)), gi.sh*gj.sh, m.alpha, m.beta) * gj.sh / gi.sh
				}
				raw.a[i*len(el)+j] = Block{ShearSlip: f * b.ShearSlip, ShearOpening: f * b.ShearOpening,
					NormalSlip: f * b.NormalSlip, NormalOpening: f * b.NormalOpening}
			}
		}
		tauA, snA = apply(raw, sA, wA)
		tauB, snB = apply(raw, sB, wB)
		ab, scale = work(m, tauA, snA, sB, wB)
		ba, _ = work(m, tauB, snB, sA, wA)
		if math.Abs(ab-ba) < 1e3*tol*scale {
			t.Errorf("raw collocation: work difference %g of scale %g: expected it not to be reciprocal", ab-ba, scale)
		}
	}
}

// TestEnergy checks Clapeyron's theorem on a random network: the work
// done by the tractions along a curved loading path from rest,
// ∫ Σ W (Δσn dw − Δτ ds), equals the elastic energy at its end,
// U = ½ Σ W (Δσn w − Δτ s), to 1e-8 relative, which holds only for a
// reciprocal operator; and U > 0 (the operator is positive definite in
// the energy norm). The path D(λ) = λ D₁ + λ² (D − D₁) makes the
// integrand a cubic in λ, integrated exactly by 3-point Gauss–Legendre.
func TestEnergy(t *testing.T) {
	el := dfnElements(networkSettings{elements: 400, seed: 4, varied: true})
	r := rand.New(rand.NewPCG(3, 4))
	s1, w1 := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	for _, set := range []Settings{{}, {PlaneStrain: true}} {
		d := mustDense(t, el, set)
		rs, _ := set.resolved()
		m := newModel(el, rock, rs)
		at := func(lambda float64, d1, d2 []float64) []float64 {
			out := make([]float64, len(d1))
			for i := range out {
				out[i] = lambda*d1[i] + lambda*lambda*(d2[i]-d1[i])
			}
			return out
		}
		rate := func(lambda float64, d1, d2 []float64) []float64 {
			out := make([]float64, len(d1))
			for i := range out {
				out[i] = d1[i] + 2*lambda*(d2[i]-d1[i])
			}
			return out
		}
		// Gauss–Legendre on [0, 1], 3 points (Abramowitz & Stegun 1964, 25.4.29).
		nodes := []float64{0.5 - 0.5*math.Sqrt(0.6), 0.5, 0.5 + 0.5*math.Sqrt(0.6)}
		weights := []float64{5.0 / 18, 8.0 / 18, 5.0 / 18}
		done := 0.0
		for q, lambda := range nodes {
			tau, sn := apply(d, at(lambda, s1, s), at(lambda, w1, w))
			dw, _ := work(m, tau, sn, rate(lambda, s1, s), rate(lambda, w1, w))
			done += weights[q] * dw
		}
		tau, sn := apply(d, s, w)
		twice, _ := work(m, tau, sn, s, w)
		numtest.Rel(t, "work along the path vs ½ Σ W t·D", done, twice/2, 1e-8)
		if !(twice > 0) {
			t.Errorf("energy %g, want > 0", twice/2)
		}
	}
}
