package mechanics

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
)

// ContactElement is one element of the friction-contact problem: a
// vertical fracture patch in map view (see package elastic for its frame
// and the sign of slip, opening and tractions) with its in-situ tractions
// and friction.
type ContactElement struct {
	Element elastic.Element
	// Group numbers the elements solved together: the elements of one
	// trace or conduit, in order along it.
	Group int
	// Shear is the in-situ shear traction along the element, signed as
	// elastic's Δτ (positive drives right-lateral slip), and Normal the
	// in-situ total normal stress, compression-positive, Pa.
	Shear, Normal float64
	// Friction of the element's surfaces.
	Friction SlipWeakening
	// Intact marks intact rock (ahead of a growing fracture's tip): it
	// neither slips nor opens, and where it touches another element
	// (DetachRadius) the two are detached without compensation, since
	// one of them cannot move, until Release.
	Intact bool
}

// ContactSettings control the solution of the contact problem.
type ContactSettings struct {
	// NearRadius, m: within a time step, elements closer than this
	// (centre to centre) load each other implicitly; farther ones through
	// the tractions of the committed state, brought up to date by the full
	// operator at every commit. It must be > 0.
	NearRadius float64
	// Tolerance is the change of slip and opening between iterations,
	// relative to the largest increment of the step, that ends them
	// (default 1e-6).
	Tolerance float64
	// MaxIterations of the block Gauss–Seidel sweeps (default 200), after
	// which a small enough working set is solved whole (and, while the
	// solves keep needing that, after retrySweeps).
	MaxIterations int
	// DetachRadius, m: elements of different groups do not load each
	// other when the centre of either is closer than this to the other
	// element (any point of it). Where two traces cross or one ends on
	// another, the constant-element collocation puts one element's centre
	// next to the other's end or on its face, where the influence is
	// singular and meaningless; such pairs are left out, their coupling
	// added to the two self-influences so that the elastic energy stays
	// positive (see compensation; 0 keeps every pair; CoupleCrossings keeps
	// those of the crossings that stay well posed). It must not exceed
	// NearRadius less half the longest element.
	DetachRadius float64
	// FarRefresh, m: the stress that slip and opening transfer beyond
	// NearRadius is added to the committed tractions once some element's
	// slip or opening has changed by more than this since the last such
	// refresh (the near field at every Commit). 0 refreshes at every
	// Commit. A refresh is a product with the whole operator, the costly
	// part of a step on a large network; the lag it saves is bounded by
	// the stress of FarRefresh of slip seen from beyond NearRadius.
	FarRefresh float64
	// NoDerivatives skips the pressure derivatives of slip and opening
	// (Aperture then returns 0 for them), for callers that couple flow and
	// slip sequentially and do not use them.
	NoDerivatives bool
	// CoupleCrossings keeps the pairs of a crossing, the touching
	// elements where traces cross, whose contact problem stays well posed
	// with them (see coupleCrossings: no pin, so their slip converges with
	// the elements); it detaches and compensates the rest. Without it
	// every touching pair is detached.
	CoupleCrossings bool
	// ShearOnly keeps every element closed: an element whose effective
	// normal stress falls below zero slides at its cohesion instead of
	// opening. The caller then models opening itself (as the simulator
	// does with the crack compliance of each fracture and conduit) and
	// passes its stress changes on through ContactState.
	ShearOnly bool
}

// ErrContactNotConverged is returned (wrapped) when the contact iterations
// do not converge; a shorter time step usually does.
var ErrContactNotConverged = errors.New("mechanics: friction contact did not converge")

