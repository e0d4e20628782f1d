package mechanics

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/internal/unionfind"
)

// Coupled crossings (ContactSettings.CoupleCrossings).
//
// A crossing is a set of ordinary elements of two groups joined by
// touching pairs between them (elements closer than DetachRadius, see
// touching): the elements that meet where two traces cross, end next to
// one another or run side by side. Three traces meeting at one place make
// three crossings, decided one after another. (Joining every touching
// pair into one set, as first built, chained crossings through traces
// running close beside them into clusters of dozens of elements on coarse
// meshes; one soft part refused the whole cluster, the clusters split into
// kept crossings as the elements shrank, and the moment grew with them:
// see the README's Convergence.) Detached and compensated (see
// compensation), a crossing is pinned: its elements are stiffened by the
// coupling they lost, and the slip of two faults crossing in an X
// converges slowly or to a false plateau
// (TestCrossingDetachmentLowersSlip). A pin changes the slip around it by
// a fraction that does not shrink with the elements: the stiffness it
// adds is of the order of an element's own, G/h, over a length h, a point
// force of the order of G·s whatever h. Only the collocation's own
// couplings converge.
//
// So a coupled crossing keeps its pairs where the contact problem stays
// well posed with them (wellPosedCrossing): its elastic energy definite,
// and its friction well posed whatever the directions of sliding (the
// collocated normal stress that one element's slip puts on the other, next
// to that element's end, can make an element sliding forwards need
// backward slip while, stuck, it is overloaded: the contact solve then
// cycles). The crossings decided so far enter each check, and the kept
// crossings that share elements with it take part in it whole (a soft
// mode can run through them); those not yet decided count as detached. Where it is not well posed, at a small angle
// (in an X of constant elements the slip energy's smallest scaled
// eigenvalue falls from 0.43 at 90° to 0.07 at 10°) or where a trace ends
// next to another's face, the crossing is detached and compensated as
// before. Crossings that an element released from intact rock makes
// (Release) are detached and compensated too.

// keptCrossingMargin is the smallest eigenvalue, relative to the
// diagonal, that a kept crossing's energy and frictional stiffness keep
// (see wellPosedCrossing): a little stiffness, so that a nearly singular
// crossing does not pass.
const keptCrossingMargin = 0.05

// crossingReach, in element lengths, is how far from a crossing's
// elements the check looks: the ordinary elements whose centres lie that
// close to a member's centre take part in it.
const crossingReach = 2

// maxSignedMembers is the largest crossing whose directions of sliding
// wellPosedCrossing tries one by one (2^10 patterns); beyond it a bound
// covers them all.
const maxSignedMembers = 10

// crossings groups pairs of elements into connected sets: it returns the
// set of each pair, in the order given, and the elements of each set, in
// the order the pairs name them.
func crossings(pairs [][2]int) (of []int, members [][]int) {
	local := map[int]int32{}
	for _, p := range pairs {
		for _, e := range p {
			if _, ok := local[e]; !ok {
				local[e] = int32(len(local))
			}
		}
	}
	sets := unionfind.New(len(local))
	for _, p := range pairs {
		sets.Union(local[p[0]], local[p[1]])
	}
	id := map[int32]int{}
	listed := map[int]bool{}
	of = make([]int, len(pairs))
	for q, p := range pairs {
		r := sets.Find(local[p[0]])
		k, ok := id[r]
		if !ok {
			k = len(members)
			id[r] = k
			members = append(members, nil)
		}
		of[q] = k
		for _, e := range p {
			if !listed[e] {
				listed[e] = true
				members[k] = append(members[k], e)
			}
		}
	}
	return of, members
}

// pairKey is the key of the pair of elements i and j: lower first.
func pairKey(i, j int) [2]int { return [2]int{min(i, j), max(i, j)} }

