package flow

import (
	"math"
	"math/rand/v2"
)

// Test systems shaped like one implicit pressure step on a fracture
// network, following the model of docs/scripts/gen_network.py (read it
// for the rationale): sticks ("fractures") of length L with uniform
// midpoints and orientations in a square of side S = L √(2 nseg / (π k)),
// so that a stick has k intersections on average (for isotropic sticks
// k = 2 nseg L² / (π S²), docs/references.md §4.1); each stick
// split into m elements, one unknown each, numbered stick by stick;
// connections between consecutive elements and between the two elements
// holding an intersection point; transmissibility T = 10^N(0, σ₁₀);
// storage s_i = storage · U(0.5, 1.5) on the diagonal. The matrix
// diag(s) + Σ T (e_i − e_j)(e_i − e_j)ᵀ is an SPD M-matrix.

// networkParams are the model's inputs.
type networkParams struct {
	unknowns int     // target number of unknowns
	perStick int     // elements per stick, m
	k        float64 // mean intersections per stick
	sigma10  float64 // standard deviation of log10 T
	storage  float64 // mean storage/Δt relative to the geometric-mean T
}

// defaultNetwork is gen_network.py's default model for n unknowns.
func defaultNetwork(n int) networkParams {
	return networkParams{unknowns: n, perStick: 20, k: 7, sigma10: 0.5, storage: 1e-3}
}

// testSystem is a connection list with coefficients and a right-hand side.
type testSystem struct {
	n       int
	conns   [][2]int
	trans   []float64 // transmissibility of each connection
	storage []float64 // diagonal term of each unknown
	rhs     []float64
}

// newNetwork draws a network system from rng.
func newNetwork(p networkParams, rng *rand.Rand) *testSystem {
	const stickLength = 1.0
	m := p.perStick
	nseg := max(1, int(math.Round(float64(p.unknowns)/float64(m))))
	side := stickLength * math.Sqrt(2*float64(nseg)/(math.Pi*p.k))
	x0 := make([][2]float64, nseg)
	x1 := make([][2]float64, nseg)
	for s := range nseg {
		mx, my := rng.Float64()*side, rng.Float64()*side
		th := rng.Float64() * math.Pi
		hx, hy := 0.5*stickLength*math.Cos(th), 0.5*stickLength*math.Sin(th)
		x0[s] = [2]float64{mx - hx, my - hy}
		x1[s] = [2]float64{mx + hx, my + hy}
	}
	sys := &testSystem{n: nseg * m}
	for s := range nseg {
		for e := range m - 1 {
			sys.conns = append(sys.conns, [2]int{s*m + e, s*m + e + 1})
		}
	}
	for _, hit := range stickIntersections(x0, x1, stickLength, side) {
		ei := min(int(hit.ti*float64(m)), m-1)
		ej := min(int(hit.tj*float64(m)), m-1)
		sys.conns = append(sys.conns, [2]int{hit.i*m + ei, hit.j*m + ej})
	}
	sys.trans = make([]float64, len(sys.conns))
	for k := range sys.trans {
		sys.trans[k] = math.Pow(10, p.sigma10*rng.NormFloat64())
	}
	sys.storage = make([]float64, sys.n)
	sys.rhs = make([]float64, sys.n)
	for i := range sys.n {
		sys.storage[i] = p.storage * (0.5 + rng.Float64())
		s, e := i/m, i%m
		t := (float64(e) + 0.5) / float64(m)
		cx := x0[s][0] + (x1[s][0]-x0[s][0])*t
		sys.rhs[i] = sys.storage[i] * cx / side // s · p_old with a regional gradient
	}
	for range min(5, sys.n) {
		sys.rhs[rng.IntN(sys.n)] += 1 // injection at a few "well" elements
	}
	return sys
}

// stickHit is one intersection: sticks i < j at fractions ti, tj of their
// lengths.
type stickHit struct {
	i, j   int
	ti, tj float64
}

