package sim

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/elastic"
	"slipfront/mechanics"
)

// mechState is the mechanical state of every element: the friction-contact
// problem of all elements, which interact through the elastic operator
// (mechanics.Contact), its committed state, and the opening of every
// element as the flow model sees it.
//
// Within a time step, flow and slip are coupled sequentially: the flow
// step sees the slip and the stresses of the last accepted step (its
// apertures then depend on the element's own pressure only, smoothly), and
// the contact problem is then solved at the step's end pressures and
// committed. The slip a step adds is bounded by numerics.slip_max, so the
// lag of dilation and stress shadows behind the pressure is one short step
// and vanishes as the step shrinks (the time-step refinement of the
// README's convergence table shows it).
type mechState struct {
	m       *model
	op      elastic.Operator
	contact *mechanics.Contact
	state   *mechanics.ContactState
	// openingShape is each element's opening relative to its crack's mean
	// (see setOpeningShape).
	openingShape []float64
	// crackNormal is the normal stress of each element's aperture law,
	// Pa (see averageNormal).
	crackNormal []float64
	// crackStiffness is the opening stiffness of each element's crack
	// (its trace, or its whole conduit), Pa/m, and opening the elastic
	// opening of each element at the last accepted step, m: its changes
	// load the other elements.
	crackStiffness, opening []float64
	// conduitAperture0 is the propped aperture of conduit elements, m.
	conduitAperture0 []float64
	// groups lists the elements of every group (trace or conduit, in order
	// along it) and groupLength its length, m: the opening of an element
	// loads the other groups only (its own crack's opening is already in
	// its compliance).
	groups      [][]int
	groupLength []float64
	// ownBlocks[g] is group g's influence on itself (row-major, receiver
	// by source), built the first time one of its cracks opens.
	ownBlocks map[int][]elastic.Block
	// slipping marks the elements that slipped in the last accepted step.
	slipping []bool
	// First slip time, s (NaN if never), and the stage index it happened in.
	firstSlip  []float64
	firstStage []int
	// SeismicMoment and AseismicMoment released so far, N·m.
	seismicMoment, aseismicMoment float64
	// Work arrays: the travel before a commit, m, and the opening change
	// of a step, m.
	travel0, dw []float64
	// The pressures, Pa, and apertures, m, of the last iteration of the
	// step, if iterated.
	lastP, lastE []float64
	iterated     bool
	// depths draws the events' depths (seeded by the scenario's seed, the
	// realization and the purpose, so runs repeat exactly).
	depths *rand.Rand
	// coulomb holds the Coulomb stress change of every element, Pa.
	coulomb []float64
	// Growth (growth.go): opened marks the elements open to flow and
	// opening (all but the intact rock ahead of growing conduits' tips);
	// tips and openedLength (m) are each conduit's opened extent;
	// elementNodes the mesh nodes of every element, built on first use;
	// growingEl marks the elements of growing conduits (nil when none
	// grows); cubeMean marks the elements whose faces conduct by the mean
	// of cubes (flow.Config.CubeMean): the growing ones and the natural
	// elements where an armed branch starts.
	opened       []bool
	tips         []tipState
	openedLength []float64
	elementNodes [][2]int
	growingEl    []bool
	cubeMean     []bool
	// paths records the headings the tips meet when the paths may turn
	// (path.go; nil otherwise).
	paths *pathRecorder
}

// contactNearRadius is the reach, in element lengths or layer
// thicknesses (the larger), within which elements load each other
// implicitly in a step; farther ones act through the committed stresses
// (see mechanics.Contact). Beyond a few fracture heights the height
// correction makes the interaction weak, so the lag of the far field cannot
// feed back on itself; within, two fractures that load each other strongly
// must be solved together or their slip would grow step after step.
const contactNearRadius = 3

// nearRadius is the contact problem's near radius, m
// (mechanics.ContactSettings.NearRadius; see contactNearRadius).
func (m *model) nearRadius() float64 {
	return contactNearRadius * math.Max(m.s.Numerics.ElementLength, m.s.Layer.Thickness)
}

