package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"

	"slipfront/dfn"
	"slipfront/internal/export"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
	"slipfront/sim"
)

func newRunCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o scenarioToFolder
	cmd := &cobra.Command{
		Use:   "run SCENARIO --out DIR",
		Short: "Simulate the pumping schedule on one fracture network",
		Long: "run generates realization 0 of the scenario's network (or --seed), pumps the schedule into it\n" +
			"and writes summary.json, timeline.csv, events.csv, fractures.csv, run.snap, maps.gpkg,\n" +
			"map.png and growth.png.\n\n" + caution,
		Example: "  slipfront run scenarios/examples/demo.toml --out run1\n" +
			"  slipfront run demo --set fluids.slickwater.viscosity=20cP --out run-20cp",
	}
	return newScenarioToFolderCmd(cmd, &o, func(ctx context.Context) error {
		return runRun(ctx, &o, g, stdout, stderr)
	})
}

func runRun(ctx context.Context, o *scenarioToFolder, g *globalOptions, stdout, stderr io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	if err := o.prepare(); err != nil {
		return err
	}
	return simulate(ctx, s, o.out, g, stdout, stderr)
}

// simulate runs scenario s into folder out and writes every output of a
// run, also after a failure (what was computed is kept).
func simulate(ctx context.Context, s *scenarios.Scenario, out string, g *globalOptions, stdout, stderr io.Writer) error {
	status := statusWriter(g, stderr)
	if err := outdir.WriteFile(out, "scenario.json", func(w io.Writer) error { return scenarios.WriteResolved(w, s) }); err != nil {
		return err
	}
	net, err := generateNetwork(s, 0)
	if err != nil {
		return err
	}
	fmt.Fprintf(status, "network: %d fractures, %d traces, %d intersections\n", len(net.Fractures), len(net.Traces), len(net.Intersections))
	// run.snap is written in place: the format keeps every complete frame
	// readable if the run stops part way.
	snap, err := os.Create(filepath.Join(out, "run.snap"))
	if err != nil {
		return err
	}
	defer snap.Close()
	rec := sim.NewRecorder(snap, s, 0)
	bar := newProgress(g, stderr, "simulating")
	start := time.Now()
	res, runErr := sim.Run(ctx, s, net, sim.Options{Begin: rec.Begin, Frame: rec.Frame,
		Progress: func(t, end float64) { bar.set(t / end) }})
	bar.done()
	if res == nil {
		return runErr
	}
	if err := rec.Close(); err != nil && runErr == nil {
		runErr = err
	}
	fmt.Fprintf(status, "simulated %.2f h in %d steps (%d repeated) in %.1f s; mass balance error %.1e\n",
		res.Duration/3600, res.Steps, res.CutSteps, time.Since(start).Seconds(), res.MassBalanceError)
	if err := writeRunFiles(ctx, out, s, net, res, runErr); err != nil {
		return err
	}
	if err := sim.WriteStageTable(stdout, res); err != nil {
		return err
	}
	for _, w := range res.Warnings {
		fmt.Fprintln(stderr, "warning:", w)
	}
	fmt.Fprintln(stdout, caution)
	fmt.Fprintf(status, "wrote %s\n", out)
	return runErr
}

// writeRunFiles writes the tables, the summary and the maps of a run.
func writeRunFiles(ctx context.Context, out string, s *scenarios.Scenario, net *dfn.Network, res *sim.Result, runErr error) error {
	for _, f := range []struct {
		name  string
		write func(io.Writer) error
	}{
		{"summary.json", func(w io.Writer) error { return sim.WriteSummary(w, s, net, res, runErr) }},
		{"timeline.csv", func(w io.Writer) error { return sim.WriteTimeline(w, s, res) }},
		{"events.csv", func(w io.Writer) error { return sim.WriteEvents(w, s, res) }},
		{"fractures.csv", func(w io.Writer) error { return sim.WriteFractures(w, s, net, res) }},
	} {
		if err := outdir.WriteFile(out, f.name, f.write); err != nil {
			return err
		}
	}
	r := &export.Run{Scenario: s, Network: net, Result: res, Time: res.Duration, OutlineTimes: res.FrameTimes}
	return export.WriteRunMaps(ctx, out, r)
}
