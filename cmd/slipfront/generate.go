package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/dfn"
	"slipfront/internal/outdir"
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
		return runGenerate(ctx, &o, stdout, statusWriter(g, stderr))
	})
}

// runGenerate writes fractures.csv, traces.csv and network.json and prints
// the network summary.
func runGenerate(_ context.Context, o *scenarioToFolder, stdout, status io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	if err := o.prepare(); err != nil {
		return err
	}
	net, err := generateNetwork(s, 0)
	if err != nil {
		return err
	}
	st := net.Stats()
	for _, f := range []struct {
		name  string
		write func(io.Writer) error
	}{
		{"fractures.csv", func(w io.Writer) error { return dfn.WriteFractures(w, net) }},
		{"traces.csv", func(w io.Writer) error { return dfn.WriteTraces(w, net) }},
		{"network.json", func(w io.Writer) error { return dfn.WriteNetworkJSON(w, net, st) }},
	} {
		if err := outdir.WriteFile(o.out, f.name, f.write); err != nil {
			return err
		}
	}
	if err := dfn.WriteSummary(stdout, net, st); err != nil {
		return err
	}
	fmt.Fprintf(status, "wrote fractures.csv, traces.csv, network.json to %s\n", o.out)
	return nil
}