// Contact is the quasi-static friction-contact problem of elastically
// interacting fracture elements under given fluid pressures.
//
// Every element is either stuck, sliding on its friction law, or open:
//
//	stuck:   Δs = 0, w = 0, |τ| ≤ c + μ(D)·(σn − p), σn ≥ p
//	sliding: τ = ±[c + μ(D)·(σn − p)] with the sign of Δs, w = 0, σn ≥ p
//	open:    w ≥ 0, σn = p, τ = 0
//
// where τ and σn are the in-situ tractions plus those that every element's
// slip s and opening w cause through the elastic operator (stress shadows),
// D the accumulated slip magnitude and μ(D) linear slip weakening
// (SlipWeakening; Ida 1972; Palmer & Rice 1973). Slip increments Δs are
// counted from the committed state of the last time step, so friction is
// rate-independent and the solution is quasi-static.
//
// # Method
//
// The elements that slip, are open, or would fail form the working set.
// Within it, nonlinear block Gauss–Seidel sweeps over the groups (traces):
// each group's elements are solved together by Newton's method with an
// active set (stuck, sliding with its sign, open), with the dense block of
// the group and the other groups' current increments as loads; after each
// group the tractions of its neighbours are brought up to date. Groups
// that load each other strongly (crossing traces on short elements) can
// make the sweeps stall or diverge; when they have not settled after
// MaxIterations sweeps, a working set of up to 1 500 elements is solved as
// one group, with every interaction within NearRadius in one Jacobian
// (stability is still judged group by group, and ∂D/∂p is then the
// response to a pressure change over the whole set). Its Jacobian keeps
// every element's row, so that the many rounds in which a few elements
// change status update its factorization by those rows (Sherman–Morrison–
// Woodbury) instead of factoring it again. Once a solve has
// needed that, the following ones (coupling iterations, later steps) try
// only retrySweeps sweeps before it and keep the whole set's matrix while
// the set is unchanged, until the sweeps settle again. Elements outside
// the set are checked against their strength after every round, and join
// it when they fail. Interactions between elements farther apart
// than NearRadius act through the committed tractions (the full operator
// at every Commit): a within-step lag that vanishes as the step shrinks.
//
// # Instability
//
// While a sliding element weakens (D < Dc), its strength falls at the rate
// W = (μs − μd)·σn′/Dc. The sliding patch is stable as long as its
// elastic stiffness exceeds that rate: the matrix −K_ss − diag(W) of the
// weakening sliding elements, symmetrized with the element areas (the
// operator is reciprocal in that weighting), is positive definite. When it
// is not, no quasi-static solution continues the slip: the patch ruptures
// (Uenishi & Rice 2003: this happens at the nucleation length, whatever the
// loading). The rupture is modelled by its static end state: the patch's
// friction drops to μd, and every element of the group that fails while
// the rupture runs joins it at μd, until the residual-friction solution
// stops at elements below their peak strength. Dynamic overshoot and
// healing are left out: a ruptured element keeps μd.
type Contact struct {
	op    elastic.Operator
	elems []ContactElement
	set   ContactSettings
	// weight is each element's area L·h, m², the weighting that makes the
	// operator reciprocal.
	weight []float64
	// self is each element's self-influence block; near[i] the elements
	// within NearRadius of i, nearSlip[i][k] the shear and normal traction
	// change of near[i][k] (the receiver) per unit slip of element i and
	// nearOpening[i][k] per unit opening. Kept apart, the slip halves are
	// all a sliding element that does not open reads when it loads its
	// neighbours (loadNear is bound by the memory it reads).
	self        []elastic.Block
	near        [][]int32
	nearSlip    [][][2]float64
	nearOpening [][][2]float64
	// detached[j] are the receivers that source j does not load, and
	// detachedBlock their influence, subtracted from the full operator's;
	// compensated is what each element's self-influence gains for them
	// (see compensation), included in self.
	detached      [][]int32
	detachedBlock [][]elastic.Block
	compensated   []elastic.Block
	// crossingOf is the crossing of each touching pair of ordinary
	// elements, by pairKey (nil without CoupleCrossings), crossingMembers
	// the elements of each and crossingKept whether it keeps its pairs.
	crossingOf      map[[2]int]int
	crossingMembers [][]int
	crossingKept    []bool
	groups          [][]int

	// The committed state of the step and its tractions.
	base *ContactState
	// The trial of the step: increments, flags, tractions.
	trial trial
	// caches keeps each group's influence matrix and factorization.
	caches map[int]*groupCache
	// relaxation is the fraction of a group solve's change that the
	// sweep applies (1 at first, less if the sweeps do not settle).
	relaxation float64
	// merging tells that the last solve needed the whole working set
	// solved at once.
	merging bool
	// The slip and opening not yet transferred to the far field, m, and
	// their largest magnitude; work arrays of the far-field product.
	pendS, pendW []float64
	pendMax      float64
	tsAll, tnAll []float64
}

