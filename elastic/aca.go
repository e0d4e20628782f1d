package elastic

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// source gives the entries of a matrix made of rd×cd blocks, one for each
// pair of a row object and a column object (an element's two tractions
// and its two discontinuities, or one stress component at a point).
type source interface {
	dims() (rd, cd int)
	// rowTo writes the blocks of row object i against the column
	// objects cols: rd rows of cd·len(cols) values, row-major.
	rowTo(dst []float64, i int, cols []int)
	// colTo writes the blocks of the row objects rows against column
	// object j: rd·len(rows) rows of cd values, row-major.
	colTo(dst []float64, rows []int, j int)
}

// lowRank is the factored block U Vᵀ: U is M×k and V is N×k, row-major.
type lowRank struct {
	u, v []float64
	k    int
}

// acaChecks is the number of rows not used as pivots on which a
// converged cross approximation is checked before it is accepted.
const acaChecks = 2

// aca approximates the block rows × cols of src by adaptive cross
// approximation with partial pivoting (Bebendorf 2000, Numer. Math. 86,
// 565–589, §3; Bebendorf & Rjasanow 2003, Computing 70, 1–24): from a
// pivot row of the residual, take its largest entry's column, subtract
// their cross, and move to the row where that column is largest; stop
// when the Frobenius norm of the last crosses is below half the larger
// of tol‖S‖_F (S the approximation, whose norm is updated exactly;
// Bebendorf & Rjasanow 2003, eq. 11) and the absolute bound abs, the
// block's share of the error allowed for the whole matrix.
//
// Pivots are whole rd×cd blocks of one row object and one column object,
// eliminated with complete pivoting inside the block (up to min(rd, cd)
// crosses per pivot block). Scalar pivoting would miss couplings that
// vanish exactly between collinear elements (shear and normal parts then
// separate, and the approximation of one part would stop the
// iteration). As a guard against such early stops, a converged
// approximation is also checked on acaChecks unused rows, and continued
// from any row whose residual is above the tolerance.
//
// A block whose approximation is below half of abs altogether is
// dropped (rank 0): far from each other, elements interact too weakly to
// matter at the tolerance asked. It returns ok = false when the rank
// would exceed maxRank.
func aca(src source, rows, cols []int, tol, abs float64, maxRank int) (lr lowRank, ok bool) {
	rd, cd := src.dims()
	m := len(rows)
	nn := cd * len(cols)
	mm := rd * m
	row := make([]float64, rd*nn)
	col := make([]float64, mm*cd)
	used := make([]bool, m)
	var us, vs [][]float64
	var norm2 float64
	i := 0
	for {
		if len(us)+min(rd, cd) > maxRank {
			return lr, false
		}
		residualRow(src, row, rows[i], cols, i, us, vs, rd, nn)
		used[i] = true
		j := pivotColumn(row, rd, cd, nn)
		if j < 0 {
			// The residual row is zero: move on to an unused row.
			if i = nextUnused(used, 0); i < 0 {
				break
			}
			continue
		}
		src.colTo(col, rows, cols[j])
		for l := range us {
			for r := range mm {
				for c := range cd {
					col[r*cd+c] -= us[l][r] * vs[l][j*cd+c]
				}
			}
		}
		first := len(us)
		us, vs = crosses(us, vs, row, col, i, j, rd, cd, nn)
		step2 := 0.0
		for a := first; a < len(us); a++ {
			for b := range len(us) {
				p := dot(us[a], us[b]) * dot(vs[a], vs[b])
				switch {
				case b < first:
					norm2 += 2 * p
				case b == a:
					norm2 += p
					step2 += p
				case b < a:
					norm2 += 2 * p
					step2 += 2 * p
				}
			}
		}
		bound := max(tol*tol*norm2, abs*abs) / 4
		if step2 <= bound {
			if i = failedCheck(src, row, rows, cols, used, us, vs, 4*bound); i < 0 {
				if norm2 <= abs*abs/4 {
					// The whole block is below its share of the error:
					// rank 0, nothing to store.
					return lowRank{}, true
				}
				break
			}
			continue
		}
		if i = nextPivotRow(us[first:], used, rd); i < 0 {
			break
		}
	}
	return pack(us, vs, mm, nn), true
}

