package batch

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"sync"
	"time"

	"slipfront/internal/crash"
	"slipfront/internal/outdir"
	"slipfront/internal/plural"
	"slipfront/internal/version"
	"slipfront/scenarios"
)

// Options configure a batch.
type Options struct {
	// Load returns the scenario with the given overrides applied after the
	// base ones, e.g.
	//
	//	func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
	//		return scenarios.Load(path, append(slices.Clone(sets), extra...)...)
	//	}
	//
	// It is called once for the base scenario, once per sweep value to
	// check it, and once per case and realization (concurrently), so the
	// runner always gets its own copy. It must be safe for concurrent use.
	Load func(extra ...scenarios.Override) (*scenarios.Scenario, error)
	// Realizations per case, ≥ 1.
	Realizations int
	// Sweeps form cases by their full product (see Case for the order).
	Sweeps []Sweep
	// Workers running realizations at once; 0 means runtime.NumCPU().
	Workers int
	// Shard of the realizations to run; the zero Shard runs them all.
	Shard Shard
	// Out is the batch folder.
	Out string
	// Resume continues the batch in Out: results already there and valid
	// are kept. Out must hold the same batch (manifest), or nothing.
	Resume bool
	// Force replaces an earlier batch in Out: everything in Out is deleted
	// before the batch starts (a batch folder is written in place, so that
	// Resume can continue it). Out must hold a batch (its manifest) or
	// nothing: Force never deletes a folder that slipfront did not write.
	Force bool
	// Run computes one realization of one case.
	Run RunFunc
	// Progress receives progress reports; nil for none. IsTerminal selects
	// a redrawn bar with rate and time left; otherwise plain lines are
	// written at each tenth of the work and at least every
	// ProgressInterval while it runs (default one minute), for logs.
	Progress         io.Writer
	IsTerminal       bool
	ProgressInterval time.Duration
	// Hooks are for tests.
	Hooks Hooks
}

// Hooks observe a batch from tests.
type Hooks struct {
	// AfterResult is called after each result file of this run is
	// committed, with the number committed so far; calls are serialized.
	AfterResult func(done int)
	// ReadResult is called with the path of every result file just before
	// it is read.
	ReadResult func(path string)
}

// Summary reports what Run did.
type Summary struct {
	// Cases and Realizations of the batch.
	Cases, Realizations int
	// Shard that ran and Owned, its number of (case, realization) results.
	Shard Shard
	Owned int
	// Resumed results were found valid and kept; Redone were present but
	// unreadable and ran again; Ran were computed now (including Redone);
	// Abandoned were running when the batch was interrupted.
	Resumed, Redone, Ran, Abandoned int
	// StaleTemps is the number of leftover temporary files removed.
	StaleTemps int
	// Complete: every owned result exists. Aggregated: the aggregate files
	// were written (complete batches of one shard; shards are aggregated
	// by Merge).
	Complete, Aggregated bool
	// Elapsed wall time.
	Elapsed time.Duration
}

type job struct{ c, r int }

// Run runs a batch: every realization of every case that the shard owns,
// on Workers goroutines, writing one result file per finished realization
// into Out/results. When the batch is complete and not sharded, it writes
// the aggregates. A cancelled ctx stops handing out work; running
// realizations finish or are abandoned (the runner sees ctx), and Run
// returns an error wrapping ctx.Err() with the folder ready for Resume.
// Bad options or input return an error matching badinput.Err before any work
// starts. The Summary is returned whenever work was attempted.
func Run(ctx context.Context, opts Options) (*Summary, error) {
	start := time.Now()
	if err := opts.check(); err != nil {
		return nil, err
	}
	m, base, cases, err := makePlan(opts)
	if err != nil {
		return nil, err
	}
	if err := prepareFolder(opts, m, base); err != nil {
		return nil, err
	}
	sum := &Summary{Cases: len(cases), Realizations: opts.Realizations, Shard: m.Shard}
	// A killed process leaves temporary files of results and, during the
	// aggregation, of the folder's tables and pictures.
	for _, dir := range []string{filepath.Join(opts.Out, ResultsDir), opts.Out} {
		n, err := removeStaleTemps(dir)
		if err != nil {
			return nil, fmt.Errorf("batch: cleaning %s: %w", dir, err)
		}
		sum.StaleTemps += n
	}
	jobs := pendingJobs(opts, m, sum)
	prog := newReporter(opts.Progress, opts.IsTerminal, opts.ProgressInterval)
	prog.start(len(jobs), sum.Resumed, sum.Owned)
	jr := &jobRunner{opts: opts, m: m, cases: cases, sum: sum, prog: prog}
	err = jr.run(ctx, jobs)
	prog.finish(err == nil)
	sum.Elapsed = time.Since(start)
	if err != nil {
		return sum, err
	}
	sum.Complete = true
	if m.Shard.Count == 1 {
		if err := aggregate(ctx, opts.Out, m, &opts.Hooks); err != nil {
			return sum, err
		}
		sum.Aggregated = true
	}
	sum.Elapsed = time.Since(start)
	return sum, nil
}

