package batch

import (
	"math"
	"testing"

	"slipfront/internal/numtest"
	"slipfront/scenarios"
)

func gridScenario(xmin, xmax, ymin, ymax, cell float64) *scenarios.Scenario {
	s := &scenarios.Scenario{}
	s.Domain = scenarios.Domain{XMin: xmin, XMax: xmax, YMin: ymin, YMax: ymax, CRS: "EPSG:32614", OriginEasting: 5e5, OriginNorthing: 35e5}
	s.Numerics.CellSize = cell
	return s
}

func TestGridFor(t *testing.T) {
	for _, tc := range []struct {
		name                   string
		xmin, xmax, ymin, ymax float64
		cell                   float64
		cols, rows             int
	}{
		// Whole numbers of cells: 300/10 and 200/10 (testdata/tiny.toml).
		{"exact", -150, 150, -100, 100, 10, 30, 20},
		// 305/10 = 30.5 → 31 columns, the last reaching past x_max.
		{"partial column", -150, 155, -100, 100, 10, 31, 20},
		// 1.1/0.1 is 11.000000000000002 in float64; the slack keeps 11.
		{"rounding sliver", 0, 1.1, 0, 0.7, 0.1, 11, 7},
		{"one cell", 0, 5, 0, 5, 10, 1, 1},
	} {
		g, err := GridFor(gridScenario(tc.xmin, tc.xmax, tc.ymin, tc.ymax, tc.cell))
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if g.Cols != tc.cols || g.Rows != tc.rows || g.CRS != "EPSG:32614" {
			t.Errorf("%s: grid %+v, want %d × %d", tc.name, g, tc.cols, tc.rows)
		}
	}
	if _, err := GridFor(gridScenario(0, 1e5, 0, 1e5, 0.01)); err == nil {
		t.Error("a grid of 1e14 cells was accepted")
	}
}

func TestGridCells(t *testing.T) {
	g, err := GridFor(gridScenario(-150, 150, -100, 100, 10))
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		x, y  float64
		index int
		ok    bool
	}{
		{"south-west corner", -150, -100, 0, true},
		{"inside cell (2,1)", -125, -85, 1*30 + 2, true},
		{"on a cell boundary goes east/north", -140, -90, 1*30 + 1, true},
		{"north-east corner belongs to the last cell", 150, 100, 20*30 - 1, true},
		{"east edge, row 3", 150, -65, 3*30 + 29, true},
		{"west of the grid", -150.001, 0, 0, false},
		{"north of the grid", 0, 100.001, 0, false},
		{"NaN", math.NaN(), 0, 0, false},
	} {
		i, ok := g.CellAt(tc.x, tc.y)
		if ok != tc.ok || ok && i != tc.index {
			t.Errorf("%s: CellAt(%g, %g) = %d, %v; want %d, %v", tc.name, tc.x, tc.y, i, ok, tc.index, tc.ok)
		}
	}
	// Centre and ColRow invert Index; the centre lies in its own cell.
	for _, i := range []int{0, 31, 599} {
		col, row := g.ColRow(i)
		if g.Index(col, row) != i {
			t.Errorf("Index(ColRow(%d)) = %d", i, g.Index(col, row))
		}
		x, y := g.Centre(i)
		if j, ok := g.CellAt(x, y); !ok || j != i {
			t.Errorf("CellAt(Centre(%d)) = %d, %v", i, j, ok)
		}
	}
	x, y := g.Centre(1*30 + 2)
	// Cell (2, 1): west edge −150 + 2·10, south edge −100 + 1·10, plus half a cell.
	numtest.Abs(t, "centre x", x, -125, 1e-12)
	numtest.Abs(t, "centre y", y, -85, 1e-12)
}

func TestTimeGridFor(t *testing.T) {
	s, err := scenarios.Load(tinyPath)
	if err != nil {
		t.Fatal(err)
	}
	// testdata/tiny.toml: two stages of 100 bbl at 8 bbl/min = 12.5 min
	// = 750 s each, plus a 600 s shut-in after each: 2700 s. Every 120 s:
	// K = ceil(2700/120) = ceil(22.5) = 23, so 24 points.
	numtest.Rel(t, "schedule length", s.ScheduleLength(), 2700, 1e-12)
	tg, err := TimeGridFor(s)
	if err != nil {
		t.Fatal(err)
	}
	if tg.Points != 24 {
		t.Errorf("points = %d, want 24", tg.Points)
	}
	numtest.Rel(t, "interval", tg.Interval, 120, 1e-12)
	numtest.Rel(t, "last time", tg.Time(tg.Points-1), 2760, 1e-12)
}

func TestResample(t *testing.T) {
	g := TimeGrid{Interval: 10, Points: 6} // 0, 10, …, 50 s
	for _, tc := range []struct {
		name          string
		times, values []float64
		want          []float64
	}{
		{"same grid", []float64{0, 10, 20, 30, 40, 50}, []float64{0, 1, 2, 3, 4, 5}, []float64{0, 1, 2, 3, 4, 5}},
		// Linear between (5, 1) and (25, 3): at 10 → 1.5, at 20 → 2.5.
		{"interpolated", []float64{5, 25}, []float64{1, 3}, []float64{1, 1.5, 2.5, 3, 3, 3}},
		{"single point holds", []float64{12}, []float64{7}, []float64{7, 7, 7, 7, 7, 7}},
		// A step at t = 20: the later value wins at the repeated time.
		{"repeated time", []float64{0, 20, 20, 40}, []float64{0, 2, 5, 7}, []float64{0, 1, 5, 6, 7, 7}},
		{"run ends early", []float64{0, 15}, []float64{0, 3}, []float64{0, 2, 3, 3, 3, 3}},
	} {
		got := g.Resample(nil, tc.times, tc.values)
		for k := range tc.want {
			numtest.Abs(t, tc.name, got[k], tc.want[k], 1e-12)
		}
	}
}
