package flow

import (
	"cmp"
	"math"
	"slices"
)

// Approximate minimum degree ordering (Amestoy, Davis & Duff 1996).
//
// The elimination is simulated on the quotient graph: eliminated unknowns
// become elements (cliques described by their variable lists), variables
// keep lists of adjacent elements followed by adjacent variables. Each step
// picks a variable of least approximate external degree, turns it into an
// element Lk absorbing its adjacent elements, and updates the degrees of
// the variables in Lk with the bound of §4 of the paper:
//
//	d̄_i = min(n − k, d̄_i(old) + |Lk \ i|, |A_i \ i| + |Lk \ i| + Σ_e |Le \ Lk|),
//
// where |Le \ Lk| comes from one scan of the element lists (Algorithm 2).
// Indistinguishable variables are merged into supervariables (found by
// hashing their lists), variables adjacent to Lk only are eliminated with
// the pivot (mass elimination), and elements whose variables are all in Lk
// are absorbed (aggressive absorption). Rows denser than
// max(16, 10√n) are set aside and ordered last, as in the paper's §6.

// amdFlip encodes node j as a negative number (and decodes it again):
// flip(flip(j)) = j and flip(j) ≤ −2 for j ≥ 0.
func amdFlip(j int32) int32 { return -j - 2 }

// amdNode is the state of one node of the quotient graph, kept together
// so that visiting a node touches one cache line.
type amdNode struct {
	pe     int32 // start of the node's list in iw, or flip(parent) once absorbed
	length int32 // length of the list
	elen   int32 // elements at the front of a variable's list; −2 for an element, −1 for a dead variable
	nv     int32 // supervariable size; 0 when merged into another; −size while in Lk
	degree int32 // approximate external degree (variable) or |Le| (element)
	next   int32 // degree list: next variable
	last   int32 // degree list: previous variable; hash while in Lk
	w      int32 // set-difference workspace and marks
}

// amd holds the quotient graph and the degree lists during the ordering.
// Index n is a virtual root that collects the dense rows.
type amd struct {
	n     int32
	iw    []int32 // element and variable lists
	nd    []amdNode
	head  []int32   // degree lists: first variable of each degree
	hash  []amdHash // variables of Lk with their hashes, for supervariables
	cnz   int32     // used length of iw
	nzmax int32     // allocated length of iw
	nel   int32     // number of eliminated variables
	// mindeg is a lower bound on the least degree in the lists.
	mindeg int32
	lemax  int32 // largest element size so far
	mark   int32 // current mark value in w
}

// amdHash pairs a variable with the hash of its list.
type amdHash struct{ h, i int32 }

// amdMarkLimit is where marks are reset: w holds marks up to
// mark + n + lemax, which must stay below the int32 limit.
const amdMarkLimit = math.MaxInt32 - 1

// amdOrder returns a fill-reducing elimination order of the symmetric
// pattern of a: perm[k] is the unknown eliminated k-th.
func amdOrder(a *CSR) []int32 {
	n := a.N
	if n == 0 {
		return nil
	}
	s := newAMD(a)
	for s.nel < s.n {
		s.eliminateNext()
	}
	return s.postorder()
}

// newAMD builds the quotient graph of the off-diagonal pattern of a and
// fills the degree lists.
func newAMD(a *CSR) *amd {
	n := int32(a.N)
	offDiag := int32(0)
	for i := range a.N {
		for _, c := range a.ColIdx[a.RowPtr[i]:a.RowPtr[i+1]] {
			if c != i {
				offDiag++
			}
		}
	}
	nzmax := offDiag + offDiag/5 + 2*n
	s := &amd{
		n: n, iw: make([]int32, nzmax), nzmax: nzmax,
		nd: make([]amdNode, n+1), head: make([]int32, n+1),
	}
	p := int32(0)
	for i := range a.N {
		v := &s.nd[i]
		v.pe = p
		for _, c := range a.ColIdx[a.RowPtr[i]:a.RowPtr[i+1]] {
			if c != i {
				s.iw[p] = int32(c)
				p++
			}
		}
		v.length = p - v.pe
	}
	s.cnz = p
	for i := range s.nd {
		v := &s.nd[i]
		s.head[i], v.next, v.last = -1, -1, -1
		v.nv, v.w = 1, 1
		v.degree = v.length
	}
	s.clearFlag()
	// The virtual root n: a dead element that will own the dense rows.
	root := &s.nd[n]
	root.nv, root.elen, root.pe, root.w = 0, -2, -1, 0
	dense := int32(max(16, 10*math.Sqrt(float64(n))))
	dense = min(n-2, dense)
	for i := int32(0); i < n; i++ {
		v := &s.nd[i]
		switch d := v.degree; {
		case d == 0: // an isolated unknown is eliminated at once
			v.elen, v.pe, v.w = -2, -1, 0
			s.nel++
		case d > dense: // a dense row is ordered last
			v.nv, v.elen, v.pe = 0, -1, amdFlip(n)
			root.nv++
			s.nel++
		default:
			s.pushDegree(i, d)
		}
	}
	return s
}

