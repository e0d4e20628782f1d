package batch

import (
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
)

// table reads a CSV file of a batch folder into its header and rows,
// failing unless it has at least one row.
func table(t *testing.T, dir, name string) (head []string, rows [][]string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, name))
	if err != nil {
		t.Fatal(err)
	}
	all := csvRows(t, b)
	if len(all) < 2 {
		t.Fatalf("%s has no rows", name)
	}
	return all[0], all[1:]
}

// field returns the value of column name in row, failing if there is no
// such column.
func field(t *testing.T, head, row []string, name string) string {
	t.Helper()
	k := slices.Index(head, name)
	if k < 0 {
		t.Fatalf("no column %q in %v", name, head)
	}
	return row[k]
}

// number parses a field; "" is NaN (a missing value).
func number(t *testing.T, s string) float64 {
	t.Helper()
	if s == "" {
		return math.NaN()
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// Pairings follow the nested-loop case numbering: with A = a0,a1 and
// B = b0,b1,b2 (case = 3·iA + iB), the reference of a case for A has
// iA = ref, for B iB = ref.
func TestPairings(t *testing.T) {
	m := &Manifest{Sweeps: []Sweep{{Key: "A", Values: []string{"a0", "a1"}, Reference: "a1"},
		{Key: "B", Values: []string{"b0", "b1", "b2"}, Reference: "b0"}}}
	for range Cases(m.Sweeps) {
		m.Cases = append(m.Cases, ManifestCase{})
	}
	want := []Pairing{
		{0, 0, 3}, {0, 1, 4}, {0, 2, 5}, // A: cases with a0 against a1
		{1, 1, 0}, {1, 2, 0}, {1, 4, 3}, {1, 5, 3}, // B: cases with b1, b2 against b0
	}
	if got := m.Pairings(); !slices.Equal(got, want) {
		t.Errorf("Pairings = %v, want %v", got, want)
	}
}

// paired.csv holds, per pairing and realization, each headline result of
// the case and its reference, equal to realizations.csv's, with their
// difference and ratio; paired-percentiles.csv holds gonum's empirical
// quantiles of those ratios.
func TestPairedTables(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	o.Realizations = 11
	if err := SetReference(o.Sweeps, "schedule.rate=6 bbl/min"); err != nil {
		t.Fatal(err)
	}
	runBatch(t, o)
	rh, rrows := table(t, out, RealizationsName)
	// result[case][realization] is the row of realizations.csv.
	result := map[[2]string][]string{}
	for _, row := range rrows {
		result[[2]string{row[0], field(t, rh, row, "realization")}] = row
	}
	ph, prows := table(t, out, PairedName)
	// 4 cases: 2 differ from their reference for each sweep.
	if want := (2 + 2) * o.Realizations; len(prows) != want {
		t.Fatalf("paired.csv has %d rows, want %d", len(prows), want)
	}
	ratios := map[string][]float64{} // by sweep, case and column
	for _, row := range prows {
		c, ref, r := row[1], field(t, ph, row, "reference_case"), field(t, ph, row, "realization")
		sweep := row[0]
		// The reference differs from the case in the swept key only.
		ci, _ := strconv.Atoi(c)
		ri, _ := strconv.Atoi(ref)
		for k, s := range o.Sweeps {
			same := Cases(o.Sweeps)[ci].Values[k] == Cases(o.Sweeps)[ri].Values[k]
			if same == (s.Key == sweep) || s.Key == sweep && Cases(o.Sweeps)[ri].Values[k] != s.Reference {
				t.Fatalf("case %s, reference %s, sweep %s: not the reference for that sweep", c, ref, sweep)
			}
		}
		if field(t, ph, row, "same_network") != "true" {
			t.Errorf("case %s and %s, realization %s: different networks", c, ref, r)
		}
		for _, h := range headlines {
			v := number(t, field(t, ph, row, h.col.Title))
			vRef := number(t, field(t, ph, row, h.col.Title+"_reference"))
			// The values are realizations.csv's, to the last bit.
			want, wantRef := number(t, field(t, rh, result[[2]string{c, r}], h.col.Title)), number(t, field(t, rh, result[[2]string{ref, r}], h.col.Title))
			if !sameNumber(v, want) || !sameNumber(vRef, wantRef) {
				t.Fatalf("%s case %s/%s realization %s: %g, %g; realizations.csv %g, %g", h.col.Title, c, ref, r, v, vRef, want, wantRef)
			}
			diff := number(t, field(t, ph, row, h.col.Title+"_difference"))
			numtest.Close(t, h.col.Title+"_difference", diff, want-wantRef, 0, 0)
			if h.ratio == "" {
				if !math.IsNaN(diff) {
					ratios[sweep+"/"+c+"/"+h.compared()] = append(ratios[sweep+"/"+c+"/"+h.compared()], diff)
				}
				continue
			}
			ratio := number(t, field(t, ph, row, h.ratio))
			if wantRef == 0 {
				if !math.IsNaN(ratio) {
					t.Errorf("%s: ratio %g to a reference of 0, want empty", h.ratio, ratio)
				}
				continue
			}
			numtest.Close(t, h.ratio, ratio, want/wantRef, 0, 0)
			ratios[sweep+"/"+c+"/"+h.ratio] = append(ratios[sweep+"/"+c+"/"+h.ratio], ratio)
		}
	}
	qh, qrows := table(t, out, PairedPercentilesName)
	if len(qrows) != 4 {
		t.Fatalf("paired-percentiles.csv has %d rows, want 4", len(qrows))
	}
	checked := 0
	for _, row := range qrows {
		for _, h := range headlines {
			name := h.compared()
			values := ratios[row[0]+"/"+row[1]+"/"+name]
			if n, _ := strconv.Atoi(field(t, qh, row, name+"_count")); n != len(values) || n == 0 {
				t.Fatalf("%s count %d, want %d (> 0)", name, n, len(values))
			}
			slices.Sort(values)
			for _, q := range []struct {
				col string
				p   float64
			}{{"_q10", 0.1}, {"_q50", 0.5}, {"_q90", 0.9}} {
				got := number(t, field(t, qh, row, name+q.col))
				numtest.Close(t, name+q.col, got, stat.Quantile(q.p, stat.Empirical, values, nil), 0, quantileTol)
				checked++
			}
		}
	}
	if checked != 4*len(headlines)*3 {
		t.Errorf("%d percentiles checked", checked)
	}
}

// sameNumber is equality with NaN equal to NaN (a missing value in both).
func sameNumber(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }

func TestSetReference(t *testing.T) {
	sweeps := func() []Sweep {
		return []Sweep{mustSweep(t, "fluids.slickwater.viscosity=1 cP,5 cP"), mustSweep(t, "schedule.rate=8 bbl/min,6 bbl/min,5 cP")}
	}
	for _, tc := range []struct {
		ref, want string // want: "" for an error, else "key=value" set
	}{
		{"5 cP", ""}, // a value of both sweeps: ambiguous
		{"fluids.slickwater.viscosity=5 cP", "fluids.slickwater.viscosity=5 cP"},
		{"6 bbl/min", "schedule.rate=6 bbl/min"},
		{" 6 bbl/min ", "schedule.rate=6 bbl/min"},
		{"7 bbl/min", ""},
		{"rock.friction_static=0.6", ""},
		{"schedule.rate=1 cP", ""},
	} {
		s := sweeps()
		err := SetReference(s, tc.ref)
		if tc.want == "" {
			if err == nil || !isBadInput(err) {
				t.Errorf("--reference %q: err = %v, want a bad-input error", tc.ref, err)
			}
			continue
		}
		key, value, _ := strings.Cut(tc.want, "=")
		k := slices.IndexFunc(s, func(sw Sweep) bool { return sw.Key == key })
		if err != nil || s[k].Reference != value || s[1-k].Reference != s[1-k].Values[0] {
			t.Errorf("--reference %q: err %v, references %q, %q; want %s", tc.ref, err, s[0].Reference, s[1].Reference, tc.want)
		}
	}
	if err := SetReference(nil, "1 cP"); err == nil || !strings.Contains(err.Error(), "no --sweep") {
		t.Errorf("a reference without sweeps: err = %v", err)
	}
	// A reference that is not a value is refused before any work starts.
	o := testOptions(t, t.TempDir())
	o.Sweeps[0].Reference = "2 cP"
	if _, err := Run(context.Background(), o); !isBadInput(err) {
		t.Errorf("Run with a reference that is not a value: err = %v", err)
	}
}

func isBadInput(err error) bool { return errors.Is(err, badinput.Err) }
