package elastic

import (
	"errors"
	"math"
	"testing"
	"unsafe"

	"gonum.org/v1/gonum/spatial/r2"
)

// TestInputErrors checks that invalid elements, material and settings
// are errors naming the element, the value and the allowed range.
func TestInputErrors(t *testing.T) {
	ok := Element{P0: r2.Vec{}, P1: r2.Vec{X: 5}, Height: 10}
	for _, tc := range []struct {
		name    string
		el      []Element
		m       Material
		s       Settings
		element int    // InputError.Element
		key     string // InputError.Name
	}{
		{"zero length", []Element{ok, {P0: r2.Vec{X: 9, Y: 1}, P1: r2.Vec{X: 9, Y: 1}, Height: 10}}, rock, Settings{}, 1, "length"},
		{"NaN end", []Element{{P0: r2.Vec{X: math.NaN()}, P1: r2.Vec{X: 5}, Height: 10}}, rock, Settings{}, 0, "p0.x"},
		{"infinite end", []Element{ok, ok, {P0: r2.Vec{}, P1: r2.Vec{Y: math.Inf(1)}, Height: 1}}, rock, Settings{}, 2, "p1.y"},
		{"zero height", []Element{{P0: r2.Vec{}, P1: r2.Vec{X: 5}}}, rock, Settings{}, 0, "height"},
		{"negative shear modulus", []Element{ok}, Material{ShearModulus: -1, PoissonRatio: 0.25}, Settings{}, -1, "shear_modulus"},
		{"Poisson ratio 0.5", []Element{ok}, Material{ShearModulus: 1e9, PoissonRatio: 0.5}, Settings{}, -1, "poisson_ratio"},
		{"tolerance below single precision", []Element{ok}, rock, Settings{Tolerance: 1e-9}, -1, "tolerance"},
		{"negative workers", []Element{ok}, rock, Settings{Workers: -2}, -1, "workers"},
		{"negative leaf size", []Element{ok}, rock, Settings{LeafSize: -1}, -1, "leaf_size"},
		{"negative memory limit", []Element{ok}, rock, Settings{MemoryLimit: -1}, -1, "memory_limit"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for name, build := range map[string]func() error{
				"dense":        func() error { _, err := NewDense(tc.el, tc.m, tc.s); return err },
				"hierarchical": func() error { _, err := NewHierarchical(tc.el, tc.m, tc.s); return err },
				"field": func() error {
					_, err := NewField(tc.el, tc.m, []r2.Vec{{X: 1, Y: 1}}, tc.s)
					return err
				},
			} {
				err := build()
				var ie *InputError
				if !errors.As(err, &ie) || ie.Element != tc.element || ie.Name != tc.key {
					t.Errorf("%s: error %v, want an *InputError for element %d, %q", name, err, tc.element, tc.key)
				}
			}
		})
	}
	if _, err := New(nil, rock, Settings{}); !errors.Is(err, ErrEmpty) {
		t.Errorf("no elements: %v, want ErrEmpty", err)
	}
}

// TestGeometryErrors checks the degenerate pairs of elements: coincident
// centres (duplicates, or two elements crossing at their centres) and a
// centre on another element's tip (a T-junction not split at the
// junction) are *GeometryErrors naming the pair; collinear elements that
// touch end to end, as a mesh of a trace makes them, are fine.
func TestGeometryErrors(t *testing.T) {
	a := Element{P0: r2.Vec{X: -5}, P1: r2.Vec{X: 5}, Height: 10}
	for _, tc := range []struct {
		name     string
		el       []Element
		receiver int // −1: no error
		source   int
	}{
		{"duplicate", []Element{a, {P0: r2.Vec{Y: 30}, P1: r2.Vec{X: 3, Y: 30}, Height: 5}, a}, 0, 2},
		{"crossing at the centres", []Element{a, {P0: r2.Vec{Y: -4}, P1: r2.Vec{Y: 4}, Height: 10}}, 0, 1},
		{"tip on a centre", []Element{a, {P0: r2.Vec{}, P1: r2.Vec{X: 3, Y: 7}, Height: 10}}, 0, 1},
		{"collinear, touching", []Element{a, {P0: r2.Vec{X: 5}, P1: r2.Vec{X: 9}, Height: 10}}, -1, -1},
		{"crossing off the centres", []Element{a, {P0: r2.Vec{X: 1, Y: -4}, P1: r2.Vec{X: 1, Y: 5}, Height: 10}}, -1, -1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for name, build := range map[string]func() (Operator, error){
				"dense":        func() (Operator, error) { return NewDense(tc.el, rock, Settings{}) },
				"hierarchical": func() (Operator, error) { return NewHierarchical(tc.el, rock, Settings{}) },
			} {
				op, err := build()
				if tc.receiver < 0 {
					if err != nil {
						t.Fatalf("%s: %v", name, err)
					}
					for i := range tc.el {
						for j := range tc.el {
							b := op.At(i, j)
							for _, v := range []float64{b.ShearSlip, b.ShearOpening, b.NormalSlip, b.NormalOpening} {
								if math.IsNaN(v) || math.IsInf(v, 0) {
									t.Fatalf("%s: At(%d, %d) = %+v, want finite", name, i, j, b)
								}
							}
						}
					}
					continue
				}
				var ge *GeometryError
				if !errors.As(err, &ge) || ge.Receiver != tc.receiver || ge.Source != tc.source {
					t.Errorf("%s: error %v, want a *GeometryError for elements %d and %d", name, err, tc.receiver, tc.source)
				}
			}
		})
	}
}

