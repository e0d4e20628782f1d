package flow

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/unionfind"
)

// Path is one conducting segment in map view: a fracture trace or a
// primary conduit.
type Path struct {
	// P0 and P1 are the ends, local metres.
	P0, P1 r2.Vec
	// Height is the conducting height, m.
	Height float64
	// Cuts are positions along the path, as fractions of its length from P0,
	// where an element boundary must lie (e.g. where a well crosses it).
	Cuts []float64
	// Via are the interior vertices of a path that bends: it runs P0,
	// Via…, P1 in straight legs, and every fraction (cuts, junctions) is
	// of its length along the legs. The vertices are boundary positions as
	// cuts are, so every element lies on one leg, unless a vertex is closer
	// than the shortest element to another boundary position: the element
	// across it then joins its two ends by a chord.
	Via []r2.Vec
}

// Length returns the path's length along its legs, m.
func (p Path) Length() float64 {
	if len(p.Via) == 0 {
		return r2.Norm(r2.Sub(p.P1, p.P0))
	}
	var l float64
	for k := range len(p.Via) + 1 {
		l += r2.Norm(r2.Sub(p.vertex(k+1), p.vertex(k)))
	}
	return l
}

// vertex returns the path's vertex k: P0, Via…, P1.
func (p Path) vertex(k int) r2.Vec {
	switch {
	case k == 0:
		return p.P0
	case k <= len(p.Via):
		return p.Via[k-1]
	}
	return p.P1
}

// At returns the point at fraction f of the path's length from P0 (f in
// [0, 1]).
func (p Path) At(f float64) r2.Vec {
	if len(p.Via) == 0 {
		return lerp(p.P0, p.P1, f)
	}
	d := f * p.Length()
	for k := range len(p.Via) + 1 {
		a, b := p.vertex(k), p.vertex(k+1)
		leg := r2.Norm(r2.Sub(b, a))
		if d <= leg && leg > 0 {
			return lerp(a, b, d/leg)
		}
		d -= leg
	}
	return p.P1
}

// vertexFractions returns the fractions of the path's length at its
// interior vertices.
func (p Path) vertexFractions() []float64 {
	if len(p.Via) == 0 {
		return nil
	}
	length := p.Length()
	out := make([]float64, len(p.Via))
	var d float64
	for k := range p.Via {
		d += r2.Norm(r2.Sub(p.vertex(k+1), p.vertex(k)))
		out[k] = d / length
	}
	return out
}

// Junction joins two paths where they cross: path A at fraction SA of its
// length and path B at fraction SB.
type Junction struct {
	A, B   int
	SA, SB float64
}

// Element is one flow element: a piece of a path, one pressure unknown.
type Element struct {
	// Path is the index of the element's path in the mesh input.
	Path int
	// P0 and P1 are the ends, local metres.
	P0, P1 r2.Vec
	// Length and Height, m.
	Length, Height float64
}

// Centre returns the element's midpoint.
func (e *Element) Centre() r2.Vec { return r2.Scale(0.5, r2.Add(e.P0, e.P1)) }

// Mesh is the flow mesh of a network: elements, the nodes where they meet,
// and the connections between them.
//
// Every node joins the elements that touch it: the two neighbours along a
// path, and at a junction the elements of both paths. Each pair of
// elements at a node is one connection; its transmissibility follows the
// star–delta rule (Karimi-Fard, Durlofsky & Aziz 2004, eq. 11): with the
// half-element conductances α_k = h_k e_k³ / (12 μ L_k/2),
//
//	T_ij = α_i α_j / Σ_k α_k
//
// which for two elements is the harmonic mean of their half conductances.
type Mesh struct {
	Elements []Element
	// NodeStart and NodeElems list the elements at each node: node n holds
	// NodeElems[NodeStart[n]:NodeStart[n+1]].
	NodeStart []int32
	NodeElems []int32
	// Conns are the element pairs of every node, node by node, each pair
	// once.
	Conns [][2]int
	// pathNodes are each path's boundary positions, numbered before
	// merging; nodeLabel maps those numbers to nodes.
	pathNodes [][]pathNode
	nodeLabel []int32
}

