package mechanics

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"slipfront/internal/numtest"
)

// demoPoro are the demo scenario's rock (ν = 0.22) with α = 1:
// A = 0.56/0.78 = 0.717949.
var demoPoro = Poroelastic{Biot: 1, Poisson: 0.22}

// inf is the thickness of the plane-strain limit.
var inf = math.Inf(1)

// newEllipse returns the depleted ellipse or fails the test.
func newEllipse(t testing.TB, l Layer, e Ellipse) *DepletedEllipse {
	t.Helper()
	d, err := NewDepletedEllipse(l, e)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// boundaryPsi returns ψ_ij at (x, y) of the layer potential of the
// ellipse with semi-axes a along x and b along y and half-thickness c
// (+Inf: plane strain), by the trapezoidal rule with n nodes on the
// boundary integral ∮ n_i ∂_j g ds with the whole kernel
// ∂_j g = g′(ρ)·X_j/ρ, g′/ρ = −2c/(ρ²√(ρ² + c²)) (or −2/ρ²). It is an
// independent route to the package's closed form plus correction, good for
// points well away from the boundary (Trefethen & Weideman 2014: geometric
// convergence of the trapezoidal rule for smooth periodic integrands).
func boundaryPsi(a, b, c, x, y float64, n int) (xx, yy, xy float64) {
	h := 2 * math.Pi / float64(n)
	for k := range n {
		sin, cos := math.Sincos(float64(k) * h)
		dx, dy := a*cos-x, b*sin-y
		r2 := dx*dx + dy*dy
		kern := -2 / r2
		if !math.IsInf(c, 1) {
			kern = -2 * c / (r2 * math.Sqrt(r2+c*c))
		}
		nx, ny := b*cos, a*sin
		xx += nx * dx * kern
		yy += ny * dy * kern
		xy += nx * dy * kern
	}
	return xx * h, yy * h, xy * h
}

// psiOf returns ψ_ij recovered from a change of an ellipse with depletion
// dp: ΔS_ij = A·dp·(χ·δ_ij + ψ_ij/(4π)).
func psiOf(c StressChange, path, dp float64) (xx, yy, xy float64) {
	inside := 0.0
	if c.Pore != 0 {
		inside = 1
	}
	u := path * dp
	return 4 * math.Pi * (c.XX/u - inside), 4 * math.Pi * (c.YY/u - inside), 4 * math.Pi * c.XY / u
}

// The closed form and its thickness correction against the boundary
// integral with the whole kernel (an independent route), inside and
// outside, for the plane-strain limit and finite thicknesses.
func TestEllipseAgainstBoundaryIntegral(t *testing.T) {
	const (
		a, b = 300.0, 100.0
		dp   = -10 * mpa
		// The independent sum uses 2^15 nodes; at the points below, at
		// least 40 m from the boundary, its error is below 1e-9 of ψ
		// (checked by halving the nodes).
		tol = 1e-9
	)
	points := [][2]float64{{0, 0}, {150, 50}, {-200, -40}, {400, 0}, {0, 200}, {250, 150}, {-600, 900}}
	for _, h := range []float64{inf, 3000, 30, 3} {
		d := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: a, SemiMinor: b, Azimuth: 90 * deg, Depletion: dp})
		for _, p := range points {
			xx, yy, xy := psiOf(d.At(p[0], p[1]), demoPoro.StressPath(), dp)
			// Azimuth 90°: the major axis is east, the minor axis north.
			wxx, wyy, wxy := boundaryPsi(a, b, h/2, p[0], p[1], 1<<15)
			what := fmt.Sprintf("h %g, point %v: ψ", h, p)
			numtest.Abs(t, what+"xx", xx, wxx, tol)
			numtest.Abs(t, what+"yy", yy, wyy, tol)
			numtest.Abs(t, what+"xy", xy, wxy, tol)
		}
	}
}

