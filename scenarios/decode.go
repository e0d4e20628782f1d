package scenarios

import (
	"fmt"
	"math"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"
)

// decoder turns the generic TOML tree into a Scenario, converting units,
// applying defaults and checking ranges, and collecting every problem with
// its file, line and key.
type decoder struct {
	file      string
	lines     keyLines
	overrides map[string]string // path → value as given to --set
	applied   []applied         // the overrides in order
	// newEntries are the named-table entries declared with "+", by path
	// ("fluids.gel").
	newEntries map[string]Override
	tree       map[string]any // the file's content, for values in messages
	errs       Errors
}

// fail records a problem with the value raw at path.
func (d *decoder) fail(path string, raw any, format string, args ...any) {
	e := &FieldError{File: d.file, Line: d.lines.lineOf(path), Key: path, Msg: fmt.Sprintf(format, args...)}
	if raw != nil {
		e.Value = renderValue(raw)
	}
	if v, ok := d.overrides[path]; ok {
		e.File, e.Line, e.Value = overrideSource, 0, v
	}
	d.errs = append(d.errs, e)
}

// failKey records a problem with the value at path as written in the file
// (used by the rules that join several keys, after conversion to SI).
func (d *decoder) failKey(path string, format string, args ...any) {
	d.fail(path, lookup(d.tree, path), format, args...)
}

// lookup returns the raw value at a normalised key path, or nil.
func lookup(tree map[string]any, path string) any {
	segs, err := parseKeyPath(path)
	if err != nil {
		return nil
	}
	var cur any = tree
	for _, s := range segs {
		m, ok := cur.(map[string]any)
		if !ok {
			return nil
		}
		cur = m[s.name]
		if s.index >= 0 {
			l, ok := asList(cur)
			if !ok || s.index >= len(l) {
				return nil
			}
			cur = l[s.index]
		}
	}
	return cur
}

// renderValue writes a raw value as it would appear in the file, cut to
// maxEchoed characters.
func renderValue(raw any) string {
	var s string
	switch v := raw.(type) {
	case string:
		return echo(v)
	case []any, []map[string]any, map[string]any:
		s = fmt.Sprintf("%v", v)
	default:
		s = fmt.Sprint(v)
	}
	if r := []rune(s); len(r) > maxEchoed {
		return string(r[:maxEchoed]) + "…"
	}
	return s
}

// decodeStruct fills the struct v from the table node. Keys in node that
// match no field are errors with the closest known key suggested.
func (d *decoder) decodeStruct(path string, node map[string]any, v reflect.Value) {
	t := v.Type()
	known := map[string]int{}
	var names []string
	for i := range t.NumField() {
		name := t.Field(i).Tag.Get("toml")
		if name == "" || name == "-" {
			continue
		}
		known[name] = i
		names = append(names, name)
	}
	keys := make([]string, 0, len(node))
	for k := range node {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if _, ok := known[k]; !ok {
			hint := suggest(k, names)
			if hint == "" {
				hint = suggestElsewhere(k)
			}
			d.fail(joinKey(path, k), nil, "unknown key%s; keys here: %s", hint, strings.Join(names, ", "))
		}
	}
	for _, name := range names {
		f := t.Field(known[name])
		fp := joinKey(path, name)
		raw, present := node[name]
		if !present {
			d.decodeAbsent(fp, f, v.Field(known[name]))
			continue
		}
		d.decodeValue(fp, raw, f, v.Field(known[name]))
	}
}

