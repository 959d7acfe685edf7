package report

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/scenario"
)

// DiffDoc compares one variant with the base, per mode.
type DiffDoc struct {
	Variant string        `json:"variant"`
	Base    string        `json:"base"`
	Modes   []ModeDiffDoc `json:"modes"` // the compared modes in report order, then "any"
}

// ModeDiffDoc is the paired comparison of one mode.
type ModeDiffDoc struct {
	Key        string  `json:"key"`
	Difference float64 `json:"difference"`
	// CILow, CIHigh: Newcombe's hybrid score interval for paired
	// proportions (method 10).
	CILow      float64  `json:"ci_low"`
	CIHigh     float64  `json:"ci_high"`
	UnpairedLo float64  `json:"unpaired_ci_low"`
	UnpairedHi float64  `json:"unpaired_ci_high"`
	Ratio      *float64 `json:"ratio,omitempty"`
	PValue     float64  `json:"p_value"` // exact McNemar test
	Discordant int64    `json:"discordant_pairs"`
	Verdict    string   `json:"verdict" jsonschema:"enum=better,enum=worse,enum=no significant difference,enum=no difference observed"`
}

// VariantDoc is one variant's result in a comparison.
type VariantDoc struct {
	Name        string           `json:"name"`
	Scenario    ScenarioInfo     `json:"scenario"`
	Inputs      []InputDoc       `json:"inputs"`
	Modes       []ProbDoc        `json:"modes"`
	Samples     int64            `json:"valid_samples"`
	Invalid     int64            `json:"invalid_samples"`
	PreloadMean float64          `json:"preload_mean_N"`
	PreloadSD   float64          `json:"preload_sd_N"`
	Percentiles []PercentilesDoc `json:"percentiles"`
	// BinnedSamples: the samples behind this variant's percentiles.
	BinnedSamples int64 `json:"binned_samples"`
}

// CompareDoc is the result of `boltrisk compare --json`.
type CompareDoc struct {
	Envelope
	RequestedSamples int64        `json:"requested_samples"`
	Samples          int64        `json:"samples"` // pairs valid in every variant
	Seed             uint64       `json:"seed"`
	Workers          int          `json:"workers"`
	Confidence       float64      `json:"confidence"`
	IntervalMethod   string       `json:"interval_method" jsonschema:"enum=auto,enum=wilson,enum=exact"`
	Partial          bool         `json:"partial"`
	PercentileLevels []float64    `json:"percentile_levels"`
	BinStride        int64        `json:"bin_stride"`
	Variants         []VariantDoc `json:"variants"`
	Differences      []DiffDoc    `json:"differences"`
	Warnings         []string     `json:"warnings"`
	Caution          string       `json:"caution"`

	Retune *RetuneDoc `json:"retune,omitempty"` // with --retune: each variant at its own callout
}

// Compare builds the comparison document; names label the variants.
func Compare(ss []*scenario.Scenario, names []string, pr *montecarlo.Paired, run Run, version string) CompareDoc {
	base := pr.Variants[0]
	doc := CompareDoc{Envelope: envelope("compare", version), RequestedSamples: run.Samples, Samples: pr.Samples,
		Seed: base.Seed, Workers: base.Workers, Confidence: pr.Confidence, IntervalMethod: run.Interval.String(), Partial: pr.Partial,
		PercentileLevels: montecarlo.Levels, BinStride: base.BinStride, Warnings: []string{}, Caution: Caution}
	for i, r := range pr.Variants {
		vd := VariantDoc{Name: names[i], Scenario: Info(ss[i]), Inputs: Inputs(ss[i], units.SI), Modes: modeProbs(r, false),
			Samples: r.Samples, Invalid: r.Invalid, PreloadMean: r.PreloadMean, PreloadSD: r.PreloadSD,
			Percentiles: []PercentilesDoc{}, BinnedSamples: r.Binned}
		if r.HasDistributions() {
			for q := montecarlo.QPreload; q < montecarlo.NumQuantities; q++ {
				p := percentilesDoc(r.Quantities[q].Percentiles)
				p.Key, p.Title, p.Unit = q.Key(), q.Title(), "N"
				vd.Percentiles = append(vd.Percentiles, p)
			}
		}
		doc.Variants = append(doc.Variants, vd)
		if r.Invalid > 0 {
			doc.Warnings = append(doc.Warnings, fmt.Sprintf("%s: %d samples outside the model's domain were left out", names[i], r.Invalid))
		}
	}
	for v := 1; v < len(pr.Variants); v++ {
		dd := DiffDoc{Variant: names[v], Base: names[0]}
		add := func(key string, d interval.Difference) {
			md := ModeDiffDoc{Key: key, Difference: d.D, CILow: d.Lo, CIHigh: d.Hi, UnpairedLo: d.UnpairedLo, UnpairedHi: d.UnpairedHi,
				PValue: d.PValue, Discordant: d.Discordant, Verdict: d.Verdict(pr.Confidence)}
			if !math.IsNaN(d.Ratio) {
				ratio := d.Ratio
				md.Ratio = &ratio
			}
			dd.Modes = append(dd.Modes, md)
		}
		for _, m := range pr.Modes {
			add(m.Key(), pr.Difference(v, m))
		}
		add("any", pr.Difference(v, model.NumModes))
		doc.Differences = append(doc.Differences, dd)
	}
	return doc
}

