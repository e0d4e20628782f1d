package elastic

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

// localStress is the stress (tension-positive, Pa) at a point, in the
// frame of a source element (x̄ along its tangent, ȳ along its normal),
// caused by a unit displacement discontinuity D̄x = 1 m (index 0) or
// D̄y = 1 m (index 1) in Crouch & Starfield's convention D = u(ȳ=0⁻) −
// u(ȳ=0⁺).
type localStress struct {
	xx, yy, xy [2]float64
}

// kernel holds the material constants of the constant-element kernel.
type kernel struct {
	g2 float64 // 2G, Pa
	c  float64 // C = 1/(4π(1−ν))
}

func newKernel(m Material) kernel {
	return kernel{g2: 2 * m.ShearModulus, c: 1 / (4 * math.Pi * (1 - m.PoissonRatio))}
}

// stress returns the stress at the local point (x, y) of a constant
// displacement discontinuity on |x| ≤ a, y = 0 (Crouch & Starfield 1983,
// Boundary Element Methods in Solid Mechanics, §5.2, plane strain):
//
//	f(x, y) = −C [y(θ1 − θ2) − (x−a) ln r1 + (x+a) ln r2],  C = 1/(4π(1−ν)),
//	r1² = (x−a)² + y², r2² = (x+a)² + y²,
//
// whose derivatives are rational:
//
//	f,xy  = C [y/r1² − y/r2²]
//	f,xx  = −f,yy = C [(x−a)/r1² − (x+a)/r2²]
//	f,xyy = −f,xxx = C [((x−a)² − y²)/r1⁴ − ((x+a)² − y²)/r2⁴]
//	f,yyy = −f,xxy = 2yC [(x−a)/r1⁴ − (x+a)/r2⁴]
//
// and
//
//	σxx = 2G Dx [2f,xy + y f,xyy] + 2G Dy [f,yy + y f,yyy]
//	σyy = 2G Dx [−y f,xyy]        + 2G Dy [f,yy − y f,yyy]
//	σxy = 2G Dx [f,yy + y f,yyy]  + 2G Dy [−y f,xyy]
//
// (the σxy–Dy term is −y f,xyy). The stress is continuous across the
// element and singular at its tips, where r1 or r2 vanishes.
func (k kernel) stress(x, y, a float64) localStress {
	xm, xp := x-a, x+a
	y2 := y * y
	r1 := xm*xm + y2
	r2 := xp*xp + y2
	r1s, r2s := r1*r1, r2*r2
	fxy := k.c * (y/r1 - y/r2)
	fyy := -k.c * (xm/r1 - xp/r2)
	fxyy := k.c * ((xm*xm-y2)/r1s - (xp*xp-y2)/r2s)
	fyyy := 2 * y * k.c * (xm/r1s - xp/r2s)
	g := k.g2
	return localStress{
		xx: [2]float64{g * (2*fxy + y*fxyy), g * (fyy + y*fyyy)},
		yy: [2]float64{g * (-y * fxyy), g * (fyy - y*fyyy)},
		xy: [2]float64{g * (fyy + y*fyyy), g * (-y * fxyy)},
	}
}

// Block is the influence of one element's displacement discontinuity on
// another's tractions: the change of shear traction Δτ and normal stress
// Δσn (compression-positive) at the receiver per unit slip s and opening
// w of the source, Pa/m. See the package documentation for the signs.
type Block struct {
	ShearSlip, ShearOpening   float64 // ∂Δτ/∂s, ∂Δτ/∂w
	NormalSlip, NormalOpening float64 // ∂Δσn/∂s, ∂Δσn/∂w
}

// collocation returns the raw constant-element coefficients: the
// tractions at the centre of receiver r caused by unit slip and opening of
// source s, in the public convention, without height correction or
// symmetrization.
//
// In the source's frame the receiver has tangent t̄ = (cos θ, sin θ) and
// normal n̄ = (−sin θ, cos θ). The tension-positive tractions there are
// σtn = t̄·σ·n̄ and σnn = n̄·σ·n̄; the public variables are s = −D̄x,
// w = −D̄y, Δτ = σtn and Δσn = −σnn, so
//
//	∂Δτ/∂s = −σtn[Dx], ∂Δτ/∂w = −σtn[Dy], ∂Δσn/∂s = σnn[Dx], ∂Δσn/∂w = σnn[Dy].
func (k kernel) collocation(r, s *geometry) Block {
	d := r2.Sub(r.c, s.c)
	x, y := r2.Dot(d, s.t), r2.Dot(d, s.n)
	cs, sn := r2.Dot(r.t, s.t), r2.Dot(r.t, s.n)
	st := k.stress(x, y, s.a)
	var tn, nn [2]float64
	for c := range 2 {
		tn[c] = cs*sn*(st.yy[c]-st.xx[c]) + (cs*cs-sn*sn)*st.xy[c]
		nn[c] = sn*sn*st.xx[c] - 2*sn*cs*st.xy[c] + cs*cs*st.yy[c]
	}
	return Block{ShearSlip: -tn[0], ShearOpening: -tn[1], NormalSlip: nn[0], NormalOpening: nn[1]}
}

// fieldStress returns the stress change (compression-positive, global
// frame) at p per unit slip (index 0) and opening (index 1) of source s,
// without height correction: S = −σ with D̄ = −(s, w), so S per unit slip
// is +σ[Dx] and per unit opening +σ[Dy], rotated by σ = σ̄xx t tᵀ +
// σ̄yy n nᵀ + σ̄xy (t nᵀ + n tᵀ).
func (k kernel) fieldStress(p r2.Vec, s *geometry) [2]Stress {
	d := r2.Sub(p, s.c)
	st := k.stress(r2.Dot(d, s.t), r2.Dot(d, s.n), s.a)
	t, n := s.t, s.n
	var out [2]Stress
	for c := range 2 {
		out[c] = Stress{
			XX: st.xx[c]*t.X*t.X + st.yy[c]*n.X*n.X + 2*st.xy[c]*t.X*n.X,
			YY: st.xx[c]*t.Y*t.Y + st.yy[c]*n.Y*n.Y + 2*st.xy[c]*t.Y*n.Y,
			XY: st.xx[c]*t.X*t.Y + st.yy[c]*n.X*n.Y + st.xy[c]*(t.X*n.Y+n.X*t.Y),
		}
	}
	return out
}
