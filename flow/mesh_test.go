package flow

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

func TestBuildMeshSinglePath(t *testing.T) {
	tests := []struct {
		name     string
		cuts     []float64
		elements int
		conns    int
	}{
		{"uniform", nil, 10, 9},
		// A cut at 55 m: 0–55 m in 6 elements, 55–100 m in 5.
		{"cut", []float64{0.55}, 11, 10},
		// Cuts closer than the minimum element length (2.5 m) share a node.
		{"merged cuts", []float64{0.55, 0.55001}, 11, 10},
		{"cuts 2 m apart", []float64{0.55, 0.57}, 11, 10},
		// 3 m apart: both are nodes, with a 3 m element between them.
		{"cuts 3 m apart", []float64{0.55, 0.58}, 12, 11},
		{"cut at the end", []float64{1, 0}, 10, 9},
		// 1 m from the end: the end node serves it.
		{"cut near the end", []float64{0.99}, 10, 9},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			paths := []Path{{P0: r2.Vec{}, P1: r2.Vec{X: 100}, Height: 5, Cuts: tc.cuts}}
			m, err := BuildMesh(paths, nil, MeshSettings{ElementLength: 10})
			if err != nil {
				t.Fatal(err)
			}
			if len(m.Elements) != tc.elements || len(m.Conns) != tc.conns {
				t.Fatalf("%d elements, %d connections; want %d, %d", len(m.Elements), len(m.Conns), tc.elements, tc.conns)
			}
			var length float64
			for _, e := range m.Elements {
				length += e.Length
				if e.Length > 10+1e-9 || e.Length < 2.5-1e-9 {
					t.Errorf("element of %g m outside [2.5, 10] m", e.Length)
				}
			}
			numtest.Abs(t, "total length", length, 100, 1e-9)
			for _, c := range tc.cuts {
				n := m.Node(0, c)
				x := nodePosition(m, n)
				if d := math.Abs(x.X - 100*c); d >= 2.5 {
					t.Errorf("cut at %g m lands on a node %g m away", 100*c, d)
				}
			}
		})
	}
}

// nodePosition returns a point shared by the elements at node n.
func nodePosition(m *Mesh, n int) r2.Vec {
	el := m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]]
	e := m.Elements[el[0]]
	if len(el) == 1 { // a path end
		if el[0] == 0 {
			return e.P0
		}
		return e.P1
	}
	o := m.Elements[el[1]]
	for _, p := range []r2.Vec{e.P0, e.P1} {
		if r2.Norm(r2.Sub(p, o.P0)) < 1e-9 || r2.Norm(r2.Sub(p, o.P1)) < 1e-9 {
			return p
		}
	}
	return e.P1
}

