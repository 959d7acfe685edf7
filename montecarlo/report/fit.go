package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
	"boltrisk/plots"
)

// FitCaution is the caution of a fit: the caution of every result, and
// what a fit of a test series can and cannot say.
const FitCaution = Caution + " A fit describes the tested batch, parts and assembly conditions only; " +
	"a small series leaves the scatter uncertain, and the tails beyond the data are the family's assumption, not a measurement."

// FitAnalysis is what `boltrisk fit` computed: the column read, the ranked
// fits, the posterior predictives of the normal and lognormal fits, and the
// probability-plot data of each fit.
type FitAnalysis struct {
	Column      *fit.Column
	SHA256      string // of the file's bytes
	Result      *fit.Result
	Predictives []fit.Predictive
	Plots       []fit.ProbPlot // one per candidate, in the candidates' order
}

// FitDoc is the JSON document of `boltrisk fit`. Values are in internal
// units (unit): N, mm, MPa, N*mm, or plain numbers.
type FitDoc struct {
	Envelope
	File        string `json:"file"`
	SHA256      string `json:"sha256"`
	Column      string `json:"column"`
	Dimension   string `json:"dimension" jsonschema:"enum=number,enum=fraction,enum=force,enum=length,enum=stress,enum=torque,enum=stiffness"`
	Unit        string `json:"unit"`         // internal unit of the values ("" for plain numbers and fractions)
	DisplayUnit string `json:"display_unit"` // unit of the text, the snippets and the pictures
	N           int    `json:"n"`            // values fitted
	Rows        int    `json:"rows"`         // data rows read
	BlankRows   []int  `json:"blank_rows,omitempty"`
	// Sample statistics (SD with divisor n − 1).
	SampleMean float64 `json:"sample_mean"`
	SampleSD   float64 `json:"sample_sd"`
	Min        float64 `json:"min"`
	Max        float64 `json:"max"`
	// Confidence is the two-sided level of the intervals.
	Confidence float64 `json:"confidence"`
	Bootstrap  int     `json:"bootstrap_replicates"` // per family; 0: no p-values, no intervals
	Seed       uint64  `json:"seed"`
	Method     string  `json:"method"` // how the p-values and intervals were obtained
	// Candidates ranked by AIC, best first.
	Candidates []FitCandidateDoc `json:"candidates"`
	Best       string            `json:"best"` // smallest AIC
	// Recommended is the family of Snippet and DataSnippet: the smallest
	// AIC among the open-tailed families (normal, lognormal, Weibull).
	Recommended string          `json:"recommended"`
	Predictives []PredictiveDoc `json:"predictives,omitempty"`
	// Snippet is the best fit as a scenario input; DataSnippet refers a
	// scenario to the data file instead (fitted when it loads).
	Snippet     string   `json:"snippet"`
	DataSnippet string   `json:"data_snippet"`
	Warnings    []string `json:"warnings"`
	Notes       []string `json:"notes,omitempty"`
	Caution     string   `json:"caution"`

	q fit.Quantity // display unit of the values
}

// FitParamDoc is an estimate with its interval (lo and hi absent without a
// bootstrap).
type FitParamDoc struct {
	Name string `json:"name"`
	// Scale: value (a value of the data, internal unit), log_value (the
	// logarithm of one) or plain.
	Scale string   `json:"scale" jsonschema:"enum=value,enum=log_value,enum=plain"`
	Value float64  `json:"value"`
	Lo    *float64 `json:"lo,omitempty"`
	Hi    *float64 `json:"hi,omitempty"`
}

// TestDoc is a goodness-of-fit statistic and its p-value.
type TestDoc struct {
	Statistic float64  `json:"statistic"`
	P         *float64 `json:"p,omitempty"`
}