// WriteCompare writes a comparison as text.
func WriteCompare(w io.Writer, doc CompareDoc, sys units.System) {
	fmt.Fprintf(w, "boltrisk compare — %s\n", strings.Join(variantNames(doc), " vs "))
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: interrupted after %d paired samples.\n", doc.Samples)
	}
	fmt.Fprintf(w, "\n%d paired samples valid in every variant (of %d requested), seed %d, %d workers: every variant sees the same draws of every shared input (common random numbers).\n",
		doc.Samples, doc.RequestedSamples, doc.Seed, doc.Workers)
	F := func(v float64) string { return sys.Format(v, units.Force) }
	fmt.Fprintln(w, "\nPreload (residual, per bolt)")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  variant\tmean\tsd\tc.o.v.\t1 %\t99 %\t")
	for _, v := range doc.Variants {
		lo, hi := "-", "-"
		if len(v.Percentiles) > 0 {
			p := v.Percentiles[0].Values
			lo, hi = F(p[0]), F(p[len(p)-1])
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%.3g\t%s\t%s\t\n", v.Name, F(v.PreloadMean), F(v.PreloadSD), v.PreloadSD/v.PreloadMean, lo, hi)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nFailure probabilities")
	fmt.Fprintf(w, "  (%s)\n", intervalNote(doc.IntervalMethod, doc.Confidence))
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "  mode\t")
	for _, v := range doc.Variants {
		fmt.Fprintf(tw, "%s\t", v.Name)
	}
	fmt.Fprintln(tw)
	for i, p := range doc.Variants[0].Modes {
		fmt.Fprintf(tw, "  %s\t", p.Title)
		for _, v := range doc.Variants {
			fmt.Fprintf(tw, "%s\t", FormatProb(v.Modes[i]))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	for _, dd := range doc.Differences {
		fmt.Fprintf(w, "\n%s against %s (paired difference, %.4g %% Newcombe score interval; exact McNemar test)\n", dd.Variant, dd.Base, 100*doc.Confidence)
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  mode\tdifference\tinterval\tratio\tverdict\t")
		for _, md := range dd.Modes {
			ratio := "-"
			if md.Ratio != nil {
				ratio = fmt.Sprintf("%.3g", *md.Ratio)
			}
			fmt.Fprintf(tw, "  %s\t%+.3e\t[%+.2e, %+.2e]\t%s\t%s\t\n", titleOfKey(md.Key), md.Difference, md.CILow, md.CIHigh, ratio, md.Verdict)
		}
		tw.Flush()
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

func variantNames(doc CompareDoc) []string {
	var out []string
	for _, v := range doc.Variants {
		out = append(out, v.Name)
	}
	return out
}

// titleOfKey is the title of a mode key ("any": "Any mode").
func titleOfKey(key string) string {
	if m, ok := model.ParseMode(key); ok {
		return m.Title()
	}
	if key == "any" {
		return "Any mode"
	}
	return key
}
