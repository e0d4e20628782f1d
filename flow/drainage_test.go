package flow

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
)

// A tight layer: k = 1e−18 m² (1 μD) and μ = 1e−3 Pa·s give λ = 1e−15
// m²/(Pa·s); φ = 0.05 and c_t = 1e−9 1/Pa give S = 5e−11 1/Pa; so
// η = λ/S = 2e−5 m²/s, and over two years of production (6.3e7 s) the
// diffusion length √(ηt) is 35.5 m. Illustrative values.
const (
	drainMobility = 1e-15
	drainStorage  = 5e-11
	drainTime     = 6.3e7
	drainDrawdown = 10e6
)

// uniformMobility returns n cells of mobility drainMobility.
func uniformMobility(n int) []float64 {
	m := make([]float64, n)
	for i := range m {
		m[i] = drainMobility
	}
	return m
}

// lineFracture is a straight fracture of held cells in a uniform layer.
type lineFracture struct {
	Drainage
	// cell returns the index of the cell at (along, across), counted
	// along and across the fracture; the fracture is the line
	// across = mid, and its middle the cell (centre, mid).
	cell        func(along, across int) int
	centre, mid int
}

// newLineFracture lays out a grid with cells h across the fracture and
// 2h along it (elongated cells, so that DX and DY mixed up show), reaching
// side m to either side of the fracture; the fracture holds 2·held+1
// cells in the middle of a line of 2·(held+margin)+1. It runs east–west,
// or north–south when northSouth is set.
func newLineFracture(h, side float64, held, margin int, northSouth bool) lineFracture {
	mid := int(math.Round(side / h))
	nAlong, nAcross := 2*(held+margin)+1, 2*mid+1
	f := lineFracture{centre: held + margin, mid: mid}
	if northSouth {
		f.Drainage = Drainage{Cols: nAcross, Rows: nAlong, DX: h, DY: 2 * h}
		f.cell = func(along, across int) int { return along*nAcross + across }
	} else {
		f.Drainage = Drainage{Cols: nAlong, Rows: nAcross, DX: 2 * h, DY: h}
		f.cell = func(along, across int) int { return across*nAlong + along }
	}
	f.Mobility = uniformMobility(nAlong * nAcross)
	f.Storage = drainStorage
	for a := margin; a < nAlong-margin; a++ {
		f.Held = append(f.Held, f.cell(a, mid))
	}
	return f
}

// erfcError returns the largest difference, as a fraction of the
// drawdown, between dp across the middle of the fracture and the
// semi-infinite solution −drawdown·erfc(x/(2√(ηt))), x the distance from
// the fracture plane through the held cells' centres.
func (f lineFracture) erfcError(dp []float64, h float64) float64 {
	l := math.Sqrt(drainMobility / drainStorage * drainTime)
	var e float64
	for j := 1; j <= f.mid; j++ {
		want := -drainDrawdown * math.Erfc(float64(j)*h/(2*l))
		for _, across := range []int{f.mid - j, f.mid + j} {
			e = math.Max(e, math.Abs(dp[f.cell(f.centre, across)]-want))
		}
	}
	return e / drainDrawdown
}

