package dfn

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

func testFracture(shape Shape, dipDeg, ddDeg, size, height float64, c r3.Vec) Fracture {
	f := Fracture{Shape: shape, Dip: rad(dipDeg), DipDirection: rad(ddDeg), Size: size, Height: height, Centre: c}
	f.Normal = orient.Normal(f.Dip, f.DipDirection)
	if shape == Disc {
		f.Height = 2 * size
		f.Area = math.Pi * size * size
	} else {
		f.Area = size * height
	}
	return f
}

// Traces and conducting heights worked by hand from the geometry in the
// package documentation (plane geometry; common practice, no source).
func TestTraceOf(t *testing.T) {
	r := Region{XMin: -100, XMax: 100, YMin: -100, YMax: 100, MidZ: -2000, Thickness: 20}
	s30 := math.Sin(rad(30))
	for _, c := range []struct {
		name           string
		f              Fracture
		ok             bool
		p0, p1         r2.Vec
		length, height float64
	}{
		{
			// Dips east, strikes north (dip direction 90 → strike 0).
			"vertical disc centred on the mid-plane",
			testFracture(Disc, 90, 90, 15, 0, r3.Vec{X: 3, Y: 4, Z: -2000}),
			true, r2.Vec{X: 3, Y: -11}, r2.Vec{X: 3, Y: 19}, 30, 20,
		},
		{
			"vertical disc, layer taller than the disc",
			testFracture(Disc, 90, 90, 6, 0, r3.Vec{Z: -2000}),
			true, r2.Vec{Y: -6}, r2.Vec{Y: 6}, 12, 12,
		},
		{
			// v0 = (−1995 + 2000)/sin 30 = 10; half chord √(15² − 10²);
			// layer interval in v: 10 ± 10/sin 30 = [−10, 30], clipped to
			// [−15, 15] → 25. The trace lies 10·cos 30 east of the centre.
			"disc dipping 30° east, centre 5 m above",
			testFracture(Disc, 30, 90, 15, 0, r3.Vec{Z: -1995}),
			true,
			r2.Vec{X: 10 * math.Cos(rad(30)), Y: -math.Sqrt(125)},
			r2.Vec{X: 10 * math.Cos(rad(30)), Y: math.Sqrt(125)},
			2 * math.Sqrt(125), 25,
		},
		{
			// Dip direction 180 (south) → strike 90 (east). v0 = −2/sin 30
			// = −4; height interval −4 ± 20 clipped to [−8, 8] → 16.
			"rectangle dipping 30° south, centre 2 m below",
			testFracture(Rectangle, 30, 180, 40, 16, r3.Vec{X: 1, Y: 1, Z: -2002}),
			true,
			r2.Vec{X: -19, Y: 1 + 4*math.Cos(rad(30))},
			r2.Vec{X: 21, Y: 1 + 4*math.Cos(rad(30))},
			40, 16,
		},
		{
			"steep rectangle: height is thickness / sin(dip)",
			testFracture(Rectangle, 30, 0, 10, 100, r3.Vec{Z: -2000}),
			// Dip direction 0 (north) → strike 270 (west): P0 is east.
			true, r2.Vec{X: 5}, r2.Vec{X: -5}, 10, 20 / s30,
		},
		{"disc that misses the mid-plane", testFracture(Disc, 90, 0, 10, 0, r3.Vec{Z: -2011}), false, r2.Vec{}, r2.Vec{}, 0, 0},
		{"rectangle that misses the mid-plane", testFracture(Rectangle, 60, 0, 10, 10, r3.Vec{Z: -1990}), false, r2.Vec{}, r2.Vec{}, 0, 0},
		{"horizontal fracture", testFracture(Disc, 0, 0, 50, 0, r3.Vec{Z: -2000}), false, r2.Vec{}, r2.Vec{}, 0, 0},
	} {
		tr, ok := TraceOf(&c.f, r)
		if ok != c.ok {
			t.Errorf("%s: ok = %v, want %v", c.name, ok, c.ok)
			continue
		}
		if !ok {
			continue
		}
		const tol = 1e-9
		numtest.Abs(t, c.name+": x0", tr.P0.X, c.p0.X, tol)
		numtest.Abs(t, c.name+": y0", tr.P0.Y, c.p0.Y, tol)
		numtest.Abs(t, c.name+": x1", tr.P1.X, c.p1.X, tol)
		numtest.Abs(t, c.name+": y1", tr.P1.Y, c.p1.Y, tol)
		numtest.Abs(t, c.name+": length", tr.Length, c.length, tol)
		numtest.Abs(t, c.name+": height", tr.Height, c.height, tol)
	}
}

// The ends of every trace lie on the fracture's plane, on the mid-plane
// and on the fracture's edge (disc) or its strike-parallel sides' ends
// (rectangle).
func TestTraceEndsOnFracture(t *testing.T) {
	r := Region{XMin: -100, XMax: 100, YMin: -100, YMax: 100, MidZ: -2000, Thickness: 20}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 2000 {
		shape := Disc
		if rng.IntN(2) == 1 {
			shape = Rectangle
		}
		f := testFracture(shape, 1+89*rng.Float64(), 360*rng.Float64(), 5+20*rng.Float64(), 5+20*rng.Float64(),
			r3.Vec{X: 10 * rng.Float64(), Y: 10 * rng.Float64(), Z: -2000 + 30*(rng.Float64()-0.5)})
		tr, ok := TraceOf(&f, r)
		if !ok {
			continue
		}
		for _, p := range []r2.Vec{tr.P0, tr.P1} {
			q := r3.Sub(r3.Vec{X: p.X, Y: p.Y, Z: r.MidZ}, f.Centre)
			numtest.Abs(t, "distance from plane", r3.Dot(q, f.Normal), 0, 1e-9)
			if shape == Disc {
				numtest.Abs(t, "distance from centre", r3.Norm(q), f.Size, 1e-9)
			} else {
				numtest.Abs(t, "|u|", math.Abs(r3.Dot(q, f.Strike())), f.Size/2, 1e-9)
			}
		}
		if tr.Height <= 0 || tr.Height > r.Thickness/math.Sin(f.Dip)+1e-9 || tr.Height > f.Height+1e-9 {
			t.Fatalf("height %g of %+v", tr.Height, f)
		}
	}
}

