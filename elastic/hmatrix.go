package elastic

import (
	"cmp"
	"math"
	"slices"
	"sync"

	"gonum.org/v1/gonum/blas/gonum"
)

// validator is implemented by sources that check the entries of the
// blocks they compute explicitly (the near field), where degenerate
// geometry shows.
type validator interface {
	validate(dense []float64, rows, cols []int) error
}

// hblock is one block of a hierarchical matrix: dense, or U Vᵀ, stored
// in single precision (relative rounding 6·10⁻⁸, below any tolerance
// allowed) and multiplied in double precision.
type hblock struct {
	spec  blockSpec
	dense []float32 // (rd·m)×(cd·n), row-major; nil for a low-rank block
	u, v  []float32 // M×k and N×k, column-major
	k     int       // rank
	tOff  int       // offset of Vᵀx (then Uᵀx, if symmetric) in the scratch t
}

// step is one contribution to a row leaf in a product: block b, as
// stored or (for a symmetric matrix) transposed.
type step struct {
	b          int
	transposed bool
}

// hmatrix is a hierarchical matrix (Hackbusch 1999, Computing 62,
// 89–108): a partition of rows × cols into dense near-field blocks and
// low-rank far-field blocks found by cross approximation. A symmetric
// one stores the blocks on and above the diagonal only and applies each
// off-diagonal block also transposed.
type hmatrix struct {
	rd, cd     int
	rows, cols *tree
	symmetric  bool
	blocks     []hblock
	lowRanks   []int  // indices of the low-rank blocks
	planOff    []int  // steps of row leaf l: plan[planOff[l]:planOff[l+1]]
	plan       []step // in block order
	workers    int

	mu sync.Mutex // guards the scratch below
	xp []float32  // x in tree order
	yp []float64  // y in tree order
	zp []float32  // one block's share of y, per row leaf
	t  []float32  // Vᵀx (and Uᵀx) of every low-rank block
}

// newHMatrix assembles the hierarchical matrix of src over the given
// trees, in parallel over blocks: first the dense blocks, whose Frobenius
// norm estimates that of the whole matrix (the near field holds the
// largest entries; this lower bound makes the criterion conservative),
// then the low-rank blocks, each allowed the absolute error
//
//	ε_b = ε ‖A‖_F (|b| / |A|)^½,  |b| the number of entries of block b,
//
// so that the errors add up to at most ε‖A‖_F (Bradley 2014, Seismol.
// Res. Lett. 85(6), for displacement-discontinuity kernels: a tolerance
// relative to each block would spend ranks on far blocks whose entries
// are negligible). A symmetric matrix (src symmetric, rows = cols) keeps
// the blocks whose row cluster comes first. Every block is computed by
// one goroutine from data that do not depend on the others, so the
// result does not depend on the number of workers.
func newHMatrix(src source, rows, cols *tree, symmetric bool, s Settings) (*hmatrix, error) {
	rd, cd := src.dims()
	specs := partition(rows, cols, s.Admissibility)
	if symmetric {
		specs = slices.DeleteFunc(specs, func(b blockSpec) bool { return rows.nodes[b.row].lo > cols.nodes[b.col].lo })
	}
	h := &hmatrix{rd: rd, cd: cd, rows: rows, cols: cols, symmetric: symmetric, blocks: make([]hblock, len(specs)), workers: s.Workers}
	var near, far []int
	for b, sp := range specs {
		if sp.lowRank {
			far = append(far, b)
		} else {
			near = append(near, b)
		}
	}
	if err := h.assemble(src, specs, near, s, 0); err != nil {
		return nil, err
	}
	norm2 := 0.0
	for _, b := range near {
		n2 := 0.0
		for _, v := range h.blocks[b].dense {
			n2 += float64(v) * float64(v)
		}
		norm2 += n2 * h.copies(specs[b])
	}
	entries := float64(rd*len(rows.perm)) * float64(cd*len(cols.perm))
	if err := h.assemble(src, specs, far, s, s.Tolerance*math.Sqrt(norm2/entries)); err != nil {
		return nil, err
	}
	h.makePlan()
	return h, nil
}

