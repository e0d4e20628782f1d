package dfn_test

import (
	"fmt"
	"math"
	"os"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/dfn"
	"slipfront/scenarios"
)

// The cone about the mean pole that holds 95 % of a Fisher set with κ = 20
// (docs/references.md §1.3: 31.76511°).
func ExampleFisherCosQuantile() {
	theta95 := math.Acos(dfn.FisherCosQuantile(0.95, 20)) * 180 / math.Pi
	fmt.Printf("θ95 = %.5f deg\n", theta95)
	// Output: θ95 = 31.76511 deg
}

// P10 along a line at 60° from the mean pole of a Fisher set with κ = 20
// converts to P32 through C13 = 0.476860 (docs/references.md §2.2).
func ExampleFisher_C13() {
	f := dfn.NewFisher(r3.Vec{Z: 1}, 20)
	line := r3.Vec{X: math.Sin(math.Pi / 3), Z: math.Cos(math.Pi / 3)}
	c13 := f.C13(line)
	fmt.Printf("C13 = %.6f, P32 for P10 = 0.05 1/m: %.4f 1/m\n", c13, 0.05/c13)
	// Output: C13 = 0.476860, P32 for P10 = 0.05 1/m: 0.1049 1/m
}

// Mean area of discs with truncated power-law radii 1–100 m, D = 2.5
// (docs/references.md §3.3: 14.137308 m²).
func ExamplePowerLaw_Moment() {
	law := dfn.PowerLaw{Min: 1, Max: 100, D: 2.5}
	fmt.Printf("E[r] = %.6f m, E[πr²] = %.6f m²\n", law.Moment(1), math.Pi*law.Moment(2))
	// Output: E[r] = 1.665017 m, E[πr²] = 14.137308 m²
}

func ExampleIntersectSegments() {
	a := dfn.Segment{P0: r2.Vec{X: 0, Y: 0}, P1: r2.Vec{X: 4, Y: 0}}
	b := dfn.Segment{P0: r2.Vec{X: 1, Y: -1}, P1: r2.Vec{X: 1, Y: 3}}
	x, ok := dfn.IntersectSegments(a, b)
	fmt.Println(ok, x.Point, x.S, x.T)
	// Output: true {1 0} 0.25 0.25
}

// Generate one realization of a single set of vertical discs and print
// its summary.
func ExampleGenerate() {
	s := &scenarios.Scenario{
		Seed:   42,
		Domain: scenarios.Domain{XMin: -200, XMax: 200, YMin: -200, YMax: 200},
		Layer:  scenarios.Layer{Depth: 2500, Thickness: 30},
		Sets: []scenarios.FractureSet{{
			Name: "J1", Shape: "disc",
			Orientation: scenarios.Orientation{Distribution: "fisher", Dip: 85 * math.Pi / 180, DipDirection: 2, Kappa: 30},
			Size:        scenarios.Size{Distribution: "constant", Value: 20},
			Intensity:   scenarios.Intensity{Measure: "count", Count: 300},
		}},
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	st := net.Stats()
	fmt.Println(len(net.Fractures), "fractures,", len(net.Traces), "traces, digest", net.Digest()[:12])
	_ = dfn.WriteSummary(os.Stdout, net, st)
	// Output:
	// 300 fractures, 167 traces, digest e0de8bb91c03
	//   set  fractures  traces  P32 target 1/m  P32 1/m  P21 1/m  kappa est.
	//    J1        300     167         0.02782  0.02756   0.0265        30.9
	//   all        300     167               -  0.02756   0.0265           -
	// 13 intersections (0.156 per trace), 154 clusters, largest cluster holds 1.6% of the trace length
}
