package batch

import (
	"context"
	"path/filepath"
	"strconv"
	"testing"

	"slipfront/scenarios"
)

// benchWork is the busy work of the CPU-bound fake runner: 25 to 40 ms of
// dependent floating-point square roots per realization (measured).
const benchWork = 2_400_000

func cpuRun(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
	return fakeOutcome(s, r, benchWork)
}

// benchmarkBatch runs a whole batch of 2 cases × 8 realizations with the
// CPU-bound runner per iteration, on the given number of workers. The
// speed-up of 2 workers over 1 is the ratio of the two benchmarks' times.
func benchmarkBatch(b *testing.B, workers int) {
	root := b.TempDir()
	sweep := mustSweep(b, "fluids.slickwater.viscosity=1 cP,20 cP")
	i := 0
	for b.Loop() {
		opts := Options{Load: loader(), Realizations: 8, Sweeps: []Sweep{sweep}, Workers: workers,
			Out: filepath.Join(root, strconv.Itoa(i)), Run: cpuRun}
		if _, err := Run(context.Background(), opts); err != nil {
			b.Fatal(err)
		}
		i++
	}
	b.ReportMetric(float64(16*b.N)/b.Elapsed().Seconds(), "realizations/s")
}

func BenchmarkBatchWorkers1(b *testing.B) { benchmarkBatch(b, 1) }
func BenchmarkBatchWorkers2(b *testing.B) { benchmarkBatch(b, 2) }

// benchmarkAggregate reads the results of a finished batch of 2 cases ×
// n realizations and renders every aggregate file (tables, paired
// comparison, probability grids, CSV metadata, summary) per iteration,
// without writing them.
func benchmarkAggregate(b *testing.B, n int) {
	out := b.TempDir()
	sweep := mustSweep(b, "fluids.slickwater.viscosity=1 cP,20 cP")
	opts := Options{Load: loader(), Realizations: n, Sweeps: []Sweep{sweep}, Workers: 2, Out: out, Run: fakeRun}
	if _, err := Run(context.Background(), opts); err != nil {
		b.Fatal(err)
	}
	m, err := readManifestFile(out)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		aggs, err := readAggregates(context.Background(), out, m, nil)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := renderAggregates(m, aggs); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(2*n*b.N)/b.Elapsed().Seconds(), "results/s")
}

func BenchmarkAggregate100(b *testing.B)  { benchmarkAggregate(b, 100) }
func BenchmarkAggregate1000(b *testing.B) { benchmarkAggregate(b, 1000) }