// FitCandidateDoc is one fitted family.
type FitCandidateDoc struct {
	Family     string        `json:"family" jsonschema:"enum=normal,enum=lognormal,enum=weibull,enum=truncnormal,enum=uniform,enum=triangular"`
	Parameters []FitParamDoc `json:"parameters"`
	Mean       FitParamDoc   `json:"mean"`
	COV        *FitParamDoc  `json:"cov,omitempty"` // absent when the mean is not positive
	K          int           `json:"k"`             // estimated parameters
	LogLik     float64       `json:"log_likelihood"`
	AIC        float64       `json:"aic"`
	BIC        float64       `json:"bic"`
	DeltaAIC   float64       `json:"delta_aic"`
	DeltaBIC   float64       `json:"delta_bic"`
	Weight     float64       `json:"akaike_weight"`
	RankBIC    int           `json:"rank_bic"`
	AD         TestDoc       `json:"anderson_darling"`
	KS         TestDoc       `json:"kolmogorov_smirnov"`
	Replicates int           `json:"replicates"`
	Snippet    string        `json:"snippet"`
	Notes      []string      `json:"notes,omitempty"`
}

// PredictiveDoc is the posterior predictive of a normal or lognormal fit
// (Student t with n − 1 degrees of freedom; on ln X for lognormal data).
type PredictiveDoc struct {
	Family   string  `json:"family" jsonschema:"enum=normal,enum=lognormal"`
	DOF      float64 `json:"dof"`
	Location float64 `json:"location"` // of X (normal) or ln X (lognormal), internal units
	Scale    float64 `json:"scale"`
	Describe string  `json:"describe"`
	// Quantiles at 1 %, 5 %, 50 %, 95 %, 99 % (internal units), and those of
	// the plug-in fit beside them.
	Levels          []float64 `json:"levels"`
	Quantiles       []float64 `json:"quantiles"`
	PlugInQuantiles []float64 `json:"plug_in_quantiles"`
	DataSnippet     string    `json:"data_snippet"`
}

var predictiveLevels = []float64{0.01, 0.05, 0.5, 0.95, 0.99}

func ptr(v float64) *float64 { return &v }

func paramDoc(p fit.Param) FitParamDoc {
	d := FitParamDoc{Name: p.Name, Value: p.Value, Scale: [...]string{"plain", "value", "log_value"}[p.Dim]}
	if p.Interval {
		d.Lo, d.Hi = ptr(p.Lo), ptr(p.Hi)
	}
	return d
}

func testDoc(t fit.Test) TestDoc {
	d := TestDoc{Statistic: t.Stat}
	if t.HasP {
		d.P = ptr(t.P)
	}
	return d
}

// dataSnippet is a scenario input that refers to the data file.
func dataSnippet(file, column string, unit string, k montecarlo.Kind, predictive bool) string {
	var b strings.Builder
	fmt.Fprintf(&b, "{data: %s, column: %s", yamlWord(file), yamlWord(column))
	if unit != "" && unit != "%" {
		fmt.Fprintf(&b, ", unit: %s", yamlWord(unit))
	}
	fmt.Fprintf(&b, ", family: %s", k)
	if predictive {
		b.WriteString(", predictive: true")
	}
	b.WriteString("}")
	return b.String()
}

// yamlWord quotes a flow-style YAML scalar when it needs it.
func yamlWord(s string) string {
	if s == "" || strings.ContainsAny(s, ",:{}[]#&*!|>'\"%@`") || strings.TrimSpace(s) != s {
		return fmt.Sprintf("%q", s)
	}
	return s
}

// choice says which family the snippets use and why.
func (d FitDoc) choice() string {
	if d.Recommended == d.Best || d.Recommended == "" {
		return "best by AIC: " + d.Best
	}
	return fmt.Sprintf("%s, best by AIC of the open-tailed families; %s ranks first but ends at its fitted bounds, which would cut off the tails that small probabilities depend on", d.Recommended, d.Best)
}

