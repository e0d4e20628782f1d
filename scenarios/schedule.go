package scenarios

import (
	"fmt"
	"strings"
)

// PlannedStage is one stage in pumping order with the schedule's defaults
// resolved.
type PlannedStage struct {
	// Well and Stage index Scenario.Wells and Well.Stages.
	Well, Stage int
	// Name is "WELL:STAGE".
	Name string
	// Fluid names an entry of Scenario.Fluids.
	Fluid string
	// Rate, m³/s; Volume, m³ (0: the duration governs); Duration, s (0: the
	// volume governs); PressureCap, Pa; ShutIn after the stage, s.
	Rate, Volume, Duration, PressureCap, ShutIn float64
	// Perforations per cluster (0: open clusters, no limited entry), their
	// Diameter, m, and discharge coefficient.
	Perforations                              int
	PerforationDiameter, DischargeCoefficient float64
}

// NominalLength is the stage's planned pumping time at its nominal rate, s:
// the duration, or volume/rate, whichever ends it first.
func (p PlannedStage) NominalLength() float64 {
	t := p.Duration
	if p.Volume > 0 && (t == 0 || p.Volume/p.Rate < t) {
		t = p.Volume / p.Rate
	}
	return t
}

// StageNameAt returns the name of stage k of a pumping order, or "" when
// k is not one (−1: before the first stage).
func StageNameAt(order []PlannedStage, k int) string {
	if k < 0 || k >= len(order) {
		return ""
	}
	return order[k].Name
}

// StageName is the "WELL:STAGE" name used in schedule.sequence and outputs.
func StageName(well, stage string) string { return well + ":" + stage }

// PumpingOrder lists the stages in the order they are pumped. The scenario
// must be valid.
func (s *Scenario) PumpingOrder() []PlannedStage {
	var order [][2]int
	switch s.Schedule.Order {
	case "sequential":
		for w, well := range s.Wells {
			for st := range well.Stages {
				order = append(order, [2]int{w, st})
			}
		}
	case "zipper":
		for st := 0; ; st++ {
			any := false
			for w, well := range s.Wells {
				if st < len(well.Stages) {
					order = append(order, [2]int{w, st})
					any = true
				}
			}
			if !any {
				break
			}
		}
	case "list":
		for _, name := range s.Schedule.Sequence {
			w, st, _ := s.findStage(name)
			order = append(order, [2]int{w, st})
		}
	}
	out := make([]PlannedStage, len(order))
	for i, ws := range order {
		out[i] = s.plan(ws[0], ws[1])
	}
	return out
}

func (s *Scenario) plan(w, st int) PlannedStage {
	sc, stage := s.Schedule, s.Wells[w].Stages[st]
	p := PlannedStage{
		Well: w, Stage: st, Name: StageName(s.Wells[w].Name, stage.Name),
		Fluid: sc.Fluid, Rate: sc.Rate, Volume: sc.Volume, Duration: sc.Duration,
		PressureCap: sc.PressureCap, ShutIn: sc.ShutIn,
		Perforations: sc.Perforations, PerforationDiameter: sc.PerforationDiameter, DischargeCoefficient: sc.DischargeCoefficient,
	}
	if stage.Perforations != nil {
		p.Perforations = *stage.Perforations
	}
	if stage.PerforationDiameter != nil {
		p.PerforationDiameter = *stage.PerforationDiameter
	}
	if stage.DischargeCoefficient != nil {
		p.DischargeCoefficient = *stage.DischargeCoefficient
	}
	if stage.Fluid != nil {
		p.Fluid = *stage.Fluid
	}
	if stage.Rate != nil {
		p.Rate = *stage.Rate
	}
	if stage.Volume != nil {
		p.Volume = *stage.Volume
	}
	if stage.Duration != nil {
		p.Duration = *stage.Duration
	}
	if stage.PressureCap != nil {
		p.PressureCap = *stage.PressureCap
	}
	return p
}

// findStage resolves "WELL:STAGE".
func (s *Scenario) findStage(name string) (well, stage int, err error) {
	wn, sn, ok := strings.Cut(name, ":")
	if !ok {
		return 0, 0, fmt.Errorf("want WELL:STAGE, e.g. %q", s.exampleStageName())
	}
	for w, well := range s.Wells {
		if well.Name != wn {
			continue
		}
		for st, stage := range well.Stages {
			if stage.Name == sn {
				return w, st, nil
			}
		}
		return 0, 0, fmt.Errorf("well %q has no stage %q", wn, sn)
	}
	return 0, 0, fmt.Errorf("no well %q", wn)
}

func (s *Scenario) exampleStageName() string {
	for _, w := range s.Wells {
		for _, st := range w.Stages {
			return StageName(w.Name, st.Name)
		}
	}
	return "A:1"
}

// InitialPorePressure is the pore pressure at the layer's mid-plane before
// pumping, Pa: pore_pressure_gradient × layer.depth.
func (s *Scenario) InitialPorePressure() float64 {
	return s.Stress.PorePressureGradient * s.Layer.Depth
}
