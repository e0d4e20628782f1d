package mechanics

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"slipfront/internal/numtest"
)

// discRectArea returns the area of the rectangle [x1, x2] × [y1, y2]
// inside the unit disc: the integral over x of the clipped chord
// min(y2, s) − max(y1, −s), s = √(1 − x²), split where the clipping
// changes (s = |y1| or |y2|) so that each piece is a sum of constants and
// ±s, integrated with ∫s dx = (x·s + asin x)/2.
func discRectArea(x1, x2, y1, y2 float64) float64 {
	x1, x2 = math.Max(x1, -1), math.Min(x2, 1)
	if x1 >= x2 || y1 >= 1 || y2 <= -1 {
		return 0
	}
	cuts := []float64{x1, x2}
	for _, y := range []float64{y1, y2} {
		if math.Abs(y) < 1 {
			xb := math.Sqrt(1 - y*y)
			for _, v := range []float64{-xb, xb} {
				if v > x1 && v < x2 {
					cuts = append(cuts, v)
				}
			}
		}
	}
	slices.Sort(cuts)
	chordInt := func(x float64) float64 { return (x*math.Sqrt(1-x*x) + math.Asin(x)) / 2 }
	area := 0.0
	for k := 0; k+1 < len(cuts); k++ {
		u, v := cuts[k], cuts[k+1]
		m := (u + v) / 2
		s := math.Sqrt(1 - m*m)
		if math.Min(y2, s) <= math.Max(y1, -s) {
			continue
		}
		sInt := chordInt(v) - chordInt(u)
		if y2 < s {
			area += y2 * (v - u)
		} else {
			area += sInt
		}
		if y1 > -s {
			area -= y1 * (v - u)
		} else {
			area += sInt
		}
	}
	return area
}

