package batch

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
)

func TestWorkersAndShardsGiveSameBytes(t *testing.T) {
	root := t.TempDir()

	one := testOptions(t, filepath.Join(root, "one"))
	sum := runBatch(t, one)
	if !sum.Complete || !sum.Aggregated || sum.Ran != 4*7 || sum.Owned != 4*7 {
		t.Fatalf("1 worker: summary %+v, want 28 results run, complete, aggregated", sum)
	}
	want := aggregateFiles(t, one.Out)

	two := testOptions(t, filepath.Join(root, "two"))
	two.Workers = 2
	runBatch(t, two)
	sameFiles(t, "1 worker vs 2 workers", want, aggregateFiles(t, two.Out))

	var shards []string
	for i := range 3 {
		o := testOptions(t, filepath.Join(root, fmt.Sprintf("shard%d", i)))
		o.Workers, o.Shard = 2, Shard{Index: i, Count: 3}
		sum := runBatch(t, o)
		// Shard i of 3 owns realizations i, i+3, … of 0…6: 3, 2, 2 of them.
		wantOwned := 4 * len(ownedBy(i, 3, 7))
		if sum.Owned != wantOwned || sum.Aggregated || !sum.Complete {
			t.Errorf("shard %d: summary %+v, want %d owned, complete, not aggregated", i, sum, wantOwned)
		}
		if _, err := os.Stat(filepath.Join(o.Out, RealizationsName)); err == nil {
			t.Errorf("shard %d wrote aggregates", i)
		}
		shards = append(shards, o.Out)
	}
	merged := filepath.Join(root, "merged")
	// Shard order on the command line does not matter.
	if err := Merge(context.Background(), []string{shards[2], shards[0], shards[1]}, merged, false); err != nil {
		t.Fatal(err)
	}
	sameFiles(t, "1 worker vs 3 shards merged", want, aggregateFiles(t, merged))

	// --force replaces an earlier merge (a stale file of it goes too), and
	// nothing else.
	if err := Merge(context.Background(), shards, merged, false); !errors.Is(err, outdir.ErrExists) || !strings.Contains(err.Error(), "--force") {
		t.Errorf("merge into an earlier merge without force: err = %v", err)
	}
	stale := filepath.Join(merged, "fan_0009.png")
	if err := os.WriteFile(stale, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Merge(context.Background(), shards, merged, true); err != nil {
		t.Fatalf("merge --force: %v", err)
	}
	sameFiles(t, "merged again with force", want, aggregateFiles(t, merged))
	if _, err := os.Stat(stale); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("merge --force kept a file of the earlier merge (%v)", err)
	}
	if err := Merge(context.Background(), shards, shards[1], true); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "is one of the shard folders") {
		t.Errorf("merge into a shard folder: err = %v", err)
	}
	if _, err := os.Stat(filepath.Join(shards[1], ManifestName)); err != nil {
		t.Errorf("a refused merge damaged its shard: %v", err)
	}

	// The aggregates are not empty: a header and one row per case ×
	// realization, per case × time, per case.
	rows := csvRows(t, want[RealizationsName])
	if len(rows) != 1+4*7 {
		t.Errorf("realizations.csv has %d rows, want %d", len(rows), 1+4*7)
	}
	if got := strings.Join(rows[0][:3], ","); got != "case,fluids.slickwater.viscosity,schedule.rate" {
		t.Errorf("realizations.csv header starts %q", got)
	}
}

func ownedBy(i, n, total int) []int {
	var rs []int
	for r := range total {
		if r%n == i {
			rs = append(rs, r)
		}
	}
	return rs
}

