package mechanics

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// SeismicityRate is the seismicity-rate model of Dieterich (1994): a
// population of faults that nucleate earthquakes under rate-and-state
// friction, loaded by a Coulomb stress history S(t). Its state variable γ,
// s/Pa, evolves as
//
//	dγ = (dt − γ·dS)/(Aσ),
//
// and the rate of earthquakes is
//
//	R = r/(γ·τ̇_r),
//
// where r is the background rate under the reference stressing rate τ̇_r,
// at which γ rests at its steady state 1/τ̇_r, and Aσ is the direct-effect
// parameter A of rate-and-state friction times the effective normal
// stress. The solutions used here, all exact:
//
//   - A stress step ΔS multiplies γ by exp(−ΔS/(Aσ)); after a step at the
//     background rate, R(t) = r/[1 + (exp(−ΔS/(Aσ)) − 1)·exp(−t/t_a)]
//     with the aftershock duration t_a = Aσ/τ̇_r ([SeismicityRate.RateAfterStep]).
//   - At a constant stressing rate Ṡ, with x = Ṡ·t/(Aσ),
//     γ(t) = γ0·e^(−x) + (1 − e^(−x))/Ṡ (γ0 + t/(Aσ) when Ṡ = 0); from the
//     steady state this is R(t) = r·(Ṡ/τ̇_r)/[1 + (Ṡ/τ̇_r − 1)·e^(−x)]
//     ([SeismicityRate.RateAfterRateChange]).
//   - The expected number of events, N = ∫R dt, follows from dividing the
//     evolution law by γ: ∫dt/γ = Aσ·ln(γ(t)/γ0) + ΔS, so over any
//     stressing history N = r·t_a·[ΔS/(Aσ) + ln(γ(t)/γ0)], and over a
//     constant-rate interval N = r·t_a·ln(1 + (e^x − 1)/(Ṡ·γ0)).
//
// The equation numbers of Dieterich (1994) were not checked; the forms
// above were derived again from the evolution law and are tested against
// each other and against quadrature.
type SeismicityRate struct {
	BackgroundRate float64 // r, events/s under the reference stressing rate, > 0
	StressingRate  float64 // τ̇_r, reference (background) Coulomb stressing rate, Pa/s, > 0
	ASigma         float64 // Aσ, rate-and-state A times the effective normal stress, Pa, > 0
}

// Validate returns an error unless r, τ̇_r and Aσ are finite and > 0.
func (m SeismicityRate) Validate() error {
	return firstError(
		positive("background_rate", m.BackgroundRate),
		positive("background_stressing_rate", m.StressingRate),
		positive("a_sigma", m.ASigma),
	)
}

// SteadyState returns γ = 1/τ̇_r, s/Pa, the state of a population that has
// been loaded at the reference stressing rate for long: its rate is r.
func (m SeismicityRate) SteadyState() float64 { return 1 / m.StressingRate }

// AftershockDuration returns t_a = Aσ/τ̇_r, s: the time over which the rate
// relaxes after a step (Dieterich 1994).
func (m SeismicityRate) AftershockDuration() float64 { return m.ASigma / m.StressingRate }

// Rate returns the seismicity rate R = r/(γ·τ̇_r), events/s, at state γ.
func (m SeismicityRate) Rate(gamma float64) float64 {
	return m.BackgroundRate / (gamma * m.StressingRate)
}

// Step returns the state after a Coulomb stress step dS, Pa:
// γ·exp(−ΔS/(Aσ)). A step adds no events by itself; it changes the rate
// that follows. Steps above about 700·Aσ underflow γ to 0 (infinite rate).
func (m SeismicityRate) Step(gamma, dS float64) float64 {
	return gamma * math.Exp(-dS/m.ASigma)
}

