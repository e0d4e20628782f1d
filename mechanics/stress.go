package mechanics

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/spatial/r3"
)

// Stress is an in-situ stress state: the total stress tensor in
// East-North-Up coordinates, compression-positive, and the pore pressure.
// Build it with [NewStress], [NewAndersonian] or [StressAtDepth]; the zero
// value is an unloaded state.
type Stress struct {
	t         [3][3]float64 // total stress tensor, Pa, ENU, compression-positive
	pore      float64       // pore pressure, Pa
	principal [3]Principal  // S1 ≥ S2 ≥ S3
	regime    string        // faulting regime of an Andersonian state, "" otherwise
}

// Principal is one principal stress.
type Principal struct {
	// Name is "SHmax", "Shmin" or "Sv" for a state with a vertical
	// principal axis built by NewAndersonian or StressAtDepth, and "S1",
	// "S2" or "S3" otherwise.
	Name string
	// Value of the principal stress, Pa, compression-positive.
	Value float64
	// Axis is the unit principal direction (its sense is arbitrary).
	Axis r3.Vec
}

// Andersonian is a stress state with one principal axis vertical and two
// horizontal, in magnitudes (Anderson's assumption for the upper crust).
type Andersonian struct {
	SHmax float64 // maximum horizontal stress, Pa
	Shmin float64 // minimum horizontal stress, Pa
	Sv    float64 // vertical stress, Pa
	// SHmaxAzimuth is the azimuth of SHmax, radians clockwise from north.
	SHmaxAzimuth float64
	PorePressure float64 // Pa
}

// Gradients describe the stress state as gradients from the surface.
type Gradients struct {
	Sv           float64 // vertical stress gradient, Pa/m
	SHmax        float64 // maximum horizontal stress gradient, Pa/m
	Shmin        float64 // minimum horizontal stress gradient, Pa/m
	PorePressure float64 // pore-pressure gradient, Pa/m
	// SHmaxAzimuth is the azimuth of SHmax, radians clockwise from north.
	SHmaxAzimuth float64
}

// Validate returns an error for a gradient that is not positive (pore
// pressure: negative), an SHmax gradient below the Shmin gradient, or a
// pore-pressure gradient not below the least stress gradient.
func (g Gradients) Validate() error {
	if err := firstError(
		positive("sv_gradient", g.Sv),
		positive("shmax_gradient", g.SHmax),
		positive("shmin_gradient", g.Shmin),
		nonNegative("pore_pressure_gradient", g.PorePressure),
		finite("shmax_azimuth", g.SHmaxAzimuth),
	); err != nil {
		return err
	}
	if g.SHmax < g.Shmin {
		return &InputError{Name: "shmax_gradient", Value: g.SHmax,
			Want: fmt.Sprintf("must be ≥ shmin_gradient (%g Pa/m)", g.Shmin)}
	}
	if least := math.Min(g.Sv, g.Shmin); g.PorePressure >= least {
		return &InputError{Name: "pore_pressure_gradient", Value: g.PorePressure,
			Want: fmt.Sprintf("must be < the least stress gradient (%g Pa/m): the fractures would already be open", least)}
	}
	return nil
}

// AtDepth returns the stress magnitudes at the true vertical depth z, m:
// each stress is its gradient times z (docs/references.md §7.1).
func (g Gradients) AtDepth(z float64) Andersonian {
	return Andersonian{
		SHmax:        g.SHmax * z,
		Shmin:        g.Shmin * z,
		Sv:           g.Sv * z,
		SHmaxAzimuth: g.SHmaxAzimuth,
		PorePressure: g.PorePressure * z,
	}
}

// StressAtDepth returns the stress state at true vertical depth z, m, from
// the gradients g.
func StressAtDepth(g Gradients, z float64) (Stress, error) {
	if err := g.Validate(); err != nil {
		return Stress{}, err
	}
	if err := positive("depth", z); err != nil {
		return Stress{}, err
	}
	return NewAndersonian(g.AtDepth(z))
}

