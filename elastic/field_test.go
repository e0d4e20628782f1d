package elastic

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// TestFieldMatchesDirect compares the hierarchical field evaluator with
// direct summation on a grid of points over a random DFN-like network:
// relative error (over all points and components) within the
// tolerance, and the blocks compressed (so that the test can fail).
func TestFieldMatchesDirect(t *testing.T) {
	el := dfnElements(networkSettings{elements: 2000, seed: 11, varied: true})
	var pts []r2.Vec
	for i := range 25 {
		for j := range 25 {
			pts = append(pts, r2.Vec{X: 20 * float64(i), Y: 20 * float64(j)})
		}
	}
	for _, tol := range []float64{1e-6, 1e-3} {
		f, err := NewField(el, rock, pts, Settings{Tolerance: tol})
		if err != nil {
			t.Fatal(err)
		}
		if f.Stats().LowRankBlocks == 0 {
			t.Fatal("no compressed block")
		}
		r := rand.New(rand.NewPCG(11, 12))
		s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
		got := make([]Stress, len(pts))
		f.StressTo(got, s, w)
		if e := errorAgainstDirect(f, pts, got, s, w); !(e <= tol) {
			t.Errorf("tolerance %g: relative error %.3g", tol, e)
		}
	}
}

// errorAgainstDirect is the relative error, over all points and
// components, of the stresses got at pts against direct summation.
func errorAgainstDirect(f *Field, pts []r2.Vec, got []Stress, s, w []float64) float64 {
	num, den := 0.0, 0.0
	for p, q := range pts {
		want := f.StressAt(q, s, w)
		for _, d := range [][2]float64{{got[p].XX, want.XX}, {got[p].YY, want.YY}, {got[p].XY, want.XY}} {
			num += (d[0] - d[1]) * (d[0] - d[1])
			den += d[1] * d[1]
		}
	}
	return math.Sqrt(num / den)
}

// A point on an element's tip (here, bent elements' ends, where rounding
// leaves it a hair off the element's line) gets NaN from that element: the
// field is singular there. Without that the huge values rounding gives
// there entered the norm that shares out the error, every far block was
// dropped, and the whole map was wrong (the stress-change map of a run
// whose paths bend through grid points). The other points keep the
// tolerance.
func TestFieldPointOnTip(t *testing.T) {
	el := dfnElements(networkSettings{elements: 2000, seed: 11, varied: true})
	// Two elements meeting at a 1° bend at (3.3, 7.1), a point exactly
	// there.
	bend := r2.Vec{X: 3.3, Y: 7.1}
	el = append(el, Element{P0: r2.Sub(bend, r2.Vec{X: 5}), P1: bend, Height: 10},
		Element{P0: bend, P1: r2.Add(bend, r2.Vec{X: 5 * math.Cos(math.Pi/180), Y: 5 * math.Sin(math.Pi/180)}), Height: 10})
	pts := []r2.Vec{bend}
	for i := range 20 {
		for j := range 20 {
			pts = append(pts, r2.Vec{X: 25*float64(i) + 1, Y: 25*float64(j) + 2})
		}
	}
	f, err := NewField(el, rock, pts, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if f.Stats().LowRankBlocks == 0 {
		t.Fatal("no compressed block")
	}
	r := rand.New(rand.NewPCG(3, 4))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	got := make([]Stress, len(pts))
	f.StressTo(got, s, w)
	if !math.IsNaN(got[0].XX) {
		t.Errorf("on the tip: %v, want NaN", got[0])
	}
	if e := errorAgainstDirect(f, pts[1:], got[1:], s, w); !(e <= 1e-6) {
		t.Errorf("relative error %.3g off the tip", e)
	}
}

// TestOnPlane checks the resolution of a stress change on vertical
// planes: with compression σ1 east–west and σ3 north–south, a plane
// striking N045°E carries the normal stress (σ1 + σ3)/2 and the shear
// (σ1 − σ3)/2, which drives right-lateral slip, and one striking N135°E
// the same shear driving left-lateral slip (Mohr's circle, Jaeger, Cook
// & Zimmerman 2007, §2.6; the senses of conjugate strike-slip faults are
// common practice, no source). Reversing the tangent changes nothing.
func TestOnPlane(t *testing.T) {
	const s1, s3 = 30e6, 10e6
	s := Stress{XX: s1, YY: s3}
	c := math.Sqrt(0.5)
	const tol = 1e-7 // Pa: round-off, 1e-14 of stresses of 1e7 Pa
	for _, tc := range []struct {
		name          string
		t             r2.Vec
		shear, normal float64
	}{
		{"N045E", r2.Vec{X: c, Y: c}, (s1 - s3) / 2, (s1 + s3) / 2},
		{"N135E", r2.Vec{X: c, Y: -c}, -(s1 - s3) / 2, (s1 + s3) / 2},
		{"N000E", r2.Vec{Y: 1}, 0, s1},
		{"N090E", r2.Vec{X: 1}, 0, s3},
	} {
		for _, dir := range []r2.Vec{tc.t, r2.Scale(-1, tc.t)} {
			sh, n := s.OnPlane(dir)
			numtest.Abs(t, tc.name+" shear", sh, tc.shear, tol)
			numtest.Abs(t, tc.name+" normal", n, tc.normal, tol)
		}
	}
	// King, Stein & Lin (1994): ΔCFS = Δτ − μ Δσn, compression-positive.
	numtest.Abs(t, "ΔCFS right-lateral", s.Coulomb(r2.Vec{X: c, Y: c}, 0.4, RightLateral), (s1-s3)/2-0.4*(s1+s3)/2, tol)
	numtest.Abs(t, "ΔCFS left-lateral", s.Coulomb(r2.Vec{X: c, Y: c}, 0.4, LeftLateral), -(s1-s3)/2-0.4*(s1+s3)/2, tol)
}

// TestFieldOnElementsMatchesOperator checks that Field resolved on an
// element agrees with the operator where the two use the same model: a
// stack of equal parallel elements of one height (see TestFieldMatchesOperator
// for one pair), here through the hierarchical evaluator.
func TestFieldOnElementsMatchesOperator(t *testing.T) {
	var el []Element
	for k := range 40 {
		el = append(el, straightCrack(10, 20, 7*float64(k), 15)...)
	}
	var pts []r2.Vec
	for _, e := range el {
		pts = append(pts, e.Centre())
	}
	f, err := NewField(el, rock, pts, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	op := mustDense(t, el, Settings{})
	r := rand.New(rand.NewPCG(13, 14))
	s, w := randomVector(r, len(el), 1e-3), randomVector(r, len(el), 1e-3)
	tau, sn := apply(op, s, w)
	st := make([]Stress, len(pts))
	f.StressTo(st, s, w)
	gt, gs := make([]float64, len(el)), make([]float64, len(el))
	for i, e := range el {
		gt[i], gs[i] = st[i].OnPlane(e.Tangent())
	}
	if e := relDiff(gt, gs, tau, sn); !(e <= 1e-6) {
		t.Errorf("field on the elements vs operator: relative error %.3g, want ≤ 1e-6", e)
	}
}
