package dfn

import "slipfront/internal/unionfind"

// AssignClusters sets Trace.Cluster to the connected component of each
// trace in the graph whose edges are the intersections, and returns the
// clusters, numbered in order of their lowest trace index (union-find,
// internal/unionfind). An isolated trace is a cluster of its own.
func AssignClusters(traces []Trace, xs []Intersection) []Cluster {
	u := unionfind.New(len(traces))
	for _, x := range xs {
		u.Union(int32(x.I), int32(x.J))
	}
	id := make([]int32, len(traces))
	for i := range id {
		id[i] = -1
	}
	var out []Cluster
	for i := range traces {
		r := u.Find(int32(i))
		if id[r] < 0 {
			id[r] = int32(len(out))
			out = append(out, Cluster{})
		}
		c := int(id[r])
		traces[i].Cluster = c
		out[c].Traces++
		out[c].Length += traces[i].Length
	}
	return out
}
