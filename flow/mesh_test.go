package flow

import (
	"math"
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
		// Cuts closer than 1 % of the element length merge.
		{"merged cuts", []float64{0.55, 0.55001}, 11, 10},
		{"cut at the end", []float64{1, 0}, 10, 9},
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
				if e.Length > 10+1e-9 {
					t.Errorf("element of %g m exceeds the element length", e.Length)
				}
			}
			numtest.Abs(t, "total length", length, 100, 1e-9)
			for _, c := range tc.cuts {
				n := m.Node(0, c)
				x := nodePosition(m, n)
				numtest.Abs(t, "cut position", x.X, 100*c, 0.01*10)
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
	paths := []Path{
		{P0: r2.Vec{X: -30}, P1: r2.Vec{X: 30}, Height: 4},
		{P0: r2.Vec{X: 10, Y: -30}, P1: r2.Vec{X: 10, Y: 20}, Height: 7},
	}
	m, err := BuildMesh(paths, []Junction{{A: 0, B: 1, SA: 40.0 / 60, SB: 0.6}}, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
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
	s.assembleFlux(Control{})
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