// Advance integrates the state over dt, s, at the constant Coulomb
// stressing rate stressingRate, Pa/s (any sign, or 0), from gamma, and
// returns the state at the end and the expected number of events in the
// interval. It is exact: with x = Ṡ·dt/(Aσ),
//
//	γ1 = γ0·e^(−x) + (dt/(Aσ))·(1 − e^(−x))/x
//	N  = r·t_a·ln(1 + (dt/(Aσγ0))·(e^x − 1)/x)             (x ≤ 0)
//	N  = r·t_a·[x + ln(e^(−x) + (1 − e^(−x))/(Ṡγ0))]        (x > 0)
//
// the two forms of N being equal, each chosen where it cannot overflow;
// (e^x − 1)/x is 1 at x = 0, so Ṡ = 0 needs no special case. For x > 0
// the logarithm, ln(γ1/γ0), is taken of a sum of positive terms, or as
// ln(1 + y) with y = (1/(Ṡγ0) − 1)·(1 − e^(−x)) where γ1/γ0 is near 1.
func (m SeismicityRate) Advance(gamma, stressingRate, dt float64) (gammaEnd, count float64) {
	x := stressingRate * dt / m.ASigma
	gammaEnd = gamma*math.Exp(-x) + dt/m.ASigma*expm1x(-x)
	var q float64
	if x <= 0 {
		q = math.Log1p(dt / (m.ASigma * gamma) * expm1x(x))
	} else {
		c, decay := 1/(stressingRate*gamma), -math.Expm1(-x)
		if ratio := math.Exp(-x) + c*decay; ratio < 0.5 || ratio > 2 {
			q = x + math.Log(ratio)
		} else {
			q = x + math.Log1p((c-1)*decay)
		}
	}
	return gammaEnd, m.BackgroundRate * m.AftershockDuration() * q
}

// eventTime returns the time after the start of a constant-rate interval,
// s, at which the expected count reaches n: the inverse of Advance's N,
//
//	τ = (Aσ/Ṡ)·ln(1 + Ṡγ0·(e^q − 1)),  q = n/(r·t_a),
//
// written as Aσγ0·(e^q − 1)·ln(1 + y)/y with y = Ṡγ0·(e^q − 1), which holds
// at Ṡ = 0 too, or, where y > 1 or e^q would overflow, as
// (Aσ/Ṡ)·[q + ln(e^(−q) − Ṡγ0·(e^(−q) − 1))].
func (m SeismicityRate) eventTime(gamma, stressingRate, n float64) float64 {
	q := n / (m.BackgroundRate * m.AftershockDuration())
	if stressingRate > 0 && (q > 700 || stressingRate*gamma*math.Expm1(q) > 1) {
		return m.ASigma / stressingRate * (q + math.Log(math.Exp(-q)-stressingRate*gamma*math.Expm1(-q)))
	}
	em := math.Expm1(q)
	return m.ASigma * gamma * em * log1pRatio(stressingRate*gamma*em)
}

// expm1x returns (e^x − 1)/x, 1 at x = 0.
func expm1x(x float64) float64 {
	if x == 0 {
		return 1
	}
	return math.Expm1(x) / x
}

// log1pRatio returns ln(1 + y)/y, 1 at y = 0.
func log1pRatio(y float64) float64 {
	if y == 0 {
		return 1
	}
	return math.Log1p(y) / y
}

// RateAfterStep returns the closed-form rate R(t), events/s, a time t, s,
// after a Coulomb stress step dS, Pa, applied to a population at steady
// state that keeps being loaded at the reference rate (Dieterich 1994):
//
//	R(t) = r / [1 + (exp(−ΔS/(Aσ)) − 1)·exp(−t/t_a)],
//
// evaluated as r/[1 − exp(−t/t_a) + exp(−ΔS/(Aσ) − t/t_a)], a sum of
// positive terms that keeps its precision early after a large step.
func (m SeismicityRate) RateAfterStep(dS, t float64) float64 {
	ta := m.AftershockDuration()
	return m.BackgroundRate / (-math.Expm1(-t/ta) + math.Exp(-dS/m.ASigma-t/ta))
}

// RateAfterRateChange returns the closed-form rate R(t), events/s, a time
// t, s, after the stressing rate of a population at steady state changes
// from τ̇_r to stressingRate, Pa/s (Dieterich 1994): with Ṡ the new rate,
//
//	R(t) = r·(Ṡ/τ̇_r) / [1 + (Ṡ/τ̇_r − 1)·exp(−Ṡ·t/(Aσ))],
//
// and r/(1 + t/t_a) for Ṡ = 0.
func (m SeismicityRate) RateAfterRateChange(stressingRate, t float64) float64 {
	if stressingRate == 0 {
		return m.BackgroundRate / (1 + t/m.AftershockDuration())
	}
	k := stressingRate / m.StressingRate
	return m.BackgroundRate * k / (1 + (k-1)*math.Exp(-stressingRate*t/m.ASigma))
}