// coupleCrossings groups the touching pairs of ordinary elements into
// crossings and compensates every such pair; then, one crossing after
// another, it keeps a crossing (undoing its compensations) if
// wellPosedCrossing accepts its elements and their neighbours with the
// decisions so far. g buckets the element centres by NearRadius.
func (c *Contact) coupleCrossings(g *centreGrid, centres []r2.Vec) {
	n := len(c.elems)
	var touching [][2]int
	for j := range n {
		g.visit(centres[j], func(i int) {
			if i > j && c.ordinaryTouching(i, j) {
				touching = append(touching, [2]int{i, j})
			}
		})
	}
	// One crossing per connected set of touching pairs between the same
	// two groups.
	byGroups := map[[2]int][]int{}
	var groupPairs [][2]int
	for q, p := range touching {
		k := pairKey(c.elems[p[0]].Group, c.elems[p[1]].Group)
		if byGroups[k] == nil {
			groupPairs = append(groupPairs, k)
		}
		byGroups[k] = append(byGroups[k], q)
	}
	c.crossingOf = map[[2]int]int{}
	for _, k := range groupPairs {
		pairs := make([][2]int, len(byGroups[k]))
		for t, q := range byGroups[k] {
			pairs[t] = touching[q]
		}
		of, members := crossings(pairs)
		for t, p := range pairs {
			c.crossingOf[pairKey(p[0], p[1])] = len(c.crossingMembers) + of[t]
		}
		c.crossingMembers = append(c.crossingMembers, members...)
	}
	c.crossingKept = make([]bool, len(c.crossingMembers))
	// undo[k] is what keeping crossing k takes off its elements'
	// compensations.
	undo := make([]map[int]elastic.Block, len(c.crossingMembers))
	for k := range undo {
		undo[k] = map[int]elastic.Block{}
	}
	for _, p := range touching {
		ci, cj := c.compensatePair(p[0], p[1], c.op.At(p[0], p[1]))
		u := undo[c.crossingOf[pairKey(p[0], p[1])]]
		u[p[0]] = subBlock(u[p[0]], ci)
		u[p[1]] = subBlock(u[p[1]], cj)
	}
	// keptAt lists, for each element, the kept crossings it belongs to.
	keptAt := map[int][]int{}
	for k, members := range c.crossingMembers {
		set := slices.Clone(members)
		in := map[int]bool{}
		for _, i := range members {
			in[i] = true
		}
		// The kept crossings that share elements with this one join the
		// check whole: a soft mode can run through them. (Theirs in turn,
		// transitively, made sets of thousands of elements on coarse
		// meshes of dense networks.)
		for _, i := range members {
			for _, kk := range keptAt[i] {
				for _, e := range c.crossingMembers[kk] {
					if !in[e] {
						in[e] = true
						set = append(set, e)
					}
				}
			}
		}
		for _, m := range set { // the elements so far: range reads set once
			r := math.Min(crossingReach*c.elems[m].Element.Length(), c.set.NearRadius)
			g.visit(centres[m], func(i int) {
				if d := r2.Sub(centres[i], centres[m]); !in[i] && !c.elems[i].Intact && r2.Dot(d, d) <= r*r {
					in[i] = true
					set = append(set, i)
				}
			})
		}
		c.crossingKept[k] = true // as the check sees it
		c.crossingKept[k] = c.wellPosedCrossing(set, len(members), func(i, j int) elastic.Block {
			switch {
			case i == j:
				return addBlock(addBlock(c.op.At(i, i), c.compensated[i]), undo[k][i])
			case c.touchingPair(i, j) && !c.keptPair(i, j):
				return elastic.Block{} // detached
			}
			return c.op.At(i, j)
		})
		if c.crossingKept[k] {
			for i, d := range undo[k] {
				c.compensated[i] = addBlock(c.compensated[i], d)
			}
			for _, i := range members {
				keptAt[i] = append(keptAt[i], k)
			}
		}
	}
}

// ordinaryTouching reports whether elements i and j are ordinary (not
// intact), of different groups and touching. coupleCrossings lists these
// pairs once; touchingPair then looks them up.
func (c *Contact) ordinaryTouching(i, j int) bool {
	return c.elems[i].Group != c.elems[j].Group && !c.elems[i].Intact && !c.elems[j].Intact && c.touching(i, j)
}

// touchingPair reports whether ordinary elements i and j are a touching
// pair of different groups (see ordinaryTouching), once coupleCrossings
// has listed them.
func (c *Contact) touchingPair(i, j int) bool {
	_, ok := c.crossingOf[pairKey(i, j)]
	return ok
}

// keptPair reports whether elements i and j, which touch, belong to a
// crossing that keeps its pairs.
func (c *Contact) keptPair(i, j int) bool {
	k, ok := c.crossingOf[pairKey(i, j)]
	return ok && c.crossingKept[k]
}

