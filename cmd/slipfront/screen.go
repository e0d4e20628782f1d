package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/dfn"
	"slipfront/internal/outdir"
	"slipfront/mechanics"
	"slipfront/scenarios"
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
		return runScreen(ctx, &o, stdout, statusWriter(g, stderr))
	})
}

// runScreen generates the network and writes screen.csv, screen.json and
// slip-vs-dp.csv.
func runScreen(_ context.Context, o *scenarioToFolder, stdout, status io.Writer) error {
	s, err := o.load(o.scenario)
	if err != nil {
		return err
	}
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return badInput(err)
	}
	crit, err := mechanics.CoulombFromScenario(s.Rock)
	if err != nil {
		return badInput(err)
	}
	if err := o.prepare(); err != nil {
		return err
	}
	net, err := generateNetwork(s, 0)
	if err != nil {
		return err
	}
	sc, err := mechanics.Screen(screenPlanes(net), stress, crit, mechanics.ScreenOptions{SetNames: setNames(s)})
	if err != nil {
		return err
	}
	if sc.Limit.Exceeded {
		fmt.Fprintln(status, "warning:", sc.Limit.Warning)
	}
	for _, f := range []struct {
		name  string
		write func(io.Writer) error
	}{
		{"screen.csv", sc.WriteCSV},
		{"screen.json", sc.WriteJSON},
		{"slip-vs-dp.csv", sc.WriteCurveCSV},
	} {
		if err := outdir.WriteFile(o.out, f.name, f.write); err != nil {
			return err
		}
	}
	if err := sc.WriteSummary(stdout); err != nil {
		return err
	}
	fmt.Fprintf(status, "wrote screen.csv, screen.json, slip-vs-dp.csv to %s\n", o.out)
	return nil
}

// screenPlanes lists every fracture with its trace length on the
// mid-plane. Mapped fractures get the set index after the generated sets.
func screenPlanes(net *dfn.Network) []mechanics.Plane {
	traceLength := make([]float64, len(net.Fractures))
	for _, t := range net.Traces {
		traceLength[t.Fracture] += t.Length
	}
	planes := make([]mechanics.Plane, len(net.Fractures))
	for i, f := range net.Fractures {
		set := f.Set
		if set == dfn.KnownSet {
			set = len(net.Sets)
		}
		planes[i] = mechanics.Plane{ID: i, Set: set, Normal: f.Normal, Area: f.Area, TraceLength: traceLength[i]}
	}
	return planes
}

// setNames names the generated sets and, after them, the mapped fractures.
func setNames(s *scenarios.Scenario) []string {
	names := make([]string, 0, len(s.Sets)+1)
	for _, set := range s.Sets {
		names = append(names, set.Name)
	}
	return append(names, dfn.KnownSetName)
}
