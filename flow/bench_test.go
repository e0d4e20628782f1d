package flow

import (
	"math"
	"math/rand/v2"
	"os"
	"sync"
	"testing"
	"time"
)

// Benchmarks of the linear-algebra layer on the network model of
// network_test.go (gen_network.py's model) at 10⁴, 10⁵ and 10⁶ unknowns.
// Reference figures for the same model, from established solvers on the
// project's machine kind, are in docs/bench.md; the
// SLIPFRONT_BENCH_MTX benchmark times the exact reference files.

// benchCache holds one generated system per size, built on first use and
// kept across b.N rounds and benchmarks.
var benchCache struct {
	sync.Mutex
	m map[int]*testSystem
}

func benchSystem(b *testing.B, n int) (*testSystem, *Assembler) {
	b.Helper()
	benchCache.Lock()
	defer benchCache.Unlock()
	if benchCache.m == nil {
		benchCache.m = map[int]*testSystem{}
	}
	sys, ok := benchCache.m[n]
	if !ok {
		sys = newNetwork(defaultNetwork(n), rand.New(rand.NewPCG(1, 2)))
		benchCache.m[n] = sys
	}
	return sys, sys.assembler()
}

func benchAssemble(b *testing.B, n int) {
	sys, as := benchSystem(b, n)
	b.ResetTimer()
	for range b.N {
		sys.fill(as)
	}
}

func BenchmarkAssemble1e4(b *testing.B) { benchAssemble(b, 1e4) }
func BenchmarkAssemble1e5(b *testing.B) { benchAssemble(b, 1e5) }
func BenchmarkAssemble1e6(b *testing.B) { benchAssemble(b, 1e6) }

func benchAnalyze(b *testing.B, n int) {
	_, as := benchSystem(b, n)
	a := as.Matrix()
	var nnzL int
	b.ResetTimer()
	for range b.N {
		ls, err := Analyze(a, Settings{Method: Cholesky})
		if err != nil {
			b.Fatal(err)
		}
		nnzL = ls.CholeskyEntries()
	}
	b.ReportMetric(float64(nnzL), "nnzL")
}

func BenchmarkCholeskyAnalyze1e4(b *testing.B) { benchAnalyze(b, 1e4) }
func BenchmarkCholeskyAnalyze1e5(b *testing.B) { benchAnalyze(b, 1e5) }
func BenchmarkCholeskyAnalyze1e6(b *testing.B) { benchAnalyze(b, 1e6) }

func benchFactor(b *testing.B, n int) {
	_, as := benchSystem(b, n)
	a := as.Matrix()
	ls, err := Analyze(a, Settings{Method: Cholesky})
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for range b.N {
		if err := ls.Factor(a); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(ls.CholeskyEntries()), "nnzL")
}

func BenchmarkCholeskyFactor1e4(b *testing.B) { benchFactor(b, 1e4) }
func BenchmarkCholeskyFactor1e5(b *testing.B) { benchFactor(b, 1e5) }
func BenchmarkCholeskyFactor1e6(b *testing.B) { benchFactor(b, 1e6) }

