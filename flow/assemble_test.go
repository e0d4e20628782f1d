package flow

import (
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// assembleTol is the relative tolerance between the Assembler's values and
// a dense assembly that adds the same terms in the same order: the sums
// are the same floating-point operations, so only a few units of
// roundoff are allowed for any reassociation by the compiler (Go does not
// reassociate floating-point sums, so the values should agree exactly).
const assembleTol = 4 * unitRoundoff

func TestAssemblerMatchesDenseAssembly(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	sys := newNetwork(networkParams{unknowns: 200, perStick: 10, k: 6, sigma10: 0.5, storage: 1e-3}, rng)
	// Duplicate connections (parallel paths between the same two
	// unknowns, given in both orientations) must add up.
	sys.conns = append(sys.conns, sys.conns[3], [2]int{sys.conns[7][1], sys.conns[7][0]})
	sys.trans = append(sys.trans, 0.25, 4)
	as := sys.assembler()
	if as.NumConnections() != len(sys.conns) {
		t.Errorf("NumConnections() = %d, want %d", as.NumConnections(), len(sys.conns))
	}

	dense := make([][]float64, sys.n)
	for i := range dense {
		dense[i] = make([]float64, sys.n)
		dense[i][i] += sys.storage[i]
	}
	for k, c := range sys.conns {
		i, j, tk := c[0], c[1], sys.trans[k]
		dense[i][i] += tk
		dense[j][j] += tk
		dense[i][j] -= tk
		dense[j][i] -= tk
	}
	a := as.Matrix()
	if err := a.Validate(); err != nil {
		t.Fatal(err)
	}
	if err := a.checkSymmetricPattern(); err != nil {
		t.Fatal(err)
	}
	for i := range sys.n {
		for j := range sys.n {
			numtest.Close(t, "A[i][j]", a.At(i, j), dense[i][j], 0, assembleTol)
		}
	}
	// Pattern: the diagonal plus one entry per distinct neighbour.
	for i := range sys.n {
		nb := map[int]bool{i: true}
		for _, c := range sys.conns {
			if c[0] == i {
				nb[c[1]] = true
			}
			if c[1] == i {
				nb[c[0]] = true
			}
		}
		if got := a.RowPtr[i+1] - a.RowPtr[i]; got != len(nb) {
			t.Errorf("row %d stores %d entries, want %d", i, got, len(nb))
		}
	}

	// Reset and refill with new values: same pattern, new values.
	for k := range sys.trans {
		sys.trans[k] *= 2
	}
	sys.fill(as)
	for k, c := range sys.conns {
		i, j, tk := c[0], c[1], sys.trans[k]/2
		dense[i][i] += tk
		dense[j][j] += tk
		dense[i][j] -= tk
		dense[j][i] -= tk
	}
	for i := range sys.n {
		for j := range sys.n {
			numtest.Close(t, "A[i][j] after refill", a.At(i, j), dense[i][j], 0, assembleTol)
		}
	}
}

func TestAssemblerRowSumsAreStorage(t *testing.T) {
	// Each connection adds t (e_i − e_j)(e_i − e_j)ᵀ, whose rows sum to
	// zero, so the row sums of A are the storage terms: the discrete
	// statement of flux conservation between unknowns (two-point flux
	// finite volumes; common practice, no source).
	rng := rand.New(rand.NewPCG(1, 2))
	sys := newNetwork(defaultNetwork(1000), rng)
	a := sys.assembler().Matrix()
	for i := range a.N {
		var sum, scale float64
		for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
			sum += a.Val[p]
			scale += abs(a.Val[p])
		}
		// The diagonal accumulates d terms and the row sum adds d more:
		// the rounding error is at most γ_{2d} Σ|a_ij| (Higham 2002,
		// §4.2, from memory), d the number of entries in the row.
		d := float64(2 * (a.RowPtr[i+1] - a.RowPtr[i]))
		gamma := d * unitRoundoff / (1 - d*unitRoundoff)
		numtest.Abs(t, "row sum − storage", sum, sys.storage[i], gamma*scale)
	}
}

