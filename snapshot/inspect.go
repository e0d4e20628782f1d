package snapshot

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"
	"unicode/utf8"

	"slipfront/internal/plural"
)

// Describe writes a human-readable account of the snapshot: the header,
// the recovery note if any, a table of frames (index, time, stage, stored
// size) and the overall compression ratio of the frames.
func Describe(w io.Writer, r *Reader) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	h := r.Header()
	line := func(key, format string, args ...any) {
		fmt.Fprintf(tw, "%s\t%s\n", key, fmt.Sprintf(format, args...))
	}
	line("format version", "%d", r.Version())
	line("scenario digest", "%s", orNone(h.Digest))
	line("seed", "%d", h.Seed)
	line("realization", "%d", h.Realization)
	line("CRS", "%s", orNone(h.CRS))
	line("origin", "easting %s m, northing %s m", fmtFloat(h.OriginEasting), fmtFloat(h.OriginNorthing))
	line("layer depth", "%s m", fmtFloat(h.LayerDepth))
	line("elements", "%d on %s", len(h.Elements), plural.S(countFractures(h.Elements), "fracture"))
	line("frame fields", "%s (as recorded; frame listings and CSV show MPa and mm)", describeFields(h.Fields))
	static := make([]Field, len(h.Static))
	for i, s := range h.Static {
		static[i] = s.Field
	}
	line("static fields", "%s", describeFields(static))
	keys := make([]string, 0, len(h.Metadata))
	for k := range h.Metadata {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		line("metadata "+k, "%s", shorten(h.Metadata[k]))
	}
	if r.Recovered() {
		line("recovered", "yes: %s", r.Note())
	}
	frames := r.Frames()
	line("frames", "%d%s", len(frames), timeRange(frames))
	if err := tw.Flush(); err != nil {
		return err
	}
	if err := describeFrames(w, r, frames, stageNames(&h)); err != nil {
		return err
	}
	stored, raw := int64(0), int64(0)
	perFrame := int64(len(h.Elements)) * int64(4*len(h.Fields)+1)
	for _, f := range frames {
		stored += f.Size
		raw += perFrame
	}
	if stored > 0 {
		_, err := fmt.Fprintf(w, "compression: %d bytes of frame arrays stored in %d bytes (ratio %.2f)\n",
			raw, stored, float64(raw)/float64(stored))
		return err
	}
	return nil
}

