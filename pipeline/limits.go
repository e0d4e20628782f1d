package pipeline

import (
	"fmt"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/internal/sysmem"
	"slipfront/scenarios"
	"slipfront/sim"
)

// Limits bound the resources of a stage, checked against estimates before
// anything large is allocated.
type Limits struct {
	// Memory a run may take, bytes; 0 means DefaultMemory().
	Memory float64
}

// DefaultMemory is the memory limit when none is given: half of what this
// process may use (the machine's memory or its control group's limit;
// common practice, no source: leaves room for the system and for the
// growth of Go's heap between collections), or 4 GiB when that cannot be
// read.
func DefaultMemory() float64 {
	if m := sysmem.Available(); m > 0 {
		return float64(m) / 2
	}
	return 4 << 30
}

func (l Limits) memory() float64 {
	if l.Memory > 0 {
		return l.Memory
	}
	return DefaultMemory()
}

// CheckNetwork refuses a scenario whose network would not fit in the
// memory limit, with the estimate and the keys that change it.
func (l Limits) CheckNetwork(s *scenarios.Scenario) error {
	e, err := dfn.Estimate(s)
	if err != nil {
		return err
	}
	if e.Bytes <= l.memory() {
		return nil
	}
	change := "the sets' intensity or size range"
	if e.Densest >= 0 {
		change = intensityKey(s, e.Densest) + " (the densest set) or the sets' size range"
	}
	return badinput.Errorf("%s: the network would take about %s (%.3g fractures, %.3g intersections), more than the memory limit of %s: "+
		"lower %s or the domain, or raise --memory-limit",
		s.Source, bytesText(e.Bytes), e.Fractures, e.Intersections, bytesText(l.memory()), change)
}

// intensityKey names the intensity key of set i that the scenario uses,
// with its value in SI: "sets[0].intensity.count = 1900000".
func intensityKey(s *scenarios.Scenario, i int) string {
	in := s.Sets[i].Intensity
	switch in.Measure {
	case "count":
		return fmt.Sprintf("sets[%d].intensity.count = %d", i, in.Count)
	case "p10":
		return fmt.Sprintf("sets[%d].intensity.p10 = %g 1/m", i, in.P10)
	default:
		return fmt.Sprintf("sets[%d].intensity.p32 = %g 1/m", i, in.P32)
	}
}

// CheckRun refuses a scenario whose simulation, runs at a time (batch
// workers), would not fit in the memory limit.
func (l Limits) CheckRun(s *scenarios.Scenario, runs int) error {
	if err := l.CheckNetwork(s); err != nil {
		return err
	}
	e, err := sim.Estimate(s)
	if err != nil {
		return err
	}
	runs = max(runs, 1)
	if need := e.Bytes * float64(runs); need > l.memory() {
		several := ""
		if runs > 1 {
			several = fmt.Sprintf(" for %d runs at a time", runs)
		}
		return badinput.Errorf("%s: the simulation would take about %s%s (%.3g elements of at most numerics.element_length = %g m on %.3g m of traces), more than the memory limit of %s: "+
			"use a longer numerics.element_length, a smaller network or fewer --workers, or raise --memory-limit",
			s.Source, bytesText(need), several, e.Elements, s.Numerics.ElementLength, e.Network.TraceLength, bytesText(l.memory()))
	}
	return nil
}

// bytesText writes a byte count in MB or GB, with the SI prefixes that
// --memory-limit reads them with (1 MB = 10⁶ bytes).
func bytesText(b float64) string {
	if b >= 1e9 {
		return fmt.Sprintf("%.1f GB", b/1e9)
	}
	return fmt.Sprintf("%.0f MB", b/1e6)
}
