package elastic

import (
	"math"
	"math/rand/v2"
	"runtime"
	"testing"
	"time"

	"gonum.org/v1/gonum/spatial/r2"
)

// benchmarkNewHierarchical times the assembly of the hierarchical
// operator of a DFN-like network of about n elements (dfnElements, with
// varied heights) on all processors, and reports its memory, compression
// ratio and mean rank.
func benchmarkNewHierarchical(b *testing.B, n int) {
	el := dfnElements(networkSettings{elements: n, seed: 1, varied: true})
	var op *Hierarchical
	for b.Loop() {
		var err error
		if op, err = NewHierarchical(el, rock, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
	s := op.Stats()
	b.ReportMetric(float64(s.Bytes)/1e6, "MB")
	b.ReportMetric(s.CompressionRatio, "ratio")
	b.ReportMetric(s.MeanRank, "rank")
	b.ReportMetric(float64(len(el)), "elements")
}

func BenchmarkNewHierarchical1e3(b *testing.B) { benchmarkNewHierarchical(b, 1e3) }
func BenchmarkNewHierarchical1e4(b *testing.B) { benchmarkNewHierarchical(b, 1e4) }
func BenchmarkNewHierarchical1e5(b *testing.B) { benchmarkNewHierarchical(b, 1e5) }

// benchmarkMulVec times one product of an operator built by build on a
// DFN-like network of about n elements.
func benchmarkMulVec(b *testing.B, n int, build func([]Element) (Operator, error)) {
	el := dfnElements(networkSettings{elements: n, seed: 1, varied: true})
	op, err := build(el)
	if err != nil {
		b.Fatal(err)
	}
	r := rand.New(rand.NewPCG(1, 2))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	tau, sn := make([]float64, len(el)), make([]float64, len(el))
	op.MulVecTo(tau, sn, s, w) // first touch of the scratch
	runtime.GC()               // collect the assembly's garbage before timing
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		op.MulVecTo(tau, sn, s, w)
	}
	b.StopTimer()
	// Relative error on 20 rows against the exact coefficients.
	var rows []int
	for i := 0; i < len(el); i += len(el) / 20 {
		rows = append(rows, i)
	}
	et, es := exactRows(op, rows, s, w)
	gt, gs := make([]float64, len(rows)), make([]float64, len(rows))
	for k, i := range rows {
		gt[k], gs[k] = tau[i], sn[i]
	}
	b.ReportMetric(relDiff(gt, gs, et, es), "row-err")
	b.ReportMetric(float64(len(el)), "elements")
}

// BenchmarkHierarchicalMulVecSparse1e4 is a product whose input is
// non-zero on 1 % of the elements (the first ones generated), as a step's
// new slip or a far-field refresh of the contact problem is: the blocks
// over zeros are skipped.
func BenchmarkHierarchicalMulVecSparse1e4(b *testing.B) {
	el := dfnElements(networkSettings{elements: 1e4, seed: 1, varied: true})
	op, err := hierarchical(el)
	if err != nil {
		b.Fatal(err)
	}
	s, w := make([]float64, len(el)), make([]float64, len(el))
	for i := range len(el) / 100 {
		s[i] = 1e-3
	}
	tau, sn := make([]float64, len(el)), make([]float64, len(el))
	op.MulVecTo(tau, sn, s, w)
	runtime.GC()
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		op.MulVecTo(tau, sn, s, w)
	}
}

func hierarchical(el []Element) (Operator, error) { return NewHierarchical(el, rock, Settings{}) }
func dense(el []Element) (Operator, error)        { return NewDense(el, rock, Settings{}) }

func BenchmarkHierarchicalMulVec1e3(b *testing.B) { benchmarkMulVec(b, 1e3, hierarchical) }
func BenchmarkHierarchicalMulVec1e4(b *testing.B) { benchmarkMulVec(b, 1e4, hierarchical) }
func BenchmarkHierarchicalMulVec1e5(b *testing.B) { benchmarkMulVec(b, 1e5, hierarchical) }

// The dense operator around the size where New switches (DenseBelow).
func BenchmarkDenseMulVec1e3(b *testing.B)        { benchmarkMulVec(b, 1e3, dense) }
func BenchmarkDenseMulVec3e3(b *testing.B)        { benchmarkMulVec(b, 3e3, dense) }
func BenchmarkHierarchicalMulVec3e3(b *testing.B) { benchmarkMulVec(b, 3e3, hierarchical) }

// benchmarkNewDense times the assembly of the dense operator.
func benchmarkNewDense(b *testing.B, n int) {
	el := dfnElements(networkSettings{elements: n, seed: 1, varied: true})
	for b.Loop() {
		if _, err := NewDense(el, rock, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(denseBytes(len(el)))/1e6, "MB")
}

func BenchmarkNewDense1e3(b *testing.B)        { benchmarkNewDense(b, 1e3) }
func BenchmarkNewDense3e3(b *testing.B)        { benchmarkNewDense(b, 3e3) }
func BenchmarkNewHierarchical3e3(b *testing.B) { benchmarkNewHierarchical(b, 3e3) }

// benchmarkField times building a Field on a square grid of about n
// points over a DFN-like network of about n elements, and one evaluation,
// reported as eval-ms.
func benchmarkField(b *testing.B, n int) {
	el := dfnElements(networkSettings{elements: n, seed: 1, varied: true})
	side := int(math.Sqrt(float64(n)))
	extent := math.Sqrt(float64(n) * elementTarget / traceDensity)
	pts := make([]r2.Vec, 0, side*side)
	for i := range side {
		for j := range side {
			pts = append(pts, r2.Vec{X: extent * (float64(i) + 0.5) / float64(side), Y: extent * (float64(j) + 0.5) / float64(side)})
		}
	}
	r := rand.New(rand.NewPCG(1, 2))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	dst := make([]Stress, len(pts))
	var f *Field
	for b.Loop() {
		var err error
		if f, err = NewField(el, rock, pts, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
	start := time.Now()
	const evals = 5
	for range evals {
		f.StressTo(dst, s, w)
	}
	st := f.Stats()
	b.ReportMetric(float64(time.Since(start).Milliseconds())/evals, "eval-ms")
	b.ReportMetric(float64(st.Bytes)/1e6, "MB")
	b.ReportMetric(float64(len(pts)), "points")
}

func BenchmarkNewField1e4(b *testing.B) { benchmarkField(b, 1e4) }

// BenchmarkProbe1e4 is one stress evaluation by direct summation at a
// point of a 10⁴-element DFN-like network every element of which slips
// and opens (the worst case: Probe skips the elements that do neither),
// as a growing fracture's path pass takes at every element a tip opens.
func BenchmarkProbe1e4(b *testing.B) {
	el := dfnElements(networkSettings{elements: 1e4, seed: 1, varied: true})
	pr, err := NewProbe(el, rock, Settings{})
	if err != nil {
		b.Fatal(err)
	}
	r := rand.New(rand.NewPCG(5, 6))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	p := r2.Scale(0.5, r2.Add(el[0].Centre(), el[len(el)-1].Centre()))
	b.ReportAllocs()
	for b.Loop() {
		pr.StressAt(p, s, w)
	}
}
