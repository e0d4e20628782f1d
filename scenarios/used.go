package scenarios

import (
	"encoding/json"
	"fmt"
	"maps"
	"reflect"
	"slices"
	"strings"
)

// What a run uses. A scenario may hold values that no run reads: fluids
// that no stage pumps, and keys of a law the scenario does not choose (the
// size of a constant law beside a power law, κ of a uniform orientation).
// They are valid but change nothing, so an override of one (a mistyped
// fluid name, a key of the other size law) is an error, an unpumped fluid
// is a warning, and UsedDigest leaves them out so that a sweep can tell
// whether its values change a run.
//
// A field tagged when:"key=a|b" is read only when its sibling key (a
// string in the same table) is one of the words; when:"key>0" only when
// its sibling number is positive.

// PumpedFluids returns the names of the fluids some stage pumps, in
// pumping order without repeats. The scenario must be valid.
func (s *Scenario) PumpedFluids() []string {
	var names []string
	for _, p := range s.PumpingOrder() {
		if !slices.Contains(names, p.Fluid) {
			names = append(names, p.Fluid)
		}
	}
	return names
}

// UsedDigest is the SHA-256 (hex) of the part of the scenario that a run
// uses: the scenario without the fluids no stage pumps and without the
// keys that the chosen laws do not read (see the when tags). Two
// scenarios with the same UsedDigest give the same run; Digest, which
// covers everything, may still differ. The scenario must be valid.
func (s *Scenario) UsedDigest() string {
	b, err := json.Marshal(s)
	if err != nil {
		panic("scenarios: UsedDigest: " + err.Error())
	}
	c := new(Scenario) // a deep copy, so that clearing leaves s alone
	if err := json.Unmarshal(b, c); err != nil {
		panic("scenarios: UsedDigest: " + err.Error())
	}
	pumped := s.PumpedFluids()
	maps.DeleteFunc(c.Fluids, func(name string, _ Fluid) bool { return !slices.Contains(pumped, name) })
	clearUnread(reflect.ValueOf(c).Elem())
	return digest(c)
}

// clearUnread sets every field of the struct v (and of the structs it
// holds) whose when tag does not hold to its zero value.
func clearUnread(v reflect.Value) {
	t := v.Type()
	for i := range t.NumField() {
		f, fv := t.Field(i), v.Field(i)
		if cond := f.Tag.Get("when"); cond != "" && !evalWhen(v, cond).holds {
			fv.SetZero()
			continue
		}
		switch {
		case fv.Kind() == reflect.Struct:
			clearUnread(fv)
		case isTableList(fv.Type()):
			for j := range fv.Len() {
				clearUnread(fv.Index(j))
			}
		}
	}
}

// when is a when tag evaluated in one table.
type when struct {
	holds bool
	// key is the sibling key; want what the tag asks of it ("lognormal or
	// exponential", "> 0"); have its value as written in messages.
	key, want, have string
}

// evalWhen evaluates the when tag cond on the struct v that holds the
// tagged field.
func evalWhen(v reflect.Value, cond string) when {
	key, limit, positive := strings.Cut(cond, ">")
	words := ""
	if !positive {
		key, words, _ = strings.Cut(cond, "=")
	}
	t := v.Type()
	for i := range t.NumField() {
		f := t.Field(i)
		if f.Tag.Get("toml") != key {
			continue
		}
		fv := v.Field(i)
		if positive {
			switch {
			case limit != "0":
				panic("scenarios: bad when tag " + cond)
			case fv.Kind() == reflect.Int:
				return when{holds: fv.Int() > 0, key: key, want: "> 0", have: fmt.Sprint(fv.Int())}
			case fv.Kind() != reflect.Float64:
				panic("scenarios: bad when tag " + cond)
			}
			have := formatQuantity(fv.Float(), unitKind(f.Tag.Get("unit")))
			return when{holds: fv.Float() > 0, key: key, want: "> 0", have: have}
		}
		if fv.Kind() != reflect.String {
			panic("scenarios: bad when tag " + cond)
		}
		allowed := strings.Split(words, "|")
		return when{holds: slices.Contains(allowed, fv.String()), key: key,
			want: "is " + orList(allowed), have: fmt.Sprintf("%q", fv.String())}
	}
	panic("scenarios: when tag " + cond + " names no key of " + t.String())
}

// unusedReason returns why the value at the normalised key path changes
// nothing a run uses, or "" when a run uses it. The scenario must be
// valid; unknown keys count as used (the decoder reported them).
func (s *Scenario) unusedReason(path string) string {
	segs, err := parseKeyPath(path)
	if err != nil {
		return ""
	}
	v, prefix := reflect.ValueOf(s).Elem(), ""
	for i := 0; i < len(segs); i++ {
		f, ok := fieldByKey(v.Type(), segs[i].name)
		if !ok {
			return ""
		}
		key := joinKey(prefix, segs[i].name)
		if cond := f.Tag.Get("when"); cond != "" {
			if w := evalWhen(v, cond); !w.holds {
				return fmt.Sprintf("%s is read only when %s %s (it is %s)", key, joinKey(prefix, w.key), w.want, w.have)
			}
		}
		fv := v.FieldByIndex(f.Index)
		switch {
		case fv.Kind() == reflect.Map && i+1 < len(segs):
			name := segs[i+1].name
			if pumped := s.PumpedFluids(); !slices.Contains(pumped, name) {
				return fmt.Sprintf("no stage pumps %s.%s (the stages pump %s)", key, name, orList(pumped))
			}
			fv, key = fv.MapIndex(reflect.ValueOf(name)), key+"."+name
			i++
		case segs[i].index >= 0 && fv.Kind() == reflect.Slice && segs[i].index < fv.Len():
			fv, key = fv.Index(segs[i].index), fmt.Sprintf("%s[%d]", key, segs[i].index)
		}
		if fv.Kind() != reflect.Struct {
			return ""
		}
		v, prefix = fv, key
	}
	return ""
}

// fieldByKey finds the field of struct type t whose toml tag is key.
func fieldByKey(t reflect.Type, key string) (reflect.StructField, bool) {
	if t.Kind() != reflect.Struct {
		return reflect.StructField{}, false
	}
	for i := range t.NumField() {
		if f := t.Field(i); f.Tag.Get("toml") == key {
			return f, true
		}
	}
	return reflect.StructField{}, false
}

// unpumpedWarnings returns a warning for every fluid that no stage pumps.
func (d *decoder) unpumpedWarnings(s *Scenario) []string {
	pumped := s.PumpedFluids()
	var out []string
	for _, name := range slices.Sorted(maps.Keys(s.Fluids)) {
		if slices.Contains(pumped, name) {
			continue
		}
		key := "fluids." + name
		e := &FieldError{File: d.file, Line: d.lines.lineOf(key), Key: key,
			Msg: fmt.Sprintf("no stage pumps this fluid (the stages pump %s); it changes nothing in a run", orList(pumped))}
		if o, ok := d.newEntries[key]; ok {
			e.File, e.Line, e.Key, e.Value = overrideSource, 0, o.Key, o.Value
		}
		out = append(out, e.Error())
	}
	return out
}
