package dfn

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// bruteForce tests every pair.
func bruteForce(segs []Segment) []Intersection {
	var out []Intersection
	for i := range segs {
		for j := i + 1; j < len(segs); j++ {
			if x, ok := IntersectSegments(segs[i], segs[j]); ok {
				out = append(out, Intersection{I: i, J: j, Point: x.Point, SI: x.S, SJ: x.T})
			}
		}
	}
	return out
}

// randomSegments mixes random sticks of many lengths with the degenerate
// cases the grid must not lose: segments on a lattice (collinear overlaps,
// shared ends, T-junctions, axis-parallel segments lying on cell
// boundaries), points, and near-touching pairs.
func randomSegments(r *rand.Rand, n int, side float64) []Segment {
	segs := make([]Segment, 0, n)
	for len(segs) < n {
		switch r.IntN(5) {
		case 0, 1: // random stick, length spread over two decades
			c := r2.Vec{X: side * r.Float64(), Y: side * r.Float64()}
			l := math.Exp(math.Log(side/200) + math.Log(100)*r.Float64())
			s, co := math.Sincos(math.Pi * r.Float64())
			d := r2.Vec{X: l / 2 * co, Y: l / 2 * s}
			segs = append(segs, Segment{P0: r2.Sub(c, d), P1: r2.Add(c, d)})
		case 2: // lattice segment (integers)
			q := func() float64 { return math.Floor(side / 10 * r.Float64()) }
			x0, y0 := q(), q()
			switch r.IntN(3) {
			case 0:
				segs = append(segs, seg(x0, y0, x0+q()/4, y0))
			case 1:
				segs = append(segs, seg(x0, y0, x0, y0+q()/4))
			default:
				k := q() / 4
				segs = append(segs, seg(x0, y0, x0+k, y0+k))
			}
		case 3: // a point
			x, y := math.Floor(side/10*r.Float64()), math.Floor(side/10*r.Float64())
			segs = append(segs, seg(x, y, x, y))
		default: // ends within GeomTol of an existing segment
			if len(segs) == 0 {
				continue
			}
			o := segs[r.IntN(len(segs))]
			p := r2.Add(o.P0, r2.Scale(r.Float64(), r2.Sub(o.P1, o.P0)))
			p.Y += GeomTol * (r.Float64() - 0.5)
			segs = append(segs, Segment{P0: p, P1: r2.Add(p, r2.Vec{X: side / 50 * (r.Float64() - 0.5), Y: side / 50 * r.Float64()})})
		}
	}
	return segs
}

// The grid finds exactly the pairs brute force finds, with identical
// points and parameters.
func TestIndexMatchesBruteForce(t *testing.T) {
	for trial, n := range []int{0, 1, 2, 50, 1500, 3000} {
		r := rand.New(rand.NewPCG(1, uint64(2+trial)))
		segs := randomSegments(r, n, 500)
		got := NewIndex(segs).Intersections()
		want := bruteForce(segs)
		if len(got) != len(want) {
			t.Fatalf("n=%d: index found %d intersections, brute force %d", n, len(got), len(want))
		}
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("n=%d: intersection %d: index %+v, brute force %+v", n, i, got[i], want[i])
			}
		}
		if n >= 1500 && len(want) < n/2 {
			t.Errorf("n=%d: only %d intersections: the test network is too sparse to mean much", n, len(want))
		}
	}
}

