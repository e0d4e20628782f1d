package elastic

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/hfref"
	"slipfront/internal/numtest"
)

const (
	crackHalf = 1.0 // c, m
	pressure  = 1e6 // net pressure p, Pa
)

// sneddonOpening is the opening of a pressurised straight crack in plane
// strain, w(x) = 2(1−ν)(p/G)√(c² − x²) (Sneddon 1946; Pollard & Segall
// 1987, eq. 8.34 from memory); the same form gives the slip under a
// uniform shear stress drop p (mode II).
func sneddonOpening(x float64) float64 {
	return 2 * (1 - rock.PoissonRatio) * pressure / rock.ShearModulus * math.Sqrt(crackHalf*crackHalf-x*x)
}

// pressurised solves N equal elements on |x| ≤ c, in plane strain, for
// faces loaded by the net pressure p: Δσn = p, Δτ = 0.
func pressurised(t *testing.T, n int) (el []Element, slip, opening []float64) {
	el = straightCrack(n, crackHalf, 0, 1)
	slip, opening = solveTractions(t, mustDense(t, el, Settings{PlaneStrain: true}), constant(n, 0), constant(n, pressure))
	return el, slip, opening
}

// TestSneddonTable reproduces, as a regression of the same formulation,
// the constant-element solution of the pressurised crack (c = 1 m,
// p = 1 MPa, G = 30 GPa, ν = 0.25): the opening of the element centred
// at x = c/N, its ratio to Sneddon's (1946) opening there, the tip
// element's ratio, and the crack volume, (1 + 1/N) times Sneddon's
// π(1−ν)pc²/G. The values were computed by an independent script of the
// Crouch & Starfield (1983) kernel (common practice, no published
// source); the faces carry no shear, so the slip is zero.
func TestSneddonTable(t *testing.T) {
	const tol = 1e-8 // the regression tolerance of the table
	for _, tc := range []struct {
		n           int
		w, ratio    float64
		tip, volume float64
	}{
		{10, 5.2321927514e-5, 1.05171031, 1.26990639, 1.10000000},
		{20, 5.1204302169e-5, 1.02536856, 1.26137312, 1.05000000},
		{40, 5.0613428129e-5, 1.01258504, 1.25728650, 1.02500000},
		{80, 5.0309588650e-5, 1.00627039, 1.25528629, 1.01250000},
	} {
		el, slip, w := pressurised(t, tc.n)
		k := tc.n / 2
		x := el[k].Centre().X
		numtest.Abs(t, "centre of element N/2", x, crackHalf/float64(tc.n), 1e-15)
		numtest.Rel(t, "w(c/N)", w[k], tc.w, tol)
		numtest.Abs(t, "w/w_Sneddon at c/N", w[k]/sneddonOpening(x), tc.ratio, 5e-9) // 8 decimals
		numtest.Abs(t, "tip ratio", w[tc.n-1]/sneddonOpening(el[tc.n-1].Centre().X), tc.tip, 5e-9)
		vol := 0.0
		for i := range w {
			vol += w[i] * el[i].Length()
		}
		want := math.Pi * (1 - rock.PoissonRatio) * pressure * crackHalf * crackHalf / rock.ShearModulus
		numtest.Rel(t, "volume ratio", vol/want, tc.volume, tol)
		for i, s := range slip {
			numtest.Abs(t, "slip", s, 0, 1e-12*w[i])
		}
	}
}

// TestCrackConvergence checks the physics of the constant-element
// solution against Sneddon (1946): away from the two elements at each
// tip the opening is within 11 %, and the error at the centre falls as
// about 0.5/N (observed order 1; Crouch & Starfield 1983, ch. 5, note
// the constant-element tip error, which does not converge).
func TestCrackConvergence(t *testing.T) {
	ns := []int{20, 40, 80, 160}
	errs := make([]float64, len(ns))
	for c, n := range ns {
		el, _, w := pressurised(t, n)
		checked := 0
		for i := 2; i < n-2; i++ {
			r := w[i] / sneddonOpening(el[i].Centre().X)
			if math.Abs(r-1) >= 0.11 {
				t.Errorf("N = %d, element %d: w/w_Sneddon = %.4f, want within 0.11 of 1", n, i, r)
			}
			checked++
		}
		if checked == 0 {
			t.Fatalf("N = %d: no interior element", n)
		}
		k := n / 2
		errs[c] = w[k]/sneddonOpening(el[k].Centre().X) - 1
		numtest.Abs(t, "N·error at the centre", float64(n)*errs[c], 0.5, 0.03) // 0.5/N to within the O(1/N²) term at N ≥ 20
	}
	for c := 1; c < len(ns); c++ {
		order := math.Log2(errs[c-1] / errs[c])
		numtest.Abs(t, "observed order", order, 1, 0.05)
	}
}

