package sim

import (
	"fmt"
	"math"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/mechanics"
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
	return RunEstimate{Network: net, Elements: el, Bytes: net.Bytes + runBytes(s, el)}, nil
}

// runBytes is the memory of a run of the scenario on the given number of
// elements and of its stress-change map, bytes.
func runBytes(s *scenarios.Scenario, elements float64) float64 {
	return elements*bytesPerElement + (float64(s.MapGrid().Cells())+elements)*bytesPerFieldObject
}

// bytesPerNearPair is the memory of one pair of elements within the
// contact problem's near radius: its receiver index and its slip and
// opening influences (36 bytes), and the growth of the slices that hold
// them, rounded up.
const bytesPerNearPair = 56

// checkMemory refuses, once the mesh is built and before the elastic
// operator and the contact problem are, a run that would take more than
// limit bytes (0: no limit). Estimate cannot know the re-initiation
// branches, which follow the network drawn, nor how densely the elements
// crowd within the contact problem's near radius, whose pairs it stores
// (mechanics.CountNearPairs): a thick layer's radius over a dense network
// holds thousands of pairs per element. The pairs are added to the
// per-element memory, which counts a typical share of them: the check errs
// high.
func (m *model) checkMemory(limit float64) error {
	if limit <= 0 {
		return nil
	}
	n := float64(len(m.elements))
	need := runBytes(m.s, n)
	var pairs int
	if need <= limit {
		pairs = mechanics.CountNearPairs(elasticElements(m.elements), m.nearRadius())
		if need += float64(pairs) * bytesPerNearPair; need <= limit {
			return nil
		}
	}
	var branches int
	for i, el := range m.mesh.Elements {
		if m.conduitEl[i] && m.conduits[el.Path-len(m.net.Traces)].IsBranch() {
			branches++
		}
	}
	within := ""
	if pairs > 0 {
		within = fmt.Sprintf(" (%d pairs of them within the contact's near radius, %.3g m)", pairs, m.nearRadius())
	}
	return badinput.Errorf("%s: the mesh has %d elements, %d of them on re-initiation branches%s, and the run would take about %.3g GB, more than the memory limit of %.3g GB: "+
		"set wells[].reinitiation = \"off\", use a longer numerics.element_length or a smaller network, or raise the memory limit",
		m.s.Source, len(m.elements), branches, within, need/1e9, limit/1e9)
}
