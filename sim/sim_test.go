package sim

import (
	"bytes"
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"slices"
	"strings"
	"sync"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/stat/distuv"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// loadExample loads an embedded example with overrides.
func loadExample(t testing.TB, name string, overrides ...string) *scenarios.Scenario {
	t.Helper()
	ov, err := scenarios.ParseOverrides(overrides)
	if err != nil {
		t.Fatal(err)
	}
	s, err := scenarios.LoadExample(name, ov...)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// runExample runs realization 0 of an embedded example with overrides.
func runExample(t testing.TB, name string, overrides ...string) (*scenarios.Scenario, *dfn.Network, *Result) {
	t.Helper()
	s := loadExample(t, name, overrides...)
	net, res := runScenario(t, s)
	return s, net, res
}

// runScenario draws realization 0 of the scenario's network and runs it.
func runScenario(t testing.TB, s *scenarios.Scenario) (*dfn.Network, *Result) {
	t.Helper()
	return runRealization(t, s, 0)
}

// runRealization draws realization r of the scenario's network and runs it.
func runRealization(t testing.TB, s *scenarios.Scenario, r int) (*dfn.Network, *Result) {
	t.Helper()
	net, err := dfn.Generate(s, r)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), s, net, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return net, res
}

// slipFront returns the distance from the well (x = 0.5 m) of the centre
// of the farthest slipped element of the single-fracture case, m.
func slipFront(res *Result) float64 {
	var front float64
	for i, el := range res.Elements {
		if res.Slip[i] > 0 {
			front = math.Max(front, 0.5*(el.P0.X+el.P1.X)-0.5)
		}
	}
	return front
}

// The slipped region of one long fracture under constant-pressure
// injection, without elastic interaction (numerics.interaction = off: each
// element slips alone when its own Coulomb criterion is met), ends where
// the erfc solution's pressure increase equals the critical increase
// (Carslaw & Jaeger 1959 §2.4; docs/references.md §12.1):
//
//	x_c = 2 √(D t) · erfc⁻¹(Δp_c / Δp),   D = e²/(12 μ c_f),
//
// with Δp_c = σn − p0 − τ/μs (docs/references.md §7.2). The error shrinks
// as the elements are refined. With interaction (the default), the stress
// that the slipped part sheds loads the fracture ahead: the slip front
// runs ahead of x_c (Bhattacharya & Viesca 2019; the criterion is checked
// against a prescribed pressure in mechanics' TestContactSlipFrontCriterion)
// and converges as elements and steps shrink together.
func TestSlipFrontFollowsPressureFront(t *testing.T) {
	const (
		e, mu, cf = 1e-4, 1e-3, 4.5e-10 // the example's aperture and fluid
		dp, tEnd  = 20e6, 60.0          // injection at 40 MPa over p0 = 20 MPa
		sigmaN    = 46.5e6              // 60·cos²60° + 42·sin²60° MPa (docs/references.md §7.1)
		tau       = 7.794228634e6       // (60 − 42)·sin 60°·cos 60° MPa
	)
	dpc := sigmaN - 20e6 - tau/0.6
	// erfc⁻¹(y) = −Φ⁻¹(y/2)/√2 with Φ the standard normal distribution.
	xc := 2 * math.Sqrt(e*e/(12*mu*cf)*tEnd) * -distuv.UnitNormal.Quantile(dpc/dp/2) / math.Sqrt2
	// Elements and time steps shrink together (dt ∝ dx², as in the flow
	// package's erfc test).
	cases := []struct {
		dx, dt float64 // m, s
	}{{40, 2}, {20, 0.5}, {10, 0.125}, {5, 0.03125}}
	var errs, fronts []float64
	for _, c := range cases {
		refine := []string{fmt.Sprintf("numerics.element_length=%g m", c.dx),
			fmt.Sprintf("numerics.time_step_max=%g s", c.dt), fmt.Sprintf("numerics.time_step_initial=%g s", c.dt/10)}
		_, _, alone := runExample(t, "single-fracture", append(refine, "numerics.interaction=off")...)
		_, _, res := runExample(t, "single-fracture", refine...)
		front := slipFront(alone)
		errs = append(errs, math.Abs(front-xc))
		fronts = append(fronts, slipFront(res))
		t.Logf("elements %g m, steps ≤ %g s: slip front %.1f m alone, %.1f m interacting; erfc front %.1f m", c.dx, c.dt, front, slipFront(res), xc)
		// The front is read at element centres, so it lies within one
		// element of x_c; 0.5 % of x_c more for the time discretisation.
		if tol := c.dx + 0.005*xc; errs[len(errs)-1] > tol {
			t.Errorf("elements %g m, no interaction: front error %.2f m > %.2f m", c.dx, errs[len(errs)-1], tol)
		}
		if slipFront(res) < xc-c.dx {
			t.Errorf("elements %g m: interacting slip front %.1f m lags the Coulomb front %.1f m", c.dx, slipFront(res), xc)
		}
	}
	if errs[len(errs)-1] >= errs[0] {
		t.Errorf("front error did not shrink with refinement: %v", errs)
	}
	// The interacting front converges: successive refinements move it less.
	if d1, d2 := math.Abs(fronts[1]-fronts[0]), math.Abs(fronts[3]-fronts[2]); d2 > math.Max(d1, cases[2].dx) {
		t.Errorf("interacting slip front does not settle under refinement: %v m", fronts)
	}
}

// With shear dilation the slipped fracture conducts better, so the same
// injection stimulates farther. Closure is on here for both runs (e0 = 1 mm,
// closure_stress 300 MPa, which keeps the diffusivity near that of the
// erfc case): with a rigid fracture, dilation would open pore volume that
// only fluid compressibility could fill (undrained suction of hundreds of
// MPa), which no fracture in rock shows.
func TestDilationCarriesSlipFarther(t *testing.T) {
	common := []string{"numerics.element_length=10 m", "rock.zero_stress_aperture=1 mm", "rock.closure_stress=300 MPa",
		"rock.dilation_slip_limit=10 mm"}
	_, _, base := runExample(t, "single-fracture", append(common, "rock.dilation_angle=0 deg")...)
	_, _, dil := runExample(t, "single-fracture", append(common, "rock.dilation_angle=5 deg")...)
	t.Logf("dilation 5°: slip front %.1f m against %.1f m without (×%.2f)", slipFront(dil), slipFront(base), slipFront(dil)/slipFront(base))
	if !(slipFront(dil) > slipFront(base)) {
		t.Errorf("dilation did not carry the slip front farther: %.1f ≤ %.1f m", slipFront(dil), slipFront(base))
	}
}

// smallPad is the zipper pad with smaller stages and a coarser mesh, quick
// enough for every test run; it runs once and is shared.
// smallPad cuts the zipper pad down for the tests of run invariants: 50 bbl
// stages on 20 m elements, and a slip-weakening distance of 1 mm so that it
// ruptures (with the zipper pad's own 3 mm it slips aseismically). Those
// elements do not resolve the nucleation length, so the number of events
// is the mesh's: the tests check how events are accounted, not how many.
var smallPad = []string{"schedule.volume=50 bbl", "numerics.element_length=20 m", "rock.slip_weakening_distance=1 mm"}

var (
	smallPadOnce   sync.Once
	smallPadResult *Result
	smallPadInput  *scenarios.Scenario
)

func runSmallPad(t *testing.T) (*scenarios.Scenario, *Result) {
	smallPadOnce.Do(func() { smallPadInput, _, smallPadResult = runExample(t, "zipper-pad", smallPad...) })
	if smallPadResult == nil {
		t.Fatal("the small demo failed in an earlier test")
	}
	return smallPadInput, smallPadResult
}

// TestZipperPadInvariants checks the run invariants on the small zipper pad: mass
// balance, a growing stimulated area, events that account for all slip.
func TestZipperPadInvariants(t *testing.T) {
	s, res := runSmallPad(t)
	if res.MassBalanceError > 1e-8 {
		t.Errorf("mass balance error %.3g > 1e-8 relative", res.MassBalanceError)
	}
	for i := 1; i < len(res.Timeline); i++ {
		a, b := res.Timeline[i-1], res.Timeline[i]
		if b.StimulatedArea < a.StimulatedArea || b.FractureArea < a.FractureArea || b.Time < a.Time {
			t.Fatalf("timeline row %d: stimulated area or time decreased", i)
		}
	}
	if res.StimulatedArea <= 0 || len(res.Events) == 0 {
		t.Fatalf("the demo stimulated nothing (area %g, %d events)", res.StimulatedArea, len(res.Events))
	}
	// The events are the ruptures: Σ M0 of the catalogue is the seismic
	// moment, and with the aseismic moment it accounts for all slip,
	// G Σ_elements L h D (Aki 1966).
	var m0, slipArea float64
	for _, e := range res.Events {
		m0 += e.Moment
	}
	for i, el := range res.Elements {
		slipArea += el.Length * el.Height * res.Slip[i]
	}
	if !slices.IsSortedFunc(res.Events, func(a, b Event) int { return cmp.Compare(a.Time, b.Time) }) {
		t.Error("the event catalogue is not in time order")
	}
	numtest.Rel(t, "Σ event moments", m0, res.SeismicMoment, 1e-9)
	// Event depths lie within the nucleating element's conducting height
	// about the mid-plane, and are not all on it.
	var spread float64
	for _, e := range res.Events {
		var h float64
		for _, el := range res.Elements {
			if el.Fracture == e.Fracture && el.Trace == e.Trace {
				h = math.Max(h, el.Height)
			}
		}
		if d := math.Abs(e.Depth - s.Layer.Depth); d > h/2 {
			t.Errorf("event at %.2f m TVD: %.2f m off the mid-plane, beyond half its fracture's height %.2f m", e.Depth, d, h)
		}
		spread = math.Max(spread, math.Abs(e.Depth-s.Layer.Depth))
	}
	if !(spread > 1) {
		t.Errorf("every event within %.2g m of the mid-plane: depths not drawn over the height", spread)
	}
	last := res.Timeline[len(res.Timeline)-1]
	if last.SeismicMoment != res.SeismicMoment || last.AseismicMoment != res.AseismicMoment {
		t.Errorf("last timeline row moments %g, %g N·m; the run's %g, %g N·m", last.SeismicMoment, last.AseismicMoment, res.SeismicMoment, res.AseismicMoment)
	}
	numtest.Rel(t, "seismic + aseismic moment", res.SeismicMoment+res.AseismicMoment, s.Rock.ShearModulus*slipArea, 1e-9)
	if !(res.AseismicMoment > 0) {
		t.Errorf("aseismic moment %g N·m: the demo's fractures slip stably before they rupture", res.AseismicMoment)
	}
	checkMcGarr(t, s, res)
	checkGainOnlyWhereSlipped(t, s, res)
}

// checkMcGarr: the largest event's moment stays below G·ΔV, McGarr's
// (2014) bound on the largest event induced by injecting ΔV
// (mechanics.MaxInducedMoment).
func checkMcGarr(t *testing.T, s *scenarios.Scenario, res *Result) {
	t.Helper()
	var largest float64
	for _, e := range res.Events {
		largest = math.Max(largest, e.Moment)
	}
	if bound := mechanics.MaxInducedMoment(s.Rock.ShearModulus, res.Injected); !(largest <= bound) {
		t.Errorf("largest event M0 = %.3g N·m exceeds McGarr's bound G·ΔV = %.3g N·m", largest, bound)
	}
}

// Every stage whose bottom-hole pressure exceeded Shmin is named by one
// warning of kind WarnBHPAboveShmin, and no other stage is: a user must
// see every stage that entered the tensile regime, not only the first.
func TestShminWarningPerStage(t *testing.T) {
	s, res := runSmallPad(t)
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		t.Fatal(err)
	}
	shmin := math.NaN()
	for _, p := range stress.Principal() {
		if p.Name == "Shmin" {
			shmin = p.Value
		}
	}
	warned := map[string]int{}
	for _, w := range res.Warnings {
		if w.Kind == WarnBHPAboveShmin {
			warned[w.Stage]++
			if !strings.Contains(w.Message, "stage "+w.Stage+":") || w.String() != w.Message {
				t.Errorf("warning %+v does not name its stage in its message", w)
			}
		}
	}
	crossed := 0
	for _, st := range res.Stages {
		want := 0
		if st.PeakBHP > shmin {
			want = 1
			crossed++
		}
		if warned[st.Name] != want {
			t.Errorf("stage %s: peak BHP %.4g MPa, Shmin %.4g MPa: %d warnings, want %d", st.Name, st.PeakBHP/1e6, shmin/1e6, warned[st.Name], want)
		}
	}
	if crossed < 2 {
		t.Fatalf("only %d stages crossed Shmin: the test needs several", crossed)
	}
}

