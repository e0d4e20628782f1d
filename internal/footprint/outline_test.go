package footprint

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/numtest"
)

// checkOutline checks that mp is a well-formed outline of the region of
// segs at radius r and sagitta s: closed rings of at least 4 points with
// no repeated consecutive point, outer rings counter-clockwise and holes
// clockwise (RFC 7946 §3.1.6), and an area inscribed in the exact one:
//
//	0 ≤ Area − area(mp) ≤ ⅔·s·(arc length)
//
// (a circular segment of chord c and sagitta s has area < ⅔·c·s: it lies
// under the parabola through its ends and apex, whose area is ⅔·c·s —
// Archimedes, Quadrature of the Parabola, prop. 17, from memory). The arc
// length is at most the outline's perimeter times θ/(2 sin(θ/2)) for
// chords of angle θ = 2·acos(1 − s/r). Vertex merging may move the
// boundary by the merge distance tol, so both bounds get tol·perimeter of
// slack.
func checkOutline(t *testing.T, name string, segs []dfn.Segment, mp orb.MultiPolygon, r, s float64) {
	t.Helper()
	exact, err := Area(segs, r)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	per := 0.0
	for i, p := range mp {
		for j, rg := range p {
			what := "hole"
			if j == 0 {
				what = "outer ring"
			}
			if len(rg) < 4 || !rg.Closed() {
				t.Errorf("%s: polygon %d %s %d: %d points, closed %v", name, i, what, j, len(rg), rg.Closed())
				continue
			}
			for k := 1; k < len(rg); k++ {
				if rg[k] == rg[k-1] {
					t.Errorf("%s: polygon %d %s %d repeats point %d", name, i, what, j, k)
				}
				per += math.Hypot(rg[k][0]-rg[k-1][0], rg[k][1]-rg[k-1][1])
			}
			if want := map[bool]orb.Orientation{true: orb.CCW, false: orb.CW}[j == 0]; rg.Orientation() != want {
				t.Errorf("%s: polygon %d %s %d has orientation %v", name, i, what, j, rg.Orientation())
			}
		}
	}
	th := 2 * math.Acos(1-s/r)
	arc := per * th / (2 * math.Sin(th/2))
	tol := 8*math.Sqrt(epsilon*r*(extent(segs)+r)) + 64*epsilon*(extent(segs)+r)
	deficit := exact - planar.Area(mp)
	if deficit < -tol*per || deficit > 2.0/3*s*arc+tol*per {
		t.Errorf("%s: area %.12g, outline %.12g: deficit %g outside [%g, %g]", name, exact, planar.Area(mp), deficit, -tol*per, 2.0/3*s*arc+tol*per)
	}
}

// extent is the largest coordinate magnitude of the segments.
func extent(segs []dfn.Segment) float64 {
	m := 0.0
	for _, s := range segs {
		m = max(m, math.Abs(s.P0.X), math.Abs(s.P0.Y), math.Abs(s.P1.X), math.Abs(s.P1.Y))
	}
	return m
}

func TestOutline(t *testing.T) {
	const r = 4.0
	net := network(rand.New(rand.NewPCG(3, 4)), 300)
	for _, c := range []struct {
		name          string
		segs          []dfn.Segment
		polys, holes  int // counted by hand for the fixed cases; −1: not checked
		sagittaFactor float64
	}{
		{"one segment", []dfn.Segment{seg(0, 0, 10, 0)}, 1, 0, 1e-2},
		{"a point", []dfn.Segment{seg(3, 4, 3, 4)}, 1, 0, 1e-3},
		{"cross", []dfn.Segment{seg(-10, 0, 10, 0), seg(0, -10, 0, 10)}, 1, 0, 1e-3},
		// A square of side 20 m > 2r: the union is a frame with one hole.
		{"square frame", []dfn.Segment{seg(0, 0, 20, 0), seg(20, 0, 20, 20), seg(20, 20, 0, 20), seg(0, 20, 0, 0)}, 1, 1, 1e-3},
		// The same square drawn twice and shifted far away: two polygons.
		{"two frames", []dfn.Segment{seg(0, 0, 20, 0), seg(20, 0, 20, 20), seg(20, 20, 0, 20), seg(0, 20, 0, 0),
			seg(100, 0, 120, 0), seg(120, 0, 120, 20), seg(120, 20, 100, 20), seg(100, 20, 100, 0)}, 2, 2, 1e-3},
		{"two discs touching at a point", []dfn.Segment{seg(0, 0, 0, 0), seg(2*r, 0, 2*r, 0)}, -1, 0, 1e-3},
		{"network, coarse chords", net, -1, -1, 1e-2},
		{"network, fine chords", net, -1, -1, 1e-6},
	} {
		s := c.sagittaFactor * r
		mp, err := Outline(c.segs, r, OutlineOptions{Sagitta: s})
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(mp) == 0 {
			t.Errorf("%s: no polygon", c.name)
			continue
		}
		holes := 0
		for _, p := range mp {
			holes += len(p) - 1
		}
		if (c.polys >= 0 && len(mp) != c.polys) || (c.holes >= 0 && holes != c.holes) {
			t.Errorf("%s: %d polygons with %d holes, want %d with %d", c.name, len(mp), holes, c.polys, c.holes)
		}
		checkOutline(t, c.name, c.segs, mp, r, s)
	}
}

