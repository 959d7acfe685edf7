package report

import (
	"encoding/csv"
	"fmt"
	"html/template"
	"io"
	"math"
	"sort"
	"strconv"
	"text/tabwriter"
)

// RankDoc is the result of `boltrisk rank --json`: a fleet of joints, each
// simulated on its own, ranked by the upper confidence bound of its
// any-mode failure probability, highest first.
type RankDoc struct {
	SchemaVersion int    `json:"schema_version"`
	Kind          string `json:"kind" jsonschema:"enum=rank"`
	ToolVersion   string `json:"tool_version"`
	// Target is the failure probability each joint is judged against (0:
	// none given, no verdicts).
	Target float64   `json:"target,omitempty"`
	Joints []RankRow `json:"joints"`
	// Verdicts counts the joints by verdict.
	Verdicts map[string]int `json:"verdicts"`
	Caution  string         `json:"caution"`
}

// RankRow is one joint of a ranking.
type RankRow struct {
	Rank     int          `json:"rank"`
	Scenario ScenarioInfo `json:"scenario"`
	Method   string       `json:"method" jsonschema:"enum=crude,enum=importance,enum=subset"`
	Samples  int64        `json:"samples"`
	Seed     uint64       `json:"seed"`
	// Any is the any-mode probability with its interval; the ranking key is
	// its ci_high.
	Any ProbDoc `json:"any"`
	// Governing is the mode with the highest upper bound (on a tie, the
	// smaller nominal safety factor).
	Governing       string  `json:"governing_mode"`
	GoverningTitle  string  `json:"governing_title"`
	GoverningCIHigh float64 `json:"governing_ci_high"`
	// Verdict against the target: meets (ci_high ≤ target), exceeds (ci_low
	// > target), undecided (the interval straddles it), or none (no target).
	Verdict string `json:"verdict" jsonschema:"enum=meets,enum=exceeds,enum=undecided,enum=none"`
	// Report is the joint's review (report.html) relative to the index page
	// (with --out; "" otherwise).
	Report   string `json:"report,omitempty"`
	Partial  bool   `json:"partial"`
	Warnings int    `json:"warnings"`
}

// Verdict judges an any-mode estimate against a target.
func Verdict(lo, hi, target float64) string {
	switch {
	case target <= 0:
		return "none"
	case hi <= target:
		return "meets"
	case lo > target:
		return "exceeds"
	}
	return "undecided"
}

// RankEntry is one simulated joint to rank: its simulate document (run
// here, or read from a file written by 'simulate --json', e.g. by one task
// of a job array) and the path of its review, if any.
type RankEntry struct {
	Doc    SimDoc
	Report string
}

// Rank builds the ranking of simulated joints against a target.
func Rank(es []RankEntry, target float64, version string) RankDoc {
	d := RankDoc{SchemaVersion: SchemaVersion, Kind: "rank", ToolVersion: version, Target: target, Joints: []RankRow{}, Verdicts: map[string]int{}, Caution: Caution}
	for _, e := range es {
		sd := &e.Doc
		row := RankRow{Scenario: sd.Scenario, Method: sd.Method, Samples: sd.Samples, Seed: sd.Seed, Report: e.Report,
			Partial: sd.Partial, Warnings: len(sd.Warnings), GoverningCIHigh: -1}
		for _, m := range sd.Modes {
			if m.Key == "any" {
				row.Any = m
				row.Any.SFPercentiles, row.Any.PerBolt, row.Any.NominalSF = nil, nil, nil
			}
		}
		if g := governing(sd.Modes); g != nil {
			row.Governing, row.GoverningTitle, row.GoverningCIHigh = g.Key, g.Title, g.CIHigh
		}
		if row.GoverningCIHigh < 0 {
			row.GoverningCIHigh = 0
		}
		row.Verdict = Verdict(row.Any.CILow, row.Any.CIHigh, target)
		d.Joints = append(d.Joints, row)
		d.Verdicts[row.Verdict]++
	}
	sort.SliceStable(d.Joints, func(i, j int) bool { return d.Joints[i].Any.CIHigh > d.Joints[j].Any.CIHigh })
	for i := range d.Joints {
		d.Joints[i].Rank = i + 1
	}
	return d
}

func rankName(r RankRow) string {
	if r.Scenario.File != "" {
		return r.Scenario.File
	}
	return r.Scenario.Name
}

