package batch

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// Probability-grid file: UTF-8 text, "\n" line ends.
//
//	# slipfront probability grid, format 1
//	# note: probability = count / realizations; unlisted cells are 0; row 0 is the south edge
//	# case: 0
//	# label: fluids.slickwater.viscosity=1 cP
//	# realizations: 20
//	# crs: EPSG:32614
//	# origin_easting_m: 612000
//	# origin_northing_m: 3540000
//	# x_min_m: -800
//	# y_min_m: -500
//	# cell_size_m: 10
//	# cols: 160
//	# rows: 100
//	col,row,x_center_m,y_center_m,count,probability
//	81,37,15,-125,3,0.15
//	…
//
// The first line is fixed. Then come "# key: value" lines with the keys
// above, each exactly once, in any order ("note" is free text and
// optional). The CSV header follows, then one row per cell stimulated in
// at least one realization, in ascending cell index (row·cols + col):
// column, row, the cell centre in local metres, the number of
// realizations in which the cell was stimulated, and that number divided
// by realizations.
const (
	probGridMagic = "# slipfront probability grid, format 1"
	probGridNote  = "probability = count / realizations; unlisted cells are 0; row 0 is the south edge"
	probGridHead  = "col,row,x_center_m,y_center_m,count,probability"
)

// ProbabilityGrid is the share of a case's realizations in which each map
// cell was stimulated.
type ProbabilityGrid struct {
	// Case index and label (Case.Label).
	Case  int
	Label string
	// Realizations counted.
	Realizations int
	// Grid of the map.
	Grid Grid
	// Cells stimulated at least once, in ascending index.
	Cells []CellCount
}

// CellCount is the number of realizations in which one cell was
// stimulated.
type CellCount struct {
	Index, Count int
}

// Probability returns Count / realizations of cell c.
func (p *ProbabilityGrid) Probability(c CellCount) float64 {
	return float64(c.Count) / float64(p.Realizations)
}

// Dense returns the probability of every cell, row-major from the south
// edge (index row·Cols + col), zero where not stimulated.
func (p *ProbabilityGrid) Dense() []float64 {
	out := make([]float64, p.Grid.Cells())
	for _, c := range p.Cells {
		out[c.Index] = p.Probability(c)
	}
	return out
}

// WriteProbabilityGrid writes p in the probability-grid format.
func WriteProbabilityGrid(w io.Writer, p *ProbabilityGrid) error {
	if err := p.check(); err != nil {
		return fmt.Errorf("batch: writing probability grid: %w", err)
	}
	var b bytes.Buffer
	g := p.Grid
	fmt.Fprintf(&b, "%s\n# note: %s\n", probGridMagic, probGridNote)
	for _, kv := range [][2]string{
		{"case", strconv.Itoa(p.Case)},
		{"label", p.Label},
		{"realizations", strconv.Itoa(p.Realizations)},
		{"crs", g.CRS},
		{"origin_easting_m", formatFloat(g.OriginEasting)},
		{"origin_northing_m", formatFloat(g.OriginNorthing)},
		{"x_min_m", formatFloat(g.XMin)},
		{"y_min_m", formatFloat(g.YMin)},
		{"cell_size_m", formatFloat(g.CellSize)},
		{"cols", strconv.Itoa(g.Cols)},
		{"rows", strconv.Itoa(g.Rows)},
	} {
		fmt.Fprintf(&b, "# %s: %s\n", kv[0], kv[1])
	}
	b.WriteString(probGridHead + "\n")
	for _, c := range p.Cells {
		col, row := g.ColRow(c.Index)
		x, y := g.Centre(c.Index)
		fmt.Fprintf(&b, "%d,%d,%s,%s,%d,%s\n", col, row, formatFloat(x), formatFloat(y), c.Count, formatFloat(p.Probability(c)))
	}
	_, err := w.Write(b.Bytes())
	return err
}

