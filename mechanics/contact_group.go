package mechanics

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"slipfront/elastic"
	"slipfront/internal/unionfind"
)

// groupCache keeps, per group, what does not change between its solves:
// the dense influence matrix of its working elements and the last
// factorization with the element states it was made for.
type groupCache struct {
	elems []int
	a     []float64 // 2m × 2m, row-major
	// The factorization of the reduced Jacobian, valid while key holds.
	key []byte
	lu  denseLU
	ok  bool
	// The factorization of the whole set's full Jacobian, updated row by
	// row (see groupSystem.full).
	rows rowUpdatedLU
}

// groupSystem is the local problem of one group's working elements: the
// unknowns z = [Δs; Δw] (m elements each), their values z0 when the group
// solve began, the tractions t0 = [τ; σn] there, and the dense influence
// matrix a (2m × 2m, row-major) with a[r][c] = ∂t_r/∂z_c. Only the free
// positions of z are solved for: the slip of sliding and open elements and
// the opening of open ones; the others are fixed (no slip increment, a
// closed element's opening zero).
//
// The whole working set's system (mergedGroup) is large, and its statuses
// change a few elements at a time over many rounds; it keeps every
// position that can be free in its Jacobian (full), a fixed one with the
// row z_pos = its value, so that a change of status replaces rows and the
// factorization is updated (rowUpdatedLU) instead of made again.
type groupSystem struct {
	c      *Contact
	group  int
	cache  *groupCache
	elems  []int
	m      int
	a      []float64
	z0, z  []float64
	t0     []float64
	free   []int
	jac    []float64 // |free|², row-major
	res    []float64 // |free|
	slopes []float64 // ∂μ/∂D of each element at z (0 unless sliding and weakening)
	// monotone forbids sliding elements to stick again (see settle).
	monotone bool
	// stall is set when the last Newton solve stopped short of
	// convergence (see stalled): an error once the statuses hold.
	stall   error
	full    bool
	fixed   []bool  // per position, in full mode
	rowKeys []uint8 // per row of jac, in full mode
}

// maxStatusChanges bounds the active-set iterations of a group solve, and
// maxNewton the Newton iterations for one set (the equations are piecewise
// linear: two or three suffice between kinks).
const (
	maxStatusChanges = 60
	maxNewton        = 30
)

// solveGroup solves the working elements elems of group g (or, with g =
// mergedGroup, the whole working set) with the others' increments as
// loads, applies the change to the tractions of their neighbours, and
// returns the largest change of slip or opening, m.
func (c *Contact) solveGroup(g int, elems []int) (float64, error) {
	s := c.newGroupSystem(g, elems)
	err := s.settle()
	// Each rupture leaves its group's sliding patch at residual friction
	// (no weakening, so stable), so a further unstable patch is another
	// group's, when the whole working set is solved at once: at most one
	// rupture per group.
	for range elems {
		var u *unstable
		if !errors.As(err, &u) {
			break
		}
		s.rupture(u.patch, u.lambda)
		err = s.settle()
	}
	if err != nil {
		return 0, err
	}
	if !c.set.NoDerivatives {
		s.derivatives()
	}
	return s.apply(), nil
}

// newGroupSystem gathers the local problem of the working elements elems
// of group g.
func (c *Contact) newGroupSystem(g int, elems []int) *groupSystem {
	t := &c.trial
	s := &groupSystem{c: c, group: g, elems: elems, full: g == mergedGroup}
	m := len(s.elems)
	s.m = m
	s.cache = c.groupCache(g, s.elems)
	s.a = s.cache.a
	n2 := 2 * m
	s.z0, s.t0 = make([]float64, n2), make([]float64, n2)
	for k, i := range s.elems {
		s.z0[k], s.z0[m+k] = t.ds[i], t.dw[i]
		s.t0[k], s.t0[m+k] = c.base.Shear[i]+t.dt[i], c.base.Normal[i]+t.dn[i]
	}
	s.z = slices.Clone(s.z0)
	s.slopes = make([]float64, m)
	return s
}

