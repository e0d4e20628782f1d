package sim

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/mechanics"
)

// rateModel runs the seismicity-rate model of Dieterich (1994)
// (mechanics.SeismicityRate) on every natural fracture element: each
// element carries a population of faults too small to mesh, with the
// background rate of the scenario's [seismicity_rate] per unit of its
// surface (length × conducting height), driven by its own Coulomb stress
//
//	S = s·Δτ − μ′·(Δσn − Δp)
//
// (its ΔCFS from all slip and opening, mechState.coulombChange, with the
// pore-pressure change, King, Stein & Lin 1994's μ′ = coulomb.
// effective_friction) plus the background stressing. Over every accepted
// step the stressing rate is taken constant, the state advanced exactly
// and the step's events drawn (Poisson number, times by inverting the
// expected count, Gutenberg–Richter magnitudes; mechanics.SeismicityRate.
// Sample) from a stream seeded by the scenario's seed, the realization and
// the purpose, so a run repeats exactly. Before pumping every population
// rests at the background steady state.
type rateModel struct {
	base    mechanics.SeismicityRate // BackgroundRate per m² of fracture surface
	sizes   mechanics.GutenbergRichter
	rng     *rand.Rand
	gamma   []float64 // per element: the state, s/Pa (NaN for conduits)
	stress  []float64 // per element: S at the end of the last step, Pa
	pStart  []float64 // per element: the pore pressure before pumping, Pa
	dropped bool      // a step's ΔS so large that the rate overflowed
}

// secondsPerYear is the Julian year, s (the unit of the background rate).
const secondsPerYear = 365.25 * 86400

// newRateModel returns the rate model of the run, or nil without a
// [seismicity_rate] table.
func newRateModel(m *model) *rateModel {
	sr := m.s.SeismicityRate
	if !sr.Active() {
		return nil
	}
	n := len(m.elements)
	rm := &rateModel{
		base: mechanics.SeismicityRate{BackgroundRate: sr.BackgroundRate / 1e6 / secondsPerYear,
			StressingRate: sr.BackgroundStressingRate, ASigma: sr.ASigma},
		sizes:  mechanics.GutenbergRichter{B: sr.BValue, Min: sr.MinMagnitude, Max: sr.MaxMagnitude},
		rng:    dfn.Stream(m.s.Seed, m.net.Realization, -1, "seismicity rate"),
		gamma:  make([]float64, n),
		stress: make([]float64, n),
		pStart: make([]float64, n),
	}
	for i, el := range m.elements {
		rm.gamma[i] = rm.base.SteadyState()
		if el.Set == ConduitSet {
			rm.gamma[i] = math.NaN()
		}
		rm.pStart[i] = m.initialPressure(i)
	}
	return rm
}

// step advances every population over the accepted step from t0 to
// t0 + dt of stage k, at whose end the pressures are p and the elements'
// Coulomb stress changes coulomb, appends the step's events to dst and
// returns them with the expected number of events of the step.
func (rm *rateModel) step(m *model, t0, dt float64, k int, p, coulomb []float64, dst []Event) ([]Event, float64) {
	mu := m.s.Coulomb.EffectiveFriction
	first := len(dst)
	var expected float64
	var drawn []mechanics.CatalogEvent
	for i, el := range m.elements {
		if math.IsNaN(rm.gamma[i]) {
			continue
		}
		s := coulomb[i] + mu*(p[i]-rm.pStart[i])
		rate := (s-rm.stress[i])/dt + rm.base.StressingRate
		rm.stress[i] = s
		pop := rm.base
		pop.BackgroundRate *= el.Length * el.Height
		iv := mechanics.RateInterval{Start: t0, Duration: dt, StressingRate: rate, Gamma: rm.gamma[i]}
		g, n := pop.Advance(rm.gamma[i], rate, dt)
		if !(g > 0) || math.IsInf(n, 0) || math.IsNaN(n) {
			// ΔS of hundreds of Aσ in one step: the rate is beyond any
			// count; the population is spent and restarts at rest.
			rm.dropped = true
			rm.gamma[i] = rm.base.SteadyState()
			continue
		}
		expected += n
		drawn = pop.Sample(drawn[:0], rm.rng, iv, rm.sizes)
		rm.gamma[i] = g
		c := r2.Scale(0.5, r2.Add(el.P0, el.P1))
		for _, ev := range drawn {
			m0 := mechanics.MomentFromMagnitude(ev.Magnitude)
			dst = append(dst, Event{Time: ev.Time, X: c.X, Y: c.Y,
				Depth:    m.s.Layer.Depth + (rm.rng.Float64()-0.5)*el.Height,
				Fracture: el.Fracture, Trace: el.Trace, Stage: k,
				Slip: math.NaN(), Area: math.NaN(), Moment: m0, Magnitude: ev.Magnitude})
		}
	}
	slices.SortStableFunc(dst[first:], func(a, b Event) int { return cmp.Compare(a.Time, b.Time) })
	return dst, expected
}