// check reports the first value the format cannot hold.
func (p *ProbabilityGrid) check() error {
	if err := p.Grid.valid(); err != nil {
		return err
	}
	switch {
	case p.Case < 0:
		return fmt.Errorf("case %d: must be ≥ 0", p.Case)
	case p.Realizations < 1:
		return fmt.Errorf("realizations %d: must be ≥ 1", p.Realizations)
	case strings.ContainsAny(p.Label, "\r\n") || strings.ContainsAny(p.Grid.CRS, "\r\n"):
		return fmt.Errorf("label or CRS holds a line break")
	}
	for i, c := range p.Cells {
		switch {
		case c.Index < 0 || c.Index >= p.Grid.Cells() || i > 0 && c.Index <= p.Cells[i-1].Index:
			return fmt.Errorf("cell %d: index %d must be in [0, %d) and ascending", i, c.Index, p.Grid.Cells())
		case c.Count < 1 || c.Count > p.Realizations:
			return fmt.Errorf("cell %d: count %d must be 1 to %d", i, c.Count, p.Realizations)
		}
	}
	return nil
}

// ReadProbabilityGrid reads a probability-grid file. Malformed input
// returns an error matching ErrFormat that names the line; it never
// panics.
func ReadProbabilityGrid(r io.Reader) (*ProbabilityGrid, error) {
	rd := &gridReader{sc: bufio.NewScanner(r)}
	rd.sc.Buffer(make([]byte, 0, 4096), maxGridLine)
	p, err := rd.read()
	if err != nil {
		return nil, err
	}
	return p, nil
}

// maxGridLine caps a line of a probability-grid file, bytes.
const maxGridLine = 1 << 20

type gridReader struct {
	sc   *bufio.Scanner
	line int
}

func (rd *gridReader) fail(format string, args ...any) error {
	return &FormatError{What: "probability grid", Line: rd.line, Msg: fmt.Sprintf(format, args...)}
}

// scanErr is the scanner's error, if any, naming the line.
func (rd *gridReader) scanErr() error {
	err := rd.sc.Err()
	switch {
	case err == nil:
		return nil
	case errors.Is(err, bufio.ErrTooLong):
		rd.line++
		return rd.fail("line longer than %d bytes", maxGridLine)
	}
	return fmt.Errorf("batch: probability grid after line %d: %w", rd.line, err)
}

func (rd *gridReader) next() (string, error) {
	if !rd.sc.Scan() {
		if err := rd.scanErr(); err != nil {
			return "", err
		}
		return "", fmt.Errorf("batch: probability grid after line %d: %w", rd.line, io.ErrUnexpectedEOF)
	}
	rd.line++
	return rd.sc.Text(), nil
}

func (rd *gridReader) read() (*ProbabilityGrid, error) {
	first, err := rd.next()
	if err != nil {
		return nil, err
	}
	if first != probGridMagic {
		return nil, rd.fail("first line %.60q: not a slipfront probability grid (want %q)", first, probGridMagic)
	}
	meta, err := rd.readMeta()
	if err != nil {
		return nil, err
	}
	p := &ProbabilityGrid{}
	if err := rd.applyMeta(p, meta); err != nil {
		return nil, err
	}
	for {
		if !rd.sc.Scan() {
			if err := rd.scanErr(); err != nil {
				return nil, err
			}
			return p, nil
		}
		rd.line++
		c, err := rd.parseRow(p, rd.sc.Text())
		if err != nil {
			return nil, err
		}
		p.Cells = append(p.Cells, c)
	}
}

var probGridKeys = []string{"case", "label", "realizations", "crs", "origin_easting_m", "origin_northing_m",
	"x_min_m", "y_min_m", "cell_size_m", "cols", "rows"}

// readMeta reads "# key: value" lines up to and including the CSV header.
func (rd *gridReader) readMeta() (map[string]string, error) {
	meta := map[string]string{}
	for {
		text, err := rd.next()
		if err != nil {
			return nil, err
		}
		if text == probGridHead {
			break
		}
		rest, ok := strings.CutPrefix(text, "# ")
		key, val, ok2 := strings.Cut(rest, ": ")
		if !ok || !ok2 {
			if ok && strings.HasSuffix(rest, ":") && !strings.Contains(rest, " ") {
				key, val, ok2 = strings.TrimSuffix(rest, ":"), "", true
			}
			if !ok2 {
				return nil, rd.fail("%.60q: want \"# key: value\" or the header %q", text, probGridHead)
			}
		}
		if _, dup := meta[key]; dup {
			return nil, rd.fail("key %q given twice", key)
		}
		known := key == "note"
		for _, k := range probGridKeys {
			known = known || k == key
		}
		if !known {
			return nil, rd.fail("unknown key %.40q; known: %s", key, strings.Join(probGridKeys, ", "))
		}
		meta[key] = val
	}
	for _, k := range probGridKeys {
		if _, ok := meta[k]; !ok {
			return nil, rd.fail("header line reached without key %q", k)
		}
	}
	return meta, nil
}