// decodeAbsent applies a field's default, or reports a missing required key.
func (d *decoder) decodeAbsent(path string, f reflect.StructField, v reflect.Value) {
	if def, ok := f.Tag.Lookup("default"); ok {
		before := len(d.errs)
		d.decodeValue(path, defaultValue(def), f, v)
		if len(d.errs) != before {
			panic(fmt.Sprintf("scenarios: bad default for %s: %v", path, d.errs[before:]))
		}
		return
	}
	if _, ok := f.Tag.Lookup("opt"); ok {
		return
	}
	switch v.Kind() {
	case reflect.Struct:
		d.decodeStruct(path, map[string]any{}, v)
	case reflect.Map:
		v.Set(reflect.MakeMap(v.Type()))
	case reflect.Slice:
		if isTableList(v.Type()) {
			return // an empty list of tables
		}
		fallthrough
	default:
		hint := ""
		if ex := f.Tag.Get("example"); ex != "" {
			hint = " (e.g. " + exampleLiteral(f, ex) + ")"
		}
		d.fail(path, nil, "required key is missing%s", hint)
	}
}

// defaultValue turns a default tag into the raw value a file would hold.
func defaultValue(def string) any {
	if def == "[]" {
		return []any{}
	}
	return def
}

func (d *decoder) decodeValue(path string, raw any, f reflect.StructField, v reflect.Value) {
	kind := unitKind(f.Tag.Get("unit"))
	switch v.Kind() {
	case reflect.Pointer:
		elem := reflect.New(v.Type().Elem())
		if d.decodeScalar(path, raw, f, kind, elem.Elem()) {
			v.Set(elem)
		}
	case reflect.Struct:
		node, ok := raw.(map[string]any)
		if !ok {
			d.fail(path, raw, "must be a table")
			return
		}
		d.decodeStruct(path, node, v)
	case reflect.Map:
		d.decodeMap(path, raw, v)
	case reflect.Slice:
		d.decodeSlice(path, raw, f, kind, v)
	default:
		d.decodeScalar(path, raw, f, kind, v)
	}
}

func (d *decoder) decodeMap(path string, raw any, v reflect.Value) {
	node, ok := raw.(map[string]any)
	if !ok {
		d.fail(path, raw, "must be a table of named tables")
		return
	}
	m := reflect.MakeMap(v.Type())
	keys := make([]string, 0, len(node))
	for k := range node {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		elem := reflect.New(v.Type().Elem()).Elem()
		sub, ok := node[k].(map[string]any)
		if !ok {
			d.fail(joinKey(path, k), node[k], "must be a table")
			continue
		}
		d.decodeStruct(joinKey(path, k), sub, elem)
		m.SetMapIndex(reflect.ValueOf(k), elem)
	}
	v.Set(m)
}

func (d *decoder) decodeSlice(path string, raw any, f reflect.StructField, kind unitKind, v reflect.Value) {
	items, ok := asList(raw)
	if !ok {
		d.fail(path, raw, "must be a list")
		return
	}
	et := v.Type().Elem()
	s := reflect.MakeSlice(v.Type(), len(items), len(items))
	for i, item := range items {
		ip := fmt.Sprintf("%s[%d]", path, i)
		switch {
		case et == reflect.TypeFor[Point]():
			d.decodePoint(ip, item, s.Index(i))
		case isTableList(v.Type()):
			node, ok := item.(map[string]any)
			if !ok {
				d.fail(ip, item, "must be a table")
				continue
			}
			d.decodeStruct(ip, node, s.Index(i))
		default:
			d.decodeScalar(ip, item, f, kind, s.Index(i))
		}
	}
	v.Set(s)
}

// asList accepts both TOML arrays and arrays of tables.
func asList(raw any) ([]any, bool) {
	switch l := raw.(type) {
	case []any:
		return l, true
	case []map[string]any:
		out := make([]any, len(l))
		for i, m := range l {
			out[i] = m
		}
		return out, true
	}
	return nil, false
}

// decodePoint reads [x, y, depth], each a length with a unit.
func (d *decoder) decodePoint(path string, raw any, v reflect.Value) {
	l, ok := raw.([]any)
	if !ok || len(l) != 3 {
		d.fail(path, raw, `must be a point ["x m", "y m", "depth m"]`)
		return
	}
	var xyz [3]float64
	for i, c := range l {
		s, ok := c.(string)
		if !ok {
			d.fail(path, raw, `coordinates need units, e.g. ["-600 m", "0 m", "2600 m"]`)
			return
		}
		q, err := parseQuantity(s, kindLength)
		if err != nil {
			d.fail(fmt.Sprintf("%s[%d]", path, i), c, "%v", err)
			return
		}
		xyz[i] = q
	}
	v.Set(reflect.ValueOf(Point{X: xyz[0], Y: xyz[1], Depth: xyz[2]}))
}