func csvRows(t testing.TB, b []byte) [][]string {
	t.Helper()
	rd := csv.NewReader(bytes.NewReader(b))
	rd.Comment = '#'
	rows, err := rd.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

func TestInterruptAndResume(t *testing.T) {
	root := t.TempDir()
	full := testOptions(t, filepath.Join(root, "full"))
	runBatch(t, full)
	want := aggregateFiles(t, full.Out)

	const k = 9 // results before the interruption
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	cut := testOptions(t, filepath.Join(root, "cut"))
	cut.Workers = 2
	cut.Hooks.AfterResult = func(done int) {
		if done == k {
			cancel()
		}
	}
	sum, err := Run(ctx, cut)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("interrupted batch: err = %v, want one wrapping context.Canceled", err)
	}
	if sum == nil || sum.Complete || sum.Aggregated || sum.Ran < k || sum.Ran >= 28 {
		t.Fatalf("interrupted batch: summary %+v, want ≥ %d and < 28 results, incomplete", sum, k)
	}
	if _, err := os.Stat(filepath.Join(cut.Out, RealizationsName)); err == nil {
		t.Fatal("an interrupted batch wrote aggregates")
	}
	files, _ := filepath.Glob(filepath.Join(cut.Out, ResultsDir, "*.sfr"))
	if len(files) != sum.Ran {
		t.Fatalf("%d result files for %d results reported", len(files), sum.Ran)
	}

	// What a crash could leave: a half-written temporary file, and (only
	// if something outside the batch damaged it) a cut result file.
	good, err := os.ReadFile(files[0])
	if err != nil {
		t.Fatal(err)
	}
	temp := filepath.Join(cut.Out, ResultsDir, "."+filepath.Base(files[1])+".tmp-123")
	if err := os.WriteFile(temp, good[:len(good)/2], 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(files[0], good[:len(good)-3], 0o644); err != nil {
		t.Fatal(err)
	}

	resume := testOptions(t, cut.Out)
	resume.Resume, resume.Workers = true, 2
	var mu sync.Mutex
	var read []string
	resume.Hooks.ReadResult = func(path string) {
		mu.Lock()
		read = append(read, path)
		mu.Unlock()
	}
	sum2 := runBatch(t, resume)
	if sum2.StaleTemps != 1 || sum2.Redone != 1 || sum2.Resumed != sum.Ran-1 || sum2.Ran != 28-sum2.Resumed {
		t.Errorf("resume: summary %+v, want 1 stale temp removed, 1 redone, %d resumed", sum2, sum.Ran-1)
	}
	for _, p := range read {
		if isTempName(filepath.Base(p)) {
			t.Errorf("resume read the temporary file %s", p)
		}
	}
	if _, err := os.Stat(temp); err == nil {
		t.Error("the stale temporary file is still there")
	}
	sameFiles(t, "uninterrupted vs interrupted and resumed", want, aggregateFiles(t, cut.Out))

	// Resuming a finished batch runs nothing and rewrites the same bytes.
	sum3 := runBatch(t, resume)
	if sum3.Ran != 0 || sum3.Resumed != 28 {
		t.Errorf("resuming a finished batch: summary %+v, want nothing run, 28 resumed", sum3)
	}
	sameFiles(t, "finished batch resumed again", want, aggregateFiles(t, cut.Out))
}

// A runner that honours cancellation is abandoned: no result is written
// for it, and the batch can be resumed.
func TestInterruptAbandonsRunning(t *testing.T) {
	out := t.TempDir()
	opts := testOptions(t, out)
	opts.Workers = 2
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var calls atomic.Int32
	opts.Run = func(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
		if calls.Add(1) == 3 {
			cancel() // the third call interrupts the batch and waits for it
			<-ctx.Done()
			return nil, ctx.Err()
		}
		return fakeRun(context.Background(), s, r)
	}
	sum, err := Run(ctx, opts)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err = %v, want context.Canceled", err)
	}
	files, _ := filepath.Glob(filepath.Join(out, ResultsDir, "*"))
	if sum.Abandoned < 1 || len(files) != sum.Ran {
		t.Errorf("summary %+v with %d files: want ≥ 1 abandoned and one file per result", sum, len(files))
	}
	opts.Run, opts.Resume = fakeRun, true
	if sum := runBatch(t, opts); !sum.Aggregated {
		t.Errorf("resume after abandoning: %+v", sum)
	}
}

