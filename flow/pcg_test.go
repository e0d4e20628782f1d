package flow

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats"

	"slipfront/internal/numtest"
)

// kershaw is the 4 × 4 SPD matrix of Kershaw (1978, J. Comput. Phys. 26,
// 43–65, from memory) on which the incomplete Cholesky factorization
// with no fill breaks down: by hand, in the natural order,
// L00 = √3, L11² = 5/3, L22² = 3/5, and L33² = 3 − 4/3 − 20/3 = −5 < 0,
// while the matrix is SPD (the test checks with a dense Cholesky).
func kershaw() *CSR {
	as, err := NewAssembler(4, [][2]int{{0, 1}, {1, 2}, {2, 3}, {0, 3}})
	if err != nil {
		panic(err)
	}
	a := as.Matrix()
	set := func(i, j int, v float64) { a.Val[as.position(i, j)] = v }
	for i := range 4 {
		set(i, i, 3)
	}
	for _, e := range [][3]float64{{0, 1, -2}, {1, 2, -2}, {2, 3, -2}, {0, 3, 2}} {
		set(int(e[0]), int(e[1]), e[2])
		set(int(e[1]), int(e[0]), e[2])
	}
	return a
}

func TestIC0BreakdownIsShifted(t *testing.T) {
	a := kershaw()
	// The matrix is SPD: dense Cholesky succeeds.
	b := []float64{1, 2, 3, 4}
	want, kappa := denseReference(t, a, b)

	identity := []int32{0, 1, 2, 3}
	sys := &pcgSystem{n: 4, perm: identity, c: permutedPattern(a, identity, identity), val: a.Val, diag: make([]int, 4)}
	for i := range 4 {
		sys.diag[i] = positionOf(a, i, i)
	}
	f := newIC0(sys.c, identity)
	if row, ok := f.factor(sys.val, sys.diag, 0); ok || row != 3 {
		t.Fatalf("unshifted IC(0) of Kershaw's matrix: ok = %v at row %d, want breakdown at row 3", ok, row)
	}
	if err := f.setup(sys); err != nil {
		t.Fatal(err)
	}
	if !(f.shift > 0) {
		t.Errorf("shift %g after a breakdown, want > 0", f.shift)
	}

	// Through the public solver the system is still solved exactly.
	ls, err := Analyze(a, Settings{Method: CGIC0, Tol: solveTol})
	if err != nil {
		t.Fatal(err)
	}
	if err := ls.Factor(a); err != nil {
		t.Fatal(err)
	}
	got := make([]float64, 4)
	res, err := ls.Solve(got, b)
	if err != nil {
		t.Fatal(err)
	}
	rho := relResidual(a, got, b)
	for i := range got {
		numtest.Abs(t, "x_i", got[i], want[i], solutionTol(kappa, rho, 4)*floats.Norm(want, 2))
	}
	if res.Iterations > 4 {
		t.Errorf("%d iterations on a 4 × 4 system, want ≤ 4 (CG terminates in n steps in exact arithmetic; Hestenes & Stiefel 1952)", res.Iterations)
	}
}

func positionOf(a *CSR, i, j int) int {
	for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
		if a.ColIdx[p] == j {
			return p
		}
	}
	panic("flow test: entry not stored")
}

