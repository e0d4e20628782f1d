// Package csvw describes the CSV tables of an output folder in a W3C CSV
// on the Web metadata file (csv-metadata.json), so that every column's
// meaning, datatype and unit travels with the data.
//
// # Format
//
// The file is a JSON-LD document in the Metadata Vocabulary for Tabular
// Data (W3C Recommendation, 17 December 2015): a table group whose
// "tables" list every CSV of the folder by "url" (relative to the
// metadata file, "/"-separated), each with a "tableSchema" whose
// "columns" give, in header order:
//
//	name            the header text, percent-encoded where it is not a
//	                URI-template variable name (RFC 6570 §2.3), e.g. a
//	                sweep key "sets[1].size.min" becomes "sets%5B1%5D.size.min"
//	titles          the header text as written
//	datatype        a CSVW built-in datatype: double, integer, string,
//	                boolean or dateTime
//	dc:description  what the column holds
//	schema:unitText the unit as a UCUM code (e.g. m2, MPa, m3/s, N.m);
//	                absent for dimensionless columns and text
//
// Tables carry "dc:title" and "dc:description"; the group carries
// "dc:title", "dc:description" and "dc:creator" (the program). The
// prefixes dc: (Dublin Core terms) and schema: (schema.org) belong to the
// CSVW context's initial context, so no custom vocabulary is needed. The
// CSV files use the CSVW default dialect: UTF-8, comma separated, one
// header row, no comment lines; an empty field is a missing value (the
// default "null" of CSVW).
//
// A CSVW processor looks for csv-metadata.json in the folder of a CSV
// file (Model for Tabular Data and Metadata on the Web, §5.3), so a
// folder with CSV files in a sub-folder writes one metadata file in each.
//
// # References
//
// Tennison, J., Kellogg, G. and Herman, I. (eds.), 2015. Metadata
// Vocabulary for Tabular Data. W3C Recommendation, 17 December 2015.
// https://www.w3.org/TR/2015/REC-tabular-metadata-20151217/
//
// Tennison, J. and Kellogg, G. (eds.), 2015. Model for Tabular Data and
// Metadata on the Web. W3C Recommendation, 17 December 2015.
// https://www.w3.org/TR/2015/REC-tabular-data-model-20151217/
//
// Gregorio, J. et al., 2012. URI Template. RFC 6570. doi:10.17487/RFC6570.
//
// Schadow, G. and McDonald, C. J., The Unified Code for Units of Measure
// (UCUM), Regenstrief Institute. https://ucum.org/ucum
package csvw

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strings"
)

// FileName is the name of the metadata file in a folder.
const FileName = "csv-metadata.json"

// CSVW built-in datatypes used by slipfront's tables.
const (
	Double   = "double"
	Integer  = "integer"
	String   = "string"
	Boolean  = "boolean"
	DateTime = "dateTime"
)

// Column describes one column of a table.
type Column struct {
	// Title is the header text.
	Title string
	// Datatype is one of Double, Integer, String, Boolean, DateTime.
	Datatype string
	// Unit is the UCUM code of the column's unit, "" for none.
	Unit string
	// Description says what the column holds.
	Description string
}

// Table describes one CSV file.
type Table struct {
	// URL is the file's path relative to the metadata file, "/"-separated.
	URL string
	// Title and Description of the table.
	Title, Description string
	// Columns in header order.
	Columns []Column
}

// Header returns the table's header row.
func (t *Table) Header() []string {
	h := make([]string, len(t.Columns))
	for i, c := range t.Columns {
		h[i] = c.Title
	}
	return h
}

// Writer writes the records of a table as CSV under its header, and
// panics when a record does not have one field per column (a programmer
// error: the metadata would not describe the file).
type Writer struct {
	t  *Table
	cw *csv.Writer
}

// NewWriter returns a Writer of table t to w, having written the header.
func NewWriter(w io.Writer, t *Table) *Writer {
	tw := &Writer{t: t, cw: csv.NewWriter(w)}
	tw.cw.Write(t.Header())
	return tw
}

// Write writes one record.
func (w *Writer) Write(record []string) {
	if len(record) != len(w.t.Columns) {
		panic(fmt.Sprintf("csvw: %s: record of %d fields for %d columns", w.t.URL, len(record), len(w.t.Columns)))
	}
	w.cw.Write(record)
}

