package gis

import (
	"slices"

	"github.com/paulmach/orb"
)

// signedArea returns the shoelace area of ring r: positive when r winds
// counter-clockwise in a right-handed (x east, y north) frame.
func signedArea(r []orb.Point) float64 {
	var s float64
	for i := 1; i < len(r); i++ {
		s += r[i-1][0]*r[i][1] - r[i][0]*r[i-1][1]
	}
	if n := len(r); n > 0 && r[0] != r[n-1] {
		s += r[n-1][0]*r[0][1] - r[0][0]*r[n-1][1]
	}
	return s / 2
}

// mapGeometry returns a copy of g with every point replaced by f(point).
// Polygon rings are rewound after mapping so that exteriors are
// counter-clockwise and holes clockwise (RFC 7946 §3.1.6; also the
// orientation OGC Simple Features and GeoPackage readers expect). It panics
// on a geometry type the package does not write (a programmer bug: layers
// are validated first).
func mapGeometry(g orb.Geometry, f func(orb.Point) orb.Point) orb.Geometry {
	switch g := g.(type) {
	case orb.Point:
		return f(g)
	case orb.LineString:
		return orb.LineString(mapPoints(g, f))
	case orb.Polygon:
		return mapPolygon(g, f)
	case orb.MultiPolygon:
		out := make(orb.MultiPolygon, len(g))
		for i, p := range g {
			out[i] = mapPolygon(p, f)
		}
		return out
	}
	panic("gis: unsupported geometry type")
}

func mapPoints(ps []orb.Point, f func(orb.Point) orb.Point) []orb.Point {
	out := make([]orb.Point, len(ps))
	for i, p := range ps {
		out[i] = f(p)
	}
	return out
}

// mapPolygon maps the rings of p and winds the exterior counter-clockwise
// and the holes clockwise.
func mapPolygon(p orb.Polygon, f func(orb.Point) orb.Point) orb.Polygon {
	out := make(orb.Polygon, len(p))
	for i, r := range p {
		q := orb.Ring(mapPoints(r, f))
		a := signedArea(q)
		if (i == 0 && a < 0) || (i > 0 && a > 0) {
			slices.Reverse(q)
		}
		out[i] = q
	}
	return out
}

// bounds returns the bounding box of the points of g and whether g has
// any point.
func bounds(g orb.Geometry) (orb.Bound, bool) {
	switch g := g.(type) {
	case nil:
		return orb.Bound{}, false
	case orb.Point:
		return g.Bound(), true
	case orb.MultiPolygon:
		if len(g) == 0 {
			return orb.Bound{}, false
		}
	}
	return g.Bound(), true
}

// isEmpty reports whether g has no points (only an empty MultiPolygon can
// pass validation without points).
func isEmpty(g orb.Geometry) bool {
	_, ok := bounds(g)
	return !ok
}