// StressHistory is a piecewise-linear Coulomb stress history: the stress
// varies linearly between consecutive knots, and two knots at the same
// time make a step.
type StressHistory struct {
	Time   []float64 // s, non-decreasing
	Stress []float64 // Coulomb stress S = τ − μ(σn − p), Pa
}

// Validate returns an error unless the history has at least one knot, as
// many stresses as times, finite values and non-decreasing times.
func (h StressHistory) Validate() error {
	if len(h.Time) == 0 || len(h.Time) != len(h.Stress) {
		return &InputError{Name: "stress history knots", Value: float64(len(h.Time)),
			Want: fmt.Sprintf("must be at least 1, with as many stresses (%d)", len(h.Stress))}
	}
	for k := range h.Time {
		if err := firstError(finite(fmt.Sprintf("stress history time[%d]", k), h.Time[k]),
			finite(fmt.Sprintf("stress history stress[%d]", k), h.Stress[k])); err != nil {
			return err
		}
		if k > 0 && h.Time[k] < h.Time[k-1] {
			return &InputError{Name: fmt.Sprintf("stress history time[%d]", k), Value: h.Time[k],
				Want: fmt.Sprintf("must be ≥ time[%d] = %g", k-1, h.Time[k-1])}
		}
	}
	return nil
}

// Integrate integrates the model over the piecewise-linear history h from
// the state gamma0 at h.Time[0], exactly on every piece ([SeismicityRate.Advance]
// on a linear piece, [SeismicityRate.Step] on a step), and writes the state
// and the expected cumulative number of events at every knot into gamma
// and count (count[0] = 0). It returns an error for an invalid history or
// a γ0 that is not finite and > 0, and panics if gamma or count is not as
// long as the history.
func (m SeismicityRate) Integrate(gamma, count []float64, h StressHistory, gamma0 float64) error {
	if err := firstError(h.Validate(), positive("initial seismicity state", gamma0)); err != nil {
		return err
	}
	if len(gamma) != len(h.Time) || len(count) != len(h.Time) {
		panic("mechanics: seismicity destination length mismatch")
	}
	gamma[0], count[0] = gamma0, 0
	for k := 1; k < len(h.Time); k++ {
		dt, dS := h.Time[k]-h.Time[k-1], h.Stress[k]-h.Stress[k-1]
		if dt == 0 {
			gamma[k], count[k] = m.Step(gamma[k-1], dS), count[k-1]
			continue
		}
		g, n := m.Advance(gamma[k-1], dS/dt, dt)
		gamma[k], count[k] = g, count[k-1]+n
	}
	return nil
}

// CatalogEvent is one event of a synthetic catalogue.
type CatalogEvent struct {
	Time      float64 // s
	Magnitude float64 // moment magnitude Mw
}

// RateInterval is one interval of constant Coulomb stressing rate.
type RateInterval struct {
	Start         float64 // s
	Duration      float64 // s, ≥ 0
	StressingRate float64 // Ṡ over the interval, Pa/s
	Gamma         float64 // state γ at Start, s/Pa
}

// Sample draws the events of one interval and appends them to dst in time
// order: their number is Poisson with the expected count N of
// [SeismicityRate.Advance], their times are independent with density
// R(t)/N (drawn by inverting the count, exact), and their magnitudes come
// from sizes. Sub-resolution seismicity (events on faults too small to
// mesh) is modelled this way; the caller advances the state with Advance.
// The draws depend only on r, so a stream seeded per realization and
// purpose gives the same catalogue on every run.
func (m SeismicityRate) Sample(dst []CatalogEvent, r *rand.Rand, iv RateInterval, sizes GutenbergRichter) []CatalogEvent {
	_, n := m.Advance(iv.Gamma, iv.StressingRate, iv.Duration)
	if !(n > 0) {
		return dst
	}
	k := int(distuv.Poisson{Lambda: n, Src: r}.Rand())
	first := len(dst)
	for range k {
		tau := m.eventTime(iv.Gamma, iv.StressingRate, r.Float64()*n)
		dst = append(dst, CatalogEvent{Time: iv.Start + math.Min(tau, iv.Duration), Magnitude: sizes.Rand(r)})
	}
	slices.SortFunc(dst[first:], func(a, b CatalogEvent) int { return cmp.Compare(a.Time, b.Time) })
	return dst
}
