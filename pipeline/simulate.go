package pipeline

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"time"

	"slipfront/batch"
	"slipfront/dfn"
	"slipfront/gis"
	"slipfront/internal/badinput"
	"slipfront/internal/plural"
	"slipfront/scenarios"
	"slipfront/sim"
)

// SimulateOptions control Simulate.
type SimulateOptions struct {
	// Out is the run folder.
	Out Folder
	// Realization is the network realization to run (0 for the first; a
	// batch's realization r is reproduced with r).
	Realization int
	// Limits bound the run's memory.
	Limits Limits
	// Status, when set, receives status lines (network size, run time).
	Status io.Writer
	// Progress, when set, is called after every accepted step with the
	// simulated time and the schedule's nominal end, s.
	Progress func(t, end float64)
}

// Simulate runs one realization of the scenario and writes the run folder
// through its partial sibling (see Folder): ScenarioFile first,
// SnapshotFile frame by frame during the run (so a stopped run keeps every
// complete frame), then SummaryFile, TimelineFile, EventsFile,
// FracturesFile, CSVMetadataFile, the maps and last ContentsFile, after
// which the folder is put in place. A run that fails part way still
// writes what it computed and returns its result with the error. A nil
// result means no folder was written: the input was refused (and the
// partial folder removed), or writing failed (and the partial folder
// keeps what was written).
func Simulate(ctx context.Context, s *scenarios.Scenario, o SimulateOptions) (*sim.Result, error) {
	status := o.Status
	if status == nil {
		status = io.Discard
	}
	if o.Realization < 0 {
		return nil, badinput.Errorf("realization %d: must be ≥ 0", o.Realization)
	}
	if err := o.Limits.CheckRun(s, 1); err != nil {
		return nil, err
	}
	st, err := o.Out.begin()
	if err != nil {
		return nil, err
	}
	res, net, runErr := simulateInto(ctx, st.Dir, s, o, status)
	if res == nil {
		if errors.Is(runErr, badinput.Err) {
			return nil, errors.Join(runErr, st.Abandon())
		}
		return nil, runErr
	}
	if err := writeRunFiles(ctx, st.Dir, s, net, res, runErr); err != nil {
		return nil, err
	}
	if err := writeContents(st.Dir, s, o.Realization); err != nil {
		return nil, err
	}
	if err := st.Commit(); err != nil {
		return nil, err
	}
	return res, runErr
}

// simulateInto generates the network and runs the simulation, writing the
// resolved scenario and the snapshot into dir.
func simulateInto(ctx context.Context, dir string, s *scenarios.Scenario, o SimulateOptions, status io.Writer) (*sim.Result, *dfn.Network, error) {
	if err := writeFiles(dir, scenarioWriter(s)); err != nil {
		return nil, nil, err
	}
	net, err := dfn.Generate(s, o.Realization)
	if err != nil {
		return nil, nil, err
	}
	fmt.Fprintf(status, "network: %s, %s, %s\n", plural.S(len(net.Fractures), "fracture"), plural.S(len(net.Traces), "trace"), plural.S(len(net.Intersections), "intersection"))
	snap, err := os.Create(filepath.Join(dir, SnapshotFile))
	if err != nil {
		return nil, nil, err
	}
	defer snap.Close()
	rec := sim.NewRecorder(snap, s, o.Realization)
	start := time.Now()
	res, runErr := sim.Run(ctx, s, net, sim.Options{Begin: rec.Begin, Frame: rec.Frame, Progress: o.Progress, MemoryLimit: o.Limits.memory()})
	if res == nil {
		return nil, nil, runErr
	}
	if err := rec.Close(); err != nil && runErr == nil {
		runErr = err
	}
	fmt.Fprintf(status, "simulated %.2f h in %d steps (%d repeated) in %.1f s; mass balance error %.1e\n",
		res.Duration/3600, res.Steps, res.CutSteps, time.Since(start).Seconds(), res.MassBalanceError)
	return res, net, runErr
}

