package csvw

import (
	"bytes"
	"encoding/json"
	"regexp"
	"strings"
	"testing"
)

// varnameRE is RFC 6570 §2.3: varname = varchar *( ["."] varchar ),
// varchar = ALPHA / DIGIT / "_" / pct-encoded.
var varnameRE = regexp.MustCompile(`^([A-Za-z0-9_]|%[0-9A-F]{2})+(\.?([A-Za-z0-9_]|%[0-9A-F]{2}))*$`)

func TestName(t *testing.T) {
	for _, tc := range []struct{ title, want string }{
		{"time_s", "time_s"},
		{"fluids.slickwater.viscosity", "fluids.slickwater.viscosity"},
		{"sets[1].size.min", "sets%5B1%5D.size.min"},
		{"_hidden", "%5Fhidden"},
		{"a b", "a%20b"},
		{"a..b", "a.%2Eb"},
		{".a", "%2Ea"},
		{"a.", "a%2E"},
		{"100%", "100%25"},
		{"ü", "%C3%BC"},
		{"", "%20"},
	} {
		got := Name(tc.title)
		if got != tc.want {
			t.Errorf("Name(%q) = %q, want %q", tc.title, got, tc.want)
		}
		if !varnameRE.MatchString(got) || strings.HasPrefix(got, "_") {
			t.Errorf("Name(%q) = %q is not a URI-template variable name CSVW allows", tc.title, got)
		}
	}
}

func sampleGroup() *Group {
	return &Group{Title: "run", Description: "tables of a run", Creator: "slipfront test", Tables: []Table{
		{URL: "timeline.csv", Title: "timeline", Description: "one row per output time", Columns: []Column{
			{Title: "time_s", Datatype: Double, Unit: "s", Description: "time since the start of pumping"},
			{Title: "stage", Datatype: String, Description: "stage name"},
		}},
		{URL: "sub/case-0000.csv", Columns: []Column{{Title: "count", Datatype: Integer}}},
	}}
}

// The written document has the CSVW structure: a context, one table per
// file with its url, and columns with name, titles, datatype, description
// and unit in header order.
func TestWrite(t *testing.T) {
	var b bytes.Buffer
	if err := sampleGroup().Write(&b); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Context []any  `json:"@context"`
		Title   string `json:"dc:title"`
		Tables  []struct {
			URL    string `json:"url"`
			Schema struct {
				Columns []map[string]string `json:"columns"`
			} `json:"tableSchema"`
		} `json:"tables"`
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatalf("%v\n%s", err, b.String())
	}
	if len(doc.Context) != 2 || doc.Context[0] != "http://www.w3.org/ns/csvw" || doc.Title != "run" {
		t.Errorf("context %v, title %q", doc.Context, doc.Title)
	}
	if len(doc.Tables) != 2 || doc.Tables[0].URL != "timeline.csv" || doc.Tables[1].URL != "sub/case-0000.csv" {
		t.Fatalf("tables %+v", doc.Tables)
	}
	cols := doc.Tables[0].Schema.Columns
	want := []map[string]string{
		{"name": "time_s", "titles": "time_s", "datatype": "double", "dc:description": "time since the start of pumping", "schema:unitText": "s"},
		{"name": "stage", "titles": "stage", "datatype": "string", "dc:description": "stage name"},
	}
	if len(cols) != len(want) {
		t.Fatalf("%d columns, want %d", len(cols), len(want))
	}
	for i := range want {
		if len(cols[i]) != len(want[i]) {
			t.Errorf("column %d: %v, want %v", i, cols[i], want[i])
		}
		for k, v := range want[i] {
			if cols[i][k] != v {
				t.Errorf("column %d %s = %q, want %q", i, k, cols[i][k], v)
			}
		}
	}
}

func TestWriteRejects(t *testing.T) {
	for _, tc := range []struct {
		name string
		edit func(g *Group)
	}{
		{"no url", func(g *Group) { g.Tables[0].URL = "" }},
		{"no columns", func(g *Group) { g.Tables[1].Columns = nil }},
		{"same url twice", func(g *Group) { g.Tables[1].URL = g.Tables[0].URL }},
		{"unknown datatype", func(g *Group) { g.Tables[0].Columns[0].Datatype = "float" }},
		{"same column twice", func(g *Group) { g.Tables[0].Columns[1].Title = "time_s" }},
	} {
		g := sampleGroup()
		tc.edit(g)
		if err := g.Write(&bytes.Buffer{}); err == nil {
			t.Errorf("%s: written", tc.name)
		}
	}
}

func TestWriterHeaderAndRecords(t *testing.T) {
	g := sampleGroup()
	var b bytes.Buffer
	w := NewWriter(&b, &g.Tables[0])
	w.Write([]string{"0.5", "W1:1"})
	w.Write([]string{"1", ""})
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	if got, want := b.String(), "time_s,stage\n0.5,W1:1\n1,\n"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "csvw: ") {
			t.Errorf("a short record did not panic with the package prefix: %v", r)
		}
	}()
	w.Write([]string{"2"})
}
