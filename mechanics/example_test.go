package mechanics_test

import (
	"fmt"
	"math"
	"os"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/orient"
	"slipfront/mechanics"
)

const deg = math.Pi / 180

// The worked example of docs/references.md §7.4: a fracture dipping 80° to
// N120°E in a strike-slip state with SHmax at N060°E.
func ExampleStress_Resolve() {
	s, err := mechanics.NewAndersonian(mechanics.Andersonian{
		SHmax: 90e6, Shmin: 55e6, Sv: 75e6, SHmaxAzimuth: 60 * deg, PorePressure: 30e6,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := s.Resolve(orient.Normal(80*deg, 120*deg))
	c := mechanics.Coulomb{Friction: 0.6}
	fmt.Printf("σn = %.6f MPa, τ = %.6f MPa, rake %.3f°\n", r.SigmaN/1e6, r.Tau/1e6, r.Rake/deg)
	fmt.Printf("slip tendency %.4f, Δp_c = %.6f MPa\n",
		mechanics.SlipTendency(r.SigmaN, r.Tau, s.PorePressure()),
		c.CriticalIncrease(r.SigmaN, r.Tau, s.PorePressure())/1e6)
	// Output:
	// σn = 64.089229 MPa, τ = 15.048682 MPa, rake -172.655°
	// slip tendency 0.4414, Δp_c = 9.008093 MPa
}

func ExampleStressAtDepth() {
	g := mechanics.Gradients{Sv: 25e3, SHmax: 27e3, Shmin: 19e3, PorePressure: 11e3, SHmaxAzimuth: 75 * deg}
	s, err := mechanics.StressAtDepth(g, 2600)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range s.Principal() {
		fmt.Printf("%-5s %.1f MPa\n", p.Name, p.Value/1e6)
	}
	check, _ := s.CheckFrictionalLimit(0.6)
	fmt.Printf("%s regime, (S1-p)/(S3-p) = %.3f, limit %.3f, exceeded %v\n", s.Regime(), check.Ratio, check.Limit, check.Exceeded)
	// Output:
	// SHmax 70.2 MPa
	// Sv    65.0 MPa
	// Shmin 49.4 MPa
	// strike-slip regime, (S1-p)/(S3-p) = 2.000, limit 3.119, exceeded false
}

// A negative gradient is an error, not a panic.
func ExampleGradients_Validate() {
	g := mechanics.Gradients{Sv: 25e3, SHmax: 18e3, Shmin: 19e3, PorePressure: 11e3}
	fmt.Println(g.Validate())
	// Output:
	// mechanics: shmax_gradient = 18000: must be ≥ shmin_gradient (19000 Pa/m)
}

func ExampleApertureModel_Evaluate() {
	m := mechanics.ApertureModel{ZeroStress: 1e-4, ClosureStress: 40e6, DilationAngle: 2.5 * deg,
		DilationSlipLimit: 5e-3, ShearModulus: 30e9, PoissonRatio: 0.25}
	patch := mechanics.Patch{Length: 20, Height: 40}
	e0, _ := m.Evaluate(50e6, 30e6, 0, patch)       // σn′ = 20 MPa, no slip
	e1, dedp := m.Evaluate(50e6, 30e6, 5e-3, patch) // after 5 mm of slip
	fmt.Printf("e = %.4e m → %.4e m, transmissivity ×%.2f, de/dp = %.3e m/Pa\n",
		e0, e1, mechanics.TransmissivityGain(e1, e0), dedp)
	// Output:
	// e = 1.8182e-05 m → 5.7874e-05 m, transmissivity ×32.25, de/dp = 2.368e-12 m/Pa
}

func ExampleMomentMagnitude() {
	fmt.Printf("%.6f\n", mechanics.MomentMagnitude(2.285714e9))
	fmt.Printf("%.5e\n", mechanics.MomentFromMagnitude(0))
	// Output:
	// 0.172681
	// 1.25893e+09
}

func ExampleScreen() {
	s, _ := mechanics.NewAndersonian(mechanics.Andersonian{
		SHmax: 90e6, Shmin: 55e6, Sv: 75e6, SHmaxAzimuth: 60 * deg, PorePressure: 30e6,
	})
	planes := []mechanics.Plane{
		{ID: 1, Set: 0, Normal: orient.Normal(80*deg, 120*deg), Area: 100, TraceLength: 10},
		{ID: 2, Set: 0, Normal: orient.Normal(85*deg, 300*deg), Area: 100, TraceLength: 10},
		{ID: 3, Set: 1, Normal: r3.Vec{Z: 1}, Area: 400, TraceLength: 0},
	}
	sc, err := mechanics.Screen(planes, s, mechanics.Coulomb{Friction: 0.6},
		mechanics.ScreenOptions{SetNames: map[int]string{0: "steep", 1: "flat"}})
	if err != nil {
		fmt.Println(err)
		return
	}
	sc.WriteSummary(os.Stdout)
	// Output:
	// Stress state (total, compression positive):
	//   S1  SHmax  90.00 MPa  trend 60.0°   plunge 0.0°
	//   S2  Sv     75.00 MPa  trend 0.0°    plunge 90.0°
	//   S3  Shmin  55.00 MPa  trend 150.0°  plunge 0.0°
	//   pore pressure 30.00 MPa; strike-slip regime
	// Frictional limit for friction 0.60: (S1-p)/(S3-p) = 2.400, limit 3.119: within the limit
	//
	// Fractures that slip at a pore-pressure increase of (cohesion 0.00 MPa):
	//     set  fractures  0 MPa  1 MPa  2 MPa  5 MPa  10 MPa
	//   steep          2   0.0%   0.0%   0.0%   0.0%  100.0%
	//    flat          1   0.0%   0.0%   0.0%   0.0%    0.0%
	//     all          3   0.0%   0.0%   0.0%   0.0%   66.7%
	//
	// Caution: slipfront is a screening and comparison tool, not a design code: pump pressures, well integrity and induced-seismicity limits follow local regulation and licensed engineering practice.
}

// A slipping patch on a fracture with linear slip weakening is seismic once
// its half-size reaches the nucleation half-length of Uenishi & Rice
// (2003). Illustrative values: G = 15 GPa, ν = 0.25, μs − μd = 0.1,
// Dc = 1 mm, σn′ = 20 MPa (W = 2 GPa/m).
func ExampleNucleation_Classify() {
	n := mechanics.Nucleation{
		Friction:     mechanics.SlipWeakening{Static: 0.6, Residual: 0.5, CriticalSlip: 1e-3},
		ShearModulus: 15e9, PoissonRatio: 0.25, Mode: mechanics.InPlane,
	}
	if err := n.Validate(); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("a_n = %.2f m\n", n.HalfLength(20e6))
	for _, length := range []float64{5, 20} {
		p := mechanics.Patch{Length: length, Height: 30}
		fmt.Printf("%g m × %g m: %v\n", p.Length, p.Height, n.Classify(p, 20e6))
	}
	// Output:
	// a_n = 5.79 m
	// 5 m × 30 m: aseismic
	// 20 m × 30 m: seismic
}

// The b-value of a small catalogue binned at 0.1 above Mc = 1.0 (Aki
// 1965 with Utsu's half-bin correction), with both standard errors: ten
// complete events with M̄ = 1.27, so b = log10(e)/(1.27 − 0.95) = 1.357.
func ExampleBValue() {
	mags := []float64{1.0, 1.0, 1.1, 1.0, 1.3, 1.2, 1.6, 1.1, 2.0, 1.4, 0.8}
	e, err := mechanics.BValue(mags, mechanics.BValueOptions{Completeness: 1.0, BinWidth: 0.1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("N = %d, b = %.3f ± %.3f (Aki) ± %.3f (Shi & Bolt)\n", e.Events, e.B, e.AkiError, e.ShiBoltError)
	// Output:
	// N = 10, b = 1.357 ± 0.429 (Aki) ± 0.434 (Shi & Bolt)
}

// McGarr's (2014) bound for 10 000 m³ of net injection into rock with
// G = 30 GPa.
func ExampleMaxInducedMoment() {
	m0 := mechanics.MaxInducedMoment(30e9, 1e4)
	fmt.Printf("M0,max = %.1e N·m, Mw %.2f\n", m0, mechanics.MomentMagnitude(m0))
	// Output:
	// M0,max = 3.0e+14 N·m, Mw 3.58
}

// The seismicity rate of Dieterich (1994) over a piecewise-linear Coulomb
// stress history: background loading, a 0.1 MPa step, then ten times
// faster loading. Illustrative values: r = 1 event/day, τ̇_r = 1 kPa/day,
// Aσ = 0.05 MPa (t_a = 50 days). The step of 2·Aσ multiplies the rate by
// e² = 7.39; ten days later the step response gives
// 1/(1 + (e⁻² − 1)·e^(−10/50)) = 3.42 events/day.
func ExampleSeismicityRate_Integrate() {
	const day = 86400.0
	m := mechanics.SeismicityRate{BackgroundRate: 1 / day, StressingRate: 1e3 / day, ASigma: 5e4}
	h := mechanics.StressHistory{
		Time:   []float64{0, 10 * day, 10 * day, 20 * day, 40 * day},
		Stress: []float64{0, 1e4, 1.1e5, 1.2e5, 3.2e5},
	}
	gamma := make([]float64, len(h.Time))
	count := make([]float64, len(h.Time))
	if err := m.Integrate(gamma, count, h, m.SteadyState()); err != nil {
		fmt.Println(err)
		return
	}
	for k := range h.Time {
		fmt.Printf("day %2.0f: %6.2f events/day, %6.1f events so far\n", h.Time[k]/day, m.Rate(gamma[k])*day, count[k])
	}
	// Output:
	// day  0:   1.00 events/day,    0.0 events so far
	// day 10:   1.00 events/day,   10.0 events so far
	// day 10:   7.39 events/day,   10.0 events so far
	// day 20:   3.42 events/day,   58.5 events so far
	// day 40:   9.66 events/day,  206.6 events so far
}

// A crack tip read from its constant tip element: the stress intensity
// factors from the element's opening and slip, the direction it grows in
// and whether it grows at a toughness of 1.5 MPa·√m.
func ExampleKinkAngle() {
	const g, nu, a = 15e9, 0.25, 0.5 // Pa, –, tip element half-length m
	kI := mechanics.TipIntensity(0.2e-3, a, g, nu)
	kII := mechanics.TipIntensity(0.05e-3, a, g, nu)
	th := mechanics.KinkAngle(kI, kII)
	keq := mechanics.EquivalentIntensity(kI, kII)
	fmt.Printf("K_I = %.3f MPa·√m, K_II = %.3f MPa·√m\n", kI/1e6, kII/1e6)
	fmt.Printf("kink %.2f°, K_eq = %.3f MPa·√m, grows: %v\n", th/deg, keq/1e6, keq >= 1.5e6)
	// Output:
	// K_I = 2.828 MPa·√m, K_II = 0.707 MPa·√m
	// kink -25.33°, K_eq = 3.070 MPa·√m, grows: true
}

// A hydraulic fracture growing along SHmax meets a natural fracture at 80°.
func ExampleApproach_Decide() {
	a := mechanics.Approach{
		Angle: 80 * deg, ParallelStress: 52e6, NormalStress: 45e6, PorePressure: 30e6,
		FluidPressure: 46e6, TensileStrength: 3e6, Friction: 0.6,
	}
	for _, sh := range []float64{52e6, 46e6} {
		a.ParallelStress = sh
		c, err := a.Decide()
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("SHmax %.0f MPa: %v\n", sh/1e6, c)
	}
	a.FluidPressure = 45.5e6 // below σn = 45.97 MPa on the natural fracture
	c, err := a.Decide()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("SHmax 46 MPa, fluid 45.5 MPa: %v\n", c)
	// Output:
	// SHmax 52 MPa: cross
	// SHmax 46 MPa: divert
	// SHmax 46 MPa, fluid 45.5 MPa: arrest
}
