package elastic

import (
	"cmp"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"
)

// cluster is a node of a cluster tree: the objects perm[lo:hi] and the
// box that holds all of them.
type cluster struct {
	lo, hi      int
	bb          box
	left, right int // child nodes, −1 for a leaf
}

func (c *cluster) isLeaf() bool { return c.left < 0 }

// clusterWords is the size of a cluster in 8-byte words.
const clusterWords = 8

// tree is a binary cluster tree of objects (elements or points) built by
// bisecting the box of their centres across its longer side at the
// median (Hackbusch 1999, §2: geometrically balanced clustering), so that
// every cluster is a contiguous range of perm.
type tree struct {
	perm  []int // tree position → object index
	nodes []cluster
}

// buildTree clusters objects with the given centres and boxes (a point
// has a box of zero size) into leaves of at most leafSize objects.
func buildTree(centres []r2.Vec, boxes []box, leafSize int) *tree {
	t := &tree{perm: make([]int, len(centres))}
	for i := range t.perm {
		t.perm[i] = i
	}
	t.split(centres, boxes, 0, len(centres), leafSize)
	return t
}

// split adds the node for perm[lo:hi] and its subtree, returning its index.
func (t *tree) split(centres []r2.Vec, boxes []box, lo, hi, leafSize int) int {
	bb, cb := emptyBox(), emptyBox()
	for _, o := range t.perm[lo:hi] {
		bb = bb.union(boxes[o])
		cb = cb.extend(centres[o])
	}
	id := len(t.nodes)
	t.nodes = append(t.nodes, cluster{lo: lo, hi: hi, bb: bb, left: -1, right: -1})
	if hi-lo <= leafSize {
		return id
	}
	coord := func(p r2.Vec) float64 { return p.X }
	if cb.max.Y-cb.min.Y > cb.max.X-cb.min.X {
		coord = func(p r2.Vec) float64 { return p.Y }
	}
	slices.SortFunc(t.perm[lo:hi], func(a, b int) int {
		if c := cmp.Compare(coord(centres[a]), coord(centres[b])); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	mid := lo + (hi-lo)/2
	left := t.split(centres, boxes, lo, mid, leafSize)
	right := t.split(centres, boxes, mid, hi, leafSize)
	t.nodes[id].left, t.nodes[id].right = left, right
	return id
}

// blockSpec is a block of the partition: the row cluster, the column
// cluster, and whether it is compressed.
type blockSpec struct {
	row, col int
	lowRank  bool
}

// partition returns the blocks of the hierarchical partition of rows ×
// cols under the standard admissibility condition
//
//	min(diam τ, diam σ) ≤ η · dist(τ, σ),  dist > 0
//
// (Hackbusch 1999; Bebendorf 2000, eq. 1.3): admissible pairs of
// clusters become low-rank blocks, inadmissible pairs of leaves dense
// blocks, and other pairs are split. Blocks come in depth-first order.
func partition(rows, cols *tree, eta float64) []blockSpec {
	var out []blockSpec
	var rec func(r, c int)
	rec = func(r, c int) {
		rn, cn := &rows.nodes[r], &cols.nodes[c]
		d := rn.bb.distance(cn.bb)
		if d > 0 && min(rn.bb.diameter(), cn.bb.diameter()) <= eta*d {
			out = append(out, blockSpec{row: r, col: c, lowRank: true})
			return
		}
		switch {
		case rn.isLeaf() && cn.isLeaf():
			out = append(out, blockSpec{row: r, col: c})
		case rn.isLeaf():
			rec(r, cn.left)
			rec(r, cn.right)
		case cn.isLeaf():
			rec(rn.left, c)
			rec(rn.right, c)
		default:
			rec(rn.left, cn.left)
			rec(rn.left, cn.right)
			rec(rn.right, cn.left)
			rec(rn.right, cn.right)
		}
	}
	rec(0, 0)
	return out
}
