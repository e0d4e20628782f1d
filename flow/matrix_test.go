package flow

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
)

// A tight matrix: k = 1e−18 m² (1 μD), φ = 0.05, c_t = 2e−9 1/Pa, water
// (μ = 1e−3 Pa·s): D = k/(φ μ c_t) = 1e−5 m²/s. Illustrative values.
var testMatrix = Matrix{Permeability: 1e-18, Porosity: 0.05, Compressibility: 2e-9, Viscosity: 1e-3,
	ShortestTime: 1, LongestTime: 1e4}

// faceSystem returns a one-element system (h = L = 1 m, so the two faces
// have 2 m²) with matrix m and no well: the tests drive its matrix with
// a prescribed face pressure through prepare and finish, exactly as Step
// does.
func faceSystem(t *testing.T, m Matrix) (*System, *State, *State) {
	t.Helper()
	mesh, err := BuildMesh([]Path{{P1: r2.Vec{X: 1}, Height: 1}}, nil, MeshSettings{ElementLength: 1})
	if err != nil {
		t.Fatal(err)
	}
	s, err := NewSystem(mesh, nil, Config{Fluid: testFluid, ReferencePressure: testP0, Matrix: &m})
	if err != nil {
		t.Fatal(err)
	}
	return s, s.NewState(testP0, constantAperture(testAperture)), s.NewState(testP0, constantAperture(testAperture))
}

// stepFace advances the matrix of faceSystem by dt with the face at p
// and returns the volume leaked over the step, m³.
func stepFace(s *System, cur, next *State, dt, p float64) float64 {
	s.mx.prepare(s.mesh, cur, next, dt)
	s.mx.finish(next, []float64{p})
	return s.mx.leak(0, p)
}

// A constant pressure step Δp at the face of a semi-infinite matrix: the
// pressure is p0 + Δp erfc(z/(2√(Dt))) and the volume taken per unit face
// area 2Δp φ c_t √(Dt/π) (Carslaw & Jaeger 1959, §2.4; docs/references.md
// §12.1 with the matrix's storage φ c_t in place of the fracture's). The
// error is mostly the cells' (second order in the grading r − 1): it
// falls as the cells are refined.
func TestMatrixErfc(t *testing.T) {
	const dp, tEnd, dt = 5e6, 1000.0, 1.0
	d := testMatrix.Diffusivity()
	numtest.Rel(t, "D", d, 1e-5, 1e-12)
	wantV := 2 * 2 * dp * testMatrix.Porosity * testMatrix.Compressibility * math.Sqrt(d*tEnd/math.Pi)
	run := func(cells int) (float64, *State) {
		m := testMatrix
		m.Cells = cells
		s, cur, next := faceSystem(t, m)
		var v float64
		for range int(tEnd / dt) {
			v += stepFace(s, cur, next, dt, testP0+dp)
			cur, next = next, cur
		}
		// The leaked volume is the matrix's gain of stored fluid (1000
		// steps of round-off).
		numtest.Rel(t, "leaked = stored in the matrix", v, s.MatrixContent(cur, 0), 1e-10)
		return v/wantV - 1, cur
	}
	// Measured relative volume errors: −0.90%, −0.35%, −0.18%, −0.08% for
	// 16, 24 (the default), 32 and 48 cells.
	prev := math.Inf(1)
	for _, tc := range []struct {
		cells int
		tol   float64
	}{{16, 0.012}, {DefaultMatrixCells, 0.005}, {32, 0.0025}, {48, 0.0012}} {
		e, _ := run(tc.cells)
		numtest.Abs(t, "volume error", e, 0, tc.tol)
		if !(math.Abs(e) < prev) {
			t.Errorf("%d cells: volume error %.5f does not fall below %.5f", tc.cells, e, prev)
		}
		prev = math.Abs(e)
	}

	// The profile at the cell centres of the default grid, within 0.2% of
	// Δp (measured 0.08%).
	_, st := run(0)
	z := 0.0
	checked := 0
	for j, hj := range testMatrix.CellSizes() {
		zc := z + hj/2
		z += hj
		want := testP0 + dp*math.Erfc(zc/(2*math.Sqrt(d*tEnd)))
		numtest.Abs(t, "matrix pressure", st.Matrix[j], want, 0.002*dp)
		checked++
	}
	if checked != DefaultMatrixCells {
		t.Fatalf("checked %d cells, want %d", checked, DefaultMatrixCells)
	}
}

// A finite block fills up: after many diffusion times of its half-width
// W the matrix holds φ c_t W Δp per unit face area, and no more.
func TestMatrixFiniteBlock(t *testing.T) {
	m := testMatrix
	m.HalfWidth = 0.05 // m; W²/D = 250 s
	s, cur, next := faceSystem(t, m)
	const dp = 2e6
	var v float64
	for range 200 {
		v += stepFace(s, cur, next, 50, testP0+dp)
		cur, next = next, cur
	}
	// After 10⁴ s = 40 W²/D the remaining deficit is ∝ exp(−π²/4·40), nil.
	numtest.Rel(t, "filled block", v, 2*m.Porosity*m.Compressibility*m.HalfWidth*dp, 1e-10)
}