// Eshelby's elliptic cylinder (Eshelby 1957; Mura 1987, §11, a₃ → ∞; from
// memory): inside, ΔS along the semi-axis a is A·Δp·a/(a + b) and along b
// A·Δp·b/(a + b), uniform; outside a circle of radius a the change is
// radial A·Δp·a²/(2r²) and tangential −A·Δp·a²/(2r²) (the classical
// a²/r² decay of a dilating cylinder in an infinite body; Timoshenko &
// Goodier 1970, ch. 13; from memory). The vertical change
// ΔSzz = 2A·Δp·χ − (ΔSxx + ΔSyy) is then A·Δp inside (the out-of-plane
// stress of plane strain) and 0 outside.
func TestEllipsePlaneStrainClosedForm(t *testing.T) {
	const dp = -10 * mpa
	path := demoPoro.StressPath()
	scale := path * math.Abs(dp) * roundOff
	d := newEllipse(t, Layer{demoPoro, inf}, Ellipse{X: 1000, Y: -500, SemiMajor: 300, SemiMinor: 100, Azimuth: 0, Depletion: dp})
	// Azimuth 0: the major axis points north (y), the minor east (x).
	for _, p := range [][2]float64{{1000, -500}, {1050, -300}, {950, -700}} {
		c := d.At(p[0], p[1])
		numtest.Abs(t, "inside ΔSyy (along a)", c.YY, path*dp*300/400, scale)
		numtest.Abs(t, "inside ΔSxx (along b)", c.XX, path*dp*100/400, scale)
		numtest.Abs(t, "inside ΔSxy", c.XY, 0, scale)
		numtest.Abs(t, "inside ΔSzz", c.ZZ, path*dp, scale)
		if c.Pore != dp {
			t.Errorf("inside Δp = %g, want %g", c.Pore, dp)
		}
	}
	circle := newEllipse(t, Layer{demoPoro, inf}, Ellipse{SemiMajor: 200, SemiMinor: 200, Azimuth: 0.3, Depletion: dp})
	for _, r := range []float64{200.001, 250, 400, 1e4} {
		for _, theta := range []float64{0, 0.4, 2} {
			x, y := r*math.Cos(theta), r*math.Sin(theta)
			c := circle.At(x, y)
			radial := c.XX*math.Cos(theta)*math.Cos(theta) + c.YY*math.Sin(theta)*math.Sin(theta) +
				2*c.XY*math.Sin(theta)*math.Cos(theta)
			hoop := c.XX + c.YY - radial
			want := path * dp * 200 * 200 / (2 * r * r)
			numtest.Abs(t, "circle radial", radial, want, scale)
			numtest.Abs(t, "circle tangential", hoop, -want, scale)
			numtest.Abs(t, "circle ΔSzz outside", c.ZZ, 0, scale)
			if c.Pore != 0 {
				t.Errorf("outside Δp = %g, want 0", c.Pore)
			}
		}
	}
}

// At the centre of a depleted circle of radius a in a layer of thickness
// h = 2c, ΔSxx = ΔSyy = A·Δp·(1 − c/(2√(a² + c²))) (docs/references.md
// §13.1, derived: the potential on the axis of a uniform disc is
// 2π(√(a² + z²) − |z|) (Kellogg 1929, ch. VI); integrated over the
// thickness it gives ψ_zz = −4π(1 − c/√(a² + c²)) at the centre, and
// ψ_xx = ψ_yy = −(4π + ψ_zz)/2). It tends to the uniaxial-strain value A·Δp
// as a/h grows (Engelder & Fischer 1994; Zoback 2007) and to the
// plane-strain value A·Δp/2 as a/h shrinks (Eshelby 1957).
func TestCircleCentreUniaxialLimit(t *testing.T) {
	const dp = -10 * mpa
	path := demoPoro.StressPath()
	for _, ratio := range []float64{1e-3, 0.1, 1, 10, 100, 1e3, 1e9} {
		const h = 30.0
		a := ratio * h
		c := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: a, SemiMinor: a, Depletion: dp}).At(0, 0)
		half := h / 2
		want := path * dp * (1 - half/(2*math.Hypot(a, half)))
		what := fmt.Sprintf("a/h = %g: ", ratio)
		numtest.Rel(t, what+"ΔSxx", c.XX, want, 1e-12)
		numtest.Rel(t, what+"ΔSyy", c.YY, want, 1e-12)
		numtest.Abs(t, what+"ΔSxy", c.XY, 0, 1e-12*math.Abs(want))
		numtest.Close(t, what+"ΔSzz", c.ZZ, 2*path*dp-2*want, 1e-12*math.Abs(want), 1e-9)
	}
	// A laterally infinite layer (a/h = 1e9) is in uniaxial strain to
	// 1e-9: ΔSh = A·ΔP, ΔSv = 0 (Engelder & Fischer 1994; Zoback 2007).
	wide := newEllipse(t, Layer{demoPoro, 30}, Ellipse{SemiMajor: 3e10, SemiMinor: 3e10, Depletion: dp}).At(0, 0)
	u := demoPoro.Uniaxial(dp)
	numtest.Rel(t, "infinite layer ΔSh", wide.XX, u.XX, 1e-9)
	numtest.Abs(t, "infinite layer ΔSv", wide.ZZ, 0, 1e-9*math.Abs(u.XX))
}

