package gis

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"slipfront/internal/numtest"
)

// maskFromArt turns rows of '#' (true) and '.' (false), written north row
// first for readability, into a grid-ordered mask (row 0 = south).
func maskFromArt(art ...string) (Grid, []bool) {
	rows, cols := len(art), len(art[0])
	g := Grid{Cols: cols, Rows: rows, CellSize: 10, XMin: -25, YMin: 40}
	mask := make([]bool, cols*rows)
	for r, line := range art {
		j := rows - 1 - r
		for i, ch := range line {
			mask[j*cols+i] = ch == '#'
		}
	}
	return g, mask
}

func TestOutlineShapes(t *testing.T) {
	cases := []struct {
		name     string
		art      []string
		polygons int
		holes    int // in total
		vertices int // in total, without the closing repeats
	}{
		{"empty", []string{"...", "..."}, 0, 0, 0},
		{"single cell", []string{"...", ".#.", "..."}, 1, 0, 4},
		{"full block, collinear edges merged", []string{"###", "###"}, 1, 0, 4},
		{"L shape", []string{"#..", "#..", "###"}, 1, 0, 6},
		{"frame with a hole", []string{"###", "#.#", "###"}, 1, 1, 8},
		{"diagonal cells are separate", []string{".#", "#."}, 2, 0, 8},
		{"hole touching the outside at a corner", []string{"##.", "#.#", "###"}, 1, 1, 4 + 6},
		{"two holes touching at a corner", []string{"####", "#.##", "##.#", "####"}, 1, 2, 4 + 4 + 4},
		{"island in a lake", []string{"#####", "#...#", "#.#.#", "#...#", "#####"}, 2, 1, 4 + 4 + 4},
		{"checkerboard", []string{"#.#.", ".#.#", "#.#.", ".#.#"}, 8, 0, 32},
		{"touching the grid edge", []string{"#.#", "###"}, 1, 0, 8},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			g, mask := maskFromArt(c.art...)
			mp, err := Outline(g, mask)
			if err != nil {
				t.Fatal(err)
			}
			holes, verts := 0, 0
			for _, p := range mp {
				holes += len(p) - 1
				for _, r := range p {
					verts += len(r) - 1
				}
			}
			if len(mp) != c.polygons || holes != c.holes || verts != c.vertices {
				t.Errorf("%d polygons, %d holes, %d vertices; want %d, %d, %d\n%v", len(mp), holes, verts, c.polygons, c.holes, c.vertices, mp)
			}
			checkOutline(t, g, mask, mp)
		})
	}
}

// checkOutline verifies the properties Outline promises: area = true
// cells × cell area, each cell centre inside iff its cell is true (even-odd
// rule over all rings), closed simple rings, exterior CCW and holes CW, no
// collinear vertices, rings starting at their south-west-most vertex.
func checkOutline(t *testing.T, g Grid, mask []bool, mp orb.MultiPolygon) {
	t.Helper()
	n := 0
	for _, in := range mask {
		if in {
			n++
		}
	}
	// areaTol, m²: coordinates are multiples of the cell size added to the
	// corner; rounding is ~1e-12 relative.
	areaTol := 1e-9 * g.CellArea() * float64(len(mask))
	numtest.Abs(t, "area", multiPolygonArea(mp), float64(n)*g.CellArea(), areaTol)
	for j := range g.Rows {
		for i := range g.Cols {
			c := g.corner(i, j)
			centre := orb.Point{c[0] + g.CellSize/2, c[1] + g.CellSize/2}
			if got := insideEvenOdd(mp, centre); got != mask[j*g.Cols+i] {
				t.Errorf("cell (%d, %d): inside %v, mask %v", i, j, got, mask[j*g.Cols+i])
			}
		}
	}
	for pi, p := range mp {
		for ri, r := range p {
			what := fmt.Sprintf("polygon %d ring %d", pi, ri)
			if len(r) < 5 || r[0] != r[len(r)-1] {
				t.Errorf("%s: not a closed ring of at least 4 vertices: %v", what, r)
				continue
			}
			a := signedArea(r)
			if (ri == 0) != (a > 0) {
				t.Errorf("%s: signed area %g (exterior must be CCW, holes CW)", what, a)
			}
			seen := map[orb.Point]bool{}
			m := len(r) - 1
			for k := range m {
				if seen[r[k]] {
					t.Errorf("%s: vertex %v repeated: ring not simple", what, r[k])
				}
				seen[r[k]] = true
				prev, next := r[(k+m-1)%m], r[k+1]
				cross := (r[k][0]-prev[0])*(next[1]-r[k][1]) - (r[k][1]-prev[1])*(next[0]-r[k][0])
				if cross == 0 {
					t.Errorf("%s: vertex %v is collinear with its neighbours", what, r[k])
				}
				if r[k][1] < r[0][1] || (r[k][1] == r[0][1] && r[k][0] < r[0][0]) {
					t.Errorf("%s: starts at %v, not at its south-west-most vertex %v", what, r[0], r[k])
				}
			}
		}
	}
}

// insideEvenOdd reports whether p is inside mp by counting ring crossings
// of a ray towards +x (p must not lie on an edge).
func insideEvenOdd(mp orb.MultiPolygon, p orb.Point) bool {
	in := false
	for _, poly := range mp {
		for _, r := range poly {
			for k := 1; k < len(r); k++ {
				a, b := r[k-1], r[k]
				if (a[1] > p[1]) != (b[1] > p[1]) {
					x := a[0] + (p[1]-a[1])/(b[1]-a[1])*(b[0]-a[0])
					if x > p[0] {
						in = !in
					}
				}
			}
		}
	}
	return in
}

