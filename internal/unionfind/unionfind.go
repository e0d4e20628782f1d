// Package unionfind is a disjoint-set forest with union by size and path
// halving (Tarjan, R.E. 1975, "Efficiency of a good but not linear set
// union algorithm", J. ACM 22(2), 215–225): near-constant time per
// operation.
package unionfind

// Forest holds disjoint sets of the elements 0 … Len()−1.
type Forest struct {
	parent []int32
	size   []int32
}

// New returns a forest of n singleton sets.
func New(n int) *Forest {
	f := &Forest{parent: make([]int32, 0, n), size: make([]int32, 0, n)}
	for range n {
		f.Add()
	}
	return f
}

// Add appends a new singleton set and returns its element.
func (f *Forest) Add() int32 {
	id := int32(len(f.parent))
	f.parent = append(f.parent, id)
	f.size = append(f.size, 1)
	return id
}

// Len returns the number of elements.
func (f *Forest) Len() int { return len(f.parent) }

// Find returns the representative of x's set.
func (f *Forest) Find(x int32) int32 {
	for f.parent[x] != x {
		f.parent[x] = f.parent[f.parent[x]]
		x = f.parent[x]
	}
	return x
}

// Union joins the sets of a and b.
func (f *Forest) Union(a, b int32) {
	ra, rb := f.Find(a), f.Find(b)
	if ra == rb {
		return
	}
	if f.size[ra] < f.size[rb] {
		ra, rb = rb, ra
	}
	f.parent[rb] = ra
	f.size[ra] += f.size[rb]
}

// Labels numbers the sets 0, 1, … in order of their lowest element and
// returns each element's set number and the number of sets.
func (f *Forest) Labels() (labels []int32, sets int) {
	labels = make([]int32, len(f.parent))
	index := make(map[int32]int32)
	for i := range f.parent {
		r := f.Find(int32(i))
		l, ok := index[r]
		if !ok {
			l = int32(len(index))
			index[r] = l
		}
		labels[i] = l
	}
	return labels, len(index)
}