// NewAndersonian returns the stress state with principal stresses SHmax
// and Shmin horizontal and Sv vertical. With θ the SHmax azimuth, the
// principal axes are eH = (sin θ, cos θ, 0), eh = (cos θ, −sin θ, 0) and
// ev = (0, 0, 1), and S = SHmax·eH·eHᵀ + Shmin·eh·ehᵀ + Sv·ev·evᵀ
// (docs/references.md §7.1). Equal principal values are ordered SHmax, Sv,
// Shmin.
func NewAndersonian(a Andersonian) (Stress, error) {
	if err := firstError(
		positive("shmax", a.SHmax),
		positive("shmin", a.Shmin),
		positive("sv", a.Sv),
		finite("shmax_azimuth", a.SHmaxAzimuth),
	); err != nil {
		return Stress{}, err
	}
	if a.SHmax < a.Shmin {
		return Stress{}, &InputError{Name: "shmax", Value: a.SHmax,
			Want: fmt.Sprintf("must be ≥ shmin (%g Pa)", a.Shmin)}
	}
	sin, cos := math.Sincos(a.SHmaxAzimuth)
	p := [3]Principal{
		{Name: "SHmax", Value: a.SHmax, Axis: r3.Vec{X: sin, Y: cos}},
		{Name: "Sv", Value: a.Sv, Axis: r3.Vec{Z: 1}},
		{Name: "Shmin", Value: a.Shmin, Axis: r3.Vec{X: cos, Y: -sin}},
	}
	sort.SliceStable(p[:], func(i, j int) bool { return p[i].Value > p[j].Value })
	s := Stress{principal: p, t: tensorFrom(p)}
	switch {
	case p[0].Name == "Sv":
		s.regime = "normal"
	case p[1].Name == "Sv":
		s.regime = "strike-slip"
	default:
		s.regime = "reverse"
	}
	if err := s.setPorePressure(a.PorePressure); err != nil {
		return Stress{}, err
	}
	return s, nil
}

// NewStress returns the stress state with the given total stress tensor,
// Pa (East-North-Up, compression-positive, symmetric), and pore pressure,
// Pa. The principal stresses come from the tensor's eigen-decomposition.
func NewStress(tensor [3][3]float64, porePressure float64) (Stress, error) {
	scale := 0.0
	for i := range 3 {
		for j := range 3 {
			v := tensor[i][j]
			if err := finite(fmt.Sprintf("stress[%d][%d]", i, j), v); err != nil {
				return Stress{}, err
			}
			scale = math.Max(scale, math.Abs(v))
		}
	}
	const symTol = 1e-9 // relative asymmetry allowed from round-off, common practice, no source
	for i := range 3 {
		for j := i + 1; j < 3; j++ {
			if math.Abs(tensor[i][j]-tensor[j][i]) > symTol*scale {
				return Stress{}, &InputError{Name: fmt.Sprintf("stress[%d][%d]", i, j), Value: tensor[i][j],
					Want: fmt.Sprintf("must equal stress[%d][%d] = %g (the tensor is symmetric)", j, i, tensor[j][i])}
			}
		}
	}
	s := Stress{t: tensor}
	s.principal = principalOf(tensor)
	if err := s.setPorePressure(porePressure); err != nil {
		return Stress{}, err
	}
	return s, nil
}

// setPorePressure checks 0 ≤ p < S3 and stores p.
func (s *Stress) setPorePressure(p float64) error {
	if err := nonNegative("pore_pressure", p); err != nil {
		return err
	}
	if s3 := s.principal[2].Value; p >= s3 {
		return &InputError{Name: "pore_pressure", Value: p,
			Want: fmt.Sprintf("must be < the least principal stress %s = %g Pa: the fractures would already be open", s.principal[2].Name, s3)}
	}
	s.pore = p
	return nil
}

// tensorFrom returns Σ Si·ei·eiᵀ.
func tensorFrom(p [3]Principal) [3][3]float64 {
	var t [3][3]float64
	for _, q := range p {
		e := [3]float64{q.Axis.X, q.Axis.Y, q.Axis.Z}
		for i := range 3 {
			for j := range 3 {
				t[i][j] += q.Value * e[i] * e[j]
			}
		}
	}
	return t
}

