package pipeline

import (
	"fmt"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"

	"slipfront/internal/version"
	"slipfront/report"
	"slipfront/scenarios"
)

// displayUnits are the units the report shows each kind of scenario value
// in (the kinds of the scenario's unit tags): the factor from SI and the
// unit's name, chosen as the trade writes them.
var displayUnits = map[string]struct {
	factor float64
	name   string
}{
	"length":          {1, "m"},
	"pressure":        {1e-6, "MPa"},
	"gradient":        {1e-3, "kPa/m"},
	"viscosity":       {1e3, "cP"},
	"compressibility": {1, "1/Pa"},
	"rate":            {60, "m³/min"},
	"volume":          {1, "m³"},
	"time":            {1, "s"},
	"angle":           {180 / math.Pi, "°"},
	"azimuth":         {180 / math.Pi, "° from north"},
	"intensity":       {1, "1/m"},
	"leakoff":         {1, "m/√s"},
}

// InputsTable is the resolved scenario for people: one row per key in
// the scenario's dotted notation (that of --set), with its value in the
// display unit of its kind, in the order of the scenario template.
func InputsTable(s *scenarios.Scenario) report.Table {
	t := report.Table{Caption: "Resolved scenario " + s.Name + " (defaults filled in; digest " + s.Digest + ")",
		Header: []string{"key", "value"}}
	walkInputs(reflect.ValueOf(s).Elem(), "", "", func(key, value string) {
		t.Rows = append(t.Rows, []string{key, value})
	})
	return t
}

// walkInputs calls row for every scalar key below v, a struct, whose key
// prefix is path; unit is the kind of v's own unit tag (for a list of
// points or numbers).
func walkInputs(v reflect.Value, path, unit string, row func(key, value string)) {
	t := v.Type()
	for i := range t.NumField() {
		f := t.Field(i)
		name := f.Tag.Get("toml")
		if name == "" || name == "-" {
			continue
		}
		key := joinKey(path, name)
		fv := v.Field(i)
		u := f.Tag.Get("unit")
		switch fv.Kind() {
		case reflect.Struct:
			walkInputs(fv, key, u, row)
		case reflect.Map:
			for _, k := range slices.Sorted(func(yield func(string) bool) {
				for _, k := range fv.MapKeys() {
					if !yield(k.String()) {
						return
					}
				}
			}) {
				walkInputs(fv.MapIndex(reflect.ValueOf(k)), key+"."+k, "", row)
			}
		case reflect.Slice:
			if fv.Type().Elem().Kind() == reflect.Struct && fv.Type().Elem().Field(0).Tag.Get("toml") != "" {
				for j := range fv.Len() {
					walkInputs(fv.Index(j), fmt.Sprintf("%s[%d]", key, j), "", row)
				}
				continue
			}
			row(key, formatList(fv, u))
		case reflect.Pointer:
			if fv.IsNil() {
				row(key, "(schedule's value)")
				continue
			}
			row(key, formatInput(fv.Elem(), u))
		default:
			row(key, formatInput(fv, u))
		}
	}
}

func joinKey(path, name string) string {
	if path == "" {
		return name
	}
	return path + "." + name
}

// formatInput writes a scalar in the display unit of its kind.
func formatInput(v reflect.Value, unit string) string {
	switch v.Kind() {
	case reflect.Float64:
		if du, ok := displayUnits[unit]; ok {
			return strconv.FormatFloat(v.Float()*du.factor, 'g', 6, 64) + " " + du.name
		}
		return strconv.FormatFloat(v.Float(), 'g', 6, 64)
	case reflect.String:
		if v.String() == "" {
			return "(none)"
		}
		return strconv.Quote(v.String())
	case reflect.Struct: // A path point: x, y and depth.
		var parts []string
		for i := range v.NumField() {
			parts = append(parts, formatInput(v.Field(i), ""))
		}
		s := "(" + strings.Join(parts, ", ") + ")"
		if du, ok := displayUnits[unit]; ok {
			s += " " + du.name
		}
		return s
	}
	return fmt.Sprint(v.Interface())
}

// formatList writes a list of scalars or points.
func formatList(v reflect.Value, unit string) string {
	if v.Len() == 0 {
		return "(none)"
	}
	parts := make([]string, v.Len())
	for i := range parts {
		parts[i] = formatInput(v.Index(i), unit)
	}
	return strings.Join(parts, "; ")
}

// programName is the program and version printed on report pages.
var programName = "slipfront " + version.Version

// scenarioDate is the date a page gives its results: the scenario's start
// of pumping (schedule.start). A page carries no clock time, so the same
// inputs give the same page.
func scenarioDate(start string) string {
	return "schedule start " + start + " (the scenario's date; the page carries no clock time)"
}

// basePage is a page of the scenario's folder with the program, the date
// and the inputs.
func basePage(title string, s *scenarios.Scenario) *report.Page {
	return &report.Page{Title: title, Program: programName, Date: scenarioDate(s.Schedule.Start),
		Inputs: []report.Table{InputsTable(s)}}
}
