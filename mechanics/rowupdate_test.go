package mechanics

import (
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"

	"slipfront/internal/numtest"
)

// Solving with a matrix some of whose rows were replaced, by the
// Sherman–Morrison–Woodbury identity on the base's factors, equals the
// direct solve with the new matrix; past maxRowUpdates replaced rows the
// base is factored again. Rows whose values changed under the same key
// are replaced only when the exact matrix is asked for.
func TestRowUpdatedLU(t *testing.T) {
	const n = 40
	rng := rand.New(rand.NewPCG(1, 2))
	random := func() []float64 {
		a := make([]float64, n*n)
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		for i := range n {
			a[i*n+i] += 2 * n // well conditioned
		}
		return a
	}
	a := random()
	for _, c := range []struct {
		name     string
		replaced int
		sameKey  bool // the replaced rows keep their keys
		exact    bool
		rebased  bool
	}{
		{name: "no row"},
		{name: "one row", replaced: 1},
		{name: "a few rows", replaced: 7},
		{name: "the most before a new base", replaced: maxRowUpdates(n)},
		{name: "one more: a new base", replaced: maxRowUpdates(n) + 1, rebased: true},
		{name: "same keys, exact", replaced: 3, sameKey: true, exact: true},
	} {
		t.Run(c.name, func(t *testing.T) {
			var u rowUpdatedLU
			if !u.update(a, make([]uint8, n), n, false) {
				t.Fatal("base singular")
			}
			b2 := slices.Clone(a)
			k2 := make([]uint8, n)
			for _, r := range rng.Perm(n)[:c.replaced] {
				for j := range n {
					b2[r*n+j] = rng.NormFloat64()
				}
				b2[r*n+r] += 2 * n
				if !c.sameKey {
					k2[r] = 1
				}
			}
			if c.sameKey {
				// Without exact the rows are kept from the base.
				if !u.update(b2, k2, n, false) || len(u.rows) != 0 {
					t.Fatalf("%d rows replaced without exact, want 0", len(u.rows))
				}
			}
			if !u.update(b2, k2, n, c.exact) {
				t.Fatal("updated matrix singular")
			}
			if rebased := len(u.rows) == 0 && c.replaced > 0; rebased != c.rebased {
				t.Errorf("base factored again = %v, want %v", rebased, c.rebased)
			}
			rhs := make([]float64, n)
			for i := range rhs {
				rhs[i] = rng.NormFloat64()
			}
			var want mat.VecDense
			if err := want.SolveVec(mat.NewDense(n, n, b2), mat.NewVecDense(n, slices.Clone(rhs))); err != nil {
				t.Fatal(err)
			}
			u.solve(rhs)
			for i := range n {
				numtest.Abs(t, "solution", rhs[i], want.AtVec(i), 1e-12)
			}
		})
	}
}