// newResponse returns the grid response or fails the test.
func newResponse(t testing.TB, l Layer, g DepletionGrid) *GridResponse {
	t.Helper()
	r, err := NewGridResponse(l, g)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// change applies r to the field dp or fails the test.
func change(t testing.TB, r *GridResponse, dp []float64, how Summation) []StressChange {
	t.Helper()
	out := make([]StressChange, len(dp))
	if err := r.Change(out, dp, how); err != nil {
		t.Fatal(err)
	}
	return out
}

// rectanglePsi returns ψ_ij at the origin of the layer potential of the
// rectangle [x1, x2] × [y1, y2] with half-thickness c (+Inf: plane strain)
// by the boundary integral ∮ n_i ∂_j g ds (divergence theorem), each edge
// cut into panels integrated by 20-point Gauss–Legendre: an independent
// route to the corner formulas of the cell kernels (Nagy, Papp & Benedek
// 2000), valid also when the origin is inside.
func rectanglePsi(x1, x2, y1, y2, c float64) (xx, yy, xy float64) {
	kern := func(x, y float64) float64 { // g′(ρ)/ρ
		r2 := x*x + y*y
		if math.IsInf(c, 1) {
			return -2 / r2
		}
		return -2 * c / (r2 * math.Sqrt(r2+c*c))
	}
	const panels, nodes = 16, 20
	edge := func(f func(s float64) float64, lo, hi float64) float64 {
		sum, w := 0.0, (hi-lo)/panels
		for k := range panels {
			sum += quad.Fixed(f, lo+float64(k)*w, lo+float64(k+1)*w, nodes, quad.Legendre{}, 0)
		}
		return sum
	}
	for _, side := range []struct{ x, n float64 }{{x2, 1}, {x1, -1}} { // east and west edges, n = (±1, 0)
		xx += side.n * edge(func(y float64) float64 { return side.x * kern(side.x, y) }, y1, y2)
		xy += side.n * edge(func(y float64) float64 { return y * kern(side.x, y) }, y1, y2)
	}
	for _, side := range []struct{ y, n float64 }{{y2, 1}, {y1, -1}} { // north and south edges, n = (0, ±1)
		yy += side.n * edge(func(x float64) float64 { return side.y * kern(x, side.y) }, x1, x2)
	}
	return xx, yy, xy
}

// One depleted cell in a grid: the change at every cell centre (direct and
// FFT summation) against the boundary integral of the cell (an independent
// route), for offsets of every sign, so that the symmetries the tables rely
// on are checked too.
func TestCellKernelAgainstBoundaryIntegral(t *testing.T) {
	const (
		dp = -3 * mpa
		// 16 panels of 20 Gauss–Legendre nodes resolve the kernel at a
		// distance of half a cell from an edge to better than 1e-11 of ψ.
		tol = 1e-11
	)
	g := DepletionGrid{Cols: 9, Rows: 7, DX: 12, DY: 7}
	src := [2]int{3, 4} // col, row
	field := make([]float64, g.Cells())
	field[src[1]*g.Cols+src[0]] = dp
	path := demoPoro.StressPath()
	for _, h := range []float64{inf, 30, 3} {
		r := newResponse(t, Layer{demoPoro, h}, g)
		for _, how := range []Summation{DirectSummation, FFTSummation} {
			out := change(t, r, field, how)
			for row := range g.Rows {
				for col := range g.Cols {
					// The source cell relative to this cell's centre.
					x1, y1 := (float64(src[0]-col)-0.5)*g.DX, (float64(src[1]-row)-0.5)*g.DY
					pxx, pyy, pxy := rectanglePsi(x1, x1+g.DX, y1, y1+g.DY, h/2)
					local := 0.0
					if col == src[0] && row == src[1] {
						local = path * dp
					}
					k := path * dp / (4 * math.Pi)
					got := out[row*g.Cols+col]
					what := fmt.Sprintf("h %g summation %d cell (%d, %d): ", h, how, col, row)
					scale := tol * path * math.Abs(dp)
					numtest.Abs(t, what+"ΔSxx", got.XX, local+k*pxx, scale)
					numtest.Abs(t, what+"ΔSyy", got.YY, local+k*pyy, scale)
					numtest.Abs(t, what+"ΔSxy", got.XY, k*pxy, scale)
					numtest.Abs(t, what+"ΔSzz", got.ZZ, 2*local-got.XX-got.YY, scale)
					if got.Pore != field[row*g.Cols+col] {
						t.Errorf("%sΔp = %g, want %g", what, got.Pore, field[row*g.Cols+col])
					}
				}
			}
		}
	}
}

// The FFT summation agrees with the direct one on a random field, on a
// grid with odd sizes and unequal cells.
func TestGridFFTMatchesDirect(t *testing.T) {
	// FFT round-off: a few ulps times log2 of the padded size, relative to
	// the largest change; 1e-12 leaves a wide margin.
	const tol = 1e-12
	rng := rand.New(rand.NewPCG(1, 2))
	g := DepletionGrid{Cols: 23, Rows: 17, DX: 20, DY: 35}
	field := make([]float64, g.Cells())
	for k := range field {
		if rng.Float64() < 0.6 {
			field[k] = -15 * mpa * rng.Float64()
		}
	}
	for _, h := range []float64{inf, 60, 5} {
		r := newResponse(t, Layer{demoPoro, h}, g)
		direct := change(t, r, field, DirectSummation)
		fft := change(t, r, field, FFTSummation)
		auto := change(t, r, field, AutoSummation)
		largest := 0.0
		for _, c := range direct {
			largest = math.Max(largest, math.Max(math.Abs(c.XX), math.Max(math.Abs(c.YY), math.Abs(c.XY))))
		}
		if largest == 0 {
			t.Fatal("no change to compare")
		}
		for k := range direct {
			for _, pair := range [][2]StressChange{{fft[k], direct[k]}, {auto[k], direct[k]}} {
				got, want := pair[0], pair[1]
				what := fmt.Sprintf("h %g cell %d: ", h, k)
				numtest.Abs(t, what+"ΔSxx", got.XX, want.XX, tol*largest)
				numtest.Abs(t, what+"ΔSyy", got.YY, want.YY, tol*largest)
				numtest.Abs(t, what+"ΔSxy", got.XY, want.XY, tol*largest)
				numtest.Abs(t, what+"ΔSzz", got.ZZ, want.ZZ, tol*largest)
			}
		}
	}
}

// The gridded superposition converges to the depleted ellipse (closed form
// in the plane-strain limit, closed form plus boundary quadrature for a
// layer 30 m thick) as the cells shrink by thirds, at second order: each
// cell carries Δp times the share of its area inside the ellipse (exact,
// discRectArea), so the error is the misplaced source within the boundary
// cells, whose first moment is O(Δ³) per cell. The points are cell centres
// at every level (odd refinement keeps them) away from the boundary.
func TestGridConvergesToEllipse(t *testing.T) {
	const a, b, dp = 300.0, 100.0, -10 * mpa
	points := [][2]float64{{0, 0}, {150, 45}, {0, 150}, {405, 0}}
	path := demoPoro.StressPath()
	for _, h := range []float64{inf, 30} {
		l := Layer{demoPoro, h}
		ref := newEllipse(t, l, Ellipse{SemiMajor: a, SemiMinor: b, Azimuth: 90 * deg, Depletion: dp})
		var errs []float64
		for _, k := range []int{1, 3, 9} {
			d := 15.0 / float64(k)
			g := DepletionGrid{Cols: 61 * k, Rows: 31 * k, DX: d, DY: d}
			x0, y0 := -0.5*float64(g.Cols)*d, -0.5*float64(g.Rows)*d // south-west corner
			field := make([]float64, g.Cells())
			for row := range g.Rows {
				for col := range g.Cols {
					x1, y1 := x0+float64(col)*d, y0+float64(row)*d
					field[row*g.Cols+col] = dp * a * b * discRectArea(x1/a, (x1+d)/a, y1/b, (y1+d)/b) / (d * d)
				}
			}
			out := change(t, newResponse(t, l, g), field, FFTSummation)
			e := 0.0
			for _, p := range points {
				col := int(math.Round((p[0]-x0)/d - 0.5))
				row := int(math.Round((p[1]-y0)/d - 0.5))
				got, want := out[row*g.Cols+col], ref.At(p[0], p[1])
				e = math.Max(e, math.Max(math.Abs(got.XX-want.XX), math.Max(math.Abs(got.YY-want.YY), math.Abs(got.XY-want.XY))))
			}
			errs = append(errs, e/(path*math.Abs(dp)))
		}
		for i := 1; i < len(errs); i++ {
			order := math.Log(errs[i-1]/errs[i]) / math.Log(3)
			t.Logf("h %g: cell %.3g m error %.3g, cell %.3g m error %.3g: observed order %.2f",
				h, 15/math.Pow(3, float64(i-1)), errs[i-1], 15/math.Pow(3, float64(i)), errs[i], order)
			// Second order expected; 1.7 allows for the pre-asymptotic
			// first refinement (cells as large as half the thickness).
			if order < 1.7 {
				t.Errorf("h %g: observed order %.2f, want ≥ 1.7 (errors %v)", h, order, errs)
			}
		}
		// The finest cells (5/3 m) are within 5e-5 of A·|Δp| (observed
		// 1e-5 and 3e-5).
		if e := errs[len(errs)-1]; e > 5e-5 {
			t.Errorf("h %g: finest error %.3g of A·|Δp|, want ≤ 5e-5", h, e)
		}
	}
}

// Deep inside a uniformly depleted square much wider than the layer is
// thick, the change is the uniaxial-strain value (Engelder & Fischer 1994;
// Zoback 2007): within (2/π)·c/L of A·Δp for a square of half-width L
// (the strip bound of TestEllipseStripLimit, twice for two directions).
func TestGridUniformSquareUniaxial(t *testing.T) {
	const dp = -10 * mpa
	g := DepletionGrid{Cols: 101, Rows: 101, DX: 100, DY: 100}
	for _, h := range []float64{30, 3} {
		r := newResponse(t, Layer{demoPoro, h}, g)
		field := make([]float64, g.Cells())
		for k := range field {
			field[k] = dp
		}
		out := change(t, r, field, AutoSummation)
		centre := out[50*g.Cols+50]
		u := demoPoro.Uniaxial(dp)
		bound := 2 / math.Pi * (h / 2) / (50.5 * 100) * 2
		for _, v := range []float64{centre.XX, centre.YY} {
			rel := math.Abs(v/u.XX - 1)
			t.Logf("h %g: centre %.6g MPa, uniaxial %.6g MPa, relative difference %.3g (bound %.3g)", h, v/mpa, u.XX/mpa, rel, bound)
			if rel > bound {
				t.Errorf("h %g: centre change %g, uniaxial %g: relative difference %.3g > %.3g", h, v, u.XX, rel, bound)
			}
		}
		numtest.Abs(t, "centre ΔSxy", centre.XY, 0, 1e-9*math.Abs(u.XX))
	}
}

// In the plane-strain limit the horizontal change is traceless where there
// is no depletion (the potential is harmonic there), and ΔSzz = 0.
func TestGridPlaneStrainTracelessOutside(t *testing.T) {
	g := DepletionGrid{Cols: 15, Rows: 12, DX: 10, DY: 10}
	field := make([]float64, g.Cells())
	for _, k := range []int{20, 21, 36, 50, 51, 52} {
		field[k] = -5 * mpa
	}
	out := change(t, newResponse(t, Layer{demoPoro, inf}, g), field, DirectSummation)
	outside := 0
	for k, c := range out {
		if field[k] != 0 {
			continue
		}
		outside++
		numtest.Abs(t, fmt.Sprintf("cell %d: ΔSxx + ΔSyy", k), c.XX+c.YY, 0, 1e-9*mpa)
		numtest.Abs(t, fmt.Sprintf("cell %d: ΔSzz", k), c.ZZ, 0, 1e-9*mpa)
	}
	if outside == 0 {
		t.Fatal("no undepleted cell to check")
	}
}

func TestGridErrors(t *testing.T) {
	l := Layer{demoPoro, 30}
	tests := []struct {
		name  string
		grid  DepletionGrid
		param string
	}{
		{"zero cols", DepletionGrid{Cols: 0, Rows: 3, DX: 1, DY: 1}, "depletion grid cells"},
		{"negative rows", DepletionGrid{Cols: 3, Rows: -1, DX: 1, DY: 1}, "depletion grid cells"},
		{"too many cells", DepletionGrid{Cols: 4096, Rows: 4096, DX: 1, DY: 1}, "depletion grid cells"},
		{"zero dx", DepletionGrid{Cols: 3, Rows: 3, DX: 0, DY: 1}, "depletion grid dx"},
		{"infinite dy", DepletionGrid{Cols: 3, Rows: 3, DX: 1, DY: inf}, "depletion grid dy"},
	}
	for _, tc := range tests {
		_, err := NewGridResponse(l, tc.grid)
		var ie *InputError
		if !errors.As(err, &ie) || ie.Name != tc.param {
			t.Errorf("%s: error %v, want an *InputError naming %q", tc.name, err, tc.param)
		}
	}
	r := newResponse(t, l, DepletionGrid{Cols: 3, Rows: 2, DX: 1, DY: 1})
	field := []float64{0, -1, 0, math.NaN(), 0, 0}
	var ie *InputError
	if err := r.Change(make([]StressChange, 6), field, AutoSummation); !errors.As(err, &ie) || ie.Name != "depletion[3] (col 0, row 1)" {
		t.Errorf("NaN depletion: error %v, want an *InputError naming the cell", err)
	}
}

// The area of a rectangle in the unit disc, by cases (whole disc, a
// quarter, a half-plane strip, a box inside, no overlap) and against a
// midpoint sum.
func TestDiscRectArea(t *testing.T) {
	tests := []struct {
		name           string
		x1, x2, y1, y2 float64
		want           float64
	}{
		{"whole disc", -2, 2, -2, 2, math.Pi},
		{"upper-right quarter", 0, 5, 0, 5, math.Pi / 4},
		{"upper half", -1, 1, 0, 1, math.Pi / 2},
		{"box inside", -0.3, 0.2, -0.1, 0.4, 0.5 * 0.5},
		{"no overlap", 0.8, 1, 0.8, 1, 0},
		{"segment above y = 0.5", -1, 1, 0.5, 1, math.Pi/3 - math.Sqrt(3)/4}, // circular segment: θ − sin θ over 2 with θ = 2π/3
	}
	for _, tc := range tests {
		numtest.Abs(t, tc.name, discRectArea(tc.x1, tc.x2, tc.y1, tc.y2), tc.want, 1e-14)
	}
	// A box cutting the circle at two sides, against a midpoint sum
	// (error O(1/n²) for the chord integrand's kinks inside the box).
	const n = 4000
	x1, x2, y1, y2 := 0.3, 1.2, -0.4, 0.7
	sum := 0.0
	for i := range n {
		x := x1 + (float64(i)+0.5)*(x2-x1)/n
		if x >= 1 {
			continue
		}
		s := math.Sqrt(1 - x*x)
		sum += math.Max(0, math.Min(y2, s)-math.Max(y1, -s)) * (x2 - x1) / n
	}
	numtest.Abs(t, "cut box", discRectArea(x1, x2, y1, y2), sum, 1e-5)
}

// A response applied to a second field (a depletion history) gives what a
// fresh response gives, bit for bit (the same arithmetic on the same
// numbers): no state leaks from one field to the next.
func TestGridResponseReuse(t *testing.T) {
	g := DepletionGrid{Cols: 11, Rows: 8, DX: 25, DY: 25}
	first, second := make([]float64, g.Cells()), make([]float64, g.Cells())
	for k := range first {
		if k%3 == 0 {
			first[k] = -8 * mpa
		}
		if k%5 == 1 {
			second[k] = -4 * mpa
		}
	}
	for _, how := range []Summation{DirectSummation, FFTSummation} {
		used := newResponse(t, Layer{demoPoro, 30}, g)
		change(t, used, first, how)
		got := change(t, used, second, how)
		want := change(t, newResponse(t, Layer{demoPoro, 30}, g), second, how)
		for k := range got {
			if got[k] != want[k] {
				t.Errorf("summation %d cell %d: reused response %+v, fresh %+v", how, k, got[k], want[k])
			}
		}
	}
}

// The automatic summation takes the direct sum for few depleted cells and
// the FFT for a field depleted all over, and, once the kernel spectra are
// built, the FFT for fewer depleted cells than before.
func TestAutoSummationChoice(t *testing.T) {
	r := newResponse(t, Layer{demoPoro, 30}, DepletionGrid{Cols: 200, Rows: 200, DX: 10, DY: 10})
	tests := []struct {
		name     string
		depleted int
		want     Summation
	}{
		{"ten cells", 10, DirectSummation},
		{"every cell", 40000, FFTSummation},
		{"a two-hundredth, spectra not built", 200, DirectSummation},
	}
	for _, tc := range tests {
		if got := r.choose(tc.depleted); got != tc.want {
			t.Errorf("%s: summation %d, want %d", tc.name, got, tc.want)
		}
	}
	field := make([]float64, r.Grid().Cells())
	field[0] = -1
	change(t, r, field, FFTSummation) // builds the spectra
	if got := r.choose(200); got != FFTSummation {
		t.Errorf("a two-hundredth, spectra built: summation %d, want FFT (%d)", got, FFTSummation)
	}
}