// clearFlag resets the marks in w to 1 (dead elements keep 0) and the mark
// to 2. It is called at the start and whenever the marks would overflow.
func (s *amd) clearFlag() {
	for k := range s.nd {
		if s.nd[k].w != 0 {
			s.nd[k].w = 1
		}
	}
	s.mark = 2
}

// advanceMark moves the mark past every value in w (which reaches at
// most mark + lemax), resetting when the int32 range would run out.
func (s *amd) advanceMark(by int32) {
	if int64(s.mark)+int64(by)+int64(s.lemax)+int64(s.n) >= amdMarkLimit {
		s.clearFlag()
		return
	}
	s.mark += by
}

func (s *amd) pushDegree(i, d int32) {
	v := &s.nd[i]
	if h := s.head[d]; h != -1 {
		s.nd[h].last = i
	}
	v.next = s.head[d]
	v.last = -1
	s.head[d] = i
}

func (s *amd) removeDegree(i int32) {
	v := &s.nd[i]
	if v.next != -1 {
		s.nd[v.next].last = v.last
	}
	if v.last != -1 {
		s.nd[v.last].next = v.next
	} else {
		s.head[v.degree] = v.next
	}
}

// eliminateNext performs one step: pivot selection, construction of the
// new element, degree update, supervariable detection.
func (s *amd) eliminateNext() {
	var k int32 = -1
	for ; s.mindeg < s.n; s.mindeg++ {
		if k = s.head[s.mindeg]; k != -1 {
			break
		}
	}
	s.removeDegree(k)
	elenk, nvk := s.nd[k].elen, s.nd[k].nv
	s.nel += nvk
	if elenk > 0 && s.cnz+s.mindeg >= s.nzmax {
		s.compress()
	}
	pk1, pk2, dk := s.buildElement(k, elenk, nvk)
	s.advanceMark(0)
	s.setDifferences(pk1, pk2)
	dk, nvk = s.updateDegrees(k, pk1, pk2, dk, nvk)
	s.nd[k].degree = dk
	s.lemax = max(s.lemax, dk)
	s.advanceMark(s.lemax)
	s.detectSupervariables()
	s.finishElement(k, pk1, pk2, dk, nvk, elenk)
}

// buildElement forms Lk, the variables adjacent to pivot k directly or
// through its elements, which it absorbs. Lk is written in place when k
// has no elements, else at the end of iw. It returns Lk's position and
// its size dk (the number of unknowns it holds).
func (s *amd) buildElement(k, elenk, nvk int32) (pk1, pk2, dk int32) {
	iw, nd := s.iw, s.nd
	nd[k].nv = -nvk
	p := nd[k].pe
	if elenk == 0 {
		pk1 = p
	} else {
		pk1 = s.cnz
	}
	pk2 = pk1
	for knt := int32(0); knt <= elenk; knt++ {
		var e, pj, ln int32
		if knt == elenk {
			e, pj, ln = k, p, nd[k].length-elenk
		} else {
			e = iw[p]
			p++
			pj, ln = nd[e].pe, nd[e].length
		}
		for _, i := range iw[pj : pj+ln] {
			nvi := nd[i].nv
			if nvi <= 0 {
				continue
			}
			dk += nvi
			nd[i].nv = -nvi
			iw[pk2] = i
			pk2++
			s.removeDegree(i)
		}
		if e != k {
			nd[e].pe = amdFlip(k)
			nd[e].w = 0
		}
	}
	if elenk != 0 {
		s.cnz = pk2
	}
	v := &nd[k]
	v.degree = dk
	v.pe = pk1
	v.length = pk2 - pk1
	v.elen = -2
	return pk1, pk2, dk
}

