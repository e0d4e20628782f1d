package elastic

import (
	"math"
	"math/bits"
	"slices"
	"sync"

	"gonum.org/v1/gonum/spatial/r2"
)

// opSource gives the operator's entries to the hierarchical matrix in
// the symmetric form
//
//	S = J W^½ A W^-½,  S_ij = J (W_i/W_j)^½ A_ij,  J = diag(−1, 1),
//
// which the reciprocity W_i A_ij = J (W_j A_ji)ᵀ J makes symmetric, so
// that only half of it is stored; the diagonal blocks are A's up to the
// sign of the shear row, so S is as large as A. Row and column objects
// are elements; the 2×2 block of a pair is [S_τs S_τw; S_σs S_σw].
type opSource struct {
	m     *model
	sqrtW []float64 // W_i^½
}

func newOpSource(m *model) opSource {
	w := make([]float64, len(m.geo))
	for i := range w {
		w[i] = math.Sqrt(m.weight(i))
	}
	return opSource{m: m, sqrtW: w}
}

func (opSource) dims() (int, int) { return 2, 2 }

// entry returns S_ij.
func (s opSource) entry(i, j int) Block {
	b := s.m.pair(i, j)
	f := s.sqrtW[i] / s.sqrtW[j]
	return Block{ShearSlip: -f * b.ShearSlip, ShearOpening: -f * b.ShearOpening, NormalSlip: f * b.NormalSlip, NormalOpening: f * b.NormalOpening}
}

func (s opSource) rowTo(dst []float64, i int, cols []int) {
	n2 := 2 * len(cols)
	for jj, j := range cols {
		b := s.entry(i, j)
		dst[2*jj], dst[2*jj+1] = b.ShearSlip, b.ShearOpening
		dst[n2+2*jj], dst[n2+2*jj+1] = b.NormalSlip, b.NormalOpening
	}
}

func (s opSource) colTo(dst []float64, rows []int, j int) {
	for ii, i := range rows {
		b := s.entry(i, j)
		dst[4*ii], dst[4*ii+1], dst[4*ii+2], dst[4*ii+3] = b.ShearSlip, b.ShearOpening, b.NormalSlip, b.NormalOpening
	}
}

// validate checks every pair of a near-field block for coincident
// centres and non-finite entries.
func (s opSource) validate(d []float64, rows, cols []int) error {
	n2 := 2 * len(cols)
	for ii, i := range rows {
		for jj, j := range cols {
			b := Block{
				ShearSlip: d[2*ii*n2+2*jj], ShearOpening: d[2*ii*n2+2*jj+1],
				NormalSlip: d[(2*ii+1)*n2+2*jj], NormalOpening: d[(2*ii+1)*n2+2*jj+1],
			}
			if err := s.m.check(b, i, j); err != nil {
				return err
			}
		}
	}
	return nil
}

// elementTree clusters elements by their centres and the boxes of their
// segments.
func elementTree(elems []Element, leafSize int) *tree {
	centres := make([]r2.Vec, len(elems))
	boxes := make([]box, len(elems))
	for i, e := range elems {
		centres[i] = e.Centre()
		boxes[i] = emptyBox().extend(e.P0).extend(e.P1)
	}
	return buildTree(centres, boxes, leafSize)
}

// Hierarchical is an Operator stored as a hierarchical matrix: a cluster
// tree of the elements by bounding boxes, dense blocks for neighbouring
// clusters and low-rank blocks U Vᵀ, found by adaptive cross
// approximation and recompressed, for clusters far apart relative to
// their size. Memory and product time grow as N log N.
type Hierarchical struct {
	m    *model
	src  opSource
	h    *hmatrix
	mu   sync.Mutex // guards x and y
	x, y []float64  // interleaved W^½ (s, w) and S W^½ (s, w)
}

// NewHierarchical assembles the hierarchical operator of the elements in
// parallel. It returns the errors of NewDense, and a *TooLargeError when
// Settings.MemoryLimit is set and EstimateMemory exceeds it.
func NewHierarchical(elems []Element, m Material, s Settings) (*Hierarchical, error) {
	r, err := prepare(elems, m, s)
	if err != nil {
		return nil, err
	}
	md := newModel(elems, m, r)
	t := elementTree(elems, r.LeafSize)
	if r.MemoryLimit > 0 {
		if est := estimateHierarchical(md, t, r); est > r.MemoryLimit {
			return nil, &TooLargeError{Elements: len(elems), Estimate: est, Limit: r.MemoryLimit}
		}
	}
	src := newOpSource(md)
	h, err := newHMatrix(src, t, t, true, r)
	if err != nil {
		return nil, err
	}
	n := len(elems)
	return &Hierarchical{m: md, src: src, h: h, x: make([]float64, 2*n), y: make([]float64, 2*n)}, nil
}

// Len returns the number of elements.
func (o *Hierarchical) Len() int { return len(o.m.geo) }

// At returns the influence of element j on element i, computed exactly
// from the kernel (not from the compressed blocks).
func (o *Hierarchical) At(i, j int) Block { return o.m.pair(i, j) }

