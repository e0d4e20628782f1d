package flow

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// The faces between marked elements conduct with the mean of the cubes
// (Config.CubeMean): where p = σ + k·e on both sides, T·(p_j − p_i) is the
// Kirchhoff flux (hk/(48μ))·(e_j⁴ − e_i⁴)/Δx exactly (derived in System's
// documentation); for equal apertures it is the series of the halves; an
// open element passes e³/4 to a closed one ahead, where the series of
// halves passes almost nothing; unmarked faces are unchanged.
func TestCubeMeanFaces(t *testing.T) {
	const h, mu, k, sigma = 5.0, 1e-2, 4e9, 40e6
	m, err := BuildMesh([]Path{{P1: r2.Vec{X: 40}, Height: h}}, nil, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Elements) != 4 {
		t.Fatalf("%d elements, want 4", len(m.Elements))
	}
	e := []float64{2e-3, 1e-3, 1e-3, 1e-6}
	tr := func(mask []bool, i, j int32) float64 { return transmissibility(t, m, nil, mu, mask, e, i, j) }
	mask := []bool{true, true, true, true}
	dx := 10.0
	t01 := tr(mask, 0, 1)
	p0, p1 := sigma+k*e[0], sigma+k*e[1]
	numtest.Rel(t, "face flux against Kirchhoff's", t01*(p0-p1), h*k/(48*mu)*(e[0]*e[0]*e[0]*e[0]-e[1]*e[1]*e[1]*e[1])/dx, 1e-12)
	numtest.Rel(t, "equal apertures: mean = series of halves", tr(mask, 1, 2), tr(nil, 1, 2), 1e-12)
	front := tr(mask, 2, 3)
	numtest.Rel(t, "open to closed: e³/4 (within e_j/e_i)", front, h*(e[2]*e[2]*e[2]/4)/(12*mu*dx), 2*e[3]/e[2])
	if series := tr(nil, 2, 3); !(series < 1e-8*front) {
		t.Errorf("series of halves %g against the mean's %g: want almost nothing", series, front)
	}
	numtest.Rel(t, "unmarked face unchanged", tr([]bool{true, false, false, true}, 0, 1), tr(nil, 0, 1), 1e-15)
	if _, err := NewSystem(m, nil, Config{Fluid: Fluid{Viscosity: mu, Compressibility: 4.5e-10}, CubeMean: []bool{true}}); err == nil {
		t.Error("a mask of the wrong length was accepted")
	}
}

// At a junction of four elements (a marked path crossing an unmarked one)
// the two marked elements meet through the mean of cubes and every pair
// with an unmarked element through the star–delta term over all four
// halves; at a well node no two elements exchange directly, marked or not.
func TestCubeMeanAtJunctions(t *testing.T) {
	const mu = 1e-3
	m := crossingMesh(t)
	mask := make([]bool, len(m.Elements))
	e := make([]float64, len(m.Elements))
	for k := range m.Elements {
		mask[k] = m.Elements[k].Path == 0
		e[k] = 1e-4 * (1 + 0.3*math.Sin(float64(k)))
	}
	junction := -1
	for n := range m.NumNodes() {
		if m.NodeStart[n+1]-m.NodeStart[n] == 4 {
			junction = n
		}
	}
	if junction < 0 {
		t.Fatal("no junction of four elements")
	}
	el := m.NodeElems[m.NodeStart[junction]:m.NodeStart[junction+1]]
	s, err := NewSystem(m, nil, Config{Fluid: Fluid{Viscosity: mu, Compressibility: 4.5e-10}, CubeMean: mask})
	if err != nil {
		t.Fatal(err)
	}
	s.conductances(e)
	var sumA float64
	for _, k := range el {
		sumA += s.alpha[k]
	}
	checked := 0
	for a := range el {
		for b := a + 1; b < len(el); b++ {
			i, j := el[a], el[b]
			want := s.alpha[i] * s.alpha[j] / sumA
			if mask[i] && mask[j] {
				ei, ej := e[i], e[j]
				li, lj := m.Elements[i].Length, m.Elements[j].Length
				want = m.Elements[i].Height * (ei*ei*ei + ei*ei*ej + ei*ej*ej + ej*ej*ej) / 4 / (6 * mu * (li + lj))
				checked++
			}
			numtest.Rel(t, fmt.Sprintf("T between elements %d and %d at the junction", i, j), transmissibility(t, m, nil, mu, mask, e, i, j), want, 1e-12)
			if got := transmissibility(t, m, []int{junction}, mu, mask, e, i, j); got != 0 {
				t.Errorf("elements %d and %d exchange %g at a well node", i, j, got)
			}
		}
	}
	if checked != 1 {
		t.Fatalf("%d marked pairs at the junction, want 1", checked)
	}
}

// transmissibility returns T_ij of the flux matrix that a system of mesh m
// (well at wellNodes, viscosity mu, faces marked by mask) assembles at the
// apertures e: (A u_j)_i = −T_ij.
func transmissibility(t *testing.T, m *Mesh, wellNodes []int, mu float64, mask []bool, e []float64, i, j int32) float64 {
	t.Helper()
	s, err := NewSystem(m, wellNodes, Config{Fluid: Fluid{Viscosity: mu, Compressibility: 4.5e-10}, CubeMean: mask})
	if err != nil {
		t.Fatal(err)
	}
	s.conductances(e)
	s.as.Reset()
	s.assembleFlux(Control{}, e)
	a := s.as.Matrix()
	u, au := make([]float64, a.N), make([]float64, a.N)
	u[j] = 1
	a.MulVecTo(au, u)
	return -au[i]
}