// ContactState is the committed mechanical state of every element.
type ContactState struct {
	// Slip, m (signed as elastic's slip), Travel the accumulated slip
	// magnitude D, m (the slip-weakening variable), Opening w, m.
	Slip, Travel, Opening []float64
	// Ruptured elements have lost their strength to μd in a rupture.
	Ruptured []bool
	// Shear and Normal are the tractions at this state: the in-situ ones
	// plus those of all slip and opening, Pa.
	Shear, Normal []float64
}

// NewContact builds the problem of the elements, whose operator op the
// caller built from the same elements in the same order.
func NewContact(op elastic.Operator, elems []ContactElement, s ContactSettings) (*Contact, error) {
	n := len(elems)
	if op.Len() != n {
		panic("mechanics: contact operator and elements differ in length")
	}
	if !(s.NearRadius > 0) || math.IsInf(s.NearRadius, 0) {
		return nil, &InputError{Name: "near radius", Value: s.NearRadius, Want: "must be finite and > 0"}
	}
	longest := 0.0
	for _, e := range elems {
		longest = math.Max(longest, e.Element.Length())
	}
	if reach := s.NearRadius - longest/2; !(s.DetachRadius >= 0 && s.DetachRadius <= reach) {
		return nil, &InputError{Name: "detach radius", Value: s.DetachRadius,
			Want: fmt.Sprintf("must be in [0, %g] (the near radius less half the longest element)", reach)}
	}
	if s.Tolerance <= 0 {
		s.Tolerance = 1e-6
	}
	if s.MaxIterations <= 0 {
		s.MaxIterations = 200
	}
	c := &Contact{op: op, elems: elems, set: s, weight: make([]float64, n), self: make([]elastic.Block, n)}
	maxGroup := -1
	for i, e := range elems {
		if err := e.Friction.Validate(); err != nil {
			return nil, fmt.Errorf("element %d: %w", i, err)
		}
		if e.Group < 0 {
			return nil, &InputError{Name: "group", Value: float64(e.Group), Want: "must be ≥ 0"}
		}
		maxGroup = max(maxGroup, e.Group)
		c.weight[i] = e.Element.Length() * e.Element.Height
		c.self[i] = op.At(i, i)
	}
	c.groups = make([][]int, maxGroup+1)
	for i, e := range elems {
		c.groups[e.Group] = append(c.groups[e.Group], i)
	}
	c.findNear()
	for i := range c.self {
		c.self[i] = addBlock(c.self[i], c.compensated[i])
	}
	c.trial = newTrial(n)
	c.caches = map[int]*groupCache{}
	c.pendS, c.pendW, c.tsAll, c.tnAll = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	return c, nil
}

// findNear lists, for every element, the elements within NearRadius and
// their influence, with a uniform grid of element centres.
func (c *Contact) findNear() {
	n := len(c.elems)
	centres := make([]r2.Vec, n)
	for i, e := range c.elems {
		centres[i] = e.Element.Centre()
	}
	g := newCentreGrid(centres, c.set.NearRadius)
	c.near = make([][]int32, n)
	c.nearSlip = make([][][2]float64, n)
	c.nearOpening = make([][][2]float64, n)
	c.detached = make([][]int32, n)
	c.detachedBlock = make([][]elastic.Block, n)
	c.compensated = make([]elastic.Block, n)
	r2max := c.set.NearRadius * c.set.NearRadius
	if c.set.CoupleCrossings {
		c.coupleCrossings(g, centres) // compensates what it detaches
	}
	for j := range n { // source j
		g.visit(centres[j], func(i int) {
			if i == j {
				return
			}
			d := r2.Sub(centres[i], centres[j])
			if c.elems[i].Group != c.elems[j].Group && c.touching(i, j) && !c.keptPair(i, j) {
				aij := c.op.At(i, j)
				c.detached[j] = append(c.detached[j], int32(i))
				c.detachedBlock[j] = append(c.detachedBlock[j], aij)
				if !c.set.CoupleCrossings && i > j && !c.elems[i].Intact && !c.elems[j].Intact { // each pair once: it is visited from both ends
					c.compensatePair(i, j, aij)
				}
				return
			}
			if r2.Dot(d, d) <= r2max {
				b := c.op.At(i, j)
				c.near[j] = append(c.near[j], int32(i))
				c.nearSlip[j] = append(c.nearSlip[j], [2]float64{b.ShearSlip, b.NormalSlip})
				c.nearOpening[j] = append(c.nearOpening[j], [2]float64{b.ShearOpening, b.NormalOpening})
			}
		})
	}
}

