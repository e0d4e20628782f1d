package sim

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/mechanics"
)

// mechState is the mechanical state of every element: the values at the
// end of the last accepted step (slip, tau), and the trial of the step
// being iterated.
type mechState struct {
	m *model
	// Accumulated slip, m, and current shear stress, Pa.
	slip, tau []float64
	// The trial of the current step, and whether an element slipped in any
	// iteration of it.
	trialSlip, trialTau []float64
	// dslip is ∂D/∂p of each element's own pressure on its patch's trial
	// slip, m/Pa (0 outside patches).
	dslip   []float64
	latched []bool
	patches []patch
	// Propped aperture, m, and opening stiffness, Pa/m, of conduit elements
	// (0 for natural elements).
	conduitAperture0, conduitStiffness []float64
	// First slip time, s (NaN if never), and the stage index it happened in.
	firstSlip  []float64
	firstStage []int
}

// patch is a run of contiguous slipping elements of one trace in a step.
type patch struct {
	trace, first, end int
	slip, area        float64
}

func newMechState(m *model) *mechState {
	n := len(m.elements)
	ms := &mechState{m: m,
		slip: make([]float64, n), tau: append([]float64(nil), m.tau0...),
		trialSlip: make([]float64, n), trialTau: make([]float64, n), dslip: make([]float64, n),
		latched: make([]bool, n), conduitAperture0: make([]float64, n), conduitStiffness: make([]float64, n),
		firstSlip: make([]float64, n), firstStage: make([]int, n),
	}
	nt := len(m.net.Traces)
	crack := mechanics.PlaneStrainCrack{ShearModulus: m.s.Rock.ShearModulus, PoissonRatio: m.s.Rock.PoissonRatio}
	for i, el := range m.mesh.Elements {
		if el.Path >= nt {
			c := m.conduits[el.Path-nt]
			ms.conduitAperture0[i] = c.Aperture
			ms.conduitStiffness[i] = crack.OpeningStiffness(mechanics.Patch{Length: r2.Norm(r2.Sub(c.P1, c.P0)), Height: c.Height})
		}
		ms.firstSlip[i] = math.NaN()
		ms.firstStage[i] = -1
	}
	return ms
}

// beginStep forgets the latches of the previous step or of a discarded
// attempt at this one.
func (ms *mechState) beginStep() { clear(ms.latched) }

// apertures is the flow.ApertureFunc of the coupled step: slip at the
// pressures p, then apertures from the effective normal stress and the
// trial slip. The derivative includes, besides the fracture's normal
// compliance, how an element's own pressure changes its patch's slip and
// so its dilation (∂e/∂D · ∂D/∂p): the storage of the linearised step then
// sees the pore volume that slip opens, which keeps the iterations from
// swinging where dilation is strong. (The coupling through the other
// elements of a patch is left out: it would fill the matrix.)
func (ms *mechState) apertures(p, e, dedp []float64) {
	ms.trialSlipAt(p)
	ap := ms.m.aperture
	for i := range p {
		if ms.m.conduitEl[i] {
			e[i], dedp[i] = ms.conduitAperture(i, p[i])
			continue
		}
		sn := ms.m.sigmaN[i]
		e[i], dedp[i] = ap.Evaluate(sn, p[i], ms.trialSlip[i], ms.m.openPatch[i])
		if ms.dslip[i] != 0 {
			dedp[i] += ap.SlipDerivative(sn, p[i], ms.trialSlip[i]) * ms.dslip[i]
		}
	}
}

// conduitAperture returns the aperture of conduit element i at pressure p
// and its derivative: a primary conduit is a propped vertical fracture
// striking along SHmax, so its normal stress is Shmin; it keeps its propped
// aperture while p ≤ Shmin and opens above it as a 2-D crack of half-size
// min(length, height)/2 under the net pressure p − Shmin (Sneddon 1946).
func (ms *mechState) conduitAperture(i int, p float64) (e, dedp float64) {
	net := p - ms.m.shmin
	if net <= 0 {
		return ms.conduitAperture0[i], 0
	}
	k := ms.conduitStiffness[i]
	return ms.conduitAperture0[i] + net/k, 1 / k
}

