package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/dfn"
	"slipfront/pipeline"
)

func newGenerateCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o scenarioToFolder
	cmd := &cobra.Command{
		Use:   "generate SCENARIO --out DIR",
		Short: "Generate one fracture network: fractures, mid-plane traces and network statistics",
		Example: "  slipfront generate scenarios/examples/demo.toml --out net\n" +
			"  slipfront generate demo --seed 7 --set sets[0].intensity.p32=0.03/m --out net7",
	}
	return newScenarioToFolderCmd(cmd, &o, func(ctx context.Context) error {
		return runGenerate(ctx, &o, g, stdout, statusWriter(g, stderr))
	})
}

// runGenerate writes the generate folder and prints the network summary.
func runGenerate(_ context.Context, o *scenarioToFolder, g *globalOptions, stdout, status io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	lim, err := g.limits()
	if err != nil {
		return err
	}
	net, st, err := pipeline.Generate(s, o.folder(), lim)
	if err != nil {
		return err
	}
	if err := dfn.WriteSummary(stdout, net, st); err != nil {
		return err
	}
	fmt.Fprintf(status, "wrote %s, %s, %s to %s\n", pipeline.NetworkFracturesFile, pipeline.TracesFile, pipeline.NetworkFile, o.out)
	return nil
}
