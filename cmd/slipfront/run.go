package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/pipeline"
	"slipfront/scenarios"
	"slipfront/sim"
)

// runOptions are the flags of "slipfront run".
type runOptions struct {
	scenarioToFolder
	realization int
}

func newRunCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o runOptions
	cmd := &cobra.Command{
		Use:   "run SCENARIO --out DIR",
		Short: "Simulate the pumping schedule on one fracture network",
		Long: "run generates realization 0 of the scenario's network (--realization N: realization N, as batch\n" +
			"draws it with the same --set values), pumps the schedule into it\n" +
			"and writes summary.json, timeline.csv, events.csv, fractures.csv, run.snap, maps.gpkg,\n" +
			"map.png and growth.png.\n\n" + caution,
		Example: "  slipfront run scenarios/examples/demo.toml --out run1\n" +
			"  slipfront run demo --set fluids.slickwater.viscosity=20cP --out run-20cp\n" +
			"  slipfront run demo --set fluids.slickwater.viscosity=20cP --realization 7 --out visc-20cp-r7",
	}
	cmd = newScenarioToFolderCmd(cmd, &o.scenarioToFolder, func(ctx context.Context) error {
		return runRun(ctx, &o, g, stdout, stderr)
	})
	cmd.Flags().IntVar(&o.realization, "realization", 0, "network realization to run, ≥ 0 (batch realization r with the same --set values is reproduced by --realization r)")
	return cmd
}

func runRun(ctx context.Context, o *runOptions, g *globalOptions, stdout, stderr io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	return simulate(ctx, s, o.folder(), o.realization, g, stdout, stderr)
}

// simulate runs scenario s into the folder and prints the stage table,
// the warnings and the caution, also after a failed run (what was
// computed is kept).
func simulate(ctx context.Context, s *scenarios.Scenario, out pipeline.Folder, realization int, g *globalOptions, stdout, stderr io.Writer) error {
	lim, err := g.limits()
	if err != nil {
		return err
	}
	status := statusWriter(g, stderr)
	bar := newProgress(g, stderr, "simulating", "h simulated", 3600)
	res, runErr := pipeline.Simulate(ctx, s, pipeline.SimulateOptions{Out: out, Realization: realization, Limits: lim, Status: status,
		Progress: bar.set})
	bar.done()
	if res == nil {
		return runErr
	}
	if err := sim.WriteStageTable(stdout, s, res); err != nil {
		return err
	}
	for _, w := range res.Warnings {
		fmt.Fprintln(stderr, "warning:", w)
	}
	fmt.Fprintln(stdout, caution)
	fmt.Fprintf(status, "wrote %s\n", out.Dir)
	return runErr
}