// setDifferences leaves w[e] − mark = |Le \ Lk| for every element e
// adjacent to a variable of Lk (Algorithm 2 of the paper).
func (s *amd) setDifferences(pk1, pk2 int32) {
	nd, mark := s.nd, s.mark
	for _, i := range s.iw[pk1:pk2] {
		vi := &nd[i]
		eln := vi.elen
		if eln <= 0 {
			continue
		}
		nvi := -vi.nv
		wnvi := mark - nvi
		for _, e := range s.iw[vi.pe : vi.pe+eln] {
			ve := &nd[e]
			if ve.w >= mark {
				ve.w -= nvi
			} else if ve.w != 0 {
				ve.w = ve.degree + wnvi
			}
		}
	}
}

// updateDegrees prunes the lists of the variables in Lk, absorbs elements
// contained in Lk, eliminates variables adjacent to Lk only, computes the
// approximate degrees and records each remaining variable's hash for the
// supervariable search. It returns the updated size of Lk and the number
// of unknowns eliminated with the pivot.
func (s *amd) updateDegrees(k, pk1, pk2, dk, nvk int32) (int32, int32) {
	iw, nd, mark := s.iw, s.nd, s.mark
	s.hash = s.hash[:0]
	for _, i := range iw[pk1:pk2] {
		vi := &nd[i]
		p1 := vi.pe
		p2 := p1 + vi.elen - 1
		pn := p1
		var h uint64
		d := int32(0)
		for p := p1; p <= p2; p++ {
			e := iw[p]
			ve := &nd[e]
			if ve.w == 0 {
				continue
			}
			if dext := ve.w - mark; dext > 0 {
				d += dext
				iw[pn] = e
				pn++
				h += uint64(e)
			} else { // aggressive absorption: Le ⊆ Lk
				ve.pe = amdFlip(k)
				ve.w = 0
			}
		}
		vi.elen = pn - p1 + 1
		p3 := pn
		p4 := p1 + vi.length
		for p := p2 + 1; p < p4; p++ {
			j := iw[p]
			if nvj := nd[j].nv; nvj > 0 {
				d += nvj
				iw[pn] = j
				pn++
				h += uint64(j)
			}
		}
		if d == 0 { // mass elimination: i is adjacent to Lk only
			vi.pe = amdFlip(k)
			nvi := -vi.nv
			dk -= nvi
			nvk += nvi
			s.nel += nvi
			vi.nv = 0
			vi.elen = -1
			continue
		}
		vi.degree = min(vi.degree, d)
		// Put k first among i's elements.
		iw[pn] = iw[p3]
		iw[p3] = iw[p1]
		iw[p1] = k
		vi.length = pn - p1 + 1
		s.hash = append(s.hash, amdHash{h: int32(h % uint64(s.n)), i: i})
	}
	return dk, nvk
}

// detectSupervariables merges variables of Lk with identical lists: the
// variables are grouped by hash (a sort of the few variables of Lk, which
// avoids a global hash table and its cache misses), then compared by
// length and entries within each group.
func (s *amd) detectSupervariables() {
	hs := s.hash
	if len(hs) < 2 {
		return
	}
	if len(hs) <= 16 {
		for a := 1; a < len(hs); a++ {
			x := hs[a]
			b := a
			for ; b > 0 && hs[b-1].h > x.h; b-- {
				hs[b] = hs[b-1]
			}
			hs[b] = x
		}
	} else {
		slices.SortFunc(hs, func(x, y amdHash) int { return cmp.Compare(x.h, y.h) })
	}
	for lo := 0; lo < len(hs); {
		hi := lo + 1
		for hi < len(hs) && hs[hi].h == hs[lo].h {
			hi++
		}
		if hi-lo > 1 {
			s.mergeGroup(hs[lo:hi])
		}
		lo = hi
	}
}

// mergeGroup compares the variables of one hash group pairwise and merges
// each indistinguishable one into the first of its kind. A merged
// variable has its hash entry's i set to −1.
func (s *amd) mergeGroup(g []amdHash) {
	iw, nd := s.iw, s.nd
	for a := range g {
		i := g[a].i
		if i < 0 {
			continue
		}
		vi := &nd[i]
		ln, eln := vi.length, vi.elen
		for _, v := range iw[vi.pe+1 : vi.pe+ln] {
			nd[v].w = s.mark
		}
		for b := a + 1; b < len(g); b++ {
			j := g[b].i
			if j < 0 {
				continue
			}
			vj := &nd[j]
			if vj.length != ln || vj.elen != eln {
				continue
			}
			same := true
			for _, v := range iw[vj.pe+1 : vj.pe+ln] {
				if nd[v].w != s.mark {
					same = false
					break
				}
			}
			if same { // j is indistinguishable from i: merge it
				vj.pe = amdFlip(i)
				vi.nv += vj.nv
				vj.nv = 0
				vj.elen = -1
				g[b].i = -1
			}
		}
		s.advanceMark(1)
	}
}

