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
	// ClusterNodes, when set, groups the well's nodes by perforation
	// cluster: ClusterNodes[k] are the nodes cluster k feeds, each node in
	// one cluster, together the well's nodes. System.ClusterRates then
	// reports each cluster's rate.
	ClusterNodes [][]int
	// Perforations, when set (with ClusterNodes, one cluster each), pass
	// each cluster's fluid through its perforations (limited entry):
	// the well no longer meets the fractures at infinite conductance.
	Perforations *LimitedEntry
	// CubeMean, when set (one entry per element), marks the elements whose
	// faces with one another take the mean of the apertures' cubes (see
	// System, Faces).
	CubeMean []bool
}

// System is the implicit pressure system of a mesh during one stage: one
// unknown per element, plus the bottom-hole pressure of the stage's well
// when it has one. The sparsity pattern is analysed once; every Picard
// iteration only refills values and refactors.
//
// # Faces
//
// Elements meet at a node through the star–delta rule over their halves'
// conductances α = h e³/(12μ·L/2) (cubic law, Witherspoon et al. 1980),
// T_ij = α_i α_j/Σα: for two elements the series of the halves. Where two
// elements at a node (not a well node) are both marked in
// Config.CubeMean, their face conducts with the mean of the cubes instead,
//
//	T = h·(e_i³ + e_i²e_j + e_i e_j² + e_j³)/4 / (12μ·(L_i + L_j)/2).
//
// Where the aperture follows the pressure linearly with one stiffness k,
// p = σ + k·e (a height-contained fracture: Perkins & Kern 1961), the flux
// h·e³/(12μ)·∂p/∂x is (h·k/(48μ))·∂(e⁴)/∂x, and T is the exact face value
// of that difference, (e_j⁴ − e_i⁴)/(4(e_j − e_i)) (the Kirchhoff
// transformation; derived here). It matters at a fluid front: a closed
// element ahead of it (e_j → 0) takes e_i³/4 through the face, where the
// series of halves lets nothing in and the front of a growing fracture
// could never move by the flow. For equal apertures and heights mean and
// series agree. At a node of three or more elements (a growing fracture
// meeting a trace) the marked pair takes the mean of cubes while every
// pair with an unmarked element keeps the star–delta term over all the
// node's halves: symmetric and conservative, though no longer the star's
// exact elimination. At a well node no two elements exchange directly,
// marked or not. Only conductances change: contents, and so the mass
// balance, do not.
//
// # Well
//
// The well feeds the network at its nodes (where its perforation clusters
// meet fractures or primary conduits). A well node is a member of infinite
// conductance in the star–delta rule, so the well exchanges α_k (p_w − p_k)
// with every element k at its nodes and the elements at a well node
// exchange nothing directly. Under rate control the well's row states
// Σ_k α_k (p_w − p_k) = Q; under pressure control p_w is given.
//
// # Limited entry
//
// With Config.Perforations, the fluid of cluster k passes through its
// perforations, a member of conductance γ_k, into the cluster's nodes,
// which together form one star node with the elements there (their
// memberships E_k, conductances α_i). The star–delta rule then gives
//
//	T_iw = α_i γ_k / (Σ_{E_k} α + γ_k),  T_ij = α_i α_j / (Σ_{E_k} α + γ_k)
//
// between an element and the well and between two elements of the
// cluster; γ_k → ∞ gives back the well above. The orifice law
// q = sign(Δp)·√(|Δp|/K_k) is linearised at the cluster's rate q⁰ of the
// previous iterate (Newton's method on the perforations, with the
// transmissibilities lagged as everywhere): q ≈ γ_k Δp + s_k with the
// tangent γ_k = 1/(2K_k|q⁰|) and s_k = q⁰/2, the source term entering the
// cluster's node and shared by its elements in proportion α_i/(Σα + γ_k);
// below the orifice law's linear continuation (LimitedEntry) γ_k is its
// slope and s_k = 0. A rate-driven cluster converges in two updates and a
// shared rate quadratically; at convergence every cluster's rate and
// perforation drop obey the orifice law while the clusters share the
// well's rate through it. The chord q⁰/Δp⁰ alone would not do: where the
// perforations dominate it maps a cluster's rate to its reciprocal, and
// the iterations swing between clusters without end.
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
	rhs    []float64 // b − D x at the iterate, D the diagonal additions (Assembler.Residual)
	sol    []float64 // the iterate [p; p_w]
	res    []float64 // residual b − A x
	delta  []float64 // the Newton-like increment
	// Aitken relaxation: the last increment and factor
	prevDelta []float64
	omega     float64
	// per-element work arrays of Step
	e, dedp, ePrev, leak []float64
	// quantum is Σ S_i·ulp(p_i) and wellQuantum Σ T_kw·dt·(ulp(p_k) +
	// ulp(p_w)) of the last assembly, m³: the finest content and inflow
	// balance the pressures can represent (massTolerance).
	quantum, wellQuantum float64
	// mx is the matrix leak-off model (nil: Carter's or none).
	mx *matrixLeak
	// Clusters (Config.ClusterNodes): wellCluster[c] is the cluster of
	// membership c of wellEl; clusterSumA the Σ α of each cluster.
	wellCluster []int32
	clusterSumA []float64
	// Limited entry (Config.Perforations; nil: none): gamma and source
	// hold each cluster's linearised perforations, q = γ Δp + s
	// (m³/(Pa·s), m³/s); pairs the element pairs of each cluster (indices
	// into wellEl), whose connections follow the well's in the pattern.
	perf          *LimitedEntry
	gamma, source []float64
	pairs         [][2]int32
	qWork         []float64 // per cluster: the rates of updatePerforations
}

