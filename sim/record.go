package sim

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/internal/version"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// Recorder writes the frames of a run to a snapshot file. Use its Begin
// and Frame methods as Options.Begin and Options.Frame, and Close it after
// the run (also after a failed one: the frames written so far stay). A
// second Begin (the next path pass) starts the file over, which needs a
// writer that can be truncated (an *os.File).
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

// recordedFields are the per-element fields of every frame, in the order
// Frame.recorded lists them; Replay reads them back by name.
var recordedFields = [...]snapshot.Field{
	{Name: snapshot.FieldPressure, Unit: "Pa"},
	{Name: snapshot.FieldAperture, Unit: "m"},
	{Name: snapshot.FieldSlip, Unit: "m"},
	{Name: snapshot.FieldCoulombChange, Unit: "Pa"},
}

// optionalField is the recorded field that snapshots written before it
// was recorded lack; Replay leaves it nil there.
const optionalField = snapshot.FieldCoulombChange

// recorded returns the frame's arrays in the order of recordedFields.
func (f *Frame) recorded() [len(recordedFields)][]float64 {
	return [...][]float64{f.Pressure, f.Aperture, f.Slip, f.CoulombChange}
}

// setRecorded sets the frame's arrays from fields in the order of
// recordedFields.
func (f *Frame) setRecorded(fields [len(recordedFields)][]float64) {
	f.Pressure, f.Aperture, f.Slip, f.CoulombChange = fields[0], fields[1], fields[2], fields[3]
}

// Metadata keys of the snapshot header written by Recorder.
const (
	MetaProgram        = "program"
	MetaScenario       = "scenario"
	MetaStart          = "schedule_start_utc"
	MetaStimulatedSlip = "stimulated_slip_m"
	MetaCellSize       = "cell_size_m"
	MetaReach          = "stimulated_reach_m"
)

// truncater is a file that can be emptied and written again from its
// start.
type truncater interface {
	Truncate(size int64) error
	Seek(offset int64, whence int) (int64, error)
}

// Begin writes the header with the element geometry; called again, it
// first empties the file.
func (r *Recorder) Begin(elements []Element) error {
	if r.sw != nil {
		t, ok := r.w.(truncater)
		if !ok {
			return fmt.Errorf("sim: Recorder.Begin again needs a file to start over, not a %T", r.w)
		}
		if err := t.Truncate(0); err != nil {
			return fmt.Errorf("sim: starting the snapshot over for the next path pass: %w", err)
		}
		if _, err := t.Seek(0, io.SeekStart); err != nil {
			return fmt.Errorf("sim: starting the snapshot over for the next path pass: %w", err)
		}
		r.sw = nil
	}
	s := r.s
	h := snapshot.Header{
		Digest: s.Digest, Seed: s.Seed, Realization: r.realization, CRS: s.Domain.CRSSpec(),
		OriginEasting: s.Domain.OriginEasting, OriginNorthing: s.Domain.OriginNorthing, LayerDepth: s.Layer.Depth,
		Metadata: map[string]string{
			MetaProgram: "slipfront " + version.Version, MetaScenario: s.Name, MetaStart: s.Schedule.Start,
			MetaStimulatedSlip: strconv.FormatFloat(s.Numerics.StimulatedSlip, 'g', -1, 64),
			MetaCellSize:       strconv.FormatFloat(s.Numerics.CellSize, 'g', -1, 64),
			MetaReach:          strconv.FormatFloat(s.Numerics.StimulatedReach, 'g', -1, 64),
		},
		Fields: slices.Clone(recordedFields[:]),
	}
	sets := snapshot.StaticField{Field: snapshot.Field{Name: "set", Unit: "index"}, Values: make([]int32, len(elements))}
	for i, el := range elements {
		h.Elements = append(h.Elements, snapshot.Element{Fracture: int32(el.Fracture),
			X0: el.P0.X, Y0: el.P0.Y, X1: el.P1.X, Y1: el.P1.Y, Height: el.Height, Length: el.Length})
		sets.Values[i] = int32(el.Set)
	}
	h.Static = []snapshot.StaticField{sets}
	var names []string
	for _, ps := range s.PumpingOrder() {
		names = append(names, ps.Name)
	}
	stages, err := json.Marshal(names)
	if err != nil {
		return err
	}
	h.Metadata[snapshot.MetaStageNames] = string(stages)
	sw, err := snapshot.NewWriter(r.w, h)
	if err != nil {
		return err
	}
	r.sw = sw
	n := len(elements)
	r.frame.Fields = make([][]float32, len(recordedFields))
	for k := range r.frame.Fields {
		r.frame.Fields[k] = make([]float32, n)
	}
	return nil
}