// copies returns how many blocks of the full matrix a stored block
// stands for: 2 for an off-diagonal block of a symmetric matrix.
func (h *hmatrix) copies(b blockSpec) float64 {
	if h.symmetric && b.row != b.col {
		return 2
	}
	return 1
}

// assemble computes the blocks idx of specs, largest first so that the
// last ones to finish are small. Low-rank blocks are allowed the absolute
// error perEntry·|b|^½.
func (h *hmatrix) assemble(src source, specs []blockSpec, idx []int, s Settings, perEntry float64) error {
	order := slices.Clone(idx)
	cost := func(b int) int {
		m, n := size(h.rows, specs[b].row), size(h.cols, specs[b].col)
		if specs[b].lowRank {
			return 16 * (m + n)
		}
		return m * n
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(cost(b), cost(a)) })
	var fe firstError
	parallelFor(len(order), 1, s.Workers, func(lo, hi int) {
		for _, b := range order[lo:hi] {
			blk, err := assembleBlock(src, h.rows, h.cols, specs[b], s, perEntry)
			if err != nil {
				fe.set(b, err)
				return
			}
			h.blocks[b] = blk
		}
	})
	return fe.err
}

func size(t *tree, node int) int { return t.nodes[node].hi - t.nodes[node].lo }

// assembleBlock computes one block: dense, or compressed by ACA (falling
// back to dense when the rank would not save memory) and recompressed.
func assembleBlock(src source, rows, cols *tree, spec blockSpec, s Settings, perEntry float64) (hblock, error) {
	rn, cn := &rows.nodes[spec.row], &cols.nodes[spec.col]
	ro, co := rows.perm[rn.lo:rn.hi], cols.perm[cn.lo:cn.hi]
	rd, cd := src.dims()
	mm, nn := rd*len(ro), cd*len(co)
	if spec.lowRank {
		abs := perEntry * math.Sqrt(float64(mm*nn))
		// A rank k costs k(M+N) numbers against M·N for the dense block.
		if lr, ok := aca(src, ro, co, s.Tolerance, abs, mm*nn/(mm+nn)); ok {
			if !s.NoRecompression {
				lr = recompress(lr, s.Tolerance, abs)
			}
			return hblock{spec: spec, u: columnMajor(lr.u, lr.k), v: columnMajor(lr.v, lr.k), k: lr.k}, nil
		}
		spec.lowRank = false
	}
	d := make([]float64, mm*nn)
	for i, o := range ro {
		src.rowTo(d[i*rd*nn:(i+1)*rd*nn], o, co)
	}
	if v, ok := src.(validator); ok {
		if err := v.validate(d, ro, co); err != nil {
			return hblock{}, err
		}
	}
	return hblock{spec: spec, dense: single(d)}, nil
}

// columnMajor returns the row-major matrix a of k columns in single
// precision, column by column.
func columnMajor(a []float64, k int) []float32 {
	out := make([]float32, len(a))
	if k == 0 {
		return out
	}
	m := len(a) / k
	for r := range m {
		for l := range k {
			out[l*m+r] = float32(a[r*k+l])
		}
	}
	return out
}

func single(x []float64) []float32 {
	out := make([]float32, len(x))
	for i, v := range x {
		out[i] = float32(v)
	}
	return out
}

