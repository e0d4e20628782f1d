package flow

import (
	"math"

	"slipfront/internal/badinput"
)

// MaxDrainageCells caps the cells of a Drainage grid (about 1000 × 1000),
// so that a cell size in the wrong unit fails with a clear error instead
// of exhausting memory: the Cholesky factor of a square grid of
// 800 × 800 cells holds 2.8·10⁷ entries (0.34 GB of values and row
// indices; measured), and grows a little faster than the cells.
const MaxDrainageCells = 1 << 20

// MaxDrainageSteps caps the time steps of Drainage.Deplete.
const MaxDrainageSteps = 100000

// drainageTol is the relative residual the linear solves must reach. The
// produced volume equals the fluid the free cells lost up to Σ_i r_i·Δt
// per step, so the target is far below DefaultTol; the direct method
// reaches it without refinement (residuals of 10⁻¹⁵ measured on
// BenchmarkDrainage's grid).
const drainageTol = 1e-12

// Drainage is one layer, of uniform thickness, on a regular map grid,
// around the propped fractures of a producing (parent) well: Deplete gives
// the change of pore pressure that months or years of production leave in
// it before a stimulation nearby. The fracture network and the matrix
// between the propped fractures drain as one equivalent medium:
// single-phase flow of a slightly compressible fluid, isothermal, in the
// map plane and averaged over the layer's height,
//
//	S ∂p/∂t = ∇·(λ ∇p),   S = φ c_t (1/Pa),   λ = k/μ (m²/(Pa·s)),
//
// with a closed outer boundary (no flow), a uniform initial pressure
// (the unknown is the change Δp from it, 0 at the start) and the Held
// cells, the parent's fractures taken as of infinite conductivity, at the
// well's pressure −drawdown throughout the production.
//
// The grid has Cols × Rows cells of DX × DY m; cell (col, row), col from
// west to east and row from south to north, has index row·Cols + col.
// Finite volumes with two-point fluxes: the face between neighbouring
// cells a and b carries the transmissibility, per metre of layer height,
//
//	T = (face length / distance between the centres) · 2λ_aλ_b/(λ_a + λ_b),
//
// the two half cells in series, exact for flow straight across the face
// (derived). Time is discretised by backward Euler. The held cells are not
// unknowns: their pressure is known, so each face between a free cell i
// and a held cell adds T to the diagonal of row i and T·(−drawdown) to its
// right-hand side. What is left on the free cells is
//
//	A = diag(S·DX·DY/Δt + Σ_held T) + Σ_faces T (e_i − e_j)(e_i − e_j)ᵀ,
//
// symmetric positive definite (every free cell has storage), the form the
// package's Cholesky solves (see the package documentation). A is an
// M-matrix, whose inverse is non-negative (Varga 1962, ch. 3, from
// memory), and A·1 = S·DX·DY/Δt + Σ_held T, so from one step to the next
// −drawdown ≤ Δp ≤ 0 in every cell for a drawdown > 0 (a discrete maximum
// principle; derived).
//
// A held cell's pressure sits at its centre: a line of held cells is a
// fracture plane through their centres, and the free cells beside it lie
// DY (a line running east–west) or DX (north–south) from it, the
// node-centred finite-difference scheme, second order in the cell size.
// The held cells' own fluid is not counted in the produced volume: it is
// at the well's pressure from the start.
type Drainage struct {
	// Cols and Rows: cells from west to east and from south to north.
	Cols, Rows int
	// DX and DY: the cell size east and north, m.
	DX, DY float64
	// Mobility holds λ = k/μ of every cell, m²/(Pa·s), finite and > 0.
	Mobility []float64
	// Storage S = φ c_t, 1/Pa, the same in every cell.
	Storage float64
	// Held lists the cells held at the well's pressure: at least one,
	// distinct, each in [0, Cols·Rows).
	Held []int
}

