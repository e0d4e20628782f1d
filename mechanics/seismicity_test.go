package mechanics

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"slipfront/internal/numtest"
)

// testSeismicity: background rate 1e−4 events/s, reference stressing rate
// 1e−3 Pa/s, Aσ = 0.05 MPa, so t_a = 5e7 s. Illustrative values.
var testSeismicity = SeismicityRate{BackgroundRate: 1e-4, StressingRate: 1e-3, ASigma: 5e4}

// exactRoundOff bounds the difference between two exact forms evaluated
// differently: a few ulps of exponentials of arguments up to ~50.
const exactRoundOff = 1e-11

// At the reference stressing rate the steady state stays put: R = r and
// N = r·t (Dieterich 1994).
func TestSeismicitySteadyState(t *testing.T) {
	m := testSeismicity
	g0 := m.SteadyState()
	g, n := m.Advance(g0, m.StressingRate, 3e8)
	numtest.Rel(t, "γ", g, g0, exactRoundOff)
	numtest.Rel(t, "N", n, m.BackgroundRate*3e8, exactRoundOff)
	numtest.Rel(t, "R", m.Rate(g), m.BackgroundRate, exactRoundOff)
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	for _, bad := range []SeismicityRate{{0, 1, 1}, {1, -1, 1}, {1, 1, math.Inf(1)}} {
		if bad.Validate() == nil {
			t.Errorf("%+v accepted", bad)
		}
	}
}

// The integrator on a stress step followed by loading at the reference
// rate reproduces Dieterich's (1994) step response
// R = r/[1 + (exp(−ΔS/Aσ) − 1)·exp(−t/t_a)], for a positive step (an
// aftershock burst), a negative one (a shadow) and none.
func TestSeismicityStepResponse(t *testing.T) {
	m := testSeismicity
	ta := m.AftershockDuration()
	for _, dS := range []float64{1e6, 2e5, -2e5, 0} {
		times := []float64{0, 0}
		stress := []float64{0, dS}
		for _, f := range []float64{1e-6, 1e-3, 0.1, 0.5, 1, 2, 5, 20} {
			times = append(times, f*ta)
			stress = append(stress, dS+m.StressingRate*f*ta)
		}
		gamma := make([]float64, len(times))
		count := make([]float64, len(times))
		if err := m.Integrate(gamma, count, StressHistory{Time: times, Stress: stress}, m.SteadyState()); err != nil {
			t.Fatal(err)
		}
		for k := 2; k < len(times); k++ {
			numtest.Rel(t, "R after step", m.Rate(gamma[k]), m.RateAfterStep(dS, times[k]), exactRoundOff)
		}
		// N(t) = ∫R dt, by Gauss–Legendre quadrature of the closed form on
		// pieces [0, 1e−14], [1e−14, 1e−13], …, [0.1, 1], [1, 20]·t_a: the
		// burst after a step decays over t_a·exp(−ΔS/Aσ) (2e−9·t_a for
		// 1 MPa), and on pieces a decade long 100 nodes reach round-off.
		quadN := quad.Fixed(func(s float64) float64 { return m.RateAfterStep(dS, s) }, 10*ta, 20*ta, 100, nil, 0)
		for e := -14; e <= 0; e++ {
			lo := 0.0
			if e > -14 {
				lo = math.Pow(10, float64(e-1)) * ta
			}
			hi := math.Pow(10, float64(e)) * ta
			quadN += quad.Fixed(func(s float64) float64 { return m.RateAfterStep(dS, s) }, lo, hi, 100, nil, 0)
		}
		quadN += quad.Fixed(func(s float64) float64 { return m.RateAfterStep(dS, s) }, ta, 10*ta, 100, nil, 0)
		numtest.Rel(t, "N = ∫R dt", count[len(count)-1], quadN, 1e-10)
	}
}

