package sim

import (
	"math"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/flow"
	"slipfront/internal/numtest"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// TestZeroProductionChangesNothing: a [depletion] table with no production
// time, and the scenario without the table, give the same run bit for bit
// (the round trip the depletion work promised: its absence leaves every
// result as it was).
func TestZeroProductionChangesNothing(t *testing.T) {
	without := loadEditedCase(t, "depleted-pad", func(text string) string {
		start, end := strings.Index(text, "[depletion]"), strings.Index(text, "[fluids.slickwater]")
		if start < 0 || end < start {
			t.Fatal("test bug: no [depletion] table before [fluids.slickwater] in testdata/depleted-pad")
		}
		return text[:start] + text[end:]
	}, nil)
	zero := loadCase(t, "depleted-pad", "depletion.duration=0 s")
	_, a := runScenario(t, without)
	_, b := runScenario(t, zero)
	if b.Depletion != nil {
		t.Fatal("zero production time left a depletion")
	}
	for _, f := range []struct {
		name string
		a, b []float64
	}{{"pressure", a.Pressure, b.Pressure}, {"slip", a.Slip, b.Slip}, {"aperture", a.Aperture, b.Aperture}} {
		if !slices.Equal(f.a, f.b) {
			t.Errorf("%s differs with an empty production", f.name)
		}
	}
	if a.StimulatedArea != b.StimulatedArea || len(a.Events) != len(b.Events) || a.SeismicMoment != b.SeismicMoment {
		t.Errorf("area %v vs %v, events %d vs %d, seismic moment %v vs %v",
			a.StimulatedArea, b.StimulatedArea, len(a.Events), len(b.Events), a.SeismicMoment, b.SeismicMoment)
	}
}

// TestDepletionUniaxialStressPath: a layer drained to the bottom-hole
// pressure everywhere (a permeable matrix produced for two years inside
// the closed map area), thin compared with the map, is a laterally
// extensive reservoir under uniaxial strain: its horizontal stresses fall
// by A·Δp with A = α(1 − 2ν)/(1 − ν) and Sv stays (Engelder & Fischer
// 1994; Zoback 2007, ch. 12). Checked on the depletion grid at the map
// centre and on every element of the stimulation's mesh: each starts from
// the depleted pore pressure, and a vertical element's normal stress has
// fallen by A·Δp. The tolerance is the layer's edge effect: h/L = 1 m over
// a 400 m map (observed below 0.3 %).
func TestDepletionUniaxialStressPath(t *testing.T) {
	// A drawdown of 6.2 MPa keeps the strike-slip order SHmax > Sv >
	// Shmin (16.2 MPa, the case's own, would take SHmax below Sv).
	s := loadCase(t, "depleted-pad", "layer.thickness=1 m", "matrix.permeability=10 mD",
		"depletion.bottomhole_pressure=25 MPa")
	d, err := Deplete(s)
	if err != nil {
		t.Fatal(err)
	}
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		t.Fatal(err)
	}
	drop := s.Depletion.BottomholePressure - stress.PorePressure()
	a := mechanics.Poroelastic{Biot: s.Depletion.Biot, Poisson: s.Rock.PoissonRatio}.StressPath()
	const tol = 0.01
	centre := d.At(r2.Vec{})
	numtest.Rel(t, "pore-pressure change at the centre", centre.Pore, drop, 1e-6)
	numtest.Rel(t, "ΔSxx at the centre", centre.XX, a*drop, tol)
	numtest.Rel(t, "ΔSyy at the centre", centre.YY, a*drop, tol)
	numtest.Abs(t, "ΔSxy at the centre", centre.XY, 0, tol*math.Abs(a*drop))
	// Both horizontal stresses, S1 and S3 of the strike-slip state, fall
	// by A·Δp and the pore pressure by Δp: the Mohr circle keeps its
	// size and moves by (1 − A)·|Δp| away from the Coulomb line, which is
	// how far the least critical increase grows.
	k, _ := d.Grid.CellAt(0, 0)
	numtest.Rel(t, "change of the least Δp_c at the centre", d.CriticalChange[k], (a-1)*drop, tol)
	// The whole closed map drained: the edge warning, and no change of
	// regime (SHmax stays above Sv).
	kinds := map[string]bool{}
	for _, w := range d.Warnings {
		kinds[w.Kind] = true
	}
	if !kinds[WarnDepletionAtEdge] || kinds[WarnRegimeChanged] {
		t.Errorf("warnings %v: want %s and not %s", d.Warnings, WarnDepletionAtEdge, WarnRegimeChanged)
	}
	if d.Produced <= 0 {
		t.Errorf("produced %g m³", d.Produced)
	}

	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	m, err := newModel(s, net, nil)
	if err != nil {
		t.Fatal(err)
	}
	vertical := 0
	for i, el := range m.elements {
		numtest.Rel(t, "initial pressure", m.pInit[i], stress.PorePressure()+drop, 1e-6)
		if !m.conduitEl[i] {
			continue // natural fractures dip: Sv (unchanged) enters their normal stress
		}
		_, before := horizontalTractions(stress, el.P0, el.P1)
		numtest.Rel(t, "normal stress change of a vertical conduit element", m.sigmaN[i]-before, a*drop, tol)
		vertical++
	}
	if vertical == 0 {
		t.Fatal("no vertical element to check")
	}
}

