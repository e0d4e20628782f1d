package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"runtime"
	"slices"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"
	"golang.org/x/term"

	"slipfront/batch"
	"slipfront/internal/plural"
	"slipfront/pipeline"
	"slipfront/scenarios"
)

// batchOptions are the flags of "slipfront batch".
type batchOptions struct {
	scenarioOptions
	scenario     string
	out          string
	realizations int
	sweeps       []string
	references   []string
	workers      int
	shard        string
	resume       bool
	force        bool
}

func newBatchCmd(g *globalOptions, stdout, stderr io.Writer) *cobra.Command {
	var o batchOptions
	cmd := &cobra.Command{
		Use:   "batch SCENARIO --realizations N [--sweep key=v1,v2,...]... --out DIR",
		Short: "Run Monte Carlo realizations of the network for every sweep case, on all cores",
		Long: "batch runs realizations 0…N−1 of the fracture network for every combination of the sweep\n" +
			"values. Realization r has the same network in every case (common random numbers), so\n" +
			"differences between cases come from the swept values alone: paired.csv compares every case\n" +
			"with its reference case (the sweep's first value, or --reference) realization by realization.\n" +
			"Each finished realization is a file of its own: --resume continues an interrupted batch,\n" +
			"--shard i/n runs a share of the realizations (e.g. one Slurm array task) for \"slipfront merge\".\n\n" + caution,
		Example: "  slipfront batch demo --realizations 4 --sweep schedule.fluid=slickwater,linear_gel --out fluids\n" +
			"  slipfront batch zipper-pad --realizations 20 --sweep fluids.slickwater.viscosity=1cP,5cP,20cP --reference 5cP --out visc\n" +
			"  slipfront batch zipper-pad --realizations 200 --shard $SLURM_ARRAY_TASK_ID/$SLURM_ARRAY_TASK_COUNT --resume --out shard-$SLURM_ARRAY_TASK_ID",
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.scenario = args[0]
			return runBatch(cmd.Context(), &o, g, stdout, stderr)
		},
	}
	o.addFlags(cmd)
	f := cmd.Flags()
	f.StringVarP(&o.out, "out", "o", "", "batch folder (required)")
	f.IntVarP(&o.realizations, "realizations", "n", 0, "realizations per case, ≥ 1 (required)")
	f.StringArrayVar(&o.sweeps, "sweep", nil, "sweep a scenario value: key=v1,v2,... with units (repeatable; several sweeps form their product)")
	f.StringArrayVar(&o.references, "reference", nil, "value each case is compared with in paired.csv: VALUE of one sweep, or KEY=VALUE (repeatable, one per sweep; default each sweep's first value)")
	f.IntVar(&o.workers, "workers", 0, "realizations run at once (default: the number of cores)")
	f.StringVar(&o.shard, "shard", "", "run only shard i of n: the realizations r with r mod n = i")
	f.BoolVar(&o.resume, "resume", false, "continue the batch in --out, keeping the realizations already done")
	f.BoolVar(&o.force, "force", false, "replace an existing batch folder: its results are deleted and the batch starts over (--resume keeps them)")
	cmd.MarkFlagRequired("out")
	cmd.MarkFlagRequired("realizations")
	return cmd
}