// decodeScalar sets a string, number, integer or quantity and checks its
// range. It reports whether v was set.
func (d *decoder) decodeScalar(path string, raw any, f reflect.StructField, kind unitKind, v reflect.Value) bool {
	if t, ok := raw.(time.Time); ok {
		raw = t.UTC().Format(time.RFC3339Nano)
	}
	spec := parseRange(f.Tag.Get("range"))
	switch v.Kind() {
	case reflect.String:
		s, ok := raw.(string)
		if !ok {
			d.fail(path, raw, "must be a string in quotes")
			return false
		}
		if len(spec.words) > 0 && !spec.allows(s) {
			d.fail(path, raw, "must be one of %s%s", strings.Join(spec.words, ", "), suggest(s, spec.words))
			return false
		}
		v.SetString(s)
	case reflect.Float64:
		x, ok := d.number(path, raw, kind)
		if !ok {
			return false
		}
		if msg := spec.check(x, kind); msg != "" {
			d.fail(path, raw, "%s", msg)
			return false
		}
		v.SetFloat(x)
	case reflect.Int, reflect.Uint64:
		n, ok := d.integer(path, raw)
		if !ok {
			return false
		}
		if msg := spec.check(float64(n), ""); msg != "" {
			d.fail(path, raw, "%s", msg)
			return false
		}
		if v.Kind() == reflect.Uint64 {
			v.SetUint(uint64(n))
		} else {
			v.SetInt(n)
		}
	default:
		panic("scenarios: unsupported field type " + v.Type().String())
	}
	return true
}

// number reads a float: a quantity string when kind is set, otherwise a
// plain number (a quoted number is accepted, as --set gives strings).
func (d *decoder) number(path string, raw any, kind unitKind) (float64, bool) {
	if kind != "" {
		s, ok := raw.(string)
		if !ok {
			number := "2600"
			switch raw.(type) {
			case int64, float64:
				number = renderValue(raw)
			}
			d.fail(path, raw, "%s, as a string", needsUnit(number, kind))
			return 0, false
		}
		x, err := parseQuantity(s, kind)
		if err != nil {
			d.fail(path, raw, "%v", err)
			return 0, false
		}
		return x, true
	}
	switch x := raw.(type) {
	case float64:
		return x, true
	case int64:
		return float64(x), true
	case string:
		v, err := strconv.ParseFloat(strings.TrimSpace(x), 64)
		if err == nil && !math.IsInf(v, 0) {
			return v, true
		}
	}
	d.fail(path, raw, "must be a plain number (no unit)")
	return 0, false
}

func (d *decoder) integer(path string, raw any) (int64, bool) {
	switch x := raw.(type) {
	case int64:
		return x, true
	case float64:
		if x == math.Trunc(x) && math.Abs(x) < 1<<53 {
			return int64(x), true
		}
	case string:
		if n, err := strconv.ParseInt(strings.TrimSpace(x), 10, 64); err == nil {
			return n, true
		}
	}
	d.fail(path, raw, "must be a whole number")
	return 0, false
}

// rangeSpec is an allowed interval, or a list of allowed words.
type rangeSpec struct {
	set            bool
	lo, hi         float64
	loOpen, hiOpen bool
	words          []string
}

