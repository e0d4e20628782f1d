package sim

import (
	"bytes"
	"context"
	"math"
	"testing"

	"slipfront/scenarios"
	"slipfront/snapshot"
)

// The Coulomb stress change of a slipped fault on planes parallel to it,
// slipping in its own sense, rises off the ends of the slipped patch and
// falls beside its middle: the lobes of King, Stein & Lin (1994, Fig. 1).
// The single-fracture example slips an east–west fault from its west end.
func TestCoulombChangeMapLobes(t *testing.T) {
	s, _, res := runExample(t, "single-fracture")
	west, east := slipExtent(res, 0.5)
	var mean float64
	for i := range res.Elements {
		mean += res.ShearSlip[i]
	}
	if west > 0 || !(east > 100) || mean == 0 {
		t.Fatalf("slip reaches %.0f m west and %.0f m east (Σ slip %g m): want a patch east of the well", west, east, mean)
	}
	sense := "right-lateral"
	if mean < 0 {
		sense = "left-lateral"
	}
	parallel := *s
	parallel.Coulomb = scenarios.Coulomb{Receiver: "strike", ReceiverStrike: math.Pi / 2, ReceiverSense: sense,
		EffectiveFriction: s.Coulomb.EffectiveFriction}
	cfs, err := CoulombChangeMap(&parallel, res)
	if err != nil {
		t.Fatal(err)
	}
	g := s.MapGrid()
	at := func(x, y float64) float64 {
		k, ok := g.CellAt(x, y)
		if !ok {
			t.Fatalf("(%g, %g) m is off the map", x, y)
		}
		return cfs[k]
	}
	// Ahead of the east tip, just off the fault plane (cell centres lie
	// 5 m north and south of it), and beside the middle of the patch
	// within a fault height (100 m; farther, the finite height lets the
	// shadow fade).
	if v := at(east+20, 4); !(v > 0) {
		t.Errorf("ΔCFS 20 m beyond the slipped patch = %.3g Pa, want > 0", v)
	}
	for _, y := range []float64{4, 14} {
		if v := at(east/2, y); !(v < 0) {
			t.Errorf("ΔCFS %g m beside the middle of the patch = %.3g Pa, want < 0 (stress shadow)", y+1, v)
		}
	}
	var nan int
	for _, v := range cfs {
		if math.IsNaN(v) {
			nan++
		}
	}
	if nan > len(cfs)/100 {
		t.Errorf("%d of %d cells are NaN", nan, len(cfs))
	}
}

// Each element's Coulomb stress change is recorded in every frame and
// replays as run (to the snapshot's float32); the slipped fault's own
// elements see it change.
func TestCoulombChangeRecorded(t *testing.T) {
	s, err := scenarios.LoadExample("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	res, back := runAndReplay(t, s)
	var changed int
	for i, want := range res.CoulombChange {
		if d := math.Abs(back.CoulombChange[i] - want); d > 1e-6*math.Abs(want)+1e-3 {
			t.Fatalf("element %d: replayed ΔCFS %.7g Pa, run %.7g Pa", i, back.CoulombChange[i], want)
		}
		if math.Abs(want) > 1e3 {
			changed++
		}
	}
	if changed == 0 {
		t.Error("no element's Coulomb stress changed by more than 1 kPa")
	}
}

// runAndReplay runs realization 0 of s with a recorder and returns the
// result and the result replayed from the snapshot at its end.
func runAndReplay(t *testing.T, s *scenarios.Scenario) (res, back *Result) {
	t.Helper()
	var buf bytes.Buffer
	rec := NewRecorder(&buf, s, 0)
	res, err := Run(context.Background(), s, mustNetwork(t, s), Options{Begin: rec.Begin, Frame: rec.Frame})
	if err != nil {
		t.Fatal(err)
	}
	if err := rec.Close(); err != nil {
		t.Fatal(err)
	}
	rd, err := snapshot.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	if back, _, err = Replay(rd, res.Duration); err != nil {
		t.Fatal(err)
	}
	return res, back
}