func runBatch(ctx context.Context, o *batchOptions, g *globalOptions, stdout, stderr io.Writer) error {
	base, err := scenarios.ParseOverrides(o.withSeed())
	if err != nil {
		return badInput(err)
	}
	lim, err := g.limits()
	if err != nil {
		return err
	}
	workers := o.workers
	if workers == 0 {
		workers = runtime.NumCPU()
	}
	opt := batch.Options{
		Load: func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
			s, err := scenarios.Load(o.scenario, append(slices.Clone(base), extra...)...)
			if err != nil {
				return nil, err
			}
			if err := checkCRS(s); err != nil {
				return nil, badInput(err)
			}
			return s, lim.CheckRun(s, workers)
		},
		Realizations: o.realizations, Workers: o.workers, Out: o.out, Resume: o.resume, Force: o.force,
		Run: lim.Realizations(workers),
	}
	for _, s := range o.sweeps {
		sw, err := batch.ParseSweep(s)
		if err != nil {
			return badInput(err)
		}
		opt.Sweeps = append(opt.Sweeps, sw)
	}
	for _, ref := range o.references {
		if err := batch.SetReference(opt.Sweeps, ref); err != nil {
			return badInput(err)
		}
	}
	if o.shard != "" {
		if opt.Shard, err = batch.ParseShard(o.shard); err != nil {
			return badInput(err)
		}
	}
	if !g.quiet {
		opt.Progress = stderr
		if f, ok := stderr.(*os.File); ok {
			opt.IsTerminal = term.IsTerminal(int(f.Fd()))
		}
	}
	sum, err := batch.Run(ctx, opt)
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "%s × %s: %d run now, %d resumed, in %.1f s\n",
		plural.S(sum.Cases, "case"), plural.S(sum.Realizations, "realization"), sum.Ran, sum.Resumed, sum.Elapsed.Seconds())
	if !sum.Aggregated {
		fmt.Fprintf(stdout, "shard %d/%d done; combine the shard folders with: slipfront merge DIR... --out DIR\n", sum.Shard.Index, sum.Shard.Count)
		return nil
	}
	return finishBatch(ctx, o.out, stdout)
}

// finishBatch writes the maps and charts of a complete batch folder and
// prints the comparison of its cases, the paired comparison with the
// reference cases and the warnings.
func finishBatch(ctx context.Context, dir string, stdout io.Writer) error {
	if err := pipeline.WriteBatchMaps(ctx, dir); err != nil {
		return err
	}
	m, aggs, err := batch.ReadAggregates(ctx, dir)
	if err != nil {
		return err
	}
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "case\tq10 area m2\tq50 area m2\tq90 area m2\tmean events\tmax Mw\twarnings\n")
	for i := range aggs {
		a := &aggs[i]
		mw := "-"
		if !math.IsNaN(a.MaxMagnitude) {
			mw = fmt.Sprintf("%.2f", a.MaxMagnitude)
		}
		warnings, _ := a.WarningTotals()
		fmt.Fprintf(tw, "%s\t%.0f\t%.0f\t%.0f\t%.1f\t%s\t%d\n", a.Case.Label, a.Final.P10, a.Final.P50, a.Final.P90, a.Events.Mean, mw, warnings)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "q10/q50/q90: %s, ascending; q90 is the high case (%s)\n", plural.S(m.Realizations, "realization"), batch.ComparisonName)
	if paired := batch.Paired(m, aggs); len(paired) > 0 {
		fmt.Fprintf(stdout, "\npaired with the reference case on the same networks: ratios case/reference (ΔMw: case − reference),\n"+
			"q50 [q10–q90] over the realizations (%s, %s):\n", batch.PairedName, batch.PairedPercentilesName)
		tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, strings.Join(pipeline.PairedHeader, "\t"))
		for _, ps := range paired {
			fmt.Fprintln(tw, strings.Join(pipeline.PairedRow(m, ps), "\t"))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	if lines := pipeline.WarningLines(batch.TotalWarnings(aggs)); len(lines) > 0 {
		fmt.Fprintf(stdout, "\nwarnings (%s, %s):\n", batch.WarningsName, batch.SummaryName)
		for _, l := range lines {
			fmt.Fprintln(stdout, "warning:", l)
		}
	}
	fmt.Fprintln(stdout, caution)
	return nil
}

func newMergeCmd(stdout io.Writer) *cobra.Command {
	var o folderOptions
	cmd := &cobra.Command{
		Use:   "merge DIR... --out DIR",
		Short: "Combine the shard folders of one batch into a complete batch folder",
		Example: "  slipfront merge shard-0 shard-1 shard-2 shard-3 --out visc\n" +
			"  slipfront merge shard-* --out visc --force",
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := batch.Merge(cmd.Context(), args, o.out, o.force); err != nil {
				return err
			}
			return finishBatch(cmd.Context(), o.out, stdout)
		},
	}
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "merged batch folder, new or empty (required)")
	cmd.Flags().BoolVar(&o.force, "force", false, "replace an existing batch folder (not one of the shards)")
	cmd.MarkFlagRequired("out")
	return cmd
}
