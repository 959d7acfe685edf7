package report

import (
	"fmt"
	"html/template"
	"sort"
	"strings"

	"boltrisk/model/units"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/scenario"
)

// SignOff is the one-page sign-off sheet at the start of a review: the
// verdict of every mode and of the joint against the target, the governing
// mode, the drivers, what was not checked, the assumptions, the caution and
// an empty block for the signatures.
type SignOff struct {
	Title       string
	Subject     string     // scenario name, file and hash
	Run         string     // method, samples, seed, run date
	Target      string     // the target and where it comes from
	Rows        [][]string // mode, estimate, upper bound, verdict
	Joint       string     // the joint's verdict
	Governing   string
	Drivers     []string
	NotChecked  []string
	Assumptions [][]string // input, distribution, source
	Fixed       string     // how many inputs are fixed, and where they are listed
	Caution     string
}

// Appendix is a verbatim text at the end of a review.
type Appendix struct {
	Heading string
	Note    string
	Text    string
}

// ScenarioAppendix embeds the scenario file verbatim with its SHA-256.
func ScenarioAppendix(s *scenario.Scenario) Appendix {
	name := s.File
	if name == "" {
		name = "built-in example"
	}
	return Appendix{Heading: "Appendix: scenario file", Note: fmt.Sprintf("%s, SHA-256 %s, %d bytes, verbatim:", name, s.SHA256, len(s.Bytes)), Text: string(s.Bytes)}
}

// sourceKind shortens an input's source to its kind: file, preset, default or data.
func sourceKind(src string) string {
	switch {
	case src == "" || src == "given":
		return "file"
	case strings.HasPrefix(src, "tool "), strings.HasPrefix(src, "condition "), strings.HasPrefix(src, "class "):
		name, _, _ := strings.Cut(src, " (")
		return "preset " + name
	case strings.HasPrefix(src, "default"):
		return "default"
	case strings.Contains(src, "fit") || strings.Contains(src, "data"):
		return "data"
	}
	name, _, _ := strings.Cut(src, " (")
	return name
}

// SignOffSheet builds the sign-off sheet of a simulation. verdicts are
// those of doc.Modes (any last); target 0 means none was given (the sheet
// then shows the estimates without verdicts).
func SignOffSheet(s *scenario.Scenario, doc SimDoc, target float64, targetFrom string, verdicts []decide.Verdict, runDate string, sys units.System) *SignOff {
	so := &SignOff{Title: "Sign-off sheet: " + titleOf(s), Caution: Caution}
	file := s.File
	if file == "" {
		file = "built-in example"
	}
	so.Subject = fmt.Sprintf("Scenario %q (%s, SHA-256 %.16s…; the file is reproduced in the appendix).", s.Name, file, s.SHA256)
	so.Run = fmt.Sprintf("%s, %d valid samples, seed %d, %.4g %% two-sided intervals; run %s.", methodName(doc.Method), doc.Samples, doc.Seed, 100*doc.Confidence, runDate)
	if target > 0 {
		so.Target = fmt.Sprintf("Target: failure probability at most %s for every mode and for the joint (%s); a mode meets it when its upper bound is at or below it, does not when its lower bound is above it.", fmtTarget(target), targetFrom)
	} else {
		so.Target = "No target given (study.target_probability or simulate --sign-off P): estimates only, no verdicts."
	}
	for i, p := range doc.Modes {
		v := "-"
		if target > 0 && i < len(verdicts) {
			v = verdicts[i].State.String()
			if verdicts[i].State == decide.CannotTell {
				v += fmt.Sprintf(" at %d samples (about %.2g needed)", doc.Samples, float64(verdicts[i].SamplesNeeded))
			}
		}
		so.Rows = append(so.Rows, []string{p.Title, FormatProb(p), fmt.Sprintf("%.2e", p.CIHigh), v})
		if p.Key == "any" {
			if target > 0 && i < len(verdicts) {
				st := strings.ToUpper(verdicts[i].State.String())
				v = st + strings.TrimPrefix(v, verdicts[i].State.String())
			}
			so.Joint = fmt.Sprintf("The joint (any mode, %s, upper bound %.2e): %s.", FormatProb(p), p.CIHigh, v)
		}
	}
	gov := ""
	so.Governing = "Governing mode: none (no mode is active)."
	if g := governing(doc.Modes); g != nil {
		so.Governing, gov = "Governing mode: "+g.Title+" (the largest upper bound; on a tie the smaller nominal safety factor).", g.Key
	}
	if doc.Partial {
		so.Run += " PARTIAL RESULT: the run was interrupted; the verdicts rest on the samples done."
	}
	if d := doc.Drivers; d != nil {
		for _, m := range d.Modes {
			if m.Key != gov {
				continue
			}
			ins := append([]InputDriverDoc(nil), m.Inputs...)
			val := func(in InputDriverDoc) float64 {
				if in.Alpha2 != nil {
					return *in.Alpha2
				}
				return in.Shift * in.Shift
			}
			sort.SliceStable(ins, func(i, j int) bool { return val(ins[i]) > val(ins[j]) })
			for i, in := range ins {
				if i == 3 {
					break
				}
				if in.Alpha2 != nil {
					sign := "+"
					if in.AlphaSign < 0 {
						sign = "−"
					}
					so.Drivers = append(so.Drivers, fmt.Sprintf("%s: α² %.2f (%s), shift %+.2f sd", in.Input, *in.Alpha2, sign, in.Shift))
				} else {
					so.Drivers = append(so.Drivers, fmt.Sprintf("%s: shift %+.2f sd", in.Input, in.Shift))
				}
			}
		}
	} else {
		so.Drivers = []string{"not computed (simulate --drivers adds them; boltrisk drivers gives the full table)"}
	}
	// Not checked: modes with the same reason share a line.
	var order []string
	byReason := map[string][]string{}
	for _, u := range doc.NotChecked {
		if _, ok := byReason[u.Reason]; !ok {
			order = append(order, u.Reason)
		}
		byReason[u.Reason] = append(byReason[u.Reason], u.Key)
	}
	for _, r := range order {
		so.NotChecked = append(so.NotChecked, strings.Join(byReason[r], ", ")+": "+r)
	}
	fixed := 0
	for _, in := range Inputs(s, sys) {
		if in.Distribution == nil {
			fixed++
			continue
		}
		so.Assumptions = append(so.Assumptions, []string{in.Label, in.Display, sourceKind(in.Source)})
	}
	so.Fixed = fmt.Sprintf("%d further inputs are fixed at their file, class or default values (listed under Inputs).", fixed)
	return so
}