// makePlan lists, for every row leaf, the blocks whose rows cover it
// (and, if symmetric, the off-diagonal blocks whose columns cover it,
// transposed), in block order, and places each low-rank block's
// projections in the scratch.
func (h *hmatrix) makePlan() {
	nl := len(h.rows.leaves)
	lists := make([][]step, nl)
	for b := range h.blocks {
		blk := &h.blocks[b]
		if blk.dense == nil && blk.k == 0 {
			continue // dropped
		}
		rn, cn := &h.rows.nodes[blk.spec.row], &h.cols.nodes[blk.spec.col]
		for l := rn.leafLo; l < rn.leafHi; l++ {
			lists[l] = append(lists[l], step{b: b})
		}
		if h.symmetric && blk.spec.row != blk.spec.col {
			for l := cn.leafLo; l < cn.leafHi; l++ {
				lists[l] = append(lists[l], step{b: b, transposed: true})
			}
		}
		if blk.dense == nil {
			blk.tOff = len(h.t)
			n := blk.k
			if h.symmetric {
				n *= 2
			}
			h.t = append(h.t, make([]float32, n)...)
			h.lowRanks = append(h.lowRanks, b)
		}
	}
	h.planOff = make([]int, nl+1)
	for l, s := range lists {
		h.planOff[l+1] = h.planOff[l] + len(s)
		h.plan = append(h.plan, s...)
	}
	h.xp = make([]float32, h.cd*len(h.cols.perm))
	h.yp = make([]float64, h.rd*len(h.rows.perm))
	h.zp = make([]float32, h.rd*len(h.rows.perm))
}

// mulVec sets y = A x, with x and y in the objects' own order, rd (cd)
// values per row (column) object. Each entry of y is summed in a fixed
// order: first every low-rank block's projections, each by one
// goroutine, then each row leaf by one goroutine over its plan. Vectors
// enter the products in single precision, like the blocks (relative
// rounding 6·10⁻⁸), and every sum is accumulated in double precision by
// gonum's vectorized Dsdot.
func (h *hmatrix) mulVec(y, x []float64) {
	h.mu.Lock()
	defer h.mu.Unlock()
	rd, cd := h.rd, h.cd
	for p, o := range h.cols.perm {
		for c := range cd {
			h.xp[p*cd+c] = float32(x[o*cd+c])
		}
	}
	// One worker calls the loops directly: a closure would allocate.
	if h.workers == 1 {
		h.projectRange(0, len(h.lowRanks))
		h.leafRange(0, len(h.rows.leaves))
	} else {
		parallelFor(len(h.lowRanks), 64, h.workers, h.projectRange)
		parallelFor(len(h.rows.leaves), 4, h.workers, h.leafRange)
	}
	for p, o := range h.rows.perm {
		copy(y[o*rd:(o+1)*rd], h.yp[p*rd:(p+1)*rd])
	}
}

// projectRange projects the low-rank blocks lowRanks[lo:hi].
func (h *hmatrix) projectRange(lo, hi int) {
	for _, b := range h.lowRanks[lo:hi] {
		h.project(&h.blocks[b])
	}
}

// leafRange computes the rows of y of the row leaves lo to hi − 1.
func (h *hmatrix) leafRange(lo, hi int) {
	for l := lo; l < hi; l++ {
		h.leafProduct(l)
	}
}

// project computes t = Vᵀ x_σ of a low-rank block (τ, σ), and, for a
// symmetric matrix, t′ = Uᵀ x_τ after it.
func (h *hmatrix) project(b *hblock) {
	k := b.k
	cn := &h.cols.nodes[b.spec.col]
	mulTransTo(h.t[b.tOff:b.tOff+k], b.v, h.xp[h.cd*cn.lo:h.cd*cn.hi], k)
	if h.symmetric {
		rn := &h.rows.nodes[b.spec.row]
		mulTransTo(h.t[b.tOff+k:b.tOff+2*k], b.u, h.xp[h.rd*rn.lo:h.rd*rn.hi], k)
	}
}

// mulTransTo sets t = Fᵀ x for the column-major len(x)×k matrix F, in
// single precision (gonum's vectorized Sdot): a far block's share of y is
// small, and so is the relative rounding √len(x)·6·10⁻⁸ of its t.
func mulTransTo(t []float32, f []float32, x []float32, k int) {
	m := len(x)
	for l := range t {
		t[l] = impl.Sdot(m, f[l*m:], 1, x, 1)
	}
}

// addTo sets y += z.
func addTo(y []float64, z []float32) {
	z = z[:len(y)]
	for i, v := range z {
		y[i] += float64(v)
	}
}

