package flow

import (
	"fmt"
	"math"

	"slipfront/internal/badinput"
)

// Fluid is a slightly compressible Newtonian fluid.
type Fluid struct {
	// Viscosity μ, Pa·s.
	Viscosity float64
	// Compressibility c_f, 1/Pa.
	Compressibility float64
	// Leakoff is Carter's leak-off coefficient C_L into the rock matrix,
	// m/√s; 0 for none.
	Leakoff float64
}

// Validate reports a non-physical fluid.
func (f Fluid) Validate() error {
	switch {
	case !(f.Viscosity > 0):
		return fmt.Errorf("flow: viscosity %g Pa·s must be > 0", f.Viscosity)
	case !(f.Compressibility > 0):
		return fmt.Errorf("flow: compressibility %g 1/Pa must be > 0", f.Compressibility)
	case !(f.Leakoff >= 0):
		return fmt.Errorf("flow: leak-off coefficient %g m/√s must be ≥ 0", f.Leakoff)
	}
	return nil
}

// Config fixes the physics of a System.
type Config struct {
	Fluid Fluid
	// ReferencePressure p_ref is the pressure at which fluid content is
	// measured (the initial pore pressure), Pa.
	ReferencePressure float64
	// Linear configures the linear solver.
	Linear Settings
	// Matrix, when set, is the rock matrix the fractures leak off into by
	// pressure diffusion, in place of Carter's coefficient (which must
	// then be 0).
	Matrix *Matrix
}

// System is the implicit pressure system of a mesh during one stage: one
// unknown per element, plus the bottom-hole pressure of the stage's well
// when it has one. The sparsity pattern is analysed once; every Picard
// iteration only refills values and refactors.
//
// # Well
//
// The well feeds the network at its nodes (where its perforation clusters
// meet fractures or primary conduits). A well node is a member of infinite
// conductance in the star–delta rule, so the well exchanges α_k (p_w − p_k)
// with every element k at its nodes and the elements at a well node
// exchange nothing directly. Under rate control the well's row states
// Σ_k α_k (p_w − p_k) = Q; under pressure control p_w is given.
type System struct {
	mesh   *Mesh
	cfg    Config
	nElem  int
	wellAt []bool  // per node: a well node
	wellEl []int32 // elements at well nodes (one entry per node membership)
	as     *Assembler
	ls     *LinearSolver
	alpha  []float64 // half-element conductances, m³/(Pa·s)
	sumA   []float64 // per node: Σ α
	rhs    []float64
	sol    []float64 // the iterate [p; p_w]
	res    []float64 // residual b − A x
	delta  []float64 // the Newton-like increment
	// Aitken relaxation: the last increment and factor
	prevDelta []float64
	omega     float64
	// per-element work arrays of Step
	e, dedp, ePrev, leak []float64
	// mx is the matrix leak-off model (nil: Carter's or none).
	mx *matrixLeak
}

// NewSystem analyses the system of mesh m with a well at wellNodes (none:
// nil).
func NewSystem(m *Mesh, wellNodes []int, cfg Config) (*System, error) {
	if err := cfg.Fluid.Validate(); err != nil {
		return nil, err
	}
	n := len(m.Elements)
	s := &System{mesh: m, cfg: cfg, nElem: n, wellAt: make([]bool, m.NumNodes())}
	if cfg.Matrix != nil {
		if err := cfg.Matrix.Validate(); err != nil {
			return nil, err
		}
		if cfg.Fluid.Leakoff != 0 {
			return nil, badinput.Errorf("flow: Carter leak-off coefficient %g m/√s and matrix leak-off are exclusive: set one", cfg.Fluid.Leakoff)
		}
		s.mx = newMatrixLeak(cfg.Matrix.withDefaults(), n, cfg.ReferencePressure)
	}
	for _, node := range wellNodes {
		if node < 0 || node >= m.NumNodes() {
			return nil, fmt.Errorf("flow: well node %d outside the mesh's %d nodes", node, m.NumNodes())
		}
		if s.wellAt[node] {
			continue
		}
		s.wellAt[node] = true
		s.wellEl = append(s.wellEl, m.NodeElems[m.NodeStart[node]:m.NodeStart[node+1]]...)
	}
	if len(wellNodes) > 0 && len(s.wellEl) == 0 {
		return nil, fmt.Errorf("flow: the well's nodes touch no element")
	}
	unknowns := n
	conns := append([][2]int(nil), m.Conns...)
	if s.HasWell() {
		unknowns++
		for _, e := range s.wellEl {
			conns = append(conns, [2]int{int(e), n})
		}
	}
	as, err := NewAssembler(unknowns, conns)
	if err != nil {
		return nil, err
	}
	ls, err := Analyze(as.Matrix(), cfg.Linear)
	if err != nil {
		return nil, err
	}
	s.as, s.ls = as, ls
	s.alpha = make([]float64, n)
	s.sumA = make([]float64, m.NumNodes())
	s.rhs = make([]float64, unknowns)
	s.sol = make([]float64, unknowns)
	s.res = make([]float64, unknowns)
	s.delta = make([]float64, unknowns)
	s.prevDelta = make([]float64, unknowns)
	return s, nil
}

