package mechanics

import (
	"slices"

	"gonum.org/v1/gonum/floats"
)

// rowUpdatedLU solves with a dense matrix A whose rows differ from those
// of a factored base matrix A0 in a few places, without factoring A: with
// E the identity columns of the k replaced rows and D (k×n) the new rows
// less the old ones, A = A0 + E D, and by the Sherman–Morrison–Woodbury
// identity (Golub & Van Loan 2013, §2.1.4)
//
//	A⁻¹b = y − W C⁻¹ D y,  y = A0⁻¹b,  W = A0⁻¹E,  C = I_k + D W,
//
// which costs k + 1 solves with A0's factors and the factorization of the
// k×k capacitance matrix C instead of a new factorization of A. Each row
// carries a key (what the row's formula depends on); a row counts as
// replaced when its key differs from the base's (or, asked for the exact
// matrix, when any of its values does), and the base is factored again
// when too many are.
type rowUpdatedLU struct {
	n    int
	base denseLU
	a0   []float64 // A0, row-major n×n
	keys []uint8   // the base's row keys
	ok   bool
	// The replaced rows, their differences from A0, A0⁻¹ e_r for each
	// (kept per row while the base stands), and C's factors.
	rows []int
	diff []float64 // k×n
	w    map[int][]float64
	cap  denseLU
}

// maxRowUpdates is the number of replaced rows beyond which the base is
// factored again: each costs a solve with A0's factors (2n² flops) and
// the capacitance matrix grows with their square, while a factorization
// costs ⅔n³ (common practice, no source).
func maxRowUpdates(n int) int { return n/8 + 8 }

// update takes the matrix a (row-major n×n, not kept) with row keys keys
// and readies solve for it: by row replacements on the base when few rows
// changed, else by factoring a as the new base. A row has changed when its
// key has, or with exact when any of its values has; rows kept from the
// base otherwise (whose values move within a key: friction that weakens
// with slip) make solve that of an approximate Jacobian, which Newton's
// iterations tolerate. It reports whether the matrix is nonsingular.
func (u *rowUpdatedLU) update(a []float64, keys []uint8, n int, exact bool) bool {
	if u.ok && u.n == n {
		u.rows = u.rows[:0]
		for r, k := range keys {
			if k != u.keys[r] || exact && !slices.Equal(a[r*n:(r+1)*n], u.a0[r*n:(r+1)*n]) {
				u.rows = append(u.rows, r)
			}
		}
		if len(u.rows) <= maxRowUpdates(n) && u.capacitance(a) {
			return true
		}
	}
	u.n, u.rows, u.w = n, u.rows[:0], map[int][]float64{}
	u.a0, u.keys = slices.Clone(a), slices.Clone(keys)
	u.ok = u.base.factorize(slices.Clone(a), n)
	return u.ok
}

// capacitance forms D and W for the replaced rows of a and factors C; it
// reports whether C is nonsingular.
func (u *rowUpdatedLU) capacitance(a []float64) bool {
	n, k := u.n, len(u.rows)
	if k == 0 {
		return true
	}
	u.diff = slices.Grow(u.diff[:0], k*n)[:k*n]
	c := make([]float64, k*k)
	for x, r := range u.rows {
		d := u.diff[x*n : (x+1)*n]
		for j := range n {
			d[j] = a[r*n+j] - u.a0[r*n+j]
		}
		if u.w[r] == nil {
			e := make([]float64, n)
			e[r] = 1
			u.base.solve(e)
			u.w[r] = e
		}
		c[x*k+x] = 1
	}
	for x := range k {
		d := u.diff[x*n : (x+1)*n]
		for y, r := range u.rows {
			c[x*k+y] += floats.Dot(d, u.w[r])
		}
	}
	return u.cap.factorize(c, k)
}

// solve overwrites b with A⁻¹b.
func (u *rowUpdatedLU) solve(b []float64) {
	u.base.solve(b)
	k := len(u.rows)
	if k == 0 {
		return
	}
	v := make([]float64, k)
	for x := range k {
		v[x] = floats.Dot(u.diff[x*u.n:(x+1)*u.n], b)
	}
	u.cap.solve(v)
	for y, r := range u.rows {
		floats.AddScaled(b, -v[y], u.w[r])
	}
}
