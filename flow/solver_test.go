package flow

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"slipfront/internal/numtest"
)

// unitRoundoff is u = 2⁻⁵³ for float64.
const unitRoundoff = 0x1p-53

// solveTol is the relative residual asked of every solver in these tests:
// tighter than DefaultTol so that the comparison with the dense solution
// is meaningful.
const solveTol = 1e-10

// denseOf returns a as a dense symmetric matrix (lower triangle read).
func denseOf(a *CSR) *mat.SymDense {
	d := mat.NewSymDense(a.N, nil)
	for i := range a.N {
		for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
			if j := a.ColIdx[p]; j <= i {
				d.SetSym(i, j, a.Val[p])
			}
		}
	}
	return d
}

// denseReference solves A x = b with gonum's dense Cholesky and returns x
// and the 2-norm condition number κ₂ = λmax/λmin from the eigenvalues.
func denseReference(t *testing.T, a *CSR, b []float64) ([]float64, float64) {
	t.Helper()
	d := denseOf(a)
	var ch mat.Cholesky
	if ok := ch.Factorize(d); !ok {
		t.Fatal("dense Cholesky: matrix is not positive definite")
	}
	x := mat.NewVecDense(a.N, nil)
	if err := ch.SolveVecTo(x, mat.NewVecDense(a.N, b)); err != nil {
		t.Fatalf("dense Cholesky solve: %v", err)
	}
	var eig mat.EigenSym
	if ok := eig.Factorize(d, false); !ok {
		t.Fatal("dense eigenvalues did not converge")
	}
	ev := eig.Values(nil)
	return x.RawVector().Data, ev[len(ev)-1] / ev[0]
}

// relResidual returns ‖b − A x‖₂ / ‖b‖₂, computed here from the CSR
// matrix, independently of the solver's own figure.
func relResidual(a *CSR, x, b []float64) float64 {
	r := make([]float64, a.N)
	a.MulVecTo(r, x)
	floats.Sub(r, b)
	return floats.Norm(r, 2) / floats.Norm(b, 2)
}

// solutionTol bounds ‖x − x_ref‖₂ / ‖x_ref‖₂ for a solution x with
// relative residual rho and the dense Cholesky solution x_ref of an n × n
// system with condition number kappa: ‖x − x*‖/‖x*‖ ≤ κ₂ rho for any x
// (Higham 2002, Accuracy and Stability of Numerical Algorithms, Thm 7.2,
// from memory), and dense Cholesky is backward stable with
// |ΔA| ≤ γ_{3n+1} |Lᵀ||L|, γ_m = m u / (1 − m u) (Higham 2002, Thm 10.4,
// from memory), which bounds its forward error by about κ₂ γ_{3n+1}. The
// same backward bound covers the rounding of the computed residual.
func solutionTol(kappa, rho float64, n int) float64 {
	m := float64(3*n + 1)
	gamma := m * unitRoundoff / (1 - m*unitRoundoff)
	return kappa * (rho + 3*gamma)
}

// residualRoundoff bounds the rounding error of a computed relative
// residual: each component of b − A x carries an error of at most
// γ_{d+1} (|A||x| + |b|)_i for a row of d entries (Higham 2002, §3.5,
// from memory), so the relative residual is off by at most
// γ_{dmax+1} ‖|A||x| + |b|‖₂ / ‖b‖₂.
func residualRoundoff(a *CSR, x, b []float64) float64 {
	dmax := 0
	w := make([]float64, a.N)
	for i := range a.N {
		dmax = max(dmax, a.RowPtr[i+1]-a.RowPtr[i])
		s := math.Abs(b[i])
		for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
			s += math.Abs(a.Val[p] * x[a.ColIdx[p]])
		}
		w[i] = s
	}
	m := float64(dmax + 1)
	gamma := m * unitRoundoff / (1 - m*unitRoundoff)
	return gamma * floats.Norm(w, 2) / floats.Norm(b, 2)
}

// testCase is a named system for the solver comparisons.
type testCase struct {
	name string
	sys  *testSystem
}