// Linear flow to a long fracture of infinite conductivity held at
// −drawdown: across its middle, far from its tips, the pressure change is
// the semi-infinite one-dimensional −drawdown·erfc(x/(2√(ηt))) (Carslaw &
// Jaeger 1959, §2.4, from memory; docs/references.md §12.1), x measured
// from the plane through the held cells' centres (the scheme's fracture
// plane, see Drainage). The fracture is 4.5 diffusion lengths long on
// either side of the middle and the closed boundary 6.3 away, whose image
// changes the profile by erfc(6.3) < 1e−5 of the drawdown (method of
// images, Carslaw & Jaeger 1959, from memory).
//
// Each level halves the cells and takes four times the steps: the error
// of the finite volumes is second order in the cell size (the node-centred
// difference scheme) and backward Euler's first order in the step, so
// the error should fall about fourfold (common practice, no source).
// Measured: 1.01 %, 0.255 %, 0.0665 % of the drawdown, both orientations.
func TestDrainageLinearFlow(t *testing.T) {
	for _, northSouth := range []bool{false, true} {
		prev := math.Inf(1)
		for _, tc := range []struct {
			h     float64
			steps int
			tol   float64
		}{
			{16, 15, 0.015},
			{8, 60, 0.004},
			{4, 240, 0.001},
		} {
			// Half-length 160 m and 96 m of layer beyond the tips, in cells
			// 2h long.
			f := newLineFracture(tc.h, 224, int(80/tc.h), int(48/tc.h), northSouth)
			dp, _, err := f.Deplete(drainDrawdown, drainTime, tc.steps)
			if err != nil {
				t.Fatal(err)
			}
			e := f.erfcError(dp, tc.h)
			t.Logf("north–south %v, h = %g m, %d steps: max error %.3g %% of the drawdown", northSouth, tc.h, tc.steps, 100*e)
			numtest.Abs(t, "profile error", e, 0, tc.tol)
			if !(e < 0.35*prev) {
				t.Errorf("north–south %v, h = %g m: error %.3g does not fall below 0.35 × %.3g", northSouth, tc.h, e, prev)
			}
			prev = e
		}
	}
}

// The produced volume is the fluid the free cells lost,
// produced = −S·DX·DY·Σ_free Δp (the scheme's mass balance: summing the
// free cells' equations, the fluxes between free cells cancel in pairs;
// common practice, no source), to the linear solves' round-off, here on a
// heterogeneous layer with a crooked fracture and a lone held cell, for
// production and for injection. Every cell stays between the well's
// pressure and the initial one (the discrete maximum principle of the
// implicit M-matrix scheme; Varga 1962, ch. 3, from memory;
// docs/references.md §16).
func TestDrainageMassBalance(t *testing.T) {
	const cols, rows = 48, 36
	d := Drainage{Cols: cols, Rows: rows, DX: 12, DY: 7, Storage: drainStorage, Mobility: make([]float64, cols*rows)}
	rnd := rand.New(rand.NewPCG(3, 4))
	for i := range d.Mobility {
		d.Mobility[i] = drainMobility * math.Exp(1.5*rnd.NormFloat64()) // log-normal, σ = 1.5
	}
	for k := range 20 {
		d.Held = append(d.Held, (8+k/2)*cols+10+k)
	}
	d.Held = append(d.Held, 30*cols+40)
	held := make(map[int]bool)
	for _, c := range d.Held {
		held[c] = true
	}
	for _, tc := range []struct {
		drawdown float64
		steps    int
	}{
		{drainDrawdown, 25},
		{-5e6, 7},
	} {
		dp, produced, err := d.Deplete(tc.drawdown, drainTime, tc.steps)
		if err != nil {
			t.Fatal(err)
		}
		var lost float64
		lo, hi := math.Min(0, -tc.drawdown), math.Max(0, -tc.drawdown)
		for c, v := range dp {
			if held[c] {
				continue
			}
			lost -= drainStorage * d.DX * d.DY * v
			if v < lo-1e-9*math.Abs(tc.drawdown) || v > hi+1e-9*math.Abs(tc.drawdown) {
				t.Errorf("drawdown %g Pa: cell %d: Δp = %g Pa outside [%g, %g]", tc.drawdown, c, v, lo, hi)
			}
		}
		if math.Abs(lost) < 1e-3*drainStorage*math.Abs(tc.drawdown)*d.DX*d.DY*cols*rows {
			t.Fatalf("drawdown %g Pa: the layer lost only %g m³/m: the test does not drain it", tc.drawdown, lost)
		}
		numtest.Rel(t, "produced = lost by the free cells", produced, lost, 1e-9)
	}
}

