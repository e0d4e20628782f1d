package elastic

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"
)

const (
	// OlsonBeta is the exponent β of Olson's (2004) height correction
	// (from memory; see the package documentation).
	OlsonBeta = 2.3
	// OlsonAlpha is the height divisor α of Olson's (2004) height
	// correction (from memory).
	OlsonAlpha = 1.0
)

// HeightFactor returns Olson's (2004) finite-height factor
//
//	F = 1 − d^β / [d² + (h/α)²]^{β/2} = 1 − [d²/(d² + (h/α)²)]^{β/2},
//
// by which a plane-strain influence coefficient between points a distance
// d apart is multiplied for fractures of height h: F = 1 at d = 0 and
// F ≈ (β/2)(αd/h)⁻² far away, so the interaction fades beyond a few
// heights as it does in three dimensions. It panics unless d ≥ 0, h > 0,
// α > 0 and β > 0.
func HeightFactor(d, h, alpha, beta float64) float64 {
	if !(d >= 0 && h > 0 && alpha > 0 && beta > 0) {
		panic("elastic: HeightFactor needs d ≥ 0 and h, α, β > 0")
	}
	ha := h / alpha
	d2 := d * d
	if d2 == 0 {
		return 1
	}
	// x^{β/2} as exp((β/2) ln x), x in (0, 1]: a few ulp, and twice as
	// fast as math.Pow, which dominated the assembly.
	return 1 - math.Exp(beta/2*math.Log(d2/(d2+ha*ha)))
}

// model is everything needed to compute an influence coefficient: the
// kernel, the elements and the height correction.
type model struct {
	k           kernel
	geo         []geometry
	plain       bool    // no height correction
	alpha, beta float64 // Olson's constants
}

func newModel(elems []Element, m Material, s Settings) *model {
	return &model{
		k:     newKernel(m),
		geo:   newGeometry(elems),
		plain: s.PlaneStrain,
		alpha: orDefault(s.Alpha, OlsonAlpha),
		beta:  orDefault(s.Beta, OlsonBeta),
	}
}

// pair returns the operator's block A_ij: the tractions at the centre of
// receiver i per unit slip and opening of source j.
//
// Collocation at element centres is not reciprocal when the two elements
// differ in length or are not parallel (the influence of j on the centre
// of i is not the influence of i on the centre of j, scaled). The
// reciprocal theorem (Betti 1872) for elements of areas W = L h requires
// W_i A_ij = J (W_j A_ji)ᵀ J, J = diag(−1, 1), because the work-conjugate
// of (s, w) is (−Δτ, Δσn). So the operator takes the mean of the two
// collocation estimates, R_ij and its reciprocal image (L_j/L_i) J R_jiᵀ J,
// which agree to the discretisation error O((a/d)²) and coincide for
// equal parallel elements (every straight crack of equal elements):
//
//	A_ij = F_ij · (h_j/h_i)^½ · ½ [R_ij + (L_j/L_i) J R_jiᵀ J],
//	F_ij = HeightFactor(|c_i − c_j|, (h_i h_j)^½, α, β).
//
// For elements of different heights, the pair height is the geometric
// mean and the factor (h_j/h_i)^½ weighs a taller source up and a
// taller receiver down; (h_j/h_i)^γ keeps W A reciprocal only for γ = ½.
// Both are this package's choice (no published source). They reduce to
// Olson's factor for equal heights, and, being products of a function of
// h_i and one of h_j far away, keep the far-field blocks of low rank
// (the pair height min(h_i, h_j), physically closer at short range,
// raised the ranks of a typical block eightfold). With PlaneStrain,
// F = 1 and the heights play no part.
func (m *model) pair(i, j int) Block {
	b, _ := m.pairBoth(i, j)
	return b
}

// pairBoth returns A_ij and A_ji, which share their two collocation
// estimates and their height factor.
func (m *model) pairBoth(i, j int) (Block, Block) {
	gi, gj := &m.geo[i], &m.geo[j]
	if i == j {
		b := m.k.collocation(gi, gi) // F = 1 at d = 0
		return b, b
	}
	r := m.k.collocation(gi, gj)
	q := m.k.collocation(gj, gi)
	f := 1.0
	hi, hj := 1.0, 1.0
	if !m.plain {
		f = HeightFactor(r2.Norm(r2.Sub(gi.c, gj.c)), gi.sh*gj.sh, m.alpha, m.beta)
		hi = gj.sh / gi.sh
		hj = gi.sh / gj.sh
	}
	return reciprocalMean(r, q, gj.a/gi.a, 0.5*f*hi), reciprocalMean(q, r, gi.a/gj.a, 0.5*f*hj)
}

// reciprocalMean returns f·[r + w·J qᵀ J], J = diag(−1, 1).
func reciprocalMean(r, q Block, w, f float64) Block {
	return Block{
		ShearSlip:     f * (r.ShearSlip + w*q.ShearSlip),
		ShearOpening:  f * (r.ShearOpening - w*q.NormalSlip),
		NormalSlip:    f * (r.NormalSlip - w*q.ShearOpening),
		NormalOpening: f * (r.NormalOpening + w*q.NormalOpening),
	}
}

// field returns the stress change (compression-positive) at p per unit
// slip and opening of element j, corrected with F(|p − c_j|, h_j): the
// stress on the layer mid-plane of a source of its own height.
func (m *model) field(p r2.Vec, j int) [2]Stress {
	g := &m.geo[j]
	if g.onTip(p, coincidence*2*g.a) {
		// On a tip the field is singular: rounding would give any value
		// at all, large enough to spoil the compression of a whole Field.
		nan := Stress{XX: math.NaN(), YY: math.NaN(), XY: math.NaN()}
		return [2]Stress{nan, nan}
	}
	s := m.k.fieldStress(p, g)
	if m.plain {
		return s
	}
	f := HeightFactor(r2.Norm(r2.Sub(p, g.c)), g.h, m.alpha, m.beta)
	for c := range s {
		s[c] = Stress{XX: f * s[c].XX, YY: f * s[c].YY, XY: f * s[c].XY}
	}
	return s
}

// weight returns the weight W_i of element i in the reciprocal theorem:
// its area L_i h_i, or its length L_i in plane strain.
func (m *model) weight(i int) float64 {
	if m.plain {
		return 2 * m.geo[i].a
	}
	return 2 * m.geo[i].a * m.geo[i].h
}

// check returns a GeometryError when the centres of distinct elements i
// and j coincide, when one centre lies on a tip of the other element
// (within the same relative distance), or when block b is not finite.
func (m *model) check(b Block, i, j int) error {
	if i == j {
		return nil
	}
	gi, gj := &m.geo[i], &m.geo[j]
	eps := coincidence * 2 * math.Min(gi.a, gj.a)
	if r2.Norm(r2.Sub(gi.c, gj.c)) <= eps {
		return &GeometryError{Receiver: i, Source: j, Reason: "centres coincide"}
	}
	if gj.onTip(gi.c, eps) || gi.onTip(gj.c, eps) {
		return &GeometryError{Receiver: i, Source: j, Reason: "the centre of one lies on a tip of the other"}
	}
	for _, v := range [...]float64{b.ShearSlip, b.ShearOpening, b.NormalSlip, b.NormalOpening} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &GeometryError{Receiver: i, Source: j, Reason: "influence not finite"}
		}
	}
	return nil
}

func orDefault[T int | float64](v, def T) T {
	if v == 0 {
		return def
	}
	return v
}
