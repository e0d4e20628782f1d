package mechanics

import (
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// denseLU is the LU factorization with partial pivoting of a small dense
// matrix (LAPACK's dgetrf and dgetrs), without the condition estimate that
// mat.LU computes at every factorization: the group solves factor often
// and need only to know whether the matrix is singular.
type denseLU struct {
	a    blas64.General
	ipiv []int
	ok   bool
}

// factorize factors the n×n row-major matrix a (which it keeps and
// overwrites) and reports whether it is nonsingular.
func (f *denseLU) factorize(a []float64, n int) bool {
	f.a = blas64.General{Rows: n, Cols: n, Stride: n, Data: a}
	if cap(f.ipiv) < n {
		f.ipiv = make([]int, n)
	}
	f.ipiv = f.ipiv[:n]
	f.ok = lapack64.Getrf(f.a, f.ipiv)
	return f.ok
}

// solve overwrites b with the solution of A x = b.
func (f *denseLU) solve(b []float64) {
	lapack64.Getrs(blas.NoTrans, f.a, blas64.General{Rows: len(b), Cols: 1, Stride: 1, Data: b}, f.ipiv)
}