// writeRunFiles writes the tables, the summary and the maps of a run.
func writeRunFiles(ctx context.Context, out string, s *scenarios.Scenario, net *dfn.Network, res *sim.Result, runErr error) error {
	files := []namedWriter{
		{SummaryFile, func(w io.Writer) error { return sim.WriteSummary(w, s, net, res, runErr) }},
		{TimelineFile, func(w io.Writer) error { return sim.WriteTimeline(w, s, res) }},
		{EventsFile, func(w io.Writer) error { return sim.WriteEvents(w, s, res) }},
		{FracturesFile, func(w io.Writer) error { return sim.WriteFractures(w, s, net, res) }},
		runMetadata(s),
	}
	if sim.Grows(s) {
		files = append(files, namedWriter{CrossingsFile, func(w io.Writer) error { return sim.WriteCrossings(w, s, res) }})
	}
	if s.SeismicityRate.Active() {
		files = append(files, namedWriter{RateEventsFile, func(w io.Writer) error { return sim.WriteRateEvents(w, s, res) }})
	}
	err := writeFiles(out, files...)
	if err != nil {
		return err
	}
	r := &Run{Scenario: s, Network: net, Result: res, Time: res.Duration, OutlineTimes: res.FrameTimes}
	return writeRunMaps(ctx, out, r)
}

// writeRunMaps writes MapsFile, StressChangeFile and the pictures of a
// finished run into dir.
func writeRunMaps(ctx context.Context, dir string, r *Run) error {
	pl, err := r.Placement()
	if err != nil {
		return err
	}
	stress, err := r.StressChangeRaster()
	if err != nil {
		return err
	}
	if err := writeFiles(dir, namedWriter{StressChangeFile, func(w io.Writer) error { return gis.WriteGeoTIFF(w, pl, stress) }}); err != nil {
		return err
	}
	d, err := r.Depletion()
	if err != nil {
		return err
	}
	if err := writeDepletionRasters(dir, pl, d); err != nil {
		return err
	}
	layers, err := r.Layers()
	if err != nil {
		return err
	}
	if err := writeGeoPackage(ctx, filepath.Join(dir, MapsFile), pl, layers, scheduleStart(r.Scenario.Schedule.Start)); err != nil {
		return err
	}
	_, _, err = writeRunPictures(dir, r)
	return err
}

// Realizations returns the batch runner (a batch.RunFunc) of runs taking
// at most the memory limit shared by workers at a time: it generates
// realization r's network and simulates the schedule on it, keeping only
// what a batch aggregates.
func (l Limits) Realizations(workers int) batch.RunFunc {
	limit := l.memory() / float64(max(workers, 1))
	return func(ctx context.Context, s *scenarios.Scenario, r int) (*batch.Outcome, error) {
		return realization(ctx, s, r, limit)
	}
}

// realization runs realization r of the scenario within limit bytes.
func realization(ctx context.Context, s *scenarios.Scenario, r int, limit float64) (*batch.Outcome, error) {
	net, err := dfn.Generate(s, r)
	if err != nil {
		return nil, err
	}
	res, err := sim.Run(ctx, s, net, sim.Options{MemoryLimit: limit})
	if err != nil {
		return nil, fmt.Errorf("realization %d: %w", r, err)
	}
	_, retained, err := sim.StimulatedGains(s, res)
	if err != nil {
		return nil, err
	}
	out := &batch.Outcome{NetworkDigest: net.Digest(), FinalArea: res.StimulatedArea, FractureArea: res.FractureArea,
		Events: len(res.Events), MaxMagnitude: sim.MaxMagnitude(res.Events), PeakPressure: res.PeakBHP,
		InjectedVolume: res.Injected, SeismicMoment: res.SeismicMoment, AseismicMoment: res.AseismicMoment,
		RetainedGain: retained, Cells: res.Cells}
	for _, w := range res.Warnings {
		out.Warnings = append(out.Warnings, batch.Warning{Kind: w.Kind, Message: w.Message})
	}
	for _, x := range res.Timeline {
		out.Times = append(out.Times, x.Time)
		out.Areas = append(out.Areas, x.StimulatedArea)
	}
	return out, nil
}
