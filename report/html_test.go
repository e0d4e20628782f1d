package report

import (
	"bytes"
	"encoding/base64"
	"strings"
	"testing"
)

func TestPageHTML(t *testing.T) {
	png := []byte("\x89PNG\r\n\x1a\n<fake>")
	p := &Page{Title: "Run <1>", Program: "slipfront 9.9", Date: "schedule start 2030-01-01T00:00:00Z",
		Facts: [][2]string{{"seed", "7"}}, Notes: []string{"BHP > Shmin"},
		Tables: []Table{{Caption: "Stages", Header: []string{"stage", "events"}, Rows: [][]string{{"W1:1", "12"}}}},
		Images: []Image{{File: "map.png", Caption: "Map"}, {File: "mohr.png", Caption: "Mohr & envelope", Data: png}},
		Inputs: []Table{{Caption: "Resolved scenario", Header: []string{"key", "value"}, Rows: [][]string{{"layer.depth", "2600 m"}}}}}
	var b bytes.Buffer
	if err := p.WriteHTML(&b); err != nil {
		t.Fatal(err)
	}
	html := b.String()
	for _, want := range []string{"Run &lt;1&gt;", PageCaution, "<td>12</td>", `src="map.png"`, "BHP &gt; Shmin",
		"slipfront 9.9 · schedule start 2030-01-01T00:00:00Z", "<h2>Inputs</h2>", "<td>layer.depth</td><td>2600 m</td>",
		`src="data:image/png;base64,` + base64.StdEncoding.EncodeToString(png) + `"`, "Mohr &amp; envelope <code>mohr.png</code>"} {
		if !strings.Contains(html, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	// Pictures come before the inputs.
	if strings.Index(html, "<h2>Pictures</h2>") > strings.Index(html, "<h2>Inputs</h2>") {
		t.Error("the inputs come before the pictures")
	}
}
