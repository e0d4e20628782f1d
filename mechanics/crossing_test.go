package mechanics

import (
	"errors"
	"math"
	"testing"

	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
)

// criticalParallel returns the smallest effective parallel stress S∥ − p0
// (Pa) at which a crosses, with its other fields fixed, by bisection on
// [S⊥ − p0, 100·(S⊥ − p0 + T0)] (the hydraulic fracture grows along the
// larger horizontal stress); ok is false when it does not cross even at
// the upper end. The test fails if a crosses already at S∥ = S⊥, where
// no critical value can be found.
func criticalParallel(t *testing.T, a Approach) (float64, bool) {
	t.Helper()
	lo, hi := a.NormalStress-a.PorePressure, 100*(a.NormalStress-a.PorePressure+a.TensileStrength)
	at := func(s float64) bool { b := a; b.ParallelStress = a.PorePressure + s; return b.Crosses() }
	if at(lo) {
		t.Fatalf("crosses already at S∥ = S⊥: %+v", a)
	}
	if !at(hi) {
		return hi, false
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		if at(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, true
}

// At a right angle the formulation is Renshaw & Pollard's (1995)
// criterion −σxx/(T0 − σyy) > (0.35 + 0.35/μ)/1.06, whose constants are
// exactly √2/4 and 3√2/4 of the mode-I near-tip field at θ = ±90° (Irwin
// 1957): the critical ratio is (1 + 1/μ)/3, within 1% of the printed,
// rounded one.
func TestCrossingOrthogonal(t *testing.T) {
	const bisection = 1e-9 // relative; 200 halvings leave far less
	rows := 0
	for _, mu := range []float64{0.3, 0.6, 1.0} {
		printed := (0.35 + 0.35/mu) / 1.06
		numtest.Rel(t, "exact vs printed Renshaw–Pollard ratio", OrthogonalCrossingRatio(mu), printed, 0.01)
		// T0 large enough that (S⊥ − p0)/(T0 + S⊥ − p0) ≤ 0.6 stays below
		// the critical ratio (0.667 at μ = 1), so S∥ = S⊥ does not cross.
		for _, tc := range []struct{ sh, t0 float64 }{{50e6, 15e6}, {45e6, 10e6}, {70e6, 30e6}} {
			a := Approach{Angle: math.Pi / 2, NormalStress: tc.sh, PorePressure: 30e6, TensileStrength: tc.t0, Friction: mu}
			crit, ok := criticalParallel(t, a)
			if !ok {
				t.Fatalf("μ = %g: never crosses", mu)
			}
			ratio := crit / (tc.t0 + tc.sh - a.PorePressure)
			numtest.Rel(t, "critical −σxx/(T0 − σyy)", ratio, OrthogonalCrossingRatio(mu), bisection)
			rows++
		}
	}
	if rows != 9 {
		t.Fatalf("checked %d rows, want 9", rows)
	}
}

// Outcome rows at a right angle with μ = 0.6 (critical ratio 8/9 by
// Renshaw & Pollard 1995), p0 = 30 MPa, S⊥ = 45 MPa, T0 = 5 MPa:
// S∥ − p0 over T0 + S⊥ − p0 = 20 MPa decides crossing; otherwise the
// fluid pressure against the normal stress on the natural fracture (S∥ at
// 90°) decides between diversion and arrest.
func TestCrossingOutcomes(t *testing.T) {
	base := Approach{Angle: math.Pi / 2, NormalStress: 45e6, PorePressure: 30e6, TensileStrength: 5e6, Friction: 0.6}
	for _, tc := range []struct {
		name     string
		parallel float64
		fluid    float64
		want     Crossing
	}{
		{"ratio 1.00 > 8/9: cross", 50e6, 46e6, Cross},
		{"ratio 0.90 > 8/9: cross", 48e6, 46e6, Cross},
		{"ratio 0.85 < 8/9, fluid below σn: arrest", 47e6, 46e6, Arrest},
		{"ratio 0.85 < 8/9, fluid above σn: divert", 47e6, 47.5e6, Divert},
		{"fluid exactly at σn: divert", 47e6, 47e6, Divert},
	} {
		a := base
		a.ParallelStress, a.FluidPressure = tc.parallel, tc.fluid
		got, err := a.Decide()
		if err != nil {
			t.Fatal(err)
		}
		if got != tc.want {
			t.Errorf("%s: %v, want %v", tc.name, got, tc.want)
		}
	}
}

// The shallower the approach, the larger the stress contrast the
// hydraulic fracture needs to cross (the finding of Gu et al. 2012, from
// memory): the critical S∥ − p0 rises as β falls from 90°, and from some
// angle on it does not cross at any contrast tried.
func TestCrossingAngle(t *testing.T) {
	const deg = math.Pi / 180
	a := Approach{NormalStress: 45e6, PorePressure: 30e6, TensileStrength: 2e6, Friction: 0.6}
	prev := 0.0
	crossed := 0
	for _, beta := range []float64{90, 80, 70, 60, 50} {
		a.Angle = beta * deg
		crit, ok := criticalParallel(t, a)
		if !ok {
			break
		}
		if crit <= prev {
			t.Errorf("β = %g°: critical S∥ − p0 = %.4g MPa, not above %.4g MPa at the steeper angle", beta, crit/1e6, prev/1e6)
		}
		prev = crit
		crossed++
	}
	if crossed < 3 {
		t.Fatalf("crossed at only %d angles; the test needs at least 3 to check the trend", crossed)
	}
	a.Angle = 15 * deg
	if _, ok := criticalParallel(t, a); ok {
		t.Errorf("β = 15°: crosses; a natural fracture met at a low angle slips first")
	}
}

// A rougher (higher μ) or cohesive natural fracture is crossed at a lower
// stress contrast (Renshaw & Pollard 1995: the ratio falls with μ).
func TestCrossingFrictionCohesion(t *testing.T) {
	const deg = math.Pi / 180
	for _, beta := range []float64{90, 70} {
		a := Approach{Angle: beta * deg, NormalStress: 45e6, PorePressure: 30e6, TensileStrength: 10e6}
		crit := func(mu, s0 float64) float64 {
			b := a
			b.Friction, b.Cohesion = mu, s0
			c, ok := criticalParallel(t, b)
			if !ok {
				t.Fatalf("β = %g°, μ = %g, S0 = %g: never crosses", beta, mu, s0)
			}
			return c
		}
		if lo, hi := crit(0.9, 0), crit(0.5, 0); !(lo < hi) {
			t.Errorf("β = %g°: μ = 0.9 needs %.4g MPa, μ = 0.5 %.4g MPa; want less for the rougher", beta, lo/1e6, hi/1e6)
		}
		if lo, hi := crit(0.6, 2e6), crit(0.6, 0); !(lo < hi) {
			t.Errorf("β = %g°: S0 = 2 MPa needs %.4g MPa, none %.4g MPa; want less with cohesion", beta, lo/1e6, hi/1e6)
		}
	}
}

// A natural fracture that already slips under the remote stresses is
// never crossed: τ ≥ μσn′ on it before the tip arrives.
func TestCrossingCriticallyStressed(t *testing.T) {
	const deg = math.Pi / 180
	// At 30° to SHmax: σn′ = 100 sin²30 + 10 cos²30 = 32.5 MPa, τ = 90 sin30 cos30 = 39.0 MPa > 0.6·32.5.
	a := Approach{Angle: 30 * deg, ParallelStress: 130e6, NormalStress: 40e6, PorePressure: 30e6, TensileStrength: 1e6, Friction: 0.6}
	if a.Crosses() {
		t.Error("crossed a natural fracture that slips under the remote stresses")
	}
}

func TestCrossingValidate(t *testing.T) {
	good := Approach{Angle: 1, ParallelStress: 50e6, NormalStress: 40e6, PorePressure: 30e6, FluidPressure: 41e6, TensileStrength: 1e6, Friction: 0.6}
	if err := good.Validate(); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		edit func(*Approach)
	}{
		{"angle 0", func(a *Approach) { a.Angle = 0 }},
		{"angle above π/2", func(a *Approach) { a.Angle = 2 }},
		{"NaN stress", func(a *Approach) { a.NormalStress = math.NaN() }},
		{"negative T0", func(a *Approach) { a.TensileStrength = -1 }},
		{"zero friction", func(a *Approach) { a.Friction = 0 }},
		{"negative cohesion", func(a *Approach) { a.Cohesion = -1 }},
	} {
		a := good
		tc.edit(&a)
		_, err := a.Decide()
		if !errors.Is(err, badinput.Err) {
			t.Errorf("%s: error %v, want bad input", tc.name, err)
		}
	}
	if got := Crossing(7).String(); got != "Crossing(7)" {
		t.Errorf("unknown outcome prints %q", got)
	}
}
