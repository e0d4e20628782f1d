package elastic

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/spatial/r2"
)

// Stress is a change of the stress tensor in the map plane, Pa,
// compression-positive, in the x (east), y (north) frame.
type Stress struct {
	XX, YY, XY float64
}

// OnPlane resolves the stress change on a vertical plane with unit
// tangent t (in map view) and normal n = (−t_y, t_x): the normal stress
// change Δσn = n·S·n (compression-positive) and the shear stress change
// Δτ = −t·S·n, which drives right-lateral slip: the side n points to
// moving along +t, the sign convention of Operator's slip. Both are
// unchanged when t is reversed.
func (s Stress) OnPlane(t r2.Vec) (shear, normal float64) {
	n := r2.Vec{X: -t.Y, Y: t.X}
	sn := r2.Vec{X: s.XX*n.X + s.XY*n.Y, Y: s.XY*n.X + s.YY*n.Y}
	return -r2.Dot(t, sn), r2.Dot(n, sn)
}

// Sense is the sense of slip of a receiver plane in map view.
type Sense int

const (
	// RightLateral (dextral) slip: the far side moves to the right.
	RightLateral Sense = 1
	// LeftLateral (sinistral) slip: the far side moves to the left.
	LeftLateral Sense = -1
)

// Coulomb returns the Coulomb stress change on a vertical receiver plane
// with unit tangent t that slips in the given sense, Pa:
//
//	ΔCFS = Δτ − μ Δσn,
//
// with Δτ the shear stress change in the direction of slip and Δσn the
// normal stress change, compression-positive (King, Stein & Lin 1994,
// "Static stress changes and the triggering of earthquakes", Bull.
// Seismol. Soc. Am. 84(3), 935–953, who write it with tension-positive
// σn as Δτ + μ′Δσn; μ is their effective friction μ′, which absorbs any
// pore-pressure change). Positive ΔCFS brings the plane closer to
// failure.
func (s Stress) Coulomb(t r2.Vec, friction float64, sense Sense) float64 {
	shear, normal := s.OnPlane(t)
	return float64(sense)*shear - friction*normal
}

// fieldSource gives the field's entries to the hierarchical matrix. Row
// object 3p + c is stress component c (XX, YY, XY) at point p; column
// objects are elements with their slip and opening.
type fieldSource struct {
	m   *model
	pts []r2.Vec
}

func (fieldSource) dims() (int, int) { return 1, 2 }

func component(s Stress, c int) float64 {
	switch c {
	case 0:
		return s.XX
	case 1:
		return s.YY
	}
	return s.XY
}

func (f fieldSource) rowTo(dst []float64, o int, cols []int) {
	p, c := f.pts[o/3], o%3
	for jj, j := range cols {
		s := f.m.field(p, j)
		dst[2*jj], dst[2*jj+1] = component(s[0], c), component(s[1], c)
	}
}

func (f fieldSource) colTo(dst []float64, rows []int, j int) {
	last := -1
	var s [2]Stress
	for ii, o := range rows {
		if o/3 != last {
			last = o / 3
			s = f.m.field(f.pts[last], j)
		}
		dst[2*ii], dst[2*ii+1] = component(s[0], o%3), component(s[1], o%3)
	}
}

// Field evaluates the stress change caused by the slip and opening of
// every element at a fixed set of map points (a grid for a map of the
// Coulomb stress change, say), through a hierarchical matrix of points ×
// elements built once: each evaluation then costs about as much as one
// operator product. The height correction uses the source's height and
// the distance from the point to its centre: the stress on the layer
// mid-plane. Stress at an element's tip is singular; a point there gets
// non-finite values. The evaluator is not symmetric and has three rows
// per point, so it is larger than the operator: 174 MB for 10⁴ points
// over 10⁴ elements (DFN-like network, tolerance 10⁻⁶), growing as
// (P + N) log(P + N); a map of 10⁵ points over 10⁵ elements needs about
// 2 GB (extrapolated), and a coarser grid or several tiles are the way
// to stay within a workstation's memory.
type Field struct {
	m    *model
	h    *hmatrix
	npts int
	mu   sync.Mutex // guards x and y
	x, y []float64
}

// NewField builds the evaluator of the stress change at points from the
// elements. It returns the errors of NewDense, and an *InputError for a
// point that is not finite.
func NewField(elems []Element, m Material, points []r2.Vec, s Settings) (*Field, error) {
	r, err := prepare(elems, m, s)
	if err != nil {
		return nil, err
	}
	if len(points) == 0 {
		return nil, fmt.Errorf("elastic: no points to evaluate the field at")
	}
	centres := make([]r2.Vec, 3*len(points))
	boxes := make([]box, 3*len(points))
	for p, q := range points {
		if math.IsNaN(q.X+q.Y) || math.IsInf(q.X+q.Y, 0) {
			return nil, &InputError{Element: -1, Name: fmt.Sprintf("points[%d]", p), Value: q.X + q.Y, Want: "must be finite"}
		}
		for c := range 3 {
			centres[3*p+c], boxes[3*p+c] = q, box{min: q, max: q}
		}
	}
	md := newModel(elems, m, r)
	rows := buildTree(centres, boxes, 3*r.LeafSize)
	h, err := newHMatrix(fieldSource{m: md, pts: points}, rows, elementTree(elems, r.LeafSize), false, r)
	if err != nil {
		return nil, err
	}
	return &Field{
		m: md, h: h, npts: len(points),
		x: make([]float64, 2*len(elems)), y: make([]float64, 3*len(points)),
	}, nil
}

// StressTo writes into dst, one per point, the stress change caused by
// slip and opening (one per element, m). Calls are serialized.
func (f *Field) StressTo(dst []Stress, slip, opening []float64) {
	checkLen(len(f.m.geo), slip, opening)
	if len(dst) != f.npts {
		panic("elastic: dimension mismatch")
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	for i := range slip {
		f.x[2*i], f.x[2*i+1] = slip[i], opening[i]
	}
	f.h.mulVec(f.y, f.x)
	for p := range dst {
		dst[p] = Stress{XX: f.y[3*p], YY: f.y[3*p+1], XY: f.y[3*p+2]}
	}
}

// StressAt returns the stress change at point p by direct summation over
// the elements (exact, O(N)); StressTo approximates the same sums to
// Settings.Tolerance.
func (f *Field) StressAt(p r2.Vec, slip, opening []float64) Stress {
	return f.m.stressAt(p, slip, opening)
}

// Stats returns the block counts, ranks and memory of the evaluator
// (Elements is the number of source elements).
func (f *Field) Stats() Stats {
	s := f.h.stats()
	s.Elements = len(f.m.geo)
	s.Bytes += 8 * int64(len(f.x)+len(f.y))
	return s
}
