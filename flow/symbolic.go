package flow

// Symbolic analysis of a sparse Cholesky factorization (Davis 2006, ch. 4):
// the elimination tree, its postorder, and the pattern of L computed row by
// row from row subtrees. Everything here depends on the pattern only and is
// done once per pattern.

// sparsePattern is the full symmetric pattern of a permuted matrix
// C = P A Pᵀ by rows, columns ascending, with src the position of each
// entry in the original matrix's Val.
type sparsePattern struct {
	n   int
	ptr []int
	col []int32
	src []int
}

// permutedPattern returns the pattern of C = P A Pᵀ for the ordering perm
// (perm[k] = original unknown of new index k, iperm its inverse).
func permutedPattern(a *CSR, perm, iperm []int32) *sparsePattern {
	n := a.N
	c := &sparsePattern{n: n, ptr: make([]int, n+1), col: make([]int32, a.NNZ()), src: make([]int, a.NNZ())}
	q := 0
	for k, r := range perm {
		for p := a.RowPtr[r]; p < a.RowPtr[r+1]; p++ {
			c.col[q] = iperm[a.ColIdx[p]]
			c.src[q] = p
			q++
		}
		c.ptr[k+1] = q
		sortPaired(c.col[c.ptr[k]:q], c.src[c.ptr[k]:q])
	}
	return c
}

// permute returns Q C Qᵀ for the ordering q (iq its inverse), keeping
// the sources in the original matrix.
func (c *sparsePattern) permute(q, iq []int32) *sparsePattern {
	d := &sparsePattern{n: c.n, ptr: make([]int, c.n+1), col: make([]int32, len(c.col)), src: make([]int, len(c.src))}
	t := 0
	for k, r := range q {
		for p := c.ptr[r]; p < c.ptr[r+1]; p++ {
			d.col[t] = iq[c.col[p]]
			d.src[t] = c.src[p]
			t++
		}
		d.ptr[k+1] = t
		sortPaired(d.col[d.ptr[k]:t], d.src[d.ptr[k]:t])
	}
	return d
}

// permutedUpper is the lower triangle of C stored by columns, which is
// its upper triangle by rows: row k lists the columns j ≤ k of C(k, j) in
// ascending order, the last one being the diagonal.
type permutedUpper struct {
	ptr []int
	col []int32
	src []int
}

// upper extracts the entries j ≤ k of each row k of c.
func (c *sparsePattern) upper() *permutedUpper {
	u := &permutedUpper{ptr: make([]int, c.n+1)}
	cnt := 0
	for k := range c.n {
		for p := c.ptr[k]; p < c.ptr[k+1] && c.col[p] <= int32(k); p++ {
			cnt++
		}
	}
	u.col, u.src = make([]int32, cnt), make([]int, cnt)
	q := 0
	for k := range c.n {
		for p := c.ptr[k]; p < c.ptr[k+1] && c.col[p] <= int32(k); p++ {
			u.col[q], u.src[q] = c.col[p], c.src[p]
			q++
		}
		u.ptr[k+1] = q
	}
	return u
}

// eliminationTree returns parent[k] of each column of C (−1 for a root),
// from Liu's algorithm with path compression through ancestor links
// (Davis 2006, §4.1).
func eliminationTree(c *sparsePattern) []int32 {
	n := c.n
	parent := make([]int32, n)
	ancestor := make([]int32, n)
	for k := range n {
		parent[k], ancestor[k] = -1, -1
		for _, i := range c.col[c.ptr[k]:c.ptr[k+1]] {
			if i >= int32(k) {
				break // columns ascend: the rest are not below k
			}
			for i != -1 && i < int32(k) {
				next := ancestor[i]
				ancestor[i] = int32(k)
				if next == -1 {
					parent[i] = int32(k)
				}
				i = next
			}
		}
	}
	return parent
}

// treePostorder returns a depth-first postorder of the forest given by
// parent: post[k] is the node visited k-th. Children are visited in
// ascending order.
func treePostorder(parent []int32) []int32 {
	n := len(parent)
	head := make([]int32, n)
	next := make([]int32, n)
	for i := range head {
		head[i] = -1
	}
	for j := n - 1; j >= 0; j-- {
		if p := parent[j]; p != -1 {
			next[j] = head[p]
			head[p] = int32(j)
		}
	}
	post := make([]int32, 0, n)
	stack := make([]int32, 0, 64)
	for r := range n {
		if parent[r] == -1 {
			post = depthFirstPost(int32(r), head, next, stack, post, -1)
		}
	}
	return post
}