// TestShearCrack checks the slip of a straight crack under a uniform
// shear stress drop Δτ: elliptical, δ(x) = 2(1−ν)(Δτ/G)√(c² − x²)
// (Pollard & Segall 1987, from memory), right-lateral for a positive
// drop, and — the Dx→σxy matrix of a collinear crack equals its Dy→σyy
// matrix (Crouch & Starfield 1983, §5.2) — equal to the opening under
// the same pressure.
func TestShearCrack(t *testing.T) {
	const n = 80
	el := straightCrack(n, crackHalf, 0, 1)
	op := mustDense(t, el, Settings{PlaneStrain: true})
	// The faces are free of shear traction: τ0 + Δτ(s) = 0 with a remote
	// shear τ0 = +Δτ that drives right-lateral slip.
	slip, opening := solveTractions(t, op, constant(n, -pressure), constant(n, 0))
	_, _, w := pressurised(t, n)
	for i := range slip {
		numtest.Rel(t, "slip = opening of the pressurised crack", slip[i], w[i], 1e-10)
		numtest.Abs(t, "opening", opening[i], 0, 1e-12*slip[i])
		if !(slip[i] > 0) {
			t.Errorf("element %d: slip %g, want > 0 (right-lateral under a right-lateral drop)", i, slip[i])
		}
	}
	// Maximum slip 2(1−ν)Δτc/G = 5e-5 m; the two centre elements are
	// within 0.5/N of it (TestCrackConvergence).
	numtest.Rel(t, "δ at the centre", slip[n/2], 2*(1-rock.PoissonRatio)*pressure*crackHalf/rock.ShearModulus, 0.5/n+1e-4)
	for i := 2; i < n-2; i++ {
		numtest.Rel(t, "δ/δ_Pollard–Segall", slip[i], sneddonOpening(el[i].Centre().X), 0.11)
	}
}

// Stress of the pressurised crack on the axis x = 0, tension-positive,
// per unit pressure (closed forms derived from the Westergaard function
// of Sneddon's 1946 crack, Z = p[z/√(z² − c²) − 1]):
//
//	σyy(0, y)/p = −[1 − y³/(y² + c²)^{3/2}]
//	σxx(0, y)/p = −[1 − y(y² + 2c²)/(y² + c²)^{3/2}]
func shadowYY(y float64) float64 { return -(1 - y*y*y/math.Pow(y*y+crackHalf*crackHalf, 1.5)) }
func shadowXX(y float64) float64 {
	return -(1 - y*(y*y+2*crackHalf*crackHalf)/math.Pow(y*y+crackHalf*crackHalf, 1.5))
}

// westergaard returns σxx, σyy, σxy/p at (x, y), tension-positive as the
// closed forms above, from Westergaard's function (hfref.CrackStress,
// which is compression-positive).
func westergaard(x, y float64) (sxx, syy, sxy float64) {
	sxx, syy, sxy = hfref.CrackStress(x, y, crackHalf)
	return -sxx, -syy, -sxy
}

// TestShadowClosedForm checks the closed forms of the stress shadow
// against the Westergaard function they come from (to 1e-12), their
// tabulated values (to the 6 decimals given), the exact values at y = c
// and at the tensile maximum of σxx, y = √2 c, and the far field.
func TestShadowClosedForm(t *testing.T) {
	const tol = 1e-12
	for _, y := range []float64{0.05, 0.25, 0.5, 0.786151, 1, math.Sqrt2, 2, 5, 40} {
		sxx, syy, sxy := westergaard(0, y)
		numtest.Abs(t, "σyy closed form vs Westergaard", shadowYY(y), syy, tol)
		numtest.Abs(t, "σxx closed form vs Westergaard", shadowXX(y), sxx, tol)
		numtest.Abs(t, "σxy on the axis", sxy, 0, tol)
	}
	for _, tc := range []struct{ y, yy, xx float64 }{
		{0.25, -0.985733, -0.529196}, {0.5, -0.910557, -0.195016}, {1, -0.646447, 0.060660},
		{2, -0.284458, 0.073313}, {5, -0.057134, 0.018295},
	} {
		numtest.Abs(t, "σyy/p table", shadowYY(tc.y), tc.yy, 5e-7)
		numtest.Abs(t, "σxx/p table", shadowXX(tc.y), tc.xx, 5e-7)
	}
	numtest.Abs(t, "σyy(c)/p", shadowYY(1), -(1 - 1/(2*math.Sqrt2)), tol)
	numtest.Abs(t, "max σxx/p", shadowXX(math.Sqrt2), 4*math.Sqrt2/(3*math.Sqrt(3))-1, tol)
	const h = 1e-5 // central difference of a smooth function: O(h²)
	numtest.Abs(t, "dσxx/dy at √2 c", (shadowXX(math.Sqrt2+h)-shadowXX(math.Sqrt2-h))/(2*h), 0, 1e-9)
	numtest.Abs(t, "σxx sign change at 0.786151 c", shadowXX(0.786151), 0, 2e-6)
	y := 1e3
	numtest.Rel(t, "far σyy → −(3/2) c²/y²", shadowYY(y), -1.5/(y*y), 2e-6)
	numtest.Rel(t, "far σxx → c²/(2y²)", shadowXX(y), 0.5/(y*y), 4e-6)
}