func (rd *gridReader) applyMeta(p *ProbabilityGrid, meta map[string]string) error {
	var err error
	ints := map[string]*int{"case": &p.Case, "realizations": &p.Realizations, "cols": &p.Grid.Cols, "rows": &p.Grid.Rows}
	for k, dst := range ints {
		if *dst, err = strconv.Atoi(meta[k]); err != nil {
			return rd.fail("%s: %q is not a whole number", k, meta[k])
		}
	}
	floats := map[string]*float64{"origin_easting_m": &p.Grid.OriginEasting, "origin_northing_m": &p.Grid.OriginNorthing,
		"x_min_m": &p.Grid.XMin, "y_min_m": &p.Grid.YMin, "cell_size_m": &p.Grid.CellSize}
	for k, dst := range floats {
		if *dst, err = strconv.ParseFloat(meta[k], 64); err != nil {
			return rd.fail("%s: %q is not a number", k, meta[k])
		}
	}
	p.Label, p.Grid.CRS = meta["label"], meta["crs"]
	if err := p.check(); err != nil {
		return rd.fail("%v", err)
	}
	return nil
}

// Tolerances of the derived columns, which a reader recomputes: the
// centre within a millionth of a cell, the probability within 1e-12
// (both far above the rounding of the shortest decimal form, far below
// anything meaningful).
const (
	centreTol      = 1e-6
	probabilityTol = 1e-12
)

func (rd *gridReader) parseRow(p *ProbabilityGrid, text string) (CellCount, error) {
	f := strings.Split(text, ",")
	if len(f) != 6 {
		return CellCount{}, rd.fail("%d fields, want 6 (%s)", len(f), probGridHead)
	}
	var n [3]int
	for i, k := range []int{0, 1, 4} {
		v, err := strconv.Atoi(f[k])
		if err != nil {
			return CellCount{}, rd.fail("field %d %.30q is not a whole number", k+1, f[k])
		}
		n[i] = v
	}
	var x [3]float64
	for i, k := range []int{2, 3, 5} {
		v, err := strconv.ParseFloat(f[k], 64)
		if err != nil || !finite(v) {
			return CellCount{}, rd.fail("field %d %.30q is not a finite number", k+1, f[k])
		}
		x[i] = v
	}
	g, col, row := p.Grid, n[0], n[1]
	if col < 0 || col >= g.Cols || row < 0 || row >= g.Rows {
		return CellCount{}, rd.fail("cell (%d, %d) outside the %d × %d grid", col, row, g.Cols, g.Rows)
	}
	c := CellCount{Index: g.Index(col, row), Count: n[2]}
	if k := len(p.Cells); k > 0 && c.Index <= p.Cells[k-1].Index {
		return CellCount{}, rd.fail("cell (%d, %d) is out of order or repeated: rows must be in ascending row·cols+col", col, row)
	}
	if c.Count < 1 || c.Count > p.Realizations {
		return CellCount{}, rd.fail("count %d: must be 1 to %d", c.Count, p.Realizations)
	}
	cx, cy := g.Centre(c.Index)
	if math.Abs(x[0]-cx) > centreTol*g.CellSize || math.Abs(x[1]-cy) > centreTol*g.CellSize {
		return CellCount{}, rd.fail("centre (%g, %g) is not the centre (%g, %g) of cell (%d, %d)", x[0], x[1], cx, cy, col, row)
	}
	if math.Abs(x[2]-p.Probability(c)) > probabilityTol {
		return CellCount{}, rd.fail("probability %g is not count/realizations = %g", x[2], p.Probability(c))
	}
	return c, nil
}

// formatFloat is the deterministic decimal form of every number in the
// batch's text files: the shortest that reads back to the same float64,
// without an exponent.
func formatFloat(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
