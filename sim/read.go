package sim

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"slipfront/scenarios"
)

// ReadEvents reads an events.csv written by WriteEvents for scenario s
// (whose pumping order names the stages). name is used in messages.
func ReadEvents(r io.Reader, name string, s *scenarios.Scenario) ([]Event, error) {
	return readCatalogue(r, name, s, EventsHeader, false)
}

// ReadRateEvents reads a rate_events.csv written by WriteRateEvents for
// scenario s: the columns of events.csv with slip and rupture area empty
// (read as NaN). name is used in messages.
func ReadRateEvents(r io.Reader, name string, s *scenarios.Scenario) ([]Event, error) {
	return readCatalogue(r, name, s, RateEventsHeader, true)
}

// readCatalogue reads a catalogue with the given header; sub marks
// sub-resolution events (see parseEvent).
func readCatalogue(r io.Reader, name string, s *scenarios.Scenario, header string, sub bool) ([]Event, error) {
	stages := stageIndex(s)
	var out []Event
	err := readRecords(r, name, header, func(rec []string) error {
		e, err := parseEvent(rec, stages, sub)
		if err == nil {
			out = append(out, e)
		}
		return err
	})
	return out, err
}

// stageIndex maps stage names to their index in the pumping order ("" to
// −1, before the first stage).
func stageIndex(s *scenarios.Scenario) map[string]int {
	stages := map[string]int{"": -1}
	for k, p := range s.PumpingOrder() {
		stages[p.Name] = k
	}
	return stages
}

// readRecords reads a CSV file that starts with the given header and
// passes every record to parse; errors name the file and line.
func readRecords(r io.Reader, name, header string, parse func(rec []string) error) error {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = len(strings.Split(header, ","))
	head, err := cr.Read()
	if err != nil {
		return fmt.Errorf("%s: %w", name, noEOF(err))
	}
	if strings.Join(head, ",") != header {
		return fmt.Errorf("%s:1: header %q, want %q", name, strings.Join(head, ","), header)
	}
	for line := 2; ; line++ {
		rec, err := cr.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
		if err := parse(rec); err != nil {
			return fmt.Errorf("%s:%d: %w", name, line, err)
		}
	}
}

func noEOF(err error) error {
	if errors.Is(err, io.EOF) {
		return errors.New("empty file")
	}
	return err
}

// parseEvent converts one record; every number must be finite, except
// that a sub-resolution event (sub) has no slip or rupture area: those
// fields must be empty and read as NaN.
func parseEvent(rec []string, stages map[string]int, sub bool) (Event, error) {
	var v [9]float64
	cols := []int{0, 1, 2, 3, 4, 6, 7, 8, 9}
	for k, c := range cols {
		if sub && (c == 6 || c == 7) {
			if rec[c] != "" {
				return Event{}, fmt.Errorf("column %d = %q: a sub-resolution event has no slip or rupture area (want empty)", c+1, rec[c])
			}
			v[k] = math.NaN()
			continue
		}
		x, err := strconv.ParseFloat(rec[c], 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return Event{}, fmt.Errorf("column %d = %q: not a finite number", c+1, rec[c])
		}
		v[k] = x
	}
	stage, ok := stages[rec[5]]
	if !ok {
		return Event{}, fmt.Errorf("stage %q is not in the scenario's schedule", rec[5])
	}
	if v[4] != math.Trunc(v[4]) || v[4] < -1 || v[4] > maxCount {
		return Event{}, fmt.Errorf("fracture_id %q: want a whole number in [0, %g], or −1 for a primary conduit", rec[4], float64(maxCount))
	}
	return Event{Time: v[0], X: v[1], Y: v[2], Depth: v[3], Fracture: int(v[4]), Trace: -1, Stage: stage,
		Slip: v[5] * 1e-3, Area: v[6], Moment: v[7], Magnitude: v[8]}, nil
}

// ReadTimeline reads a timeline.csv written by WriteTimeline for scenario
// s. name is used in messages.
func ReadTimeline(r io.Reader, name string, s *scenarios.Scenario) ([]Sample, error) {
	stages := stageIndex(s)
	var out []Sample
	err := readRecords(r, name, TimelineHeader, func(rec []string) error {
		x, err := parseSample(rec, stages)
		if err != nil {
			return err
		}
		if len(out) > 0 && x.Time < out[len(out)-1].Time {
			return fmt.Errorf("time %g s goes back", x.Time)
		}
		out = append(out, x)
		return nil
	})
	return out, err
}

