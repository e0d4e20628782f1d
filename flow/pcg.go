package flow

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
)

// Preconditioned conjugate gradients (Hestenes & Stiefel 1952; Saad 2003,
// Algorithm 9.1) on a copy of the matrix renumbered by reverse
// Cuthill–McKee, with a Jacobi or an incomplete Cholesky IC(0)
// preconditioner (Meijerink & van der Vorst 1977).

// pcgSystem is the renumbered matrix and the work vectors of the
// iterative solvers.
type pcgSystem struct {
	n    int
	perm []int32        // perm[k]: original unknown of new index k
	c    *sparsePattern // pattern of P A Pᵀ, full storage, with sources
	val  []float64      // values of P A Pᵀ, laid out as c.col
	diag []int          // position of each diagonal entry in val
	pre  preconditioner

	b, x, r, z, p, q []float64
}

// preconditioner applies M⁻¹ ≈ A⁻¹.
type preconditioner interface {
	// setup computes the preconditioner for the values of the system.
	setup(s *pcgSystem) error
	// apply computes dst = M⁻¹ r and returns r·dst.
	apply(dst, r []float64) float64
}

// newPCGSystem renumbers the pattern of a by reverse Cuthill–McKee and
// allocates the preconditioner (ic0 true for IC(0), else Jacobi).
func newPCGSystem(a *CSR, ic0 bool) *pcgSystem {
	n := a.N
	perm := rcmOrder(a)
	c := permutedPattern(a, perm, invertPerm(perm))
	s := &pcgSystem{
		n: n, perm: perm, c: c,
		val:  make([]float64, len(c.col)),
		diag: make([]int, n),
		b:    make([]float64, n), x: make([]float64, n), r: make([]float64, n),
		z: make([]float64, n), p: make([]float64, n), q: make([]float64, n),
	}
	for k := range n {
		for p := c.ptr[k]; p < c.ptr[k+1]; p++ {
			if c.col[p] == int32(k) {
				s.diag[k] = p
			}
		}
	}
	if ic0 {
		s.pre = newIC0(c, perm)
	} else {
		s.pre = &jacobi{inv: make([]float64, n)}
	}
	return s
}

// setValues copies the values of the original matrix into the renumbered
// one and sets up the preconditioner.
func (s *pcgSystem) setValues(val []float64) error {
	for p, from := range s.c.src {
		s.val[p] = val[from]
	}
	for k, p := range s.diag {
		if d := s.val[p]; !(d > 0) {
			return fmt.Errorf("%w: diagonal entry %g at unknown %d", ErrNotPositiveDefinite, d, s.perm[k])
		}
	}
	return s.pre.setup(s)
}

// mulDot computes q = A p and returns p·q in the same pass.
func (s *pcgSystem) mulDot(q, p []float64) float64 {
	ptr, col, val := s.c.ptr, s.c.col, s.val
	var pq float64
	for r := range q {
		lo, hi := ptr[r], ptr[r+1]
		cols := col[lo:hi]
		vals := val[lo:hi:hi]
		var sum float64
		for k, c := range cols {
			sum += vals[k] * p[c]
		}
		q[r] = sum
		pq += p[r] * sum
	}
	return pq
}

// residual sets r = b − A x and returns ‖r‖₂.
func (s *pcgSystem) residual(r, b, x []float64) float64 {
	ptr, col, val := s.c.ptr, s.c.col, s.val
	for i := range r {
		lo, hi := ptr[i], ptr[i+1]
		cols := col[lo:hi]
		vals := val[lo:hi:hi]
		sum := b[i]
		for k, c := range cols {
			sum -= vals[k] * x[c]
		}
		r[i] = sum
	}
	return floats.Norm(r, 2)
}

