package report

import (
	"bytes"
	"math"
	"math/rand/v2"
	"testing"

	"slipfront/internal/numtest"
)

// demoMohr returns an invented effective stress state (σ′ = 40, 25, 18
// MPa), c = 0, μ = 0.6, Δp = 6 MPa, and n planes of two sets placed inside
// the admissible region by resolving the stress on random planes.
func demoMohr(n int) *Mohr {
	m := &Mohr{
		Title:     "Demo scenario — effective stress on every fracture",
		Principal: [3]float64{40e6, 25e6, 18e6},
		Friction:  0.6,
		Increase:  6e6,
		Groups:    []string{"Set N–S", "Set E–W"},
	}
	rng := rand.New(rand.NewPCG(5, 6))
	for i := range n {
		// Direction cosines of a random plane normal in the principal frame;
		// σn = Σ σi li², τ² = Σ σi² li² − σn² (Cauchy's formula; Jaeger,
		// Cook & Zimmerman 2007).
		l := [3]float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		norm := math.Sqrt(l[0]*l[0] + l[1]*l[1] + l[2]*l[2])
		var sn, s2 float64
		for k := range 3 {
			c2 := l[k] * l[k] / (norm * norm)
			sn += m.Principal[k] * c2
			s2 += m.Principal[k] * m.Principal[k] * c2
		}
		m.Points = append(m.Points, MohrPoint{SigmaN: sn, Tau: math.Sqrt(math.Max(0, s2-sn*sn)), Group: i % 2})
	}
	return m
}

// TestMohrCircles reads the circles back from the plot content: centres
// (σi′ + σj′)/2 and radii (σi′ − σj′)/2 of the principal pairs (1, 3),
// (1, 2), (2, 3) (Jaeger, Cook & Zimmerman 2007, Fundamentals of Rock
// Mechanics, the three-dimensional Mohr circle), in MPa; and the envelopes: τ = c + μσn′ and the one
// shifted right by Δp.
func TestMohrCircles(t *testing.T) {
	m := demoMohr(10)
	m.Cohesion = 2e6
	mp := m.content()
	// mpaTol: the Pa → MPa product of numbers of size 4e7.
	const mpaTol = 1e-12
	want := [3][2]float64{{29, 11}, {32.5, 7.5}, {21.5, 3.5}} // (centre, radius), MPa.
	for i, c := range mp.circles.circles {
		numtest.Rel(t, "circle centre", c.centre, want[i][0], mpaTol)
		numtest.Rel(t, "circle radius", c.radius, want[i][1], mpaTol)
	}
	if len(mp.envelopes) != 2 {
		t.Fatalf("%d envelopes, want the initial and the shifted one", len(mp.envelopes))
	}
	for i, e := range mp.envelopes {
		numtest.Rel(t, "cohesion", e.cohesion, 2, mpaTol)
		numtest.Rel(t, "friction", e.friction, 0.6, mpaTol)
		numtest.Abs(t, "shift", e.shift, []float64{0, 6}[i], mpaTol)
	}
	if len(mp.groups) != 2 || len(mp.groups[0]) != 5 || len(mp.groups[1]) != 5 {
		t.Errorf("groups %v, want two of five points", mp.groups)
	}
	m.Increase = 0
	if n := len(m.content().envelopes); n != 1 {
		t.Errorf("%d envelopes without an increase, want 1", n)
	}
}

// TestMohrPicture: the circles are drawn in black, the envelopes in dark
// grey, the two sets in blue and vermillion markers; without the shift
// the grey ink shrinks.
func TestMohrPicture(t *testing.T) {
	m := demoMohr(200)
	img := decodePNG(t, m, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	if n := countNear(img, okabeBlue, 0); n < 2000 {
		t.Errorf("%d pixels of the first set's markers, want ≥ 2000 (100 markers of 2.6 pt)", n)
	}
	noShift := demoMohr(200)
	noShift.Increase = 0
	with, without := countNear(img, colourEnvelope, 0), countNear(decodePNG(t, noShift, DefaultSize), colourEnvelope, 0)
	if with < without+minLinePixels {
		t.Errorf("envelope-grey pixels %d with the shifted envelope, %d without: want at least %d more", with, without, minLinePixels)
	}
}

func TestMohrErrors(t *testing.T) {
	ok := func() Mohr { return Mohr{Principal: [3]float64{3, 2, 1}, Friction: 0.6} }
	for _, tc := range []struct {
		name string
		edit func(m *Mohr)
		want string
	}{
		{"unordered", func(m *Mohr) { m.Principal[1] = 5 }, "σ1′ ≥ σ2′ ≥ σ3′"},
		{"zero friction", func(m *Mohr) { m.Friction = 0 }, "μ > 0"},
		{"negative cohesion", func(m *Mohr) { m.Cohesion = -1 }, "c ≥ 0"},
		{"negative increase", func(m *Mohr) { m.Increase = -1 }, "Increase"},
		{"negative tau", func(m *Mohr) { m.Points = []MohrPoint{{SigmaN: 1, Tau: -1}} }, "Points[0]"},
		{"NaN sigma", func(m *Mohr) { m.Points = []MohrPoint{{SigmaN: math.NaN()}} }, "Points[0]"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := ok()
			tc.edit(&m)
			checkError(t, func(w *bytes.Buffer) error { return m.WritePNG(w, Size{}) }, tc.want)
		})
	}
	// Degenerate but valid: an isotropic state with no points.
	iso := Mohr{Principal: [3]float64{10e6, 10e6, 10e6}, Friction: 0.6}
	s := Size{Width: 640, Height: 480}
	checkPicture(t, decodePNG(t, &iso, s), s, minInkedFrame, 4)
}

