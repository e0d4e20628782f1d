package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// readTable reads a CSV file of a batch folder: its header and rows.
func readTable(t *testing.T, path string) ([]string, [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil || len(rows) < 2 {
		t.Fatalf("%s: %v, %d rows", path, err, len(rows))
	}
	return rows[0], rows[1:]
}

// intColumn returns the whole numbers of a column.
func intColumn(t *testing.T, head []string, rows [][]string, name string) []int {
	t.Helper()
	k := slices.Index(head, name)
	if k < 0 {
		t.Fatalf("no column %s in %v", name, head)
	}
	var out []int
	for _, r := range rows {
		v, err := strconv.Atoi(r[k])
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, v)
	}
	return out
}

// printedWarning matches the line batch prints per kind of warning.
var printedWarning = regexp.MustCompile(`(?m)^warning: (\d+) × bhp_above_shmin in (\d+) realizations, e\.g\. stage W1:1: bottom-hole pressure .* exceeded Shmin`)

// The zipper pad crosses Shmin in every stage: a small batch of it counts the
// warnings per realization and per case in its tables, the case's count
// being the sum over its realizations, and prints them at the end with an
// example message, so that no batch hides a warning its runs gave.
func TestBatchWarnings(t *testing.T) {
	if testing.Short() {
		t.Skip("runs two realizations of the demo")
	}
	dir := filepath.Join(t.TempDir(), "b")
	// Dc = 10 mm gives a nucleation half-length of 55 m, which 30 m
	// elements resolve: the runs give the Shmin warnings only.
	code, out, stderr := runCLI(t, "batch", "zipper-pad", "-n", "2", "--set", "schedule.volume=10 bbl", "--set", "schedule.shut_in=2 min",
		"--set", "numerics.element_length=30 m", "--set", "rock.slip_weakening_distance=10 mm", "--out", dir)
	if code != exitOK {
		t.Fatalf("batch: exit %d: %s", code, stderr)
	}
	rh, rrows := readTable(t, filepath.Join(dir, "realizations.csv"))
	perRealization := intColumn(t, rh, rrows, "warnings")
	sum := 0
	for r, n := range perRealization {
		if n < 1 {
			t.Errorf("realization %d: %d warnings; every demo realization crosses Shmin", r, n)
		}
		sum += n
	}
	ch, crows := readTable(t, filepath.Join(dir, "comparison.csv"))
	if got := intColumn(t, ch, crows, "warnings"); len(got) != 1 || got[0] != sum {
		t.Errorf("comparison.csv warnings %v, want the sum over the realizations %d", got, sum)
	}
	wh, wrows := readTable(t, filepath.Join(dir, "warnings.csv"))
	if got := intColumn(t, wh, wrows, "warnings"); len(got) != 1 || got[0] != sum || wrows[0][slices.Index(wh, "kind")] != "bhp_above_shmin" {
		t.Errorf("warnings.csv %v: want one row of bhp_above_shmin with %d warnings", wrows, sum)
	}
	m := printedWarning.FindStringSubmatch(out)
	if m == nil {
		t.Fatalf("batch did not print the Shmin warnings with an example:\n%s", out)
	}
	if n, _ := strconv.Atoi(m[1]); n != sum || m[2] != "2" {
		t.Errorf("printed %s warnings in %s realizations, the tables %d in 2", m[1], m[2], sum)
	}
}

// --reference names the case the others are compared with, and batch
// prints the paired comparison; a value no sweep has is bad input.
func TestBatchReference(t *testing.T) {
	dir := t.TempDir()
	args := func(out string, extra ...string) []string {
		return append([]string{"batch", "single-fracture", "-n", "2", "--set", "numerics.element_length=40 m",
			"--sweep", "fluids.water.viscosity=1cP,20cP", "--out", filepath.Join(dir, out)}, extra...)
	}
	code, out, stderr := runCLI(t, args("ref", "--reference", "20cP")...)
	if code != exitOK {
		t.Fatalf("batch: exit %d: %s", code, stderr)
	}
	if !regexp.MustCompile(`(?m)^fluids\.water\.viscosity=1cP +fluids\.water\.viscosity=20cP +\d`).MatchString(out) {
		t.Errorf("the paired table does not compare 1 cP with the reference 20 cP:\n%s", out)
	}
	h, rows := readTable(t, filepath.Join(dir, "ref", "paired.csv"))
	if got := intColumn(t, h, rows, "reference_case"); !slices.Equal(got, []int{1, 1}) {
		t.Errorf("paired.csv reference cases %v, want case 1 (20 cP) for both realizations", got)
	}
	code, _, stderr = runCLI(t, args("bad", "--reference", "7cP")...)
	if code != exitBadInput || !strings.Contains(stderr, "--reference") {
		t.Errorf("--reference 7cP: exit %d, %s", code, stderr)
	}
}

