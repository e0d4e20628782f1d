package report

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
)

// niceTicks is a plot.Ticker with about n labelled ticks at a round step
// (1, 2 or 5 × 10ᵏ) and an unlabelled tick half-way between them.
type niceTicks struct{ n int }

// Ticks implements plot.Ticker.
func (t niceTicks) Ticks(min, max float64) []plot.Tick {
	if !(max > min) || !finite(min) || !finite(max) || t.n < 1 {
		return nil
	}
	step := niceStep((max - min) / float64(t.n))
	decimals := max0(-int(math.Floor(math.Log10(step))))
	first := math.Ceil(min/step - 1e-9)
	last := math.Floor(max/step + 1e-9)
	// A range of a few ulps (min/step beyond 2⁵²) has no ticks to
	// resolve, and k++ would no longer advance a float that large.
	if last-first > 1000 || math.Abs(first) > 1<<52 || math.Abs(last) > 1<<52 {
		return nil
	}
	var ticks []plot.Tick
	for i := range int(last-first) + 1 {
		k := first + float64(i)
		v := k * step
		if math.Abs(v) < step*1e-9 {
			v = 0 // Avoid "−0" and round-off such as 1e-17.
		}
		ticks = append(ticks, plot.Tick{Value: v, Label: tickLabel(v, decimals)})
		if mid := v + step/2; mid <= max {
			ticks = append(ticks, plot.Tick{Value: mid})
		}
	}
	if mid := first*step - step/2; mid >= min {
		ticks = append(ticks, plot.Tick{Value: mid})
	}
	return ticks
}

// niceStep returns the smallest 1, 2 or 5 × 10ᵏ at or above v (v > 0).
func niceStep(v float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(v)))
	for _, f := range [...]float64{1, 2, 5, 10} {
		if f*p >= v*(1-1e-12) {
			return f * p
		}
	}
	return 10 * p
}

func max0(k int) int { return max(k, 0) }

// tickLabel writes a tick value with the given decimals, or with six
// significant digits in exponent form when it is large.
func tickLabel(v float64, decimals int) string {
	const large = 1e7 // From here on, fixed notation gets too long.
	if math.Abs(v) >= large {
		return minus(strconv.FormatFloat(v, 'g', 6, 64))
	}
	return minus(strconv.FormatFloat(v, 'f', decimals, 64))
}
