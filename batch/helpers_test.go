package batch

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"testing"

	"slipfront/scenarios"
)

// tinyPath is a small invented scenario: a 300 m × 200 m map of 10 m
// cells (30 × 20), two stages of 100 bbl at 8 bbl/min with 10 min shut-ins,
// output every 2 min.
var tinyPath = filepath.Join("testdata", "tiny.toml")

// loader returns an Options.Load for testdata/tiny.toml with base
// overrides.
func loader(base ...scenarios.Override) func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
	return func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
		return scenarios.Load(tinyPath, append(slices.Clone(base), extra...)...)
	}
}

// fakeOutcome is a deterministic stand-in for the simulator: every draw
// comes from a PCG seeded by (scenario seed, realization), as the real
// simulator's do, and the case's fluid viscosity scales the area, so
// cases differ while sharing their random numbers. work adds that many
// iterations of floating-point busy work (for benchmarks).
func fakeOutcome(s *scenarios.Scenario, r int, work int) (*Outcome, error) {
	g, err := GridFor(s)
	if err != nil {
		return nil, err
	}
	rng := rand.New(rand.NewPCG(s.Seed, uint64(r)))
	visc := s.Fluids[s.Schedule.Fluid].Viscosity
	length := s.ScheduleLength()
	scale := 2e4 * (1 + rng.Float64()) * math.Sqrt(1e-3/visc)
	n := 2 + rng.IntN(15)
	o := &Outcome{NetworkDigest: fmt.Sprintf("fake-%d-%d", s.Seed, r), MaxMagnitude: math.NaN()}
	t := 0.0
	for range n {
		o.Times = append(o.Times, t)
		o.Areas = append(o.Areas, scale*(1-math.Exp(-3*t/length)))
		t += length * rng.Float64() / float64(n) * 1.5
	}
	o.FinalArea = o.Areas[n-1]
	o.FractureArea = 0.5 * o.FinalArea * (1 + rng.Float64())
	if o.Events = rng.IntN(5); o.Events > 0 {
		o.MaxMagnitude = -2 + rng.Float64()
	}
	o.PeakPressure = 30e6 + 5e6*rng.Float64() + 1e8*visc
	o.InjectedVolume = 30 + rng.Float64()
	o.SeismicMoment, o.AseismicMoment, o.RetainedGain = 1e10*o.InjectedVolume, 4e11*o.InjectedVolume, 1+o.FinalArea/1e4
	// Warnings: 0 to 2 of one kind, and sometimes one of another.
	for k := range rng.IntN(3) {
		o.Warnings = append(o.Warnings, Warning{Kind: "bhp_above_shmin", Message: fmt.Sprintf("stage %d: fake warning of realization %d", k, r)})
	}
	if rng.IntN(4) == 0 {
		o.Warnings = append(o.Warnings, Warning{Kind: "volume_not_reached", Message: fmt.Sprintf("fake warning of realization %d", r)})
	}
	cells := int(o.FinalArea / (g.CellSize * g.CellSize))
	for range min(cells, g.Cells()) {
		o.Cells = append(o.Cells, rng.IntN(g.Cells()))
	}
	acc := 0.0
	for i := range work {
		acc += math.Sqrt(float64(i) + acc*1e-9)
	}
	if math.IsNaN(acc) {
		return nil, fmt.Errorf("busy work went wrong")
	}
	return o, nil
}

func fakeRun(ctx context.Context, s *scenarios.Scenario, r int) (*Outcome, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return fakeOutcome(s, r, 0)
}

func mustSweep(t testing.TB, text string) Sweep {
	t.Helper()
	s, err := ParseSweep(text)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// testOptions is a small batch of 4 cases (2 viscosities × 2 rates, so the
// cases' time grids differ) × 7 realizations.
func testOptions(t testing.TB, out string) Options {
	return Options{
		Load:         loader(),
		Realizations: 7,
		Sweeps: []Sweep{
			mustSweep(t, "fluids.slickwater.viscosity=1 cP, 5 cP"),
			mustSweep(t, "schedule.rate=8 bbl/min,6 bbl/min"),
		},
		Workers: 1,
		Out:     out,
		Run:     fakeRun,
	}
}

// aggregateFiles reads the files of a batch folder that must agree byte for
// byte between equivalent batches, relative to the folder: the manifest,
// the base scenario, the aggregates and the probability grids.
func aggregateFiles(t testing.TB, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	names := []string{ManifestName, ScenarioName, RealizationsName, PercentilesName, ComparisonName, WarningsName, SummaryName,
		CSVMetadataName, filepath.Join(ProbabilityDir, CSVMetadataName)}
	if _, err := os.Stat(filepath.Join(dir, PairedName)); err == nil {
		names = append(names, PairedName, PairedPercentilesName)
	}
	grids, err := filepath.Glob(filepath.Join(dir, ProbabilityDir, "*.csv"))
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range grids {
		names = append(names, filepath.Join(ProbabilityDir, filepath.Base(g)))
	}
	for _, n := range names {
		b, err := os.ReadFile(filepath.Join(dir, n))
		if err != nil {
			t.Fatal(err)
		}
		out[n] = b
	}
	return out
}

// sameFiles fails unless a and b hold the same names with the same bytes.
func sameFiles(t testing.TB, what string, a, b map[string][]byte) {
	t.Helper()
	var names []string
	for n := range a {
		names = append(names, n)
	}
	sort.Strings(names)
	if len(a) != len(b) {
		t.Fatalf("%s: %d files vs %d", what, len(a), len(b))
	}
	for _, n := range names {
		if !bytes.Equal(a[n], b[n]) {
			t.Errorf("%s: %s differs:\n%s\nvs\n%s", what, n, head(a[n]), head(b[n]))
		}
	}
}

func head(b []byte) string {
	if len(b) > 600 {
		return string(b[:600]) + "…"
	}
	return string(b)
}

func runBatch(t testing.TB, opts Options) *Summary {
	t.Helper()
	sum, err := Run(context.Background(), opts)
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

// swapScenario replaces the base scenario kept in the batch folder dir by
// another one (a thicker layer), as a mixed-up folder would hold.
func swapScenario(t *testing.T, dir string) {
	t.Helper()
	thick, err := loader(scenarios.Override{Key: "layer.thickness", Value: "25 m"})()
	if err != nil {
		t.Fatal(err)
	}
	other, err := resolvedBytes(thick)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, ScenarioName), other, 0o644); err != nil {
		t.Fatal(err)
	}
}
