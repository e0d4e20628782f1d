package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"slices"

	"slipfront/internal/badinput"
	cautionpkg "slipfront/internal/caution"
	"slipfront/internal/crash"
	"slipfront/internal/version"
	"slipfront/pipeline"

	"github.com/spf13/cobra"

	"slipfront/gis"
	"slipfront/scenarios"
)

// Exit codes of the command line contract, listed in the README
// ("Commands").
const (
	exitOK          = 0
	exitFailure     = 1
	exitBadInput    = 2
	exitInternal    = 3 // a bug in slipfront (a recovered panic)
	exitInterrupted = 130
)

// caution is printed with every result that could inform field work.
const caution = "Caution: " + cautionpkg.Text

// badInput marks err as caused by the user's input (exit code 2); nil
// stays nil.
func badInput(err error) error { return badinput.Mark(err) }

// statusWriter is where status lines go: stderr, or nowhere with --quiet.
func statusWriter(g *globalOptions, stderr io.Writer) io.Writer {
	if g.quiet {
		return io.Discard
	}
	return stderr
}

// globalOptions are the flags shared by every command.
type globalOptions struct {
	quiet       bool
	memoryLimit string
}

// limits are the resource limits of the global flags.
func (g *globalOptions) limits() (pipeline.Limits, error) {
	if g.memoryLimit == "" {
		return pipeline.Limits{}, nil
	}
	b, err := parseBytes(g.memoryLimit)
	if err != nil {
		return pipeline.Limits{}, badInput(fmt.Errorf("--memory-limit %s: %w", g.memoryLimit, err))
	}
	return pipeline.Limits{Memory: b}, nil
}

// run executes the command line args and returns the process exit code.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	var g globalOptions
	root := newRootCmd(&g, stdout, stderr)
	root.SetArgs(args)
	return execute(ctx, root, stderr)
}

// newRootCmd builds the slipfront command with every subcommand; g
// receives the global flags.
func newRootCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:           "slipfront",
		Short:         "Stochastic fracture networks, injection-driven slip and stimulated-area maps",
		Long:          "slipfront generates stochastic discrete fracture networks from fracture-set statistics,\nsimulates injection into the connected network (pressure diffusion, Mohr–Coulomb slip,\nshear dilation), and maps how the stimulated area grows.\n\n" + caution,
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	addVersionFlag(root)
	root.PersistentFlags().BoolVarP(&g.quiet, "quiet", "q", false, "print no progress or status lines")
	root.PersistentFlags().StringVar(&g.memoryLimit, "memory-limit", "", "memory a run may take, e.g. 8GB or 512MiB; scenarios estimated to need more are refused before they start (default half of the machine's memory)")
	root.AddCommand(
		newVersionCmd(stdout),
		newScenarioCmd(g, stdout, stderr),
		newGenerateCmd(g, stdout, stderr),
		newScreenCmd(g, stdout, stderr),
		newRunCmd(g, stdout, stderr),
		newDemoCmd(g, stdout, stderr),
		newInspectCmd(stdout),
		newBatchCmd(g, stdout, stderr),
		newMergeCmd(stdout),
		newExportCmd(g, stderr),
		newReportCmd(g, stderr),
	)
	return root
}

// execute runs root with its arguments and maps the outcome to an exit
// code, printing the error to stderr: a panic anywhere below (a worker
// goroutine's included, which batch hands back as a crash.Error) is an
// internal error with its stack, never bad input.
func execute(ctx context.Context, root *cobra.Command, stderr io.Writer) int {
	started := false
	markStarted(root, &started)
	err := crash.Capture(func() error { return root.ExecuteContext(ctx) })
	if err == nil {
		return exitOK
	}
	var bug *crash.Error
	if errors.As(err, &bug) {
		fmt.Fprintf(stderr, "slipfront: %v\n%s\nslipfront: this is a bug in slipfront %s, not a problem with your input; "+
			"please report it to the developers with the command line, the scenario file and this message\n", bug, bug.Stack, version.Version)
		return exitInternal
	}
	fmt.Fprintln(stderr, "slipfront:", err)
	switch {
	case errors.Is(err, context.Canceled) || ctx.Err() != nil:
		fmt.Fprintln(stderr, "slipfront: interrupted; files already written are kept")
		return exitInterrupted
	case !started, errors.Is(err, badinput.Err):
		return exitBadInput
	default:
		return exitFailure
	}
}

