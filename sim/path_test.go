package sim

import (
	"bytes"
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
	"slipfront/snapshot"
)

// Two fractures growing at once from clusters 20 m apart curve away from
// each other, the more the smaller the horizontal stress difference, as
// published for simultaneously growing parallel hydraulic fractures
// (Olson 2008, ARMA 08-327; Wu & Olson 2015, SPE J. 20(2), 337–346: the
// outer fractures of a stage turn outward, less so as SHmax − Shmin grows;
// both from memory, compared by sign and trend only). Alone, a fracture
// grows straight along SHmax. The passes converge: each one's turns are
// smaller than the one before's, and the last is within 1°.
func TestGrowthPathsTurnAway(t *testing.T) {
	run := func(clusters, shmax string) *Result {
		t.Helper()
		s := knownFractures(t, "far,-190,-190,2600,90,0,10,200\n", "numerics.interaction=on", "numerics.path_passes=3",
			"wells[0].stages[0].clusters="+clusters, "stress.shmax_gradient="+shmax+" kPa/m", "rock.fracture_toughness=3 MPa.m^0.5")
		_, res := runScenario(t, s)
		if len(res.PathPasses) != 3 {
			t.Fatalf("%d path passes reported, want 3", len(res.PathPasses))
		}
		for k, p := range res.PathPasses {
			if p.Advances == 0 {
				t.Fatalf("pass %d: no tip advanced", k+1)
			}
			if prev := res.PathPasses[max(k-1, 0)].RMSTurn; k > 0 && prev > 0 && !(p.RMSTurn < prev) {
				t.Errorf("pass %d: rms turn %.3g rad, not below the pass before's %.3g", k+1, p.RMSTurn, prev)
			}
		}
		if last := res.PathPasses[2]; !(last.MaxTurn < math.Pi/180) {
			t.Errorf("last pass: largest turn %.3g°, want < 1°", last.MaxTurn*180/math.Pi)
		}
		if res.MassBalanceError > 1e-8 {
			t.Errorf("mass-balance error %.3g", res.MassBalanceError)
		}
		return res
	}
	alone := run(`["150 m"]`, "18.54")
	for _, p := range alone.PathPasses {
		if p.MaxTurn > 1e-12 {
			t.Errorf("alone: turned by %.3g rad", p.MaxTurn)
		}
	}
	for _, e := range alone.Elements {
		if e.Set == ConduitSet && (e.P0.X != 0 || e.P1.X != 0) {
			t.Fatalf("alone: an element from %v to %v is off the line x = 0", e.P0, e.P1)
		}
	}
	// Clusters at x = −10 and +10 m; SHmax is north. The outward offset of
	// the ends of each conduit's path (which continues each fracture's
	// last heading) from its cluster, m.
	var offsets []float64
	for _, shmax := range []string{"18.54", "18.7", "19.5"} { // SHmax − Shmin = 0.10, 0.52, 2.6 MPa
		res := run(`["140 m", "160 m"]`, shmax)
		var out [2]float64
		for c, cd := range res.Conduits {
			sense := []float64{-1, 1}[c]
			for _, end := range [2]float64{cd.P0.X, cd.P1.X} {
				out[c] += sense * (end - sense*10) / 2
			}
		}
		t.Logf("SHmax gradient %s kPa/m: ends %.3f m and %.3f m outward; passes %+v", shmax, out[0], out[1], res.PathPasses)
		numtest.Abs(t, "mirror symmetry, m", out[0], out[1], 1e-3)
		if !(out[0] > 0) {
			t.Errorf("SHmax gradient %s kPa/m: the fractures turn %.3f m towards each other", shmax, out[0])
		}
		offsets = append(offsets, out[0])
	}
	if !(offsets[0] > offsets[1] && offsets[1] > offsets[2]) {
		t.Errorf("outward offsets %v m do not fall as the stress difference grows", offsets)
	}
}