// updateIterate sets x += alpha p, r −= alpha q and returns r·r, in one
// pass over the four vectors.
func updateIterate(x, r, p, q []float64, alpha float64) float64 {
	var rr float64
	r = r[:len(x)]
	p = p[:len(x)]
	q = q[:len(x)]
	for i := range x {
		x[i] += alpha * p[i]
		ri := r[i] - alpha*q[i]
		r[i] = ri
		rr += ri * ri
	}
	return rr
}

// solve runs PCG on the renumbered system A x = b from the start in s.x,
// leaving the solution in s.x. Convergence is judged on the updated
// residual and confirmed on the true residual ‖b − A x‖ / ‖b‖, which the
// result reports; if rounding made the two drift apart, CG restarts from
// the true residual.
func (s *pcgSystem) solve(b []float64, tol float64, maxIter int) (Result, error) {
	x, r, z, p, q := s.x, s.r, s.z, s.p, s.q
	bnorm := floats.Norm(b, 2)
	if bnorm == 0 {
		clear(x)
		return Result{Status: Success}, nil
	}
	res := Result{Status: IterationLimit}
	res.Residual = s.residual(r, b, x) / bnorm
	// The updated residual is compared through its square, tol² ‖b‖².
	stop := tol * tol * bnorm * bnorm
	for res.Residual > tol && res.Iterations < maxIter {
		rz := s.pre.apply(z, r)
		copy(p, z)
		for res.Iterations < maxIter {
			res.Iterations++
			pq := s.mulDot(q, p)
			if !(pq > 0) {
				res.Status = Failure
				res.Residual = s.residual(r, b, x) / bnorm
				return res, fmt.Errorf("%w: pᵀAp = %g in conjugate gradients", ErrNotPositiveDefinite, pq)
			}
			alpha := rz / pq
			if rr := updateIterate(x, r, p, q, alpha); rr <= stop {
				break
			}
			rzNew := s.pre.apply(z, r)
			floats.AddScaledTo(p, z, rzNew/rz, p)
			rz = rzNew
		}
		res.Residual = s.residual(r, b, x) / bnorm
	}
	if res.Residual <= tol {
		res.Status = Success
		return res, nil
	}
	return res, fmt.Errorf("%w: relative residual %.3g after %d iterations, want %.3g",
		ErrNotConverged, res.Residual, res.Iterations, tol)
}

// jacobi is the diagonal preconditioner M = diag(A).
type jacobi struct{ inv []float64 }

func (j *jacobi) setup(s *pcgSystem) error {
	for i, p := range s.diag {
		j.inv[i] = 1 / s.val[p]
	}
	return nil
}

func (j *jacobi) apply(dst, r []float64) float64 {
	inv := j.inv[:len(dst)]
	r = r[:len(dst)]
	var rz float64
	for i := range dst {
		z := inv[i] * r[i]
		dst[i] = z
		rz += r[i] * z
	}
	return rz
}

// ic0 is the incomplete Cholesky factorization with no fill, M = L Lᵀ
// with L restricted to the pattern of A's lower triangle. It exists
// without breakdown for M-matrices (Meijerink & van der Vorst 1977), which
// the flow matrices are; for other SPD matrices a pivot can turn
// non-positive, and the factorization is retried on A + α diag(A) with α
// growing from 10⁻³ by factors of 4 (the shifted incomplete factorization
// of Manteuffel 1980).
type ic0 struct {
	rowPtr []int     // strictly lower part of each row
	col    []int32   // column of each entry, ascending within a row
	src    []int     // position of each entry in the system's values
	val    []float64 // L[i][col]
	dinv   []float64 // 1 / L[i][i], so the solves multiply
	pos    []int     // position of each column in the current row, or −1
	shift  float64   // α used by the last successful setup
	perm   []int32   // original unknown of each row, for messages
}

const (
	ic0FirstShift = 1e-3 // Manteuffel 1980 starts from a small shift; common practice, no single value
	ic0ShiftGrow  = 4.0
	ic0MaxShift   = 1e3 // at α = 10³ the factor is essentially diagonal: Jacobi
)