// compensatePair adds the compensation of the detached pair of receiver
// i and source j, whose block A_ij is aij, to the two elements'
// compensated blocks and returns it.
func (c *Contact) compensatePair(i, j int, aij elastic.Block) (ci, cj elastic.Block) {
	ci, cj = compensation(aij, c.weight[i], c.weight[j], c.set.ShearOnly)
	c.compensated[i] = addBlock(c.compensated[i], ci)
	c.compensated[j] = addBlock(c.compensated[j], cj)
	return ci, cj
}

// Release makes intact element i an ordinary one (the fracture has
// reached it): from the next Begin it may slip and open, and its detached
// pairs with ordinary elements are compensated from then on (the
// tractions already committed are not changed).
func (c *Contact) Release(i int) {
	if !c.elems[i].Intact {
		return
	}
	c.elems[i].Intact = false
	for q, j := range c.detached[i] { // receivers of source i
		if c.elems[j].Intact {
			continue
		}
		cj, ci := c.compensatePair(int(j), i, c.detachedBlock[i][q])
		c.self[j] = addBlock(c.self[j], cj)
		c.self[i] = addBlock(c.self[i], ci)
	}
	clear(c.caches) // their matrices hold the self-influences
}

// NearPairs returns the number of element pairs that interact implicitly
// within a step.
func (c *Contact) NearPairs() int {
	var k int
	for _, l := range c.near {
		k += len(l)
	}
	return k
}

// NewState returns the state before any slip: the in-situ tractions.
func (c *Contact) NewState() *ContactState {
	n := len(c.elems)
	st := &ContactState{Slip: make([]float64, n), Travel: make([]float64, n), Opening: make([]float64, n),
		Ruptured: make([]bool, n), Shear: make([]float64, n), Normal: make([]float64, n)}
	for i, e := range c.elems {
		st.Shear[i], st.Normal[i] = e.Shear, e.Normal
	}
	return st
}

// Begin starts a time step from the committed state st, which Contact
// keeps until Commit; pStart are the pressures at the start of the step,
// Pa, against which ruptures measure how far into the step they happened.
// Calling Begin again discards the trial (a step repeated shorter).
func (c *Contact) Begin(st *ContactState, pStart []float64) {
	c.base = st
	c.trial.reset(c, pStart)
}

// SolveResult describes one solution of the trial.
type SolveResult struct {
	// Sweeps of the block Gauss–Seidel iterations, with the solves of the
	// whole working set that followed them if any; Active elements in the
	// working set.
	Sweeps, Active int
	// MaxSlip is the largest slip increment of the step, m, outside
	// ruptures (which happen at once, whatever the step).
	MaxSlip float64
	// Ruptured tells that a rupture has happened in this step.
	Ruptured bool
}

// Solve finds the slip and opening of every element at the pressures p,
// Pa, from the committed state of Begin. The result is the trial, read by
// Aperture and kept by Commit. Successive calls within a step (coupling
// iterations) start from the previous trial.
func (c *Contact) Solve(p []float64) (SolveResult, error) {
	if c.base == nil {
		panic("mechanics: Contact.Solve before Begin")
	}
	if len(p) != len(c.elems) {
		panic("mechanics: contact pressures of the wrong length")
	}
	t := &c.trial
	t.p = p
	var res SolveResult
	err := c.solveRounds(&res)
	for err != nil && c.detachStalled(err) {
		// Solve the step again from its start with those crossings
		// detached.
		t.reset(c, t.pStart)
		t.p = p
		err = c.solveRounds(&res)
	}
	if err != nil {
		return res, err
	}
	res.Active = len(t.work)
	for _, i := range t.work {
		if !t.ruptured[i] || c.base.Ruptured[i] {
			res.MaxSlip = math.Max(res.MaxSlip, math.Abs(t.ds[i]))
		}
		res.Ruptured = res.Ruptured || (t.ruptured[i] && !c.base.Ruptured[i])
	}
	return res, nil
}

