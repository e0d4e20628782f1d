package flow

import (
	"math"

	"slipfront/internal/badinput"
)

// Matrix is the rock matrix beside the fractures, into which fluid leaks
// off in proportion to the pressure difference, the alternative to
// Carter's coefficient (Fluid.Leakoff).
//
// From each face of every element, pressure diffuses into the matrix in
// one dimension, normal to the face,
//
//	φ c_t ∂p/∂t = (k/μ) ∂²p/∂z²,  p(0, t) = p_element(t),
//
// from the element's initial pressure (the System's reference pressure p0,
// or the element's own when the state starts from a depleted field,
// System.NewStateAt),
// towards a no-flow plane at HalfWidth (half the spacing between parallel
// fractures) or, with HalfWidth 0, a semi-infinite matrix. For a constant
// step Δp at the face of a semi-infinite matrix this is the erfc solution
// of Carslaw & Jaeger (1959, §2.4), whose cumulative volume per unit face
// area, 2Δp φ c_t √(D t/π) with D = k/(φ μ c_t), is Carter's (1957)
// reservoir-controlled leak-off; a varying face pressure superposes such
// steps (Duhamel's theorem). Rather than summing that history, the
// diffusion is discretised: Cells finite volumes per face, graded
// geometrically from a first cell of √(D·ShortestTime)/2 at the face to the
// no-flow plane (for a semi-infinite matrix at 4√(D·LongestTime), whose
// image changes the face flux by at most 2·exp(−16) ≈ 2e−7 up to
// LongestTime; method of images, Carslaw & Jaeger 1959), integrated by
// backward Euler with the same step as the fractures. The matrix
// pressures are part of the State.
//
// Because the leak-off is driven by p − p_matrix, an element whose
// pressure falls below its neighbouring matrix pressure draws fluid back,
// and after shut-in the fractures' pressure decays towards, but never
// below, the matrix's initial pressure (p0 without depletion; the
// discrete maximum principle of the implicit M-matrix system). Each step's matrix equations are linear and independent of the
// fractures' apertures, so they are eliminated in closed form: the leaked
// volume of element i over a step is A_i p_i − B_i with A_i > 0, which
// goes on the diagonal of the pressure system and keeps it symmetric
// positive definite; at convergence the leaked volume equals the matrix's
// gain in stored fluid exactly.
type Matrix struct {
	// Permeability k of the matrix, m².
	Permeability float64
	// Porosity φ of the matrix, in (0, 1).
	Porosity float64
	// Compressibility c_t, total (pore fluid and pore volume), 1/Pa.
	Compressibility float64
	// Viscosity μ of the fluid in the matrix pores, Pa·s.
	Viscosity float64
	// HalfWidth is the distance from a fracture face to the matrix's
	// no-flow plane, m; 0 for a semi-infinite matrix.
	HalfWidth float64
	// Cells per face (default 24).
	Cells int
	// ShortestTime and LongestTime, s, bound the diffusion times the cells
	// must resolve: the smallest time step and the run's duration
	// (defaults 1 s and 10⁷ s).
	ShortestTime, LongestTime float64
}

// Defaults of Matrix.
const (
	DefaultMatrixCells        = 24
	DefaultMatrixShortestTime = 1.0
	DefaultMatrixLongestTime  = 1e7
)

// Validate reports a non-physical matrix.
func (m Matrix) Validate() error {
	switch {
	case !(m.Permeability > 0) || math.IsInf(m.Permeability, 0):
		return badinput.Errorf("flow: matrix permeability %g m²: must be finite and > 0", m.Permeability)
	case !(m.Porosity > 0 && m.Porosity < 1):
		return badinput.Errorf("flow: matrix porosity %g: must be in (0, 1)", m.Porosity)
	case !(m.Compressibility > 0) || math.IsInf(m.Compressibility, 0):
		return badinput.Errorf("flow: matrix compressibility %g 1/Pa: must be finite and > 0", m.Compressibility)
	case !(m.Viscosity > 0) || math.IsInf(m.Viscosity, 0):
		return badinput.Errorf("flow: matrix fluid viscosity %g Pa·s: must be finite and > 0", m.Viscosity)
	case !(m.HalfWidth >= 0) || math.IsInf(m.HalfWidth, 0):
		return badinput.Errorf("flow: matrix half-width %g m: must be finite and ≥ 0 (0: semi-infinite)", m.HalfWidth)
	case m.Cells < 0 || m.Cells > 1000:
		return badinput.Errorf("flow: matrix cells %d: must be in [1, 1000] (0: default %d)", m.Cells, DefaultMatrixCells)
	case !(m.ShortestTime >= 0) || !(m.LongestTime >= 0) || math.IsInf(m.ShortestTime, 0) || math.IsInf(m.LongestTime, 0):
		return badinput.Errorf("flow: matrix times %g s, %g s: must be finite and ≥ 0 (0: defaults)", m.ShortestTime, m.LongestTime)
	}
	return nil
}