// The scheme is linear and its steps are time-invariant, so a history
// superposes exactly (Duhamel's principle; Carslaw & Jaeger 1959, §1.14,
// from memory): d1 for t, then d2 for t, equals d1 for 2t plus (d2 − d1)
// for the last t, when every period steps with the same Δt. Checked on the
// heterogeneous layer of the mass-balance test, for the pressures and the
// produced volume, to the linear solves' round-off; and a history of one
// drawdown split in two periods is that drawdown held throughout.
func TestDrainageHistorySuperposes(t *testing.T) {
	const cols, rows, n = 30, 24, 12
	d := Drainage{Cols: cols, Rows: rows, DX: 9, DY: 6, Storage: drainStorage, Mobility: make([]float64, cols*rows)}
	rnd := rand.New(rand.NewPCG(7, 8))
	for i := range d.Mobility {
		d.Mobility[i] = drainMobility * math.Exp(rnd.NormFloat64())
	}
	for k := range 10 {
		d.Held = append(d.Held, 12*cols+8+k)
	}
	const d1, d2 = 12e6, 4e6
	history, hp, err := d.DepleteHistory([]DrainagePeriod{{d1, drainTime}, {d2, drainTime}}, 2*n)
	if err != nil {
		t.Fatal(err)
	}
	whole, wp, err := d.Deplete(d1, 2*drainTime, 2*n)
	if err != nil {
		t.Fatal(err)
	}
	change, cp, err := d.Deplete(d2-d1, drainTime, n)
	if err != nil {
		t.Fatal(err)
	}
	for c := range history {
		numtest.Abs(t, fmt.Sprintf("cell %d: history against the superposition, Pa", c), history[c], whole[c]+change[c], 1e-9*d1)
	}
	numtest.Rel(t, "produced: history against the superposition", hp, wp+cp, 1e-9)
	split, sp, err := d.DepleteHistory([]DrainagePeriod{{d1, drainTime}, {d1, drainTime}}, 2*n)
	if err != nil {
		t.Fatal(err)
	}
	for c := range split {
		numtest.Abs(t, fmt.Sprintf("cell %d: one drawdown in two periods, Pa", c), split[c], whole[c], 1e-9*d1)
	}
	numtest.Rel(t, "produced: one drawdown in two periods", sp, wp, 1e-12)
	if _, _, err := d.DepleteHistory([]DrainagePeriod{{d1, drainTime}, {d2, drainTime}}, 1); err == nil ||
		!strings.Contains(err.Error(), "at least one per period") {
		t.Errorf("one step for two periods: %v", err)
	}
}

// One step on a chain of four cells whose second is held, against the
// scheme as Drainage documents it (derived): backward Euler,
//
//	(s/Δt + T_01) p_0 = −T_01 d,
//	(s/Δt + T_12 + T_23) p_2 − T_23 p_3 = −T_12 d,
//	−T_23 p_2 + (s/Δt + T_23) p_3 = 0,
//
// s = S·DX·DY, d the drawdown, T_ab = (face/distance)·2λ_aλ_b/(λ_a+λ_b),
// solved by Cramer's rule, and produced = Δt·(T_01 (p_0 + d) + T_12 (p_2 + d)).
// The mobilities differ a hundredfold across the faces, where the
// harmonic mean and the arithmetic one part by a factor of 25. The chain
// runs east, then north, so face length over distance is DY/DX, then
// DX/DY.
func TestDrainageOneStep(t *testing.T) {
	const dx, dy, dt, d = 4.0, 9.0, 1e6, drainDrawdown
	lambda := []float64{drainMobility, 100 * drainMobility, 0.5 * drainMobility, 3 * drainMobility}
	harmonic := func(a, b float64) float64 { return 2 * a * b / (a + b) }
	for _, tc := range []struct {
		name       string
		cols, rows int
		geom       float64
	}{
		{"east", 4, 1, dy / dx},
		{"north", 1, 4, dx / dy},
	} {
		dr := Drainage{Cols: tc.cols, Rows: tc.rows, DX: dx, DY: dy, Storage: drainStorage, Mobility: lambda, Held: []int{1}}
		dp, produced, err := dr.Deplete(d, dt, 1)
		if err != nil {
			t.Fatal(err)
		}
		s := drainStorage * dx * dy / dt
		t01 := tc.geom * harmonic(lambda[0], lambda[1])
		t12 := tc.geom * harmonic(lambda[1], lambda[2])
		t23 := tc.geom * harmonic(lambda[2], lambda[3])
		p0 := -t01 * d / (s + t01)
		a, b, c := s+t12+t23, -t23, s+t23 // the 2 × 2 block [a b; b c]
		det := a*c - b*b
		p2 := -t12 * d * c / det
		p3 := t12 * d * b / det
		numtest.Rel(t, tc.name+": Δp_0", dp[0], p0, 1e-12)
		numtest.Rel(t, tc.name+": Δp_1 (held)", dp[1], -d, 1e-15)
		numtest.Rel(t, tc.name+": Δp_2", dp[2], p2, 1e-12)
		numtest.Rel(t, tc.name+": Δp_3", dp[3], p3, 1e-12)
		numtest.Rel(t, tc.name+": produced", produced, dt*(t01*(p0+d)+t12*(p2+d)), 1e-12)
	}
}

