package flow

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

// patternOf returns the CSR pattern (values zero) of the graph with n
// vertices and the given edges.
func patternOf(n int, edges [][2]int) *CSR {
	as, err := NewAssembler(n, edges)
	if err != nil {
		panic(err)
	}
	return as.Matrix()
}

// randomGraph returns n vertices with about deg·n/2 random edges.
func randomGraph(n int, deg float64, rng *rand.Rand) [][2]int {
	var e [][2]int
	for range int(deg * float64(n) / 2) {
		i, j := rng.IntN(n), rng.IntN(n)
		if i != j {
			e = append(e, [2]int{i, j})
		}
	}
	return e
}

// gridGraph is the 5-point stencil on a k × k grid, numbered by rows.
func gridGraph(k int) [][2]int {
	var e [][2]int
	for y := range k {
		for x := range k {
			if x+1 < k {
				e = append(e, [2]int{y*k + x, y*k + x + 1})
			}
			if y+1 < k {
				e = append(e, [2]int{y*k + x, (y+1)*k + x})
			}
		}
	}
	return e
}

// randomTree joins each vertex i > 0 to a random earlier one, with one
// hub that collects many vertices.
func randomTree(n int, rng *rand.Rand) [][2]int {
	var e [][2]int
	for i := 1; i < n; i++ {
		p := rng.IntN(i)
		if rng.IntN(10) == 0 {
			p = 0 // the hub
		}
		e = append(e, [2]int{p, i})
	}
	return e
}

func isPermutation(p []int32, n int) bool {
	if len(p) != n {
		return false
	}
	seen := make([]bool, n)
	for _, v := range p {
		if v < 0 || int(v) >= n || seen[v] {
			return false
		}
		seen[v] = true
	}
	return true
}

// orderingCases are patterns of every shape the ordering must handle.
func orderingCases() []struct {
	name string
	a    *CSR
} {
	rng := rand.New(rand.NewPCG(1, 2))
	star := make([][2]int, 0, 59)
	for i := 1; i < 60; i++ {
		star = append(star, [2]int{0, i}) // row 0 is dense: ordered last
	}
	return []struct {
		name string
		a    *CSR
	}{
		{"single", patternOf(1, nil)},
		{"isolated", patternOf(7, nil)},
		{"chain", patternOf(50, chainSystem(50, 1, rng).conns)},
		{"dense star", patternOf(60, star)},
		{"tree with hub", patternOf(3000, randomTree(3000, rng))},
		{"grid 20x20", patternOf(400, gridGraph(20))},
		{"random", patternOf(300, randomGraph(300, 4, rng))},
		{"network", patternOf(2000, newNetwork(defaultNetwork(2000), rng).conns)},
	}
}

func TestAMDIsPermutation(t *testing.T) {
	for _, c := range orderingCases() {
		if p := amdOrder(c.a); !isPermutation(p, c.a.N) {
			t.Errorf("%s: AMD order is not a permutation of 0..%d", c.name, c.a.N-1)
		}
		if p := rcmOrder(c.a); !isPermutation(p, c.a.N) {
			t.Errorf("%s: RCM order is not a permutation of 0..%d", c.name, c.a.N-1)
		}
	}
}

func TestAMDNoFillOnTrees(t *testing.T) {
	// Eliminating leaves first factors a tree (or a path, or a star)
	// without fill, nnz(L) = n + (n − 1) (Parter 1961, from memory), and
	// minimum degree does so because a leaf has degree 1; AMD's
	// approximate degree is exact for variables adjacent to at most two
	// elements (Amestoy, Davis & Duff 1996, §4, from memory), which holds
	// throughout the elimination of a tree.
	rng := rand.New(rand.NewPCG(1, 2))
	for _, tc := range []struct {
		name string
		a    *CSR
	}{
		{"path", patternOf(500, chainSystem(500, 1, rng).conns)},
		{"star", patternOf(200, randomTreeStar(200))},
		{"tree with hub", patternOf(3000, randomTree(3000, rng))},
	} {
		o := orderCholesky(tc.a)
		if want := 2*tc.a.N - 1; o.nnzL != want {
			t.Errorf("%s: nnz(L) = %d, want %d (no fill)", tc.name, o.nnzL, want)
		}
	}
}

func randomTreeStar(n int) [][2]int {
	var e [][2]int
	for i := 1; i < n; i++ {
		e = append(e, [2]int{i, 0})
	}
	return e
}

func TestAMDBeatsBandOrderingOnGrid(t *testing.T) {
	// On a k × k grid numbered by rows, fill stays within the envelope
	// and fills it completely (George & Liu 1981, ch. 4, from memory):
	// row i of L spans columns i−1..i for 0 < i < k and i−k..i beyond,
	// so nnz(L) = 1 + 2(k−1) + (n−k)(k+1), of order n^{3/2}; minimum
	// degree gives O(n log n) in practice. At k = 40 the asymptotic ratio
	// is about √n / log₂ n ≈ 4: require at least a factor 2.
	const k = 40
	a := patternOf(k*k, gridGraph(k))
	n := k * k
	band := 1 + 2*(k-1) + (n-k)*(k+1)
	// Check the band formula itself with the symbolic code on the
	// natural order.
	id := make([]int32, n)
	for i := range id {
		id[i] = int32(i)
	}
	c := permutedPattern(a, id, id)
	if got := sum(columnCounts(c, eliminationTree(c))); got != band {
		t.Fatalf("natural order: nnz(L) = %d, want band fill %d", got, band)
	}
	if got := orderCholesky(a).nnzL; 2*got > band {
		t.Errorf("AMD: nnz(L) = %d, want at most half the band fill %d", got, band)
	}
}