// residualRow writes into row the residual of row object rows[i]: its
// blocks minus the crosses found so far.
func residualRow(src source, row []float64, obj int, cols []int, i int, us, vs [][]float64, rd, nn int) {
	src.rowTo(row, obj, cols)
	for l := range us {
		for r := range rd {
			f := us[l][i*rd+r]
			for c := range nn {
				row[r*nn+c] -= f * vs[l][c]
			}
		}
	}
}

// pivotColumn returns the column object whose block in the residual row
// has the largest Frobenius norm, or −1 when the row is zero.
func pivotColumn(row []float64, rd, cd, nn int) int {
	best, j := 0.0, -1
	for o := range nn / cd {
		s := 0.0
		for r := range rd {
			for c := range cd {
				v := row[r*nn+o*cd+c]
				s += v * v
			}
		}
		if s > best {
			best, j = s, o
		}
	}
	return j
}

// crosses eliminates the rd×cd pivot block (row object i, column object
// j) of the residual with complete pivoting, appending one cross u vᵀ per
// step: u = column/pivot, v = row. It updates row and col in place.
// Entries below 1e-10 of the first pivot are round-off (couplings that
// vanish by symmetry) and are not eliminated.
func crosses(us, vs [][]float64, row, col []float64, i, j, rd, cd, nn int) ([][]float64, [][]float64) {
	first := 0.0
	for range min(rd, cd) {
		pr, pc, p := 0, 0, 0.0
		for r := range rd {
			for c := range cd {
				if v := row[r*nn+j*cd+c]; math.Abs(v) > math.Abs(p) {
					pr, pc, p = r, c, v
				}
			}
		}
		if first == 0 {
			first = math.Abs(p)
		}
		if p == 0 || math.Abs(p) <= 1e-10*first {
			break
		}
		u := make([]float64, len(col)/cd)
		v := make([]float64, nn)
		for r := range u {
			u[r] = col[r*cd+pc] / p
		}
		copy(v, row[pr*nn:(pr+1)*nn])
		for r := range rd {
			f := u[i*rd+r]
			for c := range nn {
				row[r*nn+c] -= f * v[c]
			}
		}
		for r := range u {
			for c := range cd {
				col[r*cd+c] -= u[r] * v[j*cd+c]
			}
		}
		us, vs = append(us, u), append(vs, v)
	}
	return us, vs
}

// nextPivotRow returns the unused row object where the newest crosses
// are largest, or −1 when every row is used.
func nextPivotRow(us [][]float64, used []bool, rd int) int {
	best, next := -1.0, -1
	for o, u := range used {
		if u {
			continue
		}
		s := 0.0
		for _, c := range us {
			for r := range rd {
				s += c[o*rd+r] * c[o*rd+r]
			}
		}
		if s > best {
			best, next = s, o
		}
	}
	return next
}

// nextUnused returns the first unused row object at or after from,
// wrapping around, or −1.
func nextUnused(used []bool, from int) int {
	for k := range used {
		if o := (from + k) % len(used); !used[o] {
			return o
		}
	}
	return -1
}

// failedCheck computes the residual of up to acaChecks unused rows,
// spread over the block, and returns the first whose squared norm,
// scaled to the whole block (times the number of rows), exceeds bound;
// −1 when all pass.
func failedCheck(src source, row []float64, rows, cols []int, used []bool, us, vs [][]float64, bound float64) int {
	rd, _ := src.dims()
	nn := len(row) / rd
	m := len(rows)
	for c := range acaChecks {
		o := nextUnused(used, (2*c+1)*m/(2*acaChecks))
		if o < 0 {
			return -1
		}
		residualRow(src, row, rows[o], cols, o, us, vs, rd, nn)
		if float64(m)*dot(row, row) > bound {
			return o
		}
	}
	return -1
}