// stickIntersections finds all proper intersections among sticks of equal
// length L with a uniform grid of cell size L over their midpoints (two
// sticks can only cross if their midpoints are within L).
func stickIntersections(x0, x1 [][2]float64, L, side float64) []stickHit {
	nc := max(1, int(math.Ceil(side/L)))
	cellOf := func(s int) (int, int) {
		mx := 0.5 * (x0[s][0] + x1[s][0])
		my := 0.5 * (x0[s][1] + x1[s][1])
		return min(nc-1, max(0, int(mx/L))), min(nc-1, max(0, int(my/L)))
	}
	cells := make([][]int, nc*nc)
	for s := range x0 {
		cx, cy := cellOf(s)
		cells[cy*nc+cx] = append(cells[cy*nc+cx], s)
	}
	var hits []stickHit
	for i := range x0 {
		cx, cy := cellOf(i)
		for dy := -1; dy <= 1; dy++ {
			for dx := -1; dx <= 1; dx++ {
				ux, uy := cx+dx, cy+dy
				if ux < 0 || uy < 0 || ux >= nc || uy >= nc {
					continue
				}
				for _, j := range cells[uy*nc+ux] {
					if j <= i {
						continue
					}
					if ti, tj, ok := segmentCross(x0[i], x1[i], x0[j], x1[j]); ok {
						hits = append(hits, stickHit{i, j, ti, tj})
					}
				}
			}
		}
	}
	return hits
}

// segmentCross solves p0 + ti (p1 − p0) = q0 + tj (q1 − q0) and reports
// whether both parameters lie in [0, 1] (as gen_network.py does; parallel
// sticks never cross).
func segmentCross(p0, p1, q0, q1 [2]float64) (ti, tj float64, ok bool) {
	d1 := [2]float64{p1[0] - p0[0], p1[1] - p0[1]}
	d2 := [2]float64{q1[0] - q0[0], q1[1] - q0[1]}
	w := [2]float64{q0[0] - p0[0], q0[1] - p0[1]}
	den := d1[0]*d2[1] - d1[1]*d2[0]
	if math.Abs(den) <= 1e-12 {
		return 0, 0, false
	}
	ti = (w[0]*d2[1] - w[1]*d2[0]) / den
	tj = (w[0]*d1[1] - w[1]*d1[0]) / den
	return ti, tj, ti >= 0 && ti <= 1 && tj >= 0 && tj <= 1
}

// assembler builds the Assembler of the system and fills its values.
func (sys *testSystem) assembler() *Assembler {
	as, err := NewAssembler(sys.n, sys.conns)
	if err != nil {
		panic(err)
	}
	sys.fill(as)
	return as
}

// fill resets as and adds every storage and connection term.
func (sys *testSystem) fill(as *Assembler) {
	as.Reset()
	for i, s := range sys.storage {
		as.AddDiagonal(i, s)
	}
	for k, t := range sys.trans {
		as.AddConnection(k, t)
	}
}

// chainSystem is a single chain of n unknowns (a long fracture): storage
// s on every unknown, transmissibilities drawn like the network's.
func chainSystem(n int, s float64, rng *rand.Rand) *testSystem {
	sys := &testSystem{n: n, storage: make([]float64, n), rhs: make([]float64, n)}
	for i := range n - 1 {
		sys.conns = append(sys.conns, [2]int{i, i + 1})
		sys.trans = append(sys.trans, math.Pow(10, 0.5*rng.NormFloat64()))
	}
	for i := range n {
		sys.storage[i] = s * (0.5 + rng.Float64())
		sys.rhs[i] = rng.Float64() - 0.5
	}
	return sys
}

// merge returns the block-diagonal union of the systems: unknowns and
// connections of each are shifted past the previous ones.
func merge(parts ...*testSystem) *testSystem {
	out := &testSystem{}
	for _, p := range parts {
		for _, c := range p.conns {
			out.conns = append(out.conns, [2]int{c[0] + out.n, c[1] + out.n})
		}
		out.trans = append(out.trans, p.trans...)
		out.storage = append(out.storage, p.storage...)
		out.rhs = append(out.rhs, p.rhs...)
		out.n += p.n
	}
	return out
}