// A runner error stops the batch and names the case and realization.
func TestRunnerErrorStopsBatch(t *testing.T) {
	opts := testOptions(t, t.TempDir())
	opts.Run = func(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
		if r == 2 {
			return nil, errors.New("solver did not converge")
		}
		return fakeRun(ctx, s, r)
	}
	_, err := Run(context.Background(), opts)
	if err == nil || !strings.Contains(err.Error(), "realization 2") || !strings.Contains(err.Error(), "did not converge") || errors.Is(err, badinput.Err) {
		t.Errorf("err = %v, want the runner's error naming realization 2, not a bad-input error", err)
	}
	opts.Run = func(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
		o, _ := fakeRun(ctx, s, r)
		o.Cells = append(o.Cells, 30*20) // one past the last cell of the 30 × 20 grid
		return o, nil
	}
	opts.Force = true
	if _, err := Run(context.Background(), opts); err == nil || !strings.Contains(err.Error(), "outside the map grid") {
		t.Errorf("outcome with a cell off the grid: err = %v", err)
	}
}

// Common random numbers: with the real network generator, realization r
// has the same network in every case of a viscosity sweep, and different
// realizations have different networks. Sweeping the seed breaks this,
// which shows the check can fail.
func TestCommonRandomNumbers(t *testing.T) {
	withNetwork := func(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
		net, err := dfn.Generate(s, r)
		if err != nil {
			return nil, err
		}
		o, err := fakeOutcome(s, r, 0)
		if err != nil {
			return nil, err
		}
		o.NetworkDigest = net.Digest()
		return o, nil
	}
	digests := func(sweep string) map[int]map[string]bool {
		out := filepath.Join(t.TempDir(), "b")
		opts := Options{Load: loader(), Realizations: 4, Sweeps: []Sweep{mustSweep(t, sweep)}, Workers: 2, Out: out, Run: withNetwork}
		runBatch(t, opts)
		b, err := os.ReadFile(filepath.Join(out, RealizationsName))
		if err != nil {
			t.Fatal(err)
		}
		byReal := map[int]map[string]bool{}
		rows := csvRows(t, b)
		for _, row := range rows[1:] {
			var r int
			fmt.Sscan(row[2], &r)
			if byReal[r] == nil {
				byReal[r] = map[string]bool{}
			}
			byReal[r][row[3]] = true
		}
		return byReal
	}

	base, err := scenarios.Load(tinyPath)
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]int{}
	for r, ds := range digests("fluids.slickwater.viscosity=1 cP,5 cP,20 cP") {
		if len(ds) != 1 {
			t.Errorf("realization %d: %d network digests across the viscosity sweep, want 1: %v", r, len(ds), ds)
			continue
		}
		net, err := dfn.Generate(base, r)
		if err != nil {
			t.Fatal(err)
		}
		for d := range ds {
			if d != net.Digest() {
				t.Errorf("realization %d: digest %s, want dfn.Generate's %s", r, d, net.Digest())
			}
			if other, dup := seen[d]; dup {
				t.Errorf("realizations %d and %d share a network", other, r)
			}
			seen[d] = r
		}
	}
	for r, ds := range digests("seed=7,8") {
		if len(ds) != 2 {
			t.Errorf("seed sweep, realization %d: %d digests, want 2 (a changed seed must change the network)", r, len(ds))
		}
	}
}

