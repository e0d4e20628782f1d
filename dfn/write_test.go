package dfn

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
)

func readCSV(t *testing.T, b []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

func parse(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// fractures.csv and traces.csv hold every record with the required
// columns, and read back to the network's values within their printed
// precision (1 mm, 1e-4 degree).
func TestWriteCSV(t *testing.T) {
	n := mustGenerate(t, demoLikeScenario(), 0)
	var fb, tb bytes.Buffer
	if err := WriteFractures(&fb, n); err != nil {
		t.Fatal(err)
	}
	if err := WriteTraces(&tb, n); err != nil {
		t.Fatal(err)
	}
	frows, trows := readCSV(t, fb.Bytes()), readCSV(t, tb.Bytes())
	for _, want := range []string{"fracture_id", "set", "center_x_m", "center_y_m", "center_depth_m", "dip_deg", "dip_direction_deg", "area_m2", "shape", "size_m", "height_m"} {
		if !slices.Contains(frows[0], want) {
			t.Errorf("fractures.csv lacks column %s", want)
		}
	}
	for _, want := range []string{"trace_id", "fracture_id", "x0_m", "y0_m", "x1_m", "y1_m", "conducting_height_m", "network_cluster", "set", "trace_length_m"} {
		if !slices.Contains(trows[0], want) {
			t.Errorf("traces.csv lacks column %s", want)
		}
	}
	if len(frows) != len(n.Fractures)+1 || len(trows) != len(n.Traces)+1 {
		t.Fatalf("%d fracture rows for %d fractures, %d trace rows for %d traces", len(frows)-1, len(n.Fractures), len(trows)-1, len(n.Traces))
	}
	col := func(header []string, name string) int { return slices.Index(header, name) }
	for i, f := range n.Fractures {
		row := frows[i+1]
		numtest.Abs(t, "center_depth_m", parse(t, row[col(frows[0], "center_depth_m")]), -f.Centre.Z, 5e-4)
		numtest.Abs(t, "dip_direction_deg", parse(t, row[col(frows[0], "dip_direction_deg")]), deg(f.DipDirection), 5e-5)
		numtest.Abs(t, "area_m2", parse(t, row[col(frows[0], "area_m2")]), f.Area, 5e-4)
		if row[col(frows[0], "set")] != strconv.Itoa(f.Set) || row[col(frows[0], "shape")] != f.Shape.String() {
			t.Fatalf("row %v for %+v", row, f)
		}
	}
	for i, tr := range n.Traces {
		row := trows[i+1]
		numtest.Abs(t, "x1_m", parse(t, row[col(trows[0], "x1_m")]), tr.P1.X, 5e-4)
		numtest.Abs(t, "conducting_height_m", parse(t, row[col(trows[0], "conducting_height_m")]), tr.Height, 5e-4)
		numtest.Abs(t, "trace_length_m", parse(t, row[col(trows[0], "trace_length_m")]), tr.Length, 5e-4)
		if row[col(trows[0], "fracture_id")] != strconv.Itoa(tr.Fracture) || row[col(trows[0], "network_cluster")] != strconv.Itoa(tr.Cluster) {
			t.Fatalf("row %v for %+v", row, tr)
		}
	}
	if last := frows[len(frows)-1]; last[col(frows[0], "name")] != "F1" || last[col(frows[0], "set_name")] != KnownSetName {
		t.Errorf("mapped fracture row %v", last)
	}
}

// network.json has the required keys with the statistics' values; a
// statistic that is not a number (κ of a single mapped fracture) is null.
func TestWriteNetworkJSON(t *testing.T) {
	n := mustGenerate(t, demoLikeScenario(), 0)
	st := n.Stats()
	var b bytes.Buffer
	if err := WriteNetworkJSON(&b, n, st); err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"p32_per_m", "p21_per_m", "mean_intersections_per_trace", "clusters", "largest_cluster_fraction", "digest"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("network.json lacks %s", k)
		}
	}
	numtest.Rel(t, "p32_per_m", doc["p32_per_m"].(float64), st.P32, 1e-15)
	sets := doc["sets"].([]any)
	if len(sets) != 3 {
		t.Fatalf("%d sets, want 2 and the mapped one", len(sets))
	}
	for i, s := range sets {
		m := s.(map[string]any)
		for _, k := range []string{"name", "count", "p32_per_m", "kappa_estimate"} {
			if _, ok := m[k]; !ok {
				t.Errorf("set %d lacks %s", i, k)
			}
		}
		if m["name"] != st.Sets[i].Name || int(m["count"].(float64)) != st.Sets[i].Count {
			t.Errorf("set %d: %v", i, m)
		}
	}
	if sets[2].(map[string]any)["kappa_estimate"] != nil {
		t.Error("κ of one mapped fracture should be null")
	}
	wells := doc["wells"].([]any)
	if len(wells) != 2 || wells[0].(map[string]any)["p10_per_m"] == nil {
		t.Errorf("wells %v", wells)
	}
	var sum bytes.Buffer
	if err := WriteSummary(&sum, n, st); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"NE", "NW", KnownSetName, "clusters", "well A"} {
		if !strings.Contains(sum.String(), want) {
			t.Errorf("summary lacks %q:\n%s", want, sum.String())
		}
	}
}

