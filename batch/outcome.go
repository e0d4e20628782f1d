package batch

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"slipfront/scenarios"
)

// RunFunc computes one realization of one case: the coupled simulation of
// scenario s on network realization number realization (≥ 0). It must
// derive every random draw from (s.Seed, realization, purpose) alone, so
// that the result does not depend on which worker or shard runs it, and
// the same realization index sees the same fractures in every case
// (common random numbers). It is called concurrently from several
// goroutines, each call with its own freshly loaded s. It should return
// promptly with ctx.Err() when ctx is cancelled; a result returned after
// cancellation is still kept.
type RunFunc func(ctx context.Context, s *scenarios.Scenario, realization int) (*Outcome, error)

// Outcome is what one realization of one case produced, as the simulator
// reports it. Units are SI.
type Outcome struct {
	// NetworkDigest identifies the fracture network (dfn's
	// Network.Digest()); equal digests across cases show common random
	// numbers at work.
	NetworkDigest string
	// FinalArea is the stimulated area at the end of the run, m².
	FinalArea float64
	// FractureArea is the stimulated fracture surface area, m².
	FractureArea float64
	// Events is the number of synthetic microseismic events.
	Events int
	// MaxMagnitude is the largest moment magnitude Mw; NaN when Events is
	// 0 (and only then).
	MaxMagnitude float64
	// PeakPressure is the highest bottom-hole pressure of the run, Pa.
	PeakPressure float64
	// InjectedVolume is the total volume injected, m³.
	InjectedVolume float64
	// SeismicMoment (the events) and AseismicMoment (stable slip), N·m.
	SeismicMoment, AseismicMoment float64
	// RetainedGain is the permeability gain of the stimulated elements
	// that stays at the initial pore pressure; NaN when none was
	// stimulated.
	RetainedGain float64
	// Times (s from the start of pumping, non-decreasing) and Areas
	// (stimulated area at those times, m²) are the growth curve; at
	// least one point. The batch resamples it on the case's TimeGrid.
	Times, Areas []float64
	// Cells are the stimulated cells at the end of the run, as indices into
	// the scenario's Grid (GridFor): index = row·Cols + col, row 0 south.
	// Order and repeats do not matter; they are sorted and made unique.
	Cells []int
	// Warnings are the conditions the run's result should be read with,
	// in the order they arose.
	Warnings []Warning
}

// Warning is one condition a realization's result should be read with.
type Warning struct {
	// Kind names the condition: lower-case letters, digits and "_", e.g.
	// "bhp_above_shmin"; the batch counts warnings by kind.
	Kind string
	// Message says what happened, for people (one line).
	Message string
}

// maxWarnings caps the warnings of one realization.
const maxWarnings = 10000

// check reports the first problem of a warning.
func (w Warning) check() error {
	if w.Kind == "" || len(w.Kind) > 64 || strings.TrimFunc(w.Kind, func(r rune) bool {
		return r == '_' || 'a' <= r && r <= 'z' || '0' <= r && r <= '9'
	}) != "" {
		return fmt.Errorf("warning kind %.70q: want 1 to 64 lower-case letters, digits or _", w.Kind)
	}
	if strings.ContainsAny(w.Message, "\r\n") {
		return fmt.Errorf("warning %s: the message holds a line break", w.Kind)
	}
	return nil
}

// check reports the first inconsistency of an outcome for a grid with
// nCells cells.
func (o *Outcome) check(nCells int) error {
	nonNeg := func(name string, v float64) error {
		if !finite(v) || v < 0 {
			return fmt.Errorf("%s = %g: must be finite and ≥ 0", name, v)
		}
		return nil
	}
	for _, q := range []struct {
		name string
		v    float64
	}{{"FinalArea", o.FinalArea}, {"FractureArea", o.FractureArea}, {"PeakPressure", o.PeakPressure}, {"InjectedVolume", o.InjectedVolume},
		{"SeismicMoment", o.SeismicMoment}, {"AseismicMoment", o.AseismicMoment}} {
		if err := nonNeg(q.name, q.v); err != nil {
			return err
		}
	}
	switch {
	case o.Events < 0:
		return fmt.Errorf("Events = %d: must be ≥ 0", o.Events)
	case o.Events == 0 && !math.IsNaN(o.MaxMagnitude):
		return fmt.Errorf("MaxMagnitude = %g with no events: must be NaN", o.MaxMagnitude)
	case o.Events > 0 && !finite(o.MaxMagnitude):
		return fmt.Errorf("MaxMagnitude = %g with %d events: must be finite", o.MaxMagnitude, o.Events)
	case !math.IsNaN(o.RetainedGain) && !(o.RetainedGain > 0 && finite(o.RetainedGain)):
		return fmt.Errorf("RetainedGain = %g: must be finite and > 0, or NaN when nothing was stimulated", o.RetainedGain)
	case len(o.Times) == 0 || len(o.Times) != len(o.Areas):
		return fmt.Errorf("growth curve has %d times and %d areas: want the same number, at least 1", len(o.Times), len(o.Areas))
	}
	for i, t := range o.Times {
		if !finite(t) || i > 0 && t < o.Times[i-1] {
			return fmt.Errorf("Times[%d] = %g: times must be finite and non-decreasing", i, t)
		}
		if err := nonNeg(fmt.Sprintf("Areas[%d]", i), o.Areas[i]); err != nil {
			return err
		}
	}
	for i, c := range o.Cells {
		if c < 0 || c >= nCells {
			return fmt.Errorf("Cells[%d] = %d: outside the map grid of %d cells", i, c, nCells)
		}
	}
	if len(o.Warnings) > maxWarnings {
		return fmt.Errorf("%d warnings: at most %d", len(o.Warnings), maxWarnings)
	}
	for _, w := range o.Warnings {
		if err := w.check(); err != nil {
			return err
		}
	}
	return nil
}

// newResult checks an outcome and turns it into the stored result of case
// c, realization r.
func newResult(c, r int, caseDigest string, g Grid, tg TimeGrid, o *Outcome) (*Result, error) {
	if o == nil {
		return nil, fmt.Errorf("runner returned no outcome and no error")
	}
	if err := o.check(g.Cells()); err != nil {
		return nil, fmt.Errorf("runner returned an invalid outcome: %w", err)
	}
	cells := slices.Clone(o.Cells)
	slices.Sort(cells)
	cells = slices.Compact(cells)
	return &Result{
		Case: c, Realization: r, CaseDigest: caseDigest,
		NetworkDigest: o.NetworkDigest,
		FinalArea:     o.FinalArea, FractureArea: o.FractureArea,
		Events: o.Events, MaxMagnitude: o.MaxMagnitude,
		PeakPressure: o.PeakPressure, InjectedVolume: o.InjectedVolume,
		SeismicMoment: o.SeismicMoment, AseismicMoment: o.AseismicMoment, RetainedGain: o.RetainedGain,
		Interval: tg.Interval,
		Area:     tg.Resample(nil, o.Times, o.Areas),
		Cells:    cells,
		Warnings: slices.Clone(o.Warnings),
	}, nil
}