// Diffusivity returns D = k/(φ μ c_t), m²/s.
func (m Matrix) Diffusivity() float64 {
	return m.Permeability / (m.Porosity * m.Viscosity * m.Compressibility)
}

func (m Matrix) withDefaults() Matrix {
	if m.Cells == 0 {
		m.Cells = DefaultMatrixCells
	}
	if m.ShortestTime == 0 {
		m.ShortestTime = DefaultMatrixShortestTime
	}
	if m.LongestTime == 0 {
		m.LongestTime = DefaultMatrixLongestTime
	}
	m.LongestTime = math.Max(m.LongestTime, m.ShortestTime)
	return m
}

// CellSizes returns the thicknesses of the matrix cells of one face, m,
// from the face outwards: geometric, with a first cell of
// min(√(D·ShortestTime)/2, depth/Cells) and the growth factor r ≥ 1 that
// fills the depth, Σ h_j = depth (HalfWidth, or 4√(D·LongestTime)); a
// single cell fills the depth.
func (m Matrix) CellSizes() []float64 {
	m = m.withDefaults()
	d := m.Diffusivity()
	depth := m.HalfWidth
	if depth == 0 {
		depth = 4 * math.Sqrt(d*m.LongestTime)
	}
	n := m.Cells
	if n == 1 {
		// No growth factor to find: the bisection below would look for
		// ever.
		return []float64{depth}
	}
	first := math.Min(0.5*math.Sqrt(d*m.ShortestTime), depth/float64(n))
	// Σ_{j<n} first·r^j = depth; the sum grows with r, so bisect r.
	fill := func(r float64) float64 {
		s, h := 0.0, first
		for range n {
			s += h
			h *= r
		}
		return s
	}
	lo, hi := 1.0, 2.0
	for fill(hi) < depth {
		hi *= 2
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		if fill(mid) < depth {
			lo = mid
		} else {
			hi = mid
		}
	}
	h := make([]float64, n)
	h[0] = first
	for j := 1; j < n; j++ {
		h[j] = h[j-1] * hi
	}
	// Absorb the bisection's rounding in the last cell so the cells fill
	// the depth exactly.
	var sum float64
	for _, v := range h[:n-1] {
		sum += v
	}
	h[n-1] = depth - sum
	return h
}

// matrixLeak is the discretised matrix of a System: the cell geometry and,
// for the current time step, the factorised cell equations and each
// element's leak-off coefficients.
type matrixLeak struct {
	n int
	// storage φ c_t h_j (m/Pa) and transmissibility of each cell's outer
	// face (k/μ)/distance (m/(Pa·s)); tFace is the fracture face's.
	storage, trans []float64
	tFace          float64
	// dt is the step the factors below belong to (0: none yet).
	dt float64
	// Thomas factors of M = diag(s/dt) + Laplacian: the modified
	// super-diagonal c' and the inverse pivots; v solves M v = tFace·e_0;
	// sdt is s/dt.
	cPrime, invPivot, v, sdt []float64
	// a and b: element i leaks a_i·(p_i − p0) − b_i over the step, m³,
	// with a_i = 2 h L dt tFace (1 − v_0) and b_i = 2 h L dt tFace u_0,i.
	// Pressures enter as excesses over p0 so that the leak-off, a small
	// difference of the two terms late in a shut-in, keeps its digits.
	a, b []float64
	// p0 is the initial pore pressure (the System's reference), Pa.
	p0 float64
}