// describeFrames lists the frames, each checked against its checksum,
// with their stages by name when names has them.
func describeFrames(w io.Writer, r *Reader, frames []FrameInfo, names []string) error {
	if len(frames) == 0 {
		return nil
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "frame\ttime_s\tstage\tstored_bytes\tcheck\t")
	for i, f := range frames {
		check := "ok"
		if err := r.CheckFrame(i); err != nil {
			check = "DAMAGED"
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%d\t%s\t\n", i, fmtFloat(f.Time), stageLabel(int(f.Stage), names), f.Size, check)
	}
	return tw.Flush()
}

// stageNames returns the stage names of the header's MetaStageNames
// metadata, or nil when it is absent or not a JSON array of strings.
func stageNames(h *Header) []string {
	var names []string
	if v, ok := h.Metadata[MetaStageNames]; !ok || json.Unmarshal([]byte(v), &names) != nil {
		return nil
	}
	return names
}

// stageLabel is stage k's name when names has it, "-" for no stage (k <
// 0), and the index otherwise.
func stageLabel(k int, names []string) string {
	switch {
	case k < 0:
		return "-"
	case k < len(names):
		return names[k]
	}
	return strconv.Itoa(k)
}

// shorten quotes a metadata value, cut after maxShown bytes.
func shorten(v string) string {
	const maxShown = 200
	if len(v) <= maxShown {
		return strconv.Quote(v)
	}
	cut := maxShown
	for cut > 0 && !utf8.RuneStart(v[cut]) {
		cut--
	}
	return fmt.Sprintf("%s… (%d bytes)", strconv.Quote(v[:cut]), len(v))
}

func orNone(s string) string {
	if s == "" {
		return "(none)"
	}
	return s
}

func fmtFloat(x float64) string { return string(appendFloat64(nil, x)) }

func timeRange(frames []FrameInfo) string {
	if len(frames) == 0 {
		return ""
	}
	return fmt.Sprintf(", time %s s to %s s", fmtFloat(frames[0].Time), fmtFloat(frames[len(frames)-1].Time))
}

func describeFields(fields []Field) string {
	if len(fields) == 0 {
		return "(none)"
	}
	parts := make([]string, len(fields))
	for i, f := range fields {
		parts[i] = fmt.Sprintf("%s [%s]", f.Name, f.Unit)
	}
	return strings.Join(parts, ", ")
}

func countFractures(elements []Element) int {
	seen := make(map[int32]struct{})
	for _, e := range elements {
		seen[e.Fracture] = struct{}{}
	}
	return len(seen)
}

// MetaStageNames is the metadata key under which a writer may record the
// stage names, in stage-index order, as a JSON array of strings; the
// inspection then shows stages by name.
const MetaStageNames = "stage_names"

// CSVHeader is the first line written by WriteFrameCSV.
const CSVHeader = "element_id,fracture_id,x0_m,y0_m,x1_m,y1_m,pressure_MPa,aperture_mm,slip_mm,coulomb_change_MPa,state"

// csvColumn is a frame field converted to a CSV unit.
type csvColumn struct {
	field int     // index in Header.Fields
	scale float64 // factor from the recorded unit to the CSV unit
}

// Scale factors to the CSV units, powers of ten (SI prefixes).
var (
	toMPa = map[string]float64{"Pa": 1e-6, "kPa": 1e-3, "MPa": 1}
	toMM  = map[string]float64{"m": 1e3, "mm": 1}
)

// WriteFrameCSV writes, one line per element, the last frame at or before
// time t (s), under CSVHeader. Pressure is converted to MPa, aperture and
// slip to mm, the Coulomb stress change to MPa (empty when the snapshot
// does not record FieldCoulombChange); state is the flags byte as an
// integer. The snapshot must record the fields FieldPressure,
// FieldAperture and FieldSlip in a pressure unit (Pa, kPa, MPa) and a
// length unit (m, mm).
func WriteFrameCSV(w io.Writer, r *Reader, t float64) error {
	h := r.Header()
	coulomb := csvColumn{field: -1}
	if h.FieldIndex(FieldCoulombChange) >= 0 {
		c, err := csvColumnFor(&h, FieldCoulombChange, toMPa)
		if err != nil {
			return err
		}
		coulomb = c
	}
	var cols [3]csvColumn
	for k, want := range []struct {
		name  string
		units map[string]float64
	}{{FieldPressure, toMPa}, {FieldAperture, toMM}, {FieldSlip, toMM}} {
		c, err := csvColumnFor(&h, want.name, want.units)
		if err != nil {
			return err
		}
		cols[k] = c
	}
	f, err := r.FrameAt(t)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	bw.WriteString(CSVHeader + "\n")
	var line []byte
	for i, e := range h.Elements {
		line = strconv.AppendInt(line[:0], int64(i), 10)
		line = append(line, ',')
		line = strconv.AppendInt(line, int64(e.Fracture), 10)
		for _, x := range [...]float64{e.X0, e.Y0, e.X1, e.Y1} {
			line = appendFloat64(append(line, ','), x)
		}
		for _, c := range cols {
			line = appendFloat32Scaled(append(line, ','), f.Fields[c.field][i], c.scale)
		}
		line = append(line, ',')
		if coulomb.field >= 0 {
			line = appendFloat32Scaled(line, f.Fields[coulomb.field][i], coulomb.scale)
		}
		line = append(line, ',')
		line = strconv.AppendUint(line, uint64(f.Flags[i]), 10)
		line = append(line, '\n')
		if _, err := bw.Write(line); err != nil {
			return err
		}
	}
	return bw.Flush()
}

func csvColumnFor(h *Header, name string, units map[string]float64) (csvColumn, error) {
	k := h.FieldIndex(name)
	if k < 0 {
		names := make([]string, len(h.Fields))
		for i, f := range h.Fields {
			names[i] = f.Name
		}
		return csvColumn{}, fmt.Errorf("snapshot: no %q field for the CSV (the snapshot records: %s)", name, orNone(strings.Join(names, ", ")))
	}
	unit := h.Fields[k].Unit
	scale, ok := units[unit]
	if !ok {
		allowed := make([]string, 0, len(units))
		for u := range units {
			allowed = append(allowed, u)
		}
		slices.Sort(allowed)
		return csvColumn{}, fmt.Errorf("snapshot: field %q has unit %q; the CSV needs one of %s", name, unit, strings.Join(allowed, ", "))
	}
	return csvColumn{field: k, scale: scale}, nil
}

// flagNames names the defined flag bits, in bit order.
var flagNames = [...]struct {
	bit  byte
	name string
}{
	{FlagSlipping, "slipping"},
	{FlagSlipped, "slipped"},
	{FlagOpen, "open"},
	{FlagStimulated, "stimulated"},
	{FlagIntact, "intact"},
}

// DescribeFrame writes a summary of the last frame at or before time t
// (s): its index, time and stage, the range and mean of each field over
// the finite values, the count of non-finite values, and how many elements
// carry each flag.
func DescribeFrame(w io.Writer, r *Reader, t float64) error {
	i, err := r.Search(t)
	if err != nil {
		return err
	}
	f, err := r.ReadFrame(i)
	if err != nil {
		return err
	}
	h := r.Header()
	fmt.Fprintf(w, "frame %d of %d: time %s s, stage %s\n", i, len(r.Frames()), fmtFloat(f.Time), stageLabel(int(f.Stage), stageNames(&h)))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "field\tunit\tmin\tmax\tmean\tnon-finite")
	for k, fd := range h.Fields {
		unit, scale := shownUnit(fd)
		s := summarize(f.Fields[k], scale)
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%d\n", fd.Name, orNone(unit), s.min, s.max, s.mean, s.nonFinite)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	var counts [len(flagNames)]int
	for _, b := range f.Flags {
		for j, fl := range flagNames {
			if b&fl.bit != 0 {
				counts[j]++
			}
		}
	}
	parts := make([]string, len(flagNames))
	for j, fl := range flagNames {
		parts[j] = fmt.Sprintf("%s %d", fl.name, counts[j])
	}
	_, err = fmt.Fprintf(w, "elements flagged: %s (of %d)\n", strings.Join(parts, ", "), len(f.Flags))
	return err
}

// fieldSummary holds the statistics of one field, formatted.
type fieldSummary struct {
	min, max, mean string
	nonFinite      int
}

// shownUnit is the unit a field is shown in, the one of the CSV (MPa for
// the pressure, mm for aperture and slip, when recorded in a unit the CSV
// converts), else the recorded unit; scale converts to it.
func shownUnit(fd Field) (unit string, scale float64) {
	for _, c := range [...]struct {
		name, unit string
		from       map[string]float64
	}{{FieldPressure, "MPa", toMPa}, {FieldAperture, "mm", toMM}, {FieldSlip, "mm", toMM}, {FieldCoulombChange, "MPa", toMPa}} {
		if s, ok := c.from[fd.Unit]; ok && fd.Name == c.name {
			return c.unit, s
		}
	}
	return fd.Unit, 1
}

// summarize returns the statistics of v·scale over its finite values;
// scale is a power of ten.
func summarize(v []float32, scale float64) fieldSummary {
	lo, hi, sum, n := math.Inf(1), math.Inf(-1), 0.0, 0
	for _, x := range v {
		y := float64(x)
		if math.IsNaN(y) || math.IsInf(y, 0) {
			continue
		}
		lo, hi, sum, n = min(lo, y), max(hi, y), sum+y, n+1
	}
	s := fieldSummary{min: "-", max: "-", mean: "-", nonFinite: len(v) - n}
	if n > 0 {
		s.min = string(appendFloat32Scaled(nil, float32(lo), scale))
		s.max = string(appendFloat32Scaled(nil, float32(hi), scale))
		s.mean = strconv.FormatFloat(sum/float64(n)*scale, 'g', 6, 64)
	}
	return s
}
