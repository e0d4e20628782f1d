package scenarios

import (
	"fmt"
	"reflect"
	"slices"
	"strconv"
	"strings"
)

// Template returns a complete scenario in which every key is written with
// its value, unit kind, default and allowed range. It is generated from the
// schema itself, so it cannot fall behind it; it parses and validates as it
// stands (TestTemplateParses).
func Template() string {
	var b strings.Builder
	b.WriteString(`# slipfront scenario (TOML). Every key is listed with its default or an example.
# Values with a dimension are strings with a unit; SI is used inside.
# Units accepted:
`)
	kinds := make([]string, 0, len(unitTable))
	for k := range unitTable {
		kinds = append(kinds, string(k))
	}
	slices.Sort(kinds)
	for _, k := range kinds {
		fmt.Fprintf(&b, "#   %-16s %s\n", k, unitNames(unitKind(k)))
	}
	b.WriteString(`# Keys without a default are required. A command-line --set key=value overrides
# any single value by its dotted key, e.g. --set sets[0].orientation.kappa=15.
#
# Caution: slipfront is a screening and comparison tool. Pump pressures, well
# integrity and induced-seismicity limits follow local regulation and licensed
# engineering practice.

`)
	writeTable(&b, "", reflect.TypeFor[Scenario](), false)
	return b.String()
}

// writeTable writes the scalar keys of t, then its sub-tables.
func writeTable(b *strings.Builder, path string, t reflect.Type, arrayElem bool) {
	var subs []reflect.StructField
	for i := range t.NumField() {
		f := t.Field(i)
		name := f.Tag.Get("toml")
		if name == "" || name == "-" {
			continue
		}
		ft := f.Type
		if ft.Kind() == reflect.Struct || ft.Kind() == reflect.Map || isTableList(ft) {
			subs = append(subs, f)
			continue
		}
		writeKey(b, f)
	}
	for _, f := range subs {
		name := joinKey(path, f.Tag.Get("toml"))
		b.WriteString("\n")
		if doc := f.Tag.Get("doc"); doc != "" {
			fmt.Fprintf(b, "# %s\n", doc)
		}
		switch f.Type.Kind() {
		case reflect.Struct:
			if _, optional := f.Tag.Lookup("opt"); optional {
				writeCommentedTable(b, name, f.Type)
				continue
			}
			fmt.Fprintf(b, "[%s]\n", name)
			writeTable(b, name, f.Type, false)
		case reflect.Map:
			// One example entry of a table of named tables.
			fmt.Fprintf(b, "[%s.slickwater]\n", name)
			writeTable(b, name+".slickwater", f.Type.Elem(), false)
		case reflect.Slice:
			fmt.Fprintf(b, "[[%s]]\n", name)
			writeTable(b, name, f.Type.Elem(), true)
		}
	}
}

// writeCommentedTable writes an optional table with every line commented
// out, so that the template runs without it and a user enables it by
// removing the leading "# " of the header and of the keys.
func writeCommentedTable(b *strings.Builder, name string, t reflect.Type) {
	var sub strings.Builder
	fmt.Fprintf(&sub, "[%s]\n", name)
	writeTable(&sub, name, t, false)
	for line := range strings.Lines(sub.String()) {
		if !strings.HasPrefix(line, "#") {
			line = "# " + line
		}
		b.WriteString(line)
	}
}

// writeKey writes one "key = value  # comment" line.
func writeKey(b *strings.Builder, f reflect.StructField) {
	name := f.Tag.Get("toml")
	def, hasDef := f.Tag.Lookup("default")
	ex := f.Tag.Get("example")
	_, optional := f.Tag.Lookup("opt")
	var value string
	var notes []string
	switch {
	case ex != "":
		value = exampleLiteral(f, ex)
		if hasDef {
			notes = append(notes, "default "+exampleLiteral(f, def))
		} else {
			notes = append(notes, "required")
		}
	case hasDef:
		value = exampleLiteral(f, def)
	case optional:
		value = `""`
	}
	if u := f.Tag.Get("unit"); u != "" {
		notes = append(notes, u)
	}
	if r := f.Tag.Get("range"); r != "" {
		notes = append(notes, "allowed "+parseRange(r).describeIn(unitKind(f.Tag.Get("unit"))))
	}
	line := name + " = " + value
	prefix := ""
	if optional {
		prefix = "# "
		notes = append(notes, "optional")
	}
	comment := f.Tag.Get("doc")
	if len(notes) > 0 {
		comment += " [" + strings.Join(notes, "; ") + "]"
	}
	fmt.Fprintf(b, "%s%-38s # %s\n", prefix, line, comment)
}

// exampleLiteral writes a tag value as a TOML literal of the field's type.
func exampleLiteral(f reflect.StructField, v string) string {
	if strings.HasPrefix(v, "[") {
		return v
	}
	t := f.Type
	if t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t.Kind() == reflect.String || f.Tag.Get("unit") != "" {
		return strconv.Quote(v)
	}
	return v
}