// lowerPattern is the structure of L: column j occupies colPtr[j]:colPtr[j+1]
// of rowIdx, diagonal first, rows ascending; rows of L (the strictly lower
// part, columns ascending) are in rowPtr/colIdx.
type lowerPattern struct {
	colPtr []int
	rowIdx []int32
	rowPtr []int
	colIdx []int32
}

// columnCounts returns the number of entries in each column of L,
// diagonal included, in time nearly linear in nnz(A), without forming L
// (Gilbert, Ng & Peyton 1994; Davis 2006, §4.5). The numbering of C must
// be a postorder of its elimination tree parent, so that every subtree
// occupies a contiguous range of indices ending at its root. The count of
// column j is built from differences: +1 for each row subtree in which j
// is a leaf, −1 at the least common ancestor of consecutive leaves of the
// same row subtree, −1 at each parent, then summed over subtrees.
func columnCounts(c *sparsePattern, parent []int32) []int {
	n := c.n
	count := make([]int, n)
	first := make([]int32, n)
	maxFirst := make([]int32, n)
	prevLeaf := make([]int32, n)
	ancestor := make([]int32, n)
	for k := range n {
		first[k], maxFirst[k], prevLeaf[k], ancestor[k] = -1, -1, -1, int32(k)
	}
	// first[j] is the first (lowest) index in j's subtree; leaves start
	// with one entry, their diagonal.
	for k := range n {
		j := int32(k)
		if first[j] == -1 {
			count[j] = 1
		}
		for ; j != -1 && first[j] == -1; j = parent[j] {
			first[j] = int32(k)
		}
	}
	for j := range int32(n) {
		if p := parent[j]; p != -1 {
			count[p]--
		}
		for _, i := range c.col[c.ptr[j]:c.ptr[j+1]] {
			if i <= j || first[j] <= maxFirst[i] {
				continue // j is not a leaf of row subtree i
			}
			maxFirst[i] = first[j]
			jprev := prevLeaf[i]
			prevLeaf[i] = j
			count[j]++
			if jprev == -1 {
				continue // j is the first leaf of row subtree i
			}
			// Least common ancestor of jprev and j, with path compression.
			q := jprev
			for q != ancestor[q] {
				q = ancestor[q]
			}
			for s := jprev; s != q; {
				next := ancestor[s]
				ancestor[s] = q
				s = next
			}
			count[q]--
		}
		if p := parent[j]; p != -1 {
			ancestor[j] = p
		}
	}
	for j := range n {
		if p := parent[j]; p != -1 {
			count[p] += count[j]
		}
	}
	return count
}

// symbolicPattern computes the pattern of L from the row subtrees of the
// elimination tree: row k of L holds the nodes on the paths from each
// j < k with C(k, j) ≠ 0 up towards k (Davis 2006, §4.2), given the
// column counts. Its cost is proportional to nnz(L).
func symbolicPattern(u *permutedUpper, parent []int32, counts []int) *lowerPattern {
	n := len(counts)
	colPtr := make([]int, n+1)
	for j, c := range counts {
		colPtr[j+1] = colPtr[j] + c
	}
	// Column structure, filled in ascending row order, so sorted.
	rowIdx := make([]int32, colPtr[n])
	fill := make([]int, n)
	mark := make([]int32, n)
	for j := range n {
		rowIdx[colPtr[j]] = int32(j)
		fill[j] = colPtr[j] + 1
		mark[j] = -1
	}
	for k := range n {
		mark[k] = int32(k)
		for _, j := range u.col[u.ptr[k]:u.ptr[k+1]] {
			for ; mark[j] != int32(k); j = parent[j] {
				mark[j] = int32(k)
				rowIdx[fill[j]] = int32(k)
				fill[j]++
			}
		}
	}
	for j := range n {
		if fill[j] != colPtr[j+1] {
			panic("flow: column counts disagree with the row subtrees")
		}
	}
	// Row structure (strictly lower part) by transposition, also sorted.
	rowPtr := make([]int, n+1)
	for _, i := range rowIdx {
		rowPtr[i+1]++
	}
	for k := range n {
		rowPtr[k+1] += rowPtr[k] - 1 // minus the diagonal
	}
	colIdx := make([]int32, rowPtr[n])
	copy(fill, rowPtr[:n])
	for j := range n {
		for _, k := range rowIdx[colPtr[j]+1 : colPtr[j+1]] {
			colIdx[fill[k]] = int32(j)
			fill[k]++
		}
	}
	return &lowerPattern{colPtr: colPtr, rowIdx: rowIdx, rowPtr: rowPtr, colIdx: colIdx}
}
