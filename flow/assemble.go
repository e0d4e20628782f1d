package flow

import (
	"fmt"
	"slices"
)

// Assembler fills a symmetric CSR matrix whose sparsity pattern is fixed
// once, from the number of unknowns and the list of connections, and then
// reused for every time step and Picard iteration. Each connection k
// between unknowns i and j with transmissibility t contributes
//
//	A[i][i] += t,  A[j][j] += t,  A[i][j] −= t,  A[j][i] −= t,
//
// the two-point flux form of a conservative finite-volume scheme, so the
// matrix is diag(storage) plus a sum of t (e_i − e_j)(e_i − e_j)ᵀ.
// Every addition goes through a slot index computed once: no searching and
// no allocation after NewAssembler.
type Assembler struct {
	a *CSR
	// diag[i] is the position of A[i][i] in a.Val.
	diag []int
	// slots[k] holds the positions of A[i][i], A[j][j], A[i][j] and
	// A[j][i] for connection k = (i, j).
	slots [][4]int
	// conns are the connections' unknowns and t their transmissibilities
	// as added since the last Reset.
	conns [][2]int
	t     []float64
}

// NewAssembler builds the pattern for n unknowns and the given connections
// (pairs of unknown indices). Several connections may join the same pair:
// their contributions add up. It returns an error when n < 1, when an
// index is out of range or when a connection joins an unknown to itself.
func NewAssembler(n int, conns [][2]int) (*Assembler, error) {
	if n < 1 {
		return nil, fmt.Errorf("flow: number of unknowns = %d: must be ≥ 1", n)
	}
	for k, c := range conns {
		i, j := c[0], c[1]
		if i < 0 || i >= n || j < 0 || j >= n {
			return nil, fmt.Errorf("flow: connection %d joins unknowns %d and %d: indices must lie in [0, %d)", k, i, j, n)
		}
		if i == j {
			return nil, fmt.Errorf("flow: connection %d joins unknown %d to itself", k, i)
		}
	}
	a := symmetricPattern(n, conns)
	as := &Assembler{a: a, diag: make([]int, n), slots: make([][4]int, len(conns)),
		conns: slices.Clone(conns), t: make([]float64, len(conns))}
	for i := range n {
		as.diag[i] = as.position(i, i)
	}
	for k, c := range conns {
		i, j := c[0], c[1]
		as.slots[k] = [4]int{as.diag[i], as.diag[j], as.position(i, j), as.position(j, i)}
	}
	return as, nil
}

// symmetricPattern returns the full (both triangles and diagonal) pattern
// of the graph with n vertices and the given edges, values zero.
func symmetricPattern(n int, conns [][2]int) *CSR {
	rowPtr := make([]int, n+1)
	for i := range n {
		rowPtr[i+1] = 1 // the diagonal
	}
	for _, c := range conns {
		rowPtr[c[0]+1]++
		rowPtr[c[1]+1]++
	}
	for i := range n {
		rowPtr[i+1] += rowPtr[i]
	}
	fill := slices.Clone(rowPtr[:n])
	cols := make([]int, rowPtr[n])
	for i := range n {
		cols[fill[i]] = i
		fill[i]++
	}
	for _, c := range conns {
		cols[fill[c[0]]] = c[1]
		fill[c[0]]++
		cols[fill[c[1]]] = c[0]
		fill[c[1]]++
	}
	// Sort each row and drop duplicate pairs, compacting in place.
	out := 0
	start := 0
	for i := range n {
		row := cols[start:rowPtr[i+1]]
		start = rowPtr[i+1]
		slices.Sort(row)
		rowPtr[i] = out
		for k, c := range row {
			if k > 0 && c == row[k-1] {
				continue
			}
			cols[out] = c
			out++
		}
	}
	rowPtr[n] = out
	cols = slices.Clip(cols[:out])
	return &CSR{N: n, RowPtr: rowPtr, ColIdx: cols, Val: make([]float64, out)}
}

// position returns the index in Val of entry (i, j), which must be stored.
func (as *Assembler) position(i, j int) int {
	lo, hi := as.a.RowPtr[i], as.a.RowPtr[i+1]
	k, ok := slices.BinarySearch(as.a.ColIdx[lo:hi], j)
	if !ok {
		panic("flow: entry missing from assembled pattern")
	}
	return lo + k
}

// Matrix returns the assembled matrix. It is owned by the Assembler: its
// pattern never changes and its values change with Reset and the Add
// methods.
func (as *Assembler) Matrix() *CSR { return as.a }

// NumConnections returns the number of connections given to NewAssembler.
func (as *Assembler) NumConnections() int { return len(as.slots) }

// Reset sets every value to zero.
func (as *Assembler) Reset() {
	clear(as.a.Val)
	clear(as.t)
}

// AddDiagonal adds v to A[i][i] (a storage or well-index term).
func (as *Assembler) AddDiagonal(i int, v float64) {
	as.a.Val[as.diag[i]] += v
}

// AddConnection adds transmissibility t of connection k = (i, j):
// t to A[i][i] and A[j][j], −t to A[i][j] and A[j][i].
func (as *Assembler) AddConnection(k int, t float64) {
	s := &as.slots[k]
	v := as.a.Val
	v[s[0]] += t
	v[s[1]] += t
	v[s[2]] -= t
	v[s[3]] -= t
	as.t[k] += t
}

// Residual sets dst = f − Σ_k t_k (e_i − e_j)(x_i − x_j), the residual
// b − A x of the assembled system when the diagonal additions' part of
// it, b − D x, is given as f: each connection's flux t (x_j − x_i) is
// computed from the difference of its unknowns, so terms of size t·x do
// not cancel in floating point. dst, f and x have length N; dst must not
// overlap f or x.
func (as *Assembler) Residual(dst, f, x []float64) {
	copy(dst, f)
	for k, c := range as.conns {
		i, j := c[0], c[1]
		q := as.t[k] * (x[j] - x[i])
		dst[i] += q
		dst[j] -= q
	}
}