// FuzzPair builds the operator of two arbitrary elements: it either
// refuses them with an error, or gives finite coefficients that are
// reciprocal (Betti 1872: W_i A_ij = J (W_j A_ji)ᵀ J) and self terms of
// the signs of the package doc.
func FuzzPair(f *testing.F) {
	f.Add(0.0, 0.0, 10.0, 0.0, 20.0, 0.0, 5.0, 3.0, 8.0, 12.0)
	f.Add(0.0, 0.0, 10.0, 0.0, 5.0, 0.0, 15.0, 0.0, 8.0, 8.0)
	f.Add(0.0, 0.0, 10.0, 0.0, 5.0, -5.0, 5.0, 5.0, 8.0, 30.0)
	f.Add(0.0, 0.0, 10.0, 0.0, 0.0, 0.0, 10.0, 0.0, 8.0, 8.0)
	f.Fuzz(func(t *testing.T, x0, y0, x1, y1, x2, y2, x3, y3, h0, h1 float64) {
		for _, v := range []float64{x0, y0, x1, y1, x2, y2, x3, y3, h0, h1} {
			if math.Abs(v) > 1e4 {
				return
			}
		}
		el := []Element{{P0: r2.Vec{X: x0, Y: y0}, P1: r2.Vec{X: x1, Y: y1}, Height: h0}, {P0: r2.Vec{X: x2, Y: y2}, P1: r2.Vec{X: x3, Y: y3}, Height: h1}}
		d, err := NewDense(el, rock, Settings{})
		if err != nil {
			return // refused: invalid or degenerate, which is allowed
		}
		m := newModel(el, rock, Settings{Alpha: OlsonAlpha, Beta: OlsonBeta})
		for i := range 2 {
			self := d.At(i, i)
			if !(self.ShearSlip < 0 && self.NormalOpening > 0) {
				t.Fatalf("self terms %+v: want ShearSlip < 0 < NormalOpening", self)
			}
		}
		a, b := d.At(0, 1), d.At(1, 0)
		w0, w1 := m.weight(0), m.weight(1)
		pairs := [][2]float64{
			{w0 * a.ShearSlip, w1 * b.ShearSlip}, {w0 * a.NormalOpening, w1 * b.NormalOpening},
			{w0 * a.ShearOpening, -w1 * b.NormalSlip}, {w0 * a.NormalSlip, -w1 * b.ShearOpening},
		}
		// Round-off is relative to the largest raw collocation coefficient:
		// the mean of the two estimates can cancel (an element inside a
		// longer collinear one).
		scale := 0.0
		r01, r10 := m.k.collocation(&m.geo[0], &m.geo[1]), m.k.collocation(&m.geo[1], &m.geo[0])
		for _, v := range []float64{w0 * r01.ShearSlip, w0 * r01.ShearOpening, w0 * r01.NormalSlip, w0 * r01.NormalOpening,
			w1 * r10.ShearSlip, w1 * r10.ShearOpening, w1 * r10.NormalSlip, w1 * r10.NormalOpening} {
			scale = math.Max(scale, math.Abs(v))
		}
		for _, p := range pairs {
			if math.IsNaN(p[0]) || math.IsInf(p[0], 0) || math.IsNaN(p[1]) || math.IsInf(p[1], 0) {
				t.Fatalf("non-finite coefficients %+v, %+v", a, b)
			}
		}
		for _, p := range pairs {
			if math.Abs(p[0]-p[1]) > 1e-9*scale {
				t.Fatalf("not reciprocal: %g vs %g (largest %g)", p[0], p[1], scale)
			}
		}
	})
}

// TestStructSizes checks the sizes that the memory accounting assumes.
func TestStructSizes(t *testing.T) {
	if got := unsafe.Sizeof(geometry{}); got != 8*geometryWords {
		t.Errorf("geometry: %d bytes, accounted %d", got, 8*geometryWords)
	}
	if got := unsafe.Sizeof(hblock{}); got != 8*blockWords {
		t.Errorf("hblock: %d bytes, accounted %d", got, 8*blockWords)
	}
	if got := unsafe.Sizeof(cluster{}); got != 8*clusterWords {
		t.Errorf("cluster: %d bytes, accounted %d", got, 8*clusterWords)
	}
}