// detachRadius, in element lengths, is how close the centre of an
// element of another trace may come to an element before the two stop
// loading each other (mechanics.ContactSettings.DetachRadius): at a
// crossing, the elements that touch it (centres half an element length
// from the other trace), and traces that run closer than that. There
// constant elements give influences far too large (the stress next to an
// element's end is singular), and the slip they drive grows without bound.
// The contact problem adds each such pair's coupling to the two elements'
// own stiffness, so the elements at a crossing are stiffened instead. A
// wider band (two element lengths, the earlier choice) converged falsely:
// the zipper pad's area held within 0.3 % from 10 to 5 m elements and
// then grew 13 % at 2.5 m, and the demo's pressure was 4.4 MPa low on 10 m
// elements, whose band detached conduits 15 m apart. With the touching
// elements only, area and pressure hold from 10 m on (README,
// Convergence).
const detachRadius = 0.6

// farRefresh is the slip or opening, as a fraction of numerics.slip_max,
// that some element may gather before the stress it transfers beyond the
// near radius is brought up to date (mechanics.ContactSettings.FarRefresh):
// like the step's slip, it shrinks with slip_max.
const farRefresh = 0.1

func newMechState(m *model) (*mechState, error) {
	n := len(m.elements)
	ms := &mechState{m: m,
		crackStiffness: make([]float64, n), crackNormal: make([]float64, n), openingShape: make([]float64, n), opening: make([]float64, n), conduitAperture0: make([]float64, n),
		slipping: make([]bool, n), firstSlip: make([]float64, n), firstStage: make([]int, n),
		travel0: make([]float64, n), dw: make([]float64, n), lastP: make([]float64, n), lastE: make([]float64, n),
	}
	nt := len(m.net.Traces)
	crack := mechanics.PlaneStrainCrack{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	elems := elasticElements(m.elements)
	ce := make([]mechanics.ContactElement, n)
	ms.groups = make([][]int, nt+len(m.conduits))
	ms.groupLength = make([]float64, len(ms.groups))
	ms.ownBlocks = map[int][]elastic.Block{}
	for i := range m.elements {
		ce[i] = mechanics.ContactElement{Element: elems[i], Group: m.group[i],
			Shear: m.tau0[i], Normal: m.sigmaN[i], Friction: m.friction}
		ms.crackStiffness[i] = crack.OpeningStiffness(m.openPatch[i])
		if m.conduitEl[i] {
			ms.conduitAperture0[i] = m.conduits[m.group[i]-nt].Aperture
		}
		ms.groups[m.group[i]] = append(ms.groups[m.group[i]], i)
		ms.groupLength[m.group[i]] += m.elements[i].Length
		ms.firstSlip[i] = math.NaN()
		ms.firstStage[i] = -1
	}
	ms.openedLength = make([]float64, len(m.conduits))
	ms.setOpeningShape()
	ms.initGrowth()
	for i := range ce {
		ce[i].Intact = !ms.opened[i]
	}
	op, err := m.operator(elems)
	if err != nil {
		return nil, err
	}
	ms.op = op
	ms.contact, err = mechanics.NewContact(op, ce, mechanics.ContactSettings{
		NearRadius: m.nearRadius(), DetachRadius: detachRadius * m.s.Numerics.ElementLength,
		FarRefresh: farRefresh * m.s.Numerics.SlipMax, ShearOnly: true, NoDerivatives: true,
		CoupleCrossings: m.s.Numerics.Crossings == "coupled"})
	if err != nil {
		return nil, err
	}
	ms.state = ms.contact.NewState()
	ms.depths = dfn.Stream(m.s.Seed, m.net.Realization, -1, "event depth")
	ms.sizeGrowing()
	ms.averageNormal()
	return ms, nil
}

// resolutionWarnings warns when the elements cannot resolve the
// nucleation of ruptures: the nucleation half-length of linear slip
// weakening, a_n = 0.579·μ*/W with W = (μs − μd)·σn′/Dc and μ* = G/(1−ν)
// (Uenishi & Rice 2003), is smallest on the fracture of largest in-situ
// effective normal stress; a patch shorter than about two elements has no
// resolved instability (common practice, no source: at least a few
// elements across the process zone), so events there follow the mesh.
func (m *model) resolutionWarnings() []Warning {
	if m.s.Numerics.Interaction == "off" {
		return nil
	}
	var eff float64
	for i := range m.elements {
		eff = math.Max(eff, m.sigmaN[i]-m.initialPressure(i))
	}
	mu := mechanics.EffectiveShearModulus(m.s.Rock.ShearModulus, m.s.Rock.PoissonRatio, mechanics.InPlane)
	an := mechanics.NucleationHalfLength(mu, m.friction.WeakeningRate(eff))
	if dx := m.s.Numerics.ElementLength; dx > an {
		return []Warning{{Kind: WarnNucleationUnresolved, Message: fmt.Sprintf(
			"numerics.element_length = %g m is longer than the nucleation half-length %.3g m of slip-weakening friction at the largest effective normal stress (%.1f MPa): the number and size of events depend on the element length; use elements of %.2g m or less, or a longer rock.slip_weakening_distance",
			dx, an, eff/1e6, an/2)}}
	}
	return nil
}

// operator builds the elastic operator of the elements: every element on
// every other (numerics.interaction = on), or each on itself alone.
func (m *model) operator(elems []elastic.Element) (elastic.Operator, error) {
	mat := elastic.Material{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	if m.s.Numerics.Interaction == "off" {
		return newIsolated(elems, mat)
	}
	op, err := elastic.New(elems, mat, elastic.Settings{Tolerance: m.s.Numerics.InteractionTolerance,
		PlaneStrain: m.s.Numerics.HeightCorrection == "off"})
	if err != nil {
		return nil, fmt.Errorf("elastic interaction of %d elements: %w", len(elems), err)
	}
	return op, nil
}

// isolated is the operator without interaction: each element's
// self-influence only.
type isolated struct{ self []elastic.Block }

func newIsolated(elems []elastic.Element, mat elastic.Material) (isolated, error) {
	o := isolated{self: make([]elastic.Block, len(elems))}
	for i, e := range elems {
		d, err := elastic.NewDense([]elastic.Element{e}, mat, elastic.Settings{})
		if err != nil {
			return isolated{}, fmt.Errorf("element %d: %w", i, err)
		}
		o.self[i] = d.At(0, 0)
	}
	return o, nil
}

func (o isolated) Len() int { return len(o.self) }

func (o isolated) At(i, j int) elastic.Block {
	if i != j {
		return elastic.Block{}
	}
	return o.self[i]
}

func (o isolated) MulVecTo(dstShear, dstNormal, slip, opening []float64) {
	for i, b := range o.self {
		dstShear[i] = b.ShearSlip*slip[i] + b.ShearOpening*opening[i]
		dstNormal[i] = b.NormalSlip*slip[i] + b.NormalOpening*opening[i]
	}
}

// apertures is the flow.ApertureFunc of a step: each element's aperture at
// its pressure under the normal stress (in-situ plus the stress shadows)
// and the slip of the last accepted step. Natural elements follow the
// closure and dilation law and open above their normal stress as their
// trace's crack (mechanics.ApertureModel); a conduit keeps its propped
// aperture while p ≤ σn and opens above it as a crack of its own size
// (Sneddon 1946).
//
// The aperture has a kink where an element opens (p = σn): its slope jumps
// from the closure law's compliance to the crack's. Where an element has
// crossed the kink since the previous iteration of the step, the slope
// returned is the chord between the two iterates, so that the iterations
// close in on the kink as a secant method does instead of jumping over it
// and back.
func (ms *mechState) apertures(p, e, dedp []float64) {
	st := ms.state
	for i := range p {
		sn := ms.crackNormal[i]
		if ms.m.conduitEl[i] {
			e[i], dedp[i] = ms.conduitAperture0[i], 0
			if net := p[i] - sn; net > 0 && ms.opened[i] {
				k := ms.crackStiffness[i]
				e[i], dedp[i] = e[i]+net/k, 1/k
			}
		} else {
			e[i], dedp[i] = ms.m.aperture.Evaluate(sn, p[i], st.Travel[i], ms.m.openPatch[i])
		}
		if ms.iterated && (p[i] > sn) != (ms.lastP[i] > sn) && p[i] != ms.lastP[i] {
			dedp[i] = (e[i] - ms.lastE[i]) / (p[i] - ms.lastP[i])
		}
	}
	copy(ms.lastP, p)
	copy(ms.lastE, e)
	ms.iterated = true
}

// restart forgets the iterates of a step (flow.StepSettings.Restart).
func (ms *mechState) restart() { ms.iterated = false }

// solve finds the slip of every element at the pressures p at the end of
// a step that started at pStart (the trial; solve again to repeat the step
// shorter). It returns the largest slip increment outside ruptures, m.
func (ms *mechState) solve(pStart, p []float64) (float64, error) {
	ms.contact.Begin(ms.state, pStart)
	res, err := ms.contact.Solve(p)
	if err != nil {
		return 0, err
	}
	return res.MaxSlip, nil
}

// commit accepts the trial of a step from t0 to t0 + dt of stage k at the
// pressures p: it records the slip, turns the step's ruptures into events,
// and loads every element with the stress change of the new slip and of
// the change of opening. It returns dst with the events appended.
func (ms *mechState) commit(t0, dt float64, k int, p []float64, dst []Event) []Event {
	m, st := ms.m, ms.state
	copy(ms.travel0, st.Travel)
	ms.openingChange(p)
	step := ms.contact.Commit(m.s.Rock.ShearModulus, ms.dw)
	ms.unloadOwnOpening()
	ms.averageNormal()
	ms.seismicMoment += step.SeismicMoment
	ms.aseismicMoment += step.AseismicMoment
	for i, d := range st.Travel {
		ms.slipping[i] = d > ms.travel0[i]
		if ms.slipping[i] && math.IsNaN(ms.firstSlip[i]) {
			ms.firstSlip[i], ms.firstStage[i] = t0+dt, k
		}
	}
	first := len(dst)
	for _, rp := range step.Ruptures {
		if ev := ms.event(rp, t0+rp.Fraction*dt, k); ev.Moment > 0 {
			dst = append(dst, ev)
		}
	}
	// The catalogue is in time order: a step's ruptures come by trace.
	slices.SortStableFunc(dst[first:], func(a, b Event) int { return cmp.Compare(a.Time, b.Time) })
	return dst
}

// event is the synthetic microseismic event of a rupture: its centre is
// the nucleation element, its depth drawn uniformly over that element's
// conducting height about the layer's mid-plane (the map-view model does
// not place the rupture within the height), its slip the area-weighted
// mean slip of the rupture, its moment M0 = G·Σ A·|Δs| (Aki 1966).
func (ms *mechState) event(rp mechanics.Rupture, t float64, k int) Event {
	m, st := ms.m, ms.state
	g := m.s.Rock.ShearModulus
	var area, m0 float64
	for _, i := range rp.Elements {
		a := m.elements[i].Length * m.elements[i].Height
		area += a
		m0 += mechanics.Moment(g, a, st.Travel[i]-ms.travel0[i])
	}
	el := m.elements[rp.Nucleation]
	c := r2.Scale(0.5, r2.Add(el.P0, el.P1))
	depth := m.s.Layer.Depth + (ms.depths.Float64()-0.5)*el.Height
	return Event{Time: t, X: c.X, Y: c.Y, Depth: depth,
		Fracture: el.Fracture, Trace: el.Trace, Stage: k,
		Slip: m0 / (g * area), Area: area, Moment: m0, Magnitude: mechanics.MomentMagnitude(m0)}
}

// openingChange sets every element's opening at the pressures p and its
// change since the last step in ms.dw: the crack's mean opening above its
// normal stress, as apertures computes it, shaped along the crack as a
// pressurised crack opens (see openingShape), so that its ends close as a
// crack's do instead of ending in a step that would load the neighbours
// with a spurious concentration.
func (ms *mechState) openingChange(p []float64) {
	for i := range p {
		w := ms.openingShape[i] * math.Max(p[i]-ms.crackNormal[i], 0) / ms.crackStiffness[i]
		ms.dw[i] = w - ms.opening[i]
		ms.opening[i] = w
	}
}

// setOpeningShape sets the shape of every crack's opening: Sneddon's
// (1946) elliptical profile of a uniformly pressurised crack,
// w(x)/w̄ = (4/π)·√(1 − (x/c)²), at each element's centre x along its
// trace or conduit of half-length c (its mean over the crack is 1).
func (ms *mechState) setOpeningShape() {
	for k, g := range ms.groups {
		length := ms.groupLength[k]
		var s float64
		for _, i := range g {
			l := ms.m.elements[i].Length
			xi := (s + l/2 - length/2) / (length / 2)
			ms.openingShape[i] = 4 / math.Pi * math.Sqrt(math.Max(1-xi*xi, 0))
			s += l
		}
	}
}

// averageNormal sets the normal stress of every element's aperture law:
// the mean, weighted by length, of the normal stress along its trace or
// conduit (the opened part of a growing one). The aperture law is a whole crack's (closure under the
// effective stress, and above it Sneddon's opening under a uniform net
// pressure with the whole crack's compliance), so it takes the crack's
// mean load: the stress shadow of a neighbour, which varies slowly along
// the crack, passes on, while the concentration at the tip of a slip
// patch, which a constant element resolves poorly and which would open a
// whole crack with its compliance, is spread over the crack.
func (ms *mechState) averageNormal() {
	st := ms.state
	for _, g := range ms.groups {
		var sum, length float64
		for _, i := range g {
			if ms.opened[i] {
				sum += ms.m.elements[i].Length * st.Normal[i]
				length += ms.m.elements[i].Length
			}
		}
		for _, i := range g {
			if ms.opened[i] {
				ms.crackNormal[i] = sum / length
			} else {
				ms.crackNormal[i] = st.Normal[i] // intact rock ahead of a tip
			}
		}
	}
}

// unloadOwnOpening takes back the stress that the opening change ms.dw
// caused on its own trace or conduit: that crack's compliance already
// holds it, and the contact problem transfers it to every element.
func (ms *mechState) unloadOwnOpening() {
	st := ms.state
	for k, g := range ms.groups {
		var blocks []elastic.Block
		for c, j := range g {
			if ms.dw[j] == 0 {
				continue
			}
			if blocks == nil {
				blocks = ms.ownInfluence(k)
			}
			for r, i := range g {
				b := &blocks[r*len(g)+c]
				st.Shear[i] -= b.ShearOpening * ms.dw[j]
				st.Normal[i] -= b.NormalOpening * ms.dw[j]
			}
		}
	}
}

// ownInfluence returns group k's influence on itself, receiver by source,
// computed once.
func (ms *mechState) ownInfluence(k int) []elastic.Block {
	if b, ok := ms.ownBlocks[k]; ok {
		return b
	}
	g := ms.groups[k]
	b := make([]elastic.Block, len(g)*len(g))
	for r, i := range g {
		for c, j := range g {
			b[r*len(g)+c] = ms.op.At(i, j)
		}
	}
	ms.ownBlocks[k] = b
	return b
}

// Event is one synthetic microseismic event: a rupture of one trace in one
// step (a sliding patch that became unstable; see mechanics.Contact).
type Event struct {
	// Time since the start of pumping, s: where in its step the patch
	// became unstable.
	Time float64
	// X, Y: centre of the element where the rupture nucleated, local
	// metres; Depth TVD, m.
	X, Y, Depth float64
	// Fracture and Trace indices in the network (−1 for a conduit).
	Fracture, Trace int
	// Stage index in the pumping order.
	Stage int
	// Slip, m (mean over the rupture); Area, m²; Moment M0 = G·Σ A·Δs,
	// N·m (Aki 1966); Magnitude Mw (Hanks & Kanamori 1979, IASPEI 2013
	// form).
	Slip, Area, Moment, Magnitude float64
}

// MaxMagnitude returns the largest moment magnitude of the events, or NaN
// when there are none.
func MaxMagnitude(events []Event) float64 {
	mw := math.NaN()
	for _, e := range events {
		if math.IsNaN(mw) || e.Magnitude > mw {
			mw = e.Magnitude
		}
	}
	return mw
}

// coulombChange returns Result.CoulombChange of the committed state in a
// reused array.
func (ms *mechState) coulombChange() []float64 {
	m, st := ms.m, ms.state
	if ms.coulomb == nil {
		ms.coulomb = make([]float64, len(m.elements))
	}
	mu := m.s.Coulomb.EffectiveFriction
	for i := range ms.coulomb {
		sense := 1.0
		if m.tau0[i] < 0 {
			sense = -1
		}
		ms.coulomb[i] = sense*(st.Shear[i]-m.tau0[i]) - mu*(st.Normal[i]-m.sigmaN[i])
	}
	return ms.coulomb
}
