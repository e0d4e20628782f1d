package hfref

import "math"

// PKN is a fracture of fixed height h in plane strain in every vertical
// cross-section (an ellipse of maximum width w = 2h·p/E′ = (1−ν)h·p/G
// under the net pressure p; Perkins & Kern 1961) whose length grows
// under a constant injection rate, with no toughness and no leak-off
// (Nordgren 1972).
type PKN struct {
	// PlaneModulus E′ = E/(1 − ν²), Pa.
	PlaneModulus float64
	// Viscosity μ of the fluid, Pa·s.
	Viscosity float64
	// Height h of the fracture, m.
	Height float64
	// Rate Q injected into both wings, m³/s.
	Rate float64
}

// Nordgren's similarity solution (no leak-off) in his dimensionless form:
// L = NordgrenLength·t^(4/5) and w(0) = NordgrenWidth·t^(1/5) (see
// Nordgren). They are the front η_f and the inlet value φ(0) of the
// solution of (1/5)φ − (4/5)ηφ′ = (φ⁴)″, (φ⁴)′(0) = −1, φ(η_f) = 0,
// computed by TestNordgrenConstants (Nordgren prints 1.32 and 1.01).
const (
	NordgrenLength = 1.3208446
	NordgrenWidth  = 1.0051355
)

// Nordgren returns the PKN solution at time t (s). Mass balance over an
// elliptical cross-section, ∂(πhw/4)/∂t + ∂q/∂x = 0, with the flow of an
// elliptical channel, q = −(πhw³/(64μ))∂p/∂x, and p = E′w/(2h) give
// Nordgren's (1972) equation
//
//	∂w/∂t = D ∂²(w⁴)/∂x²,  D = E′/(128 μ h),
//
// with the rate Q/2 into each wing at x = 0 and w = 0 at the tip. In the
// variables w = a t^(1/5) φ(η), x = b t^(4/5) η with
// a = (2Q/(πh√D))^(2/5) and b = √D a^(3/2) it becomes the equation of
// NordgrenLength, so
//
//	ℓ = 1.3208 b t^(4/5) = 0.3817 (E′Q³/(μh⁴))^(1/5) t^(4/5),
//	w(0) = 1.0051 a t^(1/5) = 2.214 (μQ²/(E′h))^(1/5) t^(1/5),
//	p(0) = E′w(0)/(2h).
//
// In the dimensional form usually quoted from Nordgren with G/(1−ν) = E′/2
// and the one-wing rate q = Q/2, ℓ = 0.6646 (Gq³/((1−ν)μh⁴))^(1/5) t^(4/5)
// and w(0) = 2.543 ((1−ν)μq²/(Gh))^(1/5) t^(1/5): the quoted 0.68 and
// 2.5 (from memory) are these, to within 2.3% and 1.7%.
func (f PKN) Nordgren(t float64) Solution {
	l, w := nordgren(f.PlaneModulus/(128*f.Viscosity*f.Height), math.Pi/4*f.Height, f.Rate, t)
	return Solution{HalfLength: l, InletWidth: w, NetPressure: f.PlaneModulus * w / (2 * f.Height)}
}

// nordgren returns the front ℓ and the inlet value w(0) at time t of the
// solution of ∂w/∂t = D ∂²(w⁴)/∂x² whose cross-section holds c·w per unit
// length (c = πh/4 for an ellipse of maximum width w and height h; h for
// a slot of mean width w) and whose flux c·D·(−∂(w⁴)/∂x) at x = 0 is Q/2,
// w = 0 at the front: with w = a t^(1/5) φ(η), x = b t^(4/5) η the
// equation becomes Nordgren's (1972) (1/5)φ − (4/5)ηφ′ = (φ⁴)″ for
// b² = D a³, and the flux c·D·a⁴/b·(−(φ⁴)′(0)) = Q/2 with (φ⁴)′(0) = −1
// gives a = (Q/(2c√D))^(2/5) (derived here).
func nordgren(d, c, q, t float64) (length, inlet float64) {
	a := math.Pow(q/(2*c*math.Sqrt(d)), 0.4)
	b := math.Sqrt(d) * math.Pow(a, 1.5)
	return NordgrenLength * b * math.Pow(t, 0.8), NordgrenWidth * a * math.Pow(t, 0.2)
}

// Channel is Nordgren's fracture with the mean opening e of each vertical
// section following its net pressure through one stiffness k, p = k·e
// (k = 4G/(π(1−ν)h) for the Perkins–Kern ellipse, whose mean width is π/4
// of its maximum), and the fluid flowing as between parallel plates e
// apart, q = −(h e³/(12μ))·∂p/∂x (the cubic law), as a model that tracks
// mean openings does: with p = k·e the flux is −(hk/(48μ))·∂(e⁴)/∂x and
// mass balance ∂(h e)/∂t + ∂q/∂x = 0 gives Nordgren's equation with
// D = k/(48μ). An elliptical channel of maximum width w conducts
// πh w³/(64μ), 12/π² times as much as the slot of its mean width πw/4,
// so with the Perkins–Kern k the channel's front lies (π²/12)^(1/5) =
// 0.962 of Nordgren's at the same time (TestChannelAgainstNordgren).
type Channel struct {
	// Stiffness k = p/e, Pa/m.
	Stiffness float64
	// Viscosity μ of the fluid, Pa·s.
	Viscosity float64
	// Height h of the fracture, m.
	Height float64
	// Rate Q injected into both wings, m³/s.
	Rate float64
}

// Similarity returns the channel's similarity solution at time t (s),
// with InletWidth the mean opening at the inlet.
func (c Channel) Similarity(t float64) Solution {
	l, e := nordgren(c.Stiffness/(48*c.Viscosity), c.Height, c.Rate, t)
	return Solution{HalfLength: l, InletWidth: e, NetPressure: c.Stiffness * e}
}