// MulVecTo computes Δτ and Δσn from slip and opening (see Operator),
// with a relative error of about Settings.Tolerance. Calls are
// serialized; the result does not depend on the number of workers.
func (o *Hierarchical) MulVecTo(dstShear, dstNormal, slip, opening []float64) {
	checkLen(o.Len(), dstShear, dstNormal, slip, opening)
	o.mu.Lock()
	defer o.mu.Unlock()
	w := o.src.sqrtW
	for i := range slip {
		o.x[2*i], o.x[2*i+1] = w[i]*slip[i], w[i]*opening[i]
	}
	o.h.mulVec(o.y, o.x)
	for i := range dstShear {
		dstShear[i], dstNormal[i] = -o.y[2*i]/w[i], o.y[2*i+1]/w[i]
	}
}

// Stats returns the block counts, ranks and memory of the operator.
func (o *Hierarchical) Stats() Stats {
	s := o.h.stats()
	s.Elements = o.Len()
	s.Bytes += 8 * int64(len(o.x)+len(o.y)+len(o.src.sqrtW)+geometryWords*len(o.m.geo))
	return s
}

// EstimateMemory returns the memory, bytes, that New would use for the
// operator of the elements, without assembling it: exact for a Dense
// operator; for a Hierarchical one, the near field and the index are
// counted exactly and the ranks of the far field are measured on a few
// blocks of each size and extrapolated (typically within 20 %). It costs
// a small fraction of the assembly.
func EstimateMemory(elems []Element, m Material, s Settings) (int64, error) {
	r, err := prepare(elems, m, s)
	if err != nil {
		return 0, err
	}
	if len(elems) < r.DenseBelow {
		return denseBytes(len(elems)), nil
	}
	return estimateHierarchical(newModel(elems, m, r), elementTree(elems, r.LeafSize), r), nil
}

// estimateSamples is the number of blocks of each kind and size class
// that EstimateMemory computes.
const estimateSamples = 6

// estimateHierarchical predicts the memory of the hierarchical operator
// over t (see EstimateMemory). The norm of the matrix, which sets the
// error allowed to each far block, is extrapolated from evenly spaced
// near-field blocks; far blocks are grouped by ⌊log₂(m + n)⌋, and within
// a group the numbers stored per row-plus-column are measured on evenly
// spaced samples.
func estimateHierarchical(md *model, t *tree, s Settings) int64 {
	src := newOpSource(md)
	specs := slices.DeleteFunc(partition(t, t, s.Admissibility),
		func(b blockSpec) bool { return t.nodes[b.row].lo > t.nodes[b.col].lo })
	n := len(t.perm)
	// Geometry, tree, permutation, y in tree order and the parts' y, √W,
	// the operator's x and y, the blocks and the parts' lists of them; x
	// in tree order and the parts' z in single precision.
	words := geometryWords*n + clusterWords*len(t.nodes) + n + (1+productParts)*2*n + n + 4*n + (1+blockWords)*len(specs)
	singles := (1 + productParts) * 2 * n
	var near []blockSpec
	classes := map[int][]blockSpec{}
	nearEntries := 0
	for _, sp := range specs {
		m, k := size(t, sp.row), size(t, sp.col)
		copies := 1
		if sp.row != sp.col {
			copies = 2
		}
		if !sp.lowRank {
			singles += 4 * m * k
			nearEntries += 4 * m * k * copies
			near = append(near, sp)
			continue
		}
		c := bits.Len(uint(m + k))
		classes[c] = append(classes[c], sp)
	}
	norm2, sampled := 0.0, 0
	for _, sp := range evenly(near, 8*estimateSamples) {
		b, _ := computeBlock(src, t, t, sp, s, 0)
		for _, v := range b.dense {
			norm2 += v * v
		}
		sampled += len(b.dense)
	}
	perEntry := s.Tolerance * math.Sqrt(norm2*float64(nearEntries)/float64(sampled)/(4*float64(n)*float64(n)))
	for _, group := range classes {
		sampledSingles, sampledRC, totalRC := 0, 0, 0
		for _, sp := range group {
			totalRC += 2 * (size(t, sp.row) + size(t, sp.col))
		}
		for _, sp := range evenly(group, estimateSamples) {
			b, _ := computeBlock(src, t, t, sp, s, perEntry) // far blocks are not validated
			rc := 2 * (size(t, sp.row) + size(t, sp.col))
			sampledRC += rc
			sampledSingles += b.size()
			if b.spec.lowRank {
				sampledSingles += 2 * b.lr.k // projections
			}
		}
		singles += int(float64(sampledSingles) / float64(sampledRC) * float64(totalRC))
	}
	return 8*int64(words) + 4*int64(singles)
}

// evenly returns up to k evenly spaced items of s.
func evenly[T any](s []T, k int) []T {
	step := max(1, len(s)/k)
	var out []T
	for i := step / 2; i < len(s); i += step {
		out = append(out, s[i])
	}
	return out
}