func benchSolve(b *testing.B, n int) {
	sys, as := benchSystem(b, n)
	a := as.Matrix()
	ls, err := Analyze(a, Settings{Method: Cholesky})
	if err != nil {
		b.Fatal(err)
	}
	if err := ls.Factor(a); err != nil {
		b.Fatal(err)
	}
	x := make([]float64, n)
	b.ResetTimer()
	for range b.N {
		if _, err = ls.Solve(x, sys.rhs); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCholeskySolve1e4(b *testing.B) { benchSolve(b, 1e4) }
func BenchmarkCholeskySolve1e5(b *testing.B) { benchSolve(b, 1e5) }
func BenchmarkCholeskySolve1e6(b *testing.B) { benchSolve(b, 1e6) }

// benchPCG times one preconditioned CG solve to DefaultTol (the
// preconditioner set up beforehand) and reports the iterations and the
// time per iteration.
func benchPCG(b *testing.B, n int, m Method) {
	sys, as := benchSystem(b, n)
	a := as.Matrix()
	ls, err := Analyze(a, Settings{Method: m})
	if err != nil {
		b.Fatal(err)
	}
	if err := ls.Factor(a); err != nil {
		b.Fatal(err)
	}
	x := make([]float64, n)
	iters := 0
	b.ResetTimer()
	for range b.N {
		res, err := ls.Solve(x, sys.rhs)
		if err != nil {
			b.Fatal(err)
		}
		iters += res.Iterations
	}
	b.ReportMetric(float64(iters)/float64(b.N), "iters")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(iters), "ns/iter")
}

func BenchmarkPCGJacobi1e4(b *testing.B) { benchPCG(b, 1e4, CGJacobi) }
func BenchmarkPCGJacobi1e5(b *testing.B) { benchPCG(b, 1e5, CGJacobi) }
func BenchmarkPCGJacobi1e6(b *testing.B) { benchPCG(b, 1e6, CGJacobi) }
func BenchmarkPCGIC01e4(b *testing.B)    { benchPCG(b, 1e4, CGIC0) }
func BenchmarkPCGIC01e5(b *testing.B)    { benchPCG(b, 1e5, CGIC0) }
func BenchmarkPCGIC01e6(b *testing.B)    { benchPCG(b, 1e6, CGIC0) }

// mtxCache holds the matrix of SLIPFRONT_BENCH_MTX across b.N rounds.
var mtxCache struct {
	sync.Mutex
	name string
	a    *CSR
}

// BenchmarkSolveMatrixMarket solves the SPD system in the Matrix Market
// file named by SLIPFRONT_BENCH_MTX with b = (1, …, 1) to a relative
// residual of 1e-8 with the default solver, and reports each phase in
// seconds per solve: analyse (ordering and symbolic factorization),
// factor, solve. It is skipped when the variable is unset.
func BenchmarkSolveMatrixMarket(b *testing.B) {
	name := os.Getenv("SLIPFRONT_BENCH_MTX")
	if name == "" {
		b.Skip("SLIPFRONT_BENCH_MTX is not set")
	}
	a := loadBenchMatrix(b, name)
	rhs := make([]float64, a.N)
	for i := range rhs {
		rhs[i] = 1
	}
	x := make([]float64, a.N)
	var analyse, factor, solve time.Duration
	var ls *LinearSolver
	var res Result
	b.ResetTimer()
	for range b.N {
		t0 := time.Now()
		var err error
		ls, err = Analyze(a, Settings{Tol: 1e-8})
		if err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		if err := ls.Factor(a); err != nil {
			b.Fatal(err)
		}
		t2 := time.Now()
		if res, err = ls.Solve(x, rhs); err != nil {
			b.Fatal(err)
		}
		t3 := time.Now()
		analyse += t1.Sub(t0)
		factor += t2.Sub(t1)
		solve += t3.Sub(t2)
	}
	per := func(d time.Duration) float64 { return d.Seconds() / float64(b.N) }
	b.ReportMetric(per(analyse), "analyse-s")
	b.ReportMetric(per(factor), "factor-s")
	b.ReportMetric(per(solve), "solve-s")
	b.ReportMetric(float64(ls.CholeskyEntries()), "nnzL")
	b.ReportMetric(float64(res.Iterations), "iters")
	b.ReportMetric(math.Log10(res.Residual), "log10-residual")
}

func loadBenchMatrix(b *testing.B, name string) *CSR {
	b.Helper()
	mtxCache.Lock()
	defer mtxCache.Unlock()
	if mtxCache.name == name {
		return mtxCache.a
	}
	f, err := os.Open(name)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	a, err := ReadMatrixMarket(f)
	if err != nil {
		b.Fatal(err)
	}
	mtxCache.name, mtxCache.a = name, a
	return a
}
