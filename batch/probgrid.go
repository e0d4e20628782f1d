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

	"slipfront/internal/csvw"
)

// Probability-grid file: plain CSV (RFC 4180, UTF-8, "\n" line ends), one
// header row and no comment lines:
//
//	col,row,x_center_m,y_center_m,stimulated_realizations,stimulation_probability
//	81,37,15,-125,3,0.15
//	…
//
// then one row per cell stimulated in at least one realization, in
// ascending cell index (row·cols + col): column, row (0 = south), the
// cell centre in local metres, the number of realizations
// in which the cell was stimulated, and that number divided by the
// realizations. Unlisted cells were never stimulated. The grid itself
// (CRS, origin, corner, cell size, columns, rows) and the realization
// count are the case's in manifest.json; the folder's csv-metadata.json
// repeats them for other readers.
var probGridTable = csvw.Table{
	Title: "stimulation probability",
	Columns: []csvw.Column{
		{Title: "col", Datatype: csvw.Integer, Description: "column of the map cell, 0 at the west edge"},
		{Title: "row", Datatype: csvw.Integer, Description: "row of the map cell, 0 at the south edge"},
		{Title: "x_center_m", Datatype: csvw.Double, Unit: "m", Description: "cell centre, local east of the scenario origin"},
		{Title: "y_center_m", Datatype: csvw.Double, Unit: "m", Description: "cell centre, local north of the scenario origin"},
		{Title: "stimulated_realizations", Datatype: csvw.Integer, Description: "realizations of the case in which the cell was stimulated"},
		{Title: "stimulation_probability", Datatype: csvw.Double, Description: "stimulated_realizations divided by the case's realizations, 0 to 1"},
	},
}

// probGridHead is the header row of a probability grid.
var probGridHead = strings.Join(probGridTable.Header(), ",")

// probabilityTable describes case p's probability grid for the CSV
// metadata of the probability folder, with the grid's geometry.
func probabilityTable(p *ProbabilityGrid) csvw.Table {
	t := probGridTable
	t.URL = probabilityGridFile(p.Case)
	g := p.Grid
	crs := g.CRS
	switch {
	case crs == "":
		crs = "an undefined local frame"
	case !strings.HasPrefix(crs, "EPSG:"):
		crs = "the CRS given as WKT in manifest.json"
	}
	t.Title = fmt.Sprintf("stimulation probability, case %d", p.Case)
	t.Description = fmt.Sprintf("Case %d (%s), %d realizations: the share of them in which each map cell was stimulated; "+
		"unlisted cells are 0. Grid: %d columns × %d rows of %s m cells, south-west corner at local (%s, %s) m; "+
		"local (0, 0) is easting %s m, northing %s m (in metres, whatever the CRS's unit) in %s.",
		p.Case, p.Label, p.Realizations, g.Cols, g.Rows, formatFloat(g.CellSize), formatFloat(g.XMin), formatFloat(g.YMin),
		formatFloat(g.OriginEasting), formatFloat(g.OriginNorthing), crs)
	return t
}

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

// ReadProbabilityGrid reads the probability grid of case c of the batch
// whose manifest is m (the manifest gives the grid and the realization
// count). Malformed input returns an error matching ErrFormat that names
// the line; a file cut before its header returns io.ErrUnexpectedEOF. It
// never panics.
func ReadProbabilityGrid(r io.Reader, m *Manifest, c int) (*ProbabilityGrid, error) {
	if c < 0 || c >= len(m.Cases) {
		return nil, fmt.Errorf("batch: probability grid of case %d: the batch has %d cases", c, len(m.Cases))
	}
	p := &ProbabilityGrid{Case: c, Label: m.Cases[c].Label, Realizations: m.Realizations, Grid: m.Cases[c].Grid}
	if err := p.check(); err != nil {
		return nil, &FormatError{What: "manifest.json", Offset: -1, Msg: err.Error()}
	}
	rd := &gridReader{sc: bufio.NewScanner(r)}
	rd.sc.Buffer(make([]byte, 0, 4096), maxGridLine)
	head, err := rd.next()
	if err != nil {
		return nil, err
	}
	if head != probGridHead {
		return nil, rd.fail("header %.100q: not a slipfront probability grid (want %q)", head, probGridHead)
	}
	for {
		if !rd.sc.Scan() {
			if err := rd.scanErr(); err != nil {
				return nil, err
			}
			return p, nil
		}
		rd.line++
		cell, err := rd.parseRow(p, rd.sc.Text())
		if err != nil {
			return nil, err
		}
		p.Cells = append(p.Cells, cell)
	}
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
	if len(f) != len(probGridTable.Columns) {
		return CellCount{}, rd.fail("%d fields, want %d (%s)", len(f), len(probGridTable.Columns), probGridHead)
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
		return CellCount{}, rd.fail("stimulated_realizations %d: must be 1 to %d", c.Count, p.Realizations)
	}
	cx, cy := g.Centre(c.Index)
	tol := centreTol * g.CellSize
	if math.Abs(x[0]-cx) > tol || math.Abs(x[1]-cy) > tol {
		return CellCount{}, rd.fail("centre (%g, %g) is not the centre (%g, %g) of cell (%d, %d)", x[0], x[1], cx, cy, col, row)
	}
	if math.Abs(x[2]-p.Probability(c)) > probabilityTol {
		return CellCount{}, rd.fail("stimulation_probability %g is not stimulated_realizations/realizations = %g", x[2], p.Probability(c))
	}
	return c, nil
}

// formatFloat is the deterministic decimal form of every number in the
// batch's text files: the shortest that reads back to the same float64,
// without an exponent.
func formatFloat(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
