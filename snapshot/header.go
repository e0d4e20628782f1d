package snapshot

import (
	"encoding/binary"
	"fmt"
	"math"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Standard frame field names, shared with the simulator and used by
// WriteFrameCSV.
const (
	// FieldPressure is the fluid pressure in the element, unit "Pa".
	FieldPressure = "pressure"
	// FieldAperture is the hydraulic aperture of the element, unit "m".
	FieldAperture = "aperture"
	// FieldSlip is the cumulative shear slip of the element, unit "m".
	FieldSlip = "slip"
	// FieldCoulombChange is the Coulomb stress change on the element's own
	// plane in the sense its in-situ shear drives it, from all slip and
	// opening so far, unit "Pa" (optional: snapshots of earlier versions
	// lack it).
	FieldCoulombChange = "coulomb_change"
)

// Flag bits of the per-element state byte of a frame. Bits 5–7 are
// reserved.
const (
	// FlagSlipping: the element slipped in the step that ended at the
	// frame time.
	FlagSlipping byte = 1 << 0
	// FlagSlipped: the element has slipped at least once since the start.
	FlagSlipped byte = 1 << 1
	// FlagOpen: the element is open in tension, pressure above the
	// normal stress (p > σn).
	FlagOpen byte = 1 << 2
	// FlagStimulated: the element's cumulative slip exceeds the
	// stimulated-slip threshold of the run.
	FlagStimulated byte = 1 << 3
	// FlagIntact: the element is intact rock ahead of a growing
	// fracture's tip, not opened yet (snapshots written before growth
	// existed never set it).
	FlagIntact byte = 1 << 4
)

// Header is the part of a snapshot written once, before the frames.
type Header struct {
	// Digest identifies the scenario (hex SHA-256), or "".
	Digest string
	// Seed is the scenario seed of the run.
	Seed uint64
	// Realization is the realization index of the run, ≥ 0.
	Realization int
	// CRS is the projected CRS of the origin ("EPSG:32614"), or "" for an
	// undefined local frame.
	CRS string
	// OriginEasting and OriginNorthing place local (0, 0) in the CRS, m.
	OriginEasting, OriginNorthing float64
	// LayerDepth is the true vertical depth of the layer mid-plane, m.
	LayerDepth float64
	// Metadata holds free-form key/value pairs (program version, schedule
	// start time, …). Keys are non-empty.
	Metadata map[string]string
	// Elements is the element geometry; element i has identifier i.
	Elements []Element
	// Fields names the float32 arrays of every frame, in frame order.
	Fields []Field
	// Static holds int32 arrays written once, one value per element.
	Static []StaticField
}

// Element is the map-view geometry of one flow element: a straight piece
// of a fracture trace on the layer mid-plane.
type Element struct {
	// Fracture is the identifier of the fracture the element belongs to.
	Fracture int32
	// X0, Y0 and X1, Y1 are the element's end points, local east and
	// north, m.
	X0, Y0, X1, Y1 float64
	// Height is the conducting height of the fracture in the layer, m.
	Height float64
	// Length is the element length along the trace, m.
	Length float64
}

// Field names a per-element array and its unit.
type Field struct {
	// Name identifies the field ("pressure").
	Name string
	// Unit is the unit of the values ("Pa"); "" or "1" when dimensionless.
	Unit string
}

// StaticField is a named int32 array written once in the header.
type StaticField struct {
	Field
	// Values holds one value per element.
	Values []int32
}

// FieldIndex returns the position of the frame field called name in
// h.Fields, or -1.
func (h *Header) FieldIndex(name string) int {
	return slices.IndexFunc(h.Fields, func(f Field) bool { return f.Name == name })
}

// validate checks the limits and rules of the format; readers apply it to
// what they decoded so that every file read can be written again.
func (h *Header) validate() error {
	if err := checkText("digest", h.Digest, false); err != nil {
		return err
	}
	if err := checkText("CRS", h.CRS, false); err != nil {
		return err
	}
	if h.Realization < 0 {
		return fmt.Errorf("realization = %d: must be ≥ 0", h.Realization)
	}
	for _, v := range []struct {
		name string
		x    float64
	}{{"origin easting", h.OriginEasting}, {"origin northing", h.OriginNorthing}, {"layer depth", h.LayerDepth}} {
		if math.IsNaN(v.x) || math.IsInf(v.x, 0) {
			return fmt.Errorf("%s = %v: must be finite", v.name, v.x)
		}
	}
	if err := validateMetadata(h.Metadata); err != nil {
		return err
	}
	if len(h.Elements) > MaxElements {
		return fmt.Errorf("%d elements: at most %d allowed", len(h.Elements), MaxElements)
	}
	for i, e := range h.Elements {
		if err := e.validate(); err != nil {
			return fmt.Errorf("elements[%d]: %w", i, err)
		}
	}
	return validateFields(h.Fields, h.Static, len(h.Elements))
}

func (e Element) validate() error {
	for _, v := range []struct {
		name string
		x    float64
	}{{"x0", e.X0}, {"y0", e.Y0}, {"x1", e.X1}, {"y1", e.Y1}, {"height", e.Height}, {"length", e.Length}} {
		if math.IsNaN(v.x) || math.IsInf(v.x, 0) {
			return fmt.Errorf("%s = %v: must be finite", v.name, v.x)
		}
	}
	if e.Height < 0 || e.Length < 0 {
		return fmt.Errorf("height = %v m, length = %v m: must be ≥ 0", e.Height, e.Length)
	}
	return nil
}

func validateMetadata(m map[string]string) error {
	if len(m) > MaxMetadata {
		return fmt.Errorf("%d metadata pairs: at most %d allowed", len(m), MaxMetadata)
	}
	for k, v := range m {
		if k == "" {
			return fmt.Errorf("metadata key is empty")
		}
		if err := checkText(fmt.Sprintf("metadata key %q", k), k, false); err != nil {
			return err
		}
		if err := checkText(fmt.Sprintf("metadata[%q]", k), v, true); err != nil {
			return err
		}
	}
	return nil
}

func validateFields(fields []Field, static []StaticField, n int) error {
	if len(fields) > MaxFields || len(static) > MaxFields {
		return fmt.Errorf("%d frame fields and %d static fields: at most %d of each allowed", len(fields), len(static), MaxFields)
	}
	seen := make(map[string]bool, len(fields)+len(static))
	check := func(where string, f Field) error {
		if f.Name == "" {
			return fmt.Errorf("%s: name is empty", where)
		}
		if seen[f.Name] {
			return fmt.Errorf("%s: name %q is used twice", where, f.Name)
		}
		seen[f.Name] = true
		if err := checkText(where+" name", f.Name, false); err != nil {
			return err
		}
		return checkText(where+" unit", f.Unit, false)
	}
	for i, f := range fields {
		if err := check(fmt.Sprintf("fields[%d]", i), f); err != nil {
			return err
		}
	}
	for i, s := range static {
		if err := check(fmt.Sprintf("static[%d]", i), s.Field); err != nil {
			return err
		}
		if len(s.Values) != n {
			return fmt.Errorf("static[%d] %q has %d values for %d elements", i, s.Name, len(s.Values), n)
		}
	}
	return nil
}

// checkText checks a string's length and encoding; control characters are
// allowed only when multiline is set.
func checkText(what, s string, multiline bool) error {
	if len(s) > MaxStringLen {
		return fmt.Errorf("%s is %d bytes long: at most %d allowed", what, len(s), MaxStringLen)
	}
	if !utf8.ValidString(s) {
		return fmt.Errorf("%s %q is not valid UTF-8", what, s)
	}
	if !multiline && strings.IndexFunc(s, unicode.IsControl) >= 0 {
		return fmt.Errorf("%s %q contains a control character", what, s)
	}
	return nil
}

// appendHeader appends the header block payload for h to dst.
func appendHeader(dst []byte, h *Header, ae *arrayEncoder) []byte {
	dst = appendStr(dst, h.Digest)
	dst = binary.LittleEndian.AppendUint64(dst, h.Seed)
	dst = binary.LittleEndian.AppendUint64(dst, uint64(h.Realization))
	dst = appendStr(dst, h.CRS)
	dst = appendF64(dst, h.OriginEasting)
	dst = appendF64(dst, h.OriginNorthing)
	dst = appendF64(dst, h.LayerDepth)
	keys := make([]string, 0, len(h.Metadata))
	for k := range h.Metadata {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	dst = binary.LittleEndian.AppendUint32(dst, uint32(len(keys)))
	for _, k := range keys {
		dst = appendStr(appendStr(dst, k), h.Metadata[k])
	}
	n := len(h.Elements)
	dst = binary.LittleEndian.AppendUint32(dst, uint32(n))
	dst = binary.LittleEndian.AppendUint32(dst, uint32(len(h.Fields)))
	for _, f := range h.Fields {
		dst = appendStr(appendStr(dst, f.Name), f.Unit)
	}
	dst = binary.LittleEndian.AppendUint32(dst, uint32(len(h.Static)))
	for _, s := range h.Static {
		dst = appendStr(appendStr(dst, s.Name), s.Unit)
	}
	ids := make([]int32, n)
	for i, e := range h.Elements {
		ids[i] = e.Fracture
	}
	dst = ae.appendInt32(dst, ids)
	col := make([]float64, n)
	for _, get := range elementColumns {
		for i := range h.Elements {
			col[i] = get(&h.Elements[i])
		}
		dst = ae.appendFloat64(dst, col)
	}
	for _, s := range h.Static {
		dst = ae.appendInt32(dst, s.Values)
	}
	return dst
}

// elementColumns lists the float64 geometry columns in file order.
var elementColumns = [...]func(e *Element) float64{
	func(e *Element) float64 { return e.X0 },
	func(e *Element) float64 { return e.Y0 },
	func(e *Element) float64 { return e.X1 },
	func(e *Element) float64 { return e.Y1 },
	func(e *Element) float64 { return e.Height },
	func(e *Element) float64 { return e.Length },
}

// setElementColumn stores column k (file order) of element e.
func setElementColumn(e *Element, k int, v float64) {
	switch k {
	case 0:
		e.X0 = v
	case 1:
		e.Y0 = v
	case 2:
		e.X1 = v
	case 3:
		e.Y1 = v
	case 4:
		e.Height = v
	default:
		e.Length = v
	}
}

// decodeHeaderFixed decodes the header payload up to (not including) the
// arrays.
func decodeHeaderFixed(c *cursor, h *Header) (elements int) {
	h.Digest = c.str("digest")
	h.Seed = c.u64("seed")
	at := c.off
	if r := c.u64("realization"); r > math.MaxInt {
		c.off = at
		c.fail("realization index %d is too large", r)
	} else {
		h.Realization = int(r)
	}
	h.CRS = c.str("CRS")
	h.OriginEasting = c.f64("origin easting")
	h.OriginNorthing = c.f64("origin northing")
	h.LayerDepth = c.f64("layer depth")
	k := c.count("metadata pair count", MaxMetadata)
	if k > 0 {
		h.Metadata = make(map[string]string, k)
	}
	prev := ""
	for i := 0; i < k && c.err == nil; i++ {
		at := c.off
		key, value := c.str("metadata key"), c.str("metadata value")
		if c.err == nil && i > 0 && key <= prev {
			c.off = at
			c.fail("metadata key %q does not follow %q in byte order", key, prev)
		}
		h.Metadata[key], prev = value, key
	}
	n := c.count("element count", MaxElements)
	h.Fields = decodeFieldList(c, "frame field")
	static := decodeFieldList(c, "static field")
	if len(static) > 0 {
		h.Static = make([]StaticField, len(static))
		for i, f := range static {
			h.Static[i].Field = f
		}
	}
	return n
}

func decodeFieldList(c *cursor, what string) []Field {
	m := c.count(what+" count", MaxFields)
	if m == 0 || c.err != nil {
		return nil
	}
	fields := make([]Field, m)
	for i := range fields {
		fields[i] = Field{Name: c.str(what + " name"), Unit: c.str(what + " unit")}
	}
	return fields
}

// decodeHeaderArrays decodes the element geometry and the static fields.
func decodeHeaderArrays(c *cursor, h *Header, n int, ad *arrayDecoder) {
	decoded := uint64(n) * uint64(4+8*len(elementColumns)+4*len(h.Static))
	c.need(1+len(elementColumns)+len(h.Static), decoded, fmt.Sprintf("%d elements", n))
	raw := ad.raw(c, 4*n, "fracture id array", "")
	if c.err != nil {
		return
	}
	h.Elements = make([]Element, n)
	ids := make([]int32, n)
	unshuffleInt32(ids, raw)
	for i, id := range ids {
		h.Elements[i].Fracture = id
	}
	col := make([]float64, n)
	for k := range elementColumns {
		raw := ad.raw(c, 8*n, "element geometry array", "")
		if c.err != nil {
			return
		}
		unshuffleFloat64(col, raw)
		for i, v := range col {
			setElementColumn(&h.Elements[i], k, v)
		}
	}
	for i := range h.Static {
		raw := ad.raw(c, 4*n, "static field ", h.Static[i].Name)
		if c.err != nil {
			return
		}
		h.Static[i].Values = make([]int32, n)
		unshuffleInt32(h.Static[i].Values, raw)
	}
}
