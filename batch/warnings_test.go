package batch

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// The warnings of every realization are counted in realizations.csv; per
// case and kind in warnings.csv, per case in comparison.csv and per kind
// in summary.json, each count the sum over the realizations.
func TestWarningsCounted(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	runBatch(t, o)
	rh, rrows := table(t, out, RealizationsName)
	perCase := map[string]int{}        // case → warnings
	perCaseKind := map[[2]string]int{} // (case, kind) → warnings
	realsWith := map[[2]string]int{}   // (case, kind) → realizations
	perKind := map[string]int{}        // kind → warnings
	for _, row := range rrows {
		c := row[0]
		n, _ := strconv.Atoi(field(t, rh, row, "warnings"))
		kinds := field(t, rh, row, "warning_kinds")
		if (n == 0) != (kinds == "") || n > 0 && len(strings.Split(kinds, ";")) != n {
			t.Fatalf("case %s: %d warnings of kinds %q", c, n, kinds)
		}
		perCase[c] += n
		seen := map[string]bool{}
		for _, k := range strings.Split(kinds, ";") {
			if k == "" {
				continue
			}
			perCaseKind[[2]string{c, k}]++
			perKind[k]++
			if !seen[k] {
				seen[k] = true
				realsWith[[2]string{c, k}]++
			}
		}
	}
	if len(perKind) != 2 {
		t.Fatalf("warning kinds %v: the fake runner gives two, both must occur for the test to mean something", perKind)
	}
	wh, wrows := table(t, out, WarningsName)
	if len(wrows) != 4*len(perKind) {
		t.Errorf("warnings.csv has %d rows, want one per case and kind: %d", len(wrows), 4*len(perKind))
	}
	for _, row := range wrows {
		key := [2]string{row[0], field(t, wh, row, "kind")}
		n, _ := strconv.Atoi(field(t, wh, row, "warnings"))
		k, _ := strconv.Atoi(field(t, wh, row, "realizations_with_warning"))
		if n != perCaseKind[key] || k != realsWith[key] {
			t.Errorf("warnings.csv %v: %d warnings in %d realizations, realizations.csv sums to %d in %d", key, n, k, perCaseKind[key], realsWith[key])
		}
	}
	ch, crows := table(t, out, ComparisonName)
	total := 0
	for _, row := range crows {
		n, _ := strconv.Atoi(field(t, ch, row, "warnings"))
		if n != perCase[row[0]] {
			t.Errorf("comparison.csv case %s: %d warnings, realizations.csv sums to %d", row[0], n, perCase[row[0]])
		}
		total += n
	}
	b, err := os.ReadFile(filepath.Join(out, SummaryName))
	if err != nil {
		t.Fatal(err)
	}
	var sum struct {
		Warnings []struct {
			Kind     string
			Warnings int
			Example  string
		}
	}
	if err := json.Unmarshal(b, &sum); err != nil {
		t.Fatal(err)
	}
	got := 0
	for _, w := range sum.Warnings {
		if w.Warnings != perKind[w.Kind] || !strings.Contains(w.Example, "fake warning") {
			t.Errorf("summary.json %s: %d warnings, example %q; realizations.csv has %d", w.Kind, w.Warnings, w.Example, perKind[w.Kind])
		}
		got += w.Warnings
	}
	if got != total || len(sum.Warnings) != len(perKind) {
		t.Errorf("summary.json counts %d warnings of %d kinds, the tables %d of %d", got, len(sum.Warnings), total, len(perKind))
	}
}
