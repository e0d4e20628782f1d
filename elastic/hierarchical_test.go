package elastic

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"
)

// relDiff returns ‖a − b‖₂/‖b‖₂ over the concatenated pairs.
func relDiff(a1, a2, b1, b2 []float64) float64 {
	num, den := 0.0, 0.0
	for i := range b1 {
		num += (a1[i]-b1[i])*(a1[i]-b1[i]) + (a2[i]-b2[i])*(a2[i]-b2[i])
		den += b1[i]*b1[i] + b2[i]*b2[i]
	}
	return math.Sqrt(num / den)
}

// exactRows returns rows of the product by the exact coefficients (At).
func exactRows(op Operator, rows []int, s, w []float64) (tau, sn []float64) {
	tau, sn = make([]float64, len(rows)), make([]float64, len(rows))
	for k, i := range rows {
		for j := range s {
			b := op.At(i, j)
			tau[k] += b.ShearSlip*s[j] + b.ShearOpening*w[j]
			sn[k] += b.NormalSlip*s[j] + b.NormalOpening*w[j]
		}
	}
	return tau, sn
}

// TestHierarchicalMatchesDense compares the hierarchical operator with
// the exact coefficients on random DFN-like networks: products with
// random vectors (all rows up to 10³ elements; 10⁴ elements: 50 sampled
// rows of one product) agree to the tolerance asked, relative, as the
// bound ‖A − Ã‖_F ≤ ε‖A‖_F implies for vectors that do not single out
// the error (common practice, no source). From 10³ elements on, blocks
// must actually be compressed, so that the test can fail.
func TestHierarchicalMatchesDense(t *testing.T) {
	for _, tc := range []struct {
		n      int
		tol    float64
		sample bool
	}{
		{100, 1e-6, false}, {1000, 1e-6, false}, {1000, 1e-4, false}, {1000, 1e-6, true}, {10000, 1e-6, true},
	} {
		if tc.n == 10000 && testing.Short() {
			continue
		}
		el := dfnElements(networkSettings{elements: tc.n, seed: 5, varied: true})
		h, err := NewHierarchical(el, rock, Settings{Tolerance: tc.tol})
		if err != nil {
			t.Fatal(err)
		}
		// At 10² elements (a 120 m square) no block is worth compressing:
		// the check then covers the half storage and single precision.
		st := h.Stats()
		if st.LowRankBlocks == 0 && tc.n >= 1000 {
			t.Fatalf("n = %d: no compressed block", len(el))
		}
		r := rand.New(rand.NewPCG(uint64(tc.n), 6))
		s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
		tau, sn := apply(h, s, w)
		var err2 float64
		if tc.sample {
			var rows []int
			for i := 0; i < len(el); i += len(el) / 50 {
				rows = append(rows, i)
			}
			et, es := exactRows(h, rows, s, w)
			gt, gs := make([]float64, len(rows)), make([]float64, len(rows))
			for k, i := range rows {
				gt[k], gs[k] = tau[i], sn[i]
			}
			err2 = relDiff(gt, gs, et, es)
		} else {
			dt, ds := apply(mustDense(t, el, Settings{}), s, w)
			err2 = relDiff(tau, sn, dt, ds)
		}
		t.Logf("n = %d, tolerance %g, sampled %v: relative error %.3g, ratio %.4f, mean rank %.1f", len(el), tc.tol, tc.sample, err2, st.CompressionRatio, st.MeanRank)
		if !(err2 <= tc.tol) {
			t.Errorf("n = %d: relative error %.3g, want ≤ %g", len(el), err2, tc.tol)
		}
	}
}

// Products skip the blocks whose slice of the input is all zeros; with
// few non-zero entries (slip on a handful of elements, opening on
// another) the product still equals the dense operator's to the
// tolerance, and a zero input gives exactly zero.
func TestHierarchicalSparseInput(t *testing.T) {
	el := dfnElements(networkSettings{elements: 1000, seed: 5, varied: true})
	h, err := NewHierarchical(el, rock, Settings{Tolerance: 1e-6})
	if err != nil {
		t.Fatal(err)
	}
	d := mustDense(t, el, Settings{})
	r := rand.New(rand.NewPCG(11, 12))
	s, w := make([]float64, len(el)), make([]float64, len(el))
	for range 10 {
		s[r.IntN(len(el))] = 1e-3 * (2*r.Float64() - 1)
	}
	w[r.IntN(len(el))] = 1e-3
	for _, tc := range []struct {
		name string
		s, w []float64
	}{{"slip and opening", s, w}, {"slip only", s, make([]float64, len(el))}, {"opening only", make([]float64, len(el)), w}} {
		ht, hn := apply(h, tc.s, tc.w)
		dt, dn := apply(d, tc.s, tc.w)
		if e := relDiff(ht, hn, dt, dn); !(e <= 1e-6) {
			t.Errorf("%s: relative error %.3g against dense, want ≤ 1e-6", tc.name, e)
		}
	}
	zero := make([]float64, len(el))
	ht, hn := apply(h, zero, zero)
	for i := range ht {
		if ht[i] != 0 || hn[i] != 0 {
			t.Fatalf("zero input: element %d gets %g, %g", i, ht[i], hn[i])
		}
	}
}