// Residual gives b − A x with the diagonal's part b − D x passed in: on a
// random network it agrees with b − A x from the assembled matrix to the
// round-off of that product, and where every unknown holds the same large
// value (no flow) it is exactly b − D x, where b − A x keeps the
// round-off of the terms t·x that cancel in each row.
func TestAssemblerResidual(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	sys := newNetwork(defaultNetwork(500), rng)
	as := sys.assembler()
	a := as.Matrix()
	x, b, f := make([]float64, sys.n), make([]float64, sys.n), make([]float64, sys.n)
	for i := range x {
		x[i] = 3e7 + 1e6*rng.Float64()
		b[i] = rng.NormFloat64()
		f[i] = b[i] - sys.storage[i]*x[i]
	}
	want, got := make([]float64, sys.n), make([]float64, sys.n)
	a.MulVecTo(want, x)
	as.Residual(got, f, x)
	for i := range a.N {
		var scale float64 // Σ_j |a_ij x_j| + |b_i|: the product's round-off scale
		for p := a.RowPtr[i]; p < a.RowPtr[i+1]; p++ {
			scale += abs(a.Val[p] * x[a.ColIdx[p]])
		}
		scale += abs(b[i])
		want[i] = b[i] - want[i]
		d := float64(2 * (a.RowPtr[i+1] - a.RowPtr[i]))
		numtest.Abs(t, "flux-form residual against b − A x", got[i], want[i], d*unitRoundoff*scale)
	}
	for i := range x {
		x[i] = 3e7
		f[i] = b[i] - sys.storage[i]*x[i]
	}
	as.Residual(got, f, x)
	for i := range got {
		if got[i] != f[i] {
			t.Fatalf("at uniform x, residual[%d] = %g, want b − D x = %g exactly", i, got[i], f[i])
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func TestAssemblerErrors(t *testing.T) {
	tests := []struct {
		name  string
		n     int
		conns [][2]int
		want  string
	}{
		{"no unknowns", 0, nil, "number of unknowns = 0"},
		{"index too large", 3, [][2]int{{0, 1}, {1, 3}}, "connection 1 joins unknowns 1 and 3"},
		{"negative index", 3, [][2]int{{-1, 1}}, "connection 0 joins unknowns -1 and 1"},
		{"self connection", 3, [][2]int{{0, 1}, {2, 2}}, "connection 1 joins unknown 2 to itself"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := NewAssembler(tt.n, tt.conns)
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("error %v, want one containing %q", err, tt.want)
			}
		})
	}
}

func TestAssemblerDoesNotAllocate(t *testing.T) {
	sys := newNetwork(defaultNetwork(500), rand.New(rand.NewPCG(1, 2)))
	as := sys.assembler()
	allocs := testing.AllocsPerRun(5, func() { sys.fill(as) })
	if allocs != 0 {
		t.Errorf("Reset/AddDiagonal/AddConnection allocate %v times per fill, want 0", allocs)
	}
}

func TestCSRValidate(t *testing.T) {
	good := func() *CSR {
		return &CSR{N: 2, RowPtr: []int{0, 2, 3}, ColIdx: []int{0, 1, 1}, Val: []float64{1, 2, 3}}
	}
	tests := []struct {
		name   string
		change func(a *CSR)
		want   string
	}{
		{"valid", func(*CSR) {}, ""},
		{"short RowPtr", func(a *CSR) { a.RowPtr = a.RowPtr[:2] }, "len(RowPtr) = 2"},
		{"unsorted row", func(a *CSR) { a.ColIdx[0], a.ColIdx[1] = 1, 0 }, "row 0: column 0"},
		{"column out of range", func(a *CSR) { a.ColIdx[2] = 2 }, "row 1: column 2"},
		{"short Val", func(a *CSR) { a.Val = a.Val[:2] }, "len(Val) = 2"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			a := good()
			tt.change(a)
			err := a.Validate()
			switch {
			case tt.want == "" && err != nil:
				t.Errorf("unexpected error %v", err)
			case tt.want != "" && (err == nil || !strings.Contains(err.Error(), tt.want)):
				t.Errorf("error %v, want one containing %q", err, tt.want)
			}
		})
	}
}

func TestMulVecTo(t *testing.T) {
	// [2 -1 0; -1 2 -1; 0 -1 2] (1, 2, 3)ᵀ = (0, 0, 4)ᵀ, by hand; small
	// integers are exact in floating point, hence tolerance 0.
	a := &CSR{N: 3, RowPtr: []int{0, 2, 5, 7}, ColIdx: []int{0, 1, 0, 1, 2, 1, 2},
		Val: []float64{2, -1, -1, 2, -1, -1, 2}}
	got := make([]float64, 3)
	a.MulVecTo(got, []float64{1, 2, 3})
	for i, want := range []float64{0, 0, 4} {
		numtest.Abs(t, "(A x)_i", got[i], want, 0)
	}
}

func TestCheckSymmetricPattern(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 50 {
		n := 2 + rng.IntN(40)
		a := patternOf(n, randomGraph(n, 3, rng))
		if err := a.checkSymmetricPattern(); err != nil {
			t.Fatalf("trial %d: symmetric pattern rejected: %v", trial, err)
		}
		// Drop one stored off-diagonal entry: the mirror is now unmatched.
		var offDiag []int
		for r := range n {
			for p := a.RowPtr[r]; p < a.RowPtr[r+1]; p++ {
				if a.ColIdx[p] != r {
					offDiag = append(offDiag, p)
				}
			}
		}
		if len(offDiag) == 0 {
			continue
		}
		drop := offDiag[rng.IntN(len(offDiag))]
		b := &CSR{N: n, RowPtr: slices.Clone(a.RowPtr)}
		b.ColIdx = slices.Delete(slices.Clone(a.ColIdx), drop, drop+1)
		b.Val = make([]float64, len(b.ColIdx))
		for r := range n {
			if b.RowPtr[r+1] > drop {
				b.RowPtr[r+1]--
			}
		}
		if err := b.checkSymmetricPattern(); err == nil || !strings.Contains(err.Error(), "pattern must be symmetric") {
			t.Fatalf("trial %d: dropping entry %d: error %v, want an asymmetry error", trial, drop, err)
		}
	}
}