// principalOf returns the principal stresses of t, largest first.
func principalOf(t [3][3]float64) [3]Principal {
	sym := mat.NewSymDense(3, []float64{
		t[0][0], t[0][1], t[0][2],
		t[0][1], t[1][1], t[1][2],
		t[0][2], t[1][2], t[2][2],
	})
	var eig mat.EigenSym
	if !eig.Factorize(sym, true) {
		panic("mechanics: eigen-decomposition of a finite symmetric 3×3 matrix failed")
	}
	vals := eig.Values(nil) // ascending
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	var p [3]Principal
	for k := range 3 {
		c := 2 - k
		p[k] = Principal{
			Name:  fmt.Sprintf("S%d", k+1),
			Value: vals[c],
			Axis:  r3.Unit(r3.Vec{X: vecs.At(0, c), Y: vecs.At(1, c), Z: vecs.At(2, c)}),
		}
	}
	return p
}

// Tensor returns the total stress tensor, Pa, East-North-Up,
// compression-positive.
func (s Stress) Tensor() [3][3]float64 { return s.t }

// PorePressure returns the pore pressure of the state, Pa.
func (s Stress) PorePressure() float64 { return s.pore }

// Principal returns the principal stresses S1 ≥ S2 ≥ S3.
func (s Stress) Principal() [3]Principal { return s.principal }

// Regime returns the Andersonian faulting regime: "normal" (Sv = S1),
// "strike-slip" (Sv = S2) or "reverse" (Sv = S3); "" for a state built
// from a general tensor.
func (s Stress) Regime() string { return s.regime }

// Traction returns t = S·n, Pa, the compression-positive traction on the
// plane with normal n.
func (s Stress) Traction(n r3.Vec) r3.Vec {
	t := &s.t
	return r3.Vec{
		X: t[0][0]*n.X + t[0][1]*n.Y + t[0][2]*n.Z,
		Y: t[1][0]*n.X + t[1][1]*n.Y + t[1][2]*n.Z,
		Z: t[2][0]*n.X + t[2][1]*n.Y + t[2][2]*n.Z,
	}
}

// FrictionalLimitRatio returns the largest effective principal stress
// ratio (S1 − p)/(S3 − p) that rock with friction coefficient mu can
// sustain, [√(μ²+1) + μ]² (Jaeger, Cook & Zimmerman 2007; Zoback 2007,
// ch. 4; docs/references.md §7.3).
func FrictionalLimitRatio(mu float64) float64 {
	r := math.Sqrt(mu*mu+1) + mu
	return r * r
}

// OptimalAngle returns the angle, radians, between the optimally oriented
// plane for slip and S1: ½·atan(1/μ) = 45° − φ/2 with φ = atan μ. The
// plane contains S2, and its normal is at 45° + φ/2 from S1
// (docs/references.md §7.3).
func OptimalAngle(mu float64) float64 { return 0.5 * math.Atan(1/mu) }

// LimitCheck is the comparison of a stress state with the frictional
// limit.
type LimitCheck struct {
	Friction float64 // friction coefficient μ
	Ratio    float64 // (S1 − p)/(S3 − p) of the state
	Limit    float64 // [√(μ²+1) + μ]²
	Exceeded bool    // Ratio > Limit
	Warning  string  // why the state is suspect; "" when not exceeded
}

// limitSlack is the relative margin by which the ratio must exceed the
// limit to count, so that a state built exactly at the limit is not flagged
// from round-off (common practice, no source).
const limitSlack = 1e-12

// CheckFrictionalLimit compares the state's effective principal stress
// ratio with the frictional limit for friction mu. A state beyond the limit
// cannot persist in rock with that friction (optimally oriented fractures
// would slip and relax it), so the result carries a warning; it is not an
// error. The error is for mu ≤ 0.
func (s Stress) CheckFrictionalLimit(mu float64) (LimitCheck, error) {
	if err := positive("friction_static", mu); err != nil {
		return LimitCheck{}, err
	}
	s1, s3 := s.principal[0].Value, s.principal[2].Value
	c := LimitCheck{
		Friction: mu,
		Ratio:    (s1 - s.pore) / (s3 - s.pore),
		Limit:    FrictionalLimitRatio(mu),
	}
	if c.Ratio > c.Limit*(1+limitSlack) {
		c.Exceeded = true
		c.Warning = fmt.Sprintf("the stress state exceeds the frictional limit: (S1-p)/(S3-p) = %.4f > %.4f for friction %.3g; "+
			"optimally oriented fractures would already slip at the initial pore pressure (Jaeger & Cook; Zoback 2007)",
			c.Ratio, c.Limit, mu)
	}
	return c, nil
}
