package pipeline

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"slipfront/dfn"
	"slipfront/mechanics"
	"slipfront/report"
	"slipfront/scenarios"
)

// MohrIncrease returns the pore-pressure increase of the shifted envelope
// on the screening's Mohr diagram, Pa, and a sentence that states it: the
// increase that brings the initial pore pressure to the smaller of the
// schedule's pressure cap and Shmin. Above Shmin the fractures normal to
// it open (the run warns of the tensile regime), so that is the most a
// closed network sees, and no stage pumps above its cap.
func MohrIncrease(s *scenarios.Scenario, st mechanics.Stress) (float64, string) {
	shmin := st.Horizontal().Shmin
	top, what := shmin, "Shmin"
	if s.Schedule.PressureCap < top {
		top, what = s.Schedule.PressureCap, "the schedule's pressure cap"
	}
	dp := math.Max(top-st.PorePressure(), 0)
	return dp, fmt.Sprintf("Dashed envelope: pore pressure raised by Δp = %.1f MPa, to %s (%.1f MPa), "+
		"the smaller of the pressure cap and Shmin.", dp/1e6, what, top/1e6)
}

// screenPictures are the pictures of a screening: poles by slip tendency
// and by Δp_c with the principal axes, the Mohr diagram, the slipping
// shares against the pressure increase, and the map of traces by Δp_c
// (with the local SHmax ticks after production, none for nil).
func screenPictures(s *scenarios.Scenario, net *dfn.Network, sc *mechanics.Screening, ticks []report.StressTick) []picture {
	axes := stressAxes(sc.Stress)
	note := fmt.Sprintf("%d fractures of realization 0", len(sc.Planes))
	byTendency := &report.Stereonet{Title: s.Name + " — poles by slip tendency", Note: note, Axes: axes, Graticule: true,
		Colour: report.ColourScale{Label: "Slip tendency τ/σn′"}}
	byCritical := &report.Stereonet{Title: s.Name + " — poles by critical pressure increase", Note: note, Axes: axes, Graticule: true,
		Colour: report.ColourScale{Label: "Critical pressure increase Δp_c", Unit: "MPa"}}
	critical := map[int]float64{}
	for _, p := range sc.Planes {
		byTendency.Planes = append(byTendency.Planes, report.NetPlane{Dip: p.Dip, DipDirection: p.DipDirection, Value: p.SlipTendency})
		byCritical.Planes = append(byCritical.Planes, report.NetPlane{Dip: p.Dip, DipDirection: p.DipDirection, Value: p.CriticalIncrease / 1e6})
		critical[p.ID] = p.CriticalIncrease / 1e6
	}
	m := baseMap(s, s.Name+" — traces by critical pressure increase")
	m.Colour = report.ColourScale{Label: "Critical pressure increase Δp_c", Unit: "MPa"}
	m.Wells = mapWells(s)
	m.StressTicks = ticks
	for _, t := range net.Traces {
		m.Traces = append(m.Traces, report.Trace{A: rp(t.P0.X, t.P0.Y), B: rp(t.P1.X, t.P1.Y), Value: critical[t.Fracture]})
	}
	dp, dpNote := MohrIncrease(s, sc.Stress)
	return []picture{
		{SlipTendencyNetFile, "Poles by slip tendency: which orientations are closest to slip under the in-situ stress (after production, the depleted stress at each fracture; S1–S3 of the in-situ state marked).", byTendency},
		{CriticalNetFile, "Poles by Δp_c: how far each orientation is from failure, as the pore-pressure increase it needs.", byCritical},
		{MohrPictureFile, "Mohr diagram: every fracture against the failure envelope, now and with the pressure increase stated under it.",
			mohrPicture(s, sc, dp, dpNote)},
		{SlipSharesPictureFile, "Slip shares: the share of fractures and of trace length that slip as the pore pressure rises, per set.",
			slipShares(s, sc)},
		{CriticalMapFile, "Map by Δp_c: where the fractures closest to failure lie relative to the wells.", m},
	}
}

// stressAxes are the principal stress axes, S1 first.
func stressAxes(st mechanics.Stress) []report.StressAxis {
	var axes []report.StressAxis
	for _, p := range st.Principal() {
		axes = append(axes, report.StressAxis{Name: p.Name, Axis: p.Axis})
	}
	return axes
}

// setGroup maps a set index to a picture's group index: the generated
// sets in order, then the mapped fractures.
func setGroup(s *scenarios.Scenario, set int) int {
	if set == dfn.KnownSet {
		return len(s.Sets)
	}
	return set
}

// groupNames names the groups of setGroup.
func groupNames(s *scenarios.Scenario) []string {
	var names []string
	for _, set := range s.Sets {
		names = append(names, set.Name)
	}
	return append(names, dfn.KnownSetName)
}