// apertureSetting returns what a check of apertures needs: the
// scenario's aperture law, its stress at the layer's depth and the network
// of realization 0.
func apertureSetting(t *testing.T, s *scenarios.Scenario) (mechanics.ApertureModel, mechanics.Stress, *dfn.Network) {
	t.Helper()
	model, err := mechanics.ApertureFromScenario(s.Rock)
	if err != nil {
		t.Fatal(err)
	}
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		t.Fatal(err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	return model, stress, net
}

// checkGainOnlyWhereSlipped: an element that never slipped has exactly the
// aperture the closure law gives at its final pressure (no lasting gain);
// with dilation, a slipped one has more.
func checkGainOnlyWhereSlipped(t *testing.T, s *scenarios.Scenario, res *Result) {
	t.Helper()
	model, stress, net := apertureSetting(t, s)
	var slipped, shadowed int
	for i, el := range res.Elements {
		if el.Fracture < 0 {
			continue
		}
		f := net.Fractures[el.Fracture]
		if math.Abs(res.NormalStress[i]-stress.Resolve(f.Normal).SigmaN) > 1e3 {
			shadowed++
		}
		patch := mechanics.Patch{Length: net.Traces[el.Trace].Length, Height: el.Height}
		unslipped := model.Aperture(res.NormalStress[i], res.Pressure[i], 0, patch)
		switch {
		case res.FirstSlip[i] == res.Duration:
			// Slipped in the last step: its dilation shows in the next.
		case res.Slip[i] == 0:
			numtest.Rel(t, "aperture of an element that never slipped", res.Aperture[i], unslipped, 1e-12)
		case res.Aperture[i] <= unslipped:
			t.Errorf("element %d slipped %.3g m but gained no aperture", i, res.Slip[i])
		default:
			slipped++
		}
	}
	if slipped == 0 {
		t.Error("no slipped element to check")
	}
	// Slip and opening change the normal stress on other fractures (stress
	// shadows; Crouch & Starfield 1983): some must have moved by > 1 kPa.
	if shadowed == 0 {
		t.Error("no fracture's normal stress changed: the stress shadows are missing")
	}
}

// The retained aperture of a fracture is what the closure and dilation law
// (Willis-Richards, Watanabe & Takahashi 1996) gives its elements back at
// the initial pore pressure and in-situ normal stress with their final
// slip, relative to the same without slip: no gain without slip, more
// with it.
func TestRetainedPermeabilityGain(t *testing.T) {
	s, res := runSmallPad(t)
	model, stress, net := apertureSetting(t, s)
	fractures, err := Fractures(s, net, res)
	if err != nil {
		t.Fatal(err)
	}
	p0 := stress.PorePressure()
	retained := map[int]float64{}
	for i, el := range res.Elements {
		if el.Fracture < 0 {
			continue
		}
		sn := stress.Resolve(net.Fractures[el.Fracture].Normal).SigmaN
		patch := mechanics.Patch{Length: net.Traces[el.Trace].Length, Height: el.Height}
		ratio := model.Aperture(sn, p0, res.Slip[i], patch) / model.Aperture(sn, p0, 0, patch)
		retained[el.Fracture] += res.InitialAperture[i] * ratio * el.Length
	}
	var gained int
	for _, f := range fractures {
		numtest.Rel(t, "retained aperture", f.RetainedAperture, retained[f.Fracture]/f.TraceLength, 1e-12)
		switch {
		case f.MaxSlip == 0 && f.RetainedPermeabilityGain != 1:
			t.Errorf("fracture %d never slipped but retains a gain of %g", f.Fracture, f.RetainedPermeabilityGain)
		case f.MaxSlip > 0 && !(f.RetainedPermeabilityGain > 1):
			t.Errorf("fracture %d slipped %.3g mm but retains a gain of %g", f.Fracture, f.MaxSlip*1e3, f.RetainedPermeabilityGain)
		case f.MaxSlip > 0:
			gained++
		}
	}
	if gained == 0 {
		t.Error("no slipped fracture to check")
	}
}

// Same scenario and seed → identical timeline.csv and events.csv (every
// draw is seeded, maps are iterated in order).
func TestDeterministic(t *testing.T) {
	write := func(s *scenarios.Scenario, res *Result) ([]byte, []byte) {
		var tl, ev bytes.Buffer
		if err := WriteTimeline(&tl, s, res); err != nil {
			t.Fatal(err)
		}
		if err := WriteEvents(&ev, s, res); err != nil {
			t.Fatal(err)
		}
		return tl.Bytes(), ev.Bytes()
	}
	tl1, ev1 := write(runSmallPad(t))
	s, _, res := runExample(t, "zipper-pad", smallPad...)
	tl2, ev2 := write(s, res)
	if !bytes.Equal(tl1, tl2) || !bytes.Equal(ev1, ev2) {
		t.Error("two runs of the same scenario and seed differ")
	}
	if !bytes.HasPrefix(tl1, []byte(TimelineHeader)) || !bytes.HasPrefix(ev1, []byte(EventsHeader)) {
		t.Error("headers")
	}
}

// A stage whose clusters meet no fracture is bad input that names the
// stage.
func TestStageTouchingNoFracture(t *testing.T) {
	src, err := scenarios.ExampleSource("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	src = bytes.Replace(src, []byte(`clusters = ["100 m"]`), []byte(`clusters = ["50 m"]`), 1)
	files := os.DirFS("../scenarios/examples")
	s, err := scenarios.Parse("single-fracture.toml", src, files)
	if err != nil {
		t.Fatal(err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), s, net, Options{})
	if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "stage V:1") {
		t.Fatalf("error %v, want a bad-input error naming stage V:1", err)
	}
}

// StimulatedArea rebuilds the run's headline area from the elements'
// stimulation times, and the stimulated cells kept for maps are the cells
// those elements pass through.
func TestStimulatedAreaMatchesRun(t *testing.T) {
	s, res := runSmallPad(t)
	stimulated := func(i int) bool { return !math.IsNaN(res.StimulatedAt[i]) }
	if got := StimulatedArea(res.Elements, stimulated, s.Numerics.StimulatedReach); got != res.StimulatedArea || got <= 0 {
		t.Errorf("rebuilt stimulated area %g m², the run reported %g m²", got, res.StimulatedArea)
	}
	if last := res.Timeline[len(res.Timeline)-1]; last.StimulatedArea != res.StimulatedArea {
		t.Errorf("last timeline row %g m², result %g m²", last.StimulatedArea, res.StimulatedArea)
	}
	g := s.MapGrid()
	var want []int
	for i, el := range res.Elements {
		if stimulated(i) {
			want = CellsAlong(want, g, el.P0, el.P1)
		}
	}
	slices.Sort(want)
	want = slices.Compact(want)
	if len(want) == 0 || !slices.Equal(want, res.Cells) {
		t.Errorf("rebuilt %d cells, the run counted %d", len(want), len(res.Cells))
	}
}

// The stimulated area of one element of length L is its stadium, 2rL +
// πr² (Steiner's formula for a convex body; Santaló 1976, Part I, ch. 1,
// from memory); two elements continuing one another count as one of
// their joint length, and a parallel element farther than 2r away adds a
// second stadium.
func TestStimulatedAreaGeometry(t *testing.T) {
	const r, l = 5.0, 10.0
	el := func(x0, y0, x1, y1 float64) Element {
		return Element{P0: r2.Vec{X: x0, Y: y0}, P1: r2.Vec{X: x1, Y: y1}, Length: math.Hypot(x1-x0, y1-y0)}
	}
	stadium := func(length float64) float64 { return 2*r*length + math.Pi*r*r }
	all := func(int) bool { return true }
	for _, c := range []struct {
		name     string
		elements []Element
		want     float64
	}{
		{"one element", []Element{el(0, 0, l, 0)}, stadium(l)},
		{"two in line", []Element{el(0, 0, l, 0), el(l, 0, 2*l, 0)}, stadium(2 * l)},
		{"two apart", []Element{el(0, 0, l, 0), el(0, 2*r+1, l, 2*r+1)}, 2 * stadium(l)},
		{"one slanted", []Element{el(100, 100, 100+l*0.6, 100+l*0.8)}, stadium(l)},
	} {
		numtest.Rel(t, c.name, StimulatedArea(c.elements, all, r), c.want, 1e-12)
	}
}

// Neither the cell size of the map grid nor the output interval changes
// any result: the stimulated area is a property of the stimulated elements
// alone, and output times do not shorten time steps.
func TestResultsIndependentOfDisplay(t *testing.T) {
	// A slip-weakening distance of 1 mm makes the example rupture (its
	// events follow the mesh then; here only their independence of the
	// display matters).
	_, _, base := runExample(t, "single-fracture", "rock.slip_weakening_distance=1 mm")
	_, _, fine := runExample(t, "single-fracture", "rock.slip_weakening_distance=1 mm", "numerics.cell_size=2.5 m", "numerics.output_interval=7 s")
	if base.StimulatedArea <= 0 || fine.StimulatedArea != base.StimulatedArea {
		t.Errorf("stimulated area %g m² at the default cell size, %g m² at 2.5 m cells and another output interval",
			base.StimulatedArea, fine.StimulatedArea)
	}
	if len(base.Events) == 0 || len(fine.Events) != len(base.Events) || fine.SeismicMoment != base.SeismicMoment ||
		fine.AseismicMoment != base.AseismicMoment || fine.PeakBHP != base.PeakBHP || fine.Steps != base.Steps {
		t.Errorf("with another output interval: %d events, moments %g and %g N·m, peak BHP %g Pa, %d steps; at the default %d, %g and %g N·m, %g Pa, %d steps",
			len(fine.Events), fine.SeismicMoment, fine.AseismicMoment, fine.PeakBHP, fine.Steps,
			len(base.Events), base.SeismicMoment, base.AseismicMoment, base.PeakBHP, base.Steps)
	}
	if len(fine.Cells) <= len(base.Cells) {
		t.Errorf("%d cells at 2.5 m against %d at the default: the grid did not change", len(fine.Cells), len(base.Cells))
	}
}

// CellsAlong visits each cell a segment passes through once, in order
// (Amanatides & Woo 1987); cases checked by hand.
func TestCellsAlong(t *testing.T) {
	g := scenarios.Grid{Cols: 4, Rows: 3, CellSize: 10, XMin: 0, YMin: 0}
	tests := []struct {
		name string
		a, b r2.Vec
		want []int
	}{
		{"within one cell", r2.Vec{X: 1, Y: 1}, r2.Vec{X: 9, Y: 9}, []int{0}},
		{"along a row", r2.Vec{X: 5, Y: 5}, r2.Vec{X: 35, Y: 5}, []int{0, 1, 2, 3}},
		{"backwards", r2.Vec{X: 35, Y: 15}, r2.Vec{X: 5, Y: 15}, []int{7, 6, 5, 4}},
		{"diagonal steps", r2.Vec{X: 5, Y: 5}, r2.Vec{X: 25, Y: 12}, []int{0, 1, 5, 6}},
		{"clipped to the grid", r2.Vec{X: -15, Y: 25}, r2.Vec{X: 15, Y: 25}, []int{8, 9}},
		{"outside", r2.Vec{X: -15, Y: -5}, r2.Vec{X: -1, Y: -5}, nil},
	}
	for _, tc := range tests {
		got := CellsAlong(nil, g, tc.a, tc.b)
		if fmt.Sprint(got) != fmt.Sprint(tc.want) {
			t.Errorf("%s: cells %v, want %v", tc.name, got, tc.want)
		}
	}
}

// events.csv reads back to the same events (at the printed precision).
func TestEventsRoundTrip(t *testing.T) {
	s, res := runSmallPad(t)
	if len(res.Events) == 0 {
		t.Fatal("the small demo has no events: the round trip would compare nothing")
	}
	checkCatalogueRoundTrip(t, s, res, false)
	for _, bad := range []string{"", "a,b\n", EventsHeader + "\n1,2,3,4,5,NOPE:1,7,8,9,10\n", EventsHeader + "\n1,2,3,4,x,W1:1,7,8,9,10\n"} {
		if _, err := ReadEvents(strings.NewReader(bad), "events.csv", s); err == nil {
			t.Errorf("accepted %q", bad)
		}
	}
}

func FuzzReadEvents(f *testing.F) {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		f.Fatal(err)
	}
	f.Add([]byte(EventsHeader + "\n12.5,1,2,2600,3,W1:1,0.1,100,1.5e9,0.05\n"))
	f.Add([]byte(RateEventsHeader + "\n12.5,1,2,2600,3,W1:1,,,1.5e6,-1.9\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		// The sub-resolution reader (rate_events.csv, same columns) reads
		// the same input: its events round-trip too.
		if sub, err := ReadRateEvents(bytes.NewReader(data), "fuzz.csv", s); err == nil {
			checkCatalogueRoundTrip(t, s, &Result{RateEvents: sub}, true)
		}
		if events, err := ReadEvents(bytes.NewReader(data), "fuzz.csv", s); err == nil {
			checkCatalogueRoundTrip(t, s, &Result{Events: events}, false)
		}
	})
}

