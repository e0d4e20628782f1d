package flow

import (
	"cmp"
	"slices"
)

// Reverse Cuthill–McKee ordering (Cuthill & McKee 1969; reversed as George
// 1971 proposed), started from a pseudo-peripheral node of each connected
// component (George & Liu 1979). It narrows the band of the matrix, which
// keeps the vector entries that one row touches close in memory: it is the
// ordering of the iterative solvers, whose cost is memory traffic.

// rcmOrder returns the reverse Cuthill–McKee order of a's symmetric
// pattern: perm[k] is the unknown placed k-th.
func rcmOrder(a *CSR) []int32 {
	n := a.N
	perm := make([]int32, 0, n)
	visited := make([]bool, n)
	bfs := &bfsWork{queue: make([]int32, 0, n), stamp: make([]int32, n)}
	degree := func(i int32) int { return a.RowPtr[i+1] - a.RowPtr[i] }
	for s := range int32(n) {
		if visited[s] {
			continue
		}
		root := bfs.pseudoPeripheral(a, s)
		start := len(perm)
		perm = append(perm, root)
		visited[root] = true
		for head := start; head < len(perm); head++ {
			v := perm[head]
			first := len(perm)
			for _, c := range a.ColIdx[a.RowPtr[v]:a.RowPtr[v+1]] {
				if !visited[c] {
					visited[c] = true
					perm = append(perm, int32(c))
				}
			}
			// Neighbours in ascending degree (insertion sort for the
			// usual handful, a library sort for a well's long row).
			nb := perm[first:]
			if len(nb) > 32 {
				slices.SortStableFunc(nb, func(x, y int32) int { return cmp.Compare(degree(x), degree(y)) })
				continue
			}
			for i := 1; i < len(nb); i++ {
				x := nb[i]
				j := i
				for ; j > 0 && degree(nb[j-1]) > degree(x); j-- {
					nb[j] = nb[j-1]
				}
				nb[j] = x
			}
		}
	}
	for i, j := 0, n-1; i < j; i, j = i+1, j-1 {
		perm[i], perm[j] = perm[j], perm[i]
	}
	return perm
}

// bfsWork is the storage of repeated breadth-first searches: a queue and
// a per-node stamp that tells which search last reached the node.
type bfsWork struct {
	queue []int32
	stamp []int32
	round int32
}

// pseudoPeripheral returns a node of s's component of large eccentricity:
// repeated breadth-first searches, each from a least-degree node of the
// previous search's last level, until the depth stops growing.
func (w *bfsWork) pseudoPeripheral(a *CSR, s int32) int32 {
	root := s
	depth := -1
	for range 8 { // the search settles in two or three rounds in practice
		d, last := w.lastLevel(a, root)
		if d <= depth {
			break
		}
		depth = d
		best := last[0]
		for _, v := range last[1:] {
			if a.RowPtr[v+1]-a.RowPtr[v] < a.RowPtr[best+1]-a.RowPtr[best] {
				best = v
			}
		}
		root = best
	}
	return root
}

// lastLevel runs a breadth-first search from root and returns its depth
// and the nodes of its last level.
func (w *bfsWork) lastLevel(a *CSR, root int32) (int, []int32) {
	w.round++
	q := append(w.queue[:0], root)
	w.stamp[root] = w.round
	depth := 0
	levelStart, levelEnd := 0, 1
	for {
		for h := levelStart; h < levelEnd; h++ {
			v := q[h]
			for _, c := range a.ColIdx[a.RowPtr[v]:a.RowPtr[v+1]] {
				if w.stamp[c] != w.round {
					w.stamp[c] = w.round
					q = append(q, int32(c))
				}
			}
		}
		if len(q) == levelEnd {
			w.queue = q
			return depth, q[levelStart:levelEnd]
		}
		depth++
		levelStart, levelEnd = levelEnd, len(q)
	}
}
