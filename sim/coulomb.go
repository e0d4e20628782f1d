package sim

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// CoulombChangeMap returns the Coulomb stress change ΔCFS = s·Δτ − μ′·Δσn,
// Pa, of a run's final slip and opening (Result.ShearSlip and
// Result.Opening) at the centre of every cell of the scenario's map grid,
// in grid order, on the scenario's receiver planes
// (mechanics.ReceiverFromScenario; King, Stein & Lin 1994). The stress
// change is the elastic field of every element (elastic.Field: the
// boundary-element sums, compressed to numerics.interaction_tolerance,
// with Olson's height correction unless numerics.height_correction is
// off), on the layer mid-plane. A cell whose centre falls where the
// field is singular (an element's tip) is NaN.
func CoulombChangeMap(s *scenarios.Scenario, res *Result) ([]float64, error) {
	if res.ShearSlip == nil || res.Opening == nil {
		return nil, fmt.Errorf("sim: the result holds no final slip and opening (a replayed result)")
	}
	g := s.MapGrid()
	points := make([]r2.Vec, g.Cells())
	for k := range points {
		x, y := g.Centre(k)
		points[k] = r2.Vec{X: x, Y: y}
	}
	elems := elasticElements(res.Elements)
	mat := elastic.Material{ShearModulus: s.Rock.ShearModulus, PoissonRatio: s.Rock.PoissonRatio}
	f, err := elastic.NewField(elems, mat, points, elastic.Settings{Tolerance: s.Numerics.InteractionTolerance,
		PlaneStrain: s.Numerics.HeightCorrection == "off"})
	if err != nil {
		return nil, fmt.Errorf("stress change map over %d cells: %w", len(points), err)
	}
	stress := make([]elastic.Stress, len(points))
	f.StressTo(stress, res.ShearSlip, res.Opening)
	tangent, sense := mechanics.ReceiverFromScenario(s.Coulomb, s.Stress.SHmaxAzimuth)
	out := make([]float64, len(points))
	for k, st := range stress {
		v := st.Coulomb(tangent, s.Coulomb.EffectiveFriction, sense)
		if math.IsInf(v, 0) {
			v = math.NaN()
		}
		out[k] = v
	}
	return out, nil
}