func newMatrixLeak(m Matrix, nElem int, p0 float64) *matrixLeak {
	h := m.CellSizes()
	n := len(h)
	x := &matrixLeak{n: n, p0: p0, storage: make([]float64, n), trans: make([]float64, n),
		cPrime: make([]float64, n), invPivot: make([]float64, n), v: make([]float64, n), sdt: make([]float64, n),
		a: make([]float64, nElem), b: make([]float64, nElem)}
	mob := m.Permeability / m.Viscosity
	x.tFace = mob / (0.5 * h[0])
	for j := range h {
		x.storage[j] = m.Porosity * m.Compressibility * h[j]
		if j+1 < n {
			x.trans[j] = mob / (0.5 * (h[j] + h[j+1]))
		}
	}
	return x
}

// factor prepares the cell equations of a step dt: backward Euler,
//
//	(s_j/dt)(p_j − p_j⁰) = τ_{j−1}(p_{j−1} − p_j) − τ_j(p_j − p_{j+1}),
//
// with p_{−1} the face pressure (τ_{−1} = tFace) and τ_{n−1} = 0 (no
// flow), a tridiagonal M-matrix factorised once per step size (Thomas
// algorithm, no pivoting needed: M is diagonally dominant).
func (x *matrixLeak) factor(dt float64) {
	if dt == x.dt {
		return
	}
	x.dt = dt
	prev := 0.0 // τ_{j−1} towards the previous cell (0 for the first)
	for j := range x.n {
		diag := x.storage[j]/dt + x.trans[j]
		if j == 0 {
			diag += x.tFace
		} else {
			diag += prev
		}
		sub := -prev
		if j > 0 {
			diag -= sub * x.cPrime[j-1]
		}
		x.invPivot[j] = 1 / diag
		x.cPrime[j] = -x.trans[j] / diag
		x.sdt[j] = x.storage[j] / dt
		prev = x.trans[j]
	}
	x.v[0] = x.tFace
	for j := 1; j < x.n; j++ {
		x.v[j] = 0
	}
	x.solve(x.v)
}

// solve overwrites r with M⁻¹ r using the factors of factor.
func (x *matrixLeak) solve(r []float64) {
	r[0] *= x.invPivot[0]
	for j := 1; j < x.n; j++ {
		r[j] = (r[j] + x.trans[j-1]*r[j-1]) * x.invPivot[j]
	}
	for j := x.n - 2; j >= 0; j-- {
		r[j] -= x.cPrime[j] * r[j+1]
	}
}

// prepare computes the leak-off coefficients of every element for the
// step from cur, leaving in next the part u of the new matrix pressures'
// excess over p0 that does not depend on the face pressure
// (M u = (s/dt)·(p⁰ − p0)); the step's end adds v·(p_face − p0) and p0
// (finish).
func (x *matrixLeak) prepare(mesh *Mesh, cur, next *State, dt float64) {
	x.factor(dt)
	n := x.n
	for i := range x.a {
		u := next.Matrix[i*n : (i+1)*n]
		old := cur.Matrix[i*n : (i+1)*n]
		for j := range u {
			u[j] = x.sdt[j] * (old[j] - x.p0)
		}
		x.solve(u)
		el := &mesh.Elements[i]
		faces := 2 * el.Height * el.Length * dt * x.tFace
		x.a[i] = faces * (1 - x.v[0])
		x.b[i] = faces * u[0]
	}
}

// finish completes the new matrix pressures with the converged element
// pressures p: p_matrix = p0 + u + v·(p_i − p0).
func (x *matrixLeak) finish(next *State, p []float64) {
	n := x.n
	for i, pi := range p {
		m := next.Matrix[i*n : (i+1)*n]
		for j := range m {
			m[j] += x.p0 + x.v[j]*(pi-x.p0)
		}
	}
}

// leak returns the volume element i leaks over the step at the pressure
// p, m³.
func (x *matrixLeak) leak(i int, p float64) float64 {
	return x.a[i]*(p-x.p0) - x.b[i]
}

// MatrixContent returns the fluid stored in the matrix beside element i
// of st above the initial pore pressure p0, both faces, m³ at the
// reference density: 2 h L Σ_j φ c_t h_j (p_j − p0). Without matrix
// leak-off it returns 0.
func (s *System) MatrixContent(st *State, i int) float64 {
	x := s.mx
	if x == nil {
		return 0
	}
	el := &s.mesh.Elements[i]
	var v float64
	for j, pj := range st.Matrix[i*x.n : (i+1)*x.n] {
		v += x.storage[j] * (pj - s.cfg.ReferencePressure)
	}
	return 2 * el.Height * el.Length * v
}
