package mechanics

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// fixtureScreening screens the fixture planes with default options.
func fixtureScreening(t testing.TB) *Screening {
	t.Helper()
	sc, err := Screen(fixturePlanes(), workedExample(t), Coulomb{Friction: 0.6},
		ScreenOptions{SetNames: map[int]string{0: "NE set", 1: "E set"}})
	if err != nil {
		t.Fatal(err)
	}
	return sc
}

// render returns what write puts out.
func render(t testing.TB, write func(w *bytes.Buffer) error) string {
	t.Helper()
	var b bytes.Buffer
	if err := write(&b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

var numberRE = regexp.MustCompile(`-?\d+(\.\d+)?`)

// compareGolden compares got with testdata/name: the text between numbers
// and every integer exactly (counts, ranks, ids: "all 4" must not pass
// as "all 5"), and each decimal number within one unit of its last printed
// digit. That unit is the tolerance a rounding flip needs: the Go
// specification lets a compiler fuse x*y + z into one rounding (it does on
// arm64, and on amd64 with GOAMD64=v3), which moves a result by a few ulps
// (~1e-15 relative, far below the printed precision) and so changes the
// printed value only when it lies within those ulps of a rounding boundary,
// and then by exactly one unit of the last digit. With -update it rewrites
// the file.
func compareGolden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	want := string(raw)
	if numberRE.ReplaceAllString(got, "#") != numberRE.ReplaceAllString(want, "#") {
		t.Fatalf("%s: text differs from the golden file:\n%s", name, got)
	}
	g, w := numberRE.FindAllString(got, -1), numberRE.FindAllString(want, -1)
	if len(w) == 0 {
		t.Fatalf("%s: the golden file holds no numbers: nothing would be compared", name)
	}
	for i := range w {
		dot, gdot := strings.IndexByte(w[i], '.'), strings.IndexByte(g[i], '.')
		if dot < 0 || gdot < 0 {
			if g[i] != w[i] {
				t.Errorf("%s: number %d is %s, golden %s (integers compare exactly)", name, i, g[i], w[i])
			}
			continue
		}
		unit := math.Pow10(-(len(w[i]) - dot - 1))
		a, err := strconv.ParseFloat(g[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		b, err := strconv.ParseFloat(w[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		// The factor 1.0000001 absorbs the binary round-off of the two
		// parsed decimals and of unit itself.
		if len(g[i])-gdot != len(w[i])-dot || math.Abs(a-b) > unit*1.0000001 {
			t.Errorf("%s: number %d is %s, golden %s", name, i, g[i], w[i])
		}
	}
}

func TestScreenGolden(t *testing.T) {
	sc := fixtureScreening(t)
	compareGolden(t, "screen.csv", render(t, func(w *bytes.Buffer) error { return sc.WriteCSV(w) }))
	compareGolden(t, "screen.json", render(t, func(w *bytes.Buffer) error { return sc.WriteJSON(w) }))
	compareGolden(t, "slip-vs-dp.csv", render(t, func(w *bytes.Buffer) error { return sc.WriteCurveCSV(w) }))
	compareGolden(t, "summary.txt", render(t, func(w *bytes.Buffer) error { return sc.WriteSummary(w) }))
}

// screen.csv reads back as the plane results, in MPa and degrees, to the
// printed precision.
func TestWriteCSVReadBack(t *testing.T) {
	sc := fixtureScreening(t)
	recs, err := csv.NewReader(strings.NewReader(render(t, func(w *bytes.Buffer) error { return sc.WriteCSV(w) }))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(recs[0], ","); got != ScreenCSVHeader {
		t.Fatalf("header %q", got)
	}
	// The README's required columns come first, in order.
	required := "fracture_id,set,dip_deg,dip_direction_deg,sigma_n_MPa,tau_MPa,slip_tendency,dilation_tendency,critical_dp_MPa"
	if !strings.HasPrefix(ScreenCSVHeader, required+",") {
		t.Errorf("header lacks the required columns: %q", ScreenCSVHeader)
	}
	if len(recs) != 1+len(sc.Planes) {
		t.Fatalf("%d rows, want %d", len(recs)-1, len(sc.Planes))
	}
	for i, r := range sc.Planes {
		row := recs[i+1]
		val := func(k int) float64 {
			v, err := strconv.ParseFloat(row[k], 64)
			if err != nil {
				t.Fatal(err)
			}
			return v
		}
		if row[0] != strconv.Itoa(r.ID) || row[1] != strconv.Itoa(r.Set) || row[13] != map[int]string{0: "NE set", 1: "E set"}[r.Set] {
			t.Errorf("row %d: id %s set %s set_name %s", i, row[0], row[1], row[13])
		}
		// Half a unit of the printed decimals, plus round-off.
		const d3, d6 = 0.5e-3 + 1e-9, 0.5e-6 + 1e-12
		numtest.Abs(t, "dip_deg", val(2), r.Dip*toDeg, d3)
		numtest.Abs(t, "dip_direction_deg", val(3), r.DipDirection*toDeg, d3)
		numtest.Abs(t, "sigma_n_MPa", val(4), r.SigmaN/mpa, d6)
		numtest.Abs(t, "tau_MPa", val(5), r.Tau/mpa, d6)
		numtest.Abs(t, "slip_tendency", val(6), r.SlipTendency, d6)
		numtest.Abs(t, "dilation_tendency", val(7), r.DilationTendency, d6)
		numtest.Abs(t, "critical_dp_MPa", val(8), r.CriticalIncrease/mpa, d6)
		numtest.Abs(t, "rake_deg", angleDiff(val(9)*deg, r.Rake)/deg, 0, d3)
		if row[9] == "-180.000" {
			t.Errorf("row %d: rake printed as -180.000, want 180.000", i)
		}
		numtest.Abs(t, "area_m2", val(10), r.Area, d3)
		numtest.Abs(t, "trace_length_m", val(11), r.TraceLength, d3)
		numtest.Abs(t, "slip_tendency_total", val(12), r.TotalSlipTendency, d6)
	}
}

// screen.json carries the keys the README lists, with the tensor in MPa.
func TestWriteJSONContent(t *testing.T) {
	sc := fixtureScreening(t)
	var doc map[string]any
	if err := json.Unmarshal([]byte(render(t, func(w *bytes.Buffer) error { return sc.WriteJSON(w) })), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"stress_tensor_MPa", "pore_pressure_MPa", "friction", "cohesion_MPa",
		"frictional_limit", "sets", "total", "caution", "pressure_increases_MPa"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("screen.json lacks %q", k)
		}
	}
	tensor := doc["stress_tensor_MPa"].([]any)
	// docs/references.md §7.4 step 1, printed to 6 decimals here.
	numtest.Abs(t, "S_EN", tensor[0].([]any)[1].(float64), 15.1554445662, 0.5e-6)
	numtest.Abs(t, "S_UU", tensor[2].([]any)[2].(float64), 75, 0)
	numtest.Abs(t, "pore pressure", doc["pore_pressure_MPa"].(float64), 30, 0)
	if doc["caution"] != Caution {
		t.Errorf("caution %q", doc["caution"])
	}
	limit := doc["frictional_limit"].(map[string]any)
	numtest.Abs(t, "limit", limit["limit"].(float64), 3.119428455, 0.5e-6)
	numtest.Abs(t, "ratio", limit["ratio"].(float64), 2.4, 0)
	if limit["exceeded"] != false {
		t.Errorf("exceeded = %v", limit["exceeded"])
	}
	sets := doc["sets"].([]any)
	if len(sets) != 2 || sets[1].(map[string]any)["name"] != "E set" {
		t.Fatalf("sets: %v", sets)
	}
	total := doc["total"].(map[string]any)
	if _, has := total["set"]; has {
		t.Error("total carries a set index")
	}
	// Default increases 0, 1, 2, 5, 10 MPa: all four fixture planes need
	// more than 5 MPa, three need less than 10.
	shares := total["share_of_fractures"].([]any)
	for k, want := range []float64{0, 0, 0, 0, 0.75} {
		numtest.Abs(t, "share of fractures", shares[k].(float64), want, 0)
	}
}

func TestWriteSummaryContent(t *testing.T) {
	out := render(t, func(w *bytes.Buffer) error { return fixtureScreening(t).WriteSummary(w) })
	for _, want := range []string{"SHmax", "strike-slip", "NE set", "E set", "all", "75.0%", "10 MPa", "Caution:", "within the limit"} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q:\n%s", want, out)
		}
	}
}

// A stress state beyond the frictional limit shows its warning.
func TestWriteSummaryWarning(t *testing.T) {
	s, err := NewAndersonian(Andersonian{SHmax: 120 * mpa, Shmin: 55 * mpa, Sv: 75 * mpa, PorePressure: 30 * mpa})
	if err != nil {
		t.Fatal(err)
	}
	sc, err := Screen(fixturePlanes(), s, Coulomb{Friction: 0.6}, ScreenOptions{})
	if err != nil {
		t.Fatal(err)
	}
	out := render(t, func(w *bytes.Buffer) error { return sc.WriteSummary(w) })
	if !strings.Contains(out, "EXCEEDS") || !strings.Contains(out, "Warning:") {
		t.Errorf("summary lacks the warning:\n%s", out)
	}
}

func TestAppendFixed(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		prec int
		want string
	}{
		{-1e-9, 6, "0.000000"},
		{math.Copysign(0, -1), 3, "0.000"},
		{-0.0004, 3, "0.000"},
		{-0.0006, 3, "-0.001"},
		{12.3456789, 3, "12.346"},
		{-172.6549, 3, "-172.655"},
	} {
		if got := fixed(tc.v, tc.prec); got != tc.want {
			t.Errorf("fixed(%g, %d) = %q, want %q", tc.v, tc.prec, got, tc.want)
		}
	}
}

type failingWriter struct{}

var errWrite = errors.New("disk full")

func (failingWriter) Write([]byte) (int, error) { return 0, errWrite }

func TestWritersReportErrors(t *testing.T) {
	sc := fixtureScreening(t)
	for name, write := range map[string]func() error{
		"csv":     func() error { return sc.WriteCSV(failingWriter{}) },
		"json":    func() error { return sc.WriteJSON(failingWriter{}) },
		"curve":   func() error { return sc.WriteCurveCSV(failingWriter{}) },
		"summary": func() error { return sc.WriteSummary(failingWriter{}) },
	} {
		if err := write(); !errors.Is(err, errWrite) {
			t.Errorf("%s: error %v, want %v", name, err, errWrite)
		}
	}
}