// A bent path (an L of legs 60 m east and 40 m north) meshes like a
// straight one of its length: its vertex is a node, every element lies on
// one leg, consecutive elements share their ends, a cut lands at its
// fraction of the length along the legs, and a junction with a path
// crossing the second leg joins them there.
func TestBuildMeshBentPath(t *testing.T) {
	bent := Path{P0: r2.Vec{}, Via: []r2.Vec{{X: 60}}, P1: r2.Vec{X: 60, Y: 40}, Height: 5, Cuts: []float64{0.8}}
	numtest.Abs(t, "length", bent.Length(), 100, 1e-12)
	numtest.Abs(t, "At(0.3).X", bent.At(0.3).X, 30, 1e-12)
	numtest.Abs(t, "At(0.8).Y", bent.At(0.8).Y, 20, 1e-12)
	// The second path crosses the north leg at (60, 30): 90 % of the bent
	// path's length, half of its own.
	across := Path{P0: r2.Vec{X: 50, Y: 30}, P1: r2.Vec{X: 70, Y: 30}, Height: 5}
	m, err := BuildMesh([]Path{bent, across}, []Junction{{A: 0, B: 1, SA: 0.9, SB: 0.5}}, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	var length float64
	var own []Element
	for _, e := range m.Elements {
		if e.Path == 0 {
			own = append(own, e)
			length += e.Length
		}
	}
	if len(own) != 10 {
		t.Fatalf("%d elements on the bent path, want 10", len(own))
	}
	numtest.Abs(t, "total length", length, 100, 1e-9)
	for k, e := range own {
		onEast := e.P0.Y == 0 && e.P1.Y == 0
		onNorth := math.Abs(e.P0.X-60) < 1e-9 && math.Abs(e.P1.X-60) < 1e-9
		if !onEast && !onNorth {
			t.Errorf("element %d from %v to %v lies on neither leg", k, e.P0, e.P1)
		}
		numtest.Abs(t, "element length", r2.Norm(r2.Sub(e.P1, e.P0)), e.Length, 1e-9)
		if k > 0 && r2.Norm(r2.Sub(e.P0, own[k-1].P1)) > 1e-9 {
			t.Errorf("element %d starts at %v, its neighbour ends at %v", k, e.P0, own[k-1].P1)
		}
	}
	if x := nodePosition(m, m.Node(0, 0.8)); r2.Norm(r2.Sub(x, r2.Vec{X: 60, Y: 20})) > 1e-9 {
		t.Errorf("the cut at 80 %% lands at %v, want (60, 20)", x)
	}
	if m.Node(0, 0.9) != m.Node(1, 0.5) {
		t.Error("the junction on the north leg does not join the paths")
	}
}

// Two paths crossing at their midpoints share a node of four elements.
func TestBuildMeshJunction(t *testing.T) {
	paths := []Path{
		{P0: r2.Vec{X: -50}, P1: r2.Vec{X: 50}, Height: 5},
		{P0: r2.Vec{Y: -50}, P1: r2.Vec{Y: 50}, Height: 5},
	}
	m, err := BuildMesh(paths, []Junction{{A: 0, B: 1, SA: 0.5, SB: 0.5}}, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	n := m.Node(0, 0.5)
	if n != m.Node(1, 0.5) {
		t.Fatal("the junction is two nodes")
	}
	if got := m.NodeStart[n+1] - m.NodeStart[n]; got != 4 {
		t.Fatalf("%d elements at the junction, want 4", got)
	}
	// 9 + 9 along the paths, but the junction node has 6 pairs instead of 2.
	if len(m.Conns) != 9+9-2+6 {
		t.Errorf("%d connections, want %d", len(m.Conns), 9+9-2+6)
	}
}

func TestBuildMeshErrors(t *testing.T) {
	ok := []Path{{P1: r2.Vec{X: 1}, Height: 1}}
	if _, err := BuildMesh(ok, nil, MeshSettings{}); err == nil {
		t.Error("zero element length accepted")
	}
	for _, f := range []float64{-0.1, 0.6, math.NaN()} {
		if _, err := BuildMesh(ok, nil, MeshSettings{ElementLength: 1, MinElementFraction: f}); err == nil {
			t.Errorf("minimum element fraction %g accepted", f)
		}
	}
	if _, err := BuildMesh([]Path{{P1: r2.Vec{X: 1}}}, nil, MeshSettings{ElementLength: 1}); err == nil {
		t.Error("zero height accepted")
	}
	if _, err := BuildMesh(ok, []Junction{{A: 0, B: 3}}, MeshSettings{ElementLength: 1}); err == nil {
		t.Error("junction to a missing path accepted")
	}
}

// The star–delta transmissibilities are symmetric and conserve flux: the
// flows they give out of each element equal those of the star with the
// node at its equilibrium pressure p_n = Σα_k p_k / Σα_k (Karimi-Fard,
// Durlofsky & Aziz 2004, eqs. 9–11).
func TestStarDeltaConservesFlux(t *testing.T) {
	m := crossingMesh(t)
	s, err := NewSystem(m, nil, Config{Fluid: Fluid{Viscosity: 1e-3, Compressibility: 4.5e-10}})
	if err != nil {
		t.Fatal(err)
	}
	e := make([]float64, len(m.Elements))
	p := make([]float64, len(m.Elements))
	for i := range e {
		e[i] = 1e-4 * (1 + 0.3*math.Sin(float64(i)))
		p[i] = 30e6 + 1e5*math.Cos(float64(3*i))
	}
	s.conductances(e)
	s.as.Reset()
	s.assembleFlux(Control{}, e)
	a := s.as.Matrix()
	ap := make([]float64, len(p))
	a.MulVecTo(ap, p) // (A p)_i = Σ_j T_ij (p_i − p_j)
	for n := range m.NumNodes() {
		el := m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]]
		if len(el) != 4 {
			continue
		}
		var sa, sap float64
		for _, k := range el {
			sa += s.alpha[k]
			sap += s.alpha[k] * p[k]
		}
		pn := sap / sa
		for _, k := range el {
			star := s.alpha[k] * (p[k] - pn)
			// The element's other node contributes too; subtract it.
			other := otherNodeFlux(m, s, p, int(k), n)
			numtest.Close(t, "flux out of a junction element", ap[k]-other, star, 1e-22, 1e-9)
		}
		return
	}
	t.Fatal("no junction node found")
}