// HasWell reports whether the system has a bottom-hole pressure unknown.
func (s *System) HasWell() bool { return len(s.wellEl) > 0 }

// Solver returns the linear solver (for its statistics).
func (s *System) Solver() *LinearSolver { return s.ls }

// Content returns the fluid content of element i, m³ at the reference
// density: the pore volume h·L·e times the linearised density ratio
// 1 + c_f (p − p_ref).
func (s *System) Content(i int, e, p float64) float64 {
	el := &s.mesh.Elements[i]
	return el.Height * el.Length * e * (1 + s.cfg.Fluid.Compressibility*(p-s.cfg.ReferencePressure))
}

// conductances sets α_k = h e³ / (12 μ L/2) (cubic law, Witherspoon et al.
// 1980) and the per-node sums.
func (s *System) conductances(e []float64) {
	mu := s.cfg.Fluid.Viscosity
	for k := range s.alpha {
		el := &s.mesh.Elements[k]
		s.alpha[k] = el.Height * e[k] * e[k] * e[k] / (6 * mu * el.Length)
	}
	m := s.mesh
	for n := range s.sumA {
		var sum float64
		for _, k := range m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]] {
			sum += s.alpha[k]
		}
		s.sumA[n] = sum
	}
}

// assembleFlux adds the transmissibilities of the mesh connections and of
// the well (rate control: a connection; pressure control: diagonal terms
// and the given pressure on the right-hand side).
func (s *System) assembleFlux(ctl Control) {
	pressureControl := s.holdsPressure(ctl)
	m := s.mesh
	k := 0
	for n := range s.sumA {
		el := m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]]
		for i := range el {
			for j := i + 1; j < len(el); j++ {
				t := 0.0
				if !s.wellAt[n] && s.sumA[n] > 0 {
					t = s.alpha[el[i]] * s.alpha[el[j]] / s.sumA[n]
				}
				s.as.AddConnection(k, t)
				k++
			}
		}
	}
	if !s.HasWell() {
		return
	}
	w := s.nElem
	var total float64
	for c, e := range s.wellEl {
		a := s.alpha[e]
		total += a
		if pressureControl {
			s.as.AddDiagonal(int(e), a)
			s.rhs[e] += a * ctl.Pressure
			continue
		}
		s.as.AddConnection(k+c, a)
	}
	switch {
	case pressureControl:
		s.as.AddDiagonal(w, total)
		s.rhs[w] = total * ctl.Pressure
	default:
		s.rhs[w] = ctl.Rate
	}
}

// wellRate returns Σ α_k (p_w − p_k): the rate into the network, m³/s.
func (s *System) wellRate(p []float64, pw float64) float64 {
	var q float64
	for _, e := range s.wellEl {
		q += s.alpha[e] * (pw - p[e])
	}
	return q
}

// maxAbsDiff returns max |a_i − b_i|.
func maxAbsDiff(a, b []float64) float64 {
	var d float64
	for i := range a {
		d = math.Max(d, math.Abs(a[i]-b[i]))
	}
	return d
}
