package elastic

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/spatial/r2"
)

// Material of the check values: G = 30 GPa, ν = 0.25 (Crouch &
// Starfield 1983-style verification case, common practice, no source).
var rock = Material{ShearModulus: 30e9, PoissonRatio: 0.25}

// networkSettings describe a DFN-like test network: three sets of
// vertical fractures striking N030°E, N100°E and N150°E (normal spread
// 8°), power-law trace lengths on [20, 400] m with exponent 2
// (density ∝ L⁻³, the range and exponent of outcrop trace maps; common
// practice, no source), uniform centres at a trace density P21 of
// 0.05 m/m², each trace split into equal elements of about 7.5 m.
// Heights are 20 m, or uniform on [10, 40] m per fracture when varied.
type networkSettings struct {
	elements int
	seed     uint64
	varied   bool // heights vary between fractures
}

const (
	elementTarget = 7.5  // m
	traceDensity  = 0.05 // P21, 1/m
	lMin, lMax    = 20.0, 400.0
)

// dfnElements returns a network of at least s.elements elements.
func dfnElements(s networkSettings) []Element {
	r := rand.New(rand.NewPCG(s.seed, 2))
	side := math.Sqrt(float64(s.elements) * elementTarget / traceDensity)
	strikes := []float64{30, 100, 150}
	var out []Element
	for len(out) < s.elements {
		// Inverse CDF of the truncated power law with density ∝ L⁻³.
		u := r.Float64()
		l := 1 / math.Sqrt(1/(lMin*lMin)-u*(1/(lMin*lMin)-1/(lMax*lMax)))
		strike := (strikes[r.IntN(len(strikes))] + 8*r.NormFloat64()) * math.Pi / 180
		dir := r2.Vec{X: math.Sin(strike), Y: math.Cos(strike)}
		c := r2.Vec{X: side * r.Float64(), Y: side * r.Float64()}
		h := 20.0
		if s.varied {
			h = 10 + 30*r.Float64()
		}
		k := int(math.Ceil(l / elementTarget))
		p0 := r2.Sub(c, r2.Scale(l/2, dir))
		for e := range k {
			out = append(out, Element{
				P0:     r2.Add(p0, r2.Scale(l*float64(e)/float64(k), dir)),
				P1:     r2.Add(p0, r2.Scale(l*float64(e+1)/float64(k), dir)),
				Height: h,
			})
		}
	}
	return out
}

// randomVector returns n values uniform on [−scale, scale].
func randomVector(r *rand.Rand, n int, scale float64) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = scale * (2*r.Float64() - 1)
	}
	return v
}

// solveTractions returns the slip and opening at which the operator's
// tractions equal tau and sigma, by a dense LU solve.
func solveTractions(t testing.TB, op Operator, tau, sigma []float64) (slip, opening []float64) {
	t.Helper()
	n := op.Len()
	a := mat.NewDense(2*n, 2*n, nil)
	for i := range n {
		for j := range n {
			b := op.At(i, j)
			a.Set(i, j, b.ShearSlip)
			a.Set(i, n+j, b.ShearOpening)
			a.Set(n+i, j, b.NormalSlip)
			a.Set(n+i, n+j, b.NormalOpening)
		}
	}
	rhs := mat.NewVecDense(2*n, append(append([]float64(nil), tau...), sigma...))
	var x mat.VecDense
	if err := x.SolveVec(a, rhs); err != nil {
		t.Fatalf("solve: %v", err)
	}
	slip, opening = make([]float64, n), make([]float64, n)
	for i := range n {
		slip[i], opening[i] = x.AtVec(i), x.AtVec(n+i)
	}
	return slip, opening
}

// straightCrack returns n equal elements of height h on |x| ≤ c, y = y0,
// from west to east.
func straightCrack(n int, c, y0, h float64) []Element {
	el := make([]Element, n)
	for k := range el {
		el[k] = Element{
			P0:     r2.Vec{X: -c + 2*c*float64(k)/float64(n), Y: y0},
			P1:     r2.Vec{X: -c + 2*c*float64(k+1)/float64(n), Y: y0},
			Height: h,
		}
	}
	return el
}

// constant returns n copies of v.
func constant(n int, v float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = v
	}
	return out
}

// mustDense builds a Dense operator or fails the test.
func mustDense(t testing.TB, el []Element, s Settings) *Dense {
	t.Helper()
	d, err := NewDense(el, rock, s)
	if err != nil {
		t.Fatalf("NewDense: %v", err)
	}
	return d
}