// pack stores the crosses as row-major M×k and N×k factors.
func pack(us, vs [][]float64, mm, nn int) lowRank {
	k := len(us)
	lr := lowRank{u: make([]float64, mm*k), v: make([]float64, nn*k), k: k}
	for l := range k {
		for r := range mm {
			lr.u[r*k+l] = us[l][r]
		}
		for c := range nn {
			lr.v[c*k+l] = vs[l][c]
		}
	}
	return lr
}

// recompress cuts the rank of U Vᵀ (Bebendorf 2008, Hierarchical Matrices,
// Springer, §1.1.5): U = Q_u R_u and V = Q_v R_v by Householder QR, the
// SVD R_u R_vᵀ = W Σ Zᵀ, and the smallest rank k' whose discarded
// singular values have a Frobenius norm ≤ ½ max(tol‖Σ‖_F, abs); then
// U' = Q_u W Σ and V' = Q_v Z, truncated to k' columns.
func recompress(lr lowRank, tol, abs float64) lowRank {
	k := lr.k
	if k < 2 {
		return lr
	}
	mm, nn := len(lr.u)/k, len(lr.v)/k
	qu, ru := thinQR(lr.u, mm, k)
	qv, rv := thinQR(lr.v, nn, k)
	b := blas64.General{Rows: k, Cols: k, Stride: k, Data: make([]float64, k*k)}
	blas64.Gemm(blas.NoTrans, blas.Trans, 1, ru, rv, 0, b)
	w := blas64.General{Rows: k, Cols: k, Stride: k, Data: make([]float64, k*k)}
	zt := blas64.General{Rows: k, Cols: k, Stride: k, Data: make([]float64, k*k)}
	s := make([]float64, k)
	work := make([]float64, 1)
	lapack64.Gesvd(lapack.SVDAll, lapack.SVDAll, b, w, zt, s, work, -1)
	work = make([]float64, int(work[0]))
	if !lapack64.Gesvd(lapack.SVDAll, lapack.SVDAll, b, w, zt, s, work, len(work)) {
		return lr // no convergence of the SVD: keep the uncompressed crosses
	}
	total := dot(s, s)
	kk, tail := k, 0.0
	bound := max(tol*tol*total, abs*abs) / 4
	for kk > 1 && tail+s[kk-1]*s[kk-1] <= bound {
		tail += s[kk-1] * s[kk-1]
		kk--
	}
	out := lowRank{u: make([]float64, mm*kk), v: make([]float64, nn*kk), k: kk}
	for l := range kk {
		for c := range k {
			w.Data[c*k+l] *= s[l]
		}
	}
	wk := blas64.General{Rows: k, Cols: kk, Stride: k, Data: w.Data}
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, qu, wk, 0, blas64.General{Rows: mm, Cols: kk, Stride: kk, Data: out.u})
	ztk := blas64.General{Rows: kk, Cols: k, Stride: k, Data: zt.Data}
	blas64.Gemm(blas.NoTrans, blas.Trans, 1, qv, ztk, 0, blas64.General{Rows: nn, Cols: kk, Stride: kk, Data: out.v})
	return out
}

// thinQR returns the m×k orthonormal factor Q and the k×k triangle R of
// the row-major m×k matrix a (m ≥ k), which it leaves unchanged.
func thinQR(a []float64, m, k int) (q, r blas64.General) {
	q = blas64.General{Rows: m, Cols: k, Stride: k, Data: append([]float64(nil), a...)}
	tau := make([]float64, k)
	query := make([]float64, 1)
	lapack64.Geqrf(q, tau, query, -1)
	lwork := int(query[0])
	lapack64.Orgqr(q, tau, query, -1)
	work := make([]float64, max(lwork, int(query[0]), m))
	lapack64.Geqrf(q, tau, work, len(work))
	r = blas64.General{Rows: k, Cols: k, Stride: k, Data: make([]float64, k*k)}
	for i := range k {
		copy(r.Data[i*k+i:(i+1)*k], q.Data[i*k+i:(i+1)*k])
	}
	lapack64.Orgqr(q, tau, work, len(work))
	return q, r
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i, v := range a {
		s += v * b[i]
	}
	return s
}