// mohrPicture is the screening's Mohr diagram with the envelope shifted
// by dp, Pa: every plane at its own effective stress (after production,
// its depleted pore pressure), the circles those of the in-situ stress.
func mohrPicture(s *scenarios.Scenario, sc *mechanics.Screening, dp float64, note string) *report.Mohr {
	p0 := sc.Stress.PorePressure()
	m := &report.Mohr{Title: s.Name + " — Mohr diagram, effective stresses", Note: note,
		Cohesion: sc.Criterion.Cohesion, Friction: sc.Criterion.Friction, Increase: dp, Groups: groupNames(s)}
	for k, p := range sc.Stress.Principal() {
		m.Principal[k] = p.Value - p0
	}
	for _, p := range sc.Planes {
		m.Points = append(m.Points, report.MohrPoint{SigmaN: p.SigmaN - p.PorePressure, Tau: p.Tau, Group: setGroup(s, p.Set)})
	}
	return m
}

// slipShares is the share of fractures and of trace length with
// Δp_c ≤ Δp at every point of the screening's curve, per set and for all
// fractures.
func slipShares(s *scenarios.Scenario, sc *mechanics.Screening) *report.SlipShares {
	incs := make([]float64, len(sc.Curve))
	for i, c := range sc.Curve {
		incs[i] = c.Increase
	}
	c := &report.SlipShares{Title: s.Name + " — share of fractures that slip against the pressure increase",
		Note: "A fracture slips once the pore-pressure increase reaches its Δp_c, total stresses held fixed."}
	for _, sh := range sc.Sets {
		c.Series = append(c.Series, shareSeries(sh.Name, incs, sc.Planes, func(p mechanics.PlaneResult) bool { return p.Set == sh.Set }))
	}
	c.Series = append(c.Series, shareSeries("All fractures", incs, sc.Planes, func(mechanics.PlaneResult) bool { return true }))
	return c
}

// shareSeries counts the planes that pass keep and slip at each increase.
func shareSeries(name string, incs []float64, planes []mechanics.PlaneResult, keep func(mechanics.PlaneResult) bool) report.ShareSeries {
	var kept []mechanics.PlaneResult
	var total float64
	for _, p := range planes {
		if keep(p) {
			kept = append(kept, p)
			total += p.TraceLength
		}
	}
	slices.SortFunc(kept, func(a, b mechanics.PlaneResult) int { return cmp.Compare(a.CriticalIncrease, b.CriticalIncrease) })
	se := report.ShareSeries{Name: name, Increase: incs, Fractures: make([]float64, len(incs)), TraceLength: make([]float64, len(incs))}
	k, length := 0, 0.0
	for i, dp := range incs {
		for ; k < len(kept) && kept[k].CriticalIncrease <= dp; k++ {
			length += kept[k].TraceLength
		}
		if len(kept) > 0 {
			se.Fractures[i] = float64(k) / float64(len(kept))
		}
		if total > 0 {
			se.TraceLength[i] = math.Min(length/total, 1) // Round-off of the running sum.
		}
	}
	return se
}

// networkPictures are the pictures of a generated network: the map of
// traces by set and the poles by set with the principal stress axes.
func networkPictures(s *scenarios.Scenario, net *dfn.Network) ([]picture, error) {
	key := "Colour: set number"
	for i, set := range s.Sets {
		key += fmt.Sprintf("; %d = %s", i, set.Name)
	}
	key += "; mapped fractures grey"
	colour := report.ColourScale{Label: "Set number", NoValue: "Mapped fractures"}
	if n := len(s.Sets); n > 1 {
		colour.Min, colour.Max = 0, float64(n-1)
	}
	setValue := func(set int) float64 {
		if set == dfn.KnownSet {
			return math.NaN()
		}
		return float64(set)
	}
	m := baseMap(s, fmt.Sprintf("%s — fracture traces by set, realization %d", s.Name, net.Realization))
	m.Colour, m.Wells = colour, mapWells(s)
	for _, t := range net.Traces {
		m.Traces = append(m.Traces, report.Trace{A: rp(t.P0.X, t.P0.Y), B: rp(t.P1.X, t.P1.Y), Value: setValue(net.Fractures[t.Fracture].Set)})
	}
	st, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return nil, err
	}
	n := &report.Stereonet{Title: fmt.Sprintf("%s — poles of %d fractures by set", s.Name, len(net.Fractures)), Note: key,
		Colour: colour, Axes: stressAxes(st), Graticule: true}
	for _, f := range net.Fractures {
		n.Planes = append(n.Planes, report.NetPlane{Dip: f.Dip, DipDirection: f.DipDirection, Value: setValue(f.Set)})
	}
	return []picture{
		{NetworkMapFile, "Traces on the layer mid-plane by set: how the sets cover the map and connect to the wells. " + key + ".", m},
		{PolesPictureFile, "Poles by set: the orientation and scatter of each set against the principal stress axes.", n},
	}, nil
}