// crossingMesh is two paths of heights 4 m and 7 m crossing at a node of
// four elements, on 10 m elements.
func crossingMesh(t *testing.T) *Mesh {
	t.Helper()
	paths := []Path{
		{P0: r2.Vec{X: -30}, P1: r2.Vec{X: 30}, Height: 4},
		{P0: r2.Vec{X: 10, Y: -30}, P1: r2.Vec{X: 10, Y: 20}, Height: 7},
	}
	m, err := BuildMesh(paths, []Junction{{A: 0, B: 1, SA: 40.0 / 60, SB: 0.6}}, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// otherNodeFlux returns the flux out of element k through its node other
// than n.
func otherNodeFlux(m *Mesh, s *System, p []float64, k, n int) float64 {
	var f float64
	for o := range m.NumNodes() {
		if o == n {
			continue
		}
		el := m.NodeElems[m.NodeStart[o]:m.NodeStart[o+1]]
		member := false
		for _, x := range el {
			member = member || int(x) == k
		}
		if !member {
			continue
		}
		for _, j := range el {
			if int(j) != k {
				f += s.alpha[k] * s.alpha[j] / s.sumA[o] * (p[k] - p[j])
			}
		}
	}
	return f
}

// Junctions closer than the minimum element length share a node, near a
// path end they move to the end, and a path shorter than the minimum keeps
// one element. Element length 10 m, minimum 2.5 m.
func TestBuildMeshShortElements(t *testing.T) {
	horizontal := Path{P0: r2.Vec{}, P1: r2.Vec{X: 100}, Height: 5}
	vertical := func(x, length float64) Path {
		return Path{P0: r2.Vec{X: x, Y: -length / 2}, P1: r2.Vec{X: x, Y: length / 2}, Height: 5}
	}
	tests := []struct {
		name      string
		paths     []Path
		junctions []Junction
		// sharedNode lists junction pairs that must land on one node.
		sharedNode [][2]int
		// elementsAt is the number of elements at junction 0's node.
		elementsAt int
	}{
		{"two crossings 1 m apart", []Path{horizontal, vertical(50, 40), vertical(51, 40)},
			[]Junction{{A: 0, B: 1, SA: 0.5, SB: 0.5}, {A: 0, B: 2, SA: 0.51, SB: 0.5}}, [][2]int{{0, 1}}, 6},
		{"crossing 1 m from the end", []Path{horizontal, vertical(99, 40)},
			[]Junction{{A: 0, B: 1, SA: 0.99, SB: 0.5}}, nil, 3},
		{"path shorter than the minimum", []Path{horizontal, vertical(30, 2)},
			[]Junction{{A: 0, B: 1, SA: 0.3, SB: 0.5}}, nil, 3},
		{"crossings 3 m apart keep their nodes", []Path{horizontal, vertical(50, 40), vertical(53, 40)},
			[]Junction{{A: 0, B: 1, SA: 0.5, SB: 0.5}, {A: 0, B: 2, SA: 0.53, SB: 0.5}}, nil, 4},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m, err := BuildMesh(tc.paths, tc.junctions, MeshSettings{ElementLength: 10})
			if err != nil {
				t.Fatal(err)
			}
			checkMeshInvariants(t, m, tc.paths, tc.junctions, 10, 2.5)
			for _, pair := range tc.sharedNode {
				a, b := tc.junctions[pair[0]], tc.junctions[pair[1]]
				if m.Node(a.A, a.SA) != m.Node(b.A, b.SA) {
					t.Errorf("junctions %d and %d are on different nodes", pair[0], pair[1])
				}
			}
			n := m.Node(tc.junctions[0].A, tc.junctions[0].SA)
			if got := int(m.NodeStart[n+1] - m.NodeStart[n]); got != tc.elementsAt {
				t.Errorf("%d elements at the junction node, want %d", got, tc.elementsAt)
			}
		})
	}
}

