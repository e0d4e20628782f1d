package flow

import (
	"errors"
	"math"
	"testing"

	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
)

// A cluster of six 0.35-inch (8.89 mm) holes with C_d = 0.8, water at
// 1000 kg/m³. Illustrative values, not from a source.
var testPerfs = Perforations{Count: 6, Diameter: 8.89e-3, Discharge: 0.8}

const testDensity = 1000.0

// The SI orifice form Δp = 8ρq²/(π²n²d⁴C_d²) against the field-unit form
// in which Crump & Conway (1988) state it, Δp[psi] = 0.2369 ρ[lb/gal]
// q²[bbl/min] / (n² d⁴[in] C_d²) (the constant 0.2369 from memory). Unit
// factors: 1 lb/gal = 119.826 kg/m³, 1 bbl/min = 2.6497947e-3 m³/s,
// 1 in = 0.0254 m, 1 psi = 6894.757 Pa (NIST SP 811). The exact
// conversion of the SI form gives 0.23764: the printed constant is within
// 0.5%.
func TestPerforationPressureDrop(t *testing.T) {
	l, err := NewLimitedEntry([]Perforations{testPerfs}, testDensity)
	if err != nil {
		t.Fatal(err)
	}
	const q = 0.035 // m³/s (13.2 bbl/min)
	n, d, cd := 6.0, 8.89e-3, 0.8
	want := 8 * testDensity * q * q / (math.Pi * math.Pi * n * n * math.Pow(d, 4) * cd * cd)
	numtest.Rel(t, "Δp, SI formula", l.PressureDrop(0, q), want, 1e-14)
	numtest.Rel(t, "Δp at −q", l.PressureDrop(0, -q), -want, 1e-14)
	numtest.Rel(t, "rate back from Δp", l.Rate(0, want), q, 1e-14)

	const lbPerGal, bblPerMin, inch, psi = 119.826, 2.6497947e-3, 0.0254, 6894.757
	field := 0.2369 * (testDensity / lbPerGal) * math.Pow(q/bblPerMin, 2) / (n * n * math.Pow(d/inch, 4) * cd * cd) * psi
	numtest.Rel(t, "Δp, field-unit form", want, field, 0.005)

	// The linear continuation below 1 kPa meets the orifice law there.
	qLin := math.Sqrt(linearDrop / testPerfs.Coefficient(testDensity))
	numtest.Rel(t, "Δp at the switch", l.PressureDrop(0, qLin*(1-1e-12)), linearDrop, 1e-9)
	numtest.Rel(t, "rate at the switch", l.Rate(0, linearDrop*(1-1e-12)), qLin, 1e-9)
	numtest.Rel(t, "linear branch", l.PressureDrop(0, qLin/4), linearDrop/4, 1e-12)
}

// splitCase runs Split and checks the invariants every split must keep:
// the rates add up to the total (mass balance) and each rate is the
// orifice law at p_w − p_k.
func splitCase(t *testing.T, l *LimitedEntry, entry []float64, total float64) ([]float64, float64) {
	t.Helper()
	q := make([]float64, l.Len())
	pw := l.Split(q, entry, total)
	var sum, largest float64
	for k := range q {
		sum += q[k]
		largest = math.Max(largest, math.Abs(q[k]))
		numtest.Close(t, "p_w − p_k = Δp_k", pw-entry[k], l.PressureDrop(k, q[k]), 1e-6, 1e-10)
	}
	// The root finder stops within 1e−14 of the largest rate or 1e−12 of
	// the pressures; the latter allows up to ~1e−9 of the rate here.
	numtest.Close(t, "Σ q_k = Q", sum, total, 1e-9*largest, 0)
	return q, pw
}

