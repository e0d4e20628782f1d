package sim

import (
	"encoding/csv"
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
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = len(strings.Split(EventsHeader, ","))
	header, err := cr.Read()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, noEOF(err))
	}
	if strings.Join(header, ",") != EventsHeader {
		return nil, fmt.Errorf("%s:1: header %q, want %q", name, strings.Join(header, ","), EventsHeader)
	}
	stages := map[string]int{}
	for k, p := range s.PumpingOrder() {
		stages[p.Name] = k
	}
	var out []Event
	for line := 2; ; line++ {
		rec, err := cr.Read()
		if err == io.EOF {
			return out, nil
		}
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		e, err := parseEvent(rec, stages)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %w", name, line, err)
		}
		out = append(out, e)
	}
}

func noEOF(err error) error {
	if errors.Is(err, io.EOF) {
		return errors.New("empty file")
	}
	return err
}

// parseEvent converts one record; every number must be finite.
func parseEvent(rec []string, stages map[string]int) (Event, error) {
	var v [9]float64
	cols := []int{0, 1, 2, 3, 4, 6, 7, 8, 9}
	for k, c := range cols {
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
	if v[4] != math.Trunc(v[4]) || v[4] < 0 {
		return Event{}, fmt.Errorf("fracture_id %q: want a whole number ≥ 0", rec[4])
	}
	return Event{Time: v[0], X: v[1], Y: v[2], Depth: v[3], Fracture: int(v[4]), Trace: -1, Stage: stage,
		Slip: v[5], Area: v[6], Moment: v[7], Magnitude: v[8]}, nil
}