// groupCache returns group g's cache for the working elements elems,
// building the influence matrix when they changed.
func (c *Contact) groupCache(g int, elems []int) *groupCache {
	gc := c.caches[g]
	if gc != nil && slices.Equal(gc.elems, elems) {
		return gc
	}
	m := len(elems)
	n2 := 2 * m
	gc = &groupCache{elems: slices.Clone(elems), a: make([]float64, n2*n2)}
	for b, j := range elems { // source
		for r, i := range elems { // receiver
			blk, ok := c.influence(i, j)
			if !ok {
				continue
			}
			gc.a[r*n2+b] = blk.ShearSlip
			gc.a[r*n2+m+b] = blk.ShearOpening
			gc.a[(m+r)*n2+b] = blk.NormalSlip
			gc.a[(m+r)*n2+m+b] = blk.NormalOpening
		}
	}
	c.caches[g] = gc
	return gc
}

// influence returns the near-field block of source j on receiver i.
func (c *Contact) influence(i, j int) (elastic.Block, bool) {
	if i == j {
		return c.self[i], true
	}
	k, ok := slices.BinarySearch(c.near[j], int32(i))
	if !ok {
		return elastic.Block{}, false
	}
	sl, op := c.nearSlip[j][k], c.nearOpening[j][k]
	return elastic.Block{ShearSlip: sl[0], NormalSlip: sl[1], ShearOpening: op[0], NormalOpening: op[1]}, true
}

// tractions returns τ and σn of local element k at z.
func (s *groupSystem) tractions(k int) (tau, sigma float64) {
	n2 := 2 * s.m
	tau, sigma = s.t0[k], s.t0[s.m+k]
	rs, rn := s.a[k*n2:(k+1)*n2], s.a[(s.m+k)*n2:(s.m+k+1)*n2]
	for q := range n2 {
		if d := s.z[q] - s.z0[q]; d != 0 {
			tau += rs[q] * d
			sigma += rn[q] * d
		}
	}
	return tau, sigma
}

// unstable reports a sliding patch whose weakening outruns its stiffness
// (an error of settle, handled by solveGroup).
type unstable struct {
	patch  []int
	lambda float64
}

func (u *unstable) Error() string { return "mechanics: unstable sliding patch" }

// settle alternates Newton solves and status updates until the statuses
// hold. After every solve the sliding patch's stability is checked: near
// the instability the statuses would otherwise cycle, and past it no
// quasi-static solution exists; an *unstable error reports it.
//
// Statuses can still cycle where strongly coupled elements (crossing or
// touching traces) unload one another: an element sticks, its neighbour
// then overloads it, it slides again. After maxStatusChanges rounds the
// active set is made monotone: a sliding element keeps sliding (its
// increment may then run slightly backwards, by less than the sliding
// tolerance of the next rounds' solves), so each element changes at most
// once more and the rounds end. This is the usual guard of active-set
// methods against cycling (common practice, no source); results that
// converge within maxStatusChanges are untouched. When the statuses hold
// but Newton stalled for them, they are solved again with damped steps
// (dampedNewton) before the solve is given up.
func (s *groupSystem) settle() error {
	for round := range maxStatusChanges + 2*s.m {
		s.monotone = round >= maxStatusChanges
		if err := s.newton(); err != nil {
			return err
		}
		if lambda, patch := s.stability(); lambda < 0 {
			return &unstable{patch: patch, lambda: lambda}
		}
		if !s.updateStatus() {
			if s.stall == nil {
				return nil
			}
			// Newton cycled across a kink of the friction law for the
			// statuses that hold: retry them with damped steps.
			if err := s.dampedNewton(); err != nil {
				return &stall{err: err, elems: s.worstElements()}
			}
			if lambda, patch := s.stability(); lambda < 0 {
				return &unstable{patch: patch, lambda: lambda}
			}
			if !s.updateStatus() {
				return nil
			}
		}
	}
	return fmt.Errorf("%w: %s's element states kept changing", ErrContactNotConverged, s.name())
}

// stall is the error of a solve whose Newton steps stalled for the
// statuses that hold; elems are the elements whose equations were
// furthest from holding (see Contact.Solve, which detaches the kept
// crossings among them).
type stall struct {
	err   error
	elems []int
}