// CellSizes: geometric, the first cell √(D·t_min)/2 thick, the cells
// filling the depth 4√(D·t_max) (semi-infinite) or the half-width; one
// cell is the whole half-width (it used to loop for ever looking for a
// growth factor that one cell cannot have).
func TestMatrixCellSizes(t *testing.T) {
	for _, tc := range []struct {
		name  string
		m     Matrix
		depth float64
		first float64
	}{
		{"semi-infinite", testMatrix, 4 * math.Sqrt(1e-5*1e4), 0.5 * math.Sqrt(1e-5*1)},
		{"finite", Matrix{Permeability: 1e-18, Porosity: 0.05, Compressibility: 2e-9, Viscosity: 1e-3, HalfWidth: 1, Cells: 10}, 1, 0.5 * math.Sqrt(1e-5)},
		{"thin block: uniform", Matrix{Permeability: 1e-18, Porosity: 0.05, Compressibility: 2e-9, Viscosity: 1e-3, HalfWidth: 1e-3, Cells: 4}, 1e-3, 2.5e-4},
		{"one cell", Matrix{Permeability: 1e-18, Porosity: 0.05, Compressibility: 2e-9, Viscosity: 1e-3, HalfWidth: 1, Cells: 1}, 1, 1},
	} {
		h := tc.m.CellSizes()
		var sum float64
		for j, v := range h {
			sum += v
			if j > 0 && v < h[j-1]*(1-1e-9) {
				t.Errorf("%s: cell %d (%g m) thinner than cell %d (%g m)", tc.name, j, v, j-1, h[j-1])
			}
		}
		numtest.Rel(t, tc.name+": depth", sum, tc.depth, 1e-12)
		numtest.Rel(t, tc.name+": first cell", h[0], tc.first, 1e-12)
	}
}