// newIC0 takes the strictly lower pattern of c (rows ascending by
// column, so it is a prefix of each row).
func newIC0(c *sparsePattern, perm []int32) *ic0 {
	n := c.n
	f := &ic0{rowPtr: make([]int, n+1), dinv: make([]float64, n), pos: make([]int, n), perm: perm}
	for i := range f.pos {
		f.pos[i] = -1
	}
	for i := range n {
		for p := c.ptr[i]; p < c.ptr[i+1] && c.col[p] < int32(i); p++ {
			f.col = append(f.col, c.col[p])
			f.src = append(f.src, p)
		}
		f.rowPtr[i+1] = len(f.col)
	}
	f.val = make([]float64, len(f.col))
	return f
}

func (f *ic0) setup(s *pcgSystem) error {
	var alpha float64
	for {
		row, ok := f.factor(s.val, s.diag, alpha)
		if ok {
			f.shift = alpha
			return nil
		}
		switch {
		case alpha == 0:
			alpha = ic0FirstShift
		case alpha < ic0MaxShift:
			alpha *= ic0ShiftGrow
		default:
			return fmt.Errorf("%w: incomplete Cholesky pivot at unknown %d stays non-positive with diagonal shift %g",
				ErrNotPositiveDefinite, f.perm[row], alpha)
		}
	}
}

// factor computes IC(0) of A + alpha diag(A), row by row:
// L[i][k] = (A[i][k] − Σ_{j<k} L[i][j] L[k][j]) / L[k][k] over the
// pattern, L[i][i] = √((1+alpha) A[i][i] − Σ_k L[i][k]²). The positions
// of row i's entries are scattered into f.pos so that the sum runs over
// row k alone: the cost is Σ_k |row k|, even for a well's long row. It
// returns false and the row at the first non-positive pivot.
func (f *ic0) factor(aval []float64, diag []int, alpha float64) (int, bool) {
	col, val, pos := f.col, f.val, f.pos
	for i := range len(f.dinv) {
		lo, hi := f.rowPtr[i], f.rowPtr[i+1]
		for p := lo; p < hi; p++ {
			pos[col[p]] = p
		}
		dd := (1 + alpha) * aval[diag[i]]
		for p := lo; p < hi; p++ {
			k := col[p]
			s := aval[f.src[p]]
			klo, khi := f.rowPtr[k], f.rowPtr[k+1]
			kcols := col[klo:khi]
			kvals := val[klo:khi:khi]
			for t, j := range kcols {
				if pj := pos[j]; pj >= 0 {
					s -= val[pj] * kvals[t]
				}
			}
			l := s * f.dinv[k]
			val[p] = l
			dd -= l * l
		}
		for _, c := range col[lo:hi] {
			pos[c] = -1
		}
		if !(dd > 0) || math.IsInf(dd, 0) {
			return i, false
		}
		f.dinv[i] = 1 / math.Sqrt(dd)
	}
	return -1, true
}

// apply solves L y = r, then Lᵀ dst = y, and returns r·dst.
func (f *ic0) apply(dst, r []float64) float64 {
	col, val, dinv := f.col, f.val, f.dinv
	for i := range dinv {
		s := r[i]
		lo, hi := f.rowPtr[i], f.rowPtr[i+1]
		cols := col[lo:hi]
		vals := val[lo:hi:hi]
		for t, k := range cols {
			s -= vals[t] * dst[k]
		}
		dst[i] = s * dinv[i]
	}
	for i := len(dinv) - 1; i >= 0; i-- {
		zi := dst[i] * dinv[i]
		dst[i] = zi
		lo, hi := f.rowPtr[i], f.rowPtr[i+1]
		cols := col[lo:hi]
		vals := val[lo:hi:hi]
		for t, k := range cols {
			dst[k] -= vals[t] * zi
		}
	}
	return floats.Dot(r, dst)
}