func (e *stall) Error() string { return e.err.Error() }
func (e *stall) Unwrap() error { return e.err }

// worstElements returns the elements whose residuals at z are within a
// factor ten of the largest.
func (s *groupSystem) worstElements() []int {
	s.residual()
	worst := 0.0
	for _, r := range s.res {
		worst = max(worst, math.Abs(r))
	}
	var out []int
	for q, pos := range s.free {
		if i := s.elems[pos%s.m]; math.Abs(s.res[q]) >= 0.1*worst && !slices.Contains(out, i) {
			out = append(out, i)
		}
	}
	return out
}

// name names the system in messages: a group, or the whole working set.
func (s *groupSystem) name() string {
	if s.group == mergedGroup {
		return "the whole working set"
	}
	return fmt.Sprintf("group %d", s.group)
}

// fix sets the fixed positions of z for the current statuses and lists
// the free ones, or in full mode every position that can be free (the
// openings only without ShearOnly) and which of them are fixed.
func (s *groupSystem) fix() {
	c, t := s.c, &s.c.trial
	m := s.m
	s.free = s.free[:0]
	if s.full && s.fixed == nil {
		s.fixed = make([]bool, 2*m)
	}
	for k, i := range s.elems {
		st := t.status[i]
		switch st {
		case stuck:
			s.z[k], s.z[m+k] = 0, -c.base.Opening[i]
		case sliding:
			s.z[m+k] = -c.base.Opening[i]
		}
		if s.full {
			s.fixed[k], s.fixed[m+k] = st == stuck, st != open
			s.free = append(s.free, k)
			if !c.set.ShearOnly {
				s.free = append(s.free, m+k)
			}
			continue
		}
		switch st {
		case sliding:
			s.free = append(s.free, k)
		case open:
			s.free = append(s.free, k, m+k)
		}
	}
	slices.Sort(s.free)
}

// newton solves the equations of the current statuses. The equations are
// piecewise linear, so the Jacobian changes only where an element crosses
// a kink (Dc, σn′ = 0): a factorization is kept while the states and
// slopes it was made for hold, and made again when Newton stalls. Newton
// stops when its step falls below 1e-13 of the increments, or when two
// steps in a row with the exact Jacobian do not halve it: the step is then
// round-off (a large system's), or crosses kinks back and forth, which no
// further iteration mends.
func (s *groupSystem) newton() error {
	s.stall = nil
	s.fix()
	nf := len(s.free)
	if nf == 0 {
		return nil
	}
	refresh, exactPrev := false, false
	prev, zmax := math.Inf(1), 0.0
	for it := range maxNewton {
		s.residual()
		if !s.factor(refresh) {
			return fmt.Errorf("%w: singular system in %s", ErrContactNotConverged, s.name())
		}
		exact := refresh
		refresh = false
		d := s.newtonStep()
		step := 0.0
		zmax = 0
		for q, pos := range s.free {
			s.z[pos] -= d[q]
			step = max(step, math.Abs(d[q]))
			zmax = max(zmax, math.Abs(s.z[pos]))
		}
		if step <= 1e-13*(zmax+absScale) {
			return nil
		}
		if exact && exactPrev && step > 0.5*prev {
			s.stall = s.stalled(step, zmax)
			return nil
		}
		exactPrev = exact
		if step > 0.5*prev || it > 2 {
			refresh = true // a kink or a changed slope: use the exact Jacobian
		}
		prev = step
	}
	s.stall = s.stalled(prev, zmax)
	return nil
}

