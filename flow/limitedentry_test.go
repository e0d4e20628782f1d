package flow

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/numtest"
)

// Three parallel fractures, 100 m long and 20 m high, 50 m apart and not
// connected, each fed at its west end by a cluster and ending at its east
// end in a sink that holds the initial pressure (sinkPath), so that their
// steady rates follow the cubic law.
const (
	leLength = 100.0
	leHeight = 20.0
)

// pumpClusters pumps q into the three fractures of apertures e through
// perf (nil: open clusters) until steady (doubling steps from 1 s to
// 4096 s; the slowest fracture's diffusion time L²/D is under 400 s) and
// returns the bottom-hole pressure and the cluster rates.
func pumpClusters(t *testing.T, e [3]float64, perf *LimitedEntry, q float64) (float64, []float64) {
	t.Helper()
	var paths []Path
	var junctions []Junction
	for k := range 3 {
		y := 50 * float64(k)
		paths = append(paths, Path{P0: r2.Vec{Y: y}, P1: r2.Vec{X: leLength, Y: y}, Height: leHeight})
	}
	for k := range 3 {
		sink := sinkPath(leLength, leHeight)
		sink.P0.Y, sink.P1.Y = 50*float64(k), 50*float64(k)
		paths = append(paths, sink)
		junctions = append(junctions, Junction{A: k, B: 3 + k, SA: 1, SB: 0})
	}
	m, err := BuildMesh(paths, junctions, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	clusters := [][]int{{m.Node(0, 0)}, {m.Node(1, 0)}, {m.Node(2, 0)}}
	well := []int{clusters[0][0], clusters[1][0], clusters[2][0]}
	s, err := NewSystem(m, well, Config{Fluid: testFluid, ReferencePressure: testP0, ClusterNodes: clusters, Perforations: perf})
	if err != nil {
		t.Fatal(err)
	}
	ap := func(p, a, dedp []float64) {
		for i := range a {
			path := m.Elements[i].Path
			if path < 3 {
				a[i] = e[path]
			} else {
				a[i] = e[path-3] * sinkScale
			}
			dedp[i] = 0
		}
	}
	cur, next := s.NewState(testP0, ap), s.NewState(testP0, ap)
	ctl := Control{Mode: RateControl, Rate: q}
	for dt := 1.0; dt < 5000; dt *= 2 {
		if _, err := s.Step(cur, next, dt, ctl, ap, StepSettings{}); err != nil {
			t.Fatal(err)
		}
		cur, next = next, cur
	}
	rates := make([]float64, 3)
	s.ClusterRates(rates, cur)
	return cur.BHP, rates
}

// conductance is the steady conductance of fracture k from its cluster to
// the sink's pressure: the cubic law h e³/(12 μ L) (Witherspoon et al.
// 1980) in series with the sink's half element, m³/(Pa·s).
func conductance(e float64) float64 {
	return 1 / (12*testMu*leLength/(leHeight*e*e*e) + sinkResistance(e, leHeight))
}

// Equal clusters into equal fractures share the rate equally, and the
// perforations add exactly the orifice drop Δp = 8ρq²/(π² n² d⁴ C_d²) of
// each cluster's share to the bottom-hole pressure (Crump & Conway 1988;
// the SI form of the orifice equation).
func TestLimitedEntryEqualShares(t *testing.T) {
	const q, rho = 0.03, 1000.0
	perfs := Perforations{Count: 6, Diameter: 0.01, Discharge: 0.8}
	le, err := NewLimitedEntry([]Perforations{perfs, perfs, perfs}, rho)
	if err != nil {
		t.Fatal(err)
	}
	e := [3]float64{5e-4, 5e-4, 5e-4}
	open, openRates := pumpClusters(t, e, nil, q)
	limited, rates := pumpClusters(t, e, le, q)
	for k := range 3 {
		numtest.Rel(t, "cluster rate with perforations", rates[k], q/3, 1e-9)
		numtest.Rel(t, "cluster rate without", openRates[k], q/3, 1e-9)
	}
	numtest.Rel(t, "steady bottom-hole pressure without perforations, Pa", open-testP0, q/3/conductance(e[0]), 1e-6)
	n, d, cd := 6.0, 0.01, 0.8
	drop := 8 * rho * (q / 3) * (q / 3) / (math.Pi * math.Pi * n * n * math.Pow(d, 4) * cd * cd)
	numtest.Rel(t, "bottom-hole pressure rise through the perforations, Pa", limited-open, drop, 1e-6)
}

// Fractures of apertures 0.4, 0.5 and 0.6 mm behind equal perforations
// take the rates that make p_w − p0 = K q_k² + q_k/c_k the same for all
// three with Σ q_k = Q (the orifice law of Crump & Conway 1988 in series
// with the cubic law), solved here by bisection on p_w; fewer holes share
// the rate more evenly (the purpose of limited entry, common practice).
func TestLimitedEntryUnequalFractures(t *testing.T) {
	const q, rho = 0.03, 1000.0
	e := [3]float64{4e-4, 5e-4, 6e-4}
	_, open := pumpClusters(t, e, nil, q)
	var sumC float64
	for _, v := range e {
		sumC += conductance(v)
	}
	for k := range 3 {
		numtest.Rel(t, "open cluster's share of the cubic law", open[k], q*conductance(e[k])/sumC, 1e-6)
	}
	last := (open[2] - open[0]) / (q / 3)
	for _, holes := range []int{12, 6, 3} {
		p := Perforations{Count: holes, Diameter: 0.01, Discharge: 0.8}
		le, err := NewLimitedEntry([]Perforations{p, p, p}, rho)
		if err != nil {
			t.Fatal(err)
		}
		pw, rates := pumpClusters(t, e, le, q)
		k := p.Coefficient(rho)
		rate := func(dp float64, c float64) float64 { // K q² + q/c = dp
			return (-1/c + math.Sqrt(1/(c*c)+4*k*dp)) / (2 * k)
		}
		lo, hi := 0.0, 1e9
		for range 200 {
			mid := 0.5 * (lo + hi)
			var sum float64
			for _, v := range e {
				sum += rate(mid, conductance(v))
			}
			if sum > q {
				hi = mid
			} else {
				lo = mid
			}
		}
		numtest.Rel(t, "bottom-hole pressure above p0, Pa", pw-testP0, lo, 1e-6)
		for i := range 3 {
			numtest.Rel(t, "cluster rate", rates[i], rate(lo, conductance(e[i])), 1e-6)
		}
		if spread := (rates[2] - rates[0]) / (q / 3); !(spread < last) {
			t.Errorf("%d holes: rates %v spread %.3g of the mean, not below %.3g with more holes", holes, rates, spread, last)
		} else {
			last = spread
		}
	}
}

// The tangent passes through the orifice law at q0 with its slope,
// dq/dΔp = 1/(2K|q0|) (derived from Δp = K q|q|), and is the linear
// continuation's own line below 1 kPa.
func TestLimitedEntryTangent(t *testing.T) {
	p := Perforations{Count: 6, Diameter: 0.01, Discharge: 0.8}
	le, err := NewLimitedEntry([]Perforations{p}, 1000)
	if err != nil {
		t.Fatal(err)
	}
	k := p.Coefficient(1000)
	for _, q0 := range []float64{0.02, -0.005, 1e-4, 0} {
		slope, offset := le.Tangent(0, q0)
		numtest.Rel(t, "tangent through the law at q0", slope*le.PressureDrop(0, q0)+offset, q0, 1e-12)
		want := 1 / (2 * k * math.Abs(q0))
		if math.Abs(q0) < math.Sqrt(1e3/k) {
			want = le.Conductance(0, 0)
		}
		numtest.Rel(t, "tangent slope", slope, want, 1e-12)
	}
}

// Clusters whose nodes join several elements: cluster 0 feeds the middle
// of fracture A (its two halves meet at the node), cluster 1 the middles
// of fractures B and C (two nodes of one cluster), the halves 100 m long
// (C's western one 50 m, so that the elements at the cluster's nodes are
// not all at one pressure) and ending in sinks. The star–delta terms
// between the elements of a cluster are then in play (zeroing them fails
// this test); the steady rates must still satisfy
// p_w − p0 = K q_k² + q_k/c_k, c_k the cubic-law conductance of the
// cluster's halves in parallel (Crump & Conway 1988 in series with
// Witherspoon et al. 1980), Σ q_k = Q, solved here by bisection.
func TestLimitedEntryClustersOfSeveralElements(t *testing.T) {
	const q, rho, half = 0.03, 1000.0, 100.0
	e := [3]float64{4e-4, 5e-4, 3e-4} // A, B, C
	var paths []Path
	var junctions []Junction
	// C reaches 50 m west and 100 m east, so its two halves (and so the
	// elements at the three cluster nodes) are not at one pressure.
	west := [3]float64{half, half, 50}
	for k := range 3 {
		y := 50 * float64(k)
		paths = append(paths, Path{P0: r2.Vec{X: -west[k], Y: y}, P1: r2.Vec{X: half, Y: y}, Height: leHeight,
			Cuts: []float64{west[k] / (west[k] + half)}})
	}
	for k := range 3 {
		y := 50 * float64(k)
		east := sinkPath(half, leHeight)
		east.P0.Y, east.P1.Y = y, y
		w := sinkPath(-west[k]-1, leHeight)
		w.P0.Y, w.P1.Y = y, y
		paths = append(paths, east, w)
		junctions = append(junctions, Junction{A: k, B: 3 + 2*k, SA: 1, SB: 0}, Junction{A: k, B: 4 + 2*k, SA: 0, SB: 1})
	}
	m, err := BuildMesh(paths, junctions, MeshSettings{ElementLength: 10})
	if err != nil {
		t.Fatal(err)
	}
	mid := func(k int) float64 { return west[k] / (west[k] + half) }
	clusters := [][]int{{m.Node(0, mid(0))}, {m.Node(1, mid(1)), m.Node(2, mid(2))}}
	well := []int{clusters[0][0], clusters[1][0], clusters[1][1]}
	p := Perforations{Count: 6, Diameter: 0.01, Discharge: 0.8}
	le, err := NewLimitedEntry([]Perforations{p, p}, rho)
	if err != nil {
		t.Fatal(err)
	}
	s, err := NewSystem(m, well, Config{Fluid: testFluid, ReferencePressure: testP0, ClusterNodes: clusters, Perforations: le})
	if err != nil {
		t.Fatal(err)
	}
	ap := func(pr, a, dedp []float64) {
		for i := range a {
			path := m.Elements[i].Path
			if path < 3 {
				a[i] = e[path]
			} else {
				a[i] = e[(path-3)/2] * sinkScale
			}
			dedp[i] = 0
		}
	}
	cur, next := s.NewState(testP0, ap), s.NewState(testP0, ap)
	for dt := 1.0; dt < 5000; dt *= 2 {
		if _, err := s.Step(cur, next, dt, Control{Mode: RateControl, Rate: q}, ap, StepSettings{}); err != nil {
			t.Fatal(err)
		}
		cur, next = next, cur
	}
	rates := make([]float64, 2)
	s.ClusterRates(rates, cur)
	halfC := func(e, l float64) float64 { // one half: cubic law over l and the sink's half element
		return 1 / (12*testMu*l/(leHeight*e*e*e) + sinkResistance(e, leHeight))
	}
	c := [2]float64{2 * halfC(e[0], half), 2*halfC(e[1], half) + halfC(e[2], 50) + halfC(e[2], half)}
	k := p.Coefficient(rho)
	rate := func(dp, c float64) float64 { return (-1/c + math.Sqrt(1/(c*c)+4*k*dp)) / (2 * k) }
	lo, hi := 0.0, 1e9
	for range 200 {
		mid := 0.5 * (lo + hi)
		if rate(mid, c[0])+rate(mid, c[1]) > q {
			hi = mid
		} else {
			lo = mid
		}
	}
	numtest.Rel(t, "bottom-hole pressure above p0, Pa", cur.BHP-testP0, lo, 1e-6)
	for i := range 2 {
		numtest.Rel(t, "cluster rate", rates[i], rate(lo, c[i]), 1e-6)
	}
}
