package batch

import (
	"slices"
	"strings"
)

// WarningCount counts the warnings of one kind over realizations.
type WarningCount struct {
	// Kind of the warnings.
	Kind string
	// Warnings counts them; Realizations counts the realizations with at
	// least one.
	Warnings, Realizations int
	// Example is the message of the first of them in (case, realization)
	// order.
	Example string
}

// tally returns the count of kind in *counts, added with the example
// message when it is new.
func tally(counts *[]WarningCount, kind, example string) *WarningCount {
	k := slices.IndexFunc(*counts, func(c WarningCount) bool { return c.Kind == kind })
	if k < 0 {
		*counts = append(*counts, WarningCount{Kind: kind, Example: example})
		k = len(*counts) - 1
	}
	return &(*counts)[k]
}

func sortByKind(counts []WarningCount) []WarningCount {
	slices.SortFunc(counts, func(a, b WarningCount) int { return strings.Compare(a.Kind, b.Kind) })
	return counts
}

// CountWarnings counts the warnings of the results by kind, in kind order.
func CountWarnings(results []*Result) []WarningCount {
	var out []WarningCount
	for _, res := range results {
		seen := map[string]bool{}
		for _, w := range res.Warnings {
			c := tally(&out, w.Kind, w.Message)
			c.Warnings++
			if !seen[w.Kind] {
				seen[w.Kind] = true
				c.Realizations++
			}
		}
	}
	return sortByKind(out)
}

// TotalWarnings adds up the warning counts of every case, in kind order.
func TotalWarnings(aggs []CaseAggregate) []WarningCount {
	var out []WarningCount
	for i := range aggs {
		for _, wc := range aggs[i].Warnings {
			c := tally(&out, wc.Kind, wc.Example)
			c.Warnings += wc.Warnings
			c.Realizations += wc.Realizations
		}
	}
	return sortByKind(out)
}

// WarningTotals returns the number of warnings of the case's realizations
// and the number of realizations with at least one.
func (a *CaseAggregate) WarningTotals() (warnings, realizations int) {
	for _, wc := range a.Warnings {
		warnings += wc.Warnings
	}
	for _, res := range a.Results {
		if len(res.Warnings) > 0 {
			realizations++
		}
	}
	return warnings, realizations
}