// dampedNewton solves the equations of the current statuses again from
// where Newton stalled, with exact Jacobians and steps halved until the
// residual falls (backtracking on the residual's Euclidean norm with the
// sufficient-decrease factor 1 − 10⁻⁴α, the usual globalization of
// Newton's method: Nocedal & Wright 2006, §11.5, from memory). Plain
// Newton can cycle between the two sides of a kink (the end of
// weakening, the turn of sliding) with steps as large as the solution
// itself; damped steps settle onto the kink. It returns the stall error
// when it cannot reduce the residual either.
func (s *groupSystem) dampedNewton() error {
	z0 := make([]float64, len(s.z))
	for range maxNewton {
		s.residual()
		r0 := floats.Norm(s.res, 2)
		if !s.factor(true) {
			return fmt.Errorf("%w: singular system in %s", ErrContactNotConverged, s.name())
		}
		d := s.newtonStep()
		copy(z0, s.z)
		step, zmax := floats.Norm(d, math.Inf(1)), 0.0
		for alpha := 1.0; ; alpha /= 2 {
			if alpha < 1.0/(1<<20) {
				copy(s.z, z0)
				return s.stall
			}
			zmax = 0
			for q, pos := range s.free {
				s.z[pos] = z0[pos] - alpha*d[q]
				zmax = max(zmax, math.Abs(s.z[pos]))
			}
			s.residual()
			if floats.Norm(s.res, 2) <= (1-1e-4*alpha)*r0 {
				break
			}
		}
		// Converged when the full Newton step is within the tolerance.
		if s.stalled(step, zmax) == nil {
			s.stall = nil
			return nil
		}
	}
	return s.stall
}

// newtonStep returns J⁻¹ r for the factorized Jacobian and the residual
// of the last residual call.
func (s *groupSystem) newtonStep() []float64 {
	d := slices.Clone(s.res)
	if s.full {
		s.cache.rows.solve(d)
	} else {
		s.cache.lu.solve(d)
	}
	return d
}

// stalled accepts a Newton solve that stopped with a last step of step
// (largest |z| zmax) when that step is within the contact tolerance (the
// same test that ends the sweeps), and reports a failure otherwise. In
// the middle of the active-set rounds a stalled solve is normal (wrong
// statuses, an unstable patch not yet ruptured) and the next round
// mends it; the solve that the statuses hold for must not pass for a
// converged one.
func (s *groupSystem) stalled(step, zmax float64) error {
	if step <= s.c.set.Tolerance*zmax || step <= absTolerance {
		return nil
	}
	return fmt.Errorf("%w: Newton's steps in %s stalled at %.3g m", ErrContactNotConverged, s.name(), step)
}

// factor readies the factorization of the Jacobian of s.jac: kept while
// its key holds (reduced), updated by the rows whose key changed (full);
// with refactor made exact again. It reports whether the Jacobian is
// nonsingular.
func (s *groupSystem) factor(refactor bool) bool {
	nf := len(s.free)
	if s.full {
		return s.cache.rows.update(s.jac, s.rowKeys, nf, refactor)
	}
	key := s.key()
	if refactor || !s.cache.ok || string(key) != string(s.cache.key) {
		s.cache.key, s.cache.ok = key, s.cache.lu.factorize(slices.Clone(s.jac), nf)
	}
	return s.cache.ok
}

// key describes what the reduced Jacobian depends on: the free positions,
// each element's state, sign and rupture, and the slopes and friction of
// weakening elements (which change with slip).
func (s *groupSystem) key() []byte {
	t := &s.c.trial
	k := make([]byte, 0, 4*len(s.elems)+8*len(s.free))
	for j, i := range s.elems {
		r := byte(0)
		if t.ruptured[i] {
			r = 1
		}
		k = append(k, byte(t.status[i]), byte(t.sign[i]), r)
		if s.slopes[j] != 0 {
			k = append(k, 'w')
		}
	}
	return k
}

// absScale is a length scale, m, below which slip and opening changes are
// round-off in Newton's test (a nanometre).
const absScale = 1e-9