// Validate reports a grid that is empty, too large or not physical, and
// held cells that are missing, out of range or repeated. Its messages
// name the field and the value.
func (d Drainage) Validate() error {
	switch {
	case d.Cols < 1 || d.Rows < 1:
		return badinput.Errorf("flow: drainage grid Cols = %d, Rows = %d: want at least one column and one row", d.Cols, d.Rows)
	case d.Cols > MaxDrainageCells || d.Rows > MaxDrainageCells/d.Cols:
		return badinput.Errorf("flow: drainage grid Cols = %d, Rows = %d: %.4g cells, at most %d allowed: use larger cells or a smaller area",
			d.Cols, d.Rows, float64(d.Cols)*float64(d.Rows), MaxDrainageCells)
	case !(d.DX > 0) || math.IsInf(d.DX, 0):
		return badinput.Errorf("flow: drainage cell size DX = %g m: must be finite and > 0", d.DX)
	case !(d.DY > 0) || math.IsInf(d.DY, 0):
		return badinput.Errorf("flow: drainage cell size DY = %g m: must be finite and > 0", d.DY)
	case len(d.Mobility) != d.Cols*d.Rows:
		return badinput.Errorf("flow: drainage Mobility has %d values: want one per cell, %d × %d = %d", len(d.Mobility), d.Cols, d.Rows, d.Cols*d.Rows)
	case !(d.Storage > 0) || math.IsInf(d.Storage, 0):
		return badinput.Errorf("flow: drainage Storage = %g 1/Pa: must be finite and > 0", d.Storage)
	case len(d.Held) == 0:
		return badinput.Errorf("flow: drainage Held is empty: want at least one held cell")
	}
	for i, v := range d.Mobility {
		if !(v > 0) || math.IsInf(v, 0) {
			return badinput.Errorf("flow: drainage Mobility[%d] = %g m²/(Pa·s): must be finite and > 0", i, v)
		}
	}
	first := make(map[int]int, len(d.Held))
	for k, c := range d.Held {
		if c < 0 || c >= len(d.Mobility) {
			return badinput.Errorf("flow: drainage Held[%d] = %d: cell index must lie in [0, %d)", k, c, len(d.Mobility))
		}
		if j, ok := first[c]; ok {
			return badinput.Errorf("flow: drainage Held[%d] = %d: repeats Held[%d]", k, c, j)
		}
		first[c] = k
	}
	return nil
}

// Deplete holds the Held cells at −drawdown (Pa; > 0 draws the pressure
// down, < 0 injects) for duration seconds, in steps backward-Euler steps
// of equal length, and returns the pressure change of every cell (Pa; −drawdown in
// the held cells) and the volume produced per metre of layer height
// (m³/m; negative when injecting): the flux into the held cells summed
// over the steps,
//
//	produced = Σ_n Δt Σ_{free i, held j} T_ij (Δp_i^n + drawdown),
//
// which equals the fluid the free cells lost, −S·DX·DY·Σ_free Δp_i (the
// mass balance of the scheme, to the linear solves' residual). Zero
// production changes nothing: a duration or a drawdown of 0 gives Δp = 0
// everywhere, the held cells too, and produced = 0.
//
// The steps are equal, Δt = duration/steps, rather than growing from a
// short first step: only the state at the end is returned, and there
// backward Euler's error after the sudden drawdown (non-smooth data) is
// of order Δt/t (Thomée 2006, ch. 7, from memory), which equal steps make
// smallest; they also need a single factorization. Measured on a fracture
// crossing a grid of 1 m cells in the tests' layer (√(ηt) = 35.5 m), the
// largest error of the profile across it is 0.23 % of the drawdown after
// 60 equal steps and 0.80 % after 60 steps growing geometrically from
// duration·10⁻⁴ (0.029 % and 0.067 % after 480).
//
// The held cells' own fluid is not part of produced. Against a fracture
// plane of zero width through their centres, a line of held cells thus
// leaves out S·drawdown·DX·DY per held cell, the content of the strip it
// covers: an error of first order in the cell size in the produced
// volume, while the pressures keep second order.
func (d Drainage) Deplete(drawdown, duration float64, steps int) (dp []float64, produced float64, err error) {
	return d.DepleteHistory([]DrainagePeriod{{Drawdown: drawdown, Duration: duration}}, steps)
}

// DrainagePeriod is a time of production at one drawdown.
type DrainagePeriod struct {
	// Drawdown below the initial pressure at the held cells, Pa.
	Drawdown float64
	// Duration, s.
	Duration float64
}