func randomMask(rng *rand.Rand, cols, rows int, density float64) []bool {
	mask := make([]bool, cols*rows)
	for k := range mask {
		mask[k] = rng.Float64() < density
	}
	return mask
}

func TestOutlineRandomMasks(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, density := range []float64{0.2, 0.5, 0.8} {
		for trial := range 20 {
			g := Grid{Cols: 17, Rows: 13, CellSize: 2.5, XMin: -10, YMin: 3}
			mask := randomMask(rng, g.Cols, g.Rows, density)
			mp, err := Outline(g, mask)
			if err != nil {
				t.Fatal(err)
			}
			t.Run(fmt.Sprintf("density %.1f trial %d", density, trial), func(t *testing.T) {
				checkOutline(t, g, mask, mp)
			})
		}
	}
}

func TestOutlineDeterministic(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	g := Grid{Cols: 30, Rows: 20, CellSize: 1}
	mask := randomMask(rng, g.Cols, g.Rows, 0.5)
	a, err := Outline(g, mask)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Outline(g, mask)
	if err != nil {
		t.Fatal(err)
	}
	// Two empty outlines would compare equal whatever the code does.
	if len(a) == 0 {
		t.Fatal("empty outline of a half-filled mask: the comparison would prove nothing")
	}
	if !orb.Equal(a, b) {
		t.Errorf("two calls on the same mask differ")
	}
}

func TestThresholdAndContourLayer(t *testing.T) {
	// A 1-D ramp 0.05, 0.15, …, 0.95 along x, two rows: the 10/50/90 %
	// outlines keep the 9, 5 and 1 easternmost columns (value ≥ level).
	g := Grid{Cols: 10, Rows: 2, CellSize: 5, XMin: 0, YMin: 0}
	values := make([]float64, 20)
	for j := range 2 {
		for i := range 10 {
			values[j*10+i] = 0.05 + 0.1*float64(i)
		}
	}
	values[0] = math.NaN() // NaN is outside: column 0 was outside anyway at 0.1
	l, err := ContourLayer("probability", "stimulation probability", g, values, []float64{0.1, 0.5, 0.9})
	if err != nil {
		t.Fatal(err)
	}
	for k, cols := range []int{9, 5, 1} {
		f := l.Features[k]
		wantArea := float64(cols*2) * g.CellArea()
		numtest.Abs(t, "area_m2 field", f.Values[1].(float64), wantArea, 1e-9)
		mp := f.Geometry.(orb.MultiPolygon)
		b := mp.Bound()
		numtest.Abs(t, "west edge", b.Min[0], float64(10-cols)*5, 1e-12)
		if len(mp) != 1 {
			t.Errorf("level %v: %d polygons", f.Values[0], len(mp))
		}
	}
	if _, err := ContourLayer("p", "", g, values, []float64{math.NaN()}); err == nil {
		t.Errorf("NaN level accepted")
	}
	if _, err := ContourLayer("p", "", g, values[:5], []float64{0.5}); err == nil {
		t.Errorf("short values accepted")
	}
	if _, err := ThresholdOutline(g, values, math.NaN()); err == nil {
		t.Errorf("NaN threshold accepted")
	}
}

// TestOutlineValidGEOS writes random outlines to a GeoPackage and asks
// GEOS (through GDAL's Python bindings) whether each is valid.
func TestOutlineValidGEOS(t *testing.T) {
	needGDALPython(t)
	rng := rand.New(rand.NewPCG(1, 2))
	g := Grid{Cols: 25, Rows: 20, CellSize: 10}
	l := Layer{Name: "outlines", Geometry: MultiPolygon}
	for _, density := range []float64{0.3, 0.5, 0.6, 0.7} {
		for range 5 {
			mp, err := Outline(g, randomMask(rng, g.Cols, g.Rows, density))
			if err != nil {
				t.Fatal(err)
			}
			l.Features = append(l.Features, Feature{Geometry: mp})
		}
	}
	path := tempPath(t, "o.gpkg")
	if err := WriteGeoPackage(context.Background(), path, samplePlacement, []Layer{l}, nil); err != nil {
		t.Fatal(err)
	}
	script := `import sys
from osgeo import ogr
ogr.UseExceptions()
ds = ogr.Open(sys.argv[1])
n = 0
for f in ds.GetLayer(0):
    g = f.GetGeometryRef()
    n += 1
    if not g.IsValid():
        print("invalid feature", f.GetFID())
print("checked", n)
`
	out := runTool(t, nil, debianPython, "-c", script, path)
	if strings.TrimSpace(out) != fmt.Sprintf("checked %d", len(l.Features)) {
		t.Errorf("GEOS validity check:\n%s", out)
	}
}

func BenchmarkOutline1e4(b *testing.B) { benchmarkOutline(b, 100) }
func BenchmarkOutline1e6(b *testing.B) { benchmarkOutline(b, 1000) }

// benchmarkOutline outlines a disc with random speckle on an n×n grid.
func benchmarkOutline(b *testing.B, n int) {
	rng := rand.New(rand.NewPCG(1, 2))
	g := Grid{Cols: n, Rows: n, CellSize: 1}
	mask := make([]bool, n*n)
	for j := range n {
		for i := range n {
			dx, dy := float64(i-n/2), float64(j-n/2)
			mask[j*n+i] = dx*dx+dy*dy < float64(n*n)/9 && rng.Float64() < 0.95
		}
	}
	for b.Loop() {
		if _, err := Outline(g, mask); err != nil {
			b.Fatal(err)
		}
	}
}