// Deep inside a long depleted strip of width 2b in a layer of thickness
// h = 2c the change along the strip is A·Δp and across it
// A·Δp·(1 − (2/π)·atan(c/b)) (docs/references.md §13.1, derived: in the
// vertical section across the strip the potential is two-dimensional, and
// over the rectangle of half-sides b and c its Hessian at the centre is
// ψ_yy = −8·atan(c/b) by the corner sums of the rectangle's logarithmic
// potential). So a wide strip (b ≫ h) is in uniaxial strain both ways, and
// a narrow one (b ≪ h) is free across, the plane-strain limit. A very long
// ellipse gives the strip's values at its centre.
func TestEllipseStripLimit(t *testing.T) {
	const (
		dp = -10 * mpa
		h  = 30.0
		// The ellipse is 1000 times longer than wide; its ends change the
		// centre by at most 8e-5 relative here (5e-3 at 100 times, 1e-6
		// at 10000 times: the strip is the limit).
		tol = 2e-4
	)
	path := demoPoro.StressPath()
	for _, b := range []float64{3, 30, 300, 3000} {
		d := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: 1000 * b, SemiMinor: b, Azimuth: 90 * deg, Depletion: dp})
		c := d.At(0, 0)
		what := fmt.Sprintf("strip b/h = %g: ", b/h)
		numtest.Rel(t, what+"along", c.XX, path*dp, tol)
		numtest.Rel(t, what+"across", c.YY, path*dp*(1-2/math.Pi*math.Atan(h/2/b)), tol)
	}
}

// An ellipse turned by an azimuth gives the turned change of the ellipse
// along north (the model is isotropic in the horizontal plane).
func TestEllipseRotationInvariance(t *testing.T) {
	const dp = -5 * mpa
	for _, h := range []float64{inf, 40} {
		north := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: 250, SemiMinor: 80, Depletion: dp})
		for _, az := range []float64{30 * deg, 90 * deg, 200 * deg} {
			turned := newEllipse(t, Layer{demoPoro, h}, Ellipse{X: 10, Y: 20, SemiMajor: 250, SemiMinor: 80, Azimuth: az, Depletion: dp})
			sin, cos := math.Sincos(az)
			for _, p := range [][2]float64{{0, 0}, {30, 100}, {-200, 260}, {90, -20}} {
				// p in the frame of the northern ellipse; turn it clockwise by az.
				x, y := 10+p[0]*cos+p[1]*sin, 20-p[0]*sin+p[1]*cos
				got := turned.At(x, y)
				ref := north.At(p[0], p[1])
				// The tensor turned clockwise by az: S′ = R S Rᵀ with R the same turn.
				wxx := ref.XX*cos*cos + ref.YY*sin*sin + 2*ref.XY*sin*cos
				wyy := ref.XX*sin*sin + ref.YY*cos*cos - 2*ref.XY*sin*cos
				wxy := (ref.YY-ref.XX)*sin*cos + ref.XY*(cos*cos-sin*sin)
				tol := 1e-10 * mpa
				what := fmt.Sprintf("h %g az %g° point %v: ", h, az/deg, p)
				numtest.Abs(t, what+"ΔSxx", got.XX, wxx, tol)
				numtest.Abs(t, what+"ΔSyy", got.YY, wyy, tol)
				numtest.Abs(t, what+"ΔSxy", got.XY, wxy, tol)
				numtest.Abs(t, what+"ΔSzz", got.ZZ, ref.ZZ, tol)
			}
		}
	}
}