func TestIC0IsExactWithoutFill(t *testing.T) {
	// A chain's Cholesky factor has no fill, so IC(0) is the exact factor
	// and PCG converges in one iteration (the preconditioned matrix is
	// the identity).
	sys := chainSystem(400, 1e-3, rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	ls := mustFactor(t, a, Settings{Method: CGIC0, Tol: solveTol})
	x := make([]float64, a.N)
	res, err := ls.Solve(x, sys.rhs)
	if err != nil {
		t.Fatal(err)
	}
	if res.Iterations != 1 {
		t.Errorf("%d iterations, want 1", res.Iterations)
	}
}

func mustFactor(t *testing.T, a *CSR, s Settings) *LinearSolver {
	t.Helper()
	ls, err := Analyze(a, s)
	if err != nil {
		t.Fatal(err)
	}
	if err := ls.Factor(a); err != nil {
		t.Fatal(err)
	}
	return ls
}

func TestIterationLimit(t *testing.T) {
	sys := newNetwork(defaultNetwork(1000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	for _, m := range []Method{CGJacobi, CGIC0} {
		ls := mustFactor(t, a, Settings{Method: m, MaxIter: 3})
		x := make([]float64, a.N)
		res, err := ls.Solve(x, sys.rhs)
		if !errors.Is(err, ErrNotConverged) {
			t.Errorf("%v: error %v, want ErrNotConverged", m, err)
		}
		if res.Status != IterationLimit || res.Iterations != 3 {
			t.Errorf("%v: status %v after %d iterations, want IterationLimit after 3", m, res.Status, res.Iterations)
		}
		// The reported residual belongs to the returned iterate.
		numtest.Abs(t, "reported residual", res.Residual, relResidual(a, x, sys.rhs), 2*residualRoundoff(a, x, sys.rhs))
	}
}

func TestWarmStartFromSolution(t *testing.T) {
	sys := newNetwork(defaultNetwork(1000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	ls := mustFactor(t, a, Settings{Method: CGIC0, WarmStart: true})
	x := make([]float64, a.N)
	if _, err := ls.Solve(x, sys.rhs); err != nil {
		t.Fatal(err)
	}
	res, err := ls.Solve(x, sys.rhs)
	if err != nil {
		t.Fatal(err)
	}
	if res.Iterations != 0 {
		t.Errorf("restart from the solution took %d iterations, want 0", res.Iterations)
	}
}

func TestNotPositiveDefinite(t *testing.T) {
	// [1 2; 2 1] has eigenvalues 3 and −1: indefinite. The Cholesky pivot
	// 1 − 4 = −3 fails; CG meets pᵀAp = −2 < 0 on b = (1, −1) with
	// Jacobi (p = b); IC(0) needs a shift α > 1 ((1+α)² > 4) and then CG
	// meets the negative curvature.
	as, err := NewAssembler(2, [][2]int{{0, 1}})
	if err != nil {
		t.Fatal(err)
	}
	as.AddDiagonal(0, 3)
	as.AddDiagonal(1, 3)
	as.AddConnection(0, -2)
	a := as.Matrix()
	b := []float64{1, -1}
	for _, m := range []Method{Cholesky, CGJacobi, CGIC0} {
		ls, err := Analyze(a, Settings{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		err = ls.Factor(a)
		if err == nil {
			_, err = ls.Solve(make([]float64, 2), b)
		}
		if !errors.Is(err, ErrNotPositiveDefinite) {
			t.Errorf("%v: error %v, want ErrNotPositiveDefinite", m, err)
		}
	}
	// A non-positive diagonal is caught at Factor by every method.
	as.AddDiagonal(1, -10)
	for _, m := range []Method{Cholesky, CGJacobi, CGIC0} {
		ls, err := Analyze(a, Settings{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		if err := ls.Factor(a); !errors.Is(err, ErrNotPositiveDefinite) {
			t.Errorf("%v: negative diagonal: error %v, want ErrNotPositiveDefinite", m, err)
		}
	}
}

func TestAutoRespectsFactorBudget(t *testing.T) {
	sys := newNetwork(defaultNetwork(1000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	ls, err := Analyze(a, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if ls.Method() != Cholesky {
		t.Errorf("default budget: method %v, want Cholesky", ls.Method())
	}
	got := ls.Settings()
	numtest.Abs(t, "default Tol", got.Tol, DefaultTol, 0)
	if got.MaxIter != DefaultMaxIter || got.MaxFactorEntries != DefaultMaxFactorEntries {
		t.Errorf("defaults not filled in: %+v", got)
	}
	nnzL := ls.CholeskyEntries()
	ls, err = Analyze(a, Settings{MaxFactorEntries: nnzL - 1})
	if err != nil {
		t.Fatal(err)
	}
	if ls.Method() != CGIC0 {
		t.Errorf("budget nnz(L) − 1: method %v, want CGIC0", ls.Method())
	}
	if err := ls.Factor(a); err != nil {
		t.Fatal(err)
	}
	x := make([]float64, a.N)
	if res, err := ls.Solve(x, sys.rhs); err != nil || res.Residual > DefaultTol {
		t.Errorf("Auto → CGIC0: %v, residual %g", err, res.Residual)
	}
}

func TestRefactorWithNewValues(t *testing.T) {
	// A Picard iteration keeps the pattern and changes the values: each
	// Factor must use the new values only.
	rng := rand.New(rand.NewPCG(1, 2))
	sys := newNetwork(defaultNetwork(300), rng)
	as := sys.assembler()
	a := as.Matrix()
	for _, m := range []Method{Cholesky, CGJacobi, CGIC0} {
		ls, err := Analyze(a, Settings{Method: m, Tol: solveTol})
		if err != nil {
			t.Fatal(err)
		}
		for it := range 3 {
			for k := range sys.trans {
				sys.trans[k] *= 0.5 + rng.Float64()
			}
			sys.fill(as)
			if err := ls.Factor(a); err != nil {
				t.Fatal(err)
			}
			want, kappa := denseReference(t, a, sys.rhs)
			got := make([]float64, a.N)
			if _, err := ls.Solve(got, sys.rhs); err != nil {
				t.Fatal(err)
			}
			floats.Sub(got, want)
			rel := floats.Norm(got, 2) / floats.Norm(want, 2)
			if tol := solutionTol(kappa, solveTol, a.N); rel > tol {
				t.Errorf("%v, step %d: relative error %.3g > %.3g", m, it, rel, tol)
			}
		}
	}
}

func TestFactorSolveDoNotAllocate(t *testing.T) {
	sys := newNetwork(defaultNetwork(2000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	x := make([]float64, a.N)
	for _, m := range []Method{Cholesky, CGJacobi, CGIC0} {
		ls := mustFactor(t, a, Settings{Method: m})
		allocs := testing.AllocsPerRun(3, func() {
			if err := ls.Factor(a); err != nil {
				t.Fatal(err)
			}
			if _, err := ls.Solve(x, sys.rhs); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("%v: Factor+Solve allocate %v times, want 0", m, allocs)
		}
	}
}

func TestSolveSpecialRightHandSides(t *testing.T) {
	sys := newNetwork(defaultNetwork(200), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	for _, m := range []Method{Cholesky, CGJacobi, CGIC0} {
		ls := mustFactor(t, a, Settings{Method: m})
		x := make([]float64, a.N)
		for i := range x {
			x[i] = 7
		}
		res, err := ls.Solve(x, make([]float64, a.N))
		if err != nil || res.Status != Success {
			t.Errorf("%v, b = 0: status %v, error %v", m, res.Status, err)
		}
		if floats.Norm(x, math.Inf(1)) != 0 {
			t.Errorf("%v, b = 0: x ≠ 0", m)
		}
		b := make([]float64, a.N)
		b[3] = math.NaN()
		res, err = ls.Solve(x, b)
		if err == nil || res.Status != Failure {
			t.Errorf("%v, b with NaN: status %v, error %v; want Failure and an error", m, res.Status, err)
		}
	}
}

func TestAnalyzeAndFactorErrors(t *testing.T) {
	sys := newNetwork(defaultNetwork(100), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	tests := []struct {
		name string
		s    Settings
		want string
	}{
		{"negative tolerance", Settings{Tol: -1}, "tolerance -1"},
		{"tolerance one", Settings{Tol: 1}, "tolerance 1"},
		{"negative iterations", Settings{MaxIter: -5}, "iteration limit -5"},
		{"negative budget", Settings{MaxFactorEntries: -1}, "budget -1"},
		{"unknown method", Settings{Method: 9}, "Method(9)"},
	}
	for _, tt := range tests {
		if _, err := Analyze(a, tt.s); err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: error %v, want one containing %q", tt.name, err, tt.want)
		}
	}
	// Asymmetric pattern and missing diagonal.
	asym := &CSR{N: 2, RowPtr: []int{0, 2, 3}, ColIdx: []int{0, 1, 1}, Val: []float64{1, 1, 1}}
	if _, err := Analyze(asym, Settings{}); err == nil || !strings.Contains(err.Error(), "(0, 1) is stored but (1, 0) is not") {
		t.Errorf("asymmetric pattern: error %v", err)
	}
	noDiag := &CSR{N: 2, RowPtr: []int{0, 1, 2}, ColIdx: []int{1, 0}, Val: []float64{1, 1}}
	if _, err := Analyze(noDiag, Settings{}); err == nil || !strings.Contains(err.Error(), "diagonal entry (0, 0)") {
		t.Errorf("missing diagonal: error %v", err)
	}
	// Factor with another pattern.
	ls, err := Analyze(a, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	other := newNetwork(defaultNetwork(100), rand.New(rand.NewPCG(3, 4))).assembler().Matrix()
	if err := ls.Factor(other); err == nil || !strings.Contains(err.Error(), "pattern differs") {
		t.Errorf("other pattern: error %v", err)
	}
}

func ExampleSettings() {
	// A chain of 1000 unknowns solved by conjugate gradients with the
	// IC(0) preconditioner: for a chain IC(0) is exact (no fill), so one
	// iteration suffices.
	const n = 1000
	conns := make([][2]int, n-1)
	for i := range conns {
		conns[i] = [2]int{i, i + 1}
	}
	as, err := NewAssembler(n, conns)
	if err != nil {
		panic(err)
	}
	b := make([]float64, n)
	for i := range n {
		as.AddDiagonal(i, 1e-3)
		b[i] = 1e-3
	}
	for k := range conns {
		as.AddConnection(k, 1)
	}
	ls, err := Analyze(as.Matrix(), Settings{Method: CGIC0, Tol: 1e-10})
	if err != nil {
		panic(err)
	}
	if err := ls.Factor(as.Matrix()); err != nil {
		panic(err)
	}
	x := make([]float64, n)
	res, err := ls.Solve(x, b)
	if err != nil {
		panic(err)
	}
	// Rows sum to the storage, so x = 1 solves A x = b.
	fmt.Printf("%v after %d iteration(s); x[0] = %.9f, x[%d] = %.9f\n", res.Status, res.Iterations, x[0], n-1, x[n-1])
	// Output:
	// Success after 1 iteration(s); x[0] = 1.000000000, x[999] = 1.000000000
}

func TestCholeskyRefinement(t *testing.T) {
	// Asking for less than the direct solve's own residual triggers
	// iterative refinement r = b − A x, x += (L Lᵀ)⁻¹ r, which brings the
	// residual down to the rounding level of the residual computation
	// (Higham 2002, §12.1, from memory); asking for an unreachable 1e-20
	// ends in IterationLimit after all refinement steps.
	sys := newNetwork(defaultNetwork(2000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	x := make([]float64, a.N)

	plain := mustFactor(t, a, Settings{Method: Cholesky, Tol: 0.5})
	res0, err := plain.Solve(x, sys.rhs)
	if err != nil || res0.Iterations != 1 {
		t.Fatalf("loose tolerance: %v after %d solves, want success after 1", err, res0.Iterations)
	}

	refined := mustFactor(t, a, Settings{Method: Cholesky, Tol: 1e-20})
	res, err := refined.Solve(x, sys.rhs)
	if !errors.Is(err, ErrNotConverged) || res.Status != IterationLimit {
		t.Fatalf("tolerance 1e-20: status %v, error %v; want IterationLimit and ErrNotConverged", res.Status, err)
	}
	if res.Iterations != 1+maxRefinements {
		t.Errorf("%d solves, want %d", res.Iterations, 1+maxRefinements)
	}
	if res.Residual > res0.Residual {
		t.Errorf("refined residual %.3g exceeds the unrefined %.3g", res.Residual, res0.Residual)
	}
	numtest.Abs(t, "reported residual", res.Residual, relResidual(a, x, sys.rhs), 2*residualRoundoff(a, x, sys.rhs))
}