// parseRange reads "(0,inf)", "[0,0.5)", "[-90,90]" or "a|b|c".
func parseRange(s string) rangeSpec {
	if s == "" {
		return rangeSpec{}
	}
	if s[0] != '(' && s[0] != '[' {
		return rangeSpec{words: strings.Split(s, "|")}
	}
	parts := strings.Split(s[1:len(s)-1], ",")
	if len(parts) != 2 {
		panic("scenarios: bad range tag " + s)
	}
	lo, err1 := strconv.ParseFloat(parts[0], 64)
	hi, err2 := strconv.ParseFloat(parts[1], 64)
	if err1 != nil || err2 != nil {
		panic("scenarios: bad range tag " + s)
	}
	return rangeSpec{set: true, lo: lo, hi: hi, loOpen: s[0] == '(', hiOpen: s[len(s)-1] == ')'}
}

func (r rangeSpec) allows(w string) bool {
	for _, a := range r.words {
		if a == w {
			return true
		}
	}
	return false
}

// check returns "" when x (SI; angles in radians) is allowed, otherwise the
// rule it breaks. Angle ranges are written in degrees.
func (r rangeSpec) check(x float64, kind unitKind) string {
	if !r.set {
		return ""
	}
	if isAngle(kind) {
		x /= degree
	}
	ok := (x > r.lo || (!r.loOpen && x == r.lo)) && (x < r.hi || (!r.hiOpen && x == r.hi))
	if ok && !math.IsNaN(x) {
		return ""
	}
	return "must be " + r.describeIn(kind)
}

// isAngle reports whether range tags of kind k are written in degrees
// rather than SI.
func isAngle(k unitKind) bool { return k == kindAngle || k == kindAzimuth }

// describeIn describes the range (SI; degrees for angles) in the shown
// unit of kind k (none for a plain number), or lists the allowed words.
func (r rangeSpec) describeIn(k unitKind) string {
	switch {
	case len(r.words) > 0:
		return strings.Join(r.words, "|")
	case k == "":
		return r.describe("")
	case isAngle(k):
		return r.describe(" deg")
	}
	u := shownUnit[k]
	f := unitFactor(k, u)
	shown := rangeSpec{set: r.set, lo: r.lo / f, hi: r.hi / f, loOpen: r.loOpen, hiOpen: r.hiOpen}
	return shown.describe(" " + u)
}

func (r rangeSpec) describe(unit string) string {
	num := formatNumber
	if math.IsInf(r.hi, 1) {
		if r.loOpen {
			return "> " + num(r.lo) + unit
		}
		return "≥ " + num(r.lo) + unit
	}
	open, close := "[", "]"
	if r.loOpen {
		open = "("
	}
	if r.hiOpen {
		close = ")"
	}
	return "within " + open + num(r.lo) + ", " + num(r.hi) + close + unit
}

// suggestElsewhere looks for a key of that name (or close to it) anywhere
// in the schema, for a key written in the wrong table.
func suggestElsewhere(k string) string {
	var paths, leaves []string
	var walk func(prefix string, t reflect.Type)
	walk = func(prefix string, t reflect.Type) {
		for i := range t.NumField() {
			f := t.Field(i)
			name := f.Tag.Get("toml")
			if name == "" || name == "-" {
				continue
			}
			ft := f.Type
			switch {
			case ft.Kind() == reflect.Struct:
				walk(joinKey(prefix, name), ft)
			case isTableList(ft):
				walk(joinKey(prefix, name+"[0]"), ft.Elem())
			case ft.Kind() == reflect.Map:
				walk(joinKey(prefix, name+".NAME"), ft.Elem())
			default:
				paths = append(paths, joinKey(prefix, name))
				leaves = append(leaves, name)
			}
		}
	}
	walk("", reflect.TypeFor[Scenario]())
	hint := suggest(k, leaves)
	if hint == "" {
		return ""
	}
	for i, l := range leaves {
		if hint == fmt.Sprintf(" (did you mean %q?)", l) {
			return fmt.Sprintf(" (did you mean %q?)", paths[i])
		}
	}
	return ""
}

// isTableList reports whether t is a list of tables ([[sets]]), as opposed
// to a list of values or of points.
func isTableList(t reflect.Type) bool {
	return t.Kind() == reflect.Slice && t.Elem().Kind() == reflect.Struct && t.Elem() != reflect.TypeFor[Point]()
}