// The cumulative volume drained through both faces of a fracture of
// length L, per metre of height, is 2·L·2·drawdown·S·√(ηt/π) (Carslaw &
// Jaeger 1959, §2.4, from memory; Carter 1957; docs/references.md §12.1).
// The fracture crosses the whole grid from west to east, so the closed
// east and west boundaries are planes of symmetry of an infinitely long
// fracture (method of images) and there are no tips. The closed form
// drains the layer from the fracture plane on, the scheme from the held
// cells' edges: the held strip's content S·drawdown·DX·DY per held cell
// is added before comparing (see Deplete). With many steps the error is
// the cells': measured +0.315 %, +0.0763 %, +0.0167 % for 8, 4 and 2 m.
func TestDrainageProducedVolume(t *testing.T) {
	l := math.Sqrt(drainMobility / drainStorage * drainTime)
	prev := math.Inf(1)
	for _, tc := range []struct {
		h   float64
		tol float64
	}{
		{8, 0.004},
		{4, 0.001},
		{2, 0.0003},
	} {
		// Rows reach 6.3 diffusion lengths either side; two columns of
		// 10 m suffice, since nothing varies along the fracture.
		side := int(math.Round(224 / tc.h))
		d := Drainage{Cols: 2, Rows: 2*side + 1, DX: 10, DY: tc.h, Storage: drainStorage,
			Mobility: uniformMobility(2 * (2*side + 1)), Held: []int{2 * side, 2*side + 1}}
		_, produced, err := d.Deplete(drainDrawdown, drainTime, 4000)
		if err != nil {
			t.Fatal(err)
		}
		length := 2 * d.DX
		strip := drainStorage * drainDrawdown * length * d.DY
		want := 2 * length * 2 * drainDrawdown * drainStorage * math.Sqrt(l*l/math.Pi)
		e := (produced+strip)/want - 1
		t.Logf("h = %g m: produced %.6g m³/m, closed form %.6g m³/m, error %+.3g %%", tc.h, produced+strip, want, 100*e)
		numtest.Abs(t, "relative volume error", e, 0, tc.tol)
		if !(math.Abs(e) < 0.3*prev) {
			t.Errorf("h = %g m: volume error %.3g does not fall below 0.3 × %.3g", tc.h, e, prev)
		}
		prev = math.Abs(e)
	}
}

// Zero production changes nothing: no drawdown, or no time, leaves every
// cell, held ones too, at the initial pressure and produces nothing (the
// rule Deplete documents; common practice, no source).
func TestDrainageNothingProduced(t *testing.T) {
	f := newLineFracture(10, 50, 2, 2, false)
	for _, tc := range []struct {
		name               string
		drawdown, duration float64
	}{
		{"no drawdown", 0, drainTime},
		{"no time", drainDrawdown, 0},
	} {
		dp, produced, err := f.Deplete(tc.drawdown, tc.duration, 10)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if len(dp) != f.Cols*f.Rows {
			t.Fatalf("%s: %d values for %d cells", tc.name, len(dp), f.Cols*f.Rows)
		}
		for c, v := range dp {
			if v != 0 || math.Signbit(v) { // not even −0, which prints as such
				t.Errorf("%s: Δp[%d] = %g Pa, want 0", tc.name, c, v)
			}
		}
		if produced != 0 {
			t.Errorf("%s: produced %g m³/m, want 0", tc.name, produced)
		}
	}
}

