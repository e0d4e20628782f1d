package elastic

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// TestSelfInfluence checks the self-influence of a constant element:
// σyy per unit D_y and σxy per unit D_x at its centre are G/(π(1−ν)a)
// (Crouch & Starfield 1983, §5.2), which in this package's convention is
// ∂Δσn/∂w = +G/(π(1−ν)a) and ∂Δτ/∂s = −G/(π(1−ν)a), with no coupling.
func TestSelfInfluence(t *testing.T) {
	for _, tc := range []struct {
		name   string
		m      Material
		length float64
		want   float64 // G/(π(1−ν)a), Pa/m
	}{
		// 30e9/(π·0.75·1) = 1.2732395447e10 Pa/m, the check value of the
		// constant-element kernel (common practice, no source).
		{"G30 nu0.25 a1", rock, 2, 1.2732395447351628e10},
		{"G10 nu0.1 a0.5", Material{ShearModulus: 10e9, PoissonRatio: 0.1}, 1, 10e9 / (math.Pi * 0.9 * 0.5)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for _, s := range []Settings{{}, {PlaneStrain: true}} {
				el := []Element{{P0: r2.Vec{X: 3, Y: 1}, P1: r2.Vec{X: 3 + 0.6*tc.length, Y: 1 + 0.8*tc.length}, Height: 7}}
				d, err := NewDense(el, tc.m, s)
				if err != nil {
					t.Fatal(err)
				}
				b := d.At(0, 0)
				const tol = 1e-12 // a few roundings of a closed form
				numtest.Rel(t, "∂Δσn/∂w", b.NormalOpening, tc.want, tol)
				numtest.Rel(t, "∂Δτ/∂s", b.ShearSlip, -tc.want, tol)
				numtest.Abs(t, "∂Δτ/∂w", b.ShearOpening, 0, tol*tc.want)
				numtest.Abs(t, "∂Δσn/∂s", b.NormalSlip, 0, tol*tc.want)
			}
		})
	}
}

// displacement returns the displacement at the local point (x, y) of a
// constant discontinuity (Dx, Dy) on |x| ≤ a (Crouch & Starfield 1983,
// §5.2):
//
//	u_x = Dx[2(1−ν) f,y − y f,xx] + Dy[−(1−2ν) f,x − y f,xy]
//	u_y = Dx[(1−2ν) f,x − y f,xy] + Dy[2(1−ν) f,y − y f,yy]
//
// with f,x = C ln(r1/r2) and f,y = −C [atan2(y, x−a) − atan2(y, x+a)].
func displacement(x, y, a, nu, dx, dy float64) (ux, uy float64) {
	c := 1 / (4 * math.Pi * (1 - nu))
	r1, r2 := (x-a)*(x-a)+y*y, (x+a)*(x+a)+y*y
	fx := c * 0.5 * math.Log(r1/r2)
	fy := -c * (math.Atan2(y, x-a) - math.Atan2(y, x+a))
	fxy := c * (y/r1 - y/r2)
	fxx := c * ((x-a)/r1 - (x+a)/r2)
	fyy := -fxx
	ux = dx*(2*(1-nu)*fy-y*fxx) + dy*(-(1-2*nu)*fx-y*fxy)
	uy = dx*((1-2*nu)*fx-y*fxy) + dy*(2*(1-nu)*fy-y*fyy)
	return ux, uy
}

// TestKernelHooke checks the stress kernel independently of its
// derivation: at points around the element, the stresses equal Hooke's
// law for plane strain (σ = 2G ε + λ tr ε I, λ = 2Gν/(1−2ν)) applied to
// central-difference strains of the displacement formulas (Crouch &
// Starfield 1983, §5.2; Hooke's law as in Jaeger, Cook & Zimmerman 2007,
// §5.4).
func TestKernelHooke(t *testing.T) {
	const (
		a    = 1.0
		step = 1e-5 // m; truncation O(step²) ≈ 1e-10, round-off ≈ 1e-16/step
		tol  = 1e-6 // relative to the largest stress component
	)
	k := newKernel(rock)
	g, nu := rock.ShearModulus, rock.PoissonRatio
	lambda := 2 * g * nu / (1 - 2*nu)
	for _, p := range []r2.Vec{{X: 0.3, Y: 0.7}, {X: -1.7, Y: 0.4}, {X: 2.5, Y: -1.1}, {X: 0.2, Y: -0.05}, {X: 1.2, Y: 0.01}} {
		st := k.stress(p.X, p.Y, a)
		for c, d := range [2][2]float64{{1, 0}, {0, 1}} {
			u := func(x, y float64) (float64, float64) { return displacement(x, y, a, nu, d[0], d[1]) }
			uxp, uyp := u(p.X+step, p.Y)
			uxm, uym := u(p.X-step, p.Y)
			vxp, vyp := u(p.X, p.Y+step)
			vxm, vym := u(p.X, p.Y-step)
			exx := (uxp - uxm) / (2 * step)
			eyy := (vyp - vym) / (2 * step)
			exy := 0.5 * ((vxp-vxm)/(2*step) + (uyp-uym)/(2*step))
			want := [3]float64{2*g*exx + lambda*(exx+eyy), 2*g*eyy + lambda*(exx+eyy), 2 * g * exy}
			got := [3]float64{st.xx[c], st.yy[c], st.xy[c]}
			scale := math.Max(math.Abs(want[0]), math.Max(math.Abs(want[1]), math.Abs(want[2])))
			for i, name := range []string{"σxx", "σyy", "σxy"} {
				numtest.Abs(t, name, got[i], want[i], tol*scale)
			}
		}
	}
}