func (o *Options) check() error {
	switch {
	case o.Load == nil:
		return inputErrorf("no scenario loader")
	case o.Run == nil:
		return inputErrorf("no runner")
	case o.Realizations < 1 || o.Realizations > MaxRealizations:
		return inputErrorf("--realizations %d: must be 1 to %d", o.Realizations, MaxRealizations)
	case o.Workers < 0:
		return inputErrorf("--workers %d: must be ≥ 1 (or 0 for one per core)", o.Workers)
	case o.Out == "":
		return inputErrorf("no output folder")
	case o.Resume && o.Force:
		return inputErrorf("--resume and --force contradict each other: resume keeps the results in the folder, force deletes them")
	}
	o.Shard = o.Shard.normal()
	if err := o.Shard.check(); err != nil {
		return err
	}
	if o.Workers == 0 {
		o.Workers = runtime.NumCPU()
	}
	if err := checkSweeps(o.Sweeps); err != nil {
		return err
	}
	if n := len(Cases(o.Sweeps)) * o.Realizations; n > MaxResults {
		return inputErrorf("%s × %s = %d results: at most %d; use fewer realizations or sweep values", plural.S(len(Cases(o.Sweeps)), "case"), plural.S(o.Realizations, "realization"), n, MaxResults)
	}
	o.Sweeps = slices.Clone(o.Sweeps)
	for i, s := range o.Sweeps {
		o.Sweeps[i].Reference = s.Values[s.reference()]
	}
	return nil
}

// makePlan loads the base scenario, checks every sweep value on its own,
// then loads every case, and returns the batch's manifest, the base
// scenario and the cases.
func makePlan(opts Options) (*Manifest, *scenarios.Scenario, []Case, error) {
	base, err := opts.Load()
	if err != nil {
		return nil, nil, nil, inputError("scenario", err)
	}
	for _, sw := range opts.Sweeps {
		if err := checkSweepChanges(opts, base, sw); err != nil {
			return nil, nil, nil, err
		}
	}
	cases := Cases(opts.Sweeps)
	m := &Manifest{
		Format: ManifestFormat, ProgramVersion: version.Version,
		Scenario: ManifestScenario{Name: base.Name, Digest: base.Digest, Seed: base.Seed, Start: base.Schedule.Start},
		Sweeps:   opts.Sweeps, Realizations: opts.Realizations, Shard: opts.Shard,
	}
	if m.Sweeps == nil {
		m.Sweeps = []Sweep{}
	}
	for _, c := range cases {
		s, err := opts.Load(c.Overrides...)
		if err != nil {
			return nil, nil, nil, inputError("case "+c.Label(), err)
		}
		g, err := GridFor(s)
		if err != nil {
			return nil, nil, nil, inputError("case "+c.Label(), err)
		}
		tg, err := TimeGridFor(s)
		if err != nil {
			return nil, nil, nil, inputError("case "+c.Label(), err)
		}
		m.Cases = append(m.Cases, ManifestCase{
			Index: c.Index, Label: c.Label(), Values: c.Values, Digest: s.Digest, Grid: g, TimeGrid: tg,
		})
	}
	return m, base, cases, nil
}

