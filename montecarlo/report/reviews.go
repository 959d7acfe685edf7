package report

import (
	"fmt"
	"strings"

	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
)

func inputsSection(s *scenario.Scenario, j JointDoc, sys units.System) Section {
	t := &Table{Header: []string{"input", "value or distribution", "source"}}
	for _, r := range Inputs(s, sys) {
		t.Rows = append(t.Rows, []string{r.Label, r.Display, r.Source})
	}
	sec := Section{Heading: "Inputs", Table: t, Paragraphs: append(jointLines(j, sys), dataParagraphs(s, sys)...)}
	if s.Description != "" {
		sec.Paragraphs = append([]string{s.Description}, sec.Paragraphs...)
	}
	return sec
}

func nominalSections(doc NominalBody, sys units.System) []Section {
	F := func(v float64) string { return sys.Format(v, units.Force) }
	w := doc.Window
	joint := &Table{Header: []string{"quantity", "value"}, Rows: [][]string{
		{"bolt stiffness kb", sys.Format(doc.BoltStiffness, units.Stiffness)},
		{"member stiffness km", sys.Format(doc.MemberStiffness, units.Stiffness)},
		{"joint constant C", fmt.Sprintf("%.4f", doc.JointConstant)},
		{"assembly preload FM", F(doc.AssemblyPreload)},
		{"residual preload Fi", F(doc.Preload)},
		{"preload window", F(w.Lower) + " … " + F(w.Upper)},
		{"least preload against separation", F(w.SeparationMin)},
		{"greatest preload below proof", F(w.ProofMax)},
		{"greatest assembly preload before yield", F(w.AssemblyMax)},
		{"preload still improves Goodman up to", F(w.BeneficialMax)},
	}}
	modes := &Table{Header: []string{"mode", "demand", "capacity", "safety factor", "result"}, Rows: modeRows(doc, sys)}
	return []Section{
		{Heading: "Joint at nominal values", Table: joint},
		{Heading: "Failure modes at nominal values", Table: modes},
	}
}

// checksSections are the tightening cross-check and the not-checked list.
func checksSections(c Checks, sys units.System) []Section {
	out := []Section{{Heading: "Tightening cross-check (VDI 2230-1)",
		Table: &Table{Header: []string{"quantity", "value", "note"}, Rows: tighteningRows(c.TighteningCheck, sys)}}}
	if len(c.NotChecked) > 0 {
		t := &Table{Header: []string{"not checked", "why"}}
		for _, u := range c.NotChecked {
			t.Rows = append(t.Rows, []string{u.Key, u.Reason})
		}
		out = append(out, Section{Heading: "Not checked", Table: t,
			Paragraphs: []string{"Modes this joint did not evaluate, and topics outside the tool; check them by other means."}})
	}
	return out
}

func probTable(modes []ProbDoc) *Table {
	t := &Table{Header: []string{"mode", "probability", "c.o.v.", "interval", "failures / samples", "nominal SF"}}
	for _, p := range modes {
		sf := ""
		if p.NominalSF != nil {
			sf = fmtSF(*p.NominalSF)
		}
		t.Rows = append(t.Rows, []string{p.Title, FormatProb(p), formatCOV(p), formatInterval(p), countsCell(p), sf})
	}
	return t
}

func warningsSection(ws []string) []Section {
	if len(ws) == 0 {
		return nil
	}
	return []Section{{Heading: "Warnings", Paragraphs: ws}}
}

// SimulationReview assembles the design-review document of a simulation.
func SimulationReview(s *scenario.Scenario, doc SimDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint reliability review: " + titleOf(s), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	r.Subtitle = fmt.Sprintf("%s estimate from %d valid of %d requested samples (seed %d).", strings.ToUpper(methodName(doc.Method)[:1])+methodName(doc.Method)[1:], doc.Samples, doc.RequestedSamples, doc.Seed)
	if doc.Partial {
		r.Subtitle += " PARTIAL RESULT: the run was interrupted."
	}
	r.Sections = append(r.Sections, inputsSection(s, doc.Joint, sys))
	r.Sections = append(r.Sections, nominalSections(doc.Nominal, sys)...)
	para := []string{methodIntervalNote(doc.Method, doc.IntervalMethod, doc.Confidence) + ". A joint fails a bolt mode when any of its bolts does."}
	if doc.MethodNote != "" {
		para = append(para, "Method: "+doc.MethodNote+".")
	}
	r.Sections = append(r.Sections, Section{Heading: "Failure probabilities", Table: probTable(doc.Modes), Paragraphs: para})
	if len(doc.Cases) > 0 {
		r.Sections = append(r.Sections, Section{Heading: "Load cases", Table: casesTable(doc.Cases),
			Paragraphs: []string{"The static modes are checked in every load case, fatigue and fatigue_life in the first (the service case, whose loads the spectrum scales); the probabilities above are for all cases together (a mode fails when it fails in any case)."}})
	}
	if len(doc.Percentiles) > 0 {
		head := []string{"quantity"}
		for _, l := range doc.PercentileLevels {
			head = append(head, fmt.Sprintf("%g %%", 100*l))
		}
		pt := &Table{Header: head}
		for _, q := range doc.Percentiles {
			row := []string{q.Title}
			for _, v := range q.Values {
				row = append(row, sys.Format(v, units.Force))
			}
			pt.Rows = append(pt.Rows, row)
		}
		for _, p := range doc.Modes {
			if p.SFPercentiles != nil {
				row := []string{"safety factor, " + strings.ToLower(p.Title)}
				for _, v := range p.SFPercentiles.Values {
					row = append(row, fmt.Sprintf("%.3f", v))
				}
				pt.Rows = append(pt.Rows, row)
			}
		}
		para := []string{"Forces of one bolt per sample, the bolts in turn (they are alike in distribution); safety factors of the joint, that is of its worst bolt in each sample.",
			"Percentiles from " + doc.PercentileSource + "; " + percentileNote(maxRankError(doc)) + "."}
		r.Sections = append(r.Sections, Section{Heading: "Percentiles", Table: pt, Paragraphs: para})
	}
	r.Sections = append(r.Sections, checksSections(doc.Checks, sys)...)
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}

