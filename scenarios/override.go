package scenarios

import (
	"fmt"
	"maps"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"slipfront/internal/badinput"
	"slipfront/internal/plural"

	"github.com/BurntSushi/toml"
)

// Override is one command-line "--set key=value": a dotted scenario key
// such as "fluids.slickwater.viscosity" or "sets[0].orientation.kappa" and
// its value written as in the file, without quotes ("20 cP", "15").
//
// An override may add an entry to a named table (a fluid) only when the
// scenario names the entry (schedule.fluid or a stage's fluid), or when
// the key declares it new with a leading "+" ("+fluids.gel.viscosity"):
// otherwise a mistyped name ("fluids.watr.viscosity") would add a fluid
// that nothing pumps. An override of a value that no run reads (a fluid
// no stage pumps, a key of a law the scenario does not choose) is an
// error too; see UsedDigest.
type Override struct {
	// Key is the dotted key, with a leading "+" when it declares a new
	// entry.
	Key   string
	Value string
}

// newMark leads a key that declares a new entry of a named table.
const newMark = "+"

// split returns the key without its mark and whether it declares a new
// entry.
func (o Override) split() (key string, isNew bool) { return strings.CutPrefix(o.Key, newMark) }

func (o Override) String() string { return o.Key + "=" + o.Value }

// ParseOverride splits "key=value".
func ParseOverride(s string) (Override, error) {
	k, v, ok := strings.Cut(s, "=")
	k, v = strings.TrimSpace(k), strings.TrimSpace(v)
	if !ok || k == "" || v == "" {
		return Override{}, badinput.Errorf("--set %s: want key=value, e.g. fluids.slickwater.viscosity=20cP", s)
	}
	if _, err := parseKeyPath(strings.TrimPrefix(k, newMark)); err != nil {
		return Override{}, badinput.Errorf("--set %s: %w", s, err)
	}
	return Override{Key: k, Value: v}, nil
}

// ParseOverrides parses every "key=value" in order.
func ParseOverrides(list []string) ([]Override, error) {
	out := make([]Override, 0, len(list))
	for _, s := range list {
		o, err := ParseOverride(s)
		if err != nil {
			return nil, err
		}
		out = append(out, o)
	}
	return out, nil
}

type keySegment struct {
	name  string
	index int // -1 when the segment has no [i]
}

var segmentPattern = regexp.MustCompile(`^([A-Za-z0-9_\- ]+)(?:\[(\d+)\])?$`)

// parseKeyPath splits "sets[0].orientation.kappa" into segments.
func parseKeyPath(k string) ([]keySegment, error) {
	var segs []keySegment
	for _, part := range splitKey(k) {
		m := segmentPattern.FindStringSubmatch(part)
		if m == nil {
			return nil, fmt.Errorf("bad key %q: want dotted names with optional [index], e.g. sets[0].orientation.kappa", k)
		}
		s := keySegment{name: m[1], index: -1}
		if m[2] != "" {
			s.index, _ = strconv.Atoi(m[2])
		}
		segs = append(segs, s)
	}
	return segs, nil
}

// value is the override's value for the tree: a string, as a file's
// quoted value, or a list written as in TOML (["90 m", "120 m"]).
func (o Override) value() (any, error) {
	if !strings.HasPrefix(o.Value, "[") {
		return o.Value, nil
	}
	var t map[string]any
	if _, err := toml.Decode("v = "+o.Value, &t); err != nil {
		return nil, fmt.Errorf("a list must be written as in TOML, e.g. [\"90 m\", \"120 m\"]: %w", err)
	}
	return t["v"], nil
}

// errorf returns a problem with the override itself.
func (o Override) errorf(format string, args ...any) *FieldError {
	return &FieldError{File: overrideSource, Key: o.Key, Value: o.Value, Msg: fmt.Sprintf(format, args...)}
}

// apply writes the override into the generic TOML tree and returns the
// normalised key path it set.
func (o Override) apply(tree map[string]any) (string, error) {
	key, _ := o.split()
	segs, err := parseKeyPath(key)
	if err != nil {
		return "", err
	}
	fail := func(format string, args ...any) (string, error) { return "", o.errorf(format, args...) }
	node, path := tree, ""
	for i, s := range segs {
		last := i == len(segs)-1
		path = joinKey(path, s.name)
		if s.index >= 0 {
			list, ok := node[s.name].([]map[string]any)
			if !ok {
				return fail("%s is not a list of tables in this scenario", path)
			}
			if s.index >= len(list) {
				return fail("index %d out of range: the scenario has %s in %s", s.index, plural.Count(len(list), "entry", "entries"), path)
			}
			path += "[" + strconv.Itoa(s.index) + "]"
			if last {
				return fail("%s is a table; set one of its keys", path)
			}
			node = list[s.index]
			continue
		}
		if last {
			switch node[s.name].(type) {
			case map[string]any:
				return fail("%s is a table; set one of its keys", path)
			case []map[string]any:
				return fail("%s is a list of tables; give an index and a key, e.g. %s[0].name", path, path)
			}
			v, err := o.value()
			if err != nil {
				return fail("%v", err)
			}
			node[s.name] = v
			return path, nil
		}
		switch next := node[s.name].(type) {
		case map[string]any:
			node = next
		case nil:
			m := map[string]any{}
			node[s.name] = m
			node = m
		case []map[string]any:
			return fail("%s is a list of tables; give an index, e.g. %s[0]", path, path)
		default:
			return fail("%s is a value, not a table", path)
		}
	}
	return path, nil
}

