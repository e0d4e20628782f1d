package flow

import (
	"fmt"
	"slices"
)

// CSR is a square sparse matrix in compressed sparse row form. The flow
// systems are symmetric and stored in full: both triangles and the
// diagonal are present, so row i lists every neighbour of unknown i.
type CSR struct {
	// N is the number of rows and columns.
	N int
	// RowPtr has N+1 entries; row r occupies RowPtr[r]:RowPtr[r+1].
	RowPtr []int
	// ColIdx is the column of each stored entry, strictly ascending within
	// a row.
	ColIdx []int
	// Val is the value of each stored entry.
	Val []float64
}

// NNZ returns the number of stored entries.
func (a *CSR) NNZ() int { return a.RowPtr[a.N] }

// MulVecTo computes dst = A x. It panics if the lengths do not match N.
func (a *CSR) MulVecTo(dst, x []float64) {
	if len(dst) != a.N || len(x) != a.N {
		panic("flow: dimension mismatch")
	}
	rowPtr, colIdx, val := a.RowPtr, a.ColIdx, a.Val
	for r := range dst {
		var s float64
		lo, hi := rowPtr[r], rowPtr[r+1]
		cols := colIdx[lo:hi]
		vals := val[lo:hi:hi]
		for k, c := range cols {
			s += vals[k] * x[c]
		}
		dst[r] = s
	}
}

// At returns the entry in row i and column j (zero when it is not stored).
// It searches the row, so it is meant for tests and diagnostics, not for
// loops over the matrix.
func (a *CSR) At(i, j int) float64 {
	if i < 0 || i >= a.N || j < 0 || j >= a.N {
		panic("flow: index out of range")
	}
	lo, hi := a.RowPtr[i], a.RowPtr[i+1]
	if k, ok := slices.BinarySearch(a.ColIdx[lo:hi], j); ok {
		return a.Val[lo+k]
	}
	return 0
}

// Validate reports whether the arrays describe a well-formed matrix: N ≥ 0,
// RowPtr non-decreasing from 0, column indices in range and strictly
// ascending within each row, and Val as long as ColIdx.
func (a *CSR) Validate() error {
	if a.N < 0 {
		return fmt.Errorf("flow: matrix order N = %d: must be ≥ 0", a.N)
	}
	if len(a.RowPtr) != a.N+1 {
		return fmt.Errorf("flow: len(RowPtr) = %d: must be N+1 = %d", len(a.RowPtr), a.N+1)
	}
	if a.RowPtr[0] != 0 {
		return fmt.Errorf("flow: RowPtr[0] = %d: must be 0", a.RowPtr[0])
	}
	nnz := a.RowPtr[a.N]
	if len(a.ColIdx) != nnz || len(a.Val) != nnz {
		return fmt.Errorf("flow: len(ColIdx) = %d, len(Val) = %d: both must be RowPtr[N] = %d",
			len(a.ColIdx), len(a.Val), nnz)
	}
	for r := 0; r < a.N; r++ {
		lo, hi := a.RowPtr[r], a.RowPtr[r+1]
		if hi < lo || hi > nnz {
			return fmt.Errorf("flow: RowPtr[%d] = %d: must lie in [%d, %d]", r+1, hi, lo, nnz)
		}
		prev := -1
		for _, c := range a.ColIdx[lo:hi] {
			if c <= prev || c >= a.N {
				return fmt.Errorf("flow: row %d: column %d: columns must ascend strictly within [0, %d)", r, c, a.N)
			}
			prev = c
		}
	}
	return nil
}

// checkSymmetricPattern returns an error naming the first entry (i, j)
// whose mirror (j, i) is not stored, or a missing diagonal entry.
func (a *CSR) checkSymmetricPattern() error {
	// next[c] is the read position in row c for its entries in columns
	// visited so far: scanning rows in order, the mirrors of row r's
	// lower entries appear in ascending row order in each column's row.
	next := make([]int, a.N)
	copy(next, a.RowPtr[:a.N])
	for r := 0; r < a.N; r++ {
		hasDiag := false
		for p := a.RowPtr[r]; p < a.RowPtr[r+1]; p++ {
			c := a.ColIdx[p]
			if c == r {
				hasDiag = true
			}
			if c > r {
				// Entry (r, c) in the upper triangle: its mirror (c, r)
				// must be the next unvisited lower entry of row c.
				q := next[c]
				if q < a.RowPtr[c+1] && a.ColIdx[q] < r {
					return asymmetryError(c, a.ColIdx[q])
				}
				if q >= a.RowPtr[c+1] || a.ColIdx[q] != r {
					return asymmetryError(r, c)
				}
				next[c]++
			}
		}
		if !hasDiag {
			return fmt.Errorf("flow: diagonal entry (%d, %d) is not stored", r, r)
		}
		// Every lower entry of row r must have been matched by an upper
		// entry of an earlier row.
		q := next[r]
		if q < a.RowPtr[r+1] && a.ColIdx[q] < r {
			return asymmetryError(r, a.ColIdx[q])
		}
	}
	return nil
}

func asymmetryError(i, j int) error {
	return fmt.Errorf("flow: entry (%d, %d) is stored but (%d, %d) is not: pattern must be symmetric", i, j, j, i)
}

// samePattern reports whether a and b have the same order and the same
// stored positions.
func samePattern(a, b *CSR) bool {
	if a.N != b.N || len(a.ColIdx) != len(b.ColIdx) {
		return false
	}
	if len(a.ColIdx) > 0 && &a.ColIdx[0] == &b.ColIdx[0] && &a.RowPtr[0] == &b.RowPtr[0] {
		return true
	}
	return slices.Equal(a.RowPtr, b.RowPtr) && slices.Equal(a.ColIdx, b.ColIdx)
}
