package report

import (
	"bytes"
	"strings"
	"testing"
)

func TestPageHTML(t *testing.T) {
	p := &Page{Title: "Run <1>", Facts: [][2]string{{"seed", "7"}}, Notes: []string{"BHP > Shmin"},
		Tables: []Table{{Caption: "Stages", Header: []string{"stage", "events"}, Rows: [][]string{{"W1:1", "12"}}}},
		Images: []Image{{File: "map.png", Caption: "Map"}}}
	var b bytes.Buffer
	if err := p.WriteHTML(&b); err != nil {
		t.Fatal(err)
	}
	html := b.String()
	for _, want := range []string{"Run &lt;1&gt;", PageCaution, "<td>12</td>", `src="map.png"`, "BHP &gt; Shmin"} {
		if !strings.Contains(html, want) {
			t.Errorf("page lacks %q", want)
		}
	}
}
