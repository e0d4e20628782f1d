package unionfind

import (
	"math/rand/v2"
	"testing"
)

func TestForest(t *testing.T) {
	f := New(6)
	f.Union(0, 3)
	f.Union(4, 3)
	f.Union(1, 5)
	if f.Add() != 6 || f.Len() != 7 {
		t.Fatal("Add")
	}
	labels, sets := f.Labels()
	want := []int32{0, 1, 2, 0, 0, 1, 3}
	if sets != 4 {
		t.Errorf("%d sets, want 4", sets)
	}
	for i := range want {
		if labels[i] != want[i] {
			t.Errorf("labels %v, want %v", labels, want)
			break
		}
	}
}

// Against a naive labelling on random unions.
func TestForestRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 300
	f := New(n)
	naive := make([]int, n)
	for i := range naive {
		naive[i] = i
	}
	for range 200 {
		a, b := rng.IntN(n), rng.IntN(n)
		f.Union(int32(a), int32(b))
		old, nw := naive[b], naive[a]
		for i := range naive {
			if naive[i] == old {
				naive[i] = nw
			}
		}
	}
	for i := range n {
		for j := range n {
			if (f.Find(int32(i)) == f.Find(int32(j))) != (naive[i] == naive[j]) {
				t.Fatalf("%d and %d disagree", i, j)
			}
		}
	}
}