// TestWorkersDeterminism checks that products do not depend on the
// number of workers that assembled and multiply: bit for bit.
func TestWorkersDeterminism(t *testing.T) {
	el := dfnElements(networkSettings{elements: 1500, seed: 7, varied: true})
	r := rand.New(rand.NewPCG(7, 8))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	pts := make([]r2.Vec, 300)
	for i := range pts {
		pts[i] = r2.Vec{X: 500 * r.Float64(), Y: 500 * r.Float64()}
	}
	var ref [][]float64
	for _, workers := range []int{1, 2, 3} {
		set := Settings{Workers: workers}
		h, err := NewHierarchical(el, rock, set)
		if err != nil {
			t.Fatal(err)
		}
		d := mustDense(t, el[:600], set)
		f, err := NewField(el, rock, pts, set)
		if err != nil {
			t.Fatal(err)
		}
		ht, hs := apply(h, s, w)
		dt, ds := apply(d, s[:600], w[:600])
		fs := make([]Stress, len(pts))
		f.StressTo(fs, s, w)
		var ff []float64
		for _, v := range fs {
			ff = append(ff, v.XX, v.YY, v.XY)
		}
		got := [][]float64{ht, hs, dt, ds, ff}
		if ref == nil {
			ref = got
			continue
		}
		for k := range got {
			for i := range got[k] {
				if math.Float64bits(got[k][i]) != math.Float64bits(ref[k][i]) {
					t.Fatalf("workers = %d: result %d[%d] = %v, with 1 worker %v", workers, k, i, got[k][i], ref[k][i])
				}
			}
		}
	}
}

// TestEstimateMemory checks the memory predicted before assembly against
// the memory held after it (within 20 %), the dense case exactly, and
// that a memory limit below the estimate is refused with that estimate.
func TestEstimateMemory(t *testing.T) {
	el := dfnElements(networkSettings{elements: 3000, seed: 9, varied: true})
	est, err := EstimateMemory(el, rock, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	h, err := NewHierarchical(el, rock, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	got := h.Stats().Bytes
	if r := float64(est) / float64(got); r < 0.8 || r > 1.2 {
		t.Errorf("estimate %d B, actual %d B: ratio %.3f, want within 20 %%", est, got, r)
	}
	small := el[:200]
	est, err = EstimateMemory(small, rock, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if want := int64(32 * len(small) * len(small)); est != want {
		t.Errorf("dense estimate %d B, want %d", est, want)
	}
	op, err := New(small, rock, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if d, ok := op.(*Dense); !ok || d.Bytes() != est {
		t.Errorf("New(%d elements) = %T, want a *Dense of %d B", len(small), op, est)
	}
	full, err := EstimateMemory(el, rock, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	_, err = New(el, rock, Settings{MemoryLimit: full - 1})
	var tl *TooLargeError
	if !errors.As(err, &tl) || tl.Estimate != full || tl.Limit != full-1 || tl.Elements != len(el) {
		t.Errorf("New with a limit below the estimate: %v, want *TooLargeError{%d, %d, %d}", err, len(el), full, full-1)
	}
}

// TestMulVecAllocs checks that products allocate nothing on one worker
// (more workers start goroutines).
func TestMulVecAllocs(t *testing.T) {
	el := dfnElements(networkSettings{elements: 1000, seed: 10})
	h, err := NewHierarchical(el, rock, Settings{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	d := mustDense(t, el[:200], Settings{Workers: 1})
	s, w := make([]float64, len(el)), make([]float64, len(el))
	tau, sn := make([]float64, len(el)), make([]float64, len(el))
	for name, op := range map[string]Operator{"hierarchical": h, "dense": d} {
		n := op.Len()
		if a := testing.AllocsPerRun(5, func() { op.MulVecTo(tau[:n], sn[:n], s[:n], w[:n]) }); a != 0 {
			t.Errorf("%s: %v allocations per product, want 0", name, a)
		}
	}
}

// splitRuns covers the indices once, in consecutive runs of about
// 1/assemblyRuns of the total cost, costliest first; an index costlier
// than that is a run of its own.
func TestSplitRuns(t *testing.T) {
	idx := make([]int, 3*assemblyRuns)
	for i := range idx {
		idx[i] = 2 * i // not 0, 1, 2, …: runs hold indices, not positions
	}
	cost := func(b int) int {
		if b == 2*assemblyRuns { // one costly index
			return 100 * assemblyRuns
		}
		return 1 + b%3
	}
	runs := splitRuns(idx, cost)
	total := 0
	for _, b := range idx {
		total += cost(b)
	}
	var all []int
	prev := math.MaxInt
	for _, run := range runs {
		c := 0
		for k, b := range run {
			c += cost(b)
			if k > 0 && b != run[k-1]+2 {
				t.Fatalf("run %v is not consecutive", run)
			}
		}
		if c > prev {
			t.Errorf("run of cost %d after one of %d: not costliest first", c, prev)
		}
		if len(run) > 1 && c > total/assemblyRuns {
			t.Errorf("run %v costs %d, over the share %d", run, c, total/assemblyRuns)
		}
		prev = c
		all = append(all, run...)
	}
	if runs[0][0] != 2*assemblyRuns || len(runs[0]) != 1 {
		t.Errorf("first run %v, want the costly index alone", runs[0])
	}
	slices.Sort(all)
	if !slices.Equal(all, idx) {
		t.Errorf("runs cover %d indices, want each of the %d once", len(all), len(idx))
	}
}