// TestShadowDDM compares the stress shadow of the constant-element
// solution (N = 400) with the closed forms of Sneddon's crack on the
// perpendicular axis: within 1e-3·p. Compression-positive, the crack
// adds ΔSyy = p[1 − y³/(y² + c²)^{3/2}] on parallel planes.
func TestShadowDDM(t *testing.T) {
	const n = 400
	el, slip, w := pressurised(t, n)
	pts := []r2.Vec{{Y: 0.25}, {Y: 0.5}, {Y: 1}, {Y: 2}, {Y: 5}}
	f, err := NewField(el, rock, pts, Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	probe, err := NewProbe(el, rock, Settings{PlaneStrain: true})
	if err != nil {
		t.Fatal(err)
	}
	got := make([]Stress, len(pts))
	f.StressTo(got, slip, w)
	for i, p := range pts {
		const tol = 1e-3 * pressure
		numtest.Abs(t, "ΔSyy", got[i].YY, -pressure*shadowYY(p.Y), tol)
		numtest.Abs(t, "ΔSxx", got[i].XX, -pressure*shadowXX(p.Y), tol)
		numtest.Abs(t, "ΔSxy", got[i].XY, 0, tol)
		direct := f.StressAt(p, slip, w)
		numtest.Abs(t, "StressTo vs StressAt", got[i].YY, direct.YY, 1e-6*pressure)
		probed := probe.StressAt(p, slip, w)
		numtest.Abs(t, "Probe ΔSyy", probed.YY, -pressure*shadowYY(p.Y), tol)
		numtest.Abs(t, "Probe ΔSxx", probed.XX, -pressure*shadowXX(p.Y), tol)
		if !(got[i].YY > 0) {
			t.Errorf("y = %g: ΔSyy = %g, want > 0 (compression: the stress shadow)", p.Y, got[i].YY)
		}
	}
}

// TestStackedCracks checks the interaction of two equal, stacked,
// parallel pressurised cracks a distance s apart (plane strain, N = 80
// elements each): each one's stress shadow closes the other, so the mean
// opening falls below that of a single crack, monotonically as s
// shrinks, and tends to it as s grows. It is compared with Kachanov's
// (1987, Int. J. Solids Struct. 23(1), 23–43) approximation, which loads
// each crack by the mean traction the other induces: by symmetry both
// carry p_eff = p/(1 + Λ), Λ the mean over one crack of the normal stress
// the other induces per unit pressure (Sneddon's 1946 field, integrated
// by Gauss–Legendre), so the mean opening ratio is 1/(1 + Λ). The
// approximation drops the non-uniform part of the induced traction; its
// error grows as the cracks approach (a few percent down to s ≈ c/4, from
// memory), hence the tolerance of 4 %, and 0.5 % from s = 4c on.
func TestStackedCracks(t *testing.T) {
	const n = 80
	_, _, single := pressurised(t, n)
	mean := func(w []float64) float64 {
		s := 0.0
		for _, v := range w {
			s += v
		}
		return s / float64(len(w))
	}
	ref := mean(single)
	prev := 0.0
	for _, tc := range []struct{ s, tol float64 }{
		{0.25, 0.04}, {0.5, 0.04}, {1, 0.04}, {2, 0.04}, {4, 0.005}, {8, 0.005}, {64, 0.005},
	} {
		el := append(straightCrack(n, crackHalf, 0, 1), straightCrack(n, crackHalf, tc.s, 1)...)
		_, w := solveTractions(t, mustDense(t, el, Settings{PlaneStrain: true}), constant(2*n, 0), constant(2*n, pressure))
		ratio := mean(w[n:]) / ref
		numtest.Rel(t, "the two cracks open alike", mean(w[:n])/ref, ratio, 1e-10)
		lambda := quad.Fixed(func(x float64) float64 { _, syy, _ := westergaard(x, tc.s); return -syy }, -crackHalf, crackHalf, 64, nil, 0) / (2 * crackHalf)
		numtest.Rel(t, "mean opening ratio vs Kachanov", ratio, 1/(1+lambda), tc.tol)
		if !(ratio > prev && ratio < 1) {
			t.Errorf("s/c = %g: opening ratio %.5f, want in (%.5f, 1): rising with the spacing", tc.s, ratio, prev)
		}
		prev = ratio
	}
	numtest.Abs(t, "ratio at s = 64c", prev, 1, 1e-3)
}
