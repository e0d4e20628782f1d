package footprint

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/numtest"
)

// Area is a property of the figure: a rigid motion of every segment
// leaves it unchanged (an isometry preserves area; common practice, no
// source). Rotation moves every break height and rounds every coordinate
// afresh, so this checks the sweep's rounding as a whole: 1e-9 relative is
// the package's stated accuracy.
func TestAreaRigidMotion(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(9, 10)), 400)
	const r = 5.0
	want, err := Area(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		angle float64 // rad, about the origin
		shift r2.Vec  // m
	}{
		{"translation", 0, r2.Vec{X: 1234.5, Y: -987.25}},
		{"rotation 37 degrees", 37 * math.Pi / 180, r2.Vec{}},
		{"rotation 90 degrees", math.Pi / 2, r2.Vec{}},
		{"rotation and map coordinates", 1.1, r2.Vec{X: 512_345.6, Y: 6_432_109.8}},
	} {
		s, co := math.Sincos(c.angle)
		move := func(p r2.Vec) r2.Vec {
			return r2.Add(r2.Vec{X: co*p.X - s*p.Y, Y: s*p.X + co*p.Y}, c.shift)
		}
		moved := make([]dfn.Segment, len(segs))
		for i, g := range segs {
			moved[i] = dfn.Segment{P0: move(g.P0), P1: move(g.P1)}
		}
		got, err := Area(moved, r)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		numtest.Rel(t, c.name, got, want, 1e-9)
	}
}

// Cutting segments into collinear pieces does not change the union (each
// piece's stadium lies in the whole one's, and together they cover it;
// plane geometry). The pieces' ends are rounded onto the segment, off it
// by ~1e-16 of the coordinates, hence 1e-12 relative. In order, the pieces
// are merged back before the sweep; shuffled, the sweep sees them all.
func TestAreaSplitting(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	segs := network(rng, 150)
	const r = 3.0
	want, err := Area(segs, r)
	if err != nil {
		t.Fatal(err)
	}
	var pieces []dfn.Segment
	for _, g := range segs {
		k := 1 + rng.IntN(6)
		prev := g.P0
		for j := 1; j <= k; j++ {
			next := g.P1
			if j < k {
				next = r2.Add(g.P0, r2.Scale(float64(j)/float64(k)+0.05*(rng.Float64()-0.5)/float64(k), r2.Sub(g.P1, g.P0)))
			}
			pieces = append(pieces, dfn.Segment{P0: prev, P1: next})
			prev = next
		}
	}
	if len(pieces) < 2*len(segs) {
		t.Fatalf("only %d pieces of %d segments: nothing was split", len(pieces), len(segs))
	}
	if n := len(mergeCollinear(pieces, 64*epsilon*extent(pieces))); n != len(segs) {
		t.Errorf("%d runs merged from the pieces in order, want %d", n, len(segs))
	}
	got, err := Area(pieces, r)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "pieces in order", got, want, 1e-12)
	rng.Shuffle(len(pieces), func(i, j int) { pieces[i], pieces[j] = pieces[j], pieces[i] })
	if n := len(mergeCollinear(pieces, 64*epsilon*extent(pieces))); n < len(pieces)*9/10 {
		t.Fatalf("the shuffled pieces still merge into %d runs: the test does not exercise the sweep", n)
	}
	got, err = Area(pieces, r)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "pieces shuffled", got, want, 1e-12)
}

// The region grows strictly with r (it is the r-neighbourhood of a fixed
// set, and its boundary moves outward; common practice, no source).
func TestAreaMonotone(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(13, 14)), 200)
	prev := 0.0
	radii := []float64{0.25, 0.5, 1, 2, 2.01, 4, 8, 16, 64}
	for _, r := range radii {
		a, err := Area(segs, r)
		if err != nil {
			t.Fatal(err)
		}
		if a <= prev {
			t.Errorf("area %g at r = %g m is not above %g at the smaller radius", a, r, prev)
		}
		prev = a
	}
}

// The area does not depend on the number of workers: strips are summed in
// order (compared exactly, as the same terms in the same order must give
// the same bits).
func TestAreaDeterministic(t *testing.T) {
	segs := network(rand.New(rand.NewPCG(15, 16)), 500)
	reg, err := prepare(segs, 4)
	if err != nil {
		t.Fatal(err)
	}
	if len(reg.sw.lines) < 4 {
		t.Fatalf("%d strips: too few to share between workers", len(reg.sw.lines)-1)
	}
	a := reg.area()
	var ws workspace
	var serial neumaier
	for s := range len(reg.sw.lines) - 1 {
		serial.add(reg.sw.stripArea(s, &ws))
	}
	if a != serial.value() {
		t.Errorf("parallel area %.17g, serial %.17g", a, serial.value())
	}
}