// solveRounds enlists the failing elements and sweeps until no element
// outside the working set fails, counting the sweeps in res.
func (c *Contact) solveRounds(res *SolveResult) error {
	t := &c.trial
	for round := 0; ; round++ {
		t.enlist(c)
		sweeps, err := c.sweep(round)
		res.Sweeps += sweeps
		if err != nil {
			return err
		}
		if !t.enlist(c) {
			return nil
		}
		if round == c.set.MaxIterations {
			return fmt.Errorf("%w: elements kept failing after %d rounds", ErrContactNotConverged, round)
		}
	}
}

// sweep runs block Gauss–Seidel over the groups of the working set until
// the increments settle.
func (c *Contact) sweep(round int) (int, error) {
	t := &c.trial
	c.relaxation = 1
	budget := c.set.MaxIterations
	if c.merging && len(t.work) <= mergedLimit {
		budget = min(budget, retrySweeps)
	}
	for k := 1; k <= budget; k++ {
		if k > c.set.MaxIterations/4 {
			// Groups that load each other strongly (through the coupling
			// of slip and normal stress of crossing traces) can make
			// plain block Gauss–Seidel cycle; under-relaxed updates
			// keep its fixed points and damp the cycle.
			c.relaxation = 0.5
		}
		var change float64
		for _, g := range c.workGroups() {
			dc, err := c.solveGroup(g, c.working(g))
			if err != nil {
				return k, err
			}
			change = math.Max(change, dc)
		}
		if c.settled(change) {
			if c.merging {
				c.merging = false
				delete(c.caches, mergedGroup)
			}
			return k, nil
		}
	}
	if len(t.work) <= mergedLimit {
		c.merging = true
		k, err := c.sweepMerged(round)
		return budget + k, err
	}
	return budget, fmt.Errorf("%w in %d sweeps (round %d, %d elements active, more than the %d solved as one system)", ErrContactNotConverged,
		budget, round, len(t.work), mergedLimit)
}

// settled reports whether the largest change of a sweep, m, is within the
// tolerance of the working set's largest increment.
func (c *Contact) settled(change float64) bool {
	t := &c.trial
	var scale float64
	for _, i := range t.work {
		scale = math.Max(scale, math.Max(math.Abs(t.ds[i]), math.Abs(t.dw[i])))
	}
	return change <= c.set.Tolerance*scale || change <= absTolerance
}

// working returns the working elements of group g, ascending.
func (c *Contact) working(g int) []int {
	var elems []int
	for _, i := range c.groups[g] {
		if c.trial.inWork[i] {
			elems = append(elems, i)
		}
	}
	return elems
}

// mergedGroup is the key of the system of the whole working set, and
// mergedLimit the largest working set solved so: its matrix is dense, 2m ×
// 2m (72 MB at 1 500 elements), and the Jacobian of its sliding elements
// is factored once per change of their states (about 25 ms for 700 of
// them on one core). retrySweeps is the sweeps tried before it once a
// solve has needed it: sweeps that settle so fast cost no more than it.
const (
	mergedGroup = -1
	mergedLimit = 1500
	retrySweeps = 10
)

// sweepMerged solves the whole working set as one group, when block
// Gauss–Seidel over the groups did not settle: groups that load each other
// strongly enough (crossing traces on short elements) make the sweeps
// diverge or stall, while the coupled system has a solution. Every
// interaction within NearRadius is then in one Jacobian, so the second
// solve normally finds nothing left to change. It returns the solves it
// made.
func (c *Contact) sweepMerged(round int) (int, error) {
	t := &c.trial
	c.relaxation = 1
	const passes = 8
	for k := 1; k <= passes; k++ {
		change, err := c.solveGroup(mergedGroup, t.work)
		if err != nil {
			return k, err
		}
		if c.settled(change) {
			return k, nil
		}
	}
	return passes, fmt.Errorf("%w after %d solves of the whole working set (round %d, %d elements active)",
		ErrContactNotConverged, passes, round, len(t.work))
}