// run --realization N reproduces realization N of a batch: the same
// network and the same headline numbers as its row of realizations.csv,
// for the base case and for a sweep case given as --set. The tiny batch
// scenario's realizations differ (checked), so a run of another
// realization would not pass.
func TestRunReproducesBatchRealization(t *testing.T) {
	dir := t.TempDir()
	tiny := filepath.Join("..", "..", "batch", "testdata", "tiny.toml")
	// tiny's clusters meet no fracture without conduits; 20 m elements
	// keep it quick.
	sets := []string{"--set", "wells[0].conduit_half_length=40 m", "--set", "numerics.element_length=20 m"}
	batchArgs := append([]string{"batch", tiny, "-n", "4", "--sweep", "schedule.fluid=slickwater,gel", "--out", filepath.Join(dir, "batch"), "--quiet"}, sets...)
	if code, _, stderr := runCLI(t, batchArgs...); code != exitOK {
		t.Fatalf("batch: exit %d: %s", code, stderr)
	}
	head, rows := readTable(t, filepath.Join(dir, "batch", "realizations.csv"))
	col := func(row []string, name string) string {
		k := slices.Index(head, name)
		if k < 0 {
			t.Fatalf("no column %s in %v", name, head)
		}
		return row[k]
	}
	// Realizations 0 and 3 of the base case must differ for the test to
	// mean anything.
	if col(rows[0], "network_digest") == col(rows[3], "network_digest") || col(rows[0], "stimulated_fracture_area_m2") == col(rows[3], "stimulated_fracture_area_m2") {
		t.Fatalf("realizations 0 and 3 give the same network or area: the test cannot tell them apart\n%v\n%v", rows[0], rows[3])
	}
	for _, tc := range []struct {
		c    string
		sets []string
	}{
		{"0", nil},
		{"1", []string{"--set", "schedule.fluid=gel"}},
	} {
		i := slices.IndexFunc(rows, func(r []string) bool { return col(r, "case") == tc.c && col(r, "realization") == "3" })
		if i < 0 {
			t.Fatalf("realizations.csv has no row for case %s, realization 3", tc.c)
		}
		want := rows[i]
		out := filepath.Join(dir, "run-"+tc.c)
		args := slices.Concat([]string{"run", tiny, "--realization", "3", "--out", out, "--quiet"}, sets, tc.sets)
		if code, _, stderr := runCLI(t, args...); code != exitOK {
			t.Fatalf("run: exit %d: %s", code, stderr)
		}
		var sum struct {
			Realization   int    `json:"realization"`
			NetworkDigest string `json:"network_digest"`
			Totals        map[string]float64
			Warnings      []json.RawMessage
		}
		b, err := os.ReadFile(filepath.Join(out, "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, &sum); err != nil {
			t.Fatal(err)
		}
		if sum.Realization != 3 || sum.NetworkDigest != col(want, "network_digest") {
			t.Errorf("case %s: run of realization %d, network %.12s…; batch realization 3 has network %.12s…",
				tc.c, sum.Realization, sum.NetworkDigest, col(want, "network_digest"))
		}
		for _, name := range []string{"stimulated_area_m2", "stimulated_fracture_area_m2", "events", "max_magnitude_Mw", "peak_bhp_MPa", "injected_volume_m3"} {
			v, err := strconv.ParseFloat(col(want, name), 64)
			if err != nil {
				t.Fatalf("case %s: %s = %q: %v", tc.c, name, col(want, name), err)
			}
			if got, ok := sum.Totals[name]; !ok || got != v {
				t.Errorf("case %s: %s = %v in the run, %v in the batch", tc.c, name, got, v)
			}
		}
		if n := strconv.Itoa(len(sum.Warnings)); n != col(want, "warnings") {
			t.Errorf("case %s: %s warnings in the run, %s in the batch", tc.c, n, col(want, "warnings"))
		}
	}
}
