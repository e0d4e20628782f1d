package main

import (
	"context"
	"fmt"
	"io"

	"slipfront/pipeline"

	"github.com/spf13/cobra"
)

func newScreenCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o scenarioToFolder
	cmd := &cobra.Command{
		Use:   "screen SCENARIO --out DIR",
		Short: "Resolve the in-situ stress on every fracture and the pressure increase each needs to slip",
		Example: "  slipfront screen scenarios/examples/demo.toml --out screen\n" +
			"  slipfront screen demo --set rock.friction_static=0.7 --out screen-mu07",
	}
	return newScenarioToFolderCmd(cmd, &o, func(ctx context.Context) error {
		return runScreen(ctx, &o, g, stdout, statusWriter(g, stderr))
	})
}

// runScreen writes the screen folder and prints its summary.
func runScreen(_ context.Context, o *scenarioToFolder, g *globalOptions, stdout, status io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	lim, err := g.limits()
	if err != nil {
		return err
	}
	sc, err := pipeline.Screen(s, o.folder(), lim)
	if err != nil {
		return err
	}
	if sc.Limit.Exceeded {
		fmt.Fprintln(status, "warning:", sc.Limit.Warning)
	}
	if err := sc.WriteSummary(stdout); err != nil {
		return err
	}
	fmt.Fprintf(status, "wrote %s, %s, %s to %s\n", pipeline.ScreenTableFile, pipeline.ScreenSummaryFile, pipeline.SlipCurveFile, o.out)
	return nil
}