// demoSlipShares returns invented shares of two sets and all fractures,
// as a screening would report them at 0, 1, 2, 5 and 10 MPa, and a fine
// curve for all fractures.
func demoSlipShares() *SlipShares {
	inc := []float64{0, 1e6, 2e6, 5e6, 10e6}
	fine := make([]float64, 81)
	share := make([]float64, 81)
	for i := range fine {
		fine[i] = float64(i) * 0.125e6
		share[i] = 1 - math.Exp(-fine[i]/4e6)
	}
	return &SlipShares{
		Title: "Demo scenario — fractures slipping against pressure increase",
		Note:  "Δp_c at fixed total stress (no poroelastic stress path)",
		Series: []ShareSeries{
			{Name: "Set N–S", Increase: inc, Fractures: []float64{0.02, 0.2, 0.4, 0.7, 0.95}, TraceLength: []float64{0.05, 0.3, 0.5, 0.8, 0.97}},
			{Name: "Set E–W", Increase: inc, Fractures: []float64{0, 0.01, 0.05, 0.2, 0.5}, TraceLength: []float64{0, 0.02, 0.08, 0.3, 0.6}},
			{Name: "All fractures", Increase: fine, Fractures: share},
		},
	}
}

func TestSlipSharesPicture(t *testing.T) {
	c := demoSlipShares()
	img := decodePNG(t, c, DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart, minColours)
	// Each series' colour appears; the third (green) only in the upper
	// panel, as it has no trace-length shares.
	for i, want := range []int{minLinePixels, minLinePixels, minLinePixels} {
		if n := countNear(img, seriesColours[i], 0); n < want {
			t.Errorf("series %d: %d pixels of %v, want ≥ %d", i, n, seriesColours[i], want)
		}
	}
	// Without trace-length shares the lower panel goes: fewer blue pixels.
	one := &SlipShares{Series: []ShareSeries{{Name: "a", Increase: c.Series[0].Increase, Fractures: c.Series[0].Fractures}}}
	two := &SlipShares{Series: []ShareSeries{c.Series[0]}}
	if a, b := countNear(decodePNG(t, one, DefaultSize), okabeBlue, 0), countNear(decodePNG(t, two, DefaultSize), okabeBlue, 0); b < a+minLinePixels/2 {
		t.Errorf("blue pixels: %d with the trace-length panel, %d without; want more with it", b, a)
	}
}

func TestSlipSharesErrors(t *testing.T) {
	ok := func() SlipShares {
		return SlipShares{Series: []ShareSeries{{Name: "a", Increase: []float64{0, 1e6}, Fractures: []float64{0, 0.5}}}}
	}
	for _, tc := range []struct {
		name string
		edit func(c *SlipShares)
		want string
	}{
		{"no series", func(c *SlipShares) { c.Series = nil }, "no series"},
		{"no increases", func(c *SlipShares) { c.Series[0].Increase = nil }, "no pressure increases"},
		{"decreasing", func(c *SlipShares) { c.Series[0].Increase[1] = -1 }, "Increase[1]"},
		{"share above 1", func(c *SlipShares) { c.Series[0].Fractures[1] = 1.5 }, "Fractures[1] = 1.5"},
		{"short length", func(c *SlipShares) { c.Series[0].TraceLength = []float64{0} }, "TraceLength has 1 values"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := ok()
			tc.edit(&c)
			checkError(t, func(w *bytes.Buffer) error { return c.WritePNG(w, Size{}) }, tc.want)
		})
	}
}
