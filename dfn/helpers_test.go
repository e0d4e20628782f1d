package dfn

import (
	"slipfront/scenarios"
)

func defaultOrientation() scenarios.Orientation {
	return scenarios.Orientation{Distribution: "fisher", Dip: rad(80), DipDirection: rad(120), Kappa: 20}
}

// testSet returns a disc set of constant radius with a P32 target.
func testSet(name string, p32, radius float64) scenarios.FractureSet {
	return scenarios.FractureSet{
		Name: name, Shape: "disc", AspectRatio: 1,
		Orientation: defaultOrientation(),
		Size:        scenarios.Size{Distribution: "constant", Value: radius},
		Intensity:   scenarios.Intensity{Measure: "p32", P32: p32},
	}
}

// testScenario returns a scenario with a square map of the given side
// centred on the origin, a layer at 2000 m depth of the given thickness,
// and the sets.
func testScenario(side, thickness float64, sets ...scenarios.FractureSet) *scenarios.Scenario {
	return &scenarios.Scenario{
		Name: "test", Seed: 7,
		Domain:   scenarios.Domain{XMin: -side / 2, XMax: side / 2, YMin: -side / 2, YMax: side / 2},
		Layer:    scenarios.Layer{Depth: 2000, Thickness: thickness},
		Sets:     sets,
		Numerics: scenarios.Numerics{MaxFractures: 2_000_000},
	}
}

// eastWells returns k horizontal wells running east, spread across the
// map's middle 80 %, each spanning 90 % of the side.
func eastWells(side float64, k int) []scenarios.Well {
	ws := make([]scenarios.Well, k)
	for i := range ws {
		y := -0.4*side + 0.8*side*(float64(i)+0.5)/float64(k)
		ws[i] = scenarios.Well{Name: string(rune('A' + i)), Path: []scenarios.Point{
			{X: -0.45 * side, Y: y, Depth: 2000}, {X: 0.45 * side, Y: y, Depth: 2000},
		}}
	}
	return ws
}
