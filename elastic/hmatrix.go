package elastic

import (
	"cmp"
	"math"
	"slices"
	"sync"
)

// validator is implemented by sources that check the entries of the
// blocks they compute explicitly (the near field), where degenerate
// geometry shows.
type validator interface {
	validate(dense []float64, rows, cols []int) error
}

// hblock is one block of a hierarchical matrix: dense, or U Vᵀ, stored
// in single precision (relative rounding 6·10⁻⁸, below any tolerance
// allowed); see blockProduct for the precision of products.
type hblock struct {
	spec  blockSpec
	dense []float32 // (rd·m)×(cd·n), row-major; nil for a low-rank block
	u, v  []float32 // M×k and N×k, column-major
	k     int       // rank
	tOff  int       // offset of Vᵀx (then Uᵀx, if symmetric) in the scratch t
	cost  int       // numbers stored
}

// blockWords is the size of an hblock in 8-byte words.
const blockWords = 15

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
	workers    int

	mu    sync.Mutex // guards the scratch below
	parts []part     // the blocks split for products
	xp    []float32  // x in tree order
	// nz[k] counts the non-zero values among xp[:k]: a block whose
	// columns (or, for its transpose, rows) hold only zeros adds nothing
	// and is skipped.
	nz []int32
	yp []float64 // y in tree order
	t  []float32 // Vᵀx (and Uᵀx) of every low-rank block
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
			if w := float64(v); !math.IsInf(w, 0) && !math.IsNaN(w) {
				n2 += w * w // a field point at an element's tip is singular: its entries stay out of the norm
			}
		}
		norm2 += n2 * h.copies(specs[b])
	}
	entries := float64(rd*len(rows.perm)) * float64(cd*len(cols.perm))
	if err := h.assemble(src, specs, far, s, s.Tolerance*math.Sqrt(norm2/entries)); err != nil {
		return nil, err
	}
	h.makeParts()
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

// assemblyRuns is about the number of runs of consecutive blocks into
// which assemble splits a phase of the assembly.
const assemblyRuns = 256

// assemble computes the blocks idx of specs (in block order) in runs of
// consecutive blocks of about equal cost, in parallel over runs, largest
// first so that the last ones to finish are small. Low-rank blocks are
// allowed the absolute error perEntry·|b|^½. A run's numbers are stored
// in one allocation, in block order, so that a product reads memory
// nearly in order: at 10⁵ elements a product took 53 ms with one
// allocation per block and 39 ms with the blocks laid out in the order
// products read them (measured on two cores).
func (h *hmatrix) assemble(src source, specs []blockSpec, idx []int, s Settings, perEntry float64) error {
	runs := splitRuns(idx, func(b int) int {
		m, n := size(h.rows, specs[b].row), size(h.cols, specs[b].col)
		if specs[b].lowRank {
			return 16 * (m + n)
		}
		return m * n
	})
	var fe firstError
	parallelFor(len(runs), 1, s.Workers, func(lo, hi int) {
		for _, run := range runs[lo:hi] {
			if b, err := h.assembleRun(src, specs, run, s, perEntry); err != nil {
				fe.set(b, err)
				return
			}
		}
	})
	return fe.err
}

// splitRuns splits idx into runs of consecutive indices whose costs add
// up to about 1/assemblyRuns of the total (a costlier index is a run of
// its own), and returns them costliest first.
func splitRuns(idx []int, cost func(int) int) [][]int {
	total := 0
	for _, b := range idx {
		total += cost(b)
	}
	type run struct {
		idx  []int
		cost int
	}
	var runs []run
	for lo := 0; lo < len(idx); {
		r := run{idx: idx[lo:lo]}
		for hi := lo; hi < len(idx) && (hi == lo || r.cost+cost(idx[hi]) <= total/assemblyRuns); hi++ {
			r.idx, r.cost = idx[lo:hi+1], r.cost+cost(idx[hi])
		}
		runs = append(runs, r)
		lo += len(r.idx)
	}
	slices.SortStableFunc(runs, func(a, b run) int { return cmp.Compare(b.cost, a.cost) })
	out := make([][]int, len(runs))
	for i, r := range runs {
		out[i] = r.idx
	}
	return out
}

// assembleRun computes the blocks of one run and stores their numbers in
// one allocation, in block order. On failure it returns the failing block.
func (h *hmatrix) assembleRun(src source, specs []blockSpec, run []int, s Settings, perEntry float64) (int, error) {
	done := make([]computed, len(run))
	n := 0
	for i, b := range run {
		c, err := computeBlock(src, h.rows, h.cols, specs[b], s, perEntry)
		if err != nil {
			return b, err
		}
		done[i] = c
		n += c.size()
	}
	slab := make([]float32, n)
	for i, b := range run {
		k := done[i].size()
		h.blocks[b] = done[i].store(slab[:k:k])
		slab = slab[k:]
	}
	return 0, nil
}

func size(t *tree, node int) int { return t.nodes[node].hi - t.nodes[node].lo }

// computed is a block's numbers in double precision: the low-rank
// factors when spec.lowRank, otherwise dense (row-major, M×N).
type computed struct {
	spec  blockSpec
	dense []float64
	lr    lowRank
}

// computeBlock computes one block: dense, or compressed by ACA (falling
// back to dense when the rank would not save memory) and recompressed.
func computeBlock(src source, rows, cols *tree, spec blockSpec, s Settings, perEntry float64) (computed, error) {
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
			return computed{spec: spec, lr: lr}, nil
		}
		spec.lowRank = false
	}
	d := make([]float64, mm*nn)
	for i, o := range ro {
		src.rowTo(d[i*rd*nn:(i+1)*rd*nn], o, co)
	}
	if v, ok := src.(validator); ok {
		if err := v.validate(d, ro, co); err != nil {
			return computed{}, err
		}
	}
	return computed{spec: spec, dense: d}, nil
}

// size returns the number of single-precision numbers c stores.
func (c *computed) size() int {
	if c.spec.lowRank {
		return len(c.lr.u) + len(c.lr.v)
	}
	return len(c.dense)
}

// store returns the block c in single precision, its numbers in buf
// (c.size() long): a dense block row-major, low-rank factors column by
// column.
func (c *computed) store(buf []float32) hblock {
	b := hblock{spec: c.spec, cost: len(buf)}
	if !c.spec.lowRank {
		for i, v := range c.dense {
			buf[i] = float32(v)
		}
		b.dense = buf
		return b
	}
	b.k = c.lr.k
	b.u, b.v = buf[:len(c.lr.u):len(c.lr.u)], buf[len(c.lr.u):]
	columnMajor(b.u, c.lr.u, b.k)
	columnMajor(b.v, c.lr.v, b.k)
	return b
}

// columnMajor writes the row-major matrix a of k columns into dst in
// single precision, column by column.
func columnMajor(dst []float32, a []float64, k int) {
	if k == 0 {
		return
	}
	m := len(a) / k
	for r := range m {
		for l := range k {
			dst[l*m+r] = float32(a[r*k+l])
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
// trees and the products' scratch.
func (h *hmatrix) stats() Stats {
	var s Stats
	words := len(h.rows.perm) + clusterWords*len(h.rows.nodes) + len(h.yp) + blockWords*len(h.blocks)
	if h.cols != h.rows {
		words += len(h.cols.perm) + clusterWords*len(h.cols.nodes)
	}
	singles, ranks := len(h.t)+len(h.xp), 0
	for _, p := range h.parts {
		words += len(p.y) + len(p.blocks)
		singles += len(p.z)
	}
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