// checkMeshInvariants checks what BuildMesh promises: every element is
// between the minimum length and the element length, except the single
// element of a path shorter than the minimum; each path's elements run
// contiguously from P0 to P1 and add up to its length; and every junction
// lands on one node that holds elements of both its paths and lies less
// than the minimum length from the junction on each path.
func checkMeshInvariants(t *testing.T, m *Mesh, paths []Path, junctions []Junction, elementLength, minLength float64) {
	t.Helper()
	const roundOff = 1e-9 // m, positions and lengths of paths up to ~100 m
	byPath := make([][]int, len(paths))
	for k, e := range m.Elements {
		byPath[e.Path] = append(byPath[e.Path], k)
	}
	for i, p := range paths {
		length := r2.Norm(r2.Sub(p.P1, p.P0))
		els := byPath[i]
		if len(els) == 0 {
			t.Fatalf("path %d has no element", i)
		}
		if length < minLength && len(els) != 1 {
			t.Errorf("path %d of %g m (shorter than the minimum) has %d elements", i, length, len(els))
		}
		var sum float64
		for q, k := range els {
			e := m.Elements[k]
			sum += e.Length
			if q > 0 && (k != els[q-1]+1 || r2.Norm(r2.Sub(e.P0, m.Elements[k-1].P1)) > roundOff) {
				t.Errorf("path %d: element %d does not follow element %d", i, k, els[q-1])
			}
			if e.Length > elementLength+roundOff || (e.Length < minLength-roundOff && length >= minLength) {
				t.Errorf("path %d (%g m): element of %g m outside [%g, %g] m", i, length, e.Length, minLength, elementLength)
			}
		}
		if r2.Norm(r2.Sub(m.Elements[els[0]].P0, p.P0)) > roundOff || r2.Norm(r2.Sub(m.Elements[els[len(els)-1]].P1, p.P1)) > roundOff {
			t.Errorf("path %d: elements do not run from P0 to P1", i)
		}
		numtest.Abs(t, "path length", sum, length, roundOff)
	}
	for k, j := range junctions {
		n := m.Node(j.A, j.SA)
		if n != m.Node(j.B, j.SB) {
			t.Errorf("junction %d: paths %d and %d meet on different nodes", k, j.A, j.B)
			continue
		}
		for _, side := range [][2]float64{{float64(j.A), j.SA}, {float64(j.B), j.SB}} {
			path, f := int(side[0]), side[1]
			if !nodeHasPath(m, n, path) {
				t.Errorf("junction %d: its node has no element of path %d", k, path)
			}
			length := r2.Norm(r2.Sub(paths[path].P1, paths[path].P0))
			if d := nodeOffset(m, n, path, f) * length; d >= minLength {
				t.Errorf("junction %d: node %g m from the crossing on path %d", k, d, path)
			}
		}
	}
}

// nodeHasPath reports whether node n holds an element of path i.
func nodeHasPath(m *Mesh, n, i int) bool {
	for _, k := range m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]] {
		if m.Elements[k].Path == i {
			return true
		}
	}
	return false
}

// nodeOffset returns the distance, as a fraction of path i, from f to the
// nearest of the path's boundary positions that became node n (+Inf if
// none did).
func nodeOffset(m *Mesh, n, i int, f float64) float64 {
	d := math.Inf(1)
	for _, pn := range m.pathNodes[i] {
		if int(m.nodeLabel[pn.node]) == n {
			d = math.Min(d, math.Abs(pn.frac-f))
		}
	}
	return d
}

