package dfn

import (
	"fmt"
	"unsafe"

	"slipfront/scenarios"
)

// NetworkEstimate is what a scenario's network will hold on average, known
// before any fracture is drawn, so that a scenario too large for the
// machine is refused with numbers instead of exhausting memory.
type NetworkEstimate struct {
	// Fractures expected (sets and mapped fractures).
	Fractures float64
	// TraceLength is an upper estimate of the total trace length on the
	// mid-plane, m, and Traces of their number (every fracture).
	TraceLength, Traces float64
	// Intersections is an upper estimate of the trace intersections.
	Intersections float64
	// Bytes is the memory the network takes, from the sizes of its
	// records.
	Bytes float64
	// Densest is the index of the set with the largest P32 target, which
	// contributes the most trace length and intersections (-1 without
	// sets): the first set to thin out when the network is too large.
	Densest int
}

// Estimate returns the expected size of the scenario's network.
//
// The trace length is bounded by the stereological relation for a
// horizontal section plane, P21 = P32·E[sin δ] ≤ P32 (δ the dip; Dershowitz
// & Herda 1992), over the map area enlarged by the mean fracture size on
// every side, where traces of fractures centred outside the map still lie.
// Random segments of total length L in an area A cross each other
// L²·E|sin θ|/(πA) times on average (θ the angle between two of them;
// Santaló 1976, the Buffon–Laplace count for isotropic lines gives 2/π for
// E|sin θ|); Estimate takes E|sin θ| ≤ 1 and drops the 1/π only for the
// bound: L²/(2A), at least the count of two perpendicular sets.
func Estimate(s *scenarios.Scenario) (NetworkEstimate, error) {
	region, err := NewRegion(s.Domain, s.Layer)
	if err != nil {
		return NetworkEstimate{}, err
	}
	e := NetworkEstimate{Densest: -1}
	var p32, densest, meanSize float64
	for i, set := range s.Sets {
		m, err := NewSetModel(set, region)
		if err != nil {
			return NetworkEstimate{}, fmt.Errorf("dfn: sets[%d] (%q): %w", i, set.Name, err)
		}
		e.Fractures += m.Info.ExpectedCount
		p32 += m.Info.P32Target
		if m.Info.P32Target > densest {
			e.Densest, densest = i, m.Info.P32Target
		}
		meanSize = max(meanSize, m.Size.Moment(1))
	}
	for _, k := range s.KnownFractures.Fractures {
		e.Fractures++
		e.TraceLength += k.Length
	}
	area := (region.XMax - region.XMin + 2*meanSize) * (region.YMax - region.YMin + 2*meanSize)
	e.Traces = e.Fractures
	e.TraceLength += p32 * area
	e.Intersections = e.TraceLength * e.TraceLength / (2 * area)
	e.Bytes = e.Fractures*float64(unsafe.Sizeof(Fracture{})) +
		e.Traces*float64(unsafe.Sizeof(Trace{})+unsafe.Sizeof(Segment{})) +
		e.Intersections*float64(unsafe.Sizeof(Intersection{}))
	e.Bytes *= appendGrowth
	return e, nil
}

// appendGrowth is the factor by which slices grown by append can exceed
// their length (Go doubles small slices and grows large ones by 1.25;
// the cap is up to twice the length).
const appendGrowth = 2
