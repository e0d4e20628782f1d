package sim

import (
	"math"
	"testing"

	"slipfront/internal/hfref"
	"slipfront/scenarios"
)

// Between the two limits (1 < 𝒦 < 4) no similarity solution is in
// internal/hfref, so the transition is checked by what holds for any
// fracture that spends energy both in viscous flow and in breaking rock
// (Detournay 2004, from memory: the solution moves monotonically from the
// M-vertex to the K-vertex as 𝒦 grows): at fixed viscosity, rate and time
// a tougher rock gives a fracture no longer and a net pressure at the well
// no lower, and its length stays below both limits' lengths (within the
// lead of 2.5 elements + 1 % that TestGrowthViscosityDominated measures
// for the M-vertex). testdata/kgd-viscosity, 60 s on 1 m elements, with
// the toughness set for 𝒦 = 0, 1.5, 2.5, 3.5 and 6.
func TestGrowthTransitionRegime(t *testing.T) {
	const duration, element = 60.0, 1.0
	kgd, scale := kgdViscosityCase(t)
	lm := kgd.ViscosityDominated(duration).HalfLength
	prevLength, prevPressure := math.Inf(1), math.Inf(-1)
	for _, dimless := range []float64{0, 1.5, 2.5, 3.5, 6} {
		kic := dimless * scale
		s := loadCase(t, "kgd-viscosity", "rock.fracture_toughness="+ftoa(kic/1e6)+" MPa.m^0.5",
			"numerics.element_length="+ftoa(element)+" m", "schedule.duration="+ftoa(duration)+" s")
		kgd.Toughness = s.Rock.FractureToughness
		res, length, net := runTransition(t, s, kgd, dimless)
		bound := lm
		if dimless > 0 {
			bound = math.Min(bound, kgd.ToughnessDominated(duration).HalfLength)
		}
		t.Logf("𝒦 = %g: half-length %.2f m (M-vertex %.2f m, bound %.2f m), net pressure %.3f MPa", dimless, length, lm, bound, net/1e6)
		if length > bound+2.5*element+0.01*bound {
			t.Errorf("𝒦 = %g: half-length %.2f m beyond both limits' %.2f m (+ the lead)", dimless, length, bound)
		}
		if length > prevLength {
			t.Errorf("𝒦 = %g: half-length %.2f m longer than at the smaller 𝒦 (%.2f m)", dimless, length, prevLength)
		}
		if net < prevPressure {
			t.Errorf("𝒦 = %g: net pressure %.4g Pa below that at the smaller 𝒦 (%.4g Pa)", dimless, net, prevPressure)
		}
		if res.MassBalanceError > 1e-8 {
			t.Errorf("𝒦 = %g: mass-balance error %.3g", dimless, res.MassBalanceError)
		}
		prevLength, prevPressure = length, net
	}
}

// In plane strain with a constant rate and no leak-off the dimensionless
// toughness 𝒦 = K′(E′³μ′q)^(−1/4) does not change with time, so the
// fracture is self-similar in every regime, the transition included: its
// scaled length ℓ/(E′q³t⁴/μ′)^(1/6) and scaled net pressure
// p/(E′²μ′/t)^(1/3) depend on 𝒦 alone (Detournay 2004, from memory; it
// follows from dimensional analysis of the KGD equations). So a viscosity
// 16 times larger with a toughness twice as large (the same 𝒦) must give,
// after twice the time, the same length and twice the net pressure, on
// the same 1 m elements: a check of how viscous flow and toughness
// combine at the tip, which neither limit's solution tests. The time
// steps scale with the time (on the same steps in scaled time both runs
// are the same discrete problem; with the same steps in seconds the
// pressures differ by 4 %). At 𝒦 = 1.5, 2.5 and 3.5.
func TestGrowthTransitionSelfSimilar(t *testing.T) {
	for _, dimless := range []float64{1.5, 2.5, 3.5} {
		checkSelfSimilar(t, dimless)
	}
}

func checkSelfSimilar(t *testing.T, dimless float64) {
	const duration = 30.0
	kgd, scale := kgdViscosityCase(t)
	mu := kgd.Viscosity
	run := func(viscosity, toughness, end float64) (length, net float64) {
		s := loadCase(t, "kgd-viscosity", "rock.fracture_toughness="+ftoa(toughness/1e6)+" MPa.m^0.5",
			"fluids.gel.viscosity="+ftoa(viscosity*1e3)+" cP", "numerics.element_length=1 m",
			"schedule.duration="+ftoa(end)+" s", "numerics.output_interval="+ftoa(end)+" s",
			"numerics.time_step_initial="+ftoa(end/3000)+" s", "numerics.time_step_max="+ftoa(end/60)+" s")
		_, length, net = runTransition(t, s, kgd, dimless)
		return length, net
	}
	la, pa := run(mu, dimless*scale, duration)
	lb, pb := run(16*mu, 2*dimless*scale, 2*duration)
	t.Logf("𝒦 = %g: half-length %.2f m and %.2f m, net pressure %.4f and %.4f MPa (ratio %.4f, want 2)", dimless, la, lb, pa/1e6, pb/1e6, pb/pa)
	if math.Abs(lb-la) > 1 {
		t.Errorf("𝒦 = %g: half-lengths %.2f m and %.2f m differ by more than an element (1 m)", dimless, la, lb)
	}
	if math.Abs(pb/pa-2) > 0.02 {
		t.Errorf("𝒦 = %g: net pressures %.4g and %.4g Pa: ratio %.4f, want 2 within 1 %%", dimless, pa, pb, pb/pa)
	}
}

// kgdViscosityCase returns the plane-strain fracture of
// testdata/kgd-viscosity (E′, μ, q per unit height) and the toughness
// K_Ic per unit of 𝒦 = K′(E′³μ′q)^(−1/4), K′ = 4√(2/π)K_Ic, μ′ = 12μ
// (Detournay 2004, from memory), Pa·√m.
func kgdViscosityCase(t *testing.T) (hfref.KGD, float64) {
	t.Helper()
	base := loadCase(t, "kgd-viscosity")
	g, nu := base.Rock.ShearModulus, base.Rock.PoissonRatio
	kgd := hfref.KGD{PlaneModulus: 2 * g / (1 - nu), Viscosity: base.Fluids["gel"].Viscosity, Rate: base.Schedule.Rate / base.Layer.Thickness}
	scale := math.Pow(math.Pow(kgd.PlaneModulus, 3)*12*kgd.Viscosity*kgd.Rate, 0.25) / (4 * math.Sqrt(2/math.Pi))
	return kgd, scale
}

// runTransition runs s, a variant of testdata/kgd-viscosity (whose
// fracture is kgd), after checking that its toughness and viscosity give
// 𝒦 = dimless, and returns the result, the opened half-length, m, and the
// net pressure at the well at the end, Pa.
func runTransition(t *testing.T, s *scenarios.Scenario, kgd hfref.KGD, dimless float64) (res *Result, length, net float64) {
	t.Helper()
	kgd.Viscosity, kgd.Toughness = s.Fluids["gel"].Viscosity, s.Rock.FractureToughness
	if got := kgd.DimensionlessToughness(); math.Abs(got-dimless) > 1e-9 {
		t.Fatalf("test bug: 𝒦 = %g, want %g", got, dimless)
	}
	_, res = runScenario(t, s)
	shmin := s.Stress.ShminGradient * s.Layer.Depth
	return res, openedHalfLength(res), res.Timeline[len(res.Timeline)-1].BHP - shmin
}