// wellPosedCrossing reports whether the elements of set, whose first
// members are a crossing's and the rest the elements around it (the kept
// crossings joined to it and the neighbours), with blocks from
// block(receiver, source), make a well-posed contact problem, with the
// margin keptCrossingMargin relative to the diagonal (D^-½ M D^-½ for
// each matrix M below, D the diagonal of the energy):
//
//   - the elastic energy U = ½ zᵀ E z, E = J W A (see the elastic
//     package) symmetrized, is positive definite over slip, and without
//     ShearOnly over slip and opening;
//   - so is the frictional stiffness of slip whatever the crossing's
//     elements' directions of sliding. A sliding element i obeys
//     τ_i = σ_i (c + μ σn′_i), σ_i = ±1, whose Jacobian in the slips is,
//     weighted, −(E_ss − μ Σ E_ns), E_ns the normal traction per slip and
//     Σ = diag(σ); while its symmetric part is positive definite the
//     Jacobian is nonsingular and the sliding problem monotone (Cottle,
//     Pang & Stone 1992, from memory). Only the normal couplings of the
//     crossing's touching pairs enter E_ns: the others are there whether
//     the crossing is kept or not. Every choice of the members' σ is
//     tried, up to maxSignedMembers members; beyond that the condition
//     λ_min(E_ss) > μ‖E_ns‖₂, which covers every choice, is asked.
//
// μ is the largest friction coefficient of the members.
func (c *Contact) wellPosedCrossing(set []int, members int, block func(i, j int) elastic.Block) bool {
	m := len(set)
	full := mat.NewSymDense(2*m, nil)
	ns := mat.NewDense(members, members, nil)
	mu := 0.0
	for a, i := range set {
		for b, j := range set[a:] {
			b += a
			eij, eji := c.energyBlock(i, block(i, j)), c.energyBlock(j, block(j, i))
			for r := range 2 {
				for q := range 2 {
					if a != b || q >= r {
						// Row r of receiver i against column q of source j,
						// and the transposed pair's, averaged.
						full.SetSym(r*m+a, q*m+b, 0.5*(eij[r][q]+eji[q][r]))
					}
				}
			}
			if b < members && c.touchingPair(i, j) {
				ns.Set(a, b, eij[1][0])
				ns.Set(b, a, eji[1][0])
			}
		}
		if a < members {
			mu = math.Max(mu, c.elems[i].Friction.Static) // μd ≤ μs
		}
	}
	scale := make([]float64, 2*m)
	for k := range scale {
		v := full.At(k, k)
		if !(v > 0) {
			return false
		}
		scale[k] = 1 / math.Sqrt(v)
	}
	for r := range scale {
		for q := r; q < len(scale); q++ {
			full.SetSym(r, q, full.At(r, q)*scale[r]*scale[q])
		}
	}
	if !c.set.ShearOnly && !aboveMargin(full) {
		return false
	}
	slip := mat.NewSymDense(m, nil)
	slip.CopySym(full.SliceSym(0, m))
	if !aboveMargin(slip) {
		return false
	}
	for r := range members {
		for q := range members {
			ns.Set(r, q, mu*ns.At(r, q)*scale[r]*scale[q])
		}
	}
	if members > maxSignedMembers {
		var svd mat.SVD
		return svd.Factorize(ns, mat.SVDNone) && minEigenvalue(slip)-svd.Values(nil)[0] > keptCrossingMargin
	}
	// The signs change only the members' block A of the frictional
	// stiffness K(σ) = [[A(σ), B], [Bᵀ, C]], C the neighbours'. K(σ) − δI is
	// positive definite exactly when C − δI is (it is, a principal block of
	// the slip energy just checked) and so is the Schur complement
	// A(σ) − δI − B (C − δI)⁻¹ Bᵀ (Golub & Van Loan 2013, §4.2, from
	// memory): one factorization of C for all 2^members choices, each then
	// a members × members one.
	base := mat.NewSymDense(members, nil)
	base.CopySym(slip.SliceSym(0, members))
	for i := range members {
		base.SetSym(i, i, base.At(i, i)-keptCrossingMargin)
	}
	if rest := m - members; rest > 0 {
		around := mat.NewSymDense(rest, nil)
		around.CopySym(slip.SliceSym(members, m))
		for i := range rest {
			around.SetSym(i, i, around.At(i, i)-keptCrossingMargin)
		}
		var chol mat.Cholesky
		if !chol.Factorize(around) {
			return false
		}
		b := mat.NewDense(members, rest, nil)
		for r := range members {
			for q := range rest {
				b.Set(r, q, slip.At(r, members+q))
			}
		}
		var x, t mat.Dense
		if err := chol.SolveTo(&x, b.T()); err != nil {
			return false
		}
		t.Mul(b, &x)
		for r := range members {
			for q := r; q < members; q++ {
				base.SetSym(r, q, base.At(r, q)-0.5*(t.At(r, q)+t.At(q, r)))
			}
		}
	}
	k := mat.NewSymDense(members, nil)
	var chol mat.Cholesky
	for signs := range 1 << members {
		k.CopySym(base)
		for r := range members {
			sr := float64(1 - 2*(signs>>r&1))
			for q := range members {
				if v := ns.At(r, q); v != 0 {
					// −½(σ_r N_rq + σ_q N_qr), half from each of the two
					// visits of the symmetric entry.
					k.SetSym(r, q, k.At(r, q)-0.5*sr*v)
				}
			}
		}
		if !chol.Factorize(k) { // K(σ) − δI, through the Schur complement
			return false
		}
	}
	return true
}