// WriteRank writes the ranking as text.
func WriteRank(w io.Writer, d RankDoc) {
	fmt.Fprintf(w, "boltrisk rank — %d joints by the upper bound of the any-mode failure probability\n", len(d.Joints))
	if d.Target > 0 {
		fmt.Fprintf(w, "target %.3g: %d meet, %d exceed, %d undecided\n", d.Target, d.Verdicts["meets"], d.Verdicts["exceeds"], d.Verdicts["undecided"])
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "rank\tjoint\tany mode, upper bound\testimate\tgoverning mode\tverdict\treport")
	for _, r := range d.Joints {
		rep := r.Report
		if rep == "" {
			rep = "-"
		}
		name := rankName(r)
		if r.Partial {
			name += " (PARTIAL)"
		}
		fmt.Fprintf(tw, "%d\t%s\t%.3g\t%.3g\t%s\t%s\t%s\n", r.Rank, name, r.Any.CIHigh, r.Any.Probability, r.GoverningTitle, r.Verdict, rep)
	}
	tw.Flush()
	fmt.Fprintf(w, "\nUpper bounds: one-sided or two-sided at each run's confidence, as in each joint's simulate report.\n\n%s\n", d.Caution)
}

// WriteRankCSV writes the ranking as CSV.
func WriteRankCSV(w io.Writer, d RankDoc) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"rank", "joint", "file", "sha256", "method", "samples", "seed", "any_probability", "any_ci_low", "any_ci_high", "governing_mode", "governing_ci_high", "verdict", "target", "report"})
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	for _, r := range d.Joints {
		cw.Write([]string{strconv.Itoa(r.Rank), r.Scenario.Name, r.Scenario.File, r.Scenario.SHA256, r.Method, strconv.FormatInt(r.Samples, 10),
			strconv.FormatUint(r.Seed, 10), g(r.Any.Probability), g(r.Any.CILow), g(r.Any.CIHigh), r.Governing, g(r.GoverningCIHigh), r.Verdict, g(d.Target), r.Report})
	}
	cw.Flush()
	return cw.Error()
}

var rankPage = template.Must(template.New("rank").Funcs(template.FuncMap{
	"p":    func(x float64) string { return strconv.FormatFloat(x, 'g', 3, 64) },
	"name": rankName,
}).Parse(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Fleet ranking: {{len .Joints}} bolted joints</title>
<style>
body{font-family:system-ui,sans-serif;margin:2rem auto;max-width:72rem;padding:0 1rem;color:#1b1b1b}
table{border-collapse:collapse;width:100%}th,td{padding:.35rem .6rem;border-bottom:1px solid #ddd;text-align:left}
td.num{text-align:right;font-variant-numeric:tabular-nums}
.exceeds{background:#fde2e1}.undecided{background:#fff4d6}.meets{background:#e3f4e6}
.caution{border-left:4px solid #b00;padding:.5rem 1rem;background:#fafafa;margin-top:2rem}
</style></head>
<body data-rows="{{len .Joints}}">
<h1>Fleet ranking</h1>
<p>{{len .Joints}} joints, each simulated on its own, ranked by the upper confidence bound of the probability that any mode fails{{if gt .Target 0.0}}, judged against the target {{p .Target}}: {{index .Verdicts "meets"}} meet it, {{index .Verdicts "exceeds"}} exceed it, {{index .Verdicts "undecided"}} undecided{{end}}.</p>
<table id="ranking">
<thead><tr><th>#</th><th>joint</th><th>any mode, upper bound</th><th>estimate</th><th>governing mode</th><th>verdict</th><th>method</th><th>samples</th></tr></thead>
<tbody>
{{range .Joints}}<tr class="{{.Verdict}}"><td class="num">{{.Rank}}</td><td>{{if .Report}}<a href="{{.Report}}">{{name .}}</a>{{else}}{{name .}}{{end}}{{if .Partial}} (PARTIAL){{end}}</td><td class="num">{{p .Any.CIHigh}}</td><td class="num">{{p .Any.Probability}}</td><td>{{.GoverningTitle}}</td><td>{{.Verdict}}</td><td>{{.Method}}</td><td class="num">{{.Samples}}</td></tr>
{{end}}</tbody></table>
<p class="caution">{{.Caution}}</p>
</body></html>
`))

// WriteRankHTML writes the index page of a ranking.
func WriteRankHTML(w io.Writer, d RankDoc) error { return rankPage.Execute(w, d) }

// governing returns the mode with the largest upper bound (on a tie — no
// failure in either mode, say — the one with the smaller nominal safety
// factor), or nil when no mode but "any" is listed.
func governing(modes []ProbDoc) *ProbDoc {
	var g *ProbDoc
	sfOf := func(p *ProbDoc) float64 {
		if p.NominalSF != nil {
			return *p.NominalSF
		}
		return math.Inf(1)
	}
	for i := range modes {
		m := &modes[i]
		if m.Key == "any" {
			continue
		}
		if g == nil || m.CIHigh > g.CIHigh || (m.CIHigh == g.CIHigh && sfOf(m) < sfOf(g)) {
			g = m
		}
	}
	return g
}
