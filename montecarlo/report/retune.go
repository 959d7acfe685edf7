package report

import (
	"fmt"
	"io"

	"boltrisk/model/units"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/scenario"
)

// RetuneVariantDoc is one variant at its own callout.
type RetuneVariantDoc struct {
	Name  string `json:"name"`
	Input string `json:"input"` // the controlled input's path
	Unit  string `json:"unit"`
	// FileNominal is the variant's own setting; Nominal its callout's (the
	// setting the comparison runs at), with the upper-bound window of
	// nominal settings at the variant's scatter.
	FileNominal float64 `json:"file_nominal"`
	Nominal     float64 `json:"nominal"`
	WindowLow   float64 `json:"window_low"`
	WindowHigh  float64 `json:"window_high"`
	// ToleranceRelative is the widest tolerance (±, 3σ) at the callout; the
	// comparison keeps the variant's own scatter (FileTolerance).
	ToleranceRelative float64 `json:"tolerance_relative"`
	FileTolerance     float64 `json:"file_tolerance_relative"`
	Runs              int     `json:"runs"`
	// Any is the variant's any-mode probability at its callout, from the
	// paired comparison.
	Any *ProbDoc `json:"any_mode,omitempty"`
}

// RetuneDoc says that a comparison ran every variant at its own callout.
type RetuneDoc struct {
	Target   float64            `json:"target_probability"`
	Variants []RetuneVariantDoc `json:"variants"`
}

// Retune builds the retune part of a comparison.
func Retune(target float64, names []string, fileNominals []float64, rs []decide.Retuned) *RetuneDoc {
	d := &RetuneDoc{Target: target}
	for i, r := range rs {
		sp := r.Spec
		w := sp.Sweep.Conservative
		d.Variants = append(d.Variants, RetuneVariantDoc{Name: names[i], Input: sp.Path, Unit: internalUnit(scenario.FieldDim(sp.Path)),
			FileNominal: fileNominals[i], Nominal: sp.Nominal, WindowLow: w.Lo, WindowHigh: w.Hi,
			ToleranceRelative: sp.Upper.Meets, FileTolerance: sp.FileTolerance, Runs: sp.Runs})
	}
	return d
}

// WithRetune attaches the retune part to a comparison and copies each
// variant's any-mode probability at its callout into it.
func WithRetune(doc *CompareDoc, d *RetuneDoc) {
	doc.Retune = d
	if d == nil {
		return
	}
	for i := range d.Variants {
		if i < len(doc.Variants) && len(doc.Variants[i].Modes) > 0 {
			p := doc.Variants[i].Modes[len(doc.Variants[i].Modes)-1]
			d.Variants[i].Any = &p
		}
	}
}

// RetuneSection is the side-by-side table of the variants' callouts.
func RetuneSection(d *RetuneDoc, sys units.System) Section {
	t := &Table{Header: []string{"variant", "setting", "callout (compared at)", "window (upper bounds)", "widest tolerance", "any mode at the callout, own scatter", "file's setting"}}
	for _, v := range d.Variants {
		dim := scenario.FieldDim(v.Input)
		f := func(x float64) string { return sys.Format(x, dim) }
		any := "-"
		if v.Any != nil {
			any = FormatProb(*v.Any)
		}
		t.Rows = append(t.Rows, []string{v.Name, v.Input, f(v.Nominal), f(v.WindowLow) + " … " + f(v.WindowHigh),
			fmt.Sprintf("±%.3g %%", 100*v.ToleranceRelative), any, f(v.FileNominal)})
	}
	return Section{Heading: "Each variant at its own callout", Table: t, Paragraphs: []string{fmt.Sprintf(
		"Every variant was moved to its own callout for the target %s (as 'boltrisk spec' finds it: the geometric middle of its upper-bound window at its own scatter) and the comparison below runs them there, in lock step.", fmtTarget(d.Target))}}
}

// WriteRetune writes the retune table as text.
func WriteRetune(w io.Writer, d *RetuneDoc, sys units.System) {
	sec := RetuneSection(d, sys)
	fmt.Fprintln(w, sec.Heading)
	for _, p := range sec.Paragraphs {
		fmt.Fprintf(w, "  %s\n", p)
	}
	rows := append([][]string{sec.Table.Header}, sec.Table.Rows...)
	for i := range rows {
		rows[i] = append([]string{" "}, rows[i]...)
	}
	writeColumns(w, rows)
	fmt.Fprintln(w)
}