// SweepReview assembles the design-review document of a sweep.
func SweepReview(s *scenario.Scenario, doc SweepDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint reliability study: " + titleOf(s), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	r.Sections = append(r.Sections, inputsSection(s, doc.Joint, sys))
	if doc.Spread != nil {
		r.Sections = append(r.Sections, Section{Heading: "Largest permissible scatter", Paragraphs: []string{spreadText(doc.Spread, sys)}})
		r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
		return r
	}
	v := doc.Vary
	fx := v.formatter(sys)
	r.Subtitle = fmt.Sprintf("Sweep of %s over %d values, %d samples per value, seed %d, the same random streams at every value.", v.Input, len(v.Values), doc.SamplesPerStep, doc.Seed)
	if len(doc.Steps) > 0 {
		head := []string{v.Input, "valid samples"}
		for _, p := range doc.Steps[0].Modes {
			head = append(head, p.Title)
		}
		t := &Table{Header: head}
		for _, st := range doc.Steps {
			valid := fmt.Sprint(st.ValidSamples)
			if st.TooFewValid {
				valid += " (too few)"
			}
			row := []string{fx(st.Value), valid}
			for _, p := range st.Modes {
				row = append(row, FormatProb(p))
			}
			t.Rows = append(t.Rows, row)
		}
		r.Sections = append(r.Sections, Section{Heading: "Failure probability at each value", Table: t})
	}
	for _, w := range []*TargetWindowDoc{doc.Window, doc.Conservative} {
		if w == nil {
			continue
		}
		basis := "point estimates"
		if w == doc.Conservative {
			basis = fmt.Sprintf("upper %.4g %% bounds", 100*doc.Confidence)
		}
		r.Sections = append(r.Sections, Section{Heading: "Window (" + basis + ")", Paragraphs: []string{windowText(w, fx, basis)}})
	}
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}

// CompareReview assembles the design-review document of a comparison.
func CompareReview(ss []*scenario.Scenario, doc CompareDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint comparison: " + titleOf(ss[0]), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	names := variantNames(doc)
	r.Subtitle = fmt.Sprintf("Variants %s, %d paired samples (seed %d): every variant sees the same draws of every shared input.", strings.Join(names, ", "), doc.Samples, doc.Seed)
	for i, s := range ss {
		sec := inputsSection(s, Joint(s), sys)
		sec.Heading = "Inputs of " + names[i]
		r.Sections = append(r.Sections, sec)
	}
	t := &Table{Header: append([]string{"mode"}, names...)}
	for i, p := range doc.Variants[0].Modes {
		row := []string{p.Title}
		for _, v := range doc.Variants {
			row = append(row, FormatProb(v.Modes[i]))
		}
		t.Rows = append(t.Rows, row)
	}
	r.Sections = append(r.Sections, Section{Heading: "Failure probabilities", Table: t, Paragraphs: []string{intervalNote(doc.IntervalMethod, doc.Confidence) + "."}})
	for _, dd := range doc.Differences {
		dt := &Table{Header: []string{"mode", "difference", fmt.Sprintf("%.4g %% interval (paired)", 100*doc.Confidence), "ratio", "p-value", "verdict"}}
		for _, md := range dd.Modes {
			ratio := "-"
			if md.Ratio != nil {
				ratio = fmt.Sprintf("%.3g", *md.Ratio)
			}
			dt.Rows = append(dt.Rows, []string{md.Key, fmt.Sprintf("%+.3e", md.Difference), fmt.Sprintf("%+.2e … %+.2e", md.CILow, md.CIHigh), ratio, fmt.Sprintf("%.3g", md.PValue), md.Verdict})
		}
		r.Sections = append(r.Sections, Section{Heading: dd.Variant + " against " + dd.Base, Table: dt,
			Paragraphs: []string{"Paired difference of the probabilities with Newcombe's hybrid score interval for paired proportions; verdict from McNemar's exact test on the samples where only one of the two failed."}})
	}
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}