// From the steady state, a new constant stressing rate Ṡ gives
// R = r(Ṡ/τ̇_r)/[1 + (Ṡ/τ̇_r − 1)·exp(−Ṡt/Aσ)] (Dieterich 1994): faster
// (injection-like), stopped (Ṡ = 0: r/(1 + t/t_a)) and reversed loading.
func TestSeismicityRateChange(t *testing.T) {
	m := testSeismicity
	ta := m.AftershockDuration()
	for _, rate := range []float64{1e4 * m.StressingRate, 10 * m.StressingRate, 0, -m.StressingRate} {
		var quadN, prevT float64
		g := m.SteadyState()
		var n float64
		for _, f := range []float64{1e-6, 1e-4, 1e-2, 0.3, 1, 3} {
			tk := f * ta
			var dn float64
			g, dn = m.Advance(g, rate, tk-prevT)
			n += dn
			numtest.Rel(t, "R after rate change", m.Rate(g), m.RateAfterRateChange(rate, tk), exactRoundOff)
			quadN += quad.Fixed(func(s float64) float64 { return m.RateAfterRateChange(rate, s) }, prevT, tk, 200, nil, 0)
			numtest.Rel(t, "N = ∫R dt", n, quadN, 1e-10)
			prevT = tk
		}
	}
}

// A linear piece is integrated exactly, so splitting it changes nothing
// beyond round-off; a tiny rate matches the Ṡ = 0 limit (continuity of
// the (e^x − 1)/x forms).
func TestSeismicityExactPieces(t *testing.T) {
	m := testSeismicity
	const T = 2e7
	for _, rate := range []float64{0.05, 1e-3, 0, -2e-3} {
		g1, n1 := m.Advance(m.SteadyState(), rate, T)
		g, n := m.SteadyState(), 0.0
		const pieces = 1000
		for range pieces {
			var dn float64
			g, dn = m.Advance(g, rate, T/pieces)
			n += dn
		}
		const accumulated = 1e-10 // 1000 pieces of round-off
		numtest.Rel(t, "γ split", g, g1, accumulated)
		numtest.Rel(t, "N split", n, n1, accumulated)
	}
	g0, n0 := m.Advance(3*m.SteadyState(), 0, T)
	gt, nt := m.Advance(3*m.SteadyState(), 1e-14, T)
	numtest.Rel(t, "γ at Ṡ → 0", gt, g0, 1e-9)
	numtest.Rel(t, "N at Ṡ → 0", nt, n0, 1e-9)
	// A step adds no events: N = r·t_a·[ΔS/Aσ + ln(γ1/γ0)] = 0 across it.
	h := StressHistory{Time: []float64{0, 1e6, 1e6, 2e6}, Stress: []float64{0, 1e3, 5e5, 5e5 + 1e3}}
	gamma, count := make([]float64, 4), make([]float64, 4)
	if err := m.Integrate(gamma, count, h, m.SteadyState()); err != nil {
		t.Fatal(err)
	}
	if count[2] != count[1] {
		t.Errorf("the step added %g events", count[2]-count[1])
	}
	numtest.Rel(t, "γ after the step", gamma[2], gamma[1]*math.Exp(-(5e5-1e3)/m.ASigma), exactRoundOff)
}