// absTolerance is the change of slip or opening, m, below which the
// iterations have converged whatever the scale (far below any aperture).
const absTolerance = 1e-12

// Aperture returns, for element i of the trial, the effective normal
// stress σn − p, Pa, the accumulated slip D, m, and the opening w, m, and
// their derivatives with respect to a uniform pressure change of the
// element's group, ∂D/∂p and ∂w/∂p, m/Pa (0 for elements outside the
// working set).
func (c *Contact) Aperture(i int) (sigmaEff, travel, opening, dTravel, dOpening float64) {
	t := &c.trial
	sigmaEff = c.base.Normal[i] + t.dn[i] - t.p[i]
	return sigmaEff, c.base.Travel[i] + math.Abs(t.ds[i]), c.base.Opening[i] + t.dw[i], t.dTravelDp[i], t.dOpeningDp[i]
}

// Slipping reports whether element i slides in the trial.
func (c *Contact) Slipping(i int) bool { return c.trial.status[i] == sliding }

// Rupture is one rupture of a step: a run of elements of one group that
// lost their strength together, with the runs of the groups it crosses at
// kept crossings (see ContactSettings.CoupleCrossings), which rupture with
// it.
type Rupture struct {
	// Elements of the rupture, in order along each group, the groups in
	// order.
	Elements []int
	// Nucleation is the element that slipped most when the patch became
	// unstable.
	Nucleation int
	// Fraction in [0, 1] locates the instability within the step: the
	// stability margin of the sliding patch (the smallest eigenvalue of its
	// symmetrized stiffness less weakening, see Contact) interpolated
	// linearly between the start of the step (positive) and its end
	// (negative) to zero.
	Fraction float64
}

// StepSlip is what Commit accepted: the ruptures of the step and the slip
// moments, N·m, split into seismic (ruptures) and aseismic (stable slip).
type StepSlip struct {
	Ruptures                      []Rupture
	SeismicMoment, AseismicMoment float64
}

// Commit accepts the trial into the committed state given to Begin: the
// slip, travel, opening and rupture flags, and the tractions: at once
// those of the near field, and those of the far field when
// ContactSettings.FarRefresh says so. opening, when not nil, holds
// opening increments, m, that the caller models itself (see
// ContactSettings.ShearOnly), to be transferred with the slip. The shear
// modulus g, Pa, gives the moments M0 = G·Σ A·|Δs| (Aki 1966).
func (c *Contact) Commit(g float64, opening []float64) StepSlip {
	t, st := &c.trial, c.base
	var out StepSlip
	for _, i := range t.work {
		m0 := g * c.weight[i] * math.Abs(t.ds[i])
		if t.ruptured[i] && !st.Ruptured[i] {
			out.SeismicMoment += m0
		} else {
			out.AseismicMoment += m0
		}
	}
	out.Ruptures = t.rupturesOf(c)
	for _, i := range t.work {
		st.Slip[i] += t.ds[i]
		st.Travel[i] += math.Abs(t.ds[i])
		st.Opening[i] = math.Max(st.Opening[i]+t.dw[i], 0)
		st.Ruptured[i] = st.Ruptured[i] || t.ruptured[i]
		c.pend(i, t.ds[i], t.dw[i])
	}
	// The group solves brought the near field up to date in t.dt, t.dn.
	for i := range st.Shear {
		st.Shear[i] += t.dt[i]
		st.Normal[i] += t.dn[i]
	}
	for j, w := range opening {
		if w != 0 {
			c.loadNear(st.Shear, st.Normal, j, 0, w)
			c.pend(j, 0, w)
		}
	}
	if c.pendMax > c.set.FarRefresh {
		c.refreshFar(st)
	}
	c.base = nil
	return out
}

