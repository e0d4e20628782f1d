package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"slipfront/internal/plural"
	"slipfront/scenarios"
)

func newScenarioCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "scenario",
		Short: "Write the annotated scenario template, show an example, or check a scenario file",
	}
	cmd.AddCommand(
		&cobra.Command{
			Use:     "template",
			Short:   "Print a complete scenario with every key, its unit, default and allowed range",
			Example: "  slipfront scenario template > my-case.toml",
			Args:    cobra.NoArgs,
			RunE: func(*cobra.Command, []string) error {
				_, err := io.WriteString(stdout, scenarios.Template())
				return err
			},
		},
		newShowCmd(g, stdout, stderr),
		newCheckCmd(stdout, stderr),
	)
	return cmd
}

func newShowCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o folderOptions
	cmd := &cobra.Command{
		Use:   "show NAME [--out DIR]",
		Short: "Print an embedded example scenario (" + strings.Join(scenarios.Examples(), ", ") + "), or write it with the files it reads into a folder",
		Long: "show prints the example's TOML. An example that reads other files (zipper-pad reads its mapped\n" +
			"faults from zipper-pad-faults.csv) checks and runs only beside them: --out DIR writes the TOML and those files\n" +
			"into DIR, ready to edit and to run.",
		Example: "  slipfront scenario show demo\n" +
			"  slipfront scenario show zipper-pad --out my-pad && slipfront scenario check my-pad/zipper-pad.toml",
		Args: cobra.ExactArgs(1),
		RunE: func(_ *cobra.Command, args []string) error {
			return runShow(args[0], &o, g, stdout, stderr)
		},
	}
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "folder to write the example's TOML and the files it reads into")
	o.addForce(cmd)
	return cmd
}

// runShow prints an example, or writes it with its files into o.out.
func runShow(name string, o *folderOptions, g *globalOptions, stdout, stderr io.Writer) error {
	status := statusWriter(g, stderr)
	if o.out != "" {
		paths, err := scenarios.WriteExample(name, o.out, o.force)
		if err != nil {
			return err
		}
		fmt.Fprintf(status, "wrote %s; check it with: slipfront scenario check %s\n", strings.Join(paths, ", "), paths[0])
		return nil
	}
	if o.force {
		return badInput(errors.New("--force replaces the folder of --out; give --out DIR"))
	}
	files, err := scenarios.ExampleFiles(name)
	if err != nil {
		return err
	}
	if _, err := stdout.Write(files[0].Data); err != nil {
		return err
	}
	if len(files) > 1 {
		others := make([]string, len(files)-1)
		for i, f := range files[1:] {
			others[i] = f.Name
		}
		fmt.Fprintf(status, "note: %s reads %s beside it; write them together with: slipfront scenario show %s --out DIR\n",
			files[0].Name, strings.Join(others, ", "), name)
	}
	return nil
}

func newCheckCmd(stdout, stderr io.Writer) *cobra.Command {
	var o scenarioOptions
	cmd := &cobra.Command{
		Use:     "check FILE",
		Short:   "Validate a scenario file and print what it describes",
		Example: "  slipfront scenario check my-case.toml\n  slipfront scenario check my-case.toml --set rock.friction_static=0.7",
		Args:    cobra.ExactArgs(1),
		RunE: func(_ *cobra.Command, args []string) error {
			s, err := o.load(args[0])
			if err != nil {
				return err
			}
			for _, w := range s.Warnings {
				fmt.Fprintln(stderr, "warning:", w)
			}
			return describeScenario(stdout, s)
		},
	}
	o.addFlags(cmd)
	return cmd
}

// describeScenario prints a short account of a valid scenario.
func describeScenario(w io.Writer, s *scenarios.Scenario) error {
	var b strings.Builder
	fmt.Fprintf(&b, "%s: valid\n", s.Source)
	fmt.Fprintf(&b, "  name      %s\n  digest    %s\n  seed      %d\n", s.Name, s.Digest, s.Seed)
	crs := s.Domain.CRS
	if s.Domain.CRSWKT != "" {
		crs = "WKT " + s.Domain.CRSWKT
	}
	if crs == "" {
		crs = "undefined local frame"
	}
	fmt.Fprintf(&b, "  map       %.0f × %.0f m (%s)\n", s.Domain.XMax-s.Domain.XMin, s.Domain.YMax-s.Domain.YMin, crs)
	fmt.Fprintf(&b, "  layer     %.1f m thick at %.1f m TVD\n", s.Layer.Thickness, s.Layer.Depth)
	fmt.Fprintf(&b, "  sets      %d", len(s.Sets))
	for _, set := range s.Sets {
		fmt.Fprintf(&b, " [%s: %s, %s, %s]", set.Name, set.Orientation.Distribution, set.Size.Distribution, set.Intensity.Measure)
	}
	fmt.Fprintf(&b, "\n  known     %s\n", plural.S(len(s.KnownFractures.Fractures), "mapped fracture"))
	fmt.Fprintf(&b, "  wells     %d\n", len(s.Wells))
	order := s.PumpingOrder()
	names := make([]string, len(order))
	for i, p := range order {
		names[i] = p.Name
	}
	fmt.Fprintf(&b, "  stages    %d in %s order: %s\n", len(order), s.Schedule.Order, strings.Join(names, " "))
	fmt.Fprintf(&b, "  schedule  %.2f h at nominal rates, including shut-ins\n", s.ScheduleLength()/3600)
	_, err := io.WriteString(w, b.String())
	return err
}
