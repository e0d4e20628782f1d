package flow

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
)

// ErrNotPositiveDefinite is returned (wrapped, with the unknown and the
// pivot) when a matrix turns out not to be symmetric positive definite.
var ErrNotPositiveDefinite = errors.New("flow: matrix is not positive definite")

// cholesky is a sparse Cholesky factorization P A Pᵀ = L Lᵀ. The ordering
// and the pattern of L are computed once (orderCholesky, newCholesky);
// factor then fills L for new values of the same pattern and
// solveInPlace uses it, both without allocating.
type cholesky struct {
	n     int
	perm  []int32 // perm[k]: original unknown of new index k
	iperm []int32 // inverse of perm
	upper *permutedUpper
	pat   *lowerPattern
	cval  []float64 // values of C = P A Pᵀ, lower triangle, laid out as upper
	lval  []float64 // values of L, column by column as in pat.rowIdx
	inv   []float64 // 1 / L[k][k], so the inner loops multiply
	x     []float64 // dense work vector (zero between uses)
	fill  []int     // next free position in each column of L
}

// ordering is the result of the ordering phase: a fill-reducing
// permutation that is also a postorder of its elimination tree, the
// permuted pattern, the tree, and the column counts of L.
type ordering struct {
	perm, iperm []int32
	c           *sparsePattern
	parent      []int32
	counts      []int
	nnzL        int
}

// orderCholesky orders a (approximate minimum degree, then the postorder
// of the elimination tree, which keeps each subtree's columns contiguous)
// and counts the entries of L, without forming it. The matrix is permuted
// once; the later passes run over the permuted pattern in order.
func orderCholesky(a *CSR) *ordering {
	n := a.N
	perm := amdOrder(a)
	c := permutedPattern(a, perm, invertPerm(perm))
	parent := eliminationTree(c)
	post := treePostorder(parent)
	if !isIdentity(post) {
		// Renumber along the postorder. AMD's order is a postorder of
		// its assembly tree, which is close to the elimination tree but
		// not the same, so most rows move only a short distance.
		ipost := invertPerm(post)
		c = c.permute(post, ipost)
		newPerm := make([]int32, n)
		newParent := make([]int32, n)
		for k, p := range post {
			newPerm[k] = perm[p]
			newParent[k] = -1
			if q := parent[p]; q != -1 {
				newParent[k] = ipost[q]
			}
		}
		perm, parent = newPerm, newParent
	}
	o := &ordering{perm: perm, iperm: invertPerm(perm), c: c, parent: parent}
	o.counts = columnCounts(c, parent)
	for _, cnt := range o.counts {
		o.nnzL += cnt
	}
	return o
}

func isIdentity(p []int32) bool {
	for k, v := range p {
		if v != int32(k) {
			return false
		}
	}
	return true
}

// newCholesky computes the pattern of L for the ordering o of a and
// allocates everything the numeric phase needs.
func newCholesky(a *CSR, o *ordering) *cholesky {
	n := a.N
	upper := o.c.upper()
	pat := symbolicPattern(upper, o.parent, o.counts)
	c := &cholesky{
		n: n, perm: o.perm, iperm: o.iperm, upper: upper, pat: pat,
		cval: make([]float64, len(upper.col)),
		lval: make([]float64, len(pat.rowIdx)),
		inv:  make([]float64, n),
		x:    make([]float64, n),
		fill: make([]int, n),
	}
	c.resetFill()
	return c
}

// invertPerm returns the inverse permutation.
func invertPerm(p []int32) []int32 {
	inv := make([]int32, len(p))
	for k, v := range p {
		inv[v] = int32(k)
	}
	return inv
}

// factor computes L for the values val (laid out as the analysed
// matrix's Val), row by row (the up-looking method, Davis 2006, §4.8):
// row k of L solves L[0:k,0:k] l = C[0:k,k] through the precomputed row
// pattern, then L[k][k] = √(C[k][k] − l·l).
func (c *cholesky) factor(val []float64) error {
	colPtr, rowIdx, lval := c.pat.colPtr, c.pat.rowIdx, c.lval
	rowPtr, colIdx := c.pat.rowPtr, c.pat.colIdx
	x, fill, inv := c.x, c.fill, c.inv
	up, cval := c.upper, c.cval
	for p, from := range up.src {
		cval[p] = val[from]
	}
	for k := range c.n {
		// Scatter row k of C (columns ≤ k; the diagonal is last).
		lo, hi := up.ptr[k], up.ptr[k+1]
		for p := lo; p < hi-1; p++ {
			x[up.col[p]] = cval[p]
		}
		d := cval[hi-1]
		for _, j := range colIdx[rowPtr[k]:rowPtr[k+1]] {
			q0, q1 := colPtr[j], fill[j]
			lkj := x[j] * inv[j]
			x[j] = 0
			rows := rowIdx[q0+1 : q1]
			vals := lval[q0+1 : q1 : q1]
			for t, i := range rows {
				x[i] -= vals[t] * lkj
			}
			d -= lkj * lkj
			lval[q1] = lkj
			fill[j] = q1 + 1
		}
		if !(d > 0) || math.IsInf(d, 0) {
			// Leave the work vector clean for the next call.
			for _, j := range colIdx[rowPtr[k]:rowPtr[k+1]] {
				x[j] = 0
			}
			c.resetFill()
			return fmt.Errorf("%w: pivot %g at unknown %d", ErrNotPositiveDefinite, d, c.perm[k])
		}
		lkk := math.Sqrt(d)
		lval[colPtr[k]] = lkk
		inv[k] = 1 / lkk
	}
	c.resetFill()
	return nil
}

func (c *cholesky) resetFill() {
	for j := range c.fill {
		c.fill[j] = c.pat.colPtr[j] + 1
	}
}

// solveInPlace overwrites y with (L Lᵀ)⁻¹ y, in the permuted numbering:
// forward substitution by columns, then back substitution by columns of
// L (rows of Lᵀ).
func (c *cholesky) solveInPlace(y []float64) {
	colPtr, rowIdx, lval, inv := c.pat.colPtr, c.pat.rowIdx, c.lval, c.inv
	for j := range c.n {
		q0, q1 := colPtr[j], colPtr[j+1]
		yj := y[j] * inv[j]
		y[j] = yj
		rows := rowIdx[q0+1 : q1]
		vals := lval[q0+1 : q1 : q1]
		for t, i := range rows {
			y[i] -= vals[t] * yj
		}
	}
	for j := c.n - 1; j >= 0; j-- {
		q0, q1 := colPtr[j], colPtr[j+1]
		s := y[j]
		rows := rowIdx[q0+1 : q1]
		vals := lval[q0+1 : q1 : q1]
		for t, i := range rows {
			s -= vals[t] * y[i]
		}
		y[j] = s * inv[j]
	}
}

// residual sets r = b − C x in the permuted numbering, with C from its
// lower triangle (each off-diagonal entry used twice), and returns ‖r‖₂.
func (c *cholesky) residual(r, b, x []float64) float64 {
	up, cval := c.upper, c.cval
	copy(r, b)
	for k := range c.n {
		lo, hi := up.ptr[k], up.ptr[k+1]
		xk := x[k]
		s := cval[hi-1] * xk
		cols := up.col[lo : hi-1]
		vals := cval[lo : hi-1 : hi-1]
		for t, j := range cols {
			s += vals[t] * x[j]
			r[j] -= vals[t] * xk
		}
		r[k] -= s
	}
	return floats.Norm(r, 2)
}