// pend adds slip ds and opening dw of element i to what the far field has
// not yet seen.
func (c *Contact) pend(i int, ds, dw float64) {
	c.pendS[i] += ds
	c.pendW[i] += dw
	c.pendMax = math.Max(c.pendMax, math.Max(math.Abs(c.pendS[i]), math.Abs(c.pendW[i])))
}

// loadNear adds to the tractions ts, tn what slip ds and opening dw of
// element j cause on itself and on the elements within NearRadius.
func (c *Contact) loadNear(ts, tn []float64, j int, ds, dw float64) {
	b := c.self[j]
	ts[j] += b.ShearSlip*ds + b.ShearOpening*dw
	tn[j] += b.NormalSlip*ds + b.NormalOpening*dw
	near := c.near[j]
	switch {
	case dw == 0:
		scatter(ts, tn, near, c.nearSlip[j], ds)
	case ds == 0:
		scatter(ts, tn, near, c.nearOpening[j], dw)
	default: // slip and opening summed before they are added, one rounding per receiver
		slip, opening := c.nearSlip[j][:len(near)], c.nearOpening[j][:len(near)]
		for q, i := range near {
			ts[i] += slip[q][0]*ds + opening[q][0]*dw
			tn[i] += slip[q][1]*ds + opening[q][1]*dw
		}
	}
}

// scatter adds v times per[q], the shear and normal traction change per
// unit of receiver near[q], to ts and tn.
func scatter(ts, tn []float64, near []int32, per [][2]float64, v float64) {
	for q, b := range per[:len(near)] {
		i := near[q]
		ts[i] += b[0] * v
		tn[i] += b[1] * v
	}
}

// refreshFar adds to st the tractions of the pending slip and opening
// beyond the near field (the whole operator's, less the near field's,
// which Commit has already added) and clears them.
func (c *Contact) refreshFar(st *ContactState) {
	c.Influence(c.tsAll, c.tnAll, c.pendS, c.pendW)
	for j := range c.pendS {
		if ds, dw := c.pendS[j], c.pendW[j]; ds != 0 || dw != 0 {
			c.loadNear(c.tsAll, c.tnAll, j, -ds, -dw)
		}
	}
	for i := range st.Shear {
		st.Shear[i] += c.tsAll[i]
		st.Normal[i] += c.tnAll[i]
	}
	clear(c.pendS)
	clear(c.pendW)
	c.pendMax = 0
}

// Influence overwrites ts and tn with the shear and normal traction
// changes, Pa, that slip ds and opening dw, m, of the elements cause: the
// operator's product without the detached pairs, and with their
// compensation (see DetachRadius and compensation).
func (c *Contact) Influence(ts, tn, ds, dw []float64) {
	c.op.MulVecTo(ts, tn, ds, dw)
	for j, list := range c.detached {
		if ds[j] == 0 && dw[j] == 0 {
			continue
		}
		b := &c.compensated[j]
		ts[j] += b.ShearSlip*ds[j] + b.ShearOpening*dw[j]
		tn[j] += b.NormalSlip*ds[j] + b.NormalOpening*dw[j]
		for q, i := range list {
			b := &c.detachedBlock[j][q]
			ts[i] -= b.ShearSlip*ds[j] + b.ShearOpening*dw[j]
			tn[i] -= b.NormalSlip*ds[j] + b.NormalOpening*dw[j]
		}
	}
}

// touching reports whether elements i and j are closer than DetachRadius:
// the centre of either to the other element.
func (c *Contact) touching(i, j int) bool {
	r := c.set.DetachRadius
	a, b := c.elems[i].Element, c.elems[j].Element
	return pointSegmentDistance(a.Centre(), b.P0, b.P1) < r || pointSegmentDistance(b.Centre(), a.P0, a.P1) < r
}

// pointSegmentDistance returns the distance from p to the segment a–b.
func pointSegmentDistance(p, a, b r2.Vec) float64 {
	ab := r2.Sub(b, a)
	t := 0.0
	if l2 := r2.Dot(ab, ab); l2 > 0 {
		t = math.Max(0, math.Min(1, r2.Dot(r2.Sub(p, a), ab)/l2))
	}
	return r2.Norm(r2.Sub(p, r2.Add(a, r2.Scale(t, ab))))
}