func TestBadInput(t *testing.T) {
	badSweep := func(s string) []Sweep {
		return []Sweep{{Key: strings.Split(s, "=")[0], Values: strings.Split(strings.Split(s, "=")[1], ",")}}
	}
	for _, tc := range []struct {
		name   string
		modify func(o *Options)
		want   string // in the message
	}{
		{"realizations 0", func(o *Options) { o.Realizations = 0 }, "--realizations 0"},
		{"negative workers", func(o *Options) { o.Workers = -1 }, "--workers -1"},
		{"bad shard", func(o *Options) { o.Shard = Shard{Index: 3, Count: 3} }, "shard index must be 0 to 2"},
		{"unknown sweep key", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater.viscosty=1 cP,2 cP") }, "viscosty"},
		{"second value invalid", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater.viscosity=1 cP,-3 cP") }, `"-3 cP"`},
		{"value without unit", func(o *Options) { o.Sweeps = badSweep("schedule.rate=8 bbl/min,9") }, `"9"`},
		{"table key", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater=1,2") }, "fluids.slickwater"},
		{"same scenario twice", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater.viscosity=2 cP,0.002 Pa.s") }, `values "2 cP" and "0.002 Pa.s" give the same scenario`},
		{"only the base value", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater.viscosity=1 cP") },
			`--sweep fluids.slickwater.viscosity changes nothing a run uses: its value "1 cP" gives the base scenario's run`},
		{"every value the base's", func(o *Options) { o.Sweeps = badSweep("fluids.slickwater.viscosity=1 cP,0.001 Pa.s") },
			"fluids.slickwater.viscosity changes nothing a run uses: every value gives the base scenario's run"},
		{"mistyped fluid", func(o *Options) { o.Sweeps = badSweep("fluids.slickwatr.viscosity=1 cP,20 cP") },
			`--sweep fluids.slickwatr.viscosity: value "1 cP": --set fluids.slickwatr.viscosity=1 cP: the scenario has no fluids.slickwatr`},
		{"unpumped fluid", func(o *Options) { o.Sweeps = badSweep("fluids.gel.viscosity=1 cP,20 cP") },
			"--set fluids.gel.viscosity=1 cP: changes nothing a run uses: no stage pumps fluids.gel"},
		{"declared fluid nothing pumps", func(o *Options) { o.Sweeps = badSweep("+fluids.brine.viscosity=1 cP,2 cP") },
			"--sweep +fluids.brine.viscosity changes nothing a run uses: every value gives the base scenario's run"},
		{"key of another law", func(o *Options) { o.Sweeps = badSweep("sets[0].size.mean=10 m,20 m") },
			"sets[0].size.mean is read only when sets[0].size.distribution is lognormal or exponential"},
		{"same key twice", func(o *Options) {
			o.Sweeps = append(badSweep("seed=1,2"), badSweep("seed=3,4")...)
		}, "given twice"},
		{"resume and force", func(o *Options) { o.Resume, o.Force = true, true }, "contradict"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out := filepath.Join(t.TempDir(), "b")
			o := testOptions(t, out)
			called := false
			o.Run = func(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
				called = true
				return fakeRun(ctx, s, r)
			}
			tc.modify(&o)
			_, err := Run(context.Background(), o)
			if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("err = %v, want a bad-input error mentioning %s", err, tc.want)
			}
			if called {
				t.Error("the runner was called despite bad input")
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("the output folder was created despite bad input")
			}
		})
	}
}

func TestFolderRules(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	o.Realizations = 2
	runBatch(t, o)

	if _, err := Run(context.Background(), o); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "--resume") {
		t.Errorf("rerun into a batch folder: err = %v, want bad input suggesting --resume", err)
	}
	o.Resume = true
	o.Realizations = 3
	var mm *MismatchError
	if _, err := Run(context.Background(), o); !errors.As(err, &mm) || mm.Field != "realizations" || !errors.Is(err, badinput.Err) {
		t.Errorf("resume with other realizations: err = %v, want a MismatchError on realizations", err)
	}
	o.Realizations, o.Shard = 2, Shard{Index: 0, Count: 2}
	if _, err := Run(context.Background(), o); !errors.As(err, &mm) || mm.Field != "shard" {
		t.Errorf("resume as another shard: err = %v, want a MismatchError on the shard", err)
	}
	o.Shard, o.Load = Shard{}, loader(scenarios.Override{Key: "layer.thickness", Value: "25 m"})
	if _, err := Run(context.Background(), o); !errors.As(err, &mm) || mm.Field != "scenario digest" {
		t.Errorf("resume with another scenario: err = %v, want a MismatchError on the scenario digest", err)
	}
	o.Resume, o.Force = false, true
	if sum := runBatch(t, o); sum.Ran != 8 {
		t.Errorf("--force: ran %d results, want all 8", sum.Ran)
	}

	other := t.TempDir()
	notes := filepath.Join(other, "notes.txt")
	if err := os.WriteFile(notes, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	o2 := testOptions(t, other)
	if _, err := Run(context.Background(), o2); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "not a batch folder") {
		t.Errorf("batch into a folder of other files: err = %v, want bad input", err)
	}
	// --force replaces only a batch folder: it deletes nobody's notes.
	o2.Force = true
	if _, err := Run(context.Background(), o2); !errors.Is(err, outdir.ErrExists) || !strings.Contains(err.Error(), "--force replaces only a batch folder") {
		t.Errorf("--force on a folder of other files: err = %v", err)
	}
	if b, err := os.ReadFile(notes); err != nil || string(b) != "mine" {
		t.Errorf("--force touched a file it did not write: %q, %v", b, err)
	}
}

// A batch keeps its base scenario (the --set overrides, no sweep value)
// as ScenarioName with the manifest's digest. Resuming a folder that lacks
// it (written before batches kept it) writes it; resuming one whose
// scenario was swapped for another is refused.
func TestBatchKeepsScenario(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	o.Realizations = 2
	runBatch(t, o)
	base, err := loader()()
	if err != nil {
		t.Fatal(err)
	}
	m, err := readManifestFile(out)
	if err != nil {
		t.Fatal(err)
	}
	s, err := ReadScenario(out, m)
	if err != nil || s == nil || s.Digest != base.Digest || m.Scenario.Digest != base.Digest {
		t.Fatalf("kept scenario %v, error %v; want the base scenario %.12s…", s, err, base.Digest)
	}
	kept, err := os.ReadFile(filepath.Join(out, ScenarioName))
	if err != nil {
		t.Fatal(err)
	}

	o.Resume = true
	if err := os.Remove(filepath.Join(out, ScenarioName)); err != nil {
		t.Fatal(err)
	}
	runBatch(t, o)
	if again, err := os.ReadFile(filepath.Join(out, ScenarioName)); err != nil || !bytes.Equal(again, kept) {
		t.Errorf("resuming a folder without its scenario: %v; want the same bytes written again", err)
	}

	swapScenario(t, out)
	if _, err := Run(context.Background(), o); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "mixes two scenarios") {
		t.Errorf("resuming a folder with another scenario: err = %v, want bad input saying it mixes two scenarios", err)
	}
	if _, err := ReadScenario(out, m); !errors.Is(err, badinput.Err) {
		t.Errorf("reading another scenario: err = %v, want bad input", err)
	}
}