// markStarted wraps every command's RunE so that *started tells whether an
// error came from the command itself or from cobra's checks of the command
// line (unknown command, bad flag, missing argument: all bad input).
func markStarted(c *cobra.Command, started *bool) {
	if run := c.RunE; run != nil {
		c.RunE = func(cmd *cobra.Command, args []string) error {
			*started = true
			return run(cmd, args)
		}
	}
	for _, sub := range c.Commands() {
		markStarted(sub, started)
	}
}

// scenarioOptions are the flags of every command that reads a scenario.
type scenarioOptions struct {
	sets []string
	seed string
}

func (o *scenarioOptions) addFlags(cmd *cobra.Command) {
	cmd.Flags().StringArrayVar(&o.sets, "set", nil, "override a scenario value by its dotted key, with unit, e.g. --set fluids.slickwater.viscosity=20cP (repeatable)")
	cmd.Flags().StringVar(&o.seed, "seed", "", "scenario seed, a whole number ≥ 0 (same as --set seed=N); default the scenario's")
}

// withSeed returns the --set overrides with --seed added.
func (o *scenarioOptions) withSeed() []string {
	if o.seed == "" {
		return o.sets
	}
	return append(slices.Clone(o.sets), "seed="+o.seed)
}

// scenarioToFolder are the options of the commands that read one scenario
// and write one folder (generate, screen, run).
type scenarioToFolder struct {
	scenarioOptions
	folderOptions
	scenario string
}

// newScenarioToFolderCmd completes such a command: one SCENARIO argument,
// the scenario and folder flags, and run called with the options filled.
func newScenarioToFolderCmd(cmd *cobra.Command, o *scenarioToFolder, run func(ctx context.Context) error) *cobra.Command {
	cmd.Args = cobra.ExactArgs(1)
	cmd.RunE = func(c *cobra.Command, args []string) error {
		o.scenario = args[0]
		return run(c.Context())
	}
	o.scenarioOptions.addFlags(cmd)
	o.folderOptions.addFlags(cmd)
	return cmd
}

// folderOptions are the flags of every command that writes an output
// folder.
type folderOptions struct {
	out   string
	force bool
}

func (o *folderOptions) addFlags(cmd *cobra.Command) {
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "output folder (required)")
	o.addForce(cmd)
	cmd.MarkFlagRequired("out")
}

// forceHelp is what --force means for every command that writes a
// folder: the same rule everywhere.
const forceHelp = "replace an existing output folder; only one that slipfront wrote, and only once the new output is complete"

// addForce adds --force.
func (o *folderOptions) addForce(cmd *cobra.Command) {
	cmd.Flags().BoolVar(&o.force, "force", false, forceHelp)
}

// folder is the output folder the flags name.
func (o *folderOptions) folder() pipeline.Folder { return pipeline.Folder{Dir: o.out, Force: o.force} }

// load reads the scenario at path (or an embedded example by name) with
// the overrides applied.
func (o *scenarioOptions) load(path string) (*scenarios.Scenario, error) {
	ov, err := scenarios.ParseOverrides(o.withSeed())
	if err != nil {
		return nil, badInput(err)
	}
	s, err := scenarios.Load(path, ov...)
	if err != nil {
		return nil, badInput(err)
	}
	return s, badInput(checkCRS(s))
}

// checkCRS refuses, before any work, a CRS the maps cannot be written in
// (a geographic one: local metres need a projected CRS).
func checkCRS(s *scenarios.Scenario) error {
	if _, err := gis.ParseCRS(s.Domain.CRS); err != nil {
		return fmt.Errorf("%s: domain.crs = %q: %w", s.Source, s.Domain.CRS, err)
	}
	return nil
}