// checkCatalogueRoundTrip writes res's ruptures (or, with sub, its
// sub-resolution events) as the run does and reads them back: the same
// events at the printed precision. It returns the events read.
func checkCatalogueRoundTrip(t *testing.T, s *scenarios.Scenario, res *Result, sub bool) []Event {
	t.Helper()
	write, read, events := WriteEvents, ReadEvents, res.Events
	if sub {
		write, read, events = WriteRateEvents, ReadRateEvents, res.RateEvents
	}
	var b bytes.Buffer
	if err := write(&b, s, res); err != nil {
		t.Fatal(err)
	}
	again, err := read(bytes.NewReader(b.Bytes()), "again.csv", s)
	if err != nil || len(again) != len(events) {
		t.Fatalf("%d events written do not read back (%d read): %v", len(events), len(again), err)
	}
	for i := range again {
		checkEventsEqual(t, i, again[i], events[i])
	}
	return again
}

// Tolerances of a value written to a CSV file and read back: printed with
// d decimals ('f'), it reads back within half a unit of its last decimal;
// printed with d digits after the first ('e'), within half a unit relative
// to its size. printRoundOff adds a few ulps for the parse back to binary
// and for the MPa ↔ Pa scaling of the pressures.
func fixedTol(v float64, decimals int) float64 {
	return 0.5*math.Pow10(-decimals) + printRoundOff(v)
}