func TestMergeRefuses(t *testing.T) {
	root := t.TempDir()
	shard := func(name string, i, n int, mod func(*Options)) string {
		o := testOptions(t, filepath.Join(root, name))
		o.Realizations, o.Shard = 4, Shard{Index: i, Count: n}
		if mod != nil {
			mod(&o)
		}
		runBatch(t, o)
		return o.Out
	}
	a0, a1 := shard("a0", 0, 2, nil), shard("a1", 1, 2, nil)
	b1 := shard("b1", 1, 2, func(o *Options) { o.Load = loader(scenarios.Override{Key: "layer.thickness", Value: "25 m"}) })
	c1 := shard("c1", 1, 2, func(o *Options) { o.Realizations = 6 })
	d0 := shard("d0", 0, 3, nil)
	// A shard whose manifest claims 10⁹ realizations (beyond MaxRealizations)
	// is refused when read, before anything is counted or allocated.
	e1 := shard("e1", 1, 2, nil)
	claim, err := os.ReadFile(filepath.Join(e1, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	huge := strings.Replace(string(claim), `"realizations": 4`, `"realizations": 1000000000`, 1)
	if huge == string(claim) {
		t.Fatal("the manifest edit did not apply")
	}
	if err := os.WriteFile(filepath.Join(e1, ManifestName), []byte(huge), 0o644); err != nil {
		t.Fatal(err)
	}
	// A shard whose base scenario was swapped for another's.
	f1 := shard("f1", 1, 2, nil)
	swapScenario(t, f1)

	var mm *MismatchError
	err = Merge(context.Background(), []string{a0, b1}, filepath.Join(root, "m1"), false)
	if !errors.As(err, &mm) || mm.Field != "scenario digest" || !strings.Contains(err.Error(), b1) {
		t.Errorf("different scenarios: err = %v, want a MismatchError on the scenario digest naming %s", err, b1)
	}
	if err := Merge(context.Background(), []string{a0, c1}, filepath.Join(root, "m2"), false); !errors.As(err, &mm) || mm.Field != "realizations" {
		t.Errorf("different realizations: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0, d0}, filepath.Join(root, "m3"), false); !errors.As(err, &mm) || mm.Field != "shard count" {
		t.Errorf("different shard counts: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0}, filepath.Join(root, "m4"), false); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "shard 1/2 is missing") {
		t.Errorf("missing shard: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0, a0}, filepath.Join(root, "m5"), false); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "both shard 0/2") {
		t.Errorf("same shard twice: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0, root}, filepath.Join(root, "m6"), false); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "not a batch folder") {
		t.Errorf("not a batch folder: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0, e1}, filepath.Join(root, "m8"), false); !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), "realizations = 1000000000: must be 1 to 1000000") {
		t.Errorf("a manifest claiming 10⁹ realizations: err = %v", err)
	}
	if err := Merge(context.Background(), []string{a0, f1}, filepath.Join(root, "m9"), false); !errors.Is(err, badinput.Err) ||
		!strings.Contains(err.Error(), "mixes two scenarios") || !strings.Contains(err.Error(), f1) {
		t.Errorf("a shard with another scenario: err = %v, want bad input naming %s", err, f1)
	}
	os.Remove(filepath.Join(a1, ResultName(2, 3)))
	if err := Merge(context.Background(), []string{a0, a1}, filepath.Join(root, "m7"), false); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "incomplete") {
		t.Errorf("incomplete shard: err = %v", err)
	}
	for _, m := range []string{"m1", "m2", "m3", "m4", "m5", "m6", "m7", "m8", "m9"} {
		if _, err := os.Stat(filepath.Join(root, m)); err == nil {
			t.Errorf("a refused merge created %s", m)
		}
	}
}

func TestProgressLines(t *testing.T) {
	var plain, bar bytes.Buffer
	o := testOptions(t, filepath.Join(t.TempDir(), "a"))
	o.Progress = &plain
	runBatch(t, o)
	lines := strings.Split(strings.TrimSpace(plain.String()), "\n")
	// A start line, one line per tenth of 28 results (10 of them), and a
	// final line.
	if len(lines) != 12 || !strings.Contains(lines[len(lines)-2], "28/28 done (100%)") || !strings.Contains(lines[len(lines)-1], "28 results computed") {
		t.Errorf("plain progress:\n%s", plain.String())
	}
	o = testOptions(t, filepath.Join(t.TempDir(), "b"))
	o.Progress, o.IsTerminal = &bar, true
	runBatch(t, o)
	if s := bar.String(); !strings.Contains(s, "\r") || !strings.Contains(s, "28/28") || !strings.Contains(s, "real/s") {
		t.Errorf("terminal progress bar: %q", s)
	}
}