// applied is an override written into the tree.
type applied struct {
	o    Override
	path string // the normalised key path it set
	// declared: the key lies in an entry declared new with "+" (by this
	// override or an earlier one).
	declared bool
}

// applyOverrides writes the overrides into the tree in order, refusing
// one that adds an entry of a named table neither declared with "+" nor
// named by the scenario (see Override).
func (d *decoder) applyOverrides(tree map[string]any, overrides []Override) error {
	added := map[string]Override{} // entry path → the undeclared override that added it
	for _, o := range overrides {
		key, isNew := o.split()
		segs, err := parseKeyPath(key)
		if err != nil {
			return o.errorf("%v", err)
		}
		entry, inEntry := mapEntry(segs)
		existed := inEntry && lookup(tree, entry) != nil
		switch {
		case isNew && !inEntry:
			return o.errorf("a leading + declares a new entry of a named table, such as +fluids.NAME.viscosity; %s is not in one", key)
		case isNew && existed:
			return o.errorf("%s exists already; drop the + to change it", entry)
		}
		p, err := o.apply(tree)
		if err != nil {
			return err
		}
		d.overrides[p] = o.Value
		switch {
		case isNew:
			d.newEntries[entry] = o
		case inEntry && !existed:
			added[entry] = o
		}
		_, declared := d.newEntries[entry]
		d.applied = append(d.applied, applied{o: o, path: p, declared: inEntry && declared})
	}
	named := fluidsNamed(tree)
	for _, entry := range slices.Sorted(maps.Keys(added)) {
		table, name, _ := strings.Cut(entry, ".")
		if slices.Contains(named, name) {
			continue
		}
		o := added[entry]
		var have []string
		for k := range tree[table].(map[string]any) {
			if _, isAdded := added[table+"."+k]; !isAdded {
				have = append(have, table+"."+k)
			}
		}
		slices.Sort(have)
		list := strings.Join(have, ", ")
		if list == "" {
			list = "none"
		}
		return o.errorf("the scenario has no %s%s and nothing names it (it has %s): this would add an entry that no run uses; to add one on purpose, declare it with a leading +: --set %s%s=%s",
			entry, suggest(entry, have), list, newMark, o.Key, o.Value)
	}
	return nil
}

// checkOverridesUsed reports every override, outside entries declared
// new, of a value that no run reads. The scenario must be valid.
func (d *decoder) checkOverridesUsed(s *Scenario) {
	for _, a := range d.applied {
		if a.declared {
			continue
		}
		if why := s.unusedReason(a.path); why != "" {
			d.errs = append(d.errs, a.o.errorf("changes nothing a run uses: %s", why))
		}
	}
}

// mapEntry returns the path of the named-table entry that the key path
// segs lies in ("fluids.gel" for fluids.gel.viscosity), if any.
func mapEntry(segs []keySegment) (string, bool) {
	t, path := reflect.TypeFor[Scenario](), ""
	for i, s := range segs {
		f, ok := fieldByKey(t, s.name)
		if !ok {
			return "", false
		}
		path = joinKey(path, s.name)
		switch ft := f.Type; {
		case ft.Kind() == reflect.Map && i+1 < len(segs):
			return joinKey(path, segs[i+1].name), true
		case isTableList(ft) && s.index >= 0:
			path += "[" + strconv.Itoa(s.index) + "]"
			t = ft.Elem()
		case ft.Kind() == reflect.Struct:
			t = ft
		default:
			return "", false
		}
	}
	return "", false
}

// fluidsNamed returns the fluid names that the tree's schedule.fluid and
// stage fluids give.
func fluidsNamed(tree map[string]any) []string {
	var names []string
	add := func(path string) {
		if f, ok := lookup(tree, path).(string); ok {
			names = append(names, f)
		}
	}
	add("schedule.fluid")
	wells, _ := asList(lookup(tree, "wells"))
	for i := range wells {
		stages, _ := asList(lookup(tree, fmt.Sprintf("wells[%d].stages", i)))
		for j := range stages {
			add(fmt.Sprintf("wells[%d].stages[%d].fluid", i, j))
		}
	}
	return names
}