// residual fills s.res and s.jac (the rows and columns of the free
// positions) for the current statuses at z.
func (s *groupSystem) residual() {
	c, t := s.c, &s.c.trial
	m, n2, nf := s.m, 2*s.m, len(s.free)
	if cap(s.jac) < nf*nf {
		s.jac, s.res = make([]float64, nf*nf), make([]float64, nf)
	}
	s.jac, s.res = s.jac[:nf*nf], s.res[:nf]
	clear(s.jac)
	if s.full {
		for r, pos := range s.free {
			if s.fixed[pos] {
				s.jac[r*nf+r] = 1 // z_pos stays at its value: residual 0
				s.res[r] = 0
			}
		}
	}
	row := make([]float64, n2)
	for k, i := range s.elems {
		tau, sigma := s.tractions(k)
		eff := sigma - t.p[i]
		s.slopes[k] = 0
		switch t.status[i] {
		case sliding:
			sg := float64(t.sign[i])
			travel := c.base.Travel[i] + max(sg*s.z[k], 0)
			str, slope := c.strength(i, travel, eff, t.ruptured[i])
			copy(row, s.a[k*n2:(k+1)*n2])
			if eff > 0 {
				mu := (str - c.elems[i].Friction.Cohesion) / eff
				for p, v := range s.a[(m+k)*n2 : (m+k+1)*n2] {
					row[p] -= sg * mu * v
				}
				row[k] -= slope * eff // −s·(∂μ/∂D·s)·σn′
				s.slopes[k] = slope
			}
			s.setRow(s.rowOf(k), row, tau-sg*str)
		case open:
			s.setRow(s.rowOf(k), s.a[k*n2:(k+1)*n2], tau)
			s.setRow(s.rowOf(m+k), s.a[(m+k)*n2:(m+k+1)*n2], eff)
		}
	}
	if s.full {
		s.rowKeys = slices.Grow(s.rowKeys[:0], nf)[:nf]
		for r, pos := range s.free {
			k := pos % m
			i := s.elems[k]
			s.rowKeys[r] = rowKey(t.status[i], t.sign[i], t.ruptured[i], s.slopes[k] != 0, pos >= m)
		}
	}
}

// rowKey packs what a row of the full Jacobian depends on: the element's
// status, sign of sliding, rupture and weakening, and whether the row is
// its slip's or its opening's.
func rowKey(st elementStatus, sign int8, ruptured, weakening, opening bool) uint8 {
	k := uint8(st) | uint8(sign+1)<<2
	if ruptured {
		k |= 1 << 4
	}
	if weakening {
		k |= 1 << 5
	}
	if opening {
		k |= 1 << 6
	}
	return k
}

// rowOf returns the row of free position pos.
func (s *groupSystem) rowOf(pos int) int {
	r, _ := slices.BinarySearch(s.free, pos)
	return r
}

// setRow writes residual v and the free columns of the full row into
// reduced row r.
func (s *groupSystem) setRow(r int, full []float64, v float64) {
	nf := len(s.free)
	s.res[r] = v
	dst := s.jac[r*nf : (r+1)*nf]
	for q, pos := range s.free {
		dst[q] = full[pos]
	}
}

// updateStatus moves elements between stuck, sliding and open by the
// complementarity conditions at z and reports whether any moved.
func (s *groupSystem) updateStatus() bool {
	c, t := s.c, &s.c.trial
	m := s.m
	changed := false
	for k, i := range s.elems {
		tau, sigma := s.tractions(k)
		eff := sigma - t.p[i]
		tol := failTolerance * (math.Abs(tau) + math.Abs(sigma) + 1)
		opens := eff < -tol && !c.set.ShearOnly
		switch t.status[i] {
		case stuck:
			str, _ := c.strength(i, c.base.Travel[i], eff, t.ruptured[i])
			switch {
			case opens:
				t.status[i], changed = open, true
			case math.Abs(tau) > str+tol:
				t.status[i], t.sign[i], changed = sliding, int8(sign(tau)), true
				if t.rupturing[c.elems[i].Group] {
					t.ruptured[i] = true
				}
			}
		case sliding:
			switch {
			case opens:
				t.status[i], changed = open, true
			case float64(t.sign[i])*s.z[k] < -absScale*1e-3 && !s.monotone:
				t.status[i], changed = stuck, true
			}
		case open:
			if c.base.Opening[i]+s.z[m+k] < -absScale*1e-3 {
				t.status[i], changed = stuck, true
			}
		}
	}
	return changed
}

func sign(v float64) float64 {
	if v < 0 {
		return -1
	}
	return 1
}