// Mean intersections per stick for isotropic sticks of length L at areal
// density n: I = 2nL²/π (Santaló 1976; docs/references.md §4.1); n = 2/L² gives
// 4/π. Only sticks whose centre is more than L from the square's edges are
// counted. Each crossing is counted on two sticks, so the sum of counts
// has variance ≈ 4·(N·I/2) and the standard error of the mean is
// √(2I/N); tolerance 5 SE.
func TestSantaloSticks(t *testing.T) {
	const l, side = 1.0, 150.0
	const density = 2 / (l * l)
	want := 2 * density * l * l / math.Pi
	numtest.Rel(t, "2nL²/π at n = 2/L²", want, 4/math.Pi, 1e-15) // docs/references.md §4.1 example
	r := rand.New(rand.NewPCG(1, 2))
	n := int(density * side * side)
	segs := make([]Segment, n)
	centres := make([]r2.Vec, n)
	for i := range segs {
		c := r2.Vec{X: side * r.Float64(), Y: side * r.Float64()}
		s, co := math.Sincos(math.Pi * r.Float64())
		d := r2.Vec{X: l / 2 * co, Y: l / 2 * s}
		segs[i], centres[i] = Segment{P0: r2.Sub(c, d), P1: r2.Add(c, d)}, c
	}
	count := make([]int, n)
	for _, x := range NewIndex(segs).Intersections() {
		count[x.I]++
		count[x.J]++
	}
	var sum, inner int
	for i, c := range centres {
		if c.X > l && c.X < side-l && c.Y > l && c.Y < side-l {
			sum += count[i]
			inner++
		}
	}
	mean := float64(sum) / float64(inner)
	numtest.Abs(t, "intersections per stick", mean, want, 5*math.Sqrt(2*want/float64(inner)))
}

// Map-view crossings of a polyline: distances along the path, a trace
// crossed exactly at a path vertex reported once, a trace crossed twice
// by a zig-zag reported twice.
func TestCrossPolyline(t *testing.T) {
	segs := []Segment{
		seg(5, -1, 5, 1),   // crossed by the first leg at distance 5
		seg(10, -1, 10, 1), // through the vertex (10, 0)
		seg(10.5, 0.5, 18, 0.5),
		seg(50, 50, 60, 60), // far away
	}
	path := []r2.Vec{{X: 0, Y: 0}, {X: 10, Y: 0}, {X: 14, Y: 3}, {X: 18, Y: 0}}
	got := NewIndex(segs).CrossPolyline(path)
	// Leg 2 (10,0)→(14,3) crosses y = 0.5 at x = 10 + 4/6; leg 3
	// (14,3)→(18,0) at x = 18 − 4/6. Each leg is 5 m long.
	want := []PathCrossing{
		{Segment: 0, Distance: 5, Point: r2.Vec{X: 5}},
		{Segment: 1, Distance: 10, Point: r2.Vec{X: 10}},
		{Segment: 2, Distance: 10 + 5.0/6, Point: r2.Vec{X: 10 + 4.0/6, Y: 0.5}},
		{Segment: 2, Distance: 15 + 25.0/6, Point: r2.Vec{X: 18 - 4.0/6, Y: 0.5}},
	}
	if len(got) != len(want) {
		t.Fatalf("got %d crossings %+v, want %d", len(got), got, len(want))
	}
	for i := range want {
		if got[i].Segment != want[i].Segment {
			t.Errorf("crossing %d: segment %d, want %d", i, got[i].Segment, want[i].Segment)
		}
		numtest.Abs(t, "distance", got[i].Distance, want[i].Distance, 1e-12)
		numtest.Abs(t, "x", got[i].Point.X, want[i].Point.X, 1e-12)
		numtest.Abs(t, "y", got[i].Point.Y, want[i].Point.Y, 1e-12)
	}
}

// Clusters by hand: a chain of three traces, a crossing pair and an
// isolated trace.
func TestAssignClusters(t *testing.T) {
	segs := []Segment{
		seg(0, 0, 10, 0),   // 0 ─┐ chain 0-1-2
		seg(20, -1, 20, 1), // 1: pair with 3
		seg(5, -1, 5, 10),  // 2
		seg(19, 0, 21, 0),  // 3
		seg(0, 9, 6, 9),    // 4 crosses 2
		seg(40, 40, 41, 41),
	}
	traces := make([]Trace, len(segs))
	for i, s := range segs {
		traces[i] = Trace{Segment: s, Length: r2.Norm(r2.Sub(s.P1, s.P0))}
	}
	cl := AssignClusters(traces, NewIndex(segs).Intersections())
	wantID := []int{0, 1, 0, 1, 0, 2}
	for i, w := range wantID {
		if traces[i].Cluster != w {
			t.Errorf("trace %d: cluster %d, want %d", i, traces[i].Cluster, w)
		}
	}
	if len(cl) != 3 || cl[0].Traces != 3 || cl[1].Traces != 2 || cl[2].Traces != 1 {
		t.Fatalf("clusters %+v", cl)
	}
	numtest.Abs(t, "cluster 0 length", cl[0].Length, 10+11+6, 1e-12)
}
