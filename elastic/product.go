package elastic

import (
	"gonum.org/v1/gonum/blas/gonum"
)

// productParts is the number of parts into which the blocks are split
// for products. It is fixed, not the number of workers, so that sums are
// formed in the same order whatever the number of workers.
const productParts = 4

// part is a run of consecutive blocks whose contributions to a product
// are summed into the part's own y, by one goroutine at a time.
type part struct {
	blocks []int     // block indices, in block order
	y      []float64 // the part's share of y, in tree order
	z      []float32 // one block's share of y, single precision
}

// makeParts splits the stored blocks into productParts runs holding
// about the same number of stored numbers (dropped blocks hold none and
// are left out), and places each low-rank block's projections in the
// scratch.
func (h *hmatrix) makeParts() {
	total := 0
	for b := range h.blocks {
		blk := &h.blocks[b]
		total += blk.cost
		if blk.dense == nil && blk.k > 0 {
			blk.tOff = len(h.t)
			h.t = append(h.t, make([]float32, 2*blk.k)...)
		}
	}
	n := h.rd * len(h.rows.perm)
	h.parts = make([]part, productParts)
	sum := 0
	for b := range h.blocks {
		if h.blocks[b].cost == 0 {
			continue
		}
		p := min(productParts-1, sum*productParts/max(total, 1))
		h.parts[p].blocks = append(h.parts[p].blocks, b)
		sum += h.blocks[b].cost
	}
	for p := range h.parts {
		h.parts[p].y = make([]float64, n)
		h.parts[p].z = make([]float32, n)
	}
	h.xp = make([]float32, h.cd*len(h.cols.perm))
	h.nz = make([]int32, len(h.xp)+1)
	h.yp = make([]float64, n)
}

// mulVec sets y = A x, with x and y in the objects' own order, rd (cd)
// values per row (column) object. Each part sums its blocks'
// contributions in block order, and the parts are added in part order,
// so the result does not depend on the number of workers. Each stored
// number is read from memory once: a symmetric matrix applies an
// off-diagonal block and its transpose in the same pass.
func (h *hmatrix) mulVec(y, x []float64) {
	h.mu.Lock()
	defer h.mu.Unlock()
	rd, cd := h.rd, h.cd
	for p, o := range h.cols.perm {
		for c := range cd {
			h.xp[p*cd+c] = float32(x[o*cd+c])
		}
	}
	for k, v := range h.xp {
		h.nz[k+1] = h.nz[k]
		if v != 0 {
			h.nz[k+1]++
		}
	}
	// One worker calls the loops directly: a closure would allocate.
	if h.workers == 1 {
		h.partRange(0, len(h.parts))
		h.sumParts(0, len(h.yp))
	} else {
		parallelFor(len(h.parts), 1, h.workers, h.partRange)
		parallelFor(len(h.yp), 1<<14, h.workers, h.sumParts)
	}
	for p, o := range h.rows.perm {
		copy(y[o*rd:(o+1)*rd], h.yp[p*rd:(p+1)*rd])
	}
}

// partRange computes the shares of y of parts lo to hi − 1.
func (h *hmatrix) partRange(lo, hi int) {
	for p := lo; p < hi; p++ {
		pt := &h.parts[p]
		clear(pt.y)
		for _, b := range pt.blocks {
			h.blockProduct(&h.blocks[b], pt)
		}
	}
}

// sumParts sets yp[lo:hi] to the sum of the parts' shares, in part order.
func (h *hmatrix) sumParts(lo, hi int) {
	y := h.yp[lo:hi]
	copy(y, h.parts[0].y[lo:hi])
	for _, pt := range h.parts[1:] {
		for i, v := range pt.y[lo:hi] {
			y[i] += v
		}
	}
}

// blockProduct adds block b's contribution (and, for an off-diagonal
// block of a symmetric matrix, its transpose's) to the part's y. A
// product whose slice of x is all zeros adds exactly nothing and is
// skipped: slip and opening increments are non-zero on few elements, so
// most far blocks drop out of their products.
// Diagonal blocks, which hold the largest entries, are summed in double
// precision (gonum's vectorized Dsdot); the other blocks in single
// precision (Sdot by rows, Saxpy by columns into z, then added to y),
// one block at a time: the rounding, about √(terms)·6·10⁻⁸ of one block's
// share, stays well below the tolerance.
func (h *hmatrix) blockProduct(b *hblock, pt *part) {
	rn, cn := &h.rows.nodes[b.spec.row], &h.cols.nodes[b.spec.col]
	xc := h.xp[h.cd*cn.lo : h.cd*cn.hi]
	yr := pt.y[h.rd*rn.lo : h.rd*rn.hi]
	forward := h.nz[h.cd*cn.hi] > h.nz[h.cd*cn.lo]
	trans := h.symmetric && b.spec.row != b.spec.col && h.nz[h.rd*rn.hi] > h.nz[h.rd*rn.lo]
	if !forward && !trans {
		return
	}
	var xr []float32
	var yc []float64
	if trans { // rd = cd
		xr, yc = h.xp[h.rd*rn.lo:h.rd*rn.hi], pt.y[h.cd*cn.lo:h.cd*cn.hi]
	}
	nn := len(xc)
	switch {
	case b.dense != nil && b.spec.row == b.spec.col:
		for r := range yr {
			yr[r] += impl.Dsdot(nn, b.dense[r*nn:], 1, xc, 1)
		}
	case b.dense != nil:
		var zc []float32
		if trans {
			zc = pt.z[:nn]
			clear(zc)
		}
		for r := range yr {
			row := b.dense[r*nn : (r+1)*nn]
			if forward {
				yr[r] += float64(impl.Sdot(nn, row, 1, xc, 1))
			}
			if trans {
				impl.Saxpy(nn, xr[r], row, 1, zc, 1)
			}
		}
		if trans {
			addTo(yc, zc)
		}
	default:
		k, m := b.k, len(yr)
		t, t2 := h.t[b.tOff:b.tOff+k], h.t[b.tOff+k:b.tOff+2*k]
		zr := pt.z[:m]
		if forward {
			for l := range t {
				t[l] = impl.Sdot(nn, b.v[l*nn:], 1, xc, 1)
			}
			clear(zr)
		}
		for l := range k { // each column of U read once for both products
			col := b.u[l*m : (l+1)*m]
			if trans {
				t2[l] = impl.Sdot(m, col, 1, xr, 1)
			}
			if forward {
				impl.Saxpy(m, t[l], col, 1, zr, 1)
			}
		}
		if forward {
			addTo(yr, zr)
		}
		if trans {
			zc := pt.z[:nn]
			clear(zc)
			for l, tl := range t2 {
				impl.Saxpy(nn, tl, b.v[l*nn:], 1, zc, 1)
			}
			addTo(yc, zc)
		}
	}
}

// addTo sets y += z.
func addTo(y []float64, z []float32) {
	z = z[:len(y)]
	for i, v := range z {
		y[i] += float64(v)
	}
}

// impl is gonum's BLAS, whose Dsdot, Sdot and Saxpy are written in
// assembly on amd64.
var impl gonum.Implementation
