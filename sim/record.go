package sim

import (
	"fmt"
	"io"
	"strconv"

	"slipfront/internal/version"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// Recorder writes the frames of a run to a snapshot file. Use its Begin
// and Frame methods as Options.Begin and Options.Frame, and Close it after
// the run (also after a failed one: the frames written so far stay).
type Recorder struct {
	w           io.Writer
	s           *scenarios.Scenario
	realization int
	sw          *snapshot.Writer
	frame       snapshot.Frame
}

// NewRecorder returns a recorder writing to w.
func NewRecorder(w io.Writer, s *scenarios.Scenario, realization int) *Recorder {
	return &Recorder{w: w, s: s, realization: realization}
}

// Metadata keys of the snapshot header written by Recorder.
const (
	MetaProgram        = "program"
	MetaScenario       = "scenario"
	MetaStart          = "schedule_start_utc"
	MetaStimulatedSlip = "stimulated_slip_m"
	MetaCellSize       = "cell_size_m"
)

// Begin writes the header with the element geometry.
func (r *Recorder) Begin(elements []Element) error {
	s := r.s
	h := snapshot.Header{
		Digest: s.Digest, Seed: s.Seed, Realization: r.realization, CRS: s.Domain.CRS,
		OriginEasting: s.Domain.OriginEasting, OriginNorthing: s.Domain.OriginNorthing, LayerDepth: s.Layer.Depth,
		Metadata: map[string]string{
			MetaProgram: "slipfront " + version.Version, MetaScenario: s.Name, MetaStart: s.Schedule.Start,
			MetaStimulatedSlip: strconv.FormatFloat(s.Numerics.StimulatedSlip, 'g', -1, 64),
			MetaCellSize:       strconv.FormatFloat(s.Numerics.CellSize, 'g', -1, 64),
		},
		Fields: []snapshot.Field{{Name: snapshot.FieldPressure, Unit: "Pa"}, {Name: snapshot.FieldAperture, Unit: "m"}, {Name: snapshot.FieldSlip, Unit: "m"}},
	}
	sets := snapshot.StaticField{Field: snapshot.Field{Name: "set", Unit: "index"}, Values: make([]int32, len(elements))}
	for i, el := range elements {
		h.Elements = append(h.Elements, snapshot.Element{Fracture: int32(el.Fracture),
			X0: el.P0.X, Y0: el.P0.Y, X1: el.P1.X, Y1: el.P1.Y, Height: el.Height, Length: el.Length})
		sets.Values[i] = int32(el.Set)
	}
	h.Static = []snapshot.StaticField{sets}
	sw, err := snapshot.NewWriter(r.w, h)
	if err != nil {
		return err
	}
	r.sw = sw
	n := len(elements)
	r.frame.Fields = [][]float32{make([]float32, n), make([]float32, n), make([]float32, n)}
	return nil
}

// Frame writes one frame (the arrays as float32).
func (r *Recorder) Frame(f *Frame) error {
	if r.sw == nil {
		return fmt.Errorf("sim: Recorder.Frame before Begin")
	}
	for k, src := range [][]float64{f.Pressure, f.Aperture, f.Slip} {
		dst := r.frame.Fields[k]
		for i, v := range src {
			dst[i] = float32(v)
		}
	}
	r.frame.Time, r.frame.Stage, r.frame.Flags = f.Time, int32(f.Stage), f.Flags
	return r.sw.WriteFrame(r.frame)
}

// Close writes the frame index; without it the file still reads, by
// recovery.
func (r *Recorder) Close() error {
	if r.sw == nil {
		return nil
	}
	return r.sw.Close()
}