// No two edges of the outline cross, except neighbours at their shared
// vertex (OGC simple features: rings are simple and do not cross).
func TestOutlineSimple(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(5, 6)), 80)
	mp, err := Outline(segs, 3, OutlineOptions{Sagitta: 0.03})
	if err != nil {
		t.Fatal(err)
	}
	type edge struct{ a, b r2.Vec }
	var es []edge
	for _, p := range mp {
		for _, rg := range p {
			for k := 1; k < len(rg); k++ {
				es = append(es, edge{r2.Vec{X: rg[k-1][0], Y: rg[k-1][1]}, r2.Vec{X: rg[k][0], Y: rg[k][1]}})
			}
		}
	}
	if len(es) < 100 {
		t.Fatalf("only %d outline edges: the test network is too small", len(es))
	}
	for i := range es {
		for j := i + 1; j < len(es); j++ {
			a, b := es[i], es[j]
			if a.a == b.a || a.a == b.b || a.b == b.a || a.b == b.b {
				continue // neighbours (or rings touching at a vertex)
			}
			d1, d2 := r2.Cross(r2.Sub(a.b, a.a), r2.Sub(b.a, a.a)), r2.Cross(r2.Sub(a.b, a.a), r2.Sub(b.b, a.a))
			d3, d4 := r2.Cross(r2.Sub(b.b, b.a), r2.Sub(a.a, b.a)), r2.Cross(r2.Sub(b.b, b.a), r2.Sub(a.b, b.a))
			if d1*d2 < 0 && d3*d4 < 0 {
				t.Fatalf("outline edges %v and %v cross", a, b)
			}
		}
	}
}

// Segments of slopes from 1e-12 to 1e-6 (and 0, which the sweep takes
// exactly) ending beside the end of a diagonal one: the outline must be
// whole and inscribed. Slopes below about 4√(ε·L/r) take the frame turn
// (sweepTurn); without it the slope 1e-12 case comes out empty (the fuzz
// seed 325c9b0001952ff4, a pile of segments ending in one of slope 6e-10
// at 10⁵ m, did too). The inputs without a near-flat segment keep the map
// frame.
func TestOutlineNearlyHorizontal(t *testing.T) {
	for _, c := range []struct {
		slope, offset float64
		turned        bool
	}{
		{0, 1e5, false},
		{1e-12, 0, true},
		{6e-10, 1e5, true},
		{1e-8, 1e5, true},
		{1e-6, 1e3, false},
	} {
		segs := []dfn.Segment{
			seg(c.offset-7, c.offset-7, c.offset+48, c.offset+48),
			seg(c.offset-30, c.offset+48, c.offset+48-78*c.slope, c.offset+48-78*c.slope),
		}
		name := fmt.Sprintf("slope %g at %g m", c.slope, c.offset)
		mp, err := Outline(segs, 0.25, OutlineOptions{Sagitta: 0.0025})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if len(mp) != 1 {
			t.Errorf("%s: %d polygons, want 1", name, len(mp))
		}
		checkOutline(t, name, segs, mp, 0.25, 0.0025)
		reg, err := prepare(segs, 0.25)
		if err != nil {
			t.Fatal(err)
		}
		if turned := reg.turn != (r2.Vec{X: 1}); turned != c.turned {
			t.Errorf("%s: frame turned %v, want %v", name, turned, c.turned)
		}
	}
}

