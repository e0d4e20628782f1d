package dfn

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/orient"
)

// Shape is the outline of a planar fracture.
type Shape uint8

// Fracture shapes.
const (
	// Disc is a circular fracture; its size is the radius.
	Disc Shape = iota
	// Rectangle has its size as the length along strike and a height down
	// dip; its sides run along strike and down dip.
	Rectangle
)

// String returns "disc" or "rectangle".
func (s Shape) String() string {
	switch s {
	case Disc:
		return "disc"
	case Rectangle:
		return "rectangle"
	}
	return "unknown"
}

// KnownSet is the set index of mapped (known) fractures.
const KnownSet = -1

// KnownSetName is the name under which mapped fractures are reported.
const KnownSetName = "known"

// Fracture is one planar fracture in 3-D.
type Fracture struct {
	// Set is the index of the fracture's set in Scenario.Sets, or KnownSet.
	Set int
	// Name of a mapped fracture; empty for generated ones.
	Name  string
	Shape Shape
	// Centre in local ENU coordinates, m (z = −depth).
	Centre r3.Vec
	// Normal is the upward unit normal (z ≥ 0).
	Normal r3.Vec
	// Dip, radians in [0, π/2], and DipDirection, radians clockwise from
	// north in [0, 2π).
	Dip, DipDirection float64
	// Size is the radius of a disc or the strike length of a rectangle, m.
	Size float64
	// Height is the down-dip extent: the rectangle's height, or the
	// diameter of a disc, m.
	Height float64
	// Area of one face, m².
	Area float64
}

// Strike returns the horizontal unit vector along strike (right-hand rule).
func (f *Fracture) Strike() r3.Vec { return orient.Strike(f.DipDirection) }

// DownDip returns the unit vector pointing down the dip.
func (f *Fracture) DownDip() r3.Vec { return orient.DownDip(f.Dip, f.DipDirection) }

// Extent returns the largest distance from the centre to a point of the
// fracture: the radius of a disc, the half-diagonal of a rectangle, m.
func (f *Fracture) Extent() float64 {
	if f.Shape == Disc {
		return f.Size
	}
	return math.Hypot(f.Size, f.Height) / 2
}

// Segment is a line segment in map view, local metres.
type Segment struct {
	P0, P1 r2.Vec
}

// Trace is the intersection of a fracture with the layer mid-plane.
type Trace struct {
	// Fracture is the index of the fracture in Network.Fractures.
	Fracture int
	// Set is the fracture's set (KnownSet for mapped fractures).
	Set int
	// Segment runs along the fracture's strike from P0 to P1, local
	// metres; it is not clipped to the map.
	Segment
	// Length of the segment, m.
	Length float64
	// Height is the conducting height: the down-dip length of the fracture
	// inside the layer (see the package documentation), m.
	Height float64
	// Cluster is the index of the trace's cluster in Network.Clusters.
	Cluster int
}

// Intersection is a crossing of two traces.
type Intersection struct {
	// I < J are the trace indices.
	I, J int
	// Point of the crossing, local metres.
	Point r2.Vec
	// SI and SJ are the positions of the crossing along traces I and J as
	// fractions of their length from P0 (multiply by Length for metres).
	SI, SJ float64
}

// Cluster is a connected component of the trace-intersection graph.
type Cluster struct {
	// Traces is the number of traces in the cluster.
	Traces int
	// Length is their total length, m.
	Length float64
}

// WellPath is a well path in map view.
type WellPath struct {
	Name string
	// Path points from heel to toe, local metres.
	Path []r2.Vec
}

// WellCrossing is a crossing of a well path with a trace in map view.
type WellCrossing struct {
	// Well is the index in Network.Wells; Trace the index in
	// Network.Traces.
	Well, Trace int
	// Distance along the map-view path from its first point, m.
	Distance float64
	// Point of the crossing, local metres.
	Point r2.Vec
}

// SetInfo is what the generator derived for one set.
type SetInfo struct {
	Name  string
	Shape Shape
	// Density is λ, the number of fracture centres per unit volume of
	// rock, 1/m³.
	Density float64
	// P32Target is the fracture area per unit volume the set is generated
	// to (given, converted from P10, or implied by a count), 1/m.
	P32Target float64
	// ExpectedCount is the mean number of the set's fractures in a
	// network (exact for a count), N̄ = λ·E[enlarged box volume].
	ExpectedCount float64
}

// Network is one realization of the fracture network.
type Network struct {
	// Seed and Realization the network was generated from.
	Seed        uint64
	Realization int
	// Region is the counting volume (map × layer).
	Region Region
	// Sets lists the generated sets, in scenario order.
	Sets []SetInfo
	// Fractures: each set's in turn, then the mapped fractures.
	Fractures []Fracture
	// Traces on the mid-plane, in fracture order.
	Traces []Trace
	// Intersections between traces, sorted by (I, J).
	Intersections []Intersection
	// Clusters, numbered in order of their lowest trace index.
	Clusters []Cluster
	// Wells in scenario order and their crossings, sorted by well,
	// then distance along the path, then trace.
	Wells         []WellPath
	WellCrossings []WellCrossing
}

// SetName returns the name of set index i (KnownSetName for KnownSet).
func (n *Network) SetName(i int) string {
	if i >= 0 && i < len(n.Sets) {
		return n.Sets[i].Name
	}
	return KnownSetName
}
