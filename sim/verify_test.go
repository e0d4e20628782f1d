package sim

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"testing"

	"slipfront/mechanics"
	"slipfront/scenarios"
)

// TestVerificationCases runs every end-to-end case of the top-level
// testdata folder (a scenario, its published reference values and their
// source in reference.json) and compares the run with the reference.
func TestVerificationCases(t *testing.T) {
	dirs, err := filepath.Glob(filepath.Join("..", "testdata", "*", "reference.json"))
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no verification cases in ../testdata (%v)", err)
	}
	for _, ref := range dirs {
		dir := filepath.Dir(ref)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			var want struct {
				Source       string  `json:"source"`
				SlipFront    float64 `json:"slip_front_m"`
				CoulombFront float64 `json:"coulomb_front_m"`
				Lambda       float64 `json:"lambda"`
				T            float64 `json:"T"`
			}
			raw, err := os.ReadFile(ref)
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(raw, &want); err != nil {
				t.Fatalf("%s: %v", ref, err)
			}
			if want.Source == "" || !(want.SlipFront > 0) {
				t.Fatalf("%s: needs a source and slip_front_m", ref)
			}
			s, err := scenarios.Load(filepath.Join(dir, "scenario.toml"))
			if err != nil {
				t.Fatal(err)
			}
			// The reference's own λ solves its T (the criterion, computed
			// here independently of the value stored).
			if got := mechanics.SlipFrontFactor(want.T); math.Abs(got-want.Lambda) > 1e-6 {
				t.Errorf("λ(T = %g) = %.8f here, %.8f in reference.json", want.T, got, want.Lambda)
			}
			_, res := runScenario(t, s)
			west, east := slipExtent(res, 0.5)
			dx := s.Numerics.ElementLength
			t.Logf("slip front %.1f m west, %.1f m east; reference %.1f m (%s); Coulomb front %.1f m",
				west, east, want.SlipFront, want.Source, want.CoulombFront)
			for _, front := range []float64{west, east} {
				if math.Abs(front-want.SlipFront) > 2*dx {
					t.Errorf("slip front %.1f m, reference %.1f m ± %.0f m", front, want.SlipFront, 2*dx)
				}
			}
		})
	}
}

// slipExtent returns how far west and east of x0 the slipped elements of
// an east-west fracture reach, to their centres, m.
func slipExtent(res *Result, x0 float64) (west, east float64) {
	for i, el := range res.Elements {
		if res.Slip[i] <= 0 {
			continue
		}
		x := 0.5*(el.P0.X+el.P1.X) - x0
		west, east = math.Max(west, -x), math.Max(east, x)
	}
	return west, east
}