// awkwardCases are the systems that stress the solvers' edge handling.
func awkwardCases() []testCase {
	rng := rand.New(rand.NewPCG(1, 2))
	var cases []testCase
	cases = append(cases, testCase{"network", newNetwork(defaultNetwork(400), rng)})

	// Disconnected clusters: two small networks, a chain, and unknowns
	// with storage only (no connection at all).
	isolated := &testSystem{n: 5, storage: []float64{1e-3, 2e-3, 5e-4, 1e-3, 3e-3}, rhs: []float64{1, -1, 0.5, 0, 2}}
	cases = append(cases, testCase{"disconnected clusters", merge(
		newNetwork(networkParams{unknowns: 120, perStick: 6, k: 4, sigma10: 0.5, storage: 1e-3}, rng),
		isolated,
		chainSystem(30, 1e-3, rng),
		newNetwork(networkParams{unknowns: 80, perStick: 8, k: 3, sigma10: 1, storage: 1e-2}, rng),
	)})

	cases = append(cases, testCase{"single unknown", &testSystem{n: 1, storage: []float64{2.5}, rhs: []float64{5}}})
	cases = append(cases, testCase{"long chain", chainSystem(600, 1e-3, rng)})

	// A star: unknown 0 (a well's bottom-hole pressure: no storage)
	// joined to 150 unknowns spread over 10 chains of 15.
	star := merge(&testSystem{n: 1, storage: []float64{0}, rhs: []float64{1}})
	for range 10 {
		star = merge(star, chainSystem(15, 1e-3, rng))
	}
	for i := 1; i < star.n; i++ {
		star.conns = append(star.conns, [2]int{0, i})
		star.trans = append(star.trans, 0.1*(0.5+rng.Float64()))
	}
	cases = append(cases, testCase{"star (well unknown)", star})

	// Zero storage on about half the rows of a connected network: still
	// SPD because each connected component keeps some storage (a
	// weighted graph Laplacian plus a non-negative diagonal that is
	// positive somewhere in every component is positive definite; common
	// practice, no source).
	zs := newNetwork(networkParams{unknowns: 300, perStick: 10, k: 8, sigma10: 0.5, storage: 1e-3}, rng)
	zeroed := 0
	for i := range zs.storage {
		if rng.IntN(2) == 0 && i%10 != 0 { // every 10th keeps its storage
			zs.storage[i] = 0
			zeroed++
		}
	}
	cases = append(cases, testCase{fmt.Sprintf("zero storage on %d rows", zeroed), zs})
	return cases
}

// mixedSignSPD returns a random sparse symmetric matrix with off-diagonal
// entries of both signs, made SPD by strict diagonal dominance
// (Gershgorin's theorem; Golub & Van Loan 2013, Thm 7.2.1, from memory):
// not an M-matrix, so it exercises the solvers beyond the flow systems.
func mixedSignSPD(n int, rng *rand.Rand) (*CSR, []float64) {
	var conns [][2]int
	for i := 1; i < n; i++ {
		conns = append(conns, [2]int{i - 1, i})
		for range 2 {
			conns = append(conns, [2]int{i, rng.IntN(i)})
		}
	}
	as, err := NewAssembler(n, conns)
	if err != nil {
		panic(err)
	}
	a := as.Matrix()
	for k := range conns {
		v := rng.Float64()*2 - 1
		a.Val[as.slots[k][2]] += v
		a.Val[as.slots[k][3]] += v
	}
	for i := range n {
		var s float64
		for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
			if a.ColIdx[p] != i {
				s += math.Abs(a.Val[p])
			}
		}
		a.Val[as.diag[i]] = s + 0.1
	}
	b := make([]float64, n)
	for i := range b {
		b[i] = rng.NormFloat64()
	}
	return a, b
}

func TestSolversMatchDenseCholesky(t *testing.T) {
	type system struct {
		name string
		a    *CSR
		b    []float64
	}
	var systems []system
	for _, c := range awkwardCases() {
		systems = append(systems, system{c.name, c.sys.assembler().Matrix(), c.sys.rhs})
	}
	a, b := mixedSignSPD(250, rand.New(rand.NewPCG(1, 2)))
	systems = append(systems, system{"mixed-sign SPD", a, b})

	for _, s := range systems {
		want, kappa := denseReference(t, s.a, s.b)
		for _, m := range []Method{Auto, Cholesky, CGJacobi, CGIC0} {
			t.Run(s.name+"/"+m.String(), func(t *testing.T) {
				ls, err := Analyze(s.a, Settings{Method: m, Tol: solveTol})
				if err != nil {
					t.Fatal(err)
				}
				if err := ls.Factor(s.a); err != nil {
					t.Fatal(err)
				}
				got := make([]float64, s.a.N)
				res, err := ls.Solve(got, s.b)
				if err != nil {
					t.Fatalf("%v (result %+v)", err, res)
				}
				if res.Status != Success {
					t.Errorf("status %v, want Success", res.Status)
				}
				rho := relResidual(s.a, got, s.b)
				if rho > solveTol {
					t.Errorf("relative residual %.3g > %.3g", rho, solveTol)
				}
				// The reported residual is the one computed here, up
				// to the rounding of two residual evaluations.
				numtest.Abs(t, "reported residual", res.Residual, rho, 2*residualRoundoff(s.a, got, s.b))
				diff := make([]float64, len(got))
				floats.SubTo(diff, got, want)
				relErr := floats.Norm(diff, 2) / floats.Norm(want, 2)
				if tol := solutionTol(kappa, rho, s.a.N); relErr > tol {
					t.Errorf("‖x − x_dense‖/‖x_dense‖ = %.3g > %.3g (κ₂ = %.3g)", relErr, tol, kappa)
				}
			})
		}
	}
}