func sciTol(v float64, digits int) float64 {
	return 0.5*math.Pow10(-digits)*math.Abs(v) + printRoundOff(v)
}

func printRoundOff(v float64) float64 {
	a := math.Abs(v)
	return 4 * (a - math.Nextafter(a, 0))
}

// checkPrinted compares a value read back from a CSV file with the value
// written (NaN, written as an empty field, must stay NaN).
func checkPrinted(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.IsNaN(want) || math.IsNaN(got) {
		if !math.IsNaN(want) || !math.IsNaN(got) {
			t.Errorf("%s = %g, want %g", what, got, want)
		}
		return
	}
	numtest.Abs(t, what, got, want, tol)
}

// checkEventsEqual compares event i as read back with the event written,
// at the precision of WriteEvents: time, position and area 3 decimals,
// slip and moment 7 significant digits, magnitude 4 decimals; the integer
// fields exactly. The trace index is not written (it reads as −1).
func checkEventsEqual(t *testing.T, i int, got, want Event) {
	t.Helper()
	if got.Fracture != want.Fracture || got.Stage != want.Stage {
		t.Fatalf("event %d: fracture %d stage %d, want %d and %d", i, got.Fracture, got.Stage, want.Fracture, want.Stage)
	}
	for _, c := range []struct {
		name           string
		got, want, tol float64
	}{
		{"time", got.Time, want.Time, fixedTol(want.Time, 3)},
		{"x", got.X, want.X, fixedTol(want.X, 3)},
		{"y", got.Y, want.Y, fixedTol(want.Y, 3)},
		{"depth", got.Depth, want.Depth, fixedTol(want.Depth, 3)},
		{"slip", got.Slip, want.Slip, sciTol(want.Slip, 6)},
		{"area", got.Area, want.Area, fixedTol(want.Area, 3)},
		{"moment", got.Moment, want.Moment, sciTol(want.Moment, 6)},
		{"magnitude", got.Magnitude, want.Magnitude, fixedTol(want.Magnitude, 4)},
	} {
		checkPrinted(t, fmt.Sprintf("event %d %s", i, c.name), c.got, c.want, c.tol)
	}
}

