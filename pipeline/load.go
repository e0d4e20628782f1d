package pipeline

import (
	"math"
	"os"
	"path/filepath"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/scenarios"
	"slipfront/sim"
	"slipfront/snapshot"
)

// IsRunDir reports whether dir holds a run (a resolved scenario and a
// snapshot).
func IsRunDir(dir string) bool { return exists(dir, ScenarioFile) && exists(dir, SnapshotFile) }

// exists reports whether dir/name exists.
func exists(dir, name string) bool {
	_, err := os.Stat(filepath.Join(dir, name))
	return err == nil
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
	rd, err := snapshot.Open(filepath.Join(dir, SnapshotFile))
	if err != nil {
		return nil, err
	}
	defer rd.Close()
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
	res, times, err := sim.Replay(rd.Reader, t)
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
