package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"slipfront/internal/plural"
	"slipfront/scenarios"
)

func newScenarioCmd(stdout io.Writer) *cobra.Command {
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
		&cobra.Command{
			Use:     "show NAME",
			Short:   "Print an embedded example scenario (" + strings.Join(scenarios.Examples(), ", ") + ")",
			Example: "  slipfront scenario show demo > demo.toml",
			Args:    cobra.ExactArgs(1),
			RunE: func(_ *cobra.Command, args []string) error {
				src, err := scenarios.ExampleSource(args[0])
				if err != nil {
					return badInput(err)
				}
				_, err = stdout.Write(src)
				return err
			},
		},
		newCheckCmd(stdout),
	)
	return cmd
}

func newCheckCmd(stdout io.Writer) *cobra.Command {
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
