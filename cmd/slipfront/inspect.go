package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"slipfront/batch"
	"slipfront/internal/outdir"
	"slipfront/pipeline"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// inspectOptions are the flags of "slipfront inspect".
type inspectOptions struct {
	file string
	time string
	csv  bool
}

func newInspectCmd(stdout io.Writer) *cobra.Command {
	var o inspectOptions
	cmd := &cobra.Command{
		Use:   "inspect SNAPSHOT [--time T] [--csv]",
		Short: "Describe a snapshot file, one of its frames, or write a frame as CSV",
		Example: "  slipfront inspect slipfront-demo/run.snap\n" +
			"  slipfront inspect slipfront-demo/run.snap --time 2h\n" +
			"  slipfront inspect slipfront-demo/run.snap --time 2h --csv > frame.csv",
		Args: cobra.ExactArgs(1),
		RunE: func(_ *cobra.Command, args []string) error {
			o.file = args[0]
			return runInspect(&o, stdout)
		},
	}
	cmd.Flags().StringVar(&o.time, "time", "", "time since the start of pumping, with unit (e.g. 90min, 2h; bare numbers are seconds); default the last frame")
	cmd.Flags().BoolVar(&o.csv, "csv", false, "write the frame as CSV, one row per element")
	return cmd
}

func runInspect(o *inspectOptions, stdout io.Writer) error {
	if info, err := os.Stat(o.file); err == nil && info.IsDir() {
		return badInput(folderHint(o.file))
	}
	r, err := snapshot.Open(o.file)
	if err != nil {
		return badInput(err)
	}
	defer r.Close()
	if o.time == "" && !o.csv {
		return snapshot.Describe(stdout, r.Reader)
	}
	frames := r.Frames()
	if len(frames) == 0 {
		return badInput(fmt.Errorf("%s holds no frames", o.file))
	}
	t := frames[len(frames)-1].Time
	if o.time != "" {
		if t, err = scenarios.ParseDuration(o.time); err != nil {
			return badInput(fmt.Errorf("--time %s: %w", o.time, err))
		}
	}
	if first, last := frames[0].Time, frames[len(frames)-1].Time; t < first || t > last {
		return badInput(fmt.Errorf("--time %s: the snapshot holds frames from %.6g s to %.6g s", o.time, first, last))
	}
	if o.csv {
		return snapshot.WriteFrameCSV(stdout, r.Reader, t)
	}
	return snapshot.DescribeFrame(stdout, r.Reader, t)
}

// folderHint explains that dir is a folder, not a snapshot, and points to
// what it holds: the snapshot of a run folder (complete or partial), or
// the commands that read a batch folder.
func folderHint(dir string) error {
	snap := filepath.Join(dir, pipeline.SnapshotFile)
	switch {
	case isFile(snap):
		what := "a run folder"
		if outdir.IsPartial(dir) {
			what = "the partial folder of a stopped run"
		}
		return fmt.Errorf("%s is a folder (%s), not a snapshot file; inspect its snapshot with: slipfront inspect %s", dir, what, snap)
	case isFile(filepath.Join(dir, batch.ManifestName)):
		return fmt.Errorf("%s is a folder (a batch folder, which keeps no snapshots), not a snapshot file; "+
			"its tables are CSV files, and slipfront report or export draws its maps", dir)
	}
	return fmt.Errorf("%s is a folder, not a snapshot file; a run writes its snapshot as %s in its folder", dir, pipeline.SnapshotFile)
}

// isFile reports whether path is a regular file.
func isFile(path string) bool {
	info, err := os.Stat(path)
	return err == nil && info.Mode().IsRegular()
}