// writeMarkdown writes the sheet as Markdown.
func (so *SignOff) writeMarkdown(b *strings.Builder) {
	fmt.Fprintf(b, "# %s\n\n%s %s\n\n%s\n\n", so.Title, so.Subject, so.Run, so.Target)
	writeMDTable(b, &Table{Header: []string{"mode", "estimate", "upper bound", "verdict"}, Rows: so.Rows})
	fmt.Fprintf(b, "**%s** %s\n\n", so.Joint, so.Governing)
	fmt.Fprintf(b, "Drivers of the governing mode: %s.\n\n", strings.Join(so.Drivers, "; "))
	if len(so.NotChecked) > 0 {
		fmt.Fprintf(b, "Not checked: %s.\n\n", strings.Join(so.NotChecked, "; "))
	}
	writeMDTable(b, &Table{Header: []string{"assumption", "distribution", "source"}, Rows: so.Assumptions})
	fmt.Fprintf(b, "%s\n\n> **%s**\n\n", so.Fixed, so.Caution)
	writeMDTable(b, &Table{Header: []string{"", "name", "signature", "date"}, Rows: [][]string{{"prepared", "", "", ""}, {"checked", "", "", ""}, {"approved", "", "", ""}}})
	b.WriteString("---\n\n")
}

// writeAppendicesMarkdown writes the appendices as Markdown.
func writeAppendicesMarkdown(b *strings.Builder, as []Appendix) {
	for _, a := range as {
		fmt.Fprintf(b, "## %s\n\n%s\n\n````yaml\n%s\n````\n\n", a.Heading, a.Note, strings.TrimRight(a.Text, "\n"))
	}
}

// The sheet fits one page of A4 and of US Letter (checked by printing in
// headless Chromium): small type, tight tables, a page break after it.
var _ = template.Must(page.New("signoff").Parse(`<section class="signoff">
<style>
.signoff { font-size: 9pt; line-height: 1.25; }
.signoff h1 { font-size: 14pt; margin: 0 0 .3em; }
.signoff p { margin: .25em 0; }
.signoff table { font-size: 8pt; margin: .2em 0 .35em; }
.signoff th, .signoff td { padding: .08em .35em; }
.signoff .caution { padding: .3em .6em; font-size: 8pt; }
.signoff table.sign td { height: 1.9em; width: 11em; }
.signoff ul { margin: .1em 0 .3em 1.2em; padding: 0; font-size: 8pt; }
@page { margin: 12mm; }
@media print { .signoff { break-after: page; page-break-after: always; } }
</style>
<h1>{{.Title}}</h1>
<p>{{.Subject}} {{.Run}}</p>
<p>{{.Target}}</p>
<table><thead><tr><th>mode</th><th>estimate</th><th>upper bound</th><th>verdict</th></tr></thead><tbody>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</tbody></table>
<p><strong>{{.Joint}}</strong> {{.Governing}}</p>
<p>Drivers of the governing mode:</p><ul>{{range .Drivers}}<li>{{.}}</li>{{end}}</ul>
{{if .NotChecked}}<p>Not checked:</p><ul>{{range .NotChecked}}<li>{{.}}</li>{{end}}</ul>{{end}}
<table><thead><tr><th>assumption</th><th>distribution</th><th>source</th></tr></thead><tbody>
{{range .Assumptions}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</tbody></table>
<p>{{.Fixed}}</p>
<p class="caution">{{.Caution}}</p>
<table class="sign"><thead><tr><th></th><th>name</th><th>signature</th><th>date</th></tr></thead><tbody>
<tr><th>prepared</th><td></td><td></td><td></td></tr>
<tr><th>checked</th><td></td><td></td><td></td></tr>
<tr><th>approved</th><td></td><td></td><td></td></tr>
</tbody></table>
</section>
`))

var _ = template.Must(page.New("appendices").Parse(`{{range .}}<h2>{{.Heading}}</h2>
<p>{{.Note}}</p>
<pre class="verbatim">{{.Text}}</pre>
{{end}}`))
