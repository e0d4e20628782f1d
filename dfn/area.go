package dfn

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

// polygon is a small convex polygon in a fracture's plane coordinates
// (u along strike, v down dip from the centre), m. Clipping a quadrilateral
// by the six faces of a box leaves at most 10 vertices; the spare room
// absorbs vertices that rounding might add on a cutting line.
type polygon struct {
	n int
	p [24]r2.Vec
}

// push appends v unless the polygon is full.
func (q *polygon) push(v r2.Vec) {
	if q.n < len(q.p) {
		q.p[q.n] = v
		q.n++
	}
}

// clip keeps the part of q with a·x ≤ k (Sutherland & Hodgman 1974).
func (q *polygon) clip(a r2.Vec, k float64) {
	var out polygon
	for i := range q.n {
		cur, next := q.p[i], q.p[(i+1)%q.n]
		fc, fn := r2.Dot(a, cur)-k, r2.Dot(a, next)-k
		if fc <= 0 {
			out.push(cur)
		}
		if (fc < 0 && fn > 0) || (fc > 0 && fn < 0) {
			t := fc / (fc - fn)
			out.push(r2.Add(cur, r2.Scale(t, r2.Sub(next, cur))))
		}
	}
	*q = out
}

// area returns the polygon's area (shoelace formula), m².
func (q *polygon) area() float64 {
	var s float64
	for i := range q.n {
		s += r2.Cross(q.p[i], q.p[(i+1)%q.n])
	}
	return math.Abs(s) / 2
}

// discArea returns the area of the polygon ∩ the disc of radius r about
// the origin, as the sum over edges of the signed areas of disc ∩ triangle
// (origin, edge), m².
func (q *polygon) discArea(r float64) float64 {
	var s float64
	for i := range q.n {
		s += discTriangleArea(q.p[i], q.p[(i+1)%q.n], r)
	}
	return math.Abs(s)
}

// discTriangleArea returns the signed area of the disc of radius r about
// the origin ∩ the triangle (origin, a, b). The part of the edge a→b
// inside the disc, [t1, t2] ∩ [0, 1] with t1, t2 the roots of
// |a + t(b − a)|² = r², adds the triangle area cross(p, q)/2; the parts
// outside add the sectors r²·∠(p, q)/2. A tangent edge is outside.
func discTriangleArea(a, b r2.Vec, r float64) float64 {
	sector := func(p, q r2.Vec) float64 {
		return r * r * math.Atan2(r2.Cross(p, q), r2.Dot(p, q)) / 2
	}
	d := r2.Sub(b, a)
	qa, qb, qc := r2.Dot(d, d), 2*r2.Dot(a, d), r2.Dot(a, a)-r*r
	if qa == 0 {
		return 0
	}
	disc := qb*qb - 4*qa*qc
	if disc <= 0 {
		return sector(a, b)
	}
	sq := math.Sqrt(disc)
	lo := math.Max(0, (-qb-sq)/(2*qa))
	hi := math.Min(1, (-qb+sq)/(2*qa))
	if lo >= hi {
		return sector(a, b)
	}
	p, q := r2.Add(a, r2.Scale(lo, d)), r2.Add(a, r2.Scale(hi, d))
	return sector(a, p) + r2.Cross(p, q)/2 + sector(q, b)
}

// AreaIn returns the exact area of fracture f inside the axis-aligned box
// [lo, hi] (ENU, m), m². The box cuts the fracture plane in a convex
// polygon: with s the strike and d the down-dip unit vectors, a point
// c + u·s + v·d is inside when lo_i ≤ c_i + u s_i + v d_i ≤ hi_i for each
// axis i. A rectangle is clipped by these six half-planes; a disc's
// bounding square is clipped and intersected with the disc.
func AreaIn(f *Fracture, lo, hi [3]float64) float64 {
	s, d := f.Strike(), f.DownDip()
	var q polygon
	var hu, hv float64
	if f.Shape == Disc {
		hu, hv = f.Size, f.Size
	} else {
		hu, hv = f.Size/2, f.Height/2
	}
	q.n = 4
	q.p[0], q.p[1], q.p[2], q.p[3] = r2.Vec{X: -hu, Y: -hv}, r2.Vec{X: hu, Y: -hv}, r2.Vec{X: hu, Y: hv}, r2.Vec{X: -hu, Y: hv}
	c := [3]float64{f.Centre.X, f.Centre.Y, f.Centre.Z}
	su := [3]float64{s.X, s.Y, s.Z}
	dv := [3]float64{d.X, d.Y, d.Z}
	for i := range 3 {
		a := r2.Vec{X: su[i], Y: dv[i]}
		if a.X == 0 && a.Y == 0 {
			if c[i] < lo[i] || c[i] > hi[i] {
				return 0
			}
			continue
		}
		q.clip(a, hi[i]-c[i])
		q.clip(r2.Scale(-1, a), c[i]-lo[i])
		if q.n < 3 {
			return 0
		}
	}
	if f.Shape == Disc {
		return q.discArea(f.Size)
	}
	return q.area()
}
