package report

import (
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"strings"
)

// Review is a design-review document: written as Markdown (with PNG files
// beside it) and as one self-contained HTML file (images embedded).
type Review struct {
	Title      string
	Subtitle   string
	Sections   []Section
	Figures    []Figure
	Provenance [][2]string
	Caution    string
	SignOff    *SignOff   // the first page, when set (signoff.go)
	Appendices []Appendix // after the provenance (signoff.go)
}

// Section is a heading with paragraphs and an optional table.
type Section struct {
	Heading    string
	Paragraphs []string
	Table      *Table
}

// Table is a plain table of text cells.
type Table struct {
	Header []string
	Rows   [][]string
}

// Figure is one picture of the review.
type Figure struct {
	File    string // PNG file name beside the Markdown report
	Caption string
	PNG     []byte
}

// WriteMarkdown writes the review as Markdown; pictures are referenced by
// their file names.
func (r *Review) WriteMarkdown(w io.Writer) error {
	var b strings.Builder
	if r.SignOff != nil {
		r.SignOff.writeMarkdown(&b)
	}
	fmt.Fprintf(&b, "# %s\n\n", r.Title)
	if r.Subtitle != "" {
		fmt.Fprintf(&b, "%s\n\n", r.Subtitle)
	}
	fmt.Fprintf(&b, "> **%s**\n\n", r.Caution)
	for _, s := range r.Sections {
		fmt.Fprintf(&b, "## %s\n\n", s.Heading)
		for _, p := range s.Paragraphs {
			fmt.Fprintf(&b, "%s\n\n", p)
		}
		if s.Table != nil {
			writeMDTable(&b, s.Table)
		}
	}
	if len(r.Figures) > 0 {
		b.WriteString("## Figures\n\n")
		for _, f := range r.Figures {
			fmt.Fprintf(&b, "![%s](%s)\n\n*%s*\n\n", mdEscape(f.Caption), f.File, mdEscape(f.Caption))
		}
	}
	b.WriteString("## Provenance\n\n")
	writeMDTable(&b, &Table{Header: []string{"item", "value"}, Rows: pairs(r.Provenance)})
	writeAppendicesMarkdown(&b, r.Appendices)
	fmt.Fprintf(&b, "> **%s**\n", r.Caution)
	_, err := io.WriteString(w, b.String())
	return err
}

func pairs(ps [][2]string) [][]string {
	out := make([][]string, len(ps))
	for i, p := range ps {
		out[i] = []string{p[0], p[1]}
	}
	return out
}

func mdEscape(s string) string {
	return strings.NewReplacer("|", "\\|", "*", "\\*", "_", "\\_").Replace(s)
}

func writeMDTable(b *strings.Builder, t *Table) {
	b.WriteString("| " + strings.Join(escapeAll(t.Header), " | ") + " |\n|")
	for range t.Header {
		b.WriteString("---|")
	}
	b.WriteString("\n")
	for _, r := range t.Rows {
		b.WriteString("| " + strings.Join(escapeAll(r), " | ") + " |\n")
	}
	b.WriteString("\n")
}

func escapeAll(cells []string) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = strings.ReplaceAll(c, "|", "\\|")
	}
	return out
}

// The HTML page needs nothing from the network: styles inline, images as
// data URIs. A small script marks the body with data-images-ok once every
// image has decoded, which the browser test reads.
var page = template.Must(template.New("review").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:; style-src 'unsafe-inline'; script-src 'unsafe-inline'">
<title>{{.Title}}</title>
<style>
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; max-width: 60em; margin: 2em auto; padding: 0 1em; color: #111; line-height: 1.4; }
h1 { font-size: 1.6em; border-bottom: 2px solid #0072b2; padding-bottom: .2em; }
h2 { font-size: 1.25em; margin-top: 1.6em; color: #0072b2; }
table { border-collapse: collapse; margin: .6em 0 1em; font-size: .92em; }
th, td { border: 1px solid #bbb; padding: .25em .6em; text-align: left; vertical-align: top; }
th { background: #eef3f8; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
.caution { border: 2px solid #d55e00; background: #fff4ec; padding: .6em 1em; font-weight: bold; }
figure { margin: 1.2em 0; page-break-inside: avoid; }
figure img { max-width: 100%; border: 1px solid #ddd; }
figcaption { font-style: italic; font-size: .92em; }
pre.verbatim { font-size: .8em; white-space: pre-wrap; border: 1px solid #ddd; padding: .5em; }
@media print { body { max-width: none; margin: 0; } h2 { page-break-after: avoid; } table, figure { page-break-inside: avoid; } }
</style>
</head>
<body>
{{with .SignOff}}{{template "signoff" .}}{{end}}<h1>{{.Title}}</h1>
{{if .Subtitle}}<p>{{.Subtitle}}</p>{{end}}
<p class="caution">{{.Caution}}</p>
{{range .Sections}}<h2>{{.Heading}}</h2>
{{range .Paragraphs}}<p>{{.}}</p>
{{end}}{{with .Table}}<table><thead><tr>{{range .Header}}<th>{{.}}</th>{{end}}</tr></thead><tbody>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</tbody></table>{{end}}
{{end}}{{if .Figures}}<h2>Figures</h2>
{{range .Figures}}<figure><img src="{{.Src}}" alt="{{.Caption}}"><figcaption>{{.Caption}}</figcaption></figure>
{{end}}{{end}}<h2>Provenance</h2>
<table><tbody>{{range .Provenance}}<tr><th>{{index . 0}}</th><td>{{index . 1}}</td></tr>
{{end}}</tbody></table>
{{template "appendices" .Appendices}}<p class="caution">{{.Caution}}</p>
<script>
(function () {
  function check() {
    var imgs = document.images, ok = true;
    for (var i = 0; i < imgs.length; i++) { if (!imgs[i].complete || imgs[i].naturalWidth === 0) { ok = false; } }
    document.body.setAttribute("data-images-ok", ok ? "yes" : "no");
    document.body.setAttribute("data-images", String(imgs.length));
  }
  if (document.readyState === "complete") { check(); } else { window.addEventListener("load", check); }
})();
</script>
</body>
</html>
`))

// WriteHTML writes the review as one self-contained HTML page.
func (r *Review) WriteHTML(w io.Writer) error {
	type fig struct {
		Src     template.URL
		Caption string
	}
	data := struct {
		*Review
		Figures []fig
	}{Review: r}
	for _, f := range r.Figures {
		data.Figures = append(data.Figures, fig{Src: template.URL("data:image/png;base64," + base64.StdEncoding.EncodeToString(f.PNG)), Caption: f.Caption})
	}
	return page.Execute(w, data)
}