// leafProduct computes the rows of y of row leaf l. Diagonal blocks,
// which hold the largest entries, are summed row by row in double
// precision (gonum's vectorized Dsdot); the other blocks' shares are
// summed in single precision (Sdot by rows; Saxpy by columns into z,
// then added to y), one block at a time: the rounding, about
// √(terms)·6·10⁻⁸ of one block's share, stays well below the
// tolerance.
func (h *hmatrix) leafProduct(l int) {
	leaf := &h.rows.nodes[h.rows.leaves[l]]
	r0 := h.rd * leaf.lo
	y := h.yp[r0 : h.rd*leaf.hi]
	z := h.zp[r0 : h.rd*leaf.hi]
	clear(y)
	for _, st := range h.plan[h.planOff[l]:h.planOff[l+1]] {
		b := &h.blocks[st.b]
		own, other := &h.rows.nodes[b.spec.row], &h.cols.nodes[b.spec.col]
		if st.transposed {
			own, other = other, own
		}
		off := r0 - h.rd*own.lo
		x := h.xp[h.cd*other.lo : h.cd*other.hi]
		switch {
		case b.dense != nil && b.spec.row == b.spec.col:
			nn := len(x)
			for r := range y {
				y[r] += impl.Dsdot(nn, b.dense[(off+r)*nn:], 1, x, 1)
			}
		case b.dense != nil && !st.transposed:
			nn := len(x)
			for r := range y {
				y[r] += float64(impl.Sdot(nn, b.dense[(off+r)*nn:], 1, x, 1))
			}
		case b.dense != nil:
			// zᵀ = xᵀ D[:, off : off+len(y)], row by row of D.
			nn := len(b.dense) / len(x)
			clear(z)
			for c, xc := range x {
				impl.Saxpy(len(z), xc, b.dense[c*nn+off:], 1, z, 1)
			}
			addTo(y, z)
		default:
			k := b.k
			f, t := b.u, h.t[b.tOff:b.tOff+k]
			if st.transposed {
				f, t = b.v, h.t[b.tOff+k:b.tOff+2*k]
			}
			m := len(f) / k
			clear(z)
			for l, tl := range t {
				impl.Saxpy(len(z), tl, f[l*m+off:], 1, z, 1)
			}
			addTo(y, z)
		}
	}
}

// Stats describes the storage of an operator.
type Stats struct {
	Elements      int     // number of elements
	DenseBlocks   int     // near-field blocks stored in full
	LowRankBlocks int     // far-field blocks stored as U Vᵀ
	DroppedBlocks int     // far-field blocks below their share of the error
	MaxRank       int     // largest rank of a low-rank block
	MeanRank      float64 // mean rank of the low-rank blocks
	Bytes         int64   // memory held, bytes
	// CompressionRatio is Bytes over the 8·(rows·cols) bytes of the full
	// matrix in double precision (the smaller, the better).
	CompressionRatio float64
}

// stats counts the blocks and the memory of h: every stored number, the
// trees' permutations and the product plan.
func (h *hmatrix) stats() Stats {
	var s Stats
	words := len(h.rows.perm) + clusterWords*len(h.rows.nodes) + len(h.planOff) + 2*len(h.plan) + len(h.yp)
	if h.cols != h.rows {
		words += len(h.cols.perm) + clusterWords*len(h.cols.nodes)
	}
	singles, ranks := len(h.t)+len(h.xp)+len(h.zp), 0
	for _, b := range h.blocks {
		if b.dense != nil {
			s.DenseBlocks++
			singles += len(b.dense)
			continue
		}
		if b.k == 0 {
			s.DroppedBlocks++
			continue
		}
		s.LowRankBlocks++
		s.MaxRank = max(s.MaxRank, b.k)
		ranks += b.k
		singles += len(b.u) + len(b.v)
	}
	if s.LowRankBlocks > 0 {
		s.MeanRank = float64(ranks) / float64(s.LowRankBlocks)
	}
	s.Bytes = 8*int64(words) + 4*int64(singles)
	full := 8 * float64(h.rd*len(h.rows.perm)) * float64(h.cd*len(h.cols.perm))
	s.CompressionRatio = float64(s.Bytes) / full
	return s
}

// impl is gonum's BLAS, whose Dsdot (single-precision vectors, double
// precision sum) is written in assembly on amd64.
var impl gonum.Implementation
