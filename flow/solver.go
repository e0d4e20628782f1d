package flow

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
)

// Method selects how a LinearSolver solves A x = b.
type Method int

const (
	// Auto uses Cholesky unless the factor would hold more than
	// Settings.MaxFactorEntries entries (known after the symbolic
	// analysis); then it uses CGIC0.
	Auto Method = iota
	// Cholesky is the sparse direct factorization P A Pᵀ = L Lᵀ with an
	// approximate minimum degree ordering.
	Cholesky
	// CGJacobi is conjugate gradients preconditioned by diag(A).
	CGJacobi
	// CGIC0 is conjugate gradients preconditioned by the incomplete
	// Cholesky factorization with no fill.
	CGIC0
)

func (m Method) String() string {
	switch m {
	case Auto:
		return "Auto"
	case Cholesky:
		return "Cholesky"
	case CGJacobi:
		return "CGJacobi"
	case CGIC0:
		return "CGIC0"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// Status is the outcome of a solve.
type Status int

const (
	// NotTerminated means no solve has finished.
	NotTerminated Status = iota
	// Success means the relative residual is at most Settings.Tol.
	Success
	// IterationLimit means the iterations (or, for Cholesky, the
	// refinement steps) ran out before the residual reached Settings.Tol.
	IterationLimit
	// Failure means the method broke down: the matrix is not positive
	// definite or the data are not finite.
	Failure
)

func (s Status) String() string {
	switch s {
	case NotTerminated:
		return "NotTerminated"
	case Success:
		return "Success"
	case IterationLimit:
		return "IterationLimit"
	case Failure:
		return "Failure"
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// ErrNotConverged is returned (wrapped, with the residual reached) when a
// solve ends with Status IterationLimit.
var ErrNotConverged = errors.New("flow: linear solver did not converge")

const (
	// DefaultTol is the relative residual target when Settings.Tol is 0.
	DefaultTol = 1e-8
	// DefaultMaxIter is the iteration limit when Settings.MaxIter is 0.
	DefaultMaxIter = 10000
	// DefaultMaxFactorEntries is the budget on nnz(L) for Auto when
	// Settings.MaxFactorEntries is 0: 2·10⁸ entries, about 2.4 GB of
	// values and row indices.
	DefaultMaxFactorEntries = 200_000_000
	// maxRefinements caps the iterative refinement steps after a direct
	// solve (one or two suffice unless A is nearly singular; Higham 2002,
	// §12.1).
	maxRefinements = 3
)

// Settings configures a LinearSolver. The zero value is usable.
type Settings struct {
	// Method is the solver; Auto by default.
	Method Method
	// Tol is the target relative residual ‖b − A x‖₂ / ‖b‖₂, in (0, 1);
	// 0 means DefaultTol. Iterative methods iterate until they reach it;
	// the direct method refines its solution when it does not.
	Tol float64
	// MaxIter limits the conjugate-gradient iterations of one solve;
	// 0 means DefaultMaxIter.
	MaxIter int
	// MaxFactorEntries is Auto's budget on the entries of the Cholesky
	// factor L; 0 means DefaultMaxFactorEntries.
	MaxFactorEntries int
	// WarmStart makes the iterative methods start from the contents of
	// dst instead of zero (a previous solution is a good start).
	WarmStart bool
}

// Result describes a finished solve.
type Result struct {
	// Status is the outcome.
	Status Status
	// Iterations is the number of conjugate-gradient iterations, or for
	// Cholesky the number of triangular solve pairs (1 plus refinements).
	Iterations int
	// Residual is the relative residual ‖b − A x‖₂ / ‖b‖₂ of the returned
	// solution, computed from A (not from a recurrence).
	Residual float64
}

// LinearSolver solves A x = b for a symmetric positive definite A whose
// sparsity pattern is fixed: Analyze once per pattern, then Factor for
// each new set of values and Solve for each right-hand side. Factor and
// Solve do not allocate. A LinearSolver is not safe for concurrent use.
type LinearSolver struct {
	settings Settings
	method   Method
	pattern  *CSR
	nnzL     int
	chol     *cholesky
	pcg      *pcgSystem
	factored bool
	b, x, r  []float64 // permuted work vectors of the direct method
}

// Analyze checks the pattern of a, resolves the settings' defaults and
// does the work that depends on the pattern only: the ordering and the
// symbolic factorization for Cholesky, the renumbering and the
// preconditioner's structure for the iterative methods. The values of a
// are not used.
func Analyze(a *CSR, s Settings) (*LinearSolver, error) {
	if err := a.Validate(); err != nil {
		return nil, err
	}
	if err := a.checkSymmetricPattern(); err != nil {
		return nil, err
	}
	if err := s.resolve(); err != nil {
		return nil, err
	}
	ls := &LinearSolver{settings: s, method: s.Method, pattern: a}
	switch s.Method {
	case Auto, Cholesky:
		o := orderCholesky(a)
		ls.nnzL = o.nnzL
		if s.Method == Auto && o.nnzL > s.MaxFactorEntries {
			ls.method = CGIC0
			ls.pcg = newPCGSystem(a, true)
			break
		}
		ls.method = Cholesky
		ls.chol = newCholesky(a, o)
		ls.b, ls.x, ls.r = make([]float64, a.N), make([]float64, a.N), make([]float64, a.N)
	case CGJacobi, CGIC0:
		ls.pcg = newPCGSystem(a, s.Method == CGIC0)
	}
	return ls, nil
}

// resolve checks the settings and fills in the defaults.
func (s *Settings) resolve() error {
	if s.Method < Auto || s.Method > CGIC0 {
		return fmt.Errorf("flow: solver method %v: must be Auto, Cholesky, CGJacobi or CGIC0", s.Method)
	}
	if s.Tol == 0 {
		s.Tol = DefaultTol
	}
	if !(s.Tol > 0 && s.Tol < 1) {
		return fmt.Errorf("flow: solver tolerance %g: must lie in (0, 1)", s.Tol)
	}
	if s.MaxIter == 0 {
		s.MaxIter = DefaultMaxIter
	}
	if s.MaxIter < 0 {
		return fmt.Errorf("flow: solver iteration limit %d: must be ≥ 0", s.MaxIter)
	}
	if s.MaxFactorEntries == 0 {
		s.MaxFactorEntries = DefaultMaxFactorEntries
	}
	if s.MaxFactorEntries < 0 {
		return fmt.Errorf("flow: factor entry budget %d: must be ≥ 0", s.MaxFactorEntries)
	}
	return nil
}

// Method returns the method in use (never Auto).
func (ls *LinearSolver) Method() Method { return ls.method }

// Settings returns the settings with defaults filled in.
func (ls *LinearSolver) Settings() Settings { return ls.settings }

// CholeskyEntries returns the number of entries of the Cholesky factor L
// (diagonal included) predicted by the symbolic analysis, or 0 when the
// method was chosen without that analysis (CGJacobi, CGIC0).
func (ls *LinearSolver) CholeskyEntries() int { return ls.nnzL }

// Factor takes the values of a, which must have the analysed pattern, and
// factorizes (Cholesky) or sets up the preconditioner (CG). It returns an
// error wrapping ErrNotPositiveDefinite when a pivot or a diagonal entry
// is not positive. Later changes to a do not affect Solve.
func (ls *LinearSolver) Factor(a *CSR) error {
	if !samePattern(ls.pattern, a) {
		return errors.New("flow: matrix pattern differs from the analysed one: call Analyze again")
	}
	ls.factored = false
	var err error
	if ls.chol != nil {
		err = ls.chol.factor(a.Val)
	} else {
		err = ls.pcg.setValues(a.Val)
	}
	if err != nil {
		return err
	}
	ls.factored = true
	return nil
}

// Solve computes dst ≈ A⁻¹ b for the matrix of the last successful
// Factor. It returns an error wrapping ErrNotConverged when the residual
// target is not reached (dst then holds the last iterate), or wrapping
// ErrNotPositiveDefinite on a breakdown. dst and b must have length N and
// must not overlap.
func (ls *LinearSolver) Solve(dst, b []float64) (Result, error) {
	n := ls.pattern.N
	if len(dst) != n || len(b) != n {
		panic("flow: dimension mismatch")
	}
	if !ls.factored {
		panic("flow: Solve before a successful Factor")
	}
	for i, v := range b {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Result{Status: Failure}, fmt.Errorf("flow: right-hand side b[%d] = %g: must be finite", i, v)
		}
	}
	var (
		res Result
		err error
	)
	if ls.chol != nil {
		res, err = ls.solveDirect(dst, b)
	} else {
		res, err = ls.solveIterative(dst, b)
	}
	if err == nil && (math.IsNaN(res.Residual) || math.IsInf(res.Residual, 0)) {
		res.Status = Failure
		err = errors.New("flow: solution is not finite: the system overflows")
	}
	return res, err
}

// solveDirect solves with the Cholesky factor, then refines while the
// residual exceeds the target: r = b − A x, x += (L Lᵀ)⁻¹ r.
func (ls *LinearSolver) solveDirect(dst, b []float64) (Result, error) {
	c := ls.chol
	bp, x, r := ls.b, ls.x, ls.r
	for k, p := range c.perm {
		bp[k] = b[p]
	}
	res := Result{Status: Success}
	bnorm := floats.Norm(bp, 2)
	if bnorm == 0 {
		clear(dst)
		return res, nil
	}
	copy(x, bp)
	c.solveInPlace(x)
	res.Iterations = 1
	res.Residual = c.residual(r, bp, x) / bnorm
	for res.Residual > ls.settings.Tol && res.Iterations <= maxRefinements {
		c.solveInPlace(r)
		floats.Add(x, r)
		res.Iterations++
		res.Residual = c.residual(r, bp, x) / bnorm
	}
	for k, p := range c.perm {
		dst[p] = x[k]
	}
	if res.Residual > ls.settings.Tol {
		res.Status = IterationLimit
		return res, fmt.Errorf("%w: relative residual %.3g after %d refinement steps, want %.3g",
			ErrNotConverged, res.Residual, maxRefinements, ls.settings.Tol)
	}
	return res, nil
}

// solveIterative runs PCG in the renumbered space.
func (ls *LinearSolver) solveIterative(dst, b []float64) (Result, error) {
	s := ls.pcg
	for k, p := range s.perm {
		s.b[k] = b[p]
		if ls.settings.WarmStart {
			s.x[k] = dst[p]
		} else {
			s.x[k] = 0
		}
	}
	res, err := s.solve(s.b, ls.settings.Tol, ls.settings.MaxIter)
	for k, p := range s.perm {
		dst[p] = s.x[k]
	}
	return res, err
}
