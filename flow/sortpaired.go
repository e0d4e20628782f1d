package flow

import (
	"cmp"
	"slices"
)

// sortPaired sorts keys ascending and moves vals with them, keeping equal
// keys in input order. Rows of a network matrix hold a handful of entries,
// so short rows use insertion sort; long ones (a well's row) fall back to
// the standard library.
func sortPaired[K cmp.Ordered, V any](keys []K, vals []V) {
	if len(keys) > 32 {
		type entry struct {
			k K
			v V
		}
		e := make([]entry, len(keys))
		for i := range keys {
			e[i] = entry{keys[i], vals[i]}
		}
		slices.SortStableFunc(e, func(a, b entry) int { return cmp.Compare(a.k, b.k) })
		for i := range e {
			keys[i], vals[i] = e[i].k, e[i].v
		}
		return
	}
	for i := 1; i < len(keys); i++ {
		k, v := keys[i], vals[i]
		j := i
		for ; j > 0 && keys[j-1] > k; j-- {
			keys[j], vals[j] = keys[j-1], vals[j-1]
		}
		keys[j], vals[j] = k, v
	}
}
