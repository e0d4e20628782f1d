package mechanics

import (
	"math"
	"math/rand/v2"
	"testing"

	"slipfront/internal/numtest"
)

// Aki (1965) b = log10(e)/(M̄ − M0), standard error b/√N; Shi & Bolt
// (1982) σ_b = 2.30·b²·√(Σ(M − M̄)²/(N(N − 1))); Utsu (1966) M0 = Mc − ΔM/2
// for binned magnitudes. The expected values were worked by hand (python3)
// from these formulas for two small catalogues.
func TestBValueHandWorked(t *testing.T) {
	tests := []struct {
		name                   string
		mags                   []float64
		o                      BValueOptions
		n                      int
		mean, b, aki, shiBoltE float64
	}{
		// 0.7 is below Mc; M̄ = 1.75, Σ(M − M̄)² = 1.25.
		{"continuous", []float64{1.0, 1.5, 0.7, 2.0, 2.5}, BValueOptions{Completeness: 1},
			4, 1.75, 0.5790593092043358, 0.2895296546021679, 0.24918745122386265},
		// Binned at 0.1 with Mc = 1.0: 0.9 is out, 0.99999999 (a rounding
		// error below the 1.0 bin) is in; M0 = 0.95, M̄ = 1.1,
		// Σ(M − M̄)² = 0.06.
		{"binned", []float64{0.9, 1.0, 0.99999999, 1.1, 1.3}, BValueOptions{Completeness: 1, BinWidth: 0.1},
			4, 1.0999999975, 2.895296546021679, 1.4476482730108395, 1.3648558808252793},
	}
	const handWorked = 1e-7 // relative: the 0.99999999 row differs from 1.0 by 1e−8
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			e, err := BValue(tc.mags, tc.o)
			if err != nil {
				t.Fatal(err)
			}
			if e.Events != tc.n {
				t.Fatalf("%d complete events, want %d", e.Events, tc.n)
			}
			numtest.Rel(t, "M̄", e.Mean, tc.mean, handWorked)
			numtest.Rel(t, "b", e.B, tc.b, handWorked)
			numtest.Rel(t, "Aki error", e.AkiError, tc.aki, handWorked)
			numtest.Rel(t, "Shi & Bolt error", e.ShiBoltError, tc.shiBoltE, handWorked)
		})
	}
	// Shi & Bolt print the factor as 2.30; ln 10 differs by 0.11 %.
	e, err := BValue(tests[0].mags, tests[0].o)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "Shi & Bolt with 2.30", e.ShiBoltError, 0.2489076905599363, 1.2e-3)
}