// Exact clipped areas by hand: a circular segment between two chords at
// ±h from the centre has area 2[h√(r² − h²) + r² asin(h/r)] (plane
// geometry, common practice).
func TestAreaInByHand(t *testing.T) {
	big := [2][3]float64{{-1e3, -1e3, -3e3}, {1e3, 1e3, -1e3}}
	d := testFracture(Disc, 90, 30, 10, 0, r3.Vec{Z: -2000})
	numtest.Rel(t, "disc inside", AreaIn(&d, big[0], big[1]), 100*math.Pi, 1e-12)
	// Horizontal slab through the centre of a vertical disc.
	h := 4.0
	band := 2 * (h*math.Sqrt(100-h*h) + 100*math.Asin(h/10))
	numtest.Rel(t, "disc in a slab", AreaIn(&d, [3]float64{-1e3, -1e3, -2000 - h}, [3]float64{1e3, 1e3, -2000 + h}), band, 1e-12)
	// Box face through the centre: half.
	numtest.Rel(t, "half disc", AreaIn(&d, [3]float64{-1e3, -1e3, -2000}, big[1]), 50*math.Pi, 1e-12)
	numtest.Abs(t, "disc outside", AreaIn(&d, [3]float64{-1e3, -1e3, -1990}, big[1]), 0, 0)
	// Rectangle dipping 60° (height 20 down dip), box cutting z in
	// [−2000 − 5, −2000 + 5]: 10/sin 60 of its height remains.
	q := testFracture(Rectangle, 60, 45, 30, 20, r3.Vec{Z: -2000})
	numtest.Rel(t, "rectangle in a slab", AreaIn(&q, [3]float64{-1e3, -1e3, -2005}, [3]float64{1e3, 1e3, -1995}),
		30*10/math.Sin(rad(60)), 1e-12)
	// A horizontal rectangle above or inside a slab.
	flat := testFracture(Rectangle, 0, 0, 10, 10, r3.Vec{Z: -2000})
	numtest.Rel(t, "flat inside", AreaIn(&flat, big[0], big[1]), 100, 1e-12)
	numtest.Abs(t, "flat outside", AreaIn(&flat, [3]float64{-1e3, -1e3, -1990}, big[1]), 0, 0)
}

// AreaIn against Monte Carlo on random fractures and boxes: the fraction
// of uniform points of the fracture inside the box (binomial, 5 SE).
func TestAreaInMonteCarlo(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	lo := [3]float64{-10, -8, -2006}
	hi := [3]float64{10, 8, -1994}
	for trial := range 30 {
		shape := Disc
		if trial%2 == 1 {
			shape = Rectangle
		}
		f := testFracture(shape, 90*rng.Float64(), 360*rng.Float64(), 4+12*rng.Float64(), 4+12*rng.Float64(),
			r3.Vec{X: 16 * (rng.Float64() - 0.5), Y: 16 * (rng.Float64() - 0.5), Z: -2000 + 12*(rng.Float64()-0.5)})
		s, dd := f.Strike(), f.DownDip()
		const n = 20_000
		inside := 0
		for range n {
			var u, v float64
			if shape == Disc {
				rr := f.Size * math.Sqrt(rng.Float64())
				sp, cp := math.Sincos(2 * math.Pi * rng.Float64())
				u, v = rr*cp, rr*sp
			} else {
				u, v = f.Size*(rng.Float64()-0.5), f.Height*(rng.Float64()-0.5)
			}
			p := r3.Add(f.Centre, r3.Add(r3.Scale(u, s), r3.Scale(v, dd)))
			if p.X >= lo[0] && p.X <= hi[0] && p.Y >= lo[1] && p.Y <= hi[1] && p.Z >= lo[2] && p.Z <= hi[2] {
				inside++
			}
		}
		frac := float64(inside) / n
		want := frac * f.Area
		se := f.Area * math.Sqrt(math.Max(frac*(1-frac), 1/float64(n))/n)
		numtest.Abs(t, "area in box", AreaIn(&f, lo, hi), want, 5*se)
	}
}

func TestClipLength(t *testing.T) {
	for _, c := range []struct {
		name string
		s    Segment
		want float64
	}{
		{"inside", seg(1, 1, 4, 5), 5},
		{"crossing two sides", seg(-5, 5, 15, 5), 10},
		{"diagonal through corners", seg(-1, -1, 11, 11), 10 * math.Sqrt2},
		{"outside", seg(11, 0, 20, 10), 0},
		{"on the boundary", seg(0, 0, 0, 10), 10},
		{"point inside", seg(3, 3, 3, 3), 0},
	} {
		numtest.Abs(t, c.name, ClipLength(c.s, 0, 10, 0, 10), c.want, 1e-12)
	}
}