// checkSamplesEqual compares timeline row i as read back with the row
// written, at the precision of WriteTimeline: time 3 decimals, rate 7
// significant digits, volume and pressures (MPa) 6 decimals, areas 1
// decimal; the integer fields exactly.
func checkSamplesEqual(t *testing.T, i int, got, want Sample) {
	t.Helper()
	if got.Stage != want.Stage || got.SlippedElements != want.SlippedElements || got.Events != want.Events {
		t.Fatalf("row %d: stage %d, %d slipped elements, %d events; want %d, %d, %d", i,
			got.Stage, got.SlippedElements, got.Events, want.Stage, want.SlippedElements, want.Events)
	}
	for _, c := range []struct {
		name           string
		got, want, tol float64
	}{
		{"time", got.Time, want.Time, fixedTol(want.Time, 3)},
		{"rate", got.Rate, want.Rate, sciTol(want.Rate, 6)},
		{"injected", got.Injected, want.Injected, fixedTol(want.Injected, 6)},
		{"bhp MPa", got.BHP / 1e6, want.BHP / 1e6, fixedTol(want.BHP/1e6, 6)},
		{"stimulated area", got.StimulatedArea, want.StimulatedArea, fixedTol(want.StimulatedArea, 1)},
		{"fracture area", got.FractureArea, want.FractureArea, fixedTol(want.FractureArea, 1)},
		{"max pressure MPa", got.MaxPressure / 1e6, want.MaxPressure / 1e6, fixedTol(want.MaxPressure/1e6, 6)},
		{"seismic moment", got.SeismicMoment, want.SeismicMoment, sciTol(want.SeismicMoment, 6)},
		{"aseismic moment", got.AseismicMoment, want.AseismicMoment, sciTol(want.AseismicMoment, 6)},
	} {
		checkPrinted(t, fmt.Sprintf("row %d %s", i, c.name), c.got, c.want, c.tol)
	}
}

