package mechanics

import (
	"math"
	"slices"
	"sort"

	"gonum.org/v1/gonum/mat"

	"slipfront/internal/unionfind"
)

// elementStatus is an element's contact state in a trial.
type elementStatus int8

const (
	stuck elementStatus = iota
	sliding
	open
)

// trial is the solution of a time step being iterated: increments from the
// committed state, the working set and what the group solves found.
type trial struct {
	// p are the pressures of the current solve and pStart those of the
	// start of the step, Pa.
	p, pStart []float64
	// ds and dw are the slip and opening increments, m; dt and dn the
	// tractions they cause through the near interactions (self included),
	// Pa.
	ds, dw, dt, dn []float64
	status         []elementStatus
	sign           []int8 // direction of sliding, ±1
	ruptured       []bool
	// dTravelDp and dOpeningDp are ∂D/∂p and ∂w/∂p, m/Pa.
	dTravelDp, dOpeningDp []float64
	inWork                []bool
	work                  []int
	// rupturing groups: every element of them that starts to slide in this
	// step joins the rupture.
	rupturing map[int]bool
	// nucleations records, per rupturing group, where and when in the step
	// its instability began.
	nucleations map[int]nucleation
}

type nucleation struct {
	element  int
	fraction float64
}

func newTrial(n int) trial {
	return trial{
		ds: make([]float64, n), dw: make([]float64, n), dt: make([]float64, n), dn: make([]float64, n),
		status: make([]elementStatus, n), sign: make([]int8, n), ruptured: make([]bool, n),
		dTravelDp: make([]float64, n), dOpeningDp: make([]float64, n), inWork: make([]bool, n),
	}
}

// reset empties the trial for a step from c.base.
func (t *trial) reset(c *Contact, pStart []float64) {
	for _, i := range t.work {
		t.ds[i], t.dw[i], t.dTravelDp[i], t.dOpeningDp[i] = 0, 0, 0, 0
		t.status[i], t.sign[i], t.inWork[i] = stuck, 0, false
	}
	clear(t.dt)
	clear(t.dn)
	t.work = t.work[:0]
	copy(t.ruptured, c.base.Ruptured)
	t.rupturing = map[int]bool{}
	t.nucleations = map[int]nucleation{}
	t.pStart = pStart
	t.p = pStart
}

// strength returns the shear strength of element i at accumulated slip
// travel and effective normal stress eff, Pa, and its weakening slope
// ∂μ/∂D (0 once weakened or ruptured).
func (c *Contact) strength(i int, travel, eff float64, ruptured bool) (tau, slope float64) {
	f := c.elems[i].Friction
	eff = max(eff, 0)
	if ruptured {
		return f.Cohesion + f.Residual*eff, 0
	}
	if travel < f.CriticalSlip {
		slope = -(f.Static - f.Residual) / f.CriticalSlip
	}
	return f.Strength(travel, eff), slope
}

// failTolerance is how far, relative to the stresses involved, a traction
// may pass a strength before the element counts as failing (round-off).
const failTolerance = 1e-12

// enlist adds to the working set every element outside it that fails or
// opens under the current loads, and every element open in the committed
// state; it reports whether it added any.
func (t *trial) enlist(c *Contact) bool {
	added := false
	for i := range c.elems {
		if t.inWork[i] || c.elems[i].Intact {
			continue
		}
		b := c.base
		tau := b.Shear[i] + t.dt[i]
		eff := b.Normal[i] + t.dn[i] - t.p[i]
		s, _ := c.strength(i, b.Travel[i], eff, t.ruptured[i])
		scale := failTolerance * (math.Abs(tau) + math.Abs(b.Normal[i]) + 1)
		opens := eff < -scale && !c.set.ShearOnly
		if opens || math.Abs(tau) > s+scale || b.Opening[i] > 0 {
			t.inWork[i] = true
			t.work = append(t.work, i)
			added = true
		}
	}
	if added {
		slices.Sort(t.work)
	}
	return added
}

// workGroups returns the groups of the working set, ascending (the work
// list is sorted, and a group's elements are numbered in order, so equal
// groups need not be adjacent: collect and sort).
func (c *Contact) workGroups() []int {
	var gs []int
	for _, i := range c.trial.work {
		gs = append(gs, c.elems[i].Group)
	}
	slices.Sort(gs)
	return slices.Compact(gs)
}

// rupturesOf splits the step's newly ruptured elements into runs of
// consecutive elements of one group, and joins the runs of groups that
// touch at a kept crossing into one rupture: such traces are judged
// unstable together (see groupSystem.stability), so their slip is one
// event, not one per trace.
func (t *trial) rupturesOf(c *Contact) []Rupture {
	var runs [][]int
	runOf := map[int]int32{}
	for _, elems := range c.groups {
		var run []int
		flush := func() {
			if len(run) > 0 {
				runs = append(runs, run)
				run = nil
			}
		}
		for _, i := range elems {
			if t.ruptured[i] && !c.base.Ruptured[i] {
				runOf[i] = int32(len(runs))
				run = append(run, i)
				continue
			}
			flush()
		}
		flush()
	}
	sets := unionfind.New(len(runs))
	for i, r := range runOf {
		for _, j := range c.near[i] {
			if q, ok := runOf[int(j)]; ok && q != r && c.keptPair(i, int(j)) {
				sets.Union(r, q)
			}
		}
	}
	labels, n := sets.Labels()
	out := make([]Rupture, n)
	for r, run := range runs {
		out[labels[r]].Elements = append(out[labels[r]].Elements, run...)
	}
	for k := range out {
		r := &out[k]
		r.Nucleation, r.Fraction = -1, 1
		for _, i := range r.Elements {
			if nu, ok := t.nucleations[c.elems[i].Group]; ok && nu.element == i && (r.Nucleation < 0 || nu.fraction < r.Fraction) {
				r.Nucleation, r.Fraction = nu.element, nu.fraction
			}
		}
		if r.Nucleation < 0 {
			r.Nucleation = largestSlip(r.Elements, t.ds)
		}
	}
	return out
}

func largestSlip(elems []int, ds []float64) int {
	best := elems[0]
	for _, i := range elems {
		if math.Abs(ds[i]) > math.Abs(ds[best]) {
			best = i
		}
	}
	return best
}

// smallestEigen returns the smallest eigenvalue of the symmetric matrix
// a (n×n, row-major), or −Inf when it cannot be computed.
func smallestEigen(a []float64, n int) float64 {
	var es mat.EigenSym
	if !es.Factorize(mat.NewSymDense(n, a), false) {
		return math.Inf(-1)
	}
	v := es.Values(nil)
	sort.Float64s(v)
	return v[0]
}