func TestLimitedEntrySplit(t *testing.T) {
	const total = 0.2 // m³/s (75 bbl/min)
	equal := make([]Perforations, 5)
	for i := range equal {
		equal[i] = testPerfs
	}
	l, err := NewLimitedEntry(equal, testDensity)
	if err != nil {
		t.Fatal(err)
	}

	// Equal clusters at equal entry pressures share equally.
	entry := []float64{40e6, 40e6, 40e6, 40e6, 40e6}
	q, pw := splitCase(t, l, entry, total)
	for k := range q {
		numtest.Rel(t, "equal share", q[k], total/5, 1e-12)
	}
	numtest.Rel(t, "p_w", pw, 40e6+testPerfs.Coefficient(testDensity)*(total/5)*(total/5), 1e-12)

	// A cluster at a higher entry pressure takes less, one at a lower
	// entry pressure more; the order of rates is the reverse of the order
	// of entry pressures.
	entry = []float64{40e6, 41e6, 39e6, 40.5e6, 40e6}
	q, _ = splitCase(t, l, entry, total)
	order := []int{2, 0, 4, 3, 1} // ascending entry pressure
	for i := 1; i < len(order); i++ {
		if !(q[order[i]] < q[order[i-1]]) && entry[order[i]] > entry[order[i-1]] {
			t.Errorf("cluster %d (entry %.1f MPa) takes %g ≥ cluster %d (entry %.1f MPa) %g",
				order[i], entry[order[i]]/1e6, q[order[i]], order[i-1], entry[order[i-1]]/1e6, q[order[i-1]])
		}
	}
	numtest.Rel(t, "equal entries share equally", q[0], q[4], 1e-12)

	// Fewer holes, more friction: a cluster with 3 holes among 6-hole
	// clusters takes a quarter of the rate per unit √Δp (K ∝ 1/n²).
	mixed := []Perforations{testPerfs, {Count: 3, Diameter: testPerfs.Diameter, Discharge: testPerfs.Discharge}}
	lm, err := NewLimitedEntry(mixed, testDensity)
	if err != nil {
		t.Fatal(err)
	}
	q, _ = splitCase(t, lm, []float64{40e6, 40e6}, total)
	numtest.Rel(t, "q(3 holes)/q(6 holes)", q[1]/q[0], 0.5, 1e-12)

	// Shut-in: no net rate, fluid flows from the high cluster to the low
	// one through the well.
	q, pw = splitCase(t, l, []float64{42e6, 40e6, 40e6, 40e6, 40e6}, 0)
	if !(q[0] < 0 && q[1] > 0) || !(pw < 42e6 && pw > 40e6) {
		t.Errorf("shut-in crossflow: q = %v, p_w = %g", q, pw)
	}

	// Flowback: a negative total is taken from every cluster.
	q, _ = splitCase(t, l, []float64{40e6, 40e6, 40e6, 40e6, 40e6}, -0.01)
	for k := range q {
		numtest.Rel(t, "flowback share", q[k], -0.002, 1e-12)
	}
}

// The chord conductance lagged in a fixed-point (Picard) iteration
// converges to the orifice law: clusters feed reservoir conductances α_k
// to fixed pressures p_k in series with their perforations; each
// iteration solves the linear problem Σ g_k (p_w − p_k) = Q with
// g_k = 1/(1/α_k + 1/c_k(Δp_k)), as the implicit flow system will, and at
// its fixed point Δp_k = K_k q_k|q_k| and Σ q_k = Q hold.
func TestLimitedEntryConductance(t *testing.T) {
	clusters := []Perforations{testPerfs, testPerfs, {Count: 4, Diameter: 8.89e-3, Discharge: 0.8}}
	l, err := NewLimitedEntry(clusters, testDensity)
	if err != nil {
		t.Fatal(err)
	}
	alpha := []float64{2e-8, 5e-9, 1e-8} // m³/(Pa·s)
	res := []float64{40e6, 41e6, 39.5e6} // Pa
	const total = 0.15
	dp := make([]float64, 3) // start from no perforation drop
	var q [3]float64
	iterations := 0
	for ; iterations < 100; iterations++ {
		var sg, sgp float64
		g := make([]float64, 3)
		for k := range g {
			g[k] = 1 / (1/alpha[k] + 1/l.Conductance(k, dp[k]))
			sg += g[k]
			sgp += g[k] * res[k]
		}
		pw := (total + sgp) / sg
		change := 0.0
		for k := range g {
			q[k] = g[k] * (pw - res[k])
			next := q[k] / l.Conductance(k, dp[k])
			change = math.Max(change, math.Abs(next-dp[k]))
			dp[k] = next
		}
		if change < 1e-3 { // Pa
			break
		}
	}
	if iterations == 100 {
		t.Fatal("Picard iterations with the chord conductance did not converge")
	}
	var sum float64
	for k := range q {
		sum += q[k]
		numtest.Rel(t, "fixed point on the orifice law", dp[k], l.PressureDrop(k, q[k]), 1e-9)
	}
	numtest.Rel(t, "Σ q = Q", sum, total, 1e-12)
}

func TestLimitedEntryValidate(t *testing.T) {
	for _, tc := range []struct {
		name     string
		clusters []Perforations
		rho      float64
	}{
		{"no cluster", nil, 1000},
		{"zero density", []Perforations{testPerfs}, 0},
		{"no holes", []Perforations{{Count: 0, Diameter: 0.01, Discharge: 0.8}}, 1000},
		{"zero diameter", []Perforations{{Count: 6, Diameter: 0, Discharge: 0.8}}, 1000},
		{"discharge above 1", []Perforations{{Count: 6, Diameter: 0.01, Discharge: 1.2}}, 1000},
	} {
		if _, err := NewLimitedEntry(tc.clusters, tc.rho); !errors.Is(err, badinput.Err) {
			t.Errorf("%s: error %v, want bad input", tc.name, err)
		}
	}
}
