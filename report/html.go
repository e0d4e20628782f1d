package report

import (
	"html/template"
	"io"
	"slipfront/internal/caution"
)

// Page is an HTML page that gathers a run's or a batch's numbers and
// pictures; Caution is always printed on it. Text is escaped.
type Page struct {
	Title string
	// Facts are label–value pairs shown first.
	Facts [][2]string
	// Notes are warnings, shown highlighted.
	Notes  []string
	Tables []Table
	// Images are pictures beside the page (relative file names).
	Images []Image
}

// Table is a captioned table of text.
type Table struct {
	Caption string
	Header  []string
	Rows    [][]string
}

// Image is a picture file with a caption.
type Image struct {
	File, Caption string
}

var pageTemplate = template.Must(template.New("page").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>{{.Title}}</title>
<style>
body { font-family: sans-serif; max-width: 70em; margin: 2em auto; padding: 0 1em; color: #222; }
table { border-collapse: collapse; margin: 1em 0; }
th, td { border: 1px solid #bbb; padding: 0.25em 0.6em; text-align: right; }
th { background: #eee; } td:first-child, th:first-child { text-align: left; }
.caution { border-left: 4px solid #d55e00; padding: 0.5em 1em; background: #fff4ec; }
.note { border-left: 4px solid #e69f00; padding: 0.3em 1em; background: #fffbe6; }
figure { margin: 1.5em 0; } img { max-width: 100%; border: 1px solid #ddd; }
</style>
</head>
<body>
<h1>{{.Title}}</h1>
<p class="caution">{{.Caution}}</p>
{{with .Facts}}<table>{{range .}}<tr><th>{{index . 0}}</th><td>{{index . 1}}</td></tr>{{end}}</table>{{end}}
{{range .Notes}}<p class="note">{{.}}</p>
{{end}}{{range .Tables}}<table><caption>{{.Caption}}</caption>
<tr>{{range .Header}}<th>{{.}}</th>{{end}}</tr>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</table>
{{end}}{{range .Images}}<figure><img src="{{.File}}" alt="{{.Caption}}"><figcaption>{{.Caption}}</figcaption></figure>
{{end}}</body>
</html>
`))

// WriteHTML writes the page.
func (p *Page) WriteHTML(w io.Writer) error {
	return pageTemplate.Execute(w, struct {
		*Page
		Caution string
	}{p, PageCaution})
}

// PageCaution is the caution printed on every HTML page.
const PageCaution = caution.Text
