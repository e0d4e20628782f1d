package mechanics

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// GutenbergRichter is the Gutenberg–Richter magnitude distribution,
// log10 N(≥M) = a − b·M, truncated to [Min, Max]: the magnitudes above Min
// are exponential with rate β = b·ln 10, cut at Max,
//
//	P(M ≤ m) = (1 − 10^(−b(m − Min))) / (1 − 10^(−b(Max − Min))),  Min ≤ m ≤ Max
//
// (Gutenberg & Richter 1944; the truncated form of Cosentino, Ficarra &
// Luzio 1977, from memory). Max = +Inf gives the untruncated law.
type GutenbergRichter struct {
	B   float64 // b-value, > 0
	Min float64 // smallest magnitude
	Max float64 // largest magnitude, > Min; +Inf for no truncation
}

// Validate returns an error unless b > 0, Min is finite and Max > Min.
func (g GutenbergRichter) Validate() error {
	if err := firstError(positive("b_value", g.B), finite("magnitude_min", g.Min)); err != nil {
		return err
	}
	if !(g.Max > g.Min) {
		return &InputError{Name: "magnitude_max", Value: g.Max, Want: fmt.Sprintf("must be > magnitude_min (%g)", g.Min)}
	}
	return nil
}

// beta returns β = b·ln 10 and the normalisation 1 − 10^(−b(Max − Min)).
func (g GutenbergRichter) beta() (beta, norm float64) {
	beta = g.B * math.Ln10
	return beta, -math.Expm1(-beta * (g.Max - g.Min))
}

// CDF returns P(M ≤ m).
func (g GutenbergRichter) CDF(m float64) float64 {
	if m <= g.Min {
		return 0
	}
	if m >= g.Max {
		return 1
	}
	beta, norm := g.beta()
	return -math.Expm1(-beta*(m-g.Min)) / norm
}

// Quantile returns the magnitude m with P(M ≤ m) = p, 0 ≤ p ≤ 1:
//
//	m = Min − log10(1 − p·(1 − 10^(−b(Max − Min))))/b,
//
// the inverse-transform sampler (Devroye 1986, §II.2). It panics for p
// outside [0, 1].
func (g GutenbergRichter) Quantile(p float64) float64 {
	if !(p >= 0 && p <= 1) {
		panic(fmt.Sprintf("mechanics: quantile probability %g outside [0, 1]", p))
	}
	beta, norm := g.beta()
	return math.Min(g.Min-math.Log1p(-p*norm)/beta, g.Max)
}

// Rand returns a magnitude drawn from the distribution with r.
func (g GutenbergRichter) Rand(r *rand.Rand) float64 { return g.Quantile(r.Float64()) }

// Mean returns E[M] = Min + 1/β − L·e^(−βL)/(1 − e^(−βL)), L = Max − Min,
// the mean of an exponential truncated at L (Min + 1/β untruncated, which
// is Aki's (1965) estimator read backwards).
func (g GutenbergRichter) Mean() float64 {
	beta, norm := g.beta()
	mean := g.Min + 1/beta
	if l := g.Max - g.Min; !math.IsInf(l, 1) {
		mean -= l * math.Exp(-beta*l) / norm
	}
	return mean
}

// BValueOptions set how a catalogue is cut and binned for [BValue].
type BValueOptions struct {
	// Completeness is the magnitude of completeness Mc: only events at or
	// above it are used.
	Completeness float64
	// BinWidth is the magnitude bin ΔM of the catalogue (0.1 is usual);
	// 0 for unbinned, continuous magnitudes.
	BinWidth float64
}

// BValueEstimate is a maximum-likelihood b-value with its standard errors.
type BValueEstimate struct {
	B            float64 // b-value
	Events       int     // N, events at or above the completeness magnitude
	Mean         float64 // M̄, their mean magnitude
	AkiError     float64 // b/√N (Aki 1965)
	ShiBoltError float64 // ln 10·b²·√(Σ(M − M̄)²/(N(N − 1))) (Shi & Bolt 1982)
}

// BValue returns the maximum-likelihood b-value of the magnitudes at or
// above the completeness magnitude Mc (Aki 1965),
//
//	b = log10(e) / (M̄ − M0),
//
// with M0 = Mc for continuous magnitudes and M0 = Mc − ΔM/2, the lower edge
// of the lowest complete bin, for magnitudes binned at ΔM (Utsu 1966). An
// event counts as complete when M ≥ M0, so a binned magnitude a rounding
// error below Mc still counts. The standard errors are Aki's b/√N and Shi
// & Bolt's (1982)
//
//	σ_b = ln 10·b²·√( Σ(M − M̄)² / (N(N − 1)) ),
//
// the delta-method error of b through the standard error of M̄: Shi & Bolt
// print the factor as 2.30, ln 10 = 2.3026 rounded.
//
// It returns an error for a non-finite magnitude or Mc, a negative or
// non-finite bin width, fewer than two complete events, or complete
// magnitudes that do not rise above M0 (no spread, b infinite).
func BValue(mags []float64, o BValueOptions) (BValueEstimate, error) {
	if err := firstError(finite("completeness magnitude", o.Completeness), nonNegative("magnitude bin width", o.BinWidth)); err != nil {
		return BValueEstimate{}, err
	}
	if err := checkMagnitudes(mags); err != nil {
		return BValueEstimate{}, err
	}
	lower := o.Completeness - o.BinWidth/2
	var n int
	var sum float64
	for _, m := range mags {
		if m >= lower {
			n++
			sum += m
		}
	}
	if n < 2 {
		return BValueEstimate{}, &InputError{Name: "events at or above the completeness magnitude", Value: float64(n), Want: "must be at least 2"}
	}
	mean := sum / float64(n)
	if !(mean > lower) {
		return BValueEstimate{}, &InputError{Name: "mean complete magnitude", Value: mean,
			Want: fmt.Sprintf("must exceed Mc − ΔM/2 = %g (the magnitudes have no spread)", lower)}
	}
	var ss float64
	for _, m := range mags {
		if m >= lower {
			ss += (m - mean) * (m - mean)
		}
	}
	b := math.Log10E / (mean - lower)
	return BValueEstimate{
		B: b, Events: n, Mean: mean,
		AkiError:     b / math.Sqrt(float64(n)),
		ShiBoltError: math.Ln10 * b * b * math.Sqrt(ss/float64(n*(n-1))),
	}, nil
}

