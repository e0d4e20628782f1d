package batch_test

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"slipfront/batch"
	"slipfront/scenarios"
)

func ExampleParseSweep() {
	visc, _ := batch.ParseSweep("fluids.slickwater.viscosity=1 cP,20 cP")
	rate, _ := batch.ParseSweep("schedule.rate=6 bbl/min,8 bbl/min")
	for _, c := range batch.Cases([]batch.Sweep{visc, rate}) {
		fmt.Println(c.Index, c.Label())
	}
	// Output:
	// 0 fluids.slickwater.viscosity=1 cP, schedule.rate=6 bbl/min
	// 1 fluids.slickwater.viscosity=1 cP, schedule.rate=8 bbl/min
	// 2 fluids.slickwater.viscosity=20 cP, schedule.rate=6 bbl/min
	// 3 fluids.slickwater.viscosity=20 cP, schedule.rate=8 bbl/min
}

func ExampleParseShard() {
	s, _ := batch.ParseShard("1/4")
	var owned []int
	for r := range 10 {
		if s.Owns(r) {
			owned = append(owned, r)
		}
	}
	fmt.Println(s, owned)
	_, err := batch.ParseShard("4/4")
	fmt.Println(err)
	// Output:
	// 1/4 [1 5 9]
	// batch: --shard 4/4: the shard index must be 0 to 3 (shards are numbered from 0)
}

func ExampleGridFor() {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		fmt.Println(err)
		return
	}
	// The zipper pad's domain is x −800…800 m, y −500…500 m with 10 m cells:
	// 160 × 100. (15, −125) is column ⌊815/10⌋ = 81, row ⌊375/10⌋ = 37,
	// index 37·160 + 81 = 6001. Its six stages of 200 bbl at 10 bbl/min
	// (1200 s) and 20 min shut-ins last 6 × 2400 s = 14400 s: 48
	// intervals of 5 min, 49 times.
	g, _ := batch.GridFor(s)
	i, _ := g.CellAt(15, -125)
	col, row := g.ColRow(i)
	fmt.Printf("%d × %d cells of %g m; (15, -125) is cell %d: column %d, row %d\n", g.Cols, g.Rows, g.CellSize, i, col, row)
	tg, _ := batch.TimeGridFor(s)
	fmt.Printf("%d times, every %g s\n", tg.Points, tg.Interval)
	// Output:
	// 160 × 100 cells of 10 m; (15, -125) is cell 6001: column 81, row 37
	// 49 times, every 300 s
}

func ExampleSummarize() {
	s := batch.Summarize([]float64{70, 10, 40, 30, 20, 60, 50})
	fmt.Printf("P10 %g, P50 %g, P90 %g, mean %g, sample std %.4g\n", s.P10, s.P50, s.P90, s.Mean, s.Std)
	// Output:
	// P10 10, P50 40, P90 70, mean 40, sample std 21.6
}

// A batch with a stand-in runner: two viscosities × three realizations.
func ExampleRun() {
	dir, _ := os.MkdirTemp("", "batch-example-")
	defer os.RemoveAll(dir)
	visc, _ := batch.ParseSweep("fluids.slickwater.viscosity=1 cP,20 cP")
	run := func(ctx context.Context, s *scenarios.Scenario, r int) (*batch.Outcome, error) {
		// A real runner generates network r and simulates the schedule.
		// Here the area is 1000, 2000, 3000 m² at 1 cP, divided by the
		// viscosity in cP; P50 is the 2nd of 3 values (rank ⌈1.5⌉) and P90
		// the 3rd (rank ⌈2.7⌉).
		area := 1000 * float64(r+1) / (s.Fluids["slickwater"].Viscosity * 1e3)
		return &batch.Outcome{
			NetworkDigest: fmt.Sprintf("net-%d", r), FinalArea: area, FractureArea: 2 * area,
			MaxMagnitude: math.NaN(), PeakPressure: 40e6, InjectedVolume: 32, RetainedGain: 2,
			Times: []float64{0, 3600}, Areas: []float64{0, area}, Cells: []int{r},
		}, nil
	}
	sum, err := batch.Run(context.Background(), batch.Options{
		Load: func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
			return scenarios.LoadExample("zipper-pad", extra...)
		},
		Realizations: 3, Sweeps: []batch.Sweep{visc}, Workers: 2, Out: dir, Run: run,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(sum.Ran, "results, aggregated:", sum.Aggregated)
	b, _ := os.ReadFile(filepath.Join(dir, batch.ComparisonName))
	for _, line := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		fmt.Println(strings.Join(strings.Split(line, ",")[:6], ","))
	}
	// The paired comparison: 20 cP against the reference 1 cP on the same
	// networks, area ratio 1/20 in every realization.
	b, _ = os.ReadFile(filepath.Join(dir, batch.PairedPercentilesName))
	rows := strings.Split(strings.TrimSpace(string(b)), "\n")
	head, row := strings.Split(rows[0], ","), strings.Split(rows[1], ",")
	for i := range head {
		if strings.HasPrefix(head[i], "stimulated_area_ratio") {
			fmt.Println(head[i], row[i])
		}
	}
	// Output:
	// 6 results, aggregated: true
	// case,fluids.slickwater.viscosity,realizations,stimulated_area_m2_q10,stimulated_area_m2_q50,stimulated_area_m2_q90
	// 0,1 cP,3,1000,2000,3000
	// 1,20 cP,3,50,100,150
	// stimulated_area_ratio_q10 0.05
	// stimulated_area_ratio_q50 0.05
	// stimulated_area_ratio_q90 0.05
	// stimulated_area_ratio_count 3
}