type pathNode struct {
	frac float64
	node int32
}

// DefaultMinElementFraction is the shortest element as a fraction of the
// element length when MeshSettings.MinElementFraction is 0. An element's
// crack stiffness grows as 1/L and its pressure-diffusion time shrinks as
// L², so short elements make the smallest events and the stiffest
// systems; a quarter keeps the stiffness within a factor of four of a
// full element while moving a junction by less than a quarter of an
// element (a modelling choice, no source).
const DefaultMinElementFraction = 0.25

// MeshSettings control the element size.
type MeshSettings struct {
	// ElementLength is the longest element, m.
	ElementLength float64
	// MinElementFraction sets the shortest element, MinElementFraction ×
	// ElementLength, in (0, 0.5]; 0 selects DefaultMinElementFraction.
	// Boundary positions (junctions, cuts, path ends) of one path closer
	// than that share a node. Only a path shorter than it has a shorter
	// element: the whole path.
	MinElementFraction float64
}

// BuildMesh splits every path at its junctions and cuts, then into
// elements no longer than the element length, and joins the elements at
// common nodes.
//
// No element is shorter than the minimum element length
// L_min = MinElementFraction·ElementLength, except the single element of a
// path shorter than L_min. Along each path the boundary positions (its
// ends, cuts and junctions) are scanned from P0: a position less than
// L_min beyond the last node kept gets no node of its own, and a last
// interior node less than L_min before P1 gives way to P1; the ends are
// always nodes. Every junction and cut then lands on the nearest node of
// its path, which lies less than L_min away, so a junction still joins
// the same pair of paths and a cut still marks a node of its path. Two
// junctions closer than L_min on a path share that path's node, which
// then joins all the paths they meet (they would exchange flow through
// the short element anyway). Where three paths cross in a small triangle
// whose sides on two of them are shorter than L_min, the third path's two
// crossing nodes become one node and its elements between them hang from
// it as a dead end (as with any merge distance). Between consecutive
// nodes the path is split into ⌈gap/ElementLength⌉ equal elements, each
// at least min(gap, ElementLength/2) ≥ L_min long since
// L_min ≤ ElementLength/2.
func BuildMesh(paths []Path, junctions []Junction, s MeshSettings) (*Mesh, error) {
	if !(s.ElementLength > 0) || math.IsInf(s.ElementLength, 0) {
		return nil, fmt.Errorf("flow: element length %g m must be finite and > 0", s.ElementLength)
	}
	if s.MinElementFraction == 0 {
		s.MinElementFraction = DefaultMinElementFraction
	}
	if !(s.MinElementFraction > 0 && s.MinElementFraction <= 0.5) {
		return nil, fmt.Errorf("flow: minimum element fraction %g must be in (0, 0.5]", s.MinElementFraction)
	}
	minLength := s.MinElementFraction * s.ElementLength
	stops := make([][]float64, len(paths))
	for i, p := range paths {
		if !(p.Height > 0) {
			return nil, fmt.Errorf("flow: path %d has conducting height %g m; must be > 0", i, p.Height)
		}
		stops[i] = append(append([]float64{0, 1}, p.Cuts...), p.vertexFractions()...)
	}
	for k, j := range junctions {
		if j.A < 0 || j.A >= len(paths) || j.B < 0 || j.B >= len(paths) || j.A == j.B {
			return nil, fmt.Errorf("flow: junction %d joins paths %d and %d", k, j.A, j.B)
		}
		stops[j.A] = append(stops[j.A], j.SA)
		stops[j.B] = append(stops[j.B], j.SB)
	}
	m := &Mesh{pathNodes: make([][]pathNode, len(paths))}
	uf := unionfind.New(0)
	// Boundary nodes of every path, and the elements between them.
	var ends [][2]int32 // per element: node ids before merging
	for i, p := range paths {
		length := p.Length()
		fr := nodePositions(stops[i], minLength/length)
		var prev int32 = -1
		var prevFrac float64
		for k, f := range fr {
			id := uf.Add()
			m.pathNodes[i] = append(m.pathNodes[i], pathNode{frac: f, node: id})
			if k > 0 {
				gap := (f - prevFrac) * length
				n := max(1, int(math.Ceil(gap/s.ElementLength-1e-9)))
				left := prev
				for e := range n {
					f0 := prevFrac + (f-prevFrac)*float64(e)/float64(n)
					f1 := prevFrac + (f-prevFrac)*float64(e+1)/float64(n)
					right := id
					if e < n-1 {
						right = uf.Add()
					}
					m.Elements = append(m.Elements, Element{
						Path: i, P0: p.At(f0), P1: p.At(f1),
						Length: (f1 - f0) * length, Height: p.Height,
					})
					ends = append(ends, [2]int32{left, right})
					left = right
				}
			}
			prev, prevFrac = id, f
		}
	}
	for _, j := range junctions {
		uf.Union(m.provisionalNode(j.A, j.SA), m.provisionalNode(j.B, j.SB))
	}
	m.joinNodes(uf, ends)
	return m, nil
}