// Far from the region the layer acts as one centre of dilatation of volume
// V = π·a·b·h: ψ_ij → V·∂_i∂_j(1/r), so along the major axis
// ψ_xx → 2V/r³ (Kellogg 1929: the far field of a body is that of a point
// of the same mass). The plane-strain limit decays as 1/r² instead.
func TestEllipseFarField(t *testing.T) {
	const (
		a, b, h, dp = 300.0, 100.0, 30.0, -10 * mpa
		r           = 3e5 // r/a = 1000: corrections of relative order (a/r)² = 1e-6
	)
	path := demoPoro.StressPath()
	d := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: a, SemiMinor: b, Azimuth: 90 * deg, Depletion: dp})
	xx, yy, _ := psiOf(d.At(r, 0), path, dp)
	v := math.Pi * a * b * h
	numtest.Rel(t, "far ψxx", xx, 2*v/(r*r*r), 1e-5)
	numtest.Rel(t, "far ψyy", yy, -v/(r*r*r), 1e-5)
}

func TestNewDepletedEllipseErrors(t *testing.T) {
	good := Ellipse{SemiMajor: 300, SemiMinor: 100, Depletion: -1e6}
	tests := []struct {
		name  string
		layer Layer
		edit  func(*Ellipse)
		param string
	}{
		{"zero thickness", Layer{demoPoro, 0}, func(*Ellipse) {}, "thickness"},
		{"NaN thickness", Layer{demoPoro, math.NaN()}, func(*Ellipse) {}, "thickness"},
		{"bad Biot", Layer{Poroelastic{Biot: 2, Poisson: 0.2}, 30}, func(*Ellipse) {}, "biot_coefficient"},
		{"minor above major", Layer{demoPoro, 30}, func(e *Ellipse) { e.SemiMinor = 400 }, "ellipse semi-major axis"},
		{"zero minor", Layer{demoPoro, 30}, func(e *Ellipse) { e.SemiMinor = 0 }, "ellipse semi-minor axis"},
		{"infinite major", Layer{demoPoro, 30}, func(e *Ellipse) { e.SemiMajor = inf }, "ellipse semi-major axis"},
		{"NaN depletion", Layer{demoPoro, 30}, func(e *Ellipse) { e.Depletion = math.NaN() }, "ellipse depletion"},
		{"NaN centre", Layer{demoPoro, 30}, func(e *Ellipse) { e.X = math.NaN() }, "ellipse x"},
	}
	for _, tc := range tests {
		e := good
		tc.edit(&e)
		_, err := NewDepletedEllipse(tc.layer, e)
		var ie *InputError
		if !errors.As(err, &ie) || ie.Name != tc.param {
			t.Errorf("%s: error %v, want an *InputError naming %q", tc.name, err, tc.param)
		}
	}
}