func TestStressHistoryErrors(t *testing.T) {
	m := testSeismicity
	g, n := make([]float64, 3), make([]float64, 3)
	for _, tc := range []struct {
		name   string
		h      StressHistory
		gamma0 float64
	}{
		{"time goes back", StressHistory{Time: []float64{0, 2, 1}, Stress: []float64{0, 1, 2}}, 1},
		{"NaN stress", StressHistory{Time: []float64{0, 1, 2}, Stress: []float64{0, math.NaN(), 2}}, 1},
		{"length mismatch", StressHistory{Time: []float64{0, 1, 2}, Stress: []float64{0, 1}}, 1},
		{"empty", StressHistory{}, 1},
		{"γ0 = 0", StressHistory{Time: []float64{0, 1, 2}, Stress: []float64{0, 1, 2}}, 0},
	} {
		if err := m.Integrate(g, n, tc.h, tc.gamma0); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

// eventTime inverts the count: Advance over eventTime(n) gives back n, on
// both branches (small and large q) and for every sign of Ṡ.
func TestSeismicityEventTime(t *testing.T) {
	m := testSeismicity
	for _, tc := range []struct {
		name        string
		gamma, rate float64
		dt          float64
	}{
		{"steady", m.SteadyState(), m.StressingRate, 1e7},
		{"fast loading, large q", m.SteadyState(), 1e3, 1e4},
		{"after a burst", 1e-3 * m.SteadyState(), m.StressingRate, 1e6},
		{"stopped", m.SteadyState(), 0, 1e8},
		{"unloading", m.SteadyState(), -5e-3, 1e8},
	} {
		_, total := m.Advance(tc.gamma, tc.rate, tc.dt)
		if !(total > 0) {
			t.Fatalf("%s: no events to invert", tc.name)
		}
		for _, f := range []float64{0, 1e-6, 0.25, 0.5, 0.999, 1} {
			tau := m.eventTime(tc.gamma, tc.rate, f*total)
			_, n := m.Advance(tc.gamma, tc.rate, tau)
			numtest.Close(t, tc.name+": N(τ(n))", n, f*total, 1e-12*total, 1e-9)
		}
		numtest.Rel(t, tc.name+": τ(N)", m.eventTime(tc.gamma, tc.rate, total), tc.dt, 1e-9)
	}
}

// Sampling: over many independent intervals the number of events is
// Poisson with the expected count (mean within 5 standard errors), their
// times follow R(t) (the share in the first half of the interval within 5
// binomial standard errors of N(dt/2)/N(dt)), and every event lies in its
// interval with a magnitude in the size law's range, in time order.
func TestSeismicitySample(t *testing.T) {
	m := testSeismicity
	m.BackgroundRate = 1e-7 // about 7 events per interval below
	r := rand.New(rand.NewPCG(1, 2))
	sizes := GutenbergRichter{B: 1, Min: -1, Max: 2}
	// A burst after a 0.4 MPa step (ΔS/Aσ = 8), over three of its decay
	// times t_a·e^−8: the time law is far from uniform.
	iv := RateInterval{Start: 100, Duration: 5e4, StressingRate: 10 * m.StressingRate, Gamma: m.Step(m.SteadyState(), 4e5)}
	_, expected := m.Advance(iv.Gamma, iv.StressingRate, iv.Duration)
	_, firstHalf := m.Advance(iv.Gamma, iv.StressingRate, iv.Duration/2)
	const trials = 2000
	var events []CatalogEvent
	var total, early int
	for range trials {
		events = m.Sample(events[:0], r, iv, sizes)
		for i, e := range events {
			if e.Time < iv.Start || e.Time > iv.Start+iv.Duration {
				t.Fatalf("event at %g s outside [%g, %g]", e.Time, iv.Start, iv.Start+iv.Duration)
			}
			if e.Magnitude < sizes.Min || e.Magnitude > sizes.Max {
				t.Fatalf("magnitude %g outside the size law", e.Magnitude)
			}
			if i > 0 && e.Time < events[i-1].Time {
				t.Fatal("events out of time order")
			}
			if e.Time < iv.Start+iv.Duration/2 {
				early++
			}
		}
		total += len(events)
	}
	if total < 1000 {
		t.Fatalf("only %d events sampled: the checks below would be weak", total)
	}
	mean := float64(total) / trials
	numtest.Abs(t, "events per interval", mean, expected, 5*math.Sqrt(expected/trials))
	p := firstHalf / expected
	numtest.Abs(t, "share in the first half", float64(early)/float64(total), p, 5*math.Sqrt(p*(1-p)/float64(total)))
	// Same seed, same catalogue.
	a := m.Sample(nil, rand.New(rand.NewPCG(7, 8)), iv, sizes)
	b := m.Sample(nil, rand.New(rand.NewPCG(7, 8)), iv, sizes)
	if len(a) != len(b) || (len(a) > 0 && a[0] != b[0]) {
		t.Error("sampling is not reproducible")
	}
	if got := m.Sample(nil, r, RateInterval{Gamma: m.SteadyState(), StressingRate: 1}, sizes); len(got) != 0 {
		t.Errorf("%d events in an empty interval", len(got))
	}
}