// parseSample converts one timeline record; empty rate and pressure
// fields (no well yet) read as NaN.
// maxMPa bounds the pressures read back, MPa, so that they stay finite in
// Pa (the scenario's pressure caps are at most 1000 MPa).
const maxMPa = 1e6

// maxCount is the largest element or event count, or fracture number, a
// table may hold: 2⁵³, beyond which a float64 no longer holds every whole
// number (and an int conversion could overflow). FuzzReadTimeline found an event count of
// 5e106, which read as a whole number but did not write back as one.
const maxCount = 1 << 53

func parseSample(rec []string, stages map[string]int) (Sample, error) {
	stage, ok := stages[rec[1]]
	if !ok {
		return Sample{}, fmt.Errorf("stage %q is not in the scenario's schedule", rec[1])
	}
	var v [11]float64
	for k, c := range []int{0, 2, 3, 4, 5, 6, 8, 9, 10, 11, 12} {
		if rec[c] == "" && (c == 2 || c == 4) {
			v[k] = math.NaN()
			continue
		}
		x, err := strconv.ParseFloat(rec[c], 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return Sample{}, fmt.Errorf("column %d = %q: not a finite number", c+1, rec[c])
		}
		v[k] = x
	}
	for _, n := range []float64{v[6], v[7]} {
		if n != math.Trunc(n) || n < 0 || n > maxCount {
			return Sample{}, fmt.Errorf("element and event counts must be whole numbers in [0, %g]", float64(maxCount))
		}
	}
	if v[9] < 0 || v[10] < 0 {
		return Sample{}, fmt.Errorf("moments %g and %g N·m: must be ≥ 0", v[9], v[10])
	}
	if math.Abs(v[3]) > maxMPa || math.Abs(v[8]) > maxMPa {
		return Sample{}, fmt.Errorf("pressures of %g and %g MPa: at most %g MPa", v[3], v[8], maxMPa)
	}
	return Sample{Time: v[0], Stage: stage, Rate: v[1], Injected: v[2], BHP: v[3] * 1e6,
		StimulatedArea: v[4], FractureArea: v[5], SlippedElements: int(v[6]), Events: int(v[7]), MaxPressure: v[8] * 1e6,
		SeismicMoment: v[9], AseismicMoment: v[10]}, nil
}

// Summary is what ReadSummary reads back from a summary.json.
type Summary struct {
	Stages   []StageSummary
	Warnings []Warning
	// Growth is nil unless the run's fractures grew.
	Growth *GrowthSummary
}

// ReadSummary reads the per-stage summaries, the warnings and the growth
// from a summary.json written by WriteSummary.
func ReadSummary(r io.Reader, name string) (Summary, error) {
	var sj summaryJSON
	if err := json.NewDecoder(r).Decode(&sj); err != nil {
		return Summary{}, fmt.Errorf("%s: %w", name, err)
	}
	out := Summary{Stages: make([]StageSummary, len(sj.Stages)), Growth: sj.Growth}
	for i, st := range sj.Stages {
		mw := math.NaN()
		if st.MaxMagnitude != nil {
			mw = *st.MaxMagnitude
		}
		out.Stages[i] = StageSummary{Name: st.Name, Start: st.StartS, PumpEnd: st.PumpEndS, End: st.EndS,
			Injected: st.InjectedM3, PeakBHP: st.PeakBHPMPa * 1e6, NewArea: st.NewAreaM2, Events: st.Events,
			MaxMagnitude: mw, Capped: st.Capped, Steps: st.Steps, ClusterVolumes: st.ClusterVolumes,
			HeldNatural: st.HeldNaturalM3, HeldConduits: st.HeldConduitsM3}
		if r := st.SeismicityRate; r != nil {
			out.Stages[i].RateEvents, out.Stages[i].RateExpected = r.Events, r.Expected
		}
	}
	for _, w := range sj.Warnings {
		out.Warnings = append(out.Warnings, Warning{Kind: w.Kind, Stage: w.Stage, Message: w.Message})
	}
	return out, nil
}