func TestOutlineErrors(t *testing.T) {
	segs := []dfn.Segment{seg(0, 0, 1, 0)}
	for _, c := range []struct {
		name   string
		r, sag float64
	}{
		{"negative sagitta", 1, -0.1},
		{"sagitta above the radius", 1, 1.5},
		{"NaN sagitta", 1, math.NaN()},
		{"bad radius", -1, 0},
	} {
		if _, err := Outline(segs, c.r, OutlineOptions{Sagitta: c.sag}); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}

// Points exactly on their neighbours' line go, spikes included, and the
// ring's corners stay (plane geometry).
func TestDropCollinear(t *testing.T) {
	v := func(x, y float64) r2.Vec { return r2.Vec{X: x, Y: y} }
	for _, c := range []struct {
		name     string
		in, want []r2.Vec
	}{
		{"square", []r2.Vec{v(0, 0), v(1, 0), v(1, 1), v(0, 1)}, []r2.Vec{v(0, 0), v(1, 0), v(1, 1), v(0, 1)}},
		{"straight run", []r2.Vec{v(0, 0), v(0.5, 0), v(1, 0), v(1, 1), v(0, 1)}, []r2.Vec{v(0, 0), v(1, 0), v(1, 1), v(0, 1)}},
		{"repeated point", []r2.Vec{v(0, 0), v(1, 0), v(1, 0), v(1, 1), v(0, 1)}, []r2.Vec{v(0, 0), v(1, 0), v(1, 1), v(0, 1)}},
		{"spike on a side", []r2.Vec{v(0, 0), v(1, 0), v(1, 0.5), v(1, 0.7), v(1, 0.6), v(1, 1), v(0, 1)}, []r2.Vec{v(0, 0), v(1, 0), v(1, 1), v(0, 1)}},
		{"flat point at the start", []r2.Vec{v(0.5, 0), v(1, 0), v(1, 1), v(0, 1), v(0, 0)}, []r2.Vec{v(1, 0), v(1, 1), v(0, 1), v(0, 0)}},
		{"flat point at the end", []r2.Vec{v(1, 0), v(1, 1), v(0, 1), v(0, 0), v(0.5, 0)}, []r2.Vec{v(1, 0), v(1, 1), v(0, 1), v(0, 0)}},
	} {
		got := dropCollinear(append([]r2.Vec(nil), c.in...))
		if len(got) != len(c.want) {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("%s: %v, want %v", c.name, got, c.want)
				break
			}
		}
	}
}

// The outline does not depend on the number of workers (strips are joined
// in order): compared point by point, exactly.
func TestOutlineDeterministic(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(17, 18)), 300)
	many, err := Outline(segs, 4, OutlineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	one, err := Outline(segs, 4, OutlineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(many) < 2 || !many.Equal(one) {
		t.Errorf("%d polygons with GOMAXPROCS workers, %d with one; equal: %v", len(many), len(one), many.Equal(one))
	}
}

// When every frame tried has a nearly horizontal segment (20 000 random
// segments at a radius of 0.1 mm on a 10 km map, and one of slope 1e-11)
// the map frame stays and Area answers as before the frame turn existed:
// within rounding of the area with that segment made exactly flat.
func TestAreaWithoutFreeFrame(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	segs := make([]dfn.Segment, 0, 20001)
	for range 20000 {
		x, y, a := 1e4*rng.Float64(), 1e4*rng.Float64(), math.Pi*rng.Float64()
		segs = append(segs, seg(x, y, x+20*math.Cos(a), y+20*math.Sin(a)))
	}
	const r = 1e-4
	flat := append(slices.Clone(segs), seg(5000, 5000, 5020, 5000))
	segs = append(segs, seg(5000, 5000, 5020, 5000+20e-11))
	reg, err := prepare(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	if reg.turn != (r2.Vec{X: 1}) {
		t.Fatalf("frame turned by %v: the test needs an input no frame frees", reg.turn)
	}
	got, err := Area(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	want, err := Area(flat, r)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "area with a segment of slope 1e-11 against it flat", got, want, 1e-9)
}