// A fracture growing past a pressurised neighbour curves away from it
// (the interacting fractures of the studies above, grown one after the
// other, as a zipper partner's or a later stage's are): stage 1 grows a
// fracture at x = −10 m and stays pressurised (no shut-in), then stage 2
// grows one at x = +10 m, which turns east, away from it; the first, grown
// alone, stays straight.
func TestGrowthPathTurnsFromPressurisedNeighbour(t *testing.T) {
	twoStages := func(src string) string {
		old := "  [[wells.stages]]\n  name = \"1\"\n  clusters = [\"150 m\"]\n"
		if !strings.Contains(src, old) {
			t.Fatal("test bug: kgd-toughness's stage has changed")
		}
		return strings.Replace(src, old, old[:len(old)-len("[\"150 m\"]\n")]+"[\"140 m\"]\n  [[wells.stages]]\n  name = \"2\"\n  clusters = [\"160 m\"]\n", 1)
	}
	s := editedCase(t, "far,-190,-190,2600,90,0,10,200\n", twoStages, "numerics.interaction=on", "numerics.path_passes=3",
		"stress.shmax_gradient=18.7 kPa/m", "rock.fracture_toughness=3 MPa.m^0.5", "schedule.duration=30 s")
	_, res := runScenario(t, s)
	if len(res.Stages) != 2 || len(res.Conduits) != 2 {
		t.Fatalf("%d stages and %d conduits, want 2 and 2", len(res.Stages), len(res.Conduits))
	}
	// The outward (away from the other) offset of each conduit's ends from
	// its cluster, m.
	var out [2]float64
	for c, cd := range res.Conduits {
		sense := []float64{-1, 1}[c]
		for _, end := range [2]float64{cd.P0.X, cd.P1.X} {
			out[c] += sense * (end - sense*10) / 2
		}
	}
	t.Logf("outward offsets: first %.3g m, second %.3g m; passes %+v", out[0], out[1], res.PathPasses)
	if !(out[1] > 1) {
		t.Errorf("the second fracture ends %.3g m away from the first, want > 1 m", out[1])
	}
	if !(math.Abs(out[0]) < 0.05*out[1]) {
		t.Errorf("the first fracture, grown alone, ends %.3g m off its line (the second %.3g m)", out[0], out[1])
	}
	if last := res.PathPasses[len(res.PathPasses)-1]; !(last.MaxTurn < math.Pi/180) {
		t.Errorf("last pass: largest turn %.3g°, want < 1°", last.MaxTurn*180/math.Pi)
	}
	if res.MassBalanceError > 1e-8 {
		t.Errorf("mass-balance error %.3g", res.MassBalanceError)
	}
}

// Re-initiated branches turn as the fractures do: in the case of
// TestGrowthReinitiatesAfterArrest with the interaction on, the four
// branches that start at the natural fractures' ends (±20, ±6) m and grow
// north and south turn away from the pressurised fracture between them,
// mirror-symmetrically; their paths end more than 2 m outward after three
// passes (straight, they end at x = ±20 m), and the passes converge.
func TestGrowthBranchesTurn(t *testing.T) {
	s := knownFractures(t, "north,0,6,2600,90,0,40,200\nsouth,0,-6,2600,90,0,40,200\n",
		"stress.shmax_gradient=18.8 kPa/m", "numerics.interaction=on", "numerics.path_passes=3")
	_, res := runScenario(t, s)
	var branches int
	for _, cd := range res.Conduits {
		if !cd.IsBranch() {
			continue
		}
		branches++
		if !(math.Abs(cd.P1.X)-math.Abs(cd.P0.X) > 2) || math.Abs(cd.P0.X) != 20 {
			t.Errorf("a branch from %v ends at %v: want more than 2 m farther from x = 0", cd.P0, cd.P1)
		}
		numtest.Abs(t, "mirror symmetry, m", math.Abs(cd.P1.X), math.Abs(res.Conduits[len(res.Conduits)-1].P1.X), 1e-3)
	}
	if branches != 4 {
		t.Fatalf("%d branches, want 4", branches)
	}
	var again int
	for _, c := range res.Crossings {
		if c.Outcome == Reinitiated {
			again++
		}
	}
	if again != 4 {
		t.Errorf("%d re-initiations, want 4", again)
	}
	for k, p := range res.PathPasses[1:] {
		if !(p.RMSTurn < res.PathPasses[k].RMSTurn) {
			t.Errorf("pass %d: rms turn %.3g rad, not below the pass before's %.3g", k+2, p.RMSTurn, res.PathPasses[k].RMSTurn)
		}
	}
	if last := res.PathPasses[2]; !(last.MaxTurn < math.Pi/180) {
		t.Errorf("last pass: largest turn %.3g°, want < 1°", last.MaxTurn*180/math.Pi)
	}
	if res.MassBalanceError > 1e-8 {
		t.Errorf("mass-balance error %.3g", res.MassBalanceError)
	}
}

