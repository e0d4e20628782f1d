package elastic

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

// Element is a straight displacement-discontinuity element: a vertical
// fracture patch seen in map view, from P0 to P1, with the height it
// conducts in the layer.
type Element struct {
	P0, P1 r2.Vec  // End points, m (x east, y north).
	Height float64 // Height of the patch in the layer, m.
}

// Centre returns the mid-point of the element, m.
func (e Element) Centre() r2.Vec { return r2.Scale(0.5, r2.Add(e.P0, e.P1)) }

// Length returns the length of the element, m.
func (e Element) Length() float64 { return r2.Norm(r2.Sub(e.P1, e.P0)) }

// Tangent returns the unit tangent t = (P1 − P0)/|P1 − P0|.
func (e Element) Tangent() r2.Vec { return r2.Unit(r2.Sub(e.P1, e.P0)) }

// Normal returns the unit normal n = (−t_y, t_x), the tangent turned by
// +90° (anticlockwise seen from above).
func (e Element) Normal() r2.Vec {
	t := e.Tangent()
	return r2.Vec{X: -t.Y, Y: t.X}
}

// Material is a homogeneous, isotropic, linear-elastic rock.
type Material struct {
	ShearModulus float64 // G, Pa.
	PoissonRatio float64 // ν, dimensionless, in (−1, 0.5).
}

// InputError reports an element or material value outside its allowed
// range. Element is the index of the offending element, or −1 when the
// value is not an element's.
type InputError struct {
	Element int     // element index, or −1
	Name    string  // name of the value, e.g. "height"
	Value   float64 // offending value, SI units
	Want    string  // the allowed range, e.g. "must be finite and > 0"
}

func (e *InputError) Error() string {
	if e.Element < 0 {
		return fmt.Sprintf("elastic: %s = %g: %s", e.Name, e.Value, e.Want)
	}
	return fmt.Sprintf("elastic: elements[%d].%s = %g: %s", e.Element, e.Name, e.Value, e.Want)
}

// GeometryError reports two elements whose influence on each other is not
// defined: their centres coincide, or the centre of Receiver lies on a tip
// of Source, where the stress of a constant displacement discontinuity is
// singular (Crouch & Starfield 1983, §5.2). Split the elements at the
// junction, as a mesh of the traces does, or remove the duplicate.
type GeometryError struct {
	Receiver, Source int    // element indices
	Reason           string // what is degenerate
}

func (e *GeometryError) Error() string {
	return fmt.Sprintf("elastic: elements[%d] and elements[%d]: %s", e.Receiver, e.Source, e.Reason)
}

// coincidence is the distance between two centres, relative to the
// shorter element, below which the centres count as coincident; two such
// elements give (nearly) equal rows and a singular operator.
const coincidence = 1e-9

// Validate checks the material: G finite and > 0, −1 < ν < 0.5 (the
// bounds of a positive-definite isotropic stiffness; Jaeger, Cook &
// Zimmerman 2007, §5.3).
func (m Material) Validate() error {
	if !(m.ShearModulus > 0) || math.IsInf(m.ShearModulus, 0) {
		return &InputError{Element: -1, Name: "shear_modulus", Value: m.ShearModulus, Want: "must be finite and > 0"}
	}
	if !(m.PoissonRatio > -1 && m.PoissonRatio < 0.5) {
		return &InputError{Element: -1, Name: "poisson_ratio", Value: m.PoissonRatio, Want: "must be in (-1, 0.5)"}
	}
	return nil
}

// validateElements checks that every element has finite end points, a
// length > 0 and a finite height > 0.
func validateElements(elems []Element) error {
	for i, e := range elems {
		for _, c := range []struct {
			name string
			v    float64
		}{{"p0.x", e.P0.X}, {"p0.y", e.P0.Y}, {"p1.x", e.P1.X}, {"p1.y", e.P1.Y}} {
			if math.IsNaN(c.v) || math.IsInf(c.v, 0) {
				return &InputError{Element: i, Name: c.name, Value: c.v, Want: "must be a finite number"}
			}
		}
		if l := e.Length(); !(l > 0) || math.IsInf(l, 0) {
			return &InputError{Element: i, Name: "length", Value: l, Want: "must be finite and > 0 (P0 ≠ P1)"}
		}
		if !(e.Height > 0) || math.IsInf(e.Height, 0) {
			return &InputError{Element: i, Name: "height", Value: e.Height, Want: "must be finite and > 0"}
		}
	}
	return nil
}

// geometry is the per-element data the kernel needs, precomputed once.
type geometry struct {
	c    r2.Vec  // centre, m
	t, n r2.Vec  // unit tangent and normal
	a    float64 // half-length, m
	h    float64 // height, m
	sh   float64 // √h, m^½
}

// onTip reports whether p lies within eps of a tip of the element.
func (g *geometry) onTip(p r2.Vec, eps float64) bool {
	return r2.Norm(r2.Sub(p, r2.Add(g.c, r2.Scale(g.a, g.t)))) <= eps ||
		r2.Norm(r2.Sub(p, r2.Sub(g.c, r2.Scale(g.a, g.t)))) <= eps
}

// geometryWords is the size of a geometry in 8-byte words.
const geometryWords = 9

func newGeometry(elems []Element) []geometry {
	g := make([]geometry, len(elems))
	for i, e := range elems {
		g[i] = geometry{c: e.Centre(), t: e.Tangent(), n: e.Normal(), a: e.Length() / 2, h: e.Height, sh: math.Sqrt(e.Height)}
	}
	return g
}

// box is an axis-aligned bounding box.
type box struct{ min, max r2.Vec }

func emptyBox() box {
	inf := math.Inf(1)
	return box{min: r2.Vec{X: inf, Y: inf}, max: r2.Vec{X: -inf, Y: -inf}}
}

func (b box) extend(p r2.Vec) box {
	return box{
		min: r2.Vec{X: math.Min(b.min.X, p.X), Y: math.Min(b.min.Y, p.Y)},
		max: r2.Vec{X: math.Max(b.max.X, p.X), Y: math.Max(b.max.Y, p.Y)},
	}
}

func (b box) union(o box) box { return b.extend(o.min).extend(o.max) }

// diameter returns the length of the box's diagonal.
func (b box) diameter() float64 { return math.Hypot(b.max.X-b.min.X, b.max.Y-b.min.Y) }

// distance returns the Euclidean distance between two boxes (0 when they
// overlap).
func (b box) distance(o box) float64 {
	dx := math.Max(0, math.Max(o.min.X-b.max.X, b.min.X-o.max.X))
	dy := math.Max(0, math.Max(o.min.Y-b.max.Y, b.min.Y-o.max.Y))
	return math.Hypot(dx, dy)
}
