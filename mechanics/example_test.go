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

// The worked example of REFERENCES.md §7.4: a fracture dipping 80° to
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

func ExampleSlipModel_Slip() {
	k, _ := mechanics.NewPlaneStrainCrack(30e9, 0.25)
	m, err := mechanics.NewSlipModel(mechanics.Coulomb{Friction: 0.6}, 0.5, k)
	if err != nil {
		fmt.Println(err)
		return
	}
	// σn = 64 MPa, τ = 15 MPa, pore pressure raised to 45 MPa, on a patch
	// 20 m long and 40 m high (a 2-D crack of half-size 10 m).
	r := m.Slip(64e6, 15e6, 45e6, mechanics.Patch{Length: 20, Height: 40})
	fmt.Printf("slips %v, stress drop %.1f MPa, slip %.3f mm\n", r.Slips, r.StressDrop/1e6, r.Slip*1e3)
	m0 := mechanics.Moment(30e9, 20*40, r.Slip)
	fmt.Printf("M0 = %.3e N·m, Mw = %.2f\n", m0, mechanics.MomentMagnitude(m0))
	// Output:
	// slips true, stress drop 5.5 MPa, slip 2.160 mm
	// M0 = 5.184e+10 N·m, Mw = 1.08
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
