package dfn

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"
)

// HorizontalDip is the dip, radians, below which a fracture counts as
// horizontal and makes no trace on the mid-plane (common practice, no
// source: a plane parallel to the mid-plane has no line of intersection).
const HorizontalDip = 1e-6

// TraceOf returns the trace of f on the mid-plane of region r and whether
// f crosses it (see the package documentation for the geometry and the
// conducting height). Trace.Fracture and Trace.Cluster are left 0.
func TraceOf(f *Fracture, r Region) (Trace, bool) {
	if f.Dip < HorizontalDip {
		return Trace{}, false
	}
	sinDip := math.Sin(f.Dip)
	v0 := (f.Centre.Z - r.MidZ) / sinDip // down-dip position of the mid-plane
	var half, vlo, vhi float64
	switch f.Shape {
	case Disc:
		if !(math.Abs(v0) < f.Size) {
			return Trace{}, false
		}
		half = math.Sqrt((f.Size - v0) * (f.Size + v0))
		vlo, vhi = -f.Size, f.Size
	default:
		if !(math.Abs(v0) < f.Height/2) {
			return Trace{}, false
		}
		half = f.Size / 2
		vlo, vhi = -f.Height/2, f.Height/2
	}
	layerHalf := r.Thickness / (2 * sinDip)
	height := math.Min(v0+layerHalf, vhi) - math.Max(v0-layerHalf, vlo)
	mid := r3.Add(f.Centre, r3.Scale(v0, f.DownDip()))
	s := f.Strike()
	return Trace{
		Set: f.Set,
		Segment: Segment{
			P0: r2.Vec{X: mid.X - half*s.X, Y: mid.Y - half*s.Y},
			P1: r2.Vec{X: mid.X + half*s.X, Y: mid.Y + half*s.Y},
		},
		Length: 2 * half,
		Height: math.Max(0, height),
	}, true
}

// Traces returns the traces of the fractures that cross the mid-plane, in
// fracture order.
func Traces(fs []Fracture, r Region) []Trace {
	var out []Trace
	for i := range fs {
		if t, ok := TraceOf(&fs[i], r); ok {
			t.Fracture = i
			out = append(out, t)
		}
	}
	return out
}

// ClipLength returns the length of s inside the axis-aligned rectangle
// [xmin, xmax] × [ymin, ymax] (Liang & Barsky 1984 parametric clipping).
func ClipLength(s Segment, xmin, xmax, ymin, ymax float64) float64 {
	d := r2.Sub(s.P1, s.P0)
	t0, t1 := 0.0, 1.0
	clip := func(p, q float64) bool { // p·t ≤ q
		if p == 0 {
			return q >= 0
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		return t0 <= t1
	}
	if clip(-d.X, s.P0.X-xmin) && clip(d.X, xmax-s.P0.X) &&
		clip(-d.Y, s.P0.Y-ymin) && clip(d.Y, ymax-s.P0.Y) {
		return (t1 - t0) * r2.Norm(d)
	}
	return 0
}