// trialSlipAt finds the slipping patches at pressures p and their slip.
func (ms *mechState) trialSlipAt(p []float64) {
	m := ms.m
	sm := m.slip
	copy(ms.trialSlip, ms.slip)
	copy(ms.trialTau, ms.tau)
	clear(ms.dslip)
	ms.patches = ms.patches[:0]
	slips := func(i int) bool {
		return ms.latched[i] || sm.Criterion.Slips(m.sigmaN[i], ms.tau[i], p[i])
	}
	for trace, run := range m.runs {
		for i := run[0]; i >= 0 && i < run[1]; {
			if !slips(i) {
				i++
				continue
			}
			var drop, length float64
			j := i
			for ; j < run[1] && slips(j); j++ {
				ms.latched[j] = true
				residual := sm.ResidualFriction * math.Max(m.sigmaN[j]-p[j], 0)
				drop += math.Max(ms.tau[j]-residual, 0) * m.elements[j].Length
				length += m.elements[j].Length
				ms.trialTau[j] = math.Min(ms.tau[j], residual)
			}
			h := m.elements[i].Height
			k := sm.Stiffness.ShearStiffness(mechanics.Patch{Length: length, Height: h})
			d := drop / length / k
			for q := i; q < j; q++ {
				ms.trialSlip[q] += d
				// drop_q = τ_q − μd (σn_q − p_q) grows with p_q while the
				// element is closed and above its residual strength.
				if m.sigmaN[q] > p[q] && ms.tau[q] > sm.ResidualFriction*(m.sigmaN[q]-p[q]) {
					ms.dslip[q] = sm.ResidualFriction * m.elements[q].Length / (length * k)
				}
			}
			ms.patches = append(ms.patches, patch{trace: trace, first: i, end: j, slip: d, area: length * h})
			i = j
		}
	}
}

// maxNewSlip returns the largest slip of a trial patch, m.
func (ms *mechState) maxNewSlip() float64 {
	var d float64
	for _, pt := range ms.patches {
		d = math.Max(d, pt.slip)
	}
	return d
}

// commit accepts the trial at time t of stage k and returns the events:
// one per patch that slipped.
func (ms *mechState) commit(t float64, k int, dst []Event) []Event {
	m := ms.m
	for _, pt := range ms.patches {
		if !(pt.slip > 0) {
			continue
		}
		var c r2.Vec
		var length float64
		for i := pt.first; i < pt.end; i++ {
			el := &m.elements[i]
			c = r2.Add(c, r2.Scale(el.Length, r2.Scale(0.5, r2.Add(el.P0, el.P1))))
			length += el.Length
			if math.IsNaN(ms.firstSlip[i]) {
				ms.firstSlip[i], ms.firstStage[i] = t, k
			}
		}
		c = r2.Scale(1/length, c)
		m0 := mechanics.Moment(m.s.Rock.ShearModulus, pt.area, pt.slip)
		dst = append(dst, Event{
			Time: t, X: c.X, Y: c.Y, Depth: m.s.Layer.Depth,
			Fracture: m.net.Traces[pt.trace].Fracture, Trace: pt.trace, Stage: k,
			Slip: pt.slip, Area: pt.area, Moment: m0, Magnitude: mechanics.MomentMagnitude(m0),
		})
	}
	copy(ms.slip, ms.trialSlip)
	copy(ms.tau, ms.trialTau)
	return dst
}

// Event is one synthetic microseismic event: a patch that slipped in one
// step.
type Event struct {
	// Time since the start of pumping, s.
	Time float64
	// X, Y: length-weighted centre of the patch, local metres; Depth TVD, m.
	X, Y, Depth float64
	// Fracture and Trace indices in the network.
	Fracture, Trace int
	// Stage index in the pumping order.
	Stage int
	// Slip, m; Area, m²; Moment M0 = G·A·D, N·m (Aki 1966); Magnitude Mw
	// (Hanks & Kanamori 1979, IASPEI 2013 form).
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
