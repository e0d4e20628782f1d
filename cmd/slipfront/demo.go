package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/internal/plural"
	"slipfront/scenarios"
)

// demoOptions are the flags of "slipfront demo".
type demoOptions struct {
	folderOptions
}

func newDemoCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o demoOptions
	cmd := &cobra.Command{
		Use:   "demo [--out DIR]",
		Short: "Run the embedded demo scenario end to end",
		Long: "demo runs scenarios/examples/demo.toml (an invented well pumping two field-size stages whose\n" +
			"fractures grow from their clusters) and writes every output of a run into --out (default\n" +
			"slipfront-demo); it takes about a minute and a half. Show the scenario with: slipfront scenario show demo\n\n" + caution,
		Example: "  slipfront demo\n  slipfront demo --out /tmp/demo --force",
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runDemo(cmd.Context(), &o, g, stdout, stderr)
		},
	}
	cmd.Flags().StringVarP(&o.out, "out", "o", "slipfront-demo", "output folder")
	o.addForce(cmd)
	return cmd
}

func runDemo(ctx context.Context, o *demoOptions, g *globalOptions, stdout, stderr io.Writer) error {
	s, err := scenarios.LoadExample("demo")
	if err != nil {
		return err
	}
	out := o.folder()
	if err := out.Check(); err != nil { // before the first line is printed
		return err
	}
	fmt.Fprintf(stdout, "%s: %s, %s, %s", s.Name, plural.S(len(s.Wells), "well"), plural.S(len(s.PumpingOrder()), "stage"),
		plural.S(len(s.Sets), "fracture set"))
	if n := len(s.KnownFractures.Fractures); n > 0 {
		fmt.Fprintf(stdout, ", %s", plural.S(n, "mapped fault"))
	}
	fmt.Fprintln(stdout)
	return simulate(ctx, s, out, 0, g, stdout, stderr)
}
