package dfn

import (
	"math"
	"math/rand/v2"
	"testing"

	"slipfront/internal/numtest"
	"slipfront/scenarios"
)

// Truncated power law closed forms, docs/references.md §3.3 table (printed to
// 7 significant digits, so the tolerance is 1e-6 relative) and inverse-CDF
// values (tolerance 1e-12 relative, as given there).
func TestPowerLawTable(t *testing.T) {
	for _, c := range []struct {
		min, max, d          float64
		median, mean, m2, eA float64
	}{
		{1, 100, 2.5, 1.319502633, 1.665017, 4.500045, 14.137308},
		{1, 100, 2.0, 1.414143, 1.980198, 9.211261, 28.938031},
		{5, 500, 1.5, 7.931718, 13.513514, 675.675676, 2122.697739},
		{1, 1000, 3.0, 1.259921, 1.499999, 2.997000, 9.415353},
	} {
		p := PowerLaw{Min: c.min, Max: c.max, D: c.d}
		numtest.Rel(t, "median", p.Quantile(0.5), c.median, 1e-6)
		numtest.Rel(t, "E[r]", p.Moment(1), c.mean, 1e-6)
		numtest.Rel(t, "E[r²]", p.Moment(2), c.m2, 1e-6)
		numtest.Rel(t, "E[A]", math.Pi*p.Moment(2), c.eA, 1e-6)
		numtest.Abs(t, "E[r⁰]", p.Moment(0), 1, 1e-14)
	}
	p := PowerLaw{Min: 1, Max: 100, D: 2.5}
	for _, c := range []struct{ u, want float64 }{
		{0.5, 1.3195026327781971}, {0.9, 2.5117960092945952}, {0.99, 6.307076583871195},
	} {
		numtest.Rel(t, "inverse CDF", p.Quantile(c.u), c.want, 1e-12)
	}
	// The k = D moment uses the logarithmic form (docs/references.md §3.2):
	// E[r²] at D = 2 is 2 ln(100)/(1 − 1e-4) = 9.211261 (table row 2).
	numtest.Rel(t, "E[r^D]", PowerLaw{Min: 1, Max: 100, D: 2}.Moment(2), 2*math.Log(100)/(1-1e-4), 1e-14)
}

// sizeLaws are the laws whose sampling is checked against their moments.
var sizeLaws = []struct {
	name string
	law  SizeLaw
}{
	{"constant", Constant{Value: 30}},
	{"power law D=2.5", PowerLaw{Min: 1, Max: 100, D: 2.5}},
	{"power law D=1.5", PowerLaw{Min: 5, Max: 500, D: 1.5}},
	{"power law D=2 (k=D weighting)", PowerLaw{Min: 1, Max: 100, D: 2}},
	{"lognormal", NewLogNormal(50, 20)},
	{"exponential", Exponential{Mean: 40}},
}

// Sample moments of the s^k-weighted draws (k = 0 is the law itself)
// against the analytic mean E[S^(k+1)]/E[S^k] and second moment
// E[S^(k+2)]/E[S^k]; tolerance 5 SE with SE from the analytic variance.
// For a non-constant law this also checks Moment up to order 5.
func TestSizeLawSampleMoments(t *testing.T) {
	const n = 100_000
	for _, c := range sizeLaws {
		for k := range 4 {
			r := rand.New(rand.NewPCG(1, 2))
			var s1, s2 float64
			for range n {
				s := c.law.RandWeighted(r, k)
				s1 += s
				s2 += s * s
			}
			mk := c.law.Moment(k)
			m1 := c.law.Moment(k+1) / mk
			m2 := c.law.Moment(k+2) / mk
			m4 := c.law.Moment(k+4) / mk
			se1 := math.Sqrt(math.Max(0, m2-m1*m1) / n)
			se2 := math.Sqrt(math.Max(0, m4-m2*m2) / n)
			numtest.Close(t, c.name+" weighted mean", s1/n, m1, 5*se1, 1e-12)
			numtest.Close(t, c.name+" weighted E[S²]", s2/n, m2, 5*se2, 1e-12)
		}
	}
}

// The log-normal law built from the size's mean and standard deviation
// reproduces them (E[S] = e^(μ+σ²/2), Var = (e^(σ²) − 1)e^(2μ+σ²)).
func TestLogNormalFromMoments(t *testing.T) {
	l := NewLogNormal(50, 20)
	numtest.Rel(t, "mean", l.Moment(1), 50, 1e-12)
	numtest.Rel(t, "sd", math.Sqrt(l.Moment(2)-l.Moment(1)*l.Moment(1)), 20, 1e-10)
	numtest.Rel(t, "median e^μ", l.Quantile(0.5), math.Exp(l.Mu), 1e-12)
	// Exponential: E[S²] = 2 mean², median mean·ln 2.
	e := Exponential{Mean: 40}
	numtest.Rel(t, "exponential E[S²]", e.Moment(2), 3200, 1e-12)
	numtest.Rel(t, "exponential median", e.Quantile(0.5), 40*math.Ln2, 1e-12)
}

// The generic inverse CDF covers exponents of either sign and D = k.
func TestPowerQuantileLimits(t *testing.T) {
	for _, d := range []float64{2.5, 1e-13, 0, -0.5, -2} {
		numtest.Rel(t, "s(0)", powerQuantile(2, 50, d, 0), 2, 1e-12)
		numtest.Rel(t, "s(1)", powerQuantile(2, 50, d, 1), 50, 1e-12)
	}
	// d → 0 is log-uniform: the median is √(lo·hi).
	numtest.Rel(t, "log-uniform median", powerQuantile(2, 50, 0, 0.5), 10, 1e-12)
	numtest.Rel(t, "near-zero exponent", powerQuantile(2, 50, 1e-9, 0.5), 10, 1e-8)
	// d = −1 is the density ∝ s^0, uniform: median (lo + hi)/2.
	numtest.Rel(t, "uniform median", powerQuantile(2, 50, -1, 0.5), 26, 1e-12)
}

func TestNewSizeLawErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		sz   scenarios.Size
	}{
		{"inverted power-law bounds", scenarios.Size{Distribution: "power_law", Min: 50, Max: 20, Exponent: 2}},
		{"negative min", scenarios.Size{Distribution: "power_law", Min: -1, Max: 20, Exponent: 2}},
		{"zero exponent", scenarios.Size{Distribution: "power_law", Min: 1, Max: 20, Exponent: 0}},
		{"zero constant", scenarios.Size{Distribution: "constant", Value: 0}},
		{"lognormal zero sd", scenarios.Size{Distribution: "lognormal", Mean: 10, StdDev: 0}},
		{"exponential negative mean", scenarios.Size{Distribution: "exponential", Mean: -5}},
		{"unknown law", scenarios.Size{Distribution: "weibull", Mean: 5}},
	} {
		if _, err := NewSizeLaw(c.sz); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}