// timeline.csv and the stages of summary.json read back.
func TestTimelineAndStagesRoundTrip(t *testing.T) {
	s, res := runSmallPad(t)
	var b bytes.Buffer
	if err := WriteTimeline(&b, s, res); err != nil {
		t.Fatal(err)
	}
	got, err := ReadTimeline(bytes.NewReader(b.Bytes()), "timeline.csv", s)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Timeline) == 0 {
		t.Fatal("the small demo has no timeline: the round trip would compare nothing")
	}
	if len(got) != len(res.Timeline) {
		t.Fatalf("%d rows read, %d written", len(got), len(res.Timeline))
	}
	for i := range got {
		checkSamplesEqual(t, i, got[i], res.Timeline[i])
	}
	b.Reset()
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteSummary(&b, s, net, res, nil); err != nil {
		t.Fatal(err)
	}
	sum, err := ReadSummary(bytes.NewReader(b.Bytes()), "summary.json")
	if err != nil || len(sum.Stages) != len(res.Stages) {
		t.Fatalf("stages: %v, %d of %d", err, len(sum.Stages), len(res.Stages))
	}
	numtest.Abs(t, "stage start", sum.Stages[1].Start, res.Stages[1].Start, 0)
	if sum.Growth != nil {
		t.Errorf("growth %+v read back from a run whose fractures do not grow", sum.Growth)
	}
	if _, err := ReadTimeline(strings.NewReader(TimelineHeader+"\n5,,0,0,,0,0,0,0,0,31\n1,,0,0,,0,0,0,0,0,31\n"), "t.csv", s); err == nil {
		t.Error("a timeline going back in time was accepted")
	}
}

