package dfn

import (
	"math"
	"testing"

	"slipfront/internal/numtest"
	"slipfront/scenarios"
)

// stereologyRuns generates m realizations of one set of 10 m discs with
// the given orientation and intensity in a 600 m map, 20 m layer, with 16
// east-running wells at mid-plane depth, and returns per realization the
// set's P21 on the mid-plane and the mean P10 of the wells.
func stereologyRuns(t *testing.T, o scenarios.Orientation, in scenarios.Intensity, m int) (p21, p10 []float64) {
	t.Helper()
	set := testSet("s", 0, 10)
	set.Orientation, set.Intensity = o, in
	s := testScenario(600, 20, set)
	s.Wells = eastWells(600, 16)
	for k := range m {
		st := mustGenerate(t, s, k).Stats()
		p21 = append(p21, st.Sets[0].P21)
		var sum float64
		for _, w := range st.Wells {
			sum += w.P10
		}
		p10 = append(p10, sum/float64(len(st.Wells)))
	}
	return p21, p10
}

// checkMean compares the mean over realizations with its expectation
// within 5 standard errors (sd/√M).
func checkMean(t *testing.T, what string, vals []float64, want float64) {
	t.Helper()
	mean, sd := meanSD(vals)
	numtest.Abs(t, what, mean, want, 5*sd/math.Sqrt(float64(len(vals))))
}

// Stereology measured on generated networks (Dershowitz & Herda 1992;
// Terzaghi 1965; docs/references.md §2.2): P21 = C23·P32 on the horizontal
// mid-plane and P10 = C13·P32 along the horizontal wells, in expectation.
func TestStereologyOnNetworks(t *testing.T) {
	const p32, m = 0.1, 40
	p32Target := scenarios.Intensity{Measure: "p32", P32: p32}

	// Vertical fractures on a horizontal plane: C23 = 1.
	vertical := scenarios.Orientation{Distribution: "fixed", Dip: rad(90), DipDirection: rad(30)}
	p21, _ := stereologyRuns(t, vertical, p32Target, m)
	checkMean(t, "vertical: P21 = P32", p21, p32)

	// Uniformly random orientations: C23 = π/4, C13 = 1/2.
	p21, p10 := stereologyRuns(t, scenarios.Orientation{Distribution: "uniform"}, p32Target, m)
	checkMean(t, "uniform: P21 = (π/4)P32", p21, math.Pi/4*p32)
	checkMean(t, "uniform: P10 = P32/2", p10, p32/2)

	// One orientation at θ to the line: P10 = P32·|cos θ|. Planes dipping
	// 60° east have n = (sin 60, 0, cos 60); the wells run east, so
	// |cos θ| = sin 60.
	fixed := scenarios.Orientation{Distribution: "fixed", Dip: rad(60), DipDirection: rad(90)}
	_, p10 = stereologyRuns(t, fixed, p32Target, m)
	checkMean(t, "single orientation: P10 = P32 |cos θ|", p10, p32*math.Sin(rad(60)))

	// A Fisher set specified by its P10 along an eastward line: the wells
	// measure that P10 back (P32 = P10/C13 by quadrature, then generated).
	fisher := scenarios.Orientation{Distribution: "fisher", Dip: rad(75), DipDirection: rad(60), Kappa: 10}
	_, p10 = stereologyRuns(t, fisher, scenarios.Intensity{Measure: "p10", P10: 0.05, LineTrend: rad(90)}, m)
	checkMean(t, "Fisher: P10 given = P10 measured", p10, 0.05)
}