// energyBlock returns receiver i's row of the energy matrix for block b
// of the operator: J W_i b, J = diag(−1, 1), row-major over (slip,
// opening).
func (c *Contact) energyBlock(i int, b elastic.Block) [2][2]float64 {
	w := c.weight[i]
	return [2][2]float64{{-w * b.ShearSlip, -w * b.ShearOpening}, {w * b.NormalSlip, w * b.NormalOpening}}
}

// aboveMargin reports whether the smallest eigenvalue of e exceeds
// keptCrossingMargin: whether e − margin·I has a Cholesky factor, several
// times cheaper than its eigenvalues.
func aboveMargin(e *mat.SymDense) bool {
	n := e.SymmetricDim()
	shifted := mat.NewSymDense(n, nil)
	shifted.CopySym(e)
	for i := range n {
		shifted.SetSym(i, i, shifted.At(i, i)-keptCrossingMargin)
	}
	var chol mat.Cholesky
	return chol.Factorize(shifted)
}

// minEigenvalue returns the smallest eigenvalue of e, or −∞ when the
// decomposition fails.
func minEigenvalue(e mat.Symmetric) float64 {
	var eig mat.EigenSym
	if !eig.Factorize(e, false) {
		return math.Inf(-1)
	}
	return eig.Values(nil)[0]
}

// PinnedCrossings returns the number of places where slip is pinned:
// connected sets of detached and compensated pairs of touching ordinary
// elements of different groups (every such pair without CoupleCrossings,
// those of the crossings wellPosedCrossing refused with it; refused
// crossings that share elements count as one place).
// Intact elements make none, nor do pairs that do not load each other
// (an operator without interaction).
func (c *Contact) PinnedCrossings() int {
	var pairs [][2]int
	for j, list := range c.detached { // source j
		for q, i := range list {
			if int(i) > j && !c.elems[i].Intact && !c.elems[j].Intact && c.detachedBlock[j][q] != (elastic.Block{}) {
				pairs = append(pairs, [2]int{int(i), j})
			}
		}
	}
	_, members := crossings(pairs)
	return len(members)
}

// detachStalled detaches, from now on, the kept crossings among the
// elements where a solve stalled (err, a *stall), and reports whether it
// detached any. A kept crossing passed its check with its neighbours
// alone; in a larger working set (a junction of many traces on elements
// too long to resolve it) its statuses can admit no solution that Newton
// finds, where a detached crossing, always well posed, does. The step is
// then solved again (Solve) and the places pinned are counted by
// PinnedCrossings.
func (c *Contact) detachStalled(err error) bool {
	var st *stall
	if !c.set.CoupleCrossings || !errors.As(err, &st) {
		return false
	}
	detached := false
	for _, i := range st.elems {
		for _, j := range c.near[i] {
			if k, ok := c.crossingOf[pairKey(i, int(j))]; ok && c.crossingKept[k] {
				c.detachCrossing(k)
				detached = true
				break // c.near[i] changed
			}
		}
	}
	return detached
}

// detachCrossing detaches kept crossing k as coupleCrossings detaches a
// refused one: its touching pairs leave the near lists for the detached
// ones, and each pair's coupling is added to its two elements' own
// stiffness. The tractions already committed keep what the pairs' slip
// and opening so far put on them (as Release keeps the tractions).
func (c *Contact) detachCrossing(k int) {
	for _, j := range c.crossingMembers[k] { // source j
		for q := 0; q < len(c.near[j]); {
			i := int(c.near[j][q])
			if kk, ok := c.crossingOf[pairKey(i, j)]; !ok || kk != k {
				q++
				continue
			}
			aij := c.op.At(i, j)
			c.near[j] = slices.Delete(c.near[j], q, q+1)
			c.nearSlip[j] = slices.Delete(c.nearSlip[j], q, q+1)
			c.nearOpening[j] = slices.Delete(c.nearOpening[j], q, q+1)
			c.detached[j] = append(c.detached[j], int32(i))
			c.detachedBlock[j] = append(c.detachedBlock[j], aij)
			if i > j { // each pair once, as coupleCrossings compensates it
				ci, cj := c.compensatePair(i, j, aij)
				c.self[i] = addBlock(c.self[i], ci)
				c.self[j] = addBlock(c.self[j], cj)
			}
		}
	}
	c.crossingKept[k] = false
	clear(c.caches) // their matrices hold the self-influences and the pairs
}