// Statistics of a network laid out by hand.
func TestStatsByHand(t *testing.T) {
	r := Region{XMin: 0, XMax: 100, YMin: 0, YMax: 100, MidZ: -1000, Thickness: 10}
	n := &Network{Region: r, Sets: []SetInfo{{Name: "a", P32Target: 0.01}}}
	// Two vertical rectangles 40 m long, 10 m high, exactly filling the
	// layer; one half outside the map.
	n.Fractures = []Fracture{
		testFracture(Rectangle, 90, 90, 40, 10, vec3(50, 50, -1000)), // strikes north
		testFracture(Rectangle, 90, 0, 40, 10, vec3(50, 60, -1000)),  // strikes west
		testFracture(Rectangle, 90, 0, 40, 10, vec3(100, 10, -1000)), // half outside
	}
	n.Traces = Traces(n.Fractures, r)
	segs := []Segment{n.Traces[0].Segment, n.Traces[1].Segment, n.Traces[2].Segment}
	ix := NewIndex(segs)
	n.Intersections = ix.Intersections()
	n.Clusters = AssignClusters(n.Traces, n.Intersections)
	n.Wells = []WellPath{{Name: "W", Path: []vec2{{X: 0, Y: 40}, {X: 100, Y: 40}}}}
	for _, c := range ix.CrossPolyline(n.Wells[0].Path) {
		n.WellCrossings = append(n.WellCrossings, WellCrossing{Trace: c.Segment, Distance: c.Distance, Point: c.Point})
	}
	st := n.Stats()
	if st.Traces != 3 || st.Intersections != 1 || st.Clusters != 2 {
		t.Fatalf("stats %+v", st)
	}
	numtest.Rel(t, "P32", st.P32, (400+400+200)/(100*100*10.0), 1e-12)
	numtest.Rel(t, "P21", st.P21, (40+40+20)/(100*100.0), 1e-12)
	numtest.Rel(t, "intersections per trace", st.MeanIntersectionsPerTrace, 2.0/3, 1e-12)
	numtest.Rel(t, "largest cluster share", st.LargestClusterFraction, 80.0/120, 1e-12)
	w := st.Wells[0]
	if w.Crossings != 1 || w.ConnectedClusters != 1 || w.ConnectedTraces != 2 {
		t.Fatalf("well %+v", w)
	}
	numtest.Rel(t, "well P10", w.P10, 0.01, 1e-12)
	numtest.Rel(t, "connected length", w.ConnectedLength, 80, 1e-12)
	// Normals (1,0,0), (0,1,0), (0,1,0): R = √5, κ̂ = 2/(3 − √5).
	numtest.Rel(t, "κ̂", st.Sets[0].KappaEstimate, 2/(3-math.Sqrt(5)), 1e-12)
}

type vec2 = r2.Vec

func vec3(x, y, z float64) r3.Vec { return r3.Vec{X: x, Y: y, Z: z} }