// stability checks the sliding patch: it is stable while its
// area-weighted stiffness less its weakening,
//
//	B = −½(W K_ss + (W K_ss)ᵀ) − diag(W_k·|∂μ/∂D|·σn′_k),
//
// (W the element areas; the operator is reciprocal in that weighting, so
// W K_ss is symmetric up to round-off) is positive definite (a Cholesky
// factorization exists). For an unstable patch it returns the smallest
// eigenvalue of B, Pa·m (< 0), and the local indices of the sliding
// elements; for a stable one +Inf.
//
// The patch is one group's (trace's) sliding elements, joined with those
// of the groups it crosses at kept crossings (see coupleCrossings): two
// traces that load each other through touching elements can be unstable
// together while each is stable alone (one trace's weakening sheds its
// load onto the other, which sheds it back), and without the joint check
// Newton stalls there with no quasi-static solution to find. When the
// whole working set is solved at once, each joint patch is checked in
// turn and the first unstable one is returned, so that ruptures are
// judged, and run, the same way whichever way the contact problem was
// solved. Other near-field neighbours load each other less (they do not
// touch) and are left to their own patches.
func (s *groupSystem) stability() (float64, []int) {
	t := &s.c.trial
	var slides []int
	for k, i := range s.elems {
		if t.status[i] == sliding {
			slides = append(slides, k)
		}
	}
	if s.group != mergedGroup {
		return s.patchStability(slides), slides
	}
	for _, patch := range s.jointPatches(slides) {
		if lambda := s.patchStability(patch); lambda < 0 {
			return lambda, patch
		}
	}
	return math.Inf(1), nil
}

// jointPatches splits the sliding elements (local indices, ascending)
// into patches: one per group, those of groups with a kept touching pair
// of sliding elements joined. The patches come in order of their first
// element.
func (s *groupSystem) jointPatches(sliding []int) [][]int {
	c := s.c
	local := make(map[int]int, len(sliding))
	for x, k := range sliding {
		local[s.elems[k]] = x
	}
	sets := unionfind.New(len(sliding))
	firstOf := map[int]int32{} // group → its first sliding element
	for x, k := range sliding {
		i := s.elems[k]
		if f, ok := firstOf[c.elems[i].Group]; ok {
			sets.Union(f, int32(x))
		} else {
			firstOf[c.elems[i].Group] = int32(x)
		}
		for _, j := range c.near[i] {
			if y, ok := local[int(j)]; ok && c.keptPair(i, int(j)) {
				sets.Union(int32(x), int32(y))
			}
		}
	}
	labels, n := sets.Labels()
	patches := make([][]int, n)
	for x, k := range sliding {
		patches[labels[x]] = append(patches[labels[x]], k)
	}
	return patches
}

// patchStability returns the smallest eigenvalue of B for the sliding
// elements patch (local indices) when it is not positive definite, else
// +Inf; a patch with no weakening element is stable.
func (s *groupSystem) patchStability(patch []int) float64 {
	weakening := false
	for _, k := range patch {
		weakening = weakening || s.slopes[k] != 0
	}
	if !weakening {
		return math.Inf(1)
	}
	b := s.patchMatrix(patch, s.slopes, s.effAt)
	var ch mat.Cholesky
	if ch.Factorize(mat.NewSymDense(len(patch), b)) {
		return math.Inf(1)
	}
	return math.Min(smallestEigen(b, len(patch)), 0)
}

// effAt returns σn′ of local element k at z.
func (s *groupSystem) effAt(k int) float64 {
	_, sigma := s.tractions(k)
	return sigma - s.c.trial.p[s.elems[k]]
}

// patchMatrix builds B for the patch with the given slopes and effective
// normal stresses (row-major, len(patch)²).
func (s *groupSystem) patchMatrix(patch []int, slopes []float64, eff func(k int) float64) []float64 {
	n2, np := 2*s.m, len(patch)
	b := make([]float64, np*np)
	for x, k := range patch {
		wk := s.c.weight[s.elems[k]]
		for y, l := range patch {
			wl := s.c.weight[s.elems[l]]
			b[x*np+y] = -0.5 * (wk*s.a[k*n2+l] + wl*s.a[l*n2+k])
		}
		b[x*np+x] -= wk * math.Abs(slopes[k]) * math.Max(eff(k), 0)
	}
	return b
}