// finishElement restores the sizes of the variables of Lk, puts them back
// in the degree lists with their new degrees and compacts Lk.
func (s *amd) finishElement(k, pk1, pk2, dk, nvk, elenk int32) {
	iw, nd := s.iw, s.nd
	p := nd[k].pe
	for pk := pk1; pk < pk2; pk++ {
		i := iw[pk]
		vi := &nd[i]
		nvi := -vi.nv
		if nvi <= 0 {
			continue
		}
		vi.nv = nvi
		d := vi.degree + dk - nvi
		d = min(d, s.n-s.nel-nvi)
		s.pushDegree(i, d)
		s.mindeg = min(s.mindeg, d)
		vi.degree = d
		iw[p] = i
		p++
	}
	vk := &nd[k]
	vk.nv = nvk
	vk.length = p - vk.pe
	if vk.length == 0 {
		vk.pe = -1
		vk.w = 0
	}
	if elenk != 0 {
		s.cnz = p
	}
}

// compress removes the unused gaps from iw (garbage collection).
func (s *amd) compress() {
	iw, nd := s.iw, s.nd
	for j := int32(0); j < s.n; j++ {
		if p := nd[j].pe; p >= 0 {
			nd[j].pe = iw[p]
			iw[p] = amdFlip(j)
		}
	}
	q := int32(0)
	for p := int32(0); p < s.cnz; {
		j := amdFlip(iw[p])
		p++
		if j < 0 {
			continue
		}
		iw[q] = nd[j].pe
		nd[j].pe = q
		q++
		for range nd[j].length - 1 {
			iw[q] = iw[p]
			q++
			p++
		}
	}
	s.cnz = q
}

// postorder turns the assembly tree left by the elimination into the
// ordering: elements in depth-first postorder, each preceded by the
// variables eliminated with it.
func (s *amd) postorder() []int32 {
	n := s.n
	nd := s.nd
	parent := make([]int32, n+1)
	for i := int32(0); i <= n; i++ {
		switch {
		case nd[i].nv > 0: // an element: its parent is the absorbing element
			parent[i] = -1
			if nd[i].pe <= -2 {
				parent[i] = amdFlip(nd[i].pe)
			}
		case i == n: // virtual root without dense rows
			parent[i] = -1
		default: // a variable merged into another: find its element
			e := amdFlip(nd[i].pe)
			for nd[e].nv == 0 {
				e = amdFlip(nd[e].pe)
			}
			for j := i; nd[j].nv == 0; { // path compression
				nx := amdFlip(nd[j].pe)
				nd[j].pe = amdFlip(e)
				j = nx
			}
			parent[i] = e
		}
	}
	// Children lists: merged variables after child elements.
	head := s.head
	next := make([]int32, n+1)
	for i := range head {
		head[i] = -1
	}
	for j := n; j >= 0; j-- {
		if nd[j].nv == 0 && parent[j] != -1 {
			next[j] = head[parent[j]]
			head[parent[j]] = j
		}
	}
	for e := n; e >= 0; e-- {
		if nd[e].nv > 0 && parent[e] != -1 {
			next[e] = head[parent[e]]
			head[parent[e]] = e
		}
	}
	perm := make([]int32, 0, n)
	stack := make([]int32, 0, 64)
	for r := int32(0); r <= n; r++ {
		if parent[r] != -1 || (nd[r].nv == 0 && r == n) {
			continue
		}
		perm = depthFirstPost(r, head, next, stack, perm, n)
	}
	return perm
}

// depthFirstPost appends the nodes of the tree rooted at r in postorder
// (children lists in head/next, which it consumes), skipping the virtual
// node skip.
func depthFirstPost(r int32, head, next, stack, out []int32, skip int32) []int32 {
	stack = append(stack[:0], r)
	for len(stack) > 0 {
		p := stack[len(stack)-1]
		if c := head[p]; c != -1 {
			head[p] = next[c]
			stack = append(stack, c)
			continue
		}
		stack = stack[:len(stack)-1]
		if p != skip {
			out = append(out, p)
		}
	}
	return out
}