// A layer held everywhere has nothing left to drain: every cell is at
// −drawdown and nothing flows (the held cells' own fluid is not produced,
// see Deplete; common practice, no source).
func TestDrainageAllHeld(t *testing.T) {
	d := Drainage{Cols: 2, Rows: 2, DX: 3, DY: 4, Storage: drainStorage, Mobility: uniformMobility(4), Held: []int{3, 0, 2, 1}}
	dp, produced, err := d.Deplete(drainDrawdown, drainTime, 5)
	if err != nil {
		t.Fatal(err)
	}
	if len(dp) != 4 {
		t.Fatalf("%d values for 4 cells", len(dp))
	}
	for _, v := range dp {
		numtest.Rel(t, "Δp of a held cell", v, -drainDrawdown, 1e-15)
	}
	if produced != 0 {
		t.Errorf("produced %g m³/m, want 0", produced)
	}
}

// A single held cell in the middle of an odd grid whose mobility is
// mirror-symmetric about the middle column and the middle row gives a
// field symmetric under x → −x and y → −y (the problem is invariant under
// both reflections; common practice, no source), to round-off. The grid
// is not square and its cells not square, so rows and columns mixed up
// break the symmetry.
func TestDrainageSymmetry(t *testing.T) {
	const cols, rows = 31, 21
	d := Drainage{Cols: cols, Rows: rows, DX: 9, DY: 6, Storage: drainStorage, Mobility: make([]float64, cols*rows),
		Held: []int{rows/2*cols + cols/2}}
	for row := range rows {
		for col := range cols {
			// Distances from the nearer edges: mirror-symmetric.
			dc, dr := min(col, cols-1-col), min(row, rows-1-row)
			d.Mobility[row*cols+col] = drainMobility * math.Exp(0.7*float64(dc%3)-0.4*float64(dr%4))
		}
	}
	dp, _, err := d.Deplete(drainDrawdown, drainTime, 20)
	if err != nil {
		t.Fatal(err)
	}
	// A cell far from the well must have drained, or the test checks
	// only zeros.
	if corner := dp[0]; !(corner < -1e-3*drainDrawdown) {
		t.Fatalf("corner Δp = %g Pa: the field does not reach the corners", corner)
	}
	for row := range rows {
		for col := range cols {
			v := dp[row*cols+col]
			numtest.Abs(t, "Δp mirrored west–east", dp[row*cols+cols-1-col], v, 1e-12*drainDrawdown)
			numtest.Abs(t, "Δp mirrored south–north", dp[(rows-1-row)*cols+col], v, 1e-12*drainDrawdown)
		}
	}
}

