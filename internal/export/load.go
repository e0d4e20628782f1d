package export

import (
	"fmt"
	"math"
	"os"
	"path/filepath"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/scenarios"
	"slipfront/sim"
	"slipfront/snapshot"
)

// Run folder files read back by LoadRun.
const (
	ScenarioFile = "scenario.json"
	SnapshotFile = "run.snap"
	EventsFile   = "events.csv"
)

// IsRunDir reports whether dir holds a run (a resolved scenario and a
// snapshot).
func IsRunDir(dir string) bool {
	for _, f := range []string{ScenarioFile, SnapshotFile} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			return false
		}
	}
	return true
}

// LoadRun reads a run folder back at time t, s (NaN: the last frame): the
// resolved scenario, the network (generated again from its seed), the
// state of the snapshot frame at or before t and the events up to it.
// First-slip and stimulation times are those of the first frame that
// shows them, so they are known to the output interval.
func LoadRun(dir string, t float64) (*Run, error) {
	s, err := readScenario(filepath.Join(dir, ScenarioFile))
	if err != nil {
		return nil, err
	}
	f, err := os.Open(filepath.Join(dir, SnapshotFile))
	if err != nil {
		return nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, err
	}
	rd, err := snapshot.NewReader(f, info.Size())
	if err != nil {
		return nil, fmt.Errorf("%s: %w", SnapshotFile, err)
	}
	frames := rd.Frames()
	if len(frames) == 0 {
		return nil, badinput.Errorf("%s holds no frames", filepath.Join(dir, SnapshotFile))
	}
	last := frames[len(frames)-1].Time
	if math.IsNaN(t) {
		t = last
	}
	if t < frames[0].Time || t > last {
		return nil, badinput.Errorf("time %g s is outside the run: its frames span %g s to %g s", t, frames[0].Time, last)
	}
	h := rd.Header()
	if h.Digest != s.Digest {
		return nil, badinput.Errorf("%s belongs to scenario %.12s…, but %s is scenario %.12s…: the folder mixes two runs",
			SnapshotFile, h.Digest, ScenarioFile, s.Digest)
	}
	net, err := dfn.Generate(s, h.Realization)
	if err != nil {
		return nil, err
	}
	for i, e := range h.Elements {
		if int(e.Fracture) >= len(net.Fractures) {
			return nil, badinput.Errorf("%s: element %d names fracture %d, but the network has %d", SnapshotFile, i, e.Fracture, len(net.Fractures))
		}
	}
	res, times, err := replay(rd, &h, t)
	if err != nil {
		return nil, err
	}
	ef, err := os.Open(filepath.Join(dir, EventsFile))
	if err != nil {
		return nil, err
	}
	defer ef.Close()
	events, err := sim.ReadEvents(ef, EventsFile, s)
	if err != nil {
		return nil, err
	}
	for _, e := range events {
		if e.Time <= t {
			res.Events = append(res.Events, e)
		}
	}
	return &Run{Scenario: s, Network: net, Result: res, Time: t, OutlineTimes: times}, nil
}

func readScenario(path string) (*scenarios.Scenario, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return scenarios.ReadResolved(f, path)
}

// replay reads the frames up to time t into a result: the state of the
// last of them, and the first frame at which each element had slipped and
// was stimulated.
func replay(rd *snapshot.Reader, h *snapshot.Header, t float64) (*sim.Result, []float64, error) {
	n := len(h.Elements)
	res := &sim.Result{
		Elements: make([]sim.Element, n), FirstSlip: nanSlice(n), FirstSlipStage: make([]int, n),
		StimulatedAt: nanSlice(n), Stimulated: make([]bool, n),
	}
	var sets []int32
	for _, st := range h.Static {
		if st.Name == "set" {
			sets = st.Values
		}
	}
	for i, e := range h.Elements {
		el := sim.Element{Trace: -1, Fracture: int(e.Fracture), Set: sim.ConduitSet,
			P0: r2.Vec{X: e.X0, Y: e.Y0}, P1: r2.Vec{X: e.X1, Y: e.Y1}, Length: e.Length, Height: e.Height}
		if sets != nil {
			el.Set = int(sets[i])
		}
		res.Elements[i] = el
		res.FirstSlipStage[i] = -1
	}
	fields := [3]int{h.FieldIndex(snapshot.FieldPressure), h.FieldIndex(snapshot.FieldAperture), h.FieldIndex(snapshot.FieldSlip)}
	for _, k := range fields {
		if k < 0 {
			return nil, nil, fmt.Errorf("%s lacks a pressure, aperture or slip field", SnapshotFile)
		}
	}
	var times []float64
	var fr snapshot.Frame
	for i, info := range rd.Frames() {
		if info.Time > t {
			break
		}
		if err := rd.ReadFrameInto(&fr, i); err != nil {
			return nil, nil, err
		}
		times = append(times, info.Time)
		for j, flag := range fr.Flags {
			if flag&snapshot.FlagSlipped != 0 && math.IsNaN(res.FirstSlip[j]) {
				res.FirstSlip[j], res.FirstSlipStage[j] = info.Time, int(info.Stage)
			}
			if flag&snapshot.FlagStimulated != 0 && math.IsNaN(res.StimulatedAt[j]) {
				res.StimulatedAt[j], res.Stimulated[j] = info.Time, true
			}
		}
		if i == 0 {
			res.InitialAperture = float64s(fr.Fields[fields[1]])
		}
		res.Pressure, res.Aperture, res.Slip = float64s(fr.Fields[fields[0]]), float64s(fr.Fields[fields[1]]), float64s(fr.Fields[fields[2]])
	}
	return res, times, nil
}

func nanSlice(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.NaN()
	}
	return v
}

func float64s(v []float32) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}