// A random network of 80 segments, 1–60 m long, in a 100 m square, with
// every crossing a junction and cuts on a third of the paths: the
// invariants hold with the default minimum (a quarter of 10 m). The test
// is not vacuous: the network has boundary positions closer than the
// minimum on some path, and with a tiny minimum fraction the same network
// meshes into elements shorter than 2.5 m.
func TestBuildMeshRandomNetwork(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	const count, elementLength, minLength = 80, 10.0, 2.5
	paths := make([]Path, count)
	for i := range paths {
		c := r2.Vec{X: 100 * r.Float64(), Y: 100 * r.Float64()}
		half := 0.5 + 29.5*r.Float64()
		a := math.Pi * r.Float64()
		d := r2.Vec{X: half * math.Cos(a), Y: half * math.Sin(a)}
		paths[i] = Path{P0: r2.Sub(c, d), P1: r2.Add(c, d), Height: 5}
		if i%3 == 0 {
			paths[i].Cuts = []float64{r.Float64(), r.Float64()}
		}
	}
	var junctions []Junction
	for i := range paths {
		for j := i + 1; j < len(paths); j++ {
			if si, sj, ok := crossing(paths[i], paths[j]); ok {
				junctions = append(junctions, Junction{A: i, B: j, SA: si, SB: sj})
			}
		}
	}
	near := closePositions(paths, junctions, minLength)
	if near == 0 {
		t.Fatal("no boundary positions closer than the minimum: the test would be vacuous")
	}
	fine, err := BuildMesh(paths, junctions, MeshSettings{ElementLength: elementLength, MinElementFraction: 0.01})
	if err != nil {
		t.Fatal(err)
	}
	short := 0
	for _, e := range fine.Elements {
		if e.Length < minLength {
			short++
		}
	}
	if short == 0 {
		t.Fatal("a 1 % minimum makes no short element: the test would be vacuous")
	}
	m, err := BuildMesh(paths, junctions, MeshSettings{ElementLength: elementLength})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%d junctions, %d close boundary pairs; %d elements (%d shorter than %g m with a 1 %% minimum), %d with the default",
		len(junctions), near, len(fine.Elements), short, minLength, len(m.Elements))
	checkMeshInvariants(t, m, paths, junctions, elementLength, minLength)
	for i, p := range paths {
		for _, c := range p.Cuts {
			n := m.Node(i, c)
			if !nodeHasPath(m, n, i) || nodeOffset(m, n, i, c)*r2.Norm(r2.Sub(p.P1, p.P0)) >= minLength {
				t.Errorf("path %d: cut at %g misplaced", i, c)
			}
		}
	}
}

// crossing returns where segments a and b cross, as fractions of each.
func crossing(a, b Path) (sa, sb float64, ok bool) {
	da, db := r2.Sub(a.P1, a.P0), r2.Sub(b.P1, b.P0)
	den := da.X*db.Y - da.Y*db.X
	if den == 0 {
		return 0, 0, false
	}
	w := r2.Sub(b.P0, a.P0)
	sa = (w.X*db.Y - w.Y*db.X) / den
	sb = (w.X*da.Y - w.Y*da.X) / den
	return sa, sb, sa >= 0 && sa <= 1 && sb >= 0 && sb <= 1
}

// closePositions counts the pairs of consecutive boundary positions
// (ends, cuts, junctions) on the same path closer than minLength, m.
func closePositions(paths []Path, junctions []Junction, minLength float64) int {
	stops := make([][]float64, len(paths))
	for i, p := range paths {
		stops[i] = append([]float64{0, 1}, p.Cuts...)
	}
	for _, j := range junctions {
		stops[j.A] = append(stops[j.A], j.SA)
		stops[j.B] = append(stops[j.B], j.SB)
	}
	var n int
	for i, f := range stops {
		sort.Float64s(f)
		length := r2.Norm(r2.Sub(paths[i].P1, paths[i].P0))
		for k := 1; k < len(f); k++ {
			if (f[k]-f[k-1])*length < minLength {
				n++
			}
		}
	}
	return n
}
