package flow

import (
	"fmt"
	"math"

	"slipfront/internal/badinput"
)

// Perforations are the holes of one perforation cluster.
type Perforations struct {
	// Count n of open perforations.
	Count int
	// Diameter d of each entry hole, m.
	Diameter float64
	// Discharge is the orifice discharge coefficient C_d, in (0, 1].
	Discharge float64
}

// Validate reports a cluster that cannot pass fluid.
func (p Perforations) Validate() error {
	switch {
	case p.Count < 1:
		return badinput.Errorf("flow: perforation count %d: must be ≥ 1", p.Count)
	case !(p.Diameter > 0) || math.IsInf(p.Diameter, 0):
		return badinput.Errorf("flow: perforation diameter %g m: must be finite and > 0", p.Diameter)
	case !(p.Discharge > 0 && p.Discharge <= 1):
		return badinput.Errorf("flow: discharge coefficient %g: must be in (0, 1]", p.Discharge)
	}
	return nil
}

// Coefficient returns K = 8ρ/(π² n² d⁴ C_d²), Pa·s²/m⁶, of the cluster
// for a fluid of density rho (kg/m³): the orifice equation
// q = n C_d (π d²/4) √(2Δp/ρ) solved for the pressure drop gives
// Δp = K q² (Crump & Conway 1988, J. Pet. Tech. 40(8), who state it in
// field units; the SI form follows from the orifice equation).
func (p Perforations) Coefficient(rho float64) float64 {
	n := float64(p.Count)
	d2 := p.Diameter * p.Diameter
	return 8 * rho / (math.Pi * math.Pi * n * n * d2 * d2 * p.Discharge * p.Discharge)
}

// linearDrop is the perforation pressure drop below which the orifice law
// is replaced by the straight line through 0 that meets it there, Pa
// (common practice, no source): it keeps the conductance q/Δp finite as
// the rate of a cluster goes through zero. 1 kPa is a thousandth of a
// typical design drop, and the rate there is √(1e3/K).
const linearDrop = 1e3

// perfRate returns the rate through a cluster of coefficient k (Pa·s²/m⁶)
// at the pressure drop dp (Pa): sign(Δp)·√(|Δp|/K), linear below
// linearDrop.
func perfRate(k, dp float64) float64 {
	if math.Abs(dp) < linearDrop {
		return dp / math.Sqrt(k*linearDrop)
	}
	return math.Copysign(math.Sqrt(math.Abs(dp)/k), dp)
}

// perfConductance returns the chord conductance q/Δp of a cluster of
// coefficient k at the pressure drop dp, m³/(Pa·s).
func perfConductance(k, dp float64) float64 {
	return 1 / math.Sqrt(k*math.Max(math.Abs(dp), linearDrop))
}

// LimitedEntry shares a stage's rate between its perforation clusters
// through their perforation friction: each cluster k takes the rate q_k
// whose pressure drop across its perforations, Δp_k = K_k q_k|q_k|,
// bridges the bottom-hole pressure p_w and the pressure p_k of the
// fractures at its entry, p_w = p_k + Δp_k, and the rates add up to the
// stage's, Σ q_k = Q. A cluster whose entry is above p_w takes fluid back
// into the well (crossflow during shut-in).
type LimitedEntry struct {
	// coef holds K_k of every cluster, Pa·s²/m⁶.
	coef []float64
	// sumInvSqrt is Σ 1/√K_k, m³/(s·√Pa).
	sumInvSqrt float64
}

// NewLimitedEntry returns the limited-entry model of a stage with the
// given clusters and a fluid of density rho (kg/m³, a property of the
// pumped fluid).
func NewLimitedEntry(clusters []Perforations, rho float64) (*LimitedEntry, error) {
	if len(clusters) == 0 {
		return nil, badinput.Errorf("flow: a stage needs at least one perforation cluster")
	}
	if !(rho > 0) || math.IsInf(rho, 0) {
		return nil, badinput.Errorf("flow: fluid density %g kg/m³: must be finite and > 0", rho)
	}
	l := &LimitedEntry{coef: make([]float64, len(clusters))}
	for i, c := range clusters {
		if err := c.Validate(); err != nil {
			return nil, fmt.Errorf("cluster %d: %w", i, err)
		}
		l.coef[i] = c.Coefficient(rho)
		l.sumInvSqrt += 1 / math.Sqrt(l.coef[i])
	}
	return l, nil
}

