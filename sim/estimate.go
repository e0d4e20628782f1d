package sim

import (
	"math"

	"slipfront/dfn"
	"slipfront/scenarios"
)

// RunEstimate is the size of a run, known before the network is drawn.
type RunEstimate struct {
	// Network is the network's estimate.
	Network dfn.NetworkEstimate
	// Elements is an upper estimate of the flow elements.
	Elements float64
	// Bytes is the memory of the network, the run and its stress-change
	// map.
	Bytes float64
}

// bytesPerElement is the memory a run takes per flow element: the mesh,
// the flow system with its Cholesky factor, the elastic operator (dense
// or hierarchical) with the near-field blocks of the contact problem, the
// mechanical state and the snapshot frames in flight. Measured with the
// maximum resident set size of the zipper pad at element lengths 10 m and 5 m
// (10 751 and 19 688 elements: 260 MB and 415 MB, 17 kB per element
// beyond the program itself), rounded up.
const bytesPerElement = 20 << 10

// bytesPerFieldObject is the memory of the stress-change map at the end
// of a run (CoulombChangeMap) per map cell and per element: its
// hierarchical field evaluator grows as (cells + elements)·log. Measured
// with the maximum resident set size of the zipper pad with its map (10 751
// elements, 16 000 cells: 507 MB in all, about 250 MB more than the run
// without the map), rounded up.
const bytesPerFieldObject = 10 << 10

// Estimate returns the size of a run of the scenario: elements from the
// estimated trace length split at element_length, plus one more element
// per trace and two per intersection (the splits at the ends and at every
// crossing), plus the primary conduits.
func Estimate(s *scenarios.Scenario) (RunEstimate, error) {
	net, err := dfn.Estimate(s)
	if err != nil {
		return RunEstimate{}, err
	}
	length := net.TraceLength
	for _, w := range s.Wells {
		for _, st := range w.Stages {
			length += 2 * w.ConduitHalfLength * float64(len(st.Clusters))
		}
	}
	el := math.Ceil(length/s.Numerics.ElementLength) + net.Traces + 2*net.Intersections
	field := (float64(s.MapGrid().Cells()) + el) * bytesPerFieldObject
	return RunEstimate{Network: net, Elements: el, Bytes: net.Bytes + el*bytesPerElement + field}, nil
}