// DepleteHistory is Deplete for a production history: the held cells go
// through the periods in order, each at its own drawdown. The steps are
// shared out in proportion to the periods' durations, at least one each
// (a period of zero duration takes none), equal within a period, with one
// factorization per period; the error at the end is that of the last
// period's steps (see Deplete). The held cells end at the last drawdown.
// Zero production (every drawdown or every duration 0) changes nothing.
func (d Drainage) DepleteHistory(periods []DrainagePeriod, steps int) (dp []float64, produced float64, err error) {
	if err := d.Validate(); err != nil {
		return nil, 0, err
	}
	if len(periods) == 0 {
		return nil, 0, badinput.Errorf("flow: drainage history has no period")
	}
	var total float64
	producing := false
	for k, pd := range periods {
		switch {
		case math.IsNaN(pd.Drawdown) || math.IsInf(pd.Drawdown, 0):
			return nil, 0, badinput.Errorf("flow: drainage period %d: drawdown %g Pa: must be finite", k, pd.Drawdown)
		case !(pd.Duration >= 0) || math.IsInf(pd.Duration, 0):
			return nil, 0, badinput.Errorf("flow: drainage period %d: duration %g s: must be finite and ≥ 0", k, pd.Duration)
		}
		total += pd.Duration
		producing = producing || (pd.Drawdown != 0 && pd.Duration > 0)
	}
	if steps < len(periods) || steps > MaxDrainageSteps {
		return nil, 0, badinput.Errorf("flow: drainage steps %d: must be in [%d, %d] (at least one per period)", steps, len(periods), MaxDrainageSteps)
	}
	dp = make([]float64, len(d.Mobility))
	if !producing {
		return dp, 0, nil
	}
	g := d.connect()
	last := periods[len(periods)-1].Drawdown
	for _, c := range d.Held {
		dp[c] = -last
	}
	if len(g.toHeld) == 0 {
		return dp, 0, nil // every cell is held: nothing left to drain
	}
	as, err := NewAssembler(len(g.toHeld), g.conns)
	if err != nil {
		return nil, 0, err
	}
	ls, err := Analyze(as.Matrix(), Settings{Method: Cholesky, Tol: drainageTol})
	if err != nil {
		return nil, 0, err
	}
	p, b := make([]float64, len(g.toHeld)), make([]float64, len(g.toHeld))
	for _, pd := range periods {
		if pd.Duration == 0 {
			continue
		}
		n := max(1, int(math.Round(float64(steps)*pd.Duration/total)))
		dt := pd.Duration / float64(n)
		sdt := d.Storage * d.DX * d.DY / dt
		as.Reset()
		for k, t := range g.trans {
			as.AddConnection(k, t)
		}
		for i, w := range g.toHeld {
			as.AddDiagonal(i, sdt+w)
		}
		if err := ls.Factor(as.Matrix()); err != nil {
			return nil, 0, err
		}
		for range n {
			for i, w := range g.toHeld {
				b[i] = sdt*p[i] - w*pd.Drawdown
			}
			if _, err := ls.Solve(p, b); err != nil {
				return nil, 0, err
			}
			for i, w := range g.toHeld {
				produced += dt * w * (p[i] + pd.Drawdown)
			}
		}
	}
	for c, i := range g.unknown {
		if i >= 0 {
			dp[c] = p[i]
		}
	}
	return dp, produced, nil
}

// drainageGraph is the free cells of a Drainage and their faces.
type drainageGraph struct {
	// unknown[c] is the unknown of cell c, or −1 for a held cell.
	unknown []int
	// conns and trans: the faces between two free cells, as pairs of
	// unknowns, and their transmissibilities, m³/(Pa·s) per m of height.
	conns [][2]int
	trans []float64
	// toHeld[i] is Σ T over the faces between free cell i and held cells.
	toHeld []float64
}

// connect numbers the free cells and sorts every face into a connection
// between two free cells, a coupling of a free cell to a held one, or
// nothing (two held cells).
func (d Drainage) connect() drainageGraph {
	g := drainageGraph{unknown: make([]int, len(d.Mobility))}
	for _, c := range d.Held {
		g.unknown[c] = -1
	}
	n := 0
	for c, i := range g.unknown {
		if i == 0 {
			g.unknown[c] = n
			n++
		}
	}
	g.toHeld = make([]float64, n)
	face := func(a, b int, geom float64) {
		la, lb := d.Mobility[a], d.Mobility[b]
		t := geom * 2 / (1/la + 1/lb) // the harmonic mean; λ_aλ_b cannot overflow
		switch ia, ib := g.unknown[a], g.unknown[b]; {
		case ia >= 0 && ib >= 0:
			g.conns = append(g.conns, [2]int{ia, ib})
			g.trans = append(g.trans, t)
		case ia >= 0:
			g.toHeld[ia] += t
		case ib >= 0:
			g.toHeld[ib] += t
		}
	}
	eastward, northward := d.DY/d.DX, d.DX/d.DY // face length / distance
	for row := range d.Rows {
		for col := range d.Cols {
			c := row*d.Cols + col
			if col+1 < d.Cols {
				face(c, c+1, eastward)
			}
			if row+1 < d.Rows {
				face(c, c+d.Cols, northward)
			}
		}
	}
	return g
}