// Fit builds the document of a fit.
func Fit(a FitAnalysis, version string) FitDoc {
	c, r := a.Column, a.Result
	doc := FitDoc{Envelope: envelope("fit", version), File: c.File, SHA256: a.SHA256, Column: c.Name, Dimension: c.Dim.Key(),
		Unit: internalUnit(c.Dim), DisplayUnit: c.Unit, N: r.N, Rows: c.Rows, BlankRows: c.Blank,
		SampleMean: r.Mean, SampleSD: r.SD, Min: r.Min, Max: r.Max, Confidence: r.Confidence, Bootstrap: r.Bootstrap, Seed: r.Seed,
		Method: r.Method, Best: r.Best().Family.String(), Recommended: r.Recommended().Family.String(), Snippet: fit.Snippet(r.Recommended().Dist, c.Quantity),
		Warnings: append([]string{}, r.Warnings...), Notes: append(append([]string{}, c.Notes...), r.Notes...), Caution: FitCaution}
	doc.q = c.Quantity
	doc.DataSnippet = dataSnippet(c.File, c.Name, c.Unit, r.Recommended().Family, false)
	for _, cand := range r.Candidates {
		cd := FitCandidateDoc{Family: cand.Family.String(), Mean: paramDoc(cand.Mean), K: cand.K, LogLik: cand.LogLik, AIC: cand.AIC, BIC: cand.BIC,
			DeltaAIC: cand.DeltaAIC, DeltaBIC: cand.DeltaBIC, Weight: cand.Weight, RankBIC: cand.RankBIC, AD: testDoc(cand.AD), KS: testDoc(cand.KS),
			Replicates: cand.Replicates, Snippet: fit.Snippet(cand.Dist, c.Quantity), Notes: cand.Notes}
		for _, p := range cand.Params {
			cd.Parameters = append(cd.Parameters, paramDoc(p))
		}
		if cand.COVDefined {
			cv := paramDoc(cand.COV)
			cd.COV = &cv
		}
		doc.Candidates = append(doc.Candidates, cd)
	}
	for _, p := range a.Predictives {
		pd := PredictiveDoc{Family: p.Family.String(), DOF: p.DF, Location: p.Loc, Scale: p.Scale, Describe: p.Describe(c.Quantity),
			Levels: predictiveLevels, DataSnippet: dataSnippet(c.File, c.Name, c.Unit, p.Family, true)}
		plug := r.Candidate(p.Family)
		for _, l := range predictiveLevels {
			pd.Quantiles = append(pd.Quantiles, p.Quantile(l))
			if plug != nil {
				pd.PlugInQuantiles = append(pd.PlugInQuantiles, plug.Dist.Quantile(l))
			}
		}
		doc.Predictives = append(doc.Predictives, pd)
	}
	return doc
}

// quantity is how the document's values are shown.
func (d *FitDoc) quantity() fit.Quantity { return d.q }

func (d *FitDoc) param(p FitParamDoc) string {
	q := d.quantity()
	v := func(x float64) string {
		switch p.Scale {
		case "value":
			return q.Format(x)
		case "log_value":
			return fmt.Sprintf("%.4g", x-math.Log(q.Scale))
		}
		return fmt.Sprintf("%.4g", x)
	}
	s := v(p.Value)
	if p.Lo != nil {
		s += " [" + v(*p.Lo) + ", " + v(*p.Hi) + "]"
	}
	return s
}

func pOf(t TestDoc) string {
	if t.P == nil {
		return "-"
	}
	return fmt.Sprintf("%.3f", *t.P)
}