// leakSystem is a wide compliant fracture of one 10 m element fed by a
// well at its end (as in TestCarterLeakoff): it follows the well pressure
// within a fraction of a second, so the matrix sees the well's pressure
// history.
func leakSystem(t *testing.T) (*System, *State, *State, ApertureFunc) {
	t.Helper()
	mesh, err := BuildMesh([]Path{{P1: r2.Vec{X: 10}, Height: 10}}, nil, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	ap := func(p, e, dedp []float64) {
		for i := range p {
			e[i], dedp[i] = 1e-3+1e-10*(p[i]-testP0), 1e-10
		}
	}
	m := testMatrix
	m.Permeability = 1e-16 // D = 1e−3 m²/s, so the leak-off shows within minutes
	s, err := NewSystem(mesh, []int{mesh.Node(0, 0)}, Config{Fluid: testFluid, ReferencePressure: testP0, Matrix: &m})
	if err != nil {
		t.Fatal(err)
	}
	return s, s.NewState(testP0, ap), s.NewState(testP0, ap), ap
}

// The flow step with matrix leak-off keeps the mass balance
// injected − leaked − stored of every step within 1e−8 of the fluid moved
// (the step's own tolerance is 1e−10), the leaked volume is the matrix's
// gain of stored fluid, and fluid comes back from the matrix once the
// fracture's pressure falls below the matrix's: under production at
// p0 − 2 MPa after injection at p0 + 5 MPa, and after it below p0 too.
func TestMatrixLeakoffStep(t *testing.T) {
	s, cur, next, ap := leakSystem(t)
	phase := func(ctl Control, steps int) (injected, leaked float64, drawnBack bool) {
		for range steps {
			res, err := s.Step(cur, next, 5, ctl, ap, StepSettings{})
			if err != nil {
				t.Fatal(err)
			}
			moved := math.Max(math.Abs(res.Injected), math.Max(math.Abs(res.Leaked), math.Abs(res.Stored)))
			numtest.Abs(t, "step mass balance", res.MassError/moved, 0, 1e-8)
			gain := s.MatrixContent(next, 0) - s.MatrixContent(cur, 0)
			numtest.Close(t, "leaked = matrix gain", res.Leaked, gain, 1e-12*s.MatrixContent(next, 0), 1e-9)
			injected += res.Injected
			leaked += res.Leaked
			drawnBack = drawnBack || res.Leaked < 0
			cur, next = next, cur
		}
		return injected, leaked, drawnBack
	}
	start := total(cur.Content)
	inj1, leak1, back1 := phase(Control{Mode: PressureControl, Pressure: testP0 + 5e6}, 60)
	if !(leak1 > 0) || back1 {
		t.Errorf("injection: leaked %g m³, drawn back %v; want leak-off into the matrix only", leak1, back1)
	}
	inj2, leak2, back2 := phase(Control{Mode: PressureControl, Pressure: testP0 - 2e6}, 60)
	if !back2 || !(leak2 < 0) {
		t.Errorf("production below p0: leaked %g m³, drawn back %v; want fluid back from the matrix", leak2, back2)
	}
	// Over both phases the fracture's content change is what came in minus
	// what went into the matrix.
	numtest.Rel(t, "mass balance over the run", inj1+inj2-leak1-leak2, total(cur.Content)-start, 1e-8)
}

// After shut-in the fracture's pressure decays towards p0 by leak-off but
// never below it: the matrix beside it stays at or above p0 and the
// implicit system obeys the maximum principle. The shut-in runs on a
// System of the same mesh without the well (as a stage that is not
// pumped), carrying the state over, matrix pressures included.
func TestMatrixShutIn(t *testing.T) {
	s, cur, next, ap := leakSystem(t)
	for range 30 {
		if _, err := s.Step(cur, next, 5, Control{Mode: PressureControl, Pressure: testP0 + 5e6}, ap, StepSettings{}); err != nil {
			t.Fatal(err)
		}
		cur, next = next, cur
	}
	shut, err := NewSystem(s.mesh, nil, s.cfg)
	if err != nil {
		t.Fatal(err)
	}
	before := total(cur.Content) + shut.MatrixContent(cur, 0)
	lowest := math.Inf(1)
	steps := 0
	for dt := 5.0; dt < 2e5; dt *= 1.5 {
		if _, err := shut.Step(cur, next, dt, Control{}, ap, StepSettings{}); err != nil {
			t.Fatal(err)
		}
		cur, next = next, cur
		if cur.Pressure[0] > lowest+1 {
			t.Errorf("t = %.0f s: the shut-in pressure rose again, to %.6f MPa", cur.Time, cur.Pressure[0]/1e6)
		}
		lowest = math.Min(lowest, cur.Pressure[0])
		steps++
	}
	if steps == 0 {
		t.Fatal("no shut-in step")
	}
	// The pressure tolerance of a step is 1 Pa.
	if lowest < testP0-1 {
		t.Errorf("shut-in pressure fell to %.6f MPa, below p0 = %.6f MPa", lowest/1e6, testP0/1e6)
	}
	// Measured: 4.90 MPa above p0 at shut-in, 0.36 MPa after 6·10⁵ s (the
	// matrix's excess spreads as 1/√t, so the decay is slow).
	if rise := cur.Pressure[0] - testP0; !(rise < 1e6) {
		t.Errorf("after shut-in the pressure is still %.3f MPa above p0; leak-off should have drained most of it", rise/1e6)
	}
	// Nothing is lost: the fluid left the fracture for the matrix.
	numtest.Rel(t, "fracture + matrix content", total(cur.Content)+shut.MatrixContent(cur, 0), before, 1e-8)
}

func TestMatrixValidate(t *testing.T) {
	mesh, err := BuildMesh([]Path{{P1: r2.Vec{X: 1}, Height: 1}}, nil, MeshSettings{ElementLength: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		edit  func(*Matrix)
		fluid Fluid
	}{
		{"zero permeability", func(m *Matrix) { m.Permeability = 0 }, testFluid},
		{"porosity 1", func(m *Matrix) { m.Porosity = 1 }, testFluid},
		{"negative compressibility", func(m *Matrix) { m.Compressibility = -1 }, testFluid},
		{"NaN viscosity", func(m *Matrix) { m.Viscosity = math.NaN() }, testFluid},
		{"negative half-width", func(m *Matrix) { m.HalfWidth = -1 }, testFluid},
		{"too many cells", func(m *Matrix) { m.Cells = 5000 }, testFluid},
		{"with Carter's coefficient too", func(m *Matrix) {}, Fluid{Viscosity: testMu, Compressibility: testComp, Leakoff: 1e-5}},
	} {
		m := testMatrix
		tc.edit(&m)
		_, err := NewSystem(mesh, nil, Config{Fluid: tc.fluid, ReferencePressure: testP0, Matrix: &m})
		if !errors.Is(err, badinput.Err) {
			t.Errorf("%s: error %v, want bad input", tc.name, err)
		}
	}
}

// A face held below the initial pore pressure draws fluid out of the
// matrix: the diffusion is linear in p − p0, so the volume is exactly the
// negative of that of the same step above p0 (Carslaw & Jaeger 1959: the
// erfc solution scales with Δp of either sign).
func TestMatrixBelowInitialPressure(t *testing.T) {
	const dp = 3e6
	volume := func(p float64) float64 {
		s, cur, next := faceSystem(t, testMatrix)
		var v float64
		for range 100 {
			v += stepFace(s, cur, next, 2, p)
			cur, next = next, cur
		}
		return v
	}
	below, above := volume(testP0-dp), volume(testP0+dp)
	if !(below < 0) {
		t.Fatalf("face at p0 − 3 MPa leaked %g m³; want fluid drawn back (< 0)", below)
	}
	numtest.Rel(t, "drawn back = −(leaked at +Δp)", below, -above, 1e-12)
}