func sum(v []int) int {
	s := 0
	for _, x := range v {
		s += x
	}
	return s
}

// denseSymbolic eliminates the pattern of C = P A Pᵀ on a dense boolean
// matrix: after step k, C(i, j) is set for every pair i, j > k both
// adjacent to k (the fill graph; Rose 1970, from memory). It returns the
// row indices of each column of L and the elimination tree
// parent[j] = min{i > j : L(i, j) ≠ 0} (Schreiber 1982, from memory).
func denseSymbolic(a *CSR, perm, iperm []int32) ([][]int32, []int32) {
	n := a.N
	m := make([][]bool, n)
	for i := range m {
		m[i] = make([]bool, n)
		m[i][i] = true
	}
	for r := range n {
		for _, c := range a.ColIdx[a.RowPtr[r]:a.RowPtr[r+1]] {
			m[iperm[r]][iperm[c]] = true
		}
	}
	cols := make([][]int32, n)
	parent := make([]int32, n)
	for k := range n {
		parent[k] = -1
		for i := k; i < n; i++ {
			if m[i][k] {
				cols[k] = append(cols[k], int32(i))
				if i > k && parent[k] == -1 {
					parent[k] = int32(i)
				}
			}
		}
		for _, i := range cols[k][1:] {
			for _, j := range cols[k][1:] {
				m[i][j] = true
			}
		}
	}
	return cols, parent
}

func TestSymbolicMatchesDenseElimination(t *testing.T) {
	for _, c := range orderingCases() {
		if c.a.N > 500 {
			continue
		}
		t.Run(c.name, func(t *testing.T) {
			o := orderCholesky(c.a)
			ch := newCholesky(c.a, o)
			wantCols, wantParent := denseSymbolic(c.a, o.perm, o.iperm)
			if !slices.Equal(o.parent, wantParent) {
				t.Errorf("elimination tree %v, want %v", o.parent, wantParent)
			}
			for j := range c.a.N {
				got := ch.pat.rowIdx[ch.pat.colPtr[j]:ch.pat.colPtr[j+1]]
				if !slices.Equal(got, wantCols[j]) {
					t.Fatalf("column %d of L: rows %v, want %v", j, got, wantCols[j])
				}
				if o.counts[j] != len(wantCols[j]) {
					t.Fatalf("column count %d = %d, want %d", j, o.counts[j], len(wantCols[j]))
				}
			}
			// The order is a postorder: each parent after its children.
			for j, p := range o.parent {
				if p != -1 && int(p) <= j {
					t.Fatalf("parent[%d] = %d is not after its child", j, p)
				}
			}
		})
	}
}

func TestRCMNarrowsBandOfShuffledGrid(t *testing.T) {
	// A k × k grid has bandwidth k in its row numbering; a random
	// numbering destroys that and RCM must recover a band of the same
	// order (Cuthill & McKee 1969: the level structure of a grid from a
	// corner has levels of at most k + 1 nodes, so the bandwidth is at most
	// about 2k).
	const k = 30
	rng := rand.New(rand.NewPCG(1, 2))
	shuffle := rng.Perm(k * k)
	var e [][2]int
	for _, c := range gridGraph(k) {
		e = append(e, [2]int{shuffle[c[0]], shuffle[c[1]]})
	}
	a := patternOf(k*k, e)
	perm := rcmOrder(a)
	iperm := invertPerm(perm)
	bw := 0
	for r := range a.N {
		for _, c := range a.ColIdx[a.RowPtr[r]:a.RowPtr[r+1]] {
			bw = max(bw, abs32(iperm[r]-iperm[c]))
		}
	}
	if bw > 2*k+1 {
		t.Errorf("RCM bandwidth %d, want at most %d", bw, 2*k+1)
	}
}

func abs32(x int32) int {
	if x < 0 {
		return int(-x)
	}
	return int(x)
}

func ExampleAnalyze() {
	// Three unknowns in a chain with unit storage and transmissibility:
	// A = I + Σ t (e_i − e_j)(e_i − e_j)ᵀ = [2 −1 0; −1 3 −1; 0 −1 2],
	// whose rows sum to 1, so A x = (1, 1, 1) has x = (1, 1, 1).
	as, err := NewAssembler(3, [][2]int{{0, 1}, {1, 2}})
	if err != nil {
		panic(err)
	}
	for i := range 3 {
		as.AddDiagonal(i, 1)
	}
	as.AddConnection(0, 1)
	as.AddConnection(1, 1)
	a := as.Matrix()

	ls, err := Analyze(a, Settings{}) // once per pattern
	if err != nil {
		panic(err)
	}
	if err := ls.Factor(a); err != nil { // once per new set of values
		panic(err)
	}
	x := make([]float64, 3)
	res, err := ls.Solve(x, []float64{1, 1, 1}) // once per right-hand side
	if err != nil {
		panic(err)
	}
	fmt.Println(ls.Method(), res.Status)
	fmt.Printf("x = %.6f\n", x)
	// Output:
	// Cholesky Success
	// x = [1.000000 1.000000 1.000000]
}

func TestAMDMarkReset(t *testing.T) {
	// The marks in w are int32 and are reset when they would overflow;
	// marks only matter relative to each other, so starting next to the
	// limit must give the same order as starting from scratch.
	a := patternOf(3000, newNetwork(defaultNetwork(3000), rand.New(rand.NewPCG(1, 2))).conns)
	want := amdOrder(a)
	s := newAMD(a)
	s.mark = amdMarkLimit - int32(a.N) - 100
	for s.nel < s.n {
		s.eliminateNext()
	}
	if got := s.postorder(); !slices.Equal(got, want) {
		t.Error("order changed when the marks were reset during the elimination")
	}
}