func FuzzReadTimeline(f *testing.F) {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		f.Fatal(err)
	}
	f.Add([]byte(TimelineHeader + "\n0,,,0,31.2,0,0,0,0,0,31.2,0,0\n300,W1:1,2.6e-02,7.9,49.1,100.0,250.0,3000.0,4,7,49.1,2.5e+10,1.0e+12\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		rows, err := ReadTimeline(bytes.NewReader(data), "fuzz.csv", s)
		if err != nil {
			return
		}
		var b bytes.Buffer
		if err := WriteTimeline(&b, s, &Result{Timeline: rows}); err != nil {
			t.Fatal(err)
		}
		again, err := ReadTimeline(bytes.NewReader(b.Bytes()), "again.csv", s)
		if err != nil || len(again) != len(rows) {
			t.Fatalf("written timeline does not read back: %v", err)
		}
		for i := range again {
			checkSamplesEqual(t, i, again[i], rows[i])
		}
	})
}

// Slip found in an attempt that the pressure cap discards must not carry
// into the capped attempt: with the cap (30 MPa) below the critical
// pressure (p0 + Δp_c = 33.51 MPa), nothing may slip.
func TestCapAttemptLeavesNoSlip(t *testing.T) {
	_, _, res := runExample(t, "single-fracture", "schedule.control=rate", "schedule.rate=100 bbl/min",
		"schedule.pressure_cap=30 MPa", "rock.friction_residual=0.1", "numerics.element_length=20 m")
	if len(res.Events) != 0 || res.PeakBHP > 30e6*(1+1e-12) {
		t.Errorf("%d events, peak BHP %.6g MPa with the cap at 30 MPa", len(res.Events), res.PeakBHP/1e6)
	}
}

