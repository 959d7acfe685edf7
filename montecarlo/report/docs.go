package report

import (
	"fmt"

	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
)

func inputsSection(s *scenario.Scenario, sys units.System) Section {
	t := &Table{Header: []string{"input", "value or distribution", "source"}}
	for _, r := range Inputs(s, sys) {
		t.Rows = append(t.Rows, []string{r.Label, r.Value, r.Source})
	}
	sec := Section{Heading: "Inputs", Table: t}
	if s.Description != "" {
		sec.Paragraphs = []string{s.Description}
	}
	return sec
}

func nominalSections(doc NominalDoc, sys units.System) []Section {
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

func probTable(order []string, modes map[string]ProbDoc, conf float64) *Table {
	t := &Table{Header: []string{"mode", "probability", fmt.Sprintf("%.4g %% interval", 100*conf), "failures / samples", "nominal SF"}}
	for _, k := range order {
		p := modes[k]
		iv := fmt.Sprintf("%.3e … %.3e", p.CILow, p.CIHigh)
		if p.UpperBoundOnly {
			iv = fmt.Sprintf("≤ %.2e (one-sided; none failed)", p.CIHigh)
		}
		sf := ""
		if p.NominalSF != nil {
			sf = fmtSF(*p.NominalSF)
		}
		t.Rows = append(t.Rows, []string{k, FormatProb(p), iv, fmt.Sprintf("%d / %d", p.Failures, p.Samples), sf})
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
	r.Subtitle = fmt.Sprintf("Monte Carlo estimate from %d samples (seed %d).", doc.Samples, doc.Seed)
	if doc.Partial {
		r.Subtitle += " PARTIAL RESULT: the run was interrupted."
	}
	r.Sections = append(r.Sections, inputsSection(s, sys))
	r.Sections = append(r.Sections, nominalSections(doc.Nominal, sys)...)
	r.Sections = append(r.Sections, Section{Heading: "Failure probabilities", Table: probTable(doc.ModeOrder, doc.Modes, doc.Confidence),
		Paragraphs: []string{"Wilson score intervals; where no sample failed, the one-sided exact upper bound. A joint fails a bolt mode when any of its bolts does."}})
	pt := &Table{Header: []string{"quantity", "1 %", "5 %", "50 %", "95 %", "99 %"}}
	for _, q := range []struct{ key, label string }{{"preload_N", "residual preload"}, {"bolt_force_N", "largest bolt force"}, {"clamp_force_N", "least clamp force"}} {
		row := []string{q.label}
		for _, v := range doc.Percentiles[q.key] {
			row = append(row, sys.Format(v, units.Force))
		}
		pt.Rows = append(pt.Rows, row)
	}
	for _, k := range doc.ModeOrder {
		if p := doc.Modes[k]; p.SFPercentiles != nil {
			row := []string{"safety factor " + k}
			for _, v := range p.SFPercentiles {
				row = append(row, fmt.Sprintf("%.3f", v))
			}
			pt.Rows = append(pt.Rows, row)
		}
	}
	para := []string{"Forces over every bolt of each sample; safety factors of the joint, that is of its worst bolt in each sample."}
	if note := BinnedNote(doc.BinnedSamples, doc.Samples, doc.BinStride); note != "" {
		para = append(para, "P"+note[1:]+".")
	}
	r.Sections = append(r.Sections, Section{Heading: "Percentiles", Table: pt, Paragraphs: para})
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}

// SweepReview assembles the design-review document of a sweep.
func SweepReview(s *scenario.Scenario, doc SweepDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint reliability study: " + titleOf(s), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	r.Sections = append(r.Sections, inputsSection(s, sys))
	if doc.Spread != nil {
		sp := doc.Spread
		dim := scenario.FieldDim(sp.Input)
		var text string
		switch {
		case sp.Below:
			text = fmt.Sprintf("Even 1/64 of the scenario's scatter of %s misses the target %.3g: the nominal design itself must change.", sp.Input, sp.Target)
		case sp.Above:
			text = fmt.Sprintf("The target %.3g holds even at 16 times the scenario's scatter of %s.", sp.Target, sp.Input)
		default:
			text = fmt.Sprintf("The largest scatter of %s meeting the failure probability %.3g is %.3g times the scenario's: standard deviation %s, c.o.v. %.3g (±%.3g %% at 3σ), distribution %s.",
				sp.Input, sp.Target, sp.Factor, sys.Format(sp.SD, dim), sp.COV, 300*sp.COV, sp.Description)
		}
		r.Sections = append(r.Sections, Section{Heading: "Largest permissible scatter", Paragraphs: []string{text}})
		r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
		return r
	}
	v := doc.Vary
	fx := v.formatter(sys)
	r.Subtitle = fmt.Sprintf("Sweep of %s over %d values, %d samples per value, seed %d, the same random streams at every value.", v.Input, len(v.Values), doc.SamplesPerStep, doc.Seed)
	t := &Table{Header: append([]string{v.Input}, doc.ModeOrder...)}
	for _, st := range doc.Steps {
		row := []string{fx(st.Value)}
		for _, k := range doc.ModeOrder {
			row = append(row, FormatProb(st.Modes[k]))
		}
		t.Rows = append(t.Rows, row)
	}
	r.Sections = append(r.Sections, Section{Heading: "Failure probability at each value", Table: t})
	for _, w := range []*TargetWindowDoc{doc.Window, doc.Conservative} {
		if w == nil {
			continue
		}
		basis := "point estimates"
		if w == doc.Conservative {
			basis = fmt.Sprintf("upper %.4g %% bounds", 100*doc.Confidence)
		}
		var text string
		if !w.Found {
			text = fmt.Sprintf("No value in the swept range meets the failure probability %.3g (%s); the least any-mode probability is %.3g at %s.", w.Target, basis, w.BestProbability, fx(w.Best))
		} else {
			text = fmt.Sprintf("Window for a failure probability ≤ %.3g (%s): %s to %s. Lower end: %s. Upper end: %s. Least any-mode probability %.3g at %s.",
				w.Target, basis, fx(w.Lower), fx(w.Upper), Bound(w.LowerOpen, w.LowerCombined, w.LowerBoundModes), Bound(w.UpperOpen, w.UpperCombined, w.UpperBoundModes), w.BestProbability, fx(w.Best))
		}
		r.Sections = append(r.Sections, Section{Heading: "Window (" + basis + ")", Paragraphs: []string{text}})
	}
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}

// CompareReview assembles the design-review document of a comparison.
func CompareReview(ss []*scenario.Scenario, doc CompareDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint comparison: " + titleOf(ss[0]), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	names := variantNames(doc)
	r.Subtitle = fmt.Sprintf("Variants %v, %d paired samples (seed %d): every variant sees the same draws of every shared input.", names, doc.Samples, doc.Seed)
	for i, s := range ss {
		sec := inputsSection(s, sys)
		sec.Heading = "Inputs of " + names[i]
		r.Sections = append(r.Sections, sec)
	}
	t := &Table{Header: append([]string{"mode"}, names...)}
	for _, k := range doc.ModeOrder {
		row := []string{k}
		for _, v := range doc.Variants {
			row = append(row, FormatProb(v.Modes[k]))
		}
		t.Rows = append(t.Rows, row)
	}
	r.Sections = append(r.Sections, Section{Heading: "Failure probabilities", Table: t})
	for _, dd := range doc.Differences {
		dt := &Table{Header: []string{"mode", "difference", fmt.Sprintf("%.4g %% interval (paired)", 100*doc.Confidence), "ratio", "p-value", "verdict"}}
		for _, k := range doc.ModeOrder {
			md := dd.Modes[k]
			ratio := "-"
			if md.Ratio != nil {
				ratio = fmt.Sprintf("%.3g", *md.Ratio)
			}
			dt.Rows = append(dt.Rows, []string{k, fmt.Sprintf("%+.3e", md.Difference), fmt.Sprintf("%+.2e … %+.2e", md.CILow, md.CIHigh), ratio, fmt.Sprintf("%.3g", md.PValue), md.Verdict})
		}
		r.Sections = append(r.Sections, Section{Heading: dd.Variant + " against " + dd.Base, Table: dt,
			Paragraphs: []string{"Paired difference of the probabilities; verdict from McNemar's exact test on the samples where only one of the two failed."}})
	}
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}