// joinNodes numbers the merged nodes, lists the elements at each and the
// element pairs that meet there.
func (m *Mesh) joinNodes(uf *unionfind.Forest, ends [][2]int32) {
	labels, nodes := uf.Labels()
	m.nodeLabel = labels
	count := make([]int32, nodes+1)
	for _, e := range ends {
		count[labels[e[0]]+1]++
		if labels[e[1]] != labels[e[0]] {
			count[labels[e[1]]+1]++
		}
	}
	for n := range nodes {
		count[n+1] += count[n]
	}
	m.NodeStart = count
	m.NodeElems = make([]int32, count[nodes])
	fill := append([]int32(nil), count[:nodes]...)
	for k, e := range ends {
		a, b := labels[e[0]], labels[e[1]]
		m.NodeElems[fill[a]] = int32(k)
		fill[a]++
		if b != a {
			m.NodeElems[fill[b]] = int32(k)
			fill[b]++
		}
	}
	for n := range nodes {
		el := m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]]
		for i := range el {
			for j := i + 1; j < len(el); j++ {
				m.Conns = append(m.Conns, [2]int{int(el[i]), int(el[j])})
			}
		}
	}
}

// NumNodes returns the number of nodes.
func (m *Mesh) NumNodes() int { return len(m.NodeStart) - 1 }

// Node returns the node at fraction f along path i: the boundary position
// of the path closest to f.
func (m *Mesh) Node(path int, f float64) int {
	return int(m.nodeLabel[m.provisionalNode(path, f)])
}

// provisionalNode returns the path's boundary position closest to f, as
// numbered before the nodes were merged.
func (m *Mesh) provisionalNode(path int, f float64) int32 {
	nodes := m.pathNodes[path]
	k := sort.Search(len(nodes), func(k int) bool { return nodes[k].frac >= f })
	switch {
	case k == len(nodes):
		k--
	case k > 0 && f-nodes[k-1].frac < nodes[k].frac-f:
		k--
	}
	return nodes[k].node
}

func lerp(a, b r2.Vec, f float64) r2.Vec { return r2.Add(a, r2.Scale(f, r2.Sub(b, a))) }

// nodePositions returns the positions along a path, as fractions of its
// length, that become nodes: the ends 0 and 1, and the boundary positions
// f (clamped to [0, 1] and sorted in place) kept by a scan from 0 that
// skips any position closer than tol to the last node kept; a last
// interior node closer than tol to 1 is replaced by 1. Consecutive nodes
// are thus at least tol apart, unless the path is shorter than tol (then
// only 0 and 1 remain), and every position lies less than tol from a node.
func nodePositions(f []float64, tol float64) []float64 {
	for i := range f {
		f[i] = math.Min(1, math.Max(0, f[i]))
	}
	sort.Float64s(f)
	out := []float64{0}
	for _, x := range f {
		if x-out[len(out)-1] >= tol {
			out = append(out, x)
		}
	}
	switch last := out[len(out)-1]; {
	case last == 1:
	case 1-last < tol && len(out) > 1:
		out[len(out)-1] = 1
	default:
		out = append(out, 1)
	}
	return out
}
