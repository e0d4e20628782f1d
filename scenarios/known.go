package scenarios

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// knownColumns are the columns of a known-fracture CSV file, in SI units
// and degrees as their names say. Lines starting with # are comments.
var knownColumns = []string{"name", "center_x_m", "center_y_m", "center_depth_m", "dip_deg", "dip_direction_deg", "length_m", "height_m"}

// ReadKnownFractures parses a known-fracture CSV (columns knownColumns, in
// any order, with a header). name is used in messages.
func ReadKnownFractures(r io.Reader, name string) ([]KnownFracture, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	header, err := cr.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("%s: empty file; want a header %s", name, strings.Join(knownColumns, ","))
	}
	if err != nil {
		return nil, csvError(name, err)
	}
	if !slices.ContainsFunc(header, func(h string) bool { return slices.Contains(knownColumns, strings.TrimSpace(h)) }) {
		// Not a header of ours at all (perhaps the wrong file): say so
		// without repeating what the file holds.
		return nil, fmt.Errorf("%s:1: the first line names none of the columns %s; is this the known-fracture table?", name, strings.Join(knownColumns, ","))
	}
	col := map[string]int{}
	for i, h := range header {
		h = strings.TrimSpace(h)
		if !slices.Contains(knownColumns, h) {
			line, _ := cr.FieldPos(i)
			return nil, fmt.Errorf("%s:%d: unknown column %s%s; columns: %s", name, line, echo(h), suggest(h, knownColumns), strings.Join(knownColumns, ","))
		}
		col[h] = i
	}
	for _, c := range knownColumns {
		if _, ok := col[c]; !ok {
			return nil, fmt.Errorf("%s:1: missing column %q; columns: %s", name, c, strings.Join(knownColumns, ","))
		}
	}
	var out []KnownFracture
	seen := map[string]int{} // name → line
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			return out, nil
		}
		if err != nil {
			return nil, csvError(name, err)
		}
		line, _ := cr.FieldPos(0)
		k, err := knownFracture(rec, col, name, line)
		if err != nil {
			return nil, err
		}
		if first, dup := seen[k.Name]; dup {
			return nil, fmt.Errorf("%s:%d: name %s repeats the name on line %d; names must be unique", name, line, echo(k.Name), first)
		}
		seen[k.Name] = line
		out = append(out, k)
	}
}

// knownFracture converts one record, checking every range.
func knownFracture(rec []string, col map[string]int, name string, line int) (KnownFracture, error) {
	k := KnownFracture{Name: strings.TrimSpace(rec[col["name"]]), Line: line}
	if k.Name == "" {
		return k, fmt.Errorf("%s:%d: name: must not be empty", name, line)
	}
	fields := []struct {
		col    string
		dst    *float64
		lo, hi float64
		loOpen bool
		scale  float64
	}{
		{"center_x_m", &k.X, math.Inf(-1), math.Inf(1), false, 1},
		{"center_y_m", &k.Y, math.Inf(-1), math.Inf(1), false, 1},
		{"center_depth_m", &k.Depth, 0, math.Inf(1), true, 1},
		{"dip_deg", &k.Dip, 0, 90, false, degree},
		{"dip_direction_deg", &k.DipDirection, 0, 360, false, degree},
		{"length_m", &k.Length, 0, math.Inf(1), true, 1},
		{"height_m", &k.Height, 0, math.Inf(1), true, 1},
	}
	for _, f := range fields {
		s := strings.TrimSpace(rec[col[f.col]])
		v, err := strconv.ParseFloat(s, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return k, fmt.Errorf("%s:%d: %s = %s: not a number", name, line, f.col, echo(s))
		}
		if v < f.lo || v > f.hi || (f.loOpen && v == f.lo) {
			r := rangeSpec{set: true, lo: f.lo, hi: f.hi, loOpen: f.loOpen}
			return k, fmt.Errorf("%s:%d: %s = %s: must be %s", name, line, f.col, s, r.describe(""))
		}
		*f.dst = v * f.scale
	}
	return k, nil
}

func csvError(name string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("%s:%d: %w", name, pe.Line, pe.Err)
	}
	return fmt.Errorf("%s: %w", name, err)
}