// WriteFit writes the fit as terminal text.
func WriteFit(w io.Writer, d FitDoc) {
	q := d.quantity()
	fmt.Fprintf(w, "boltrisk fit — %s, column %q\n", d.File, d.Column)
	fmt.Fprintf(w, "file sha256 %.12s…\n\n", d.SHA256)
	unit := d.DisplayUnit
	if unit == "" {
		unit = "plain numbers"
	}
	fmt.Fprintf(w, "Sample: n = %d of %d rows (%s); mean %s, sd %s, min %s, max %s\n", d.N, d.Rows, unit, q.Format(d.SampleMean), q.Format(d.SampleSD), q.Format(d.Min), q.Format(d.Max))
	fmt.Fprintf(w, "\nFamilies ranked by AIC (BIC rank beside); goodness of fit: Anderson–Darling A², Kolmogorov–Smirnov D\n")
	rows := [][]string{{"family", "k", "log L", "AIC", "ΔAIC", "weight", "BIC rank", "A²", "p", "D", "p"}}
	for _, c := range d.Candidates {
		rows = append(rows, []string{c.Family, fmt.Sprint(c.K), fmt.Sprintf("%.3f", c.LogLik), fmt.Sprintf("%.2f", c.AIC), fmt.Sprintf("%.2f", c.DeltaAIC),
			fmt.Sprintf("%.3f", c.Weight), fmt.Sprint(c.RankBIC), fmt.Sprintf("%.4f", c.AD.Statistic), pOf(c.AD), fmt.Sprintf("%.4f", c.KS.Statistic), pOf(c.KS)})
	}
	writeColumns(w, rows)
	fmt.Fprintf(w, "  %s\n", d.Method)
	if d.Bootstrap > 0 {
		fmt.Fprintf(w, "\nEstimates with %g %% two-sided intervals\n", 100*d.Confidence)
	} else {
		fmt.Fprintf(w, "\nEstimates (no intervals without a bootstrap)\n")
	}
	for _, c := range d.Candidates {
		var parts []string
		for _, p := range c.Parameters {
			parts = append(parts, p.Name+" "+d.param(p))
		}
		parts = append(parts, "mean "+d.param(c.Mean))
		if c.COV != nil {
			cv := *c.COV
			s := fmt.Sprintf("%.2f %%", 100*cv.Value)
			if cv.Lo != nil {
				s += fmt.Sprintf(" [%.2f %%, %.2f %%]", 100**cv.Lo, 100**cv.Hi)
			}
			parts = append(parts, "c.o.v. "+s)
		}
		fmt.Fprintf(w, "  %-11s %s\n", c.Family, strings.Join(parts, "; "))
		for _, n := range c.Notes {
			fmt.Fprintf(w, "  %-11s note: %s\n", "", n)
		}
	}
	if len(d.Predictives) > 0 {
		fmt.Fprintf(w, "\nPosterior predictive (non-informative prior; Gelman et al., Bayesian Data Analysis, 3rd ed., §3.2)\n")
		rows := [][]string{{"family", "law", "", "1 %", "5 %", "50 %", "95 %", "99 %"}}
		for _, p := range d.Predictives {
			pr := []string{p.Family, p.Describe, "predictive"}
			pl := []string{"", "", "plug-in"}
			for i := range p.Levels {
				pr = append(pr, q.Format(p.Quantiles[i]))
				if i < len(p.PlugInQuantiles) {
					pl = append(pl, q.Format(p.PlugInQuantiles[i]))
				}
			}
			rows = append(rows, pr, pl)
		}
		writeColumns(w, rows)
	}
	fmt.Fprintf(w, "\nScenario input (%s), to paste:\n  %s\n", d.choice(), d.Snippet)
	fmt.Fprintf(w, "or refer to the data, fitted when the scenario loads (path relative to the scenario file):\n  %s\n", d.DataSnippet)
	for _, p := range d.Predictives {
		fmt.Fprintf(w, "  %s\n", p.DataSnippet)
	}
	for _, n := range d.Notes {
		fmt.Fprintf(w, "\nNote: %s\n", n)
	}
	writeWarnings(w, d.Warnings)
	fmt.Fprintln(w)
	writeWrapped(w, d.Caution)
}