// Frame writes one frame (the arrays as float32).
func (r *Recorder) Frame(f *Frame) error {
	if r.sw == nil {
		return fmt.Errorf("sim: Recorder.Frame before Begin")
	}
	for k, src := range f.recorded() {
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

// Replayed tells which frames Replay used.
type Replayed struct {
	// Times of the frames read, s.
	Times []float64
	// Damaged are the times of frames up to t that failed their checksum
	// and were skipped, s.
	Damaged []float64
}

// Replay reads the frames of a snapshot written by a Recorder up to time t,
// s, into a result: the elements, the state of the last intact one of
// those frames, and the first frame at which each element had slipped and
// was stimulated (so those times are known to the output interval).
// Damaged frames are skipped and listed; it fails only when no frame up to
// t is intact.
func Replay(rd *snapshot.Reader, t float64) (*Result, Replayed, error) {
	h := rd.Header()
	n := len(h.Elements)
	res := &Result{
		Elements: make([]Element, n), FirstSlip: nanSlice(n), FirstSlipStage: make([]int, n),
		StimulatedAt: nanSlice(n), Stimulated: make([]bool, n),
	}
	var sets []int32
	for _, st := range h.Static {
		if st.Name == "set" {
			sets = st.Values
		}
	}
	for i, e := range h.Elements {
		el := Element{Trace: -1, Fracture: int(e.Fracture), Set: ConduitSet,
			P0: r2.Vec{X: e.X0, Y: e.Y0}, P1: r2.Vec{X: e.X1, Y: e.Y1}, Length: e.Length, Height: e.Height}
		if sets != nil {
			el.Set = int(sets[i])
		}
		res.Elements[i] = el
		res.FirstSlipStage[i] = -1
	}
	var index [len(recordedFields)]int
	for k, f := range recordedFields {
		if index[k] = h.FieldIndex(f.Name); index[k] < 0 && f.Name != optionalField {
			return nil, Replayed{}, fmt.Errorf("sim: the snapshot lacks the %s field", f.Name)
		}
	}
	var rp Replayed
	var fr snapshot.Frame
	var state Frame
	for i, info := range rd.Frames() {
		if info.Time > t {
			break
		}
		if err := rd.ReadFrameInto(&fr, i); errors.Is(err, snapshot.ErrFormat) {
			rp.Damaged = append(rp.Damaged, info.Time)
			continue
		} else if err != nil {
			return nil, rp, err
		}
		rp.Times = append(rp.Times, info.Time)
		if res.Opened == nil {
			res.Opened = make([]bool, n)
		}
		for j, flag := range fr.Flags {
			res.Opened[j] = flag&snapshot.FlagIntact == 0
			if flag&snapshot.FlagSlipped != 0 && math.IsNaN(res.FirstSlip[j]) {
				res.FirstSlip[j], res.FirstSlipStage[j] = info.Time, int(info.Stage)
			}
			if flag&snapshot.FlagStimulated != 0 && math.IsNaN(res.StimulatedAt[j]) {
				res.StimulatedAt[j], res.Stimulated[j] = info.Time, true
			}
		}
		var fields [len(recordedFields)][]float64
		for k, at := range index {
			if at >= 0 {
				fields[k] = float64s(fr.Fields[at])
			}
		}
		state.setRecorded(fields)
		if res.InitialAperture == nil {
			res.InitialAperture = state.Aperture
		}
	}
	if len(rp.Times) == 0 {
		return nil, rp, fmt.Errorf("sim: no intact frame at or before %g s (%d damaged): %w", t, len(rp.Damaged), snapshot.ErrFormat)
	}
	res.Pressure, res.Aperture, res.Slip, res.CoulombChange = state.Pressure, state.Aperture, state.Slip, state.CoulombChange
	return res, rp, nil
}

func nanSlice(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.NaN()
	}
	return v
}

func float64s(v []float32) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}