// The SHmax rotation around a depleted ellipse at stated points, against
// the closed form of Eshelby's elliptic cylinder (the plane-strain limit;
// Eshelby 1957; Mura 1987, §11) evaluated independently with an
// eigen-decomposition of the changed 2 × 2 tensor (docs/references.md
// §13.1, derived with docs/scripts/depletion.py, python3 + numpy 1.24).
// The ellipse has a = 300 m east, b = 100 m, Δp = −10 MPa, α = 1,
// ν = 0.22; in situ SHmax = 52 MPa at N60E and Shmin = 48 MPa. Inside the
// ellipse the stress falls more along its length (−5.384615 MPa) than
// across (−1.794872 MPa), so SHmax turns away from the long axis; beyond
// its tip the radial stress falls and the tangential one rises.
func TestRotationAroundEllipse(t *testing.T) {
	d := newEllipse(t, Layer{demoPoro, inf}, Ellipse{SemiMajor: 300, SemiMinor: 100, Azimuth: 90 * deg, Depletion: -10 * mpa})
	h := Horizontal{SHmax: 52 * mpa, Shmin: 48 * mpa, Azimuth: 60 * deg}
	tests := []struct {
		x, y                       float64
		dxx, dyy, dxy              float64 // MPa
		shmax, shmin, az, rotation float64 // MPa, degrees
	}{
		{0, 0, -5.384615, -1.794872, 0, 48.315990, 44.504523, 32.674345, -27.325655},
		{150, 50, -5.384615, -1.794872, 0, 48.315990, 44.504523, 32.674345, -27.325655},
		{400, 0, -1.115190, 1.115190, 0, 51.735877, 48.264123, 43.097568, -16.902432},
		{0, 200, 1.137903, -1.137903, 0, 52.751478, 47.248522, 70.493438, 10.493438},
		{250, 150, 0.316742, -0.316742, -1.266968, 51.396464, 48.603536, 80.273212, 20.273212},
		{-250, 150, 0.316742, -0.316742, 1.266968, 53.275351, 46.724649, 56.852120, -3.147880},
	}
	const printed = 1e-6 // the values are printed with six decimals
	changes := make([]StressChange, len(tests))
	for i, tc := range tests {
		changes[i] = d.At(tc.x, tc.y)
	}
	after := make([]Horizontal, len(tests))
	rot := make([]float64, len(tests))
	ChangedHorizontals(after, rot, h, changes)
	for i, tc := range tests {
		what := fmt.Sprintf("(%g, %g): ", tc.x, tc.y)
		numtest.Abs(t, what+"ΔSxx", changes[i].XX/mpa, tc.dxx, printed)
		numtest.Abs(t, what+"ΔSyy", changes[i].YY/mpa, tc.dyy, printed)
		numtest.Abs(t, what+"ΔSxy", changes[i].XY/mpa, tc.dxy, printed)
		numtest.Abs(t, what+"SHmax", after[i].SHmax/mpa, tc.shmax, printed)
		numtest.Abs(t, what+"Shmin", after[i].Shmin/mpa, tc.shmin, printed)
		numtest.Abs(t, what+"azimuth", after[i].Azimuth/deg, tc.az, printed)
		numtest.Abs(t, what+"rotation", rot[i]/deg, tc.rotation, printed)
	}
}

// Equilibrium across the edge of the depleted region: the traction ΔS·n
// on the boundary is continuous (the free strain jumps, the stress it
// leaves does not), while the normal stress along the boundary jumps by
// exactly A·Δp, since ψ_ij jumps by 4π·n_i·n_j across a step of density
// (Kellogg 1929, ch. VI; Eshelby 1957). This ties the interior and
// exterior closed forms and the thickness correction together without any
// reference value.
func TestEllipseTractionContinuity(t *testing.T) {
	const (
		a, b, dp = 300.0, 100.0, -10 * mpa
		step     = 1e-6 // m either side of the boundary
	)
	path := demoPoro.StressPath()
	// The change varies over lengths ≥ 1 m here, so 1e-6 m either side
	// moves it by less than 1e-5 of A·|Δp|.
	tol := 1e-5 * path * math.Abs(dp)
	for _, h := range []float64{inf, 30} {
		d := newEllipse(t, Layer{demoPoro, h}, Ellipse{SemiMajor: a, SemiMinor: b, Azimuth: 90 * deg, Depletion: dp})
		for k := range 24 {
			th := 2 * math.Pi * (float64(k) + 0.3) / 24
			x, y := a*math.Cos(th), b*math.Sin(th)
			nx, ny := b*math.Cos(th), a*math.Sin(th)
			norm := math.Hypot(nx, ny)
			nx, ny = nx/norm, ny/norm
			in, out := d.At(x-step*nx, y-step*ny), d.At(x+step*nx, y+step*ny)
			if in.Pore != dp || out.Pore != 0 {
				t.Fatalf("h %g θ %.2f: Δp inside %g, outside %g", h, th, in.Pore, out.Pore)
			}
			what := fmt.Sprintf("h %g θ %.2f: ", h, th)
			numtest.Abs(t, what+"traction x", in.XX*nx+in.XY*ny, out.XX*nx+out.XY*ny, tol)
			numtest.Abs(t, what+"traction y", in.XY*nx+in.YY*ny, out.XY*nx+out.YY*ny, tol)
			along := func(c StressChange) float64 { return c.XX*ny*ny + c.YY*nx*nx - 2*c.XY*nx*ny }
			numtest.Abs(t, what+"jump along the boundary", along(in)-along(out), path*dp, tol)
		}
	}
}