// NewSystem analyses the system of mesh m with a well at wellNodes (none:
// nil).
func NewSystem(m *Mesh, wellNodes []int, cfg Config) (*System, error) {
	if err := cfg.Fluid.Validate(); err != nil {
		return nil, err
	}
	n := len(m.Elements)
	if cfg.CubeMean != nil && len(cfg.CubeMean) != n {
		return nil, fmt.Errorf("flow: %d cube-mean marks for %d elements", len(cfg.CubeMean), n)
	}
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
	if err := s.wellMembers(m, wellNodes, cfg); err != nil {
		return nil, err
	}
	unknowns := n
	conns := append([][2]int(nil), m.Conns...)
	if s.HasWell() {
		unknowns++
		for _, e := range s.wellEl {
			conns = append(conns, [2]int{int(e), n})
		}
		for _, pr := range s.pairs {
			conns = append(conns, [2]int{int(s.wellEl[pr[0]]), int(s.wellEl[pr[1]])})
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

// wellMembers finds the element memberships at the well's nodes, their
// clusters (Config.ClusterNodes) and, with limited entry, the element
// pairs of every cluster.
func (s *System) wellMembers(m *Mesh, wellNodes []int, cfg Config) error {
	clusterOf := map[int]int32{}
	for k, nodes := range cfg.ClusterNodes {
		for _, node := range nodes {
			if j, ok := clusterOf[node]; ok && int(j) != k {
				return fmt.Errorf("flow: well node %d is in clusters %d and %d: each node belongs to one cluster", node, j, k)
			}
			clusterOf[node] = int32(k)
		}
	}
	if cfg.Perforations != nil && cfg.Perforations.Len() != len(cfg.ClusterNodes) {
		return fmt.Errorf("flow: %d perforation clusters for %d clusters of well nodes", cfg.Perforations.Len(), len(cfg.ClusterNodes))
	}
	for _, node := range wellNodes {
		if node < 0 || node >= m.NumNodes() {
			return fmt.Errorf("flow: well node %d outside the mesh's %d nodes", node, m.NumNodes())
		}
		if s.wellAt[node] {
			continue
		}
		k, ok := clusterOf[node]
		if cfg.ClusterNodes != nil && !ok {
			return fmt.Errorf("flow: well node %d is in no cluster", node)
		}
		s.wellAt[node] = true
		for _, e := range m.NodeElems[m.NodeStart[node]:m.NodeStart[node+1]] {
			s.wellEl = append(s.wellEl, e)
			s.wellCluster = append(s.wellCluster, k)
		}
	}
	if len(wellNodes) > 0 && len(s.wellEl) == 0 {
		return fmt.Errorf("flow: the well's nodes touch no element")
	}
	for node := range clusterOf {
		if node < 0 || node >= m.NumNodes() || !s.wellAt[node] {
			return fmt.Errorf("flow: cluster node %d is not a well node", node)
		}
	}
	if cfg.ClusterNodes == nil {
		return nil
	}
	s.clusterSumA = make([]float64, len(cfg.ClusterNodes))
	if cfg.Perforations == nil {
		return nil
	}
	s.perf = cfg.Perforations
	n := s.perf.Len()
	s.gamma, s.source, s.qWork = make([]float64, n), make([]float64, n), make([]float64, n)
	for k := range s.gamma {
		s.gamma[k] = s.perf.Conductance(k, 0) // the linear branch: the steepest
	}
	for a := range s.wellEl {
		for b := a + 1; b < len(s.wellEl); b++ {
			if s.wellCluster[a] == s.wellCluster[b] && s.wellEl[a] != s.wellEl[b] {
				s.pairs = append(s.pairs, [2]int32{int32(a), int32(b)})
			}
		}
	}
	return nil
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

// face returns the conductance between elements i and j at node n,
// m³/(Pa·s), at the apertures e: the mean of the cubes where both are
// marked (Config.CubeMean), else the star–delta of the halves.
func (s *System) face(i, j int32, n int, e []float64) float64 {
	if cm := s.cfg.CubeMean; cm != nil && cm[i] && cm[j] {
		a, b := &s.mesh.Elements[i], &s.mesh.Elements[j]
		ei, ej := e[i], e[j]
		cubes := (ei*ei*ei + ei*ei*ej + ei*ej*ej + ej*ej*ej) / 4
		return (a.Height + b.Height) / 2 * cubes / (6 * s.cfg.Fluid.Viscosity * (a.Length + b.Length))
	}
	if s.sumA[n] == 0 {
		return 0
	}
	return s.alpha[i] * s.alpha[j] / s.sumA[n]
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
// the well (rate control: a connection; pressure control: diagonal terms,
// with the given pressure in wellInflow's right-hand side).
func (s *System) assembleFlux(ctl Control, e []float64) {
	pressureControl := s.holdsPressure(ctl)
	m := s.mesh
	k := 0
	for n := range s.sumA {
		el := m.NodeElems[m.NodeStart[n]:m.NodeStart[n+1]]
		for i := range el {
			for j := i + 1; j < len(el); j++ {
				t := 0.0
				if !s.wellAt[n] {
					t = s.face(el[i], el[j], n, e)
				}
				s.as.AddConnection(k, t)
				k++
			}
		}
	}
	if !s.HasWell() {
		return
	}
	var total float64
	for c, e := range s.wellEl {
		a := s.wellConductance(c)
		total += a
		if pressureControl {
			s.as.AddDiagonal(int(e), a)
			continue
		}
		s.as.AddConnection(k+c, a)
	}
	k += len(s.wellEl)
	for i, pr := range s.pairs {
		a, b := pr[0], pr[1]
		cl := s.wellCluster[a]
		s.as.AddConnection(k+i, s.alpha[s.wellEl[a]]*s.alpha[s.wellEl[b]]/(s.clusterSumA[cl]+s.gamma[cl]))
	}
	if pressureControl {
		s.as.AddDiagonal(s.nElem, total)
	}
}

// wellInflow adds to f the well's terms of the residual b − A x at the
// iterate x = [p; p_w] that assembleFlux's matrix leaves out, in
// difference form: under pressure control T_kw (P − p_k) into each
// connected element and Σ T_kw (P − p_w) into the well's row; under rate
// control the rate into the well's row; with limited entry the
// perforations' source terms.
func (s *System) wellInflow(f []float64, ctl Control, x []float64) {
	if !s.HasWell() {
		return
	}
	w := s.nElem
	switch {
	case s.holdsPressure(ctl):
		var total float64
		for c, e := range s.wellEl {
			a := s.wellConductance(c)
			total += a
			f[e] += a * (ctl.Pressure - x[e])
		}
		f[w] = total * (ctl.Pressure - x[w])
	default:
		f[w] = ctl.Rate - s.sourceRate()
	}
	if s.perf != nil {
		// The perforations' source terms enter the clusters' elements.
		for c, e := range s.wellEl {
			cl := s.wellCluster[c]
			f[e] += s.source[cl] * s.alpha[e] / (s.clusterSumA[cl] + s.gamma[cl])
		}
	}
}

// sourceRate is the part of the well's rate that the perforations' source
// terms carry, Σ_k s_k Σα_k/(Σα_k + γ_k), m³/s (0 without limited entry).
func (s *System) sourceRate() float64 {
	var q float64
	for k := range s.source {
		q += s.clusterSource(k)
	}
	return q
}

// clusterSource is the part of cluster k's rate its perforations' source
// term carries into its elements, m³/s.
func (s *System) clusterSource(k int) float64 {
	return s.source[k] * s.clusterSumA[k] / (s.clusterSumA[k] + s.gamma[k])
}

// wellConductance is the conductance between the well and membership c of
// wellEl: α, or with limited entry α γ/(Σα + γ) of its cluster.
func (s *System) wellConductance(c int) float64 {
	a := s.alpha[s.wellEl[c]]
	if s.perf == nil {
		return a
	}
	k := s.wellCluster[c]
	return a * s.gamma[k] / (s.clusterSumA[k] + s.gamma[k])
}

// wellRate returns Σ T_kw (p_w − p_k), and the perforations' source
// terms: the rate into the network, m³/s.
func (s *System) wellRate(p []float64, pw float64) float64 {
	q := s.sourceRate()
	for c, e := range s.wellEl {
		q += s.wellConductance(c) * (pw - p[e])
	}
	return q
}

// sumClusters sets clusterSumA to each cluster's Σ α (after
// conductances).
func (s *System) sumClusters() {
	if s.clusterSumA == nil {
		return
	}
	clear(s.clusterSumA)
	for c, e := range s.wellEl {
		s.clusterSumA[s.wellCluster[c]] += s.alpha[e]
	}
}

// clusterRates sets dst[k] to the rate into cluster k at the element
// pressures p and bottom-hole pressure pw, m³/s (the conductances and
// perforations of the last assembly).
func (s *System) clusterRates(dst, p []float64, pw float64) {
	clear(dst)
	for k := range s.source {
		dst[k] = s.clusterSource(k)
	}
	for c, e := range s.wellEl {
		dst[s.wellCluster[c]] += s.wellConductance(c) * (pw - p[e])
	}
}

// updatePerforations linearises each cluster's perforations at its rate
// at p and pw under the present linearisation (see System, Limited entry).
func (s *System) updatePerforations(p []float64, pw float64) {
	if s.perf == nil || math.IsNaN(pw) {
		return
	}
	s.clusterRates(s.qWork, p, pw)
	for k, qk := range s.qWork {
		s.gamma[k], s.source[k] = s.perf.Tangent(k, qk)
	}
}

// ClusterRates sets dst[k] to the rate of cluster k (Config.ClusterNodes)
// in the state st, m³/s, with the apertures and perforation conductances
// of the last step; it panics without clusters.
func (s *System) ClusterRates(dst []float64, st *State) {
	if s.clusterSumA == nil || len(dst) != len(s.clusterSumA) {
		panic("flow: ClusterRates: no clusters, or dst of the wrong length")
	}
	s.clusterRates(dst, st.Pressure, st.BHP)
}

// maxAbsDiff returns max |a_i − b_i|.
func maxAbsDiff(a, b []float64) float64 {
	var d float64
	for i := range a {
		d = max(d, math.Abs(a[i]-b[i]))
	}
	return d
}