// checkSweepChanges loads the base scenario with each value of the sweep
// on its own and refuses a sweep that changes nothing a run uses (every
// value gives the base scenario's run, compared by
// scenarios.Scenario.UsedDigest: a fluid declared new that no stage
// pumps changes only what no run reads) and two values that give the same
// scenario ("1 cP" and "0.001 Pa.s"). Loading refuses a value of a key
// that no run reads, or that adds an entry nothing names.
func checkSweepChanges(opts Options, base *scenarios.Scenario, sw Sweep) error {
	digests := make([]string, len(sw.Values))
	baseRun := base.UsedDigest()
	unchanged := 0
	for i, v := range sw.Values {
		s, err := opts.Load(scenarios.Override{Key: sw.Key, Value: v})
		if err != nil {
			return inputError(fmt.Sprintf("--sweep %s: value %q", sw.Key, v), err)
		}
		digests[i] = s.Digest
		if s.UsedDigest() == baseRun {
			unchanged++
		}
	}
	if unchanged == len(sw.Values) {
		what := fmt.Sprintf("its value %q gives", sw.Values[0])
		if len(sw.Values) > 1 {
			what = "every value gives"
		}
		return inputErrorf("--sweep %s changes nothing a run uses: %s the base scenario's run; sweep other values or another key", sw.Key, what)
	}
	for i := range sw.Values {
		for j := range i {
			if digests[i] == digests[j] {
				return inputErrorf("--sweep %s: values %q and %q give the same scenario", sw.Key, sw.Values[j], sw.Values[i])
			}
		}
	}
	return nil
}

// prepareFolder checks Out against the options, clears it for Force, and
// writes the manifest and the base scenario.
func prepareFolder(opts Options, m *Manifest, base *scenarios.Scenario) error {
	old, err := readManifestFile(opts.Out)
	switch {
	case opts.Force:
		if err := clearBatchFolder(opts.Out); err != nil {
			return err
		}
	case err == nil && opts.Resume:
		if field, want, got, differ := m.difference(old, true); differ {
			return &MismatchError{Field: field, Want: want, Got: got, WantFrom: "this batch", Dir: opts.Out}
		}
	case err == nil:
		return inputError(opts.Out+" holds a batch; use --resume to continue it or --force to replace it", outdir.ErrExists)
	case !errors.Is(err, fs.ErrNotExist):
		return inputError("cannot use "+opts.Out+" (use --force to replace it)", err)
	default:
		entries, rerr := os.ReadDir(opts.Out)
		if rerr == nil && len(entries) > 0 {
			return inputError(fmt.Sprintf("%s holds %s but no %s, so it is not a batch folder; choose another --out", opts.Out,
				plural.Count(len(entries), "entry", "entries"), ManifestName), outdir.ErrExists)
		}
	}
	if err := os.MkdirAll(filepath.Join(opts.Out, ResultsDir), 0o755); err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	if err := writeFileAtomic(opts.Out, ManifestName, func(w io.Writer) error { return WriteManifest(w, m) }); err != nil {
		return err
	}
	return writeScenario(opts.Out, m, base, opts.Resume)
}

// clearBatchFolder empties dir for --force. It refuses a folder that
// holds something but no manifest: --force replaces a batch folder (or
// the output folder of any command) only when slipfront wrote it, so a
// mistyped --out cannot delete someone's files. An absent dir is fine.
func clearBatchFolder(dir string) error {
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return inputError("output folder", err)
	}
	if len(entries) == 0 {
		return nil
	}
	if _, err := os.Lstat(filepath.Join(dir, ManifestName)); err != nil {
		return inputError(fmt.Sprintf("%s holds %s but no %s, so it is not a batch folder; --force replaces only a batch folder: choose another --out",
			dir, plural.Count(len(entries), "entry", "entries"), ManifestName), outdir.ErrExists)
	}
	for _, e := range entries {
		if err := os.RemoveAll(filepath.Join(dir, e.Name())); err != nil {
			return fmt.Errorf("batch: clearing %s: %w", dir, err)
		}
	}
	return nil
}