// writeWrapped writes text wrapped to 78 columns.
func writeWrapped(w io.Writer, text string) {
	line := ""
	for _, word := range strings.Fields(text) {
		if line != "" && len(line)+1+len(word) > 78 {
			fmt.Fprintln(w, line)
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += word
	}
	if line != "" {
		fmt.Fprintln(w, line)
	}
}

// FitFigures draws the probability plot of every fitted family.
func FitFigures(a FitAnalysis) ([]Figure, error) {
	var figs []Figure
	xl := a.Column.Name
	if a.Column.Unit != "" {
		xl += " (" + a.Column.Unit + ")"
	}
	for i, pp := range a.Plots {
		k := a.Result.Candidates[i].Family
		p, err := plots.ProbabilityPlot(plots.ProbabilitySpec{Title: fmt.Sprintf("%s: %s fit (%s paper)", a.Column.Name, k, pp.Paper), XLabel: xl, Data: ProbabilityData(pp)})
		if err != nil {
			return nil, err
		}
		caption := fmt.Sprintf("The %d values of %s (%s) on %s probability paper against the fitted %s, with the pointwise %g %% band of the ordered values (plotting positions %s). The band leaves out the uncertainty of the fitted parameters.",
			pp.N, a.Column.Name, a.Column.File, pp.Paper, k, 100*pp.Confidence, pp.Positions)
		if pp.Shown < pp.N {
			caption += fmt.Sprintf(" %d of the values are shown.", pp.Shown)
		}
		f, err := figure(p, "probability-"+k.String()+".png", caption)
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	return figs, nil
}

// FitReview assembles the review document of a fit; prov are its
// provenance rows.
func FitReview(d FitDoc, figs []Figure, prov [][2]string) *Review {
	r := &Review{Title: fmt.Sprintf("Fit of test data: %s, column %s", d.File, d.Column), Caution: d.Caution, Figures: figs,
		Provenance: append(prov, [2]string{"data " + d.File, "SHA-256 " + d.SHA256})}
	r.Subtitle = fmt.Sprintf("%d values; %s.", d.N, d.choice())
	q := d.quantity()
	t := &Table{Header: []string{"family", "ΔAIC", "weight", "BIC rank", "A² (p)", "D (p)", "mean", "c.o.v."}}
	for _, c := range d.Candidates {
		cov := ""
		if c.COV != nil {
			cov = fmt.Sprintf("%.2f %%", 100*c.COV.Value)
		}
		t.Rows = append(t.Rows, []string{c.Family, fmt.Sprintf("%.2f", c.DeltaAIC), fmt.Sprintf("%.3f", c.Weight), fmt.Sprint(c.RankBIC),
			fmt.Sprintf("%.4f (%s)", c.AD.Statistic, pOf(c.AD)), fmt.Sprintf("%.4f (%s)", c.KS.Statistic, pOf(c.KS)), d.param(c.Mean), cov})
	}
	r.Sections = append(r.Sections, Section{Heading: "Sample", Paragraphs: []string{fmt.Sprintf("n = %d of %d rows; mean %s, sd %s, min %s, max %s.", d.N, d.Rows, q.Format(d.SampleMean), q.Format(d.SampleSD), q.Format(d.Min), q.Format(d.Max))}})
	r.Sections = append(r.Sections, Section{Heading: "Families ranked by AIC", Table: t, Paragraphs: []string{d.Method + "."}})
	var para []string
	for _, p := range d.Predictives {
		para = append(para, fmt.Sprintf("%s data: %s; 1 %% quantile %s (plug-in %s).", p.Family, p.Describe, q.Format(p.Quantiles[0]), q.Format(p.PlugInQuantiles[0])))
	}
	if len(para) > 0 {
		r.Sections = append(r.Sections, Section{Heading: "Posterior predictive", Paragraphs: para})
	}
	snip := []string{"Recommended fit (" + d.choice() + "): `" + d.Snippet + "`", "Or the data itself: `" + d.DataSnippet + "`"}
	for _, p := range d.Predictives {
		snip = append(snip, "With the predictive: `"+p.DataSnippet+"`")
	}
	r.Sections = append(r.Sections, Section{Heading: "Scenario input", Paragraphs: snip})
	r.Sections = append(r.Sections, warningsSection(d.Warnings)...)
	return r
}