// Each path pass records its own frames: a run interrupted in a pass
// before the last keeps that pass's frames so far, in a snapshot that
// starts over with the pass's mesh, and returns that pass's result with
// an error naming the pass.
func TestPathPassInterruptedKeepsItsFrames(t *testing.T) {
	s := knownFractures(t, "far,-190,-190,2600,90,0,10,200\n",
		"numerics.interaction=on", "numerics.path_passes=3", "schedule.duration=30 s")
	net := mustNetwork(t, s)
	name := filepath.Join(t.TempDir(), "run.snap")
	f, err := os.Create(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rec := NewRecorder(f, s, 0)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var begins, frames, elements int
	opt := Options{
		Begin: func(el []Element) error {
			begins++
			frames, elements = 0, len(el)
			return rec.Begin(el)
		},
		Frame: func(fr *Frame) error {
			frames++
			if begins == 2 && frames == 3 {
				cancel()
			}
			return rec.Frame(fr)
		},
	}
	res, err := Run(ctx, s, net, opt)
	if !errors.Is(err, context.Canceled) || !strings.Contains(err.Error(), "path pass 2 of 3") {
		t.Fatalf("error %v, want the cancellation in path pass 2 of 3", err)
	}
	if res == nil || len(res.PathPasses) != 2 {
		t.Fatalf("result %v, want the second pass's, with two passes' turns", res)
	}
	if err := rec.Close(); err != nil {
		t.Fatal(err)
	}
	rd, err := snapshot.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer rd.Close()
	if n, m := len(rd.Frames()), len(rd.Header().Elements); n != frames || m != elements || n < 3 {
		t.Errorf("snapshot: %d frames of %d elements, want the second pass's %d of %d", n, m, frames, elements)
	}
}

// A recording can start over only in a file: a second Begin on a writer
// that cannot be truncated is an error, not a snapshot with two headers.
func TestRecorderBeginAgainNeedsAFile(t *testing.T) {
	s := knownFractures(t, "far,-190,-190,2600,90,0,10,200\n")
	var buf bytes.Buffer
	rec := NewRecorder(&buf, s, 0)
	el := []Element{{P0: r2.Vec{X: 0}, P1: r2.Vec{X: 1}, Height: 10, Length: 1}}
	if err := rec.Begin(el); err != nil {
		t.Fatal(err)
	}
	if err := rec.Begin(el); err == nil || !strings.Contains(err.Error(), "needs a file") {
		t.Errorf("second Begin on a buffer: %v, want an error that it needs a file", err)
	}
}

// relaxPlan relaxes the passes as Aitken's factor does a fixed-point
// iteration (Irons & Tuck 1969): on a path whose heading met is
// G(x) = b − 1.2·x for a path direction x (angles, radians: a tip whose
// own turn moves the stress that turns it, the more so), the plain passes
// x ← G(x) alternate and grow (gain −1.2), while the relaxed ones take
// ω = 1/2.2 after the second pass and reach the fixed point b/2.2, where
// the turns vanish (to round-off, on which ω then wanders), by the fourth.
// Every heading of a pass turns by the same ω times its own turn.
func TestRelaxPlanDampsAlternatingPasses(t *testing.T) {
	const b = 0.05
	met := func(x float64) float64 { return b - 1.2*x }
	// pass records the headings met along paths whose directions are x.
	pass := func(x []float64) *pathPlan {
		var side []heading
		for i, xi := range x {
			g := met(xi)
			side = append(side, heading{s: float64(i), dir: r2.Vec{X: math.Cos(g), Y: math.Sin(g)},
				path: r2.Vec{X: math.Cos(xi), Y: math.Sin(xi)}, turn: g - xi})
		}
		return &pathPlan{clusters: [][2][]heading{{side, nil}}, branches: map[branchKey][]heading{}}
	}
	angles := func(p *pathPlan) []float64 {
		var x []float64
		for _, h := range p.clusters[0][0] {
			x = append(x, math.Atan2(h.dir.Y, h.dir.X))
		}
		return x
	}
	start := []float64{0, 0.01, -0.02}
	plain, relaxed := start, start
	var prev *pathPlan
	omega := 1.0
	for k := 1; k <= 4; k++ {
		plain = angles(pass(plain))
		next := pass(relaxed)
		omega = relaxPlan(prev, next, omega)
		if k == 2 {
			numtest.Rel(t, "Aitken's factor after the second pass", omega, 1/2.2, 1e-9)
		}
		relaxed, prev = angles(next), next
	}
	for i := range start {
		numtest.Abs(t, "relaxed path direction after four passes", relaxed[i], b/2.2, 1e-12)
		if !(math.Abs(plain[i]-b/2.2) > math.Abs(start[i]-b/2.2)) {
			t.Errorf("plain passes moved path %d from %.3g to %.3g, closer to the fixed point %.3g: want them to diverge", i, start[i], plain[i], b/2.2)
		}
	}
}
