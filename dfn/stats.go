package dfn

import (
	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"
)

// NetworkStats are the intensity and connectivity statistics of a network
// (see the package documentation for how each is measured).
type NetworkStats struct {
	Fractures     int
	Traces        int
	Intersections int
	// P32 is the fracture area inside the counting volume per unit volume,
	// all sets and mapped fractures, 1/m.
	P32 float64
	// P21 is the trace length inside the map per unit map area, 1/m.
	P21 float64
	// MeanIntersectionsPerTrace is 2 × intersections / traces (each
	// intersection lies on two traces); 0 without traces.
	MeanIntersectionsPerTrace float64
	// Clusters counts the connected components, isolated traces included.
	Clusters int
	// LargestClusterFraction is the share of the total trace length in the
	// cluster with the most trace length; 0 without traces.
	LargestClusterFraction float64
	// Sets: one per generated set, then KnownSet if there are mapped
	// fractures.
	Sets  []SetStats
	Wells []WellStats
}

// SetStats are the statistics of one set.
type SetStats struct {
	Name string
	// Set is the index in Scenario.Sets or KnownSet.
	Set int
	// Count of fractures and of traces.
	Count, Traces int
	// P32Target is the set's target, 1/m; NaN for mapped fractures.
	P32Target float64
	// P32 and P21 realized, 1/m.
	P32, P21 float64
	// KappaEstimate is (N − 1)/(N − R) of the set's normals
	// (KappaEstimate); NaN with fewer than two fractures.
	KappaEstimate float64
}

// WellStats are the crossings and connections of one well.
type WellStats struct {
	Name string
	// PathLength in map view, m.
	PathLength float64
	// Crossings of the path with traces, and P10 = crossings/PathLength,
	// 1/m.
	Crossings int
	P10       float64
	// CrossedTraces is the number of distinct traces the path crosses.
	CrossedTraces int
	// ConnectedClusters are the clusters of the crossed traces;
	// ConnectedTraces and ConnectedLength (m) count every trace in them.
	ConnectedClusters int
	ConnectedTraces   int
	ConnectedLength   float64
}

// Stats measures the network.
func (n *Network) Stats() NetworkStats {
	r := n.Region
	st := NetworkStats{
		Fractures: len(n.Fractures), Traces: len(n.Traces), Intersections: len(n.Intersections),
		Clusters: len(n.Clusters),
	}
	nsets := len(n.Sets)
	perSet := make([]SetStats, nsets+1) // last: known
	normals := make([][]r3.Vec, nsets+1)
	slot := func(set int) int {
		if set == KnownSet {
			return nsets
		}
		return set
	}
	lo := [3]float64{r.XMin, r.YMin, r.ZMin()}
	hi := [3]float64{r.XMax, r.YMax, r.ZMax()}
	for i := range n.Fractures {
		f := &n.Fractures[i]
		k := slot(f.Set)
		perSet[k].Count++
		perSet[k].P32 += AreaIn(f, lo, hi)
		normals[k] = append(normals[k], f.Normal)
	}
	var totalLen float64
	for i := range n.Traces {
		t := &n.Traces[i]
		k := slot(t.Set)
		perSet[k].Traces++
		perSet[k].P21 += ClipLength(t.Segment, r.XMin, r.XMax, r.YMin, r.YMax)
		totalLen += t.Length
	}
	for k := range perSet {
		s := &perSet[k]
		s.P32 /= r.Volume()
		s.P21 /= r.MapArea()
		st.P32 += s.P32
		st.P21 += s.P21
		s.KappaEstimate, _ = KappaEstimate(normals[k])
		if k < nsets {
			s.Name, s.Set, s.P32Target = n.Sets[k].Name, k, n.Sets[k].P32Target
		} else {
			s.Name, s.Set, s.P32Target = KnownSetName, KnownSet, nan()
		}
	}
	st.Sets = perSet[:nsets]
	if perSet[nsets].Count > 0 {
		st.Sets = perSet
	}
	if len(n.Traces) > 0 {
		st.MeanIntersectionsPerTrace = 2 * float64(len(n.Intersections)) / float64(len(n.Traces))
		var largest float64
		for _, c := range n.Clusters {
			largest = max(largest, c.Length)
		}
		st.LargestClusterFraction = largest / totalLen
	}
	st.Wells = n.wellStats()
	return st
}

// wellStats counts each well's crossings and connections.
func (n *Network) wellStats() []WellStats {
	out := make([]WellStats, len(n.Wells))
	for w, p := range n.Wells {
		out[w].Name = p.Name
		for k := 0; k+1 < len(p.Path); k++ {
			out[w].PathLength += r2.Norm(r2.Sub(p.Path[k+1], p.Path[k]))
		}
	}
	traces := make([]map[int]bool, len(n.Wells))
	clusters := make([]map[int]bool, len(n.Wells))
	for _, c := range n.WellCrossings {
		if traces[c.Well] == nil {
			traces[c.Well], clusters[c.Well] = map[int]bool{}, map[int]bool{}
		}
		out[c.Well].Crossings++
		traces[c.Well][c.Trace] = true
		clusters[c.Well][n.Traces[c.Trace].Cluster] = true
	}
	for w := range out {
		s := &out[w]
		s.P10 = float64(s.Crossings) / s.PathLength
		s.CrossedTraces = len(traces[w])
		s.ConnectedClusters = len(clusters[w])
		for c := range clusters[w] {
			s.ConnectedTraces += n.Clusters[c].Traces
		}
	}
	// Sum lengths in cluster order so the result does not depend on map
	// iteration order.
	for w := range out {
		for c := range n.Clusters {
			if clusters[w][c] {
				out[w].ConnectedLength += n.Clusters[c].Length
			}
		}
	}
	return out
}
