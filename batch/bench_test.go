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