// WoessnerWiemerCorrection is the +0.2 that Woessner & Wiemer (2005) add to
// the maximum-curvature completeness magnitude, which they found to
// underestimate Mc by about 0.2 on average.
const WoessnerWiemerCorrection = 0.2

// CompletenessOptions set the maximum-curvature estimate of
// [MaxCurvatureCompleteness].
type CompletenessOptions struct {
	// BinWidth is the magnitude bin ΔM of the frequency–magnitude
	// histogram, > 0 (0.1 is usual).
	BinWidth float64
	// Correction is added to the magnitude of maximum curvature: 0 for the
	// plain method of Wiemer & Wyss (2000), WoessnerWiemerCorrection for
	// the usual corrected one.
	Correction float64
}

// MaxCurvatureCompleteness returns the magnitude of completeness by the
// maximum-curvature method (Wiemer & Wyss 2000): the centre of the
// magnitude bin holding the most events in the non-cumulative
// frequency–magnitude histogram, plus o.Correction. Bins are centred on
// the multiples of ΔM (a magnitude m falls in bin round(m/ΔM)); a tie goes
// to the lowest magnitude. It returns an error for an empty catalogue, a
// non-finite magnitude or a bin width that is not finite and > 0.
func MaxCurvatureCompleteness(mags []float64, o CompletenessOptions) (float64, error) {
	if err := firstError(positive("magnitude bin width", o.BinWidth), finite("completeness correction", o.Correction)); err != nil {
		return 0, err
	}
	if len(mags) == 0 {
		return 0, &InputError{Name: "events in the catalogue", Value: 0, Want: "must be at least 1"}
	}
	if err := checkMagnitudes(mags); err != nil {
		return 0, err
	}
	counts := make(map[int64]int)
	for _, m := range mags {
		k := math.Round(m / o.BinWidth)
		if math.Abs(k) > 1<<53 {
			return 0, &InputError{Name: "magnitude bin width", Value: o.BinWidth,
				Want: fmt.Sprintf("is too small for magnitude %g: at most 2⁵³ bins from 0", m)}
		}
		counts[int64(k)]++
	}
	var best int64
	most := 0
	for k, c := range counts {
		if c > most || (c == most && k < best) {
			best, most = k, c
		}
	}
	return float64(best)*o.BinWidth + o.Correction, nil
}

// CatalogueBin is the magnitude bin of the catalogue fits, 0.1 as usual
// for magnitude–frequency analysis (common practice, no source).
const CatalogueBin = 0.1

// FitCatalogue returns the magnitude of completeness of a catalogue by
// maximum curvature in bins of CatalogueBin with Woessner & Wiemer's +0.2
// (MaxCurvatureCompleteness), and the maximum-likelihood b-value of the
// events at or above it with its standard errors (BValue, magnitudes taken
// as continuous; Aki 1965; Shi & Bolt 1982). It returns an error when the
// catalogue is empty or fewer than two events reach Mc.
func FitCatalogue(mags []float64) (mc float64, b BValueEstimate, err error) {
	mc, err = MaxCurvatureCompleteness(mags, CompletenessOptions{BinWidth: CatalogueBin, Correction: WoessnerWiemerCorrection})
	if err != nil {
		return 0, BValueEstimate{}, err
	}
	b, err = BValue(mags, BValueOptions{Completeness: mc})
	if err != nil {
		return 0, BValueEstimate{}, fmt.Errorf("%d events in all, Mc = %.2f: %w", len(mags), mc, err)
	}
	return mc, b, nil
}

// checkMagnitudes returns an error naming the first magnitude that is not
// a finite number.
func checkMagnitudes(mags []float64) error {
	for i, m := range mags {
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return finite(fmt.Sprintf("magnitude[%d]", i), m)
		}
	}
	return nil
}

// MaxInducedMoment returns McGarr's (2014) upper bound on the seismic
// moment of the largest earthquake induced by fluid injection,
//
//	M0,max = G·ΔV,
//
// N·m, for rock of shear modulus G, Pa, and the net injected volume ΔV,
// m³ (0 for ΔV ≤ 0). McGarr's abstract (read) states the bound for the
// maximum (largest-event) moment and its assumptions: a fully saturated,
// brittle rock mass that responds to injection with a sequence of
// earthquakes confined to the region weakened by the pressure increase,
// with a Gutenberg–Richter distribution of b = 1. The derivation goes
// through the summed moment of such a sequence, which for b = 1 is about
// twice the largest (from memory). Comparing the summed moment of a
// catalogue with G·ΔV, as McGarr (1976) did with the sum (from memory), is
// therefore a stricter check than the published one: the sum always
// exceeds the largest event. Earthquakes on faults that run beyond the
// pressurised region are outside the bound's assumptions.
func MaxInducedMoment(shearModulus, netInjectedVolume float64) float64 {
	return shearModulus * math.Max(netInjectedVolume, 0)
}