// Bad input is reported as such (badinput.Err), and the message names the
// field and its value.
func TestDrainageValidate(t *testing.T) {
	good := func() Drainage {
		return Drainage{Cols: 3, Rows: 2, DX: 10, DY: 5, Storage: drainStorage, Mobility: uniformMobility(6), Held: []int{1, 4}}
	}
	if _, _, err := good().Deplete(drainDrawdown, drainTime, 3); err != nil {
		t.Fatalf("valid input: %v", err)
	}
	type args struct {
		drawdown, duration float64
		steps              int
	}
	valid := args{drainDrawdown, drainTime, 3}
	for _, tc := range []struct {
		name string
		edit func(d *Drainage)
		args args
		want string
	}{
		{"no columns", func(d *Drainage) { d.Cols = 0 }, valid, "Cols = 0"},
		{"negative rows", func(d *Drainage) { d.Rows = -3 }, valid, "Rows = -3"},
		{"too many cells", func(d *Drainage) { d.Cols, d.Rows = 2048, 1024 }, valid, "Cols = 2048, Rows = 1024: 2.097e+06 cells, at most 1048576"},
		{"cell count overflows", func(d *Drainage) { d.Cols, d.Rows = math.MaxInt, 2 }, valid, "Cols = 9223372036854775807, Rows = 2"},
		{"DX zero", func(d *Drainage) { d.DX = 0 }, valid, "DX = 0 m"},
		{"DX infinite", func(d *Drainage) { d.DX = math.Inf(1) }, valid, "DX = +Inf m"},
		{"DY NaN", func(d *Drainage) { d.DY = math.NaN() }, valid, "DY = NaN m"},
		{"mobility count", func(d *Drainage) { d.Mobility = d.Mobility[:5] }, valid, "Mobility has 5 values"},
		{"mobility negative", func(d *Drainage) { d.Mobility[3] = -1 }, valid, "Mobility[3] = -1 m²/(Pa·s)"},
		{"mobility zero", func(d *Drainage) { d.Mobility[0] = 0 }, valid, "Mobility[0] = 0 m²/(Pa·s)"},
		{"mobility infinite", func(d *Drainage) { d.Mobility[5] = math.Inf(1) }, valid, "Mobility[5] = +Inf"},
		{"storage zero", func(d *Drainage) { d.Storage = 0 }, valid, "Storage = 0 1/Pa"},
		{"storage NaN", func(d *Drainage) { d.Storage = math.NaN() }, valid, "Storage = NaN 1/Pa"},
		{"nothing held", func(d *Drainage) { d.Held = nil }, valid, "Held is empty"},
		{"held negative", func(d *Drainage) { d.Held[1] = -1 }, valid, "Held[1] = -1: cell index must lie in [0, 6)"},
		{"held past the end", func(d *Drainage) { d.Held[0] = 6 }, valid, "Held[0] = 6"},
		{"held twice", func(d *Drainage) { d.Held = []int{3, 5, 3} }, valid, "Held[2] = 3: repeats Held[0]"},
		{"drawdown NaN", nil, args{math.NaN(), drainTime, 3}, "drawdown NaN Pa"},
		{"drawdown infinite", nil, args{math.Inf(-1), drainTime, 3}, "drawdown -Inf Pa"},
		{"duration negative", nil, args{drainDrawdown, -1, 3}, "duration -1 s"},
		{"duration infinite", nil, args{drainDrawdown, math.Inf(1), 3}, "duration +Inf s"},
		{"no steps", nil, args{drainDrawdown, drainTime, 0}, "steps 0"},
		{"too many steps", nil, args{drainDrawdown, drainTime, MaxDrainageSteps + 1}, "steps 100001"},
	} {
		d := good()
		if tc.edit != nil {
			tc.edit(&d)
		}
		dp, _, err := d.Deplete(tc.args.drawdown, tc.args.duration, tc.args.steps)
		switch {
		case err == nil:
			t.Errorf("%s: no error", tc.name)
		case !errors.Is(err, badinput.Err):
			t.Errorf("%s: %v: not marked as bad input", tc.name, err)
		case !strings.Contains(err.Error(), tc.want):
			t.Errorf("%s: error %q does not contain %q", tc.name, err, tc.want)
		case dp != nil:
			t.Errorf("%s: %d values returned with the error", tc.name, len(dp))
		}
		if tc.edit != nil && d.Validate() == nil {
			t.Errorf("%s: Validate accepts it", tc.name)
		}
	}
}

// BenchmarkDrainage: a 2 km square of 10 m cells (4·10⁴ cells), ten
// parallel fractures of 30 cells 180 m apart, two years in 60 steps.
func BenchmarkDrainage(b *testing.B) {
	const n = 200
	d := Drainage{Cols: n, Rows: n, DX: 10, DY: 10, Storage: drainStorage, Mobility: uniformMobility(n * n)}
	for k := range 10 {
		row := 10 + 18*k
		for col := 85; col < 115; col++ {
			d.Held = append(d.Held, row*n+col)
		}
	}
	b.ResetTimer()
	for range b.N {
		if _, _, err := d.Deplete(drainDrawdown, drainTime, 60); err != nil {
			b.Fatal(err)
		}
	}
}