// Flush writes any buffered data and returns the first error of any write.
func (w *Writer) Flush() error {
	w.cw.Flush()
	return w.cw.Error()
}

// Group is the content of one metadata file.
type Group struct {
	// Title and Description of the folder's tables; Creator names the
	// program that wrote them.
	Title, Description, Creator string
	Tables                      []Table
}

type groupJSON struct {
	Context     [2]any      `json:"@context"`
	Title       string      `json:"dc:title"`
	Description string      `json:"dc:description,omitempty"`
	Creator     string      `json:"dc:creator,omitempty"`
	Tables      []tableJSON `json:"tables"`
}

type tableJSON struct {
	URL         string     `json:"url"`
	Title       string     `json:"dc:title,omitempty"`
	Description string     `json:"dc:description,omitempty"`
	Schema      schemaJSON `json:"tableSchema"`
}

type schemaJSON struct {
	Columns []columnJSON `json:"columns"`
}

type columnJSON struct {
	Name        string `json:"name"`
	Titles      string `json:"titles"`
	Datatype    string `json:"datatype"`
	Description string `json:"dc:description,omitempty"`
	Unit        string `json:"schema:unitText,omitempty"`
}

// Write writes g as indented JSON. It fails when a table has no URL or no
// columns, two tables share a URL, a column has an unknown datatype, or
// two columns of a table share a name.
func (g *Group) Write(w io.Writer) error {
	out := groupJSON{
		Context:     [2]any{"http://www.w3.org/ns/csvw", map[string]string{"@language": "en"}},
		Title:       g.Title,
		Description: g.Description,
		Creator:     g.Creator,
		Tables:      make([]tableJSON, 0, len(g.Tables)),
	}
	urls := map[string]bool{}
	for _, t := range g.Tables {
		if err := t.check(); err != nil {
			return err
		}
		if urls[t.URL] {
			return fmt.Errorf("csvw: table %s listed twice", t.URL)
		}
		urls[t.URL] = true
		tj := tableJSON{URL: t.URL, Title: t.Title, Description: t.Description}
		for _, c := range t.Columns {
			tj.Schema.Columns = append(tj.Schema.Columns, columnJSON{
				Name: Name(c.Title), Titles: c.Title, Datatype: c.Datatype, Description: c.Description, Unit: c.Unit})
		}
		out.Tables = append(out.Tables, tj)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(out)
}

// check reports the first problem of a table description.
func (t *Table) check() error {
	if t.URL == "" || len(t.Columns) == 0 {
		return fmt.Errorf("csvw: table %q: needs a URL and at least one column", t.URL)
	}
	names := map[string]bool{}
	for _, c := range t.Columns {
		switch c.Datatype {
		case Double, Integer, String, Boolean, DateTime:
		default:
			return fmt.Errorf("csvw: %s: column %q has datatype %q", t.URL, c.Title, c.Datatype)
		}
		n := Name(c.Title)
		if names[n] {
			return fmt.Errorf("csvw: %s: two columns are named %q", t.URL, n)
		}
		names[n] = true
	}
	return nil
}

// Name returns the CSVW column name of a header text: the text itself when
// it is a URI-template variable name (RFC 6570 §2.3: ALPHA, DIGIT and "_",
// with single dots between them) that does not start with "_" (reserved
// by CSVW); otherwise the text with every other byte percent-encoded
// (%XX, upper-case hex), and so a leading "_" or dot, a trailing dot and
// the second of two dots.
func Name(title string) string {
	if title == "" {
		return "%20" // not a header we write; keeps the name non-empty
	}
	var b strings.Builder
	for i := 0; i < len(title); i++ {
		c := title[i]
		varchar := c == '_' && i > 0 || 'A' <= c && c <= 'Z' || 'a' <= c && c <= 'z' || '0' <= c && c <= '9'
		dot := c == '.' && i > 0 && i < len(title)-1 && title[i-1] != '.'
		if varchar || dot {
			b.WriteByte(c)
			continue
		}
		fmt.Fprintf(&b, "%%%02X", c)
	}
	return b.String()
}