// TestConduitsFollowDepletedSHmax: the child's conduits strike along SHmax
// as the parent's production turned it at each cluster (the reorientation
// behind refracs and child wells: Elbel & Mack 1993; Roussel & Sharma
// 2012, qualitative), and along the in-situ SHmax without production.
func TestConduitsFollowDepletedSHmax(t *testing.T) {
	for _, tc := range []struct {
		name     string
		override string
		turned   bool
	}{{"two years of production", "depletion.duration=2 yr", true}, {"none", "depletion.duration=0 s", false}} {
		s := loadCase(t, "depleted-pad", tc.override)
		net, err := dfn.Generate(s, 0)
		if err != nil {
			t.Fatal(err)
		}
		m, err := newModel(s, net, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(m.conduits) != 3 {
			t.Fatalf("%s: %d conduits, want the child's 3", tc.name, len(m.conduits))
		}
		for _, c := range m.conduits {
			d := r2.Sub(c.P1, c.P0)
			strike := math.Atan2(d.X, d.Y) // clockwise from north
			want := s.Stress.SHmaxAzimuth
			if tc.turned {
				centre := r2.Scale(0.5, r2.Add(c.P0, c.P1))
				want = m.stress.Horizontal().Changed(m.depletion.At(centre)).Azimuth
				if turn := math.Abs(mechanics.SHmaxRotation(s.Stress.SHmaxAzimuth, want)); turn < 1e-4 {
					t.Errorf("%s: SHmax turned by only %.2g rad at a child cluster 100 m from the parent", tc.name, turn)
				}
			}
			numtest.Abs(t, tc.name+": conduit strike against SHmax, rad", mechanics.SHmaxRotation(want, strike), 0, 1e-12)
		}
	}
}

// The scenario's cap on the depletion grid is one that the drainage and
// the stress response both accept, so a grid the scenario check passes
// cannot fail later for its size.
func TestDepletionGridCaps(t *testing.T) {
	if scenarios.MaxDepletionCells > flow.MaxDrainageCells || scenarios.MaxDepletionCells > mechanics.MaxDepletionCells {
		t.Errorf("scenarios.MaxDepletionCells = %d; flow accepts %d, mechanics %d",
			scenarios.MaxDepletionCells, flow.MaxDrainageCells, mechanics.MaxDepletionCells)
	}
}

// A production history of two equal periods at one bottom-hole pressure is
// that pressure held throughout (the drainage's superposition is tested
// in flow); a second period at a higher pressure lets the layer recover
// part of its drop and produces less.
func TestDepletionHistory(t *testing.T) {
	deplete := func(overrides ...string) *Depletion {
		t.Helper()
		d, err := Deplete(loadCase(t, "depleted-pad", overrides...))
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	whole := deplete()
	split := deplete("depletion.duration=1 yr", "depletion.periods=[{duration = \"1 yr\", bottomhole_pressure = \"15 MPa\"}]")
	eased := deplete("depletion.duration=1 yr", "depletion.periods=[{duration = \"1 yr\", bottomhole_pressure = \"25 MPa\"}]")
	for k := range whole.Pore {
		numtest.Abs(t, "pore-pressure change, two equal periods against one, Pa", split.Pore[k], whole.Pore[k], 1e-6)
	}
	numtest.Rel(t, "produced, two equal periods against one", split.Produced, whole.Produced, 1e-9)
	if !(eased.Produced < whole.Produced) {
		t.Errorf("a second year at 25 MPa produced %g m³, not less than two years at 15 MPa (%g m³)", eased.Produced, whole.Produced)
	}
	k, _ := whole.Grid.CellAt(0, 40) // between the parent's fractures, off them
	if !(eased.Pore[k] > whole.Pore[k]) {
		t.Errorf("at (0, 40) m: %g Pa after easing the drawdown, %g Pa without: no recovery", eased.Pore[k], whole.Pore[k])
	}
}
