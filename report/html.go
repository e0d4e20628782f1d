package report

import (
	"encoding/base64"
	"html/template"
	"io"
	"slipfront/internal/caution"
)

// Page is an HTML page that gathers a folder's numbers and pictures;
// Caution is always printed on it. Text is escaped. The page loads
// nothing from elsewhere: its style is inline and an image with Data is
// embedded as a data URI (RFC 2397), so that the page alone can be sent.
//
// The parts come in this order: the title, the caution, Program and Date,
// Facts, Notes, Tables, Images, and last the Inputs under their own
// heading.
type Page struct {
	Title string
	// Program names the program and its version, e.g. "slipfront 0.1.0";
	// Date says when the inputs place the results (not when the page was
	// written, so that the same inputs give the same page).
	Program, Date string
	// Facts are label–value pairs shown first.
	Facts [][2]string
	// Notes are warnings, shown highlighted.
	Notes  []string
	Tables []Table
	// Images are pictures with captions.
	Images []Image
	// Inputs are the tables of what the results were computed from, e.g.
	// the resolved scenario with units.
	Inputs []Table
}

// Table is a captioned table of text.
type Table struct {
	Caption string
	Header  []string
	Rows    [][]string
}

// Image is a picture with a caption: File is its name beside the page,
// and Data, when not nil, its PNG bytes, embedded in the page.
type Image struct {
	File, Caption string
	Data          []byte
}

// src is the image's source: a data URI of Data (RFC 2397, media type
// image/png), or the file name.
func (im Image) src() any {
	if im.Data == nil {
		return im.File
	}
	return template.URL("data:image/png;base64," + base64.StdEncoding.EncodeToString(im.Data)) // A URI we built: trusted.
}

var pageTemplate = template.Must(template.New("page").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>{{.Title}}</title>
<style>
body { font-family: sans-serif; max-width: 70em; margin: 2em auto; padding: 0 1em; color: #222; }
table { border-collapse: collapse; margin: 1em 0; }
caption { text-align: left; font-weight: bold; padding: 0.3em 0; }
th, td { border: 1px solid #bbb; padding: 0.25em 0.6em; text-align: right; }
th { background: #eee; } td:first-child, th:first-child { text-align: left; }
table.inputs td { text-align: left; }
.caution { border-left: 4px solid #d55e00; padding: 0.5em 1em; background: #fff4ec; }
.note { border-left: 4px solid #e69f00; padding: 0.3em 1em; background: #fffbe6; }
.meta { color: #555; }
figure { margin: 1.5em 0; } img { max-width: 100%; border: 1px solid #ddd; }
figcaption { margin-top: 0.3em; }
</style>
</head>
<body>
<h1>{{.Title}}</h1>
<p class="caution">{{.Caution}}</p>
{{if or .Program .Date}}<p class="meta">{{.Program}}{{if and .Program .Date}} · {{end}}{{.Date}}</p>
{{end}}{{with .Facts}}<table>{{range .}}<tr><th>{{index . 0}}</th><td>{{index . 1}}</td></tr>{{end}}</table>{{end}}
{{range .Notes}}<p class="note">{{.}}</p>
{{end}}{{range .Tables}}<table><caption>{{.Caption}}</caption>
<tr>{{range .Header}}<th>{{.}}</th>{{end}}</tr>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</table>
{{end}}{{with .Figures}}<h2>Pictures</h2>
{{range .}}<figure><img src="{{.Src}}" alt="{{.Caption}}"><figcaption>{{.Caption}} <code>{{.File}}</code></figcaption></figure>
{{end}}{{end}}{{with .Inputs}}<h2>Inputs</h2>
{{range .}}<table class="inputs"><caption>{{.Caption}}</caption>
<tr>{{range .Header}}<th>{{.}}</th>{{end}}</tr>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</table>
{{end}}{{end}}</body>
</html>
`))

// figure is an image as the template draws it.
type figure struct {
	Src           any
	Caption, File string
}

// WriteHTML writes the page.
func (p *Page) WriteHTML(w io.Writer) error {
	figures := make([]figure, len(p.Images))
	for i, im := range p.Images {
		figures[i] = figure{Src: im.src(), Caption: im.Caption, File: im.File}
	}
	return pageTemplate.Execute(w, struct {
		*Page
		Caution string
		Figures []figure
	}{p, PageCaution, figures})
}

// PageCaution is the caution printed on every HTML page.
const PageCaution = caution.Text