// An element length too short for the network is refused before the mesh
// is built, not by running out of memory. (The scenario's range already
// refuses 0.1 mm; the simulator guards callers that skip validation.)
func TestElementCap(t *testing.T) {
	s, err := scenarios.LoadExample("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	s.Numerics.ElementLength = 1e-4
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), s, net, Options{})
	if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "numerics.element_length") {
		t.Errorf("error %v", err)
	}
}

// A run that needs more accepted steps than numerics.max_steps stops with
// ErrTooManySteps. The scenario check counts only the schedule length over
// time_step_max (60 s / 0.5 s = 120 steps for single-fracture), so 120
// passes it; the run starts at time_step_initial = 0.05 s and grows its
// steps from there, so it needs more than 120.
func TestMaxStepsStopsRun(t *testing.T) {
	ov, err := scenarios.ParseOverrides([]string{"numerics.max_steps=120", "numerics.element_length=40 m"})
	if err != nil {
		t.Fatal(err)
	}
	s, err := scenarios.LoadExample("single-fracture", ov...)
	if err != nil {
		t.Fatalf("max_steps = 120 is refused up front, so the run-time stop is not reached: %v", err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), s, net, Options{})
	if !errors.Is(err, ErrTooManySteps) || !strings.Contains(err.Error(), "numerics.max_steps = 120") {
		t.Fatalf("error %v, want ErrTooManySteps naming numerics.max_steps = 120", err)
	}
	if res == nil {
		t.Fatal("no result: the steps run before the stop are lost")
	}
	if res.Steps != 120 {
		t.Errorf("stopped after %d accepted steps, want 120", res.Steps)
	}
}
