package pipeline

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
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
// state of the last intact snapshot frame at or before t and the events up
// to it. First-slip and stimulation times are those of the first frame
// that shows them, so they are known to the output interval. A complete
// folder's files are checked against its contents list; a stopped run's
// partial folder (no list, perhaps no events) is read from its recovered
// frames, and Run.Notes say what was assumed.
func LoadRun(dir string, t float64) (*Run, error) {
	s, err := readScenario(filepath.Join(dir, ScenarioFile))
	if err != nil {
		return nil, err
	}
	read := []string{ScenarioFile, EventsFile}
	if s.SeismicityRate.Active() {
		read = append(read, RateEventsFile)
	}
	contents, note, err := openRunFolder(dir, s, read...)
	if err != nil {
		return nil, err
	}
	r := &Run{Scenario: s, Complete: note == ""}
	if note != "" {
		r.Notes = append(r.Notes, note)
	}
	rd, err := snapshot.Open(filepath.Join(dir, SnapshotFile))
	if errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(err, snapshot.ErrFormat) {
		return nil, badinput.Errorf("%w (a run stopped before its snapshot held a header and a frame has nothing to read)", err)
	}
	if err != nil {
		return nil, err
	}
	defer rd.Close()
	if contents != nil {
		damage, err := contents.verifySnapshot(dir, rd)
		if err != nil {
			return nil, err
		}
		if damage != "" {
			r.Notes = append(r.Notes, damage)
		}
	}
	if rd.Recovered() {
		r.Notes = append(r.Notes, SnapshotFile+" was recovered: "+rd.Note())
	}
	if r.Time, err = frameTime(rd.Reader, t); err != nil {
		return nil, err
	}
	h := rd.Header()
	if h.Digest != s.Digest {
		return nil, badinput.Errorf("%s belongs to scenario %.12s…, but %s is scenario %.12s…: the folder mixes two runs",
			SnapshotFile, h.Digest, ScenarioFile, s.Digest)
	}
	if r.Network, err = dfn.Generate(s, h.Realization); err != nil {
		return nil, err
	}
	for i, e := range h.Elements {
		if int(e.Fracture) >= len(r.Network.Fractures) {
			return nil, badinput.Errorf("%s: element %d names fracture %d, but the network has %d", SnapshotFile, i, e.Fracture, len(r.Network.Fractures))
		}
	}
	res, rp, err := sim.Replay(rd.Reader, r.Time)
	if err != nil {
		return nil, err
	}
	if len(rp.Damaged) > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("%d damaged snapshot frames skipped (at %v s)", len(rp.Damaged), rp.Damaged))
	}
	if last := rp.Times[len(rp.Times)-1]; last < r.Time {
		r.Notes = append(r.Notes, fmt.Sprintf("the state shown is that of the last intact frame, at %g s, not %g s", last, r.Time))
		r.Time = last
	}
	r.Result, r.OutlineTimes = res, rp.Times
	return r, r.readEvents(dir)
}

// frameTime checks t against the snapshot's frames; NaN means the last.
func frameTime(rd *snapshot.Reader, t float64) (float64, error) {
	frames := rd.Frames()
	if len(frames) == 0 {
		return 0, badinput.Errorf("the snapshot holds no frames")
	}
	first, last := frames[0].Time, frames[len(frames)-1].Time
	if math.IsNaN(t) {
		return last, nil
	}
	if t < first || t > last {
		return 0, badinput.Errorf("time %g s is outside the run: its frames span %g s to %g s", t, first, last)
	}
	return t, nil
}

// eventTimeSlack is how far past the state's time an event may lie and
// still belong to it: half a unit of the last decimal EventsFile writes
// times with (sim.WriteEvents: 3 decimals), so that an event at the run's
// last time belongs to its last state also when read back.
const eventTimeSlack = 5e-4

// shows reports whether an event at time t, s, belongs to the run's state.
func (r *Run) shows(t float64) bool { return t <= r.Time+eventTimeSlack }

// readEvents adds the events up to the run's time from EventsFile, and
// the sub-resolution events from RateEventsFile when the scenario has a
// [seismicity_rate] table; a stopped run has none to read.
func (r *Run) readEvents(dir string) error {
	events, err := r.readCatalogue(dir, EventsFile, "events", sim.ReadEvents)
	if err != nil || events == nil {
		return err
	}
	r.Result.Events = events
	if !r.Scenario.SeismicityRate.Active() {
		return nil
	}
	r.Result.RateEvents, err = r.readCatalogue(dir, RateEventsFile, "sub-resolution events", sim.ReadRateEvents)
	return err
}

// readCatalogue reads the catalogue file of the folder dir with read and
// returns its events up to the run's time (never nil); a stopped run that
// wrote no such file returns nil and a note saying so.
func (r *Run) readCatalogue(dir, file, what string, read func(io.Reader, string, *scenarios.Scenario) ([]sim.Event, error)) ([]sim.Event, error) {
	f, err := os.Open(filepath.Join(dir, file))
	if errors.Is(err, fs.ErrNotExist) && !r.Complete {
		r.Notes = append(r.Notes, "no "+file+": the stopped run wrote no "+what)
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	defer f.Close()
	all, err := read(f, file, r.Scenario)
	if err != nil {
		return nil, err
	}
	shown := []sim.Event{}
	for _, e := range all {
		if r.shows(e.Time) {
			shown = append(shown, e)
		}
	}
	return shown, nil
}

func readScenario(path string) (*scenarios.Scenario, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return scenarios.ReadResolved(f, path)
}