// Len returns the number of clusters.
func (l *LimitedEntry) Len() int { return len(l.coef) }

// PressureDrop returns the drop Δp (Pa) across the perforations of
// cluster k at the rate q (m³/s): K_k q|q|, or its linear continuation
// below 1 kPa.
func (l *LimitedEntry) PressureDrop(k int, q float64) float64 {
	c := l.coef[k]
	if qLin := math.Sqrt(linearDrop / c); math.Abs(q) < qLin {
		return q * math.Sqrt(c*linearDrop)
	}
	return c * q * math.Abs(q)
}

// Rate returns the rate (m³/s) through cluster k at the pressure drop dp
// (Pa), the inverse of PressureDrop.
func (l *LimitedEntry) Rate(k int, dp float64) float64 { return perfRate(l.coef[k], dp) }

// Conductance returns the chord conductance c_k = q_k/Δp_k of cluster k
// at the pressure drop dp, m³/(Pa·s): at dp = 0 the slope of the orifice
// law's linear continuation, the System's first linearisation of a
// cluster before it has a rate (later iterations take the tangent,
// LimitedEntry.Tangent: the chord alone lets the clusters' rates swing).
func (l *LimitedEntry) Conductance(k int, dp float64) float64 {
	return perfConductance(l.coef[k], dp)
}

// Tangent returns the linearisation of cluster k's perforations at the
// rate q0 (m³/s): q ≈ slope·Δp + offset, the tangent of the orifice law at
// q0, slope = 1/(2K|q0|) (m³/(Pa·s)) and offset = q0/2 (m³/s); on the
// linear continuation below 1 kPa, its slope and offset 0.
func (l *LimitedEntry) Tangent(k int, q0 float64) (slope, offset float64) {
	c := l.coef[k]
	if math.Abs(q0) < math.Sqrt(linearDrop/c) {
		return perfConductance(c, 0), 0
	}
	return 1 / (2 * c * math.Abs(q0)), q0 / 2
}

// Split sets dst[k] to the rate (m³/s) of cluster k when the stage takes
// the total rate total (m³/s) and the fractures at the clusters' entries
// are at the pressures entry (Pa), and returns the bottom-hole pressure
// p_w (Pa). Σ q_k(p_w) is continuous and strictly increasing in p_w, so
// p_w is bracketed — Σ q ≤ 0 at min p_k and Σ q ≥ Q at
// max p_k + (Q/Σ K_k^(−1/2))² for Q ≥ 0 (mirrored for Q < 0) — and found
// by Newton steps kept inside the bracket, with bisection when a step
// leaves it; it ends when the bracket is below 1e−12 of the pressures or
// the rates add up to Q within 1e−14 of the largest cluster rate.
func (l *LimitedEntry) Split(dst, entry []float64, total float64) float64 {
	if len(dst) != len(l.coef) || len(entry) != len(l.coef) {
		panic("flow: limited entry: dimension mismatch")
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range entry {
		lo, hi = math.Min(lo, p), math.Max(hi, p)
	}
	reach := (total / l.sumInvSqrt) * (total / l.sumInvSqrt)
	if total > 0 {
		hi += reach
	} else {
		lo -= reach
	}
	scale := math.Max(math.Abs(lo), math.Abs(hi))
	pw := 0.5 * (lo + hi)
	for range 200 {
		var sum, slope, largest float64
		for k, c := range l.coef {
			q := perfRate(c, pw-entry[k])
			sum += q
			largest = math.Max(largest, math.Abs(q))
			// d q/d Δp = 1/(2√(K|Δp|)) on the orifice branch, the chord on the linear one.
			if dp := math.Abs(pw - entry[k]); dp < linearDrop {
				slope += perfConductance(c, dp)
			} else {
				slope += 0.5 * perfConductance(c, dp)
			}
		}
		f := sum - total
		if math.Abs(f) <= 1e-14*math.Max(largest, math.Abs(total)) || hi-lo <= 1e-12*scale {
			break
		}
		if f > 0 {
			hi = pw
		} else {
			lo = pw
		}
		next := pw - f/slope
		if !(next > lo && next < hi) {
			next = 0.5 * (lo + hi)
		}
		pw = next
	}
	for k, c := range l.coef {
		dst[k] = perfRate(c, pw-entry[k])
	}
	return pw
}
