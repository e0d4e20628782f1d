package batch

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/stat"

	"slipfront/internal/numtest"
)

// quantileTol: Summarize calls gonum itself, so any difference is a bug;
// the tolerance only absorbs the decimal round trip through a CSV file,
// which is exact for the shortest representation ('f', -1).
const quantileTol = 1e-12

// Hand-computed values from Hyndman & Fan (1996) definition 1 (inverse of
// the empirical distribution function), Q(p) = x_k with k = ⌈np⌉, on
// x = 10, 20, …, 70 (n = 7):
//
//	P10: np = 0.7 → k = 1 → 10
//	P50: np = 3.5 → k = 4 → 40
//	P90: np = 6.3 → k = 7 → 70
//
// The mean is 40 and the sample standard deviation
// sqrt((30² + 20² + 10² + 0 + 10² + 20² + 30²)/6) = sqrt(2800/6).
// With n = 20 values 1 … 20: P10 = x₂ = 2, P50 = x₁₀ = 10, P90 = x₁₈ = 18.
func TestSummarizeDefinition1(t *testing.T) {
	x := []float64{70, 10, 40, 30, 20, 60, 50} // Summarize sorts
	s := Summarize(x)
	numtest.Abs(t, "P10", s.P10, 10, 1e-12)
	numtest.Abs(t, "P50", s.P50, 40, 1e-12)
	numtest.Abs(t, "P90", s.P90, 70, 1e-12)
	numtest.Abs(t, "mean", s.Mean, 40, 1e-12)
	numtest.Rel(t, "sample std", s.Std, math.Sqrt(2800.0/6), 1e-12)
	numtest.Abs(t, "max", s.Max, 70, 0)
	twenty := make([]float64, 20)
	for i := range twenty {
		twenty[i] = float64(20 - i)
	}
	s = Summarize(twenty)
	numtest.Abs(t, "P10 of 1…20", s.P10, 2, 0)
	numtest.Abs(t, "P50 of 1…20", s.P50, 10, 0)
	numtest.Abs(t, "P90 of 1…20", s.P90, 18, 0)
	if !math.IsNaN(Summarize([]float64{3}).Std) {
		t.Error("the sample standard deviation of one value is not NaN")
	}
}

// Summarize agrees with gonum's stat.Quantile (Empirical) called directly
// on random samples of several sizes, and P10 ≤ P50 ≤ P90.
func TestSummarizeMatchesGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{1, 2, 3, 10, 20, 101} {
		x := make([]float64, n)
		for i := range x {
			x[i] = rng.ExpFloat64() * 1e4
		}
		sorted := slices.Clone(x)
		slices.Sort(sorted)
		s := Summarize(slices.Clone(x))
		for _, q := range []struct {
			p   float64
			got float64
		}{{0.1, s.P10}, {0.5, s.P50}, {0.9, s.P90}} {
			want := stat.Quantile(q.p, stat.Empirical, sorted, nil)
			numtest.Close(t, "n="+strconv.Itoa(n)+" P"+strconv.Itoa(int(q.p*100)), q.got, want, 0, quantileTol)
		}
		if !(s.P10 <= s.P50 && s.P50 <= s.P90) {
			t.Errorf("n=%d: P10 %g, P50 %g, P90 %g not ascending", n, s.P10, s.P50, s.P90)
		}
		if n > 1 {
			numtest.Rel(t, "std", s.Std, stat.StdDev(sorted, nil), 1e-12)
		}
	}
}

// percentiles.csv of a real batch agrees with gonum applied to the area
// curves read back from the result files.
func TestPercentilesFileMatchesGonum(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	o.Realizations = 11
	runBatch(t, o)
	b, err := os.ReadFile(filepath.Join(out, PercentilesName))
	if err != nil {
		t.Fatal(err)
	}
	rows := csvRows(t, b)
	m, err := readManifestFile(out)
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for _, row := range rows[1:] {
		// A field that does not parse would read as 0, which the areas at
		// time 0 also are: refuse it rather than compare it.
		number := func(k int) float64 {
			x, err := strconv.ParseFloat(row[k], 64)
			if err != nil {
				t.Fatalf("percentiles.csv row %v: %v", row, err)
			}
			return x
		}
		c, err := strconv.Atoi(row[0])
		if err != nil {
			t.Fatal(err)
		}
		tcol := 3 // case, two sweep keys, then time_s
		time := number(tcol)
		k := int(math.Round(time / m.Cases[c].TimeGrid.Interval))
		var at []float64
		for r := range o.Realizations {
			res, err := readResultFile(out, c, r, &m.Cases[c], nil)
			if err != nil {
				t.Fatal(err)
			}
			at = append(at, res.Area[k])
		}
		slices.Sort(at)
		for i, p := range []float64{0.1, 0.5, 0.9} {
			got := number(tcol + 1 + i)
			numtest.Close(t, "percentiles.csv row "+row[0]+" "+row[tcol], got, stat.Quantile(p, stat.Empirical, at, nil), 0, quantileTol)
		}
		mean := number(tcol + 4)
		numtest.Close(t, "mean", mean, stat.Mean(at, nil), 1e-9, quantileTol)
		checked++
	}
	if checked < 4*2 {
		t.Errorf("only %d rows checked", checked)
	}
}