// rupture turns the unstable sliding patch into a rupture: its elements
// drop to residual friction, the group ruptures every element that starts
// to slide for the rest of the step, and the nucleation is recorded with
// the fraction of the step at which the patch's stability margin crossed
// zero (linear between the start of the step and now).
func (s *groupSystem) rupture(patch []int, lambda1 float64) {
	t := &s.c.trial
	nucleus := patch[0]
	for _, k := range patch {
		i := s.elems[k]
		t.ruptured[i] = true
		t.rupturing[s.c.elems[i].Group] = true
		if math.Abs(s.z[k]) > math.Abs(s.z[nucleus]) {
			nucleus = k
		}
	}
	// The nucleation belongs to the nucleus's own group (the same as the
	// system's unless the whole working set is solved at once).
	g := s.c.elems[s.elems[nucleus]].Group
	if _, ok := t.nucleations[g]; ok {
		return
	}
	// The same patch at the start of the step: committed travel and
	// tractions, the step's starting pressures.
	start := make([]float64, s.m)
	for _, k := range patch {
		i := s.elems[k]
		_, start[k] = s.c.strength(i, s.c.base.Travel[i], s.c.base.Normal[i]-t.pStart[i], s.c.base.Ruptured[i])
	}
	lambda0 := smallestEigen(s.patchMatrix(patch, start, func(k int) float64 {
		i := s.elems[k]
		return s.c.base.Normal[i] - t.pStart[i]
	}), len(patch))
	f := 1.0
	if lambda0 > 0 && lambda1 < 0 {
		f = lambda0 / (lambda0 - lambda1)
	} else if lambda0 <= 0 {
		f = 0
	}
	t.nucleations[g] = nucleation{element: s.elems[nucleus], fraction: f}
}

// derivatives sets ∂D/∂p and ∂w/∂p of the group's elements for a uniform
// pressure change over the group: J y = −∂r/∂p at the solution.
func (s *groupSystem) derivatives() {
	c, t := s.c, &s.c.trial
	m := s.m
	for _, i := range s.elems {
		t.dTravelDp[i], t.dOpeningDp[i] = 0, 0
	}
	nf := len(s.free)
	if nf == 0 {
		return
	}
	s.fix()
	s.residual()
	var lu denseLU
	if !lu.factorize(slices.Clone(s.jac), nf) {
		return
	}
	rhs := make([]float64, nf)
	for k, i := range s.elems {
		switch t.status[i] {
		case sliding:
			if eff := s.effAt(k); eff > 0 {
				str, _ := c.strength(i, c.base.Travel[i]+math.Abs(s.z[k]), eff, t.ruptured[i])
				rhs[s.rowOf(k)] = -float64(t.sign[i]) * (str - c.elems[i].Friction.Cohesion) / eff // −∂r/∂p
			}
		case open:
			rhs[s.rowOf(m+k)] = 1
		}
	}
	y := rhs
	lu.solve(y)
	for k, i := range s.elems {
		switch t.status[i] {
		case sliding:
			t.dTravelDp[i] = math.Max(float64(t.sign[i])*y[s.rowOf(k)], 0)
		case open:
			t.dOpeningDp[i] = math.Max(y[s.rowOf(m+k)], 0)
		}
	}
}

// apply writes the group's new increments into the trial and adds their
// change to the tractions of every element within reach; it returns the
// largest change, m.
func (s *groupSystem) apply() float64 {
	c, t := s.c, &s.c.trial
	m := s.m
	var change float64
	w := c.relaxation
	for k, j := range s.elems {
		ds, dw := w*(s.z[k]-s.z0[k]), w*(s.z[m+k]-s.z0[m+k])
		s.z[k], s.z[m+k] = s.z0[k]+ds, s.z0[m+k]+dw
		if ds == 0 && dw == 0 {
			continue
		}
		change = max(change, math.Abs(ds), math.Abs(dw))
		t.ds[j], t.dw[j] = s.z[k], s.z[m+k]
		c.loadNear(t.dt, t.dn, j, ds, dw)
	}
	return change
}