// TestDisplacementJump checks the sign convention D = u(0⁻) − u(0⁺) of
// Crouch & Starfield (1983, §5.2): across the element u jumps by −D, and
// a pure D_y (D_x) moves the faces symmetrically, u_y (u_x) = ∓D/2 just
// above and below; so opening w = −D_y moves the upper face (the side
// of the normal) up.
func TestDisplacementJump(t *testing.T) {
	const tol = 1e-9 // distance 1e-12 m from the element, O(y) error
	for _, x := range []float64{-0.8, 0, 0.45} {
		uxp, uyp := displacement(x, 1e-12, 1, 0.25, 0.7, -1.3)
		uxm, uym := displacement(x, -1e-12, 1, 0.25, 0.7, -1.3)
		numtest.Abs(t, "jump of u_x", uxp-uxm, -0.7, tol)
		numtest.Abs(t, "jump of u_y", uyp-uym, 1.3, tol)
		_, uyp = displacement(x, 1e-12, 1, 0.25, 0, 1)
		_, uym = displacement(x, -1e-12, 1, 0.25, 0, 1)
		numtest.Abs(t, "u_y(0⁺)", uyp, -0.5, tol)
		numtest.Abs(t, "u_y(0⁻)", uym, 0.5, tol)
		uxp, _ = displacement(x, 1e-12, 1, 0.25, 1, 0)
		uxm, _ = displacement(x, -1e-12, 1, 0.25, 1, 0)
		numtest.Abs(t, "u_x(0⁺)", uxp, -0.5, tol)
		numtest.Abs(t, "u_x(0⁻)", uxm, 0.5, tol)
	}
}

// TestBlockInvariance checks, on random pairs of elements, that the
// influence does not depend on the order of an element's end points:
// slip (right-lateral), opening, Δτ (driving right-lateral slip) and Δσn
// are all unchanged when t and n are reversed (a consequence of the
// conventions, common practice, no source).
func TestBlockInvariance(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	const tol = 1e-11 // relative to the largest entry; round-off of rotations
	reverse := func(e Element) Element { return Element{P0: e.P1, P1: e.P0, Height: e.Height} }
	for range 200 {
		el := make([]Element, 2)
		for i := range el {
			c := r2.Vec{X: 20 * r.Float64(), Y: 20 * r.Float64()}
			th := math.Pi * r.Float64()
			d := r2.Scale(0.5+3*r.Float64(), r2.Vec{X: math.Cos(th), Y: math.Sin(th)})
			el[i] = Element{P0: r2.Sub(c, d), P1: r2.Add(c, d), Height: 5 + 20*r.Float64()}
		}
		want := mustDense(t, el, Settings{}).At(0, 1)
		scale := math.Max(math.Max(math.Abs(want.ShearSlip), math.Abs(want.ShearOpening)),
			math.Max(math.Abs(want.NormalSlip), math.Abs(want.NormalOpening)))
		for _, rev := range [][]Element{{reverse(el[0]), el[1]}, {el[0], reverse(el[1])}, {reverse(el[0]), reverse(el[1])}} {
			got := mustDense(t, rev, Settings{}).At(0, 1)
			numtest.Abs(t, "ShearSlip", got.ShearSlip, want.ShearSlip, tol*scale)
			numtest.Abs(t, "ShearOpening", got.ShearOpening, want.ShearOpening, tol*scale)
			numtest.Abs(t, "NormalSlip", got.NormalSlip, want.NormalSlip, tol*scale)
			numtest.Abs(t, "NormalOpening", got.NormalOpening, want.NormalOpening, tol*scale)
		}
	}
}

// TestFieldMatchesOperator checks that the stress field of a source,
// resolved on a receiver of the same length, height and orientation,
// equals the operator's coefficient (for such a pair collocation is
// already reciprocal, so the operator's mean changes nothing); and that
// a parallel neighbour of an opened element is compressed (the stress
// shadow, Sneddon 1946).
func TestFieldMatchesOperator(t *testing.T) {
	src := Element{P0: r2.Vec{X: -2, Y: 0}, P1: r2.Vec{X: 2, Y: 3}, Height: 12}
	off := r2.Vec{X: -3.3, Y: 4.1}
	rcv := Element{P0: r2.Add(src.P0, off), P1: r2.Add(src.P1, off), Height: 12}
	el := []Element{rcv, src}
	for _, s := range []Settings{{}, {PlaneStrain: true}} {
		want := mustDense(t, el, s).At(0, 1)
		f, err := NewField(el, rock, []r2.Vec{rcv.Centre()}, s)
		if err != nil {
			t.Fatal(err)
		}
		perSlip := f.StressAt(rcv.Centre(), []float64{0, 1}, []float64{0, 0})
		perOpen := f.StressAt(rcv.Centre(), []float64{0, 0}, []float64{0, 1})
		ts, ns := perSlip.OnPlane(rcv.Tangent())
		to, no := perOpen.OnPlane(rcv.Tangent())
		const tol = 1e-12 // same formulas, different order of operations
		scale := math.Abs(want.NormalOpening)
		numtest.Abs(t, "ShearSlip", ts, want.ShearSlip, tol*scale)
		numtest.Abs(t, "NormalSlip", ns, want.NormalSlip, tol*scale)
		numtest.Abs(t, "ShearOpening", to, want.ShearOpening, tol*scale)
		numtest.Abs(t, "NormalOpening", no, want.NormalOpening, tol*scale)
		if !(want.NormalOpening > 0) {
			t.Errorf("opening compresses a parallel neighbour: ∂Δσn/∂w = %g, want > 0", want.NormalOpening)
		}
	}
}