// pendingJobs lists the (case, realization) pairs still to run, in
// realization-major order (all cases of realization 0, then 1, …), so an
// interrupted batch has every case equally far along. With Resume, valid
// result files are kept and unreadable ones are run again.
func pendingJobs(opts Options, m *Manifest, sum *Summary) []job {
	var jobs []job
	for r := 0; r < m.Realizations; r++ {
		if !m.Shard.Owns(r) {
			continue
		}
		for c := range m.Cases {
			sum.Owned++
			if opts.Resume {
				_, err := readResultFile(opts.Out, c, r, &m.Cases[c], &opts.Hooks)
				if err == nil {
					sum.Resumed++
					continue
				}
				if !errors.Is(err, fs.ErrNotExist) {
					sum.Redone++
				}
			}
			jobs = append(jobs, job{c, r})
		}
	}
	return jobs
}

// jobRunner runs the jobs of a batch on its workers and keeps the tally.
type jobRunner struct {
	opts  Options
	m     *Manifest
	cases []Case
	sum   *Summary
	prog  reporter
	// cancel stops the other workers after the first failure.
	cancel context.CancelFunc

	mu       sync.Mutex // guards sum, prog and firstErr
	firstErr error
}

// run runs jobs on the workers until done, the first failure, or
// cancellation.
func (jr *jobRunner) run(parent context.Context, jobs []job) error {
	ctx, cancel := context.WithCancel(parent)
	defer cancel()
	jr.cancel = cancel
	feed := feedJobs(ctx, jobs)
	var wg sync.WaitGroup
	for range min(jr.opts.Workers, len(jobs)) {
		wg.Go(func() { jr.work(ctx, feed) })
	}
	wg.Wait()
	switch {
	case jr.firstErr != nil:
		return jr.firstErr
	case parent.Err() != nil:
		return fmt.Errorf("batch: interrupted with %d of %s done; run again with --resume to finish: %w",
			jr.sum.Resumed+jr.sum.Ran, plural.S(jr.sum.Owned, "result"), parent.Err())
	}
	return nil
}

// feedJobs sends the jobs in order until they are all taken or ctx ends.
func feedJobs(ctx context.Context, jobs []job) <-chan job {
	feed := make(chan job)
	go func() {
		defer close(feed)
		for _, j := range jobs {
			select {
			case feed <- j:
			case <-ctx.Done():
				return
			}
		}
	}()
	return feed
}

// work runs the jobs it takes from feed; after a cancellation it drains
// feed without running them.
func (jr *jobRunner) work(ctx context.Context, feed <-chan job) {
	for j := range feed {
		if ctx.Err() != nil {
			continue
		}
		// A panic in a realization is a bug: it reaches the caller as a
		// crash.Error instead of killing the process from this goroutine.
		jr.record(ctx, crash.Capture(func() error { return runOne(ctx, jr.opts, jr.m, jr.cases, j) }))
	}
}

// record counts a finished job, or keeps the first failure and cancels the
// others.
func (jr *jobRunner) record(ctx context.Context, err error) {
	jr.mu.Lock()
	defer jr.mu.Unlock()
	switch {
	case err == nil:
		jr.sum.Ran++
		jr.prog.step()
		if jr.opts.Hooks.AfterResult != nil {
			jr.opts.Hooks.AfterResult(jr.sum.Ran)
		}
	case ctx.Err() != nil:
		jr.sum.Abandoned++
	default:
		jr.firstErr = err
		jr.cancel()
	}
}

// runOne runs and stores one realization of one case.
func runOne(ctx context.Context, opts Options, m *Manifest, cases []Case, j job) error {
	mc := &m.Cases[j.c]
	where := fmt.Sprintf("batch: case %d (%s), realization %d", j.c, mc.Label, j.r)
	s, err := opts.Load(cases[j.c].Overrides...)
	if err != nil {
		return fmt.Errorf("%s: loading the scenario: %w", where, err)
	}
	if s.Digest != mc.Digest {
		return fmt.Errorf("%s: the scenario changed while the batch ran (digest %s, expected %s)", where, s.Digest, mc.Digest)
	}
	out, err := opts.Run(ctx, s, j.r)
	if err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	res, err := newResult(j.c, j.r, mc.Digest, mc.Grid, mc.TimeGrid, out)
	if err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	if err := writeFileAtomic(opts.Out, ResultName(j.c, j.r), func(w io.Writer) error { return WriteResult(w, res) }); err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	return nil
}
