package elastic

// Dense is an Operator that stores every block: exact, O(N²) memory
// (32 bytes per pair) and time per product. It is meant for small
// networks and as the reference for Hierarchical.
type Dense struct {
	n       int
	a       []Block // row-major, a[i*n+j] = A_ij
	workers int
}

// NewDense assembles the dense operator of the elements. It returns an
// *InputError for invalid elements, material or settings, and a
// *GeometryError for two elements with coincident centres or a centre on
// another element's tip.
func NewDense(elems []Element, m Material, s Settings) (*Dense, error) {
	r, err := prepare(elems, m, s)
	if err != nil {
		return nil, err
	}
	n := len(elems)
	if r.MemoryLimit > 0 && denseBytes(n) > r.MemoryLimit {
		return nil, &TooLargeError{Elements: n, Estimate: denseBytes(n), Limit: r.MemoryLimit}
	}
	md := newModel(elems, m, r)
	d := &Dense{n: n, a: make([]Block, n*n), workers: r.Workers}
	var fe firstError
	// Row i fills A_ij and A_ji for j ≥ i: each pair is computed once,
	// and each entry written by one goroutine.
	parallelFor(n, 8, r.Workers, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			for j := i; j < n; j++ {
				aij, aji := md.pairBoth(i, j)
				if err := md.check(aij, i, j); err != nil {
					fe.set(i, err)
					return
				}
				d.a[i*n+j], d.a[j*n+i] = aij, aji
			}
		}
	})
	if fe.err != nil {
		return nil, fe.err
	}
	return d, nil
}

// denseBytes is the memory of a Dense operator of n elements.
func denseBytes(n int) int64 { return int64(n) * int64(n) * 32 }

// Len returns the number of elements.
func (d *Dense) Len() int { return d.n }

// At returns the influence of element j on element i.
func (d *Dense) At(i, j int) Block { return d.a[i*d.n+j] }

// Bytes returns the memory held by the matrix, bytes.
func (d *Dense) Bytes() int64 { return denseBytes(d.n) }

// MulVecTo computes Δτ and Δσn from slip and opening (see Operator).
// Rows are summed in a fixed order, so the result does not depend on the
// number of workers.
func (d *Dense) MulVecTo(dstShear, dstNormal, slip, opening []float64) {
	checkLen(d.n, dstShear, dstNormal, slip, opening)
	if d.workers == 1 { // a closure would allocate
		d.rows(0, d.n, dstShear, dstNormal, slip, opening)
		return
	}
	parallelFor(d.n, 64, d.workers, func(lo, hi int) { d.rows(lo, hi, dstShear, dstNormal, slip, opening) })
}

// rows computes the rows lo to hi − 1 of the product.
func (d *Dense) rows(lo, hi int, dstShear, dstNormal, slip, opening []float64) {
	for i := lo; i < hi; i++ {
		row := d.a[i*d.n : (i+1)*d.n]
		var t, s float64
		for j, b := range row {
			t += b.ShearSlip*slip[j] + b.ShearOpening*opening[j]
			s += b.NormalSlip*slip[j] + b.NormalOpening*opening[j]
		}
		dstShear[i], dstNormal[i] = t, s
	}
}