func TestBValueErrors(t *testing.T) {
	tests := []struct {
		name string
		mags []float64
		o    BValueOptions
	}{
		{"one complete event", []float64{0.5, 1.2}, BValueOptions{Completeness: 1}},
		{"no spread", []float64{1, 1, 1}, BValueOptions{Completeness: 1}},
		{"NaN magnitude", []float64{1.2, math.NaN(), 1.5}, BValueOptions{Completeness: 1}},
		{"infinite Mc", []float64{1.2, 1.5}, BValueOptions{Completeness: math.Inf(-1)}},
		{"negative bin", []float64{1.2, 1.5}, BValueOptions{Completeness: 1, BinWidth: -0.1}},
	}
	for _, tc := range tests {
		if _, err := BValue(tc.mags, tc.o); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

// The maximum-likelihood b of a Gutenberg–Richter sample is unbiased to
// O(1/N) and its standard error is b/√N (Aki 1965), so a fixed-seed sample
// of 5000 must land within 2 standard errors, continuous or binned at 0.1
// with Utsu's (1966) half-bin correction; binning moves M̄ by ≈ ΔM·q/(1−q)
// − ΔM/2 (q = 10^(−bΔM)), a bias of −0.3 % of b here, a fifth of a
// standard error. Without the correction the binned estimate is off by
// ≈ +13 %, far beyond 5 standard errors: the test shows it matters.
func TestBValueSyntheticCatalogue(t *testing.T) {
	const n, b = 5000, 1.0
	r := rand.New(rand.NewPCG(1, 2))
	continuous := make([]float64, n)
	binned := make([]float64, n)
	gr := GutenbergRichter{B: b, Min: 0.95, Max: math.Inf(1)}
	for i := range continuous {
		continuous[i] = gr.Rand(r)
		binned[i] = math.Round(continuous[i]*10) / 10
	}
	check := func(name string, mags []float64, o BValueOptions, within float64) BValueEstimate {
		t.Helper()
		e, err := BValue(mags, o)
		if err != nil {
			t.Fatal(err)
		}
		if e.Events != n {
			t.Fatalf("%s: %d complete events, want %d", name, e.Events, n)
		}
		if d := math.Abs(e.B - b); d > within*e.AkiError {
			t.Errorf("%s: b = %.4f, %.2f standard errors from %g", name, e.B, d/e.AkiError, b)
		}
		// The two standard errors agree for a large exponential sample:
		// Σ(M − M̄)²/N → 1/β², so Shi & Bolt's tends to b/√N.
		numtest.Rel(t, name+": Shi & Bolt vs Aki error", e.ShiBoltError, e.AkiError, 0.05)
		return e
	}
	check("continuous", continuous, BValueOptions{Completeness: 0.95}, 2)
	check("binned", binned, BValueOptions{Completeness: 1, BinWidth: 0.1}, 2)
	if e, err := BValue(binned, BValueOptions{Completeness: 1}); err != nil {
		t.Fatal(err)
	} else if math.Abs(e.B-b) < 5*e.AkiError {
		t.Errorf("binned magnitudes without the half-bin correction give b = %.4f, within 5 standard errors", e.B)
	}
}

// FitCatalogue on a continuous Gutenberg–Richter sample of b = 1 above
// 0.5 (Aki 1965): the fullest 0.1 bin is the first whole one, centred on
// 0.6 (the 0.5 bin holds only its upper half), so Mc = 0.6 + 0.2
// (Woessner & Wiemer 2005), and the b-value of the events above it is
// within two standard errors of 1. Fewer than two events above Mc is an
// error.
func TestFitCatalogue(t *testing.T) {
	const n, b = 4000, 1.0
	r := rand.New(rand.NewPCG(3, 4))
	gr := GutenbergRichter{B: b, Min: 0.5, Max: math.Inf(1)}
	mags := make([]float64, n)
	for i := range mags {
		mags[i] = gr.Rand(r)
	}
	mc, e, err := FitCatalogue(mags)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "Mc", mc, 0.8, 1e-12)
	if d := math.Abs(e.B - b); d > 2*e.AkiError {
		t.Errorf("b = %.4f, %.2f standard errors from %g", e.B, d/e.AkiError, b)
	}
	if _, _, err := FitCatalogue([]float64{0.5, 0.5, 0.5, 1.5}); err == nil {
		t.Error("one event above Mc gave a b-value")
	}
}

// Maximum curvature (Wiemer & Wyss 2000) is the mode of the non-cumulative
// histogram; Woessner & Wiemer (2005) add 0.2. A hand-made histogram with
// a tie between 0.7 and 1.0 (12 events each): the lower one wins.
func TestMaxCurvatureCompleteness(t *testing.T) {
	var mags []float64
	for _, bin := range []struct {
		m float64
		n int
	}{{0.5, 3}, {0.6, 7}, {0.7, 12}, {0.8, 9}, {0.9, 5}, {1.0, 12}, {1.4, 2}} {
		for range bin.n {
			mags = append(mags, bin.m)
		}
	}
	const binCentre = 1e-12 // k·ΔM in floating point
	for _, tc := range []struct {
		correction, want float64
	}{{0, 0.7}, {WoessnerWiemerCorrection, 0.9}} {
		mc, err := MaxCurvatureCompleteness(mags, CompletenessOptions{BinWidth: 0.1, Correction: tc.correction})
		if err != nil {
			t.Fatal(err)
		}
		numtest.Abs(t, "Mc", mc, tc.want, binCentre)
	}
	// A complete Gutenberg–Richter catalogue binned at 0.1 from 1.0 up has
	// its most populated bin at the bottom (the histogram decreases by the
	// factor 10^(−0.1b) per bin): Mc = 1.0.
	r := rand.New(rand.NewPCG(1, 2))
	gr := GutenbergRichter{B: 1, Min: 0.95, Max: math.Inf(1)}
	complete := make([]float64, 5000)
	for i := range complete {
		complete[i] = math.Round(gr.Rand(r)*10) / 10
	}
	mc, err := MaxCurvatureCompleteness(complete, CompletenessOptions{BinWidth: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	numtest.Abs(t, "Mc of a complete catalogue", mc, 1.0, binCentre)

	for _, tc := range []struct {
		name string
		mags []float64
		o    CompletenessOptions
	}{
		{"empty", nil, CompletenessOptions{BinWidth: 0.1}},
		{"zero bin", []float64{1}, CompletenessOptions{}},
		{"Inf magnitude", []float64{1, math.Inf(1)}, CompletenessOptions{BinWidth: 0.1}},
		{"bin too small", []float64{3}, CompletenessOptions{BinWidth: 1e-300}},
	} {
		if _, err := MaxCurvatureCompleteness(tc.mags, tc.o); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

// Inverse transform of the Gutenberg–Richter law (Devroye 1986, §II.2):
// untruncated, b = 1, Min = −1, p = 0.5 gives −1 + log10 2 = −0.698970004;
// truncated to [0, 1] with b = 1, P(M ≤ 0.5) = (1 − 10^−0.5)/0.9 =
// 0.7597469266 and E[M] = 1/ln 10 − 0.1/0.9 = 0.3231833708 (worked by hand).
func TestGutenbergRichter(t *testing.T) {
	open := GutenbergRichter{B: 1, Min: -1, Max: math.Inf(1)}
	numtest.Rel(t, "median", open.Quantile(0.5), -1+math.Log10(2), roundOff)
	numtest.Rel(t, "untruncated mean", open.Mean(), -1+1/math.Ln10, roundOff)
	cut := GutenbergRichter{B: 1, Min: 0, Max: 1}
	numtest.Rel(t, "CDF(0.5)", cut.CDF(0.5), 0.7597469266479577, roundOff)
	numtest.Rel(t, "truncated mean", cut.Mean(), 0.32318337079214066, roundOff)
	numtest.Abs(t, "Quantile(1)", cut.Quantile(1), 1, roundOff)
	numtest.Abs(t, "Quantile(0)", cut.Quantile(0), 0, 0)
	if cut.CDF(-1) != 0 || cut.CDF(2) != 1 {
		t.Error("CDF outside the range")
	}
	for _, p := range []float64{0.01, 0.3, 0.5, 0.9, 0.999} {
		numtest.Abs(t, "CDF(Quantile(p))", cut.CDF(cut.Quantile(p)), p, roundOff)
	}

	// Sample mean within 5 standard errors (sample standard deviation/√N)
	// of the closed form; every draw inside [Min, Max].
	r := rand.New(rand.NewPCG(1, 2))
	const n = 100000
	var sum, sum2 float64
	for range n {
		m := cut.Rand(r)
		if m < cut.Min || m > cut.Max {
			t.Fatalf("draw %g outside [%g, %g]", m, cut.Min, cut.Max)
		}
		sum += m
		sum2 += m * m
	}
	mean := sum / n
	se := math.Sqrt((sum2/n - mean*mean) / n)
	numtest.Abs(t, "sample mean", mean, cut.Mean(), 5*se)

	for _, g := range []GutenbergRichter{{B: 0, Min: 0, Max: 1}, {B: 1, Min: 1, Max: 1}, {B: 1, Min: math.NaN(), Max: 1}, {B: 1, Min: 2, Max: 1}} {
		if err := g.Validate(); err == nil {
			t.Errorf("%+v: no error", g)
		}
	}
	if err := open.Validate(); err != nil {
		t.Error(err)
	}
}

// McGarr (2014), abstract: the maximum seismic moment is the injected
// volume times the modulus of rigidity. 10⁴ m³ in rock of G = 30 GPa:
// 3e14 N·m, Mw = (2/3)(log10 3e14 − 9.1) = 3.5847475 (IASPEI 2013 form).
func TestMaxInducedMoment(t *testing.T) {
	m0 := MaxInducedMoment(30e9, 1e4)
	numtest.Rel(t, "M0,max", m0, 3e14, roundOff)
	numtest.Abs(t, "Mw", MomentMagnitude(m0), 3.584747503146442, 1e-12)
	if MaxInducedMoment(30e9, -5) != 0 {
		t.Error("net withdrawal gives a positive bound")
	}
}
