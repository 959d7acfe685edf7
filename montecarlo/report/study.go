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
	"boltrisk/montecarlo/scenario"
)

// VaryDoc describes the varied quantity of a sweep.
type VaryDoc struct {
	Input  string    `json:"input"` // input path, "load" or "spread:<path>"
	Kind   string    `json:"kind"`  // "value", "load-multiplier", "spread-multiplier"
	Unit   string    `json:"unit"`  // of values (internal SI: N, mm, MPa, N*mm; "" for multipliers)
	Values []float64 `json:"values"`
}

// StepDoc is one step of a sweep.
type StepDoc struct {
	Value float64            `json:"value"`
	Modes map[string]ProbDoc `json:"modes"`
}

// TargetWindowDoc is the range of the varied value meeting a target probability.
type TargetWindowDoc struct {
	Target          float64  `json:"target_probability"`
	Found           bool     `json:"found"`
	Lower           float64  `json:"lower"`
	Upper           float64  `json:"upper"`
	LowerOpen       bool     `json:"lower_at_range_end"`
	UpperOpen       bool     `json:"upper_at_range_end"`
	LowerBoundModes []string `json:"modes_bounding_lower"`
	UpperBoundModes []string `json:"modes_bounding_upper"`
	// Set when no single mode exceeds the target beyond that end, only the
	// joint as a whole; the list then names the largest contributor.
	LowerCombined   bool    `json:"lower_bounded_by_combination"`
	UpperCombined   bool    `json:"upper_bounded_by_combination"`
	Best            float64 `json:"least_any_mode_at"`
	BestProbability float64 `json:"least_any_mode_probability"`
}

// SpreadDoc answers the inverse question: how much scatter still meets the target.
type SpreadDoc struct {
	Input       string  `json:"input"`
	Target      float64 `json:"target_probability"`
	Factor      float64 `json:"spread_factor"`
	SD          float64 `json:"sd"`
	COV         float64 `json:"cov"`
	Unit        string  `json:"unit"`
	Probability float64 `json:"any_mode_probability"`
	Below       bool    `json:"target_missed_at_least_scatter"`
	Above       bool    `json:"target_met_at_most_scatter"`
	Description string  `json:"distribution"`
}

// SweepDoc is the result of `boltrisk sweep --json`.
type SweepDoc struct {
	SchemaVersion  int              `json:"schema_version"`
	Kind           string           `json:"kind"`
	ToolVersion    string           `json:"tool_version"`
	Scenario       ScenarioInfo     `json:"scenario"`
	Inputs         []InputRow       `json:"inputs,omitempty"`
	Vary           *VaryDoc         `json:"vary,omitempty"`
	SamplesPerStep int64            `json:"samples_per_step"`
	Seed           uint64           `json:"seed"`
	Confidence     float64          `json:"confidence"`
	Partial        bool             `json:"partial"`
	ModeOrder      []string         `json:"mode_order,omitempty"`
	Steps          []StepDoc        `json:"steps,omitempty"`
	Window         *TargetWindowDoc `json:"window,omitempty"`
	Conservative   *TargetWindowDoc `json:"window_upper_bounds,omitempty"`
	Spread         *SpreadDoc       `json:"spread_limit,omitempty"`
	Warnings       []string         `json:"warnings"`
	Caution        string           `json:"caution"`
}

func resultModes(r *montecarlo.Result) (map[string]ProbDoc, []string) {
	out := map[string]ProbDoc{}
	var order []string
	for _, m := range r.Modes {
		out[m.Mode.Key()] = probDoc(m.Mode.Title(), m.Interval)
		order = append(order, m.Mode.Key())
	}
	out["any"] = probDoc("Any mode", r.Any)
	return out, append(order, "any")
}

func windowDoc(w montecarlo.Window) *TargetWindowDoc {
	d := &TargetWindowDoc{Target: w.Target, Found: w.Found, Lower: w.Lo, Upper: w.Hi, LowerOpen: w.OpenLo, UpperOpen: w.OpenHi,
		Best: w.Best, BestProbability: w.BestP, LowerBoundModes: []string{}, UpperBoundModes: []string{},
		LowerCombined: w.LoCombined, UpperCombined: w.HiCombined}
	for _, m := range w.LoModes {
		d.LowerBoundModes = append(d.LowerBoundModes, m.Key())
	}
	for _, m := range w.HiModes {
		d.UpperBoundModes = append(d.UpperBoundModes, m.Key())
	}
	return d
}

// Sweep builds the sweep document; target ≤ 0 means no window.
func Sweep(s *scenario.Scenario, sw *montecarlo.Sweep, set montecarlo.Settings, target float64, version string) SweepDoc {
	doc := SweepDoc{SchemaVersion: SchemaVersion, Kind: "sweep", ToolVersion: version, Scenario: Info(s),
		Inputs: Inputs(s, units.SI), SamplesPerStep: set.Samples, Seed: set.Seed, Confidence: set.Confidence,
		Partial: sw.Partial, Warnings: []string{}, Caution: Caution}
	doc.Vary = varyDoc(&sw.Vary)
	for _, st := range sw.Steps {
		modes, order := resultModes(st.Result)
		doc.Steps = append(doc.Steps, StepDoc{Value: st.X, Modes: modes})
		doc.ModeOrder = order
	}
	if target > 0 && !sw.Partial {
		doc.Window = windowDoc(montecarlo.FindWindow(sw, target, false))
		doc.Conservative = windowDoc(montecarlo.FindWindow(sw, target, true))
	}
	for _, w := range s.Warnings {
		doc.Warnings = append(doc.Warnings, w.String())
	}
	return doc
}

func varyDoc(v *montecarlo.Vary) *VaryDoc {
	d := &VaryDoc{Values: v.Values()}
	switch v.Kind {
	case montecarlo.VaryInput:
		d.Input, d.Kind = v.Path, "value"
		d.Unit = internalUnit(scenario.FieldDim(v.Path))
	case montecarlo.VaryLoad:
		d.Input, d.Kind = "load", "load-multiplier"
	case montecarlo.VarySpread:
		d.Input, d.Kind = "spread:"+v.Path, "spread-multiplier"
	}
	return d
}

// formatter returns how to print a value of the varied quantity: with its
// unit, or as a multiplier "×1.5".
func (v *VaryDoc) formatter(sys units.System) func(float64) string {
	if v.Kind != "value" {
		return func(x float64) string { return "×" + units.Sig(x, 3) }
	}
	dim := scenario.FieldDim(v.Input)
	return func(x float64) string { return sys.Format(x, dim) }
}

// internalUnit names the internal unit of a dimension (the unit of JSON values).
func internalUnit(d units.Dim) string {
	return map[units.Dim]string{units.Force: "N", units.Length: "mm", units.Stress: "MPa", units.Torque: "N*mm", units.Stiffness: "N/mm"}[d]
}

// SpreadLimit builds the document of a spread-limit search.
func SpreadLimit(s *scenario.Scenario, sl *montecarlo.SpreadLimit, set montecarlo.Settings, version string) SweepDoc {
	doc := SweepDoc{SchemaVersion: SchemaVersion, Kind: "spread-limit", ToolVersion: version, Scenario: Info(s),
		Inputs: Inputs(s, units.SI), SamplesPerStep: set.Samples, Seed: set.Seed, Confidence: set.Confidence,
		Warnings: []string{}, Caution: Caution}
	dim := scenario.FieldDim(sl.Path)
	d := sl.Dist
	doc.Spread = &SpreadDoc{Input: sl.Path, Target: sl.Target, Factor: sl.Factor, SD: d.StdDev(), COV: d.StdDev() / d.Mean(),
		Unit: internalUnit(dim), Probability: sl.P, Below: sl.Below, Above: sl.Above,
		Description: d.Describe(func(v float64) string { return units.SI.Format(v, dim) })}
	return doc
}

// WriteSweep writes a sweep (or spread-limit) result as text.
func WriteSweep(w io.Writer, s *scenario.Scenario, doc SweepDoc, sys units.System) {
	title(w, "sweep", s)
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: interrupted after %d of %d steps.\n", len(doc.Steps), len(doc.Vary.Values))
	}
	if doc.Spread != nil {
		writeSpread(w, doc, sys)
		writeWarnings(w, doc.Warnings)
		WriteCaution(w)
		return
	}
	v := doc.Vary
	fx := v.formatter(sys)
	fmt.Fprintf(w, "\nVarying %s from %s to %s in %d steps; %d samples per step, seed %d, the same random streams at every step.\n",
		v.Input, fx(v.Values[0]), fx(v.Values[len(v.Values)-1]), len(v.Values), doc.SamplesPerStep, doc.Seed)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "  ", shortName(v.Input), "\t")
	for _, k := range doc.ModeOrder {
		fmt.Fprintf(tw, "%s\t", k)
	}
	fmt.Fprintln(tw)
	for _, st := range doc.Steps {
		fmt.Fprintf(tw, "  %s\t", fx(st.Value))
		for _, k := range doc.ModeOrder {
			fmt.Fprintf(tw, "%s\t", FormatProb(st.Modes[k]))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	if doc.Window != nil {
		writeWindow(w, doc.Window, fx, "point estimates")
		writeWindow(w, doc.Conservative, fx, fmt.Sprintf("upper %.4g %% bounds", 100*doc.Confidence))
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

// Bound says what limits one end of a window.
func Bound(open, combined bool, modes []string) string {
	switch {
	case open:
		return "end of the swept range: widen it"
	case combined:
		return "bounded by the joint as a whole: no single mode exceeds the target; largest " + strings.Join(modes, ", ")
	}
	return "bounded by " + strings.Join(modes, ", ")
}

func shortName(p string) string {
	if i := strings.LastIndexByte(p, '.'); i >= 0 {
		return p[i+1:]
	}
	return p
}

func writeWindow(w io.Writer, d *TargetWindowDoc, fx func(float64) string, basis string) {
	fmt.Fprintf(w, "\nWindow for a failure probability ≤ %.3g (%s):\n", d.Target, basis)
	if !d.Found {
		fmt.Fprintf(w, "  NO value in the swept range meets the target; the least any-mode probability is %.3g at %s.\n", d.BestProbability, fx(d.Best))
		return
	}
	fmt.Fprintf(w, "  from %s (%s)\n  to   %s (%s)\n", fx(d.Lower), Bound(d.LowerOpen, d.LowerCombined, d.LowerBoundModes),
		fx(d.Upper), Bound(d.UpperOpen, d.UpperCombined, d.UpperBoundModes))
	fmt.Fprintf(w, "  least any-mode probability %.3g at %s\n", d.BestProbability, fx(d.Best))
}

func writeSpread(w io.Writer, doc SweepDoc, sys units.System) {
	sp := doc.Spread
	dim := scenario.FieldDim(sp.Input)
	fmt.Fprintf(w, "\nLargest scatter of %s for a failure probability ≤ %.3g (%d samples per trial, seed %d, common random numbers):\n",
		sp.Input, sp.Target, doc.SamplesPerStep, doc.Seed)
	switch {
	case sp.Below:
		fmt.Fprintf(w, "  NONE: even 1/64 of the scenario's scatter gives %.3g; the nominal design misses the target.\n", sp.Probability)
	case sp.Above:
		fmt.Fprintf(w, "  the target holds even at 16× the scenario's scatter (%.3g); scatter of this input does not govern.\n", sp.Probability)
	default:
		fmt.Fprintf(w, "  %.3g × the scenario's scatter: sd %s, c.o.v. %.3g, i.e. ±%.3g %% at 3σ\n", sp.Factor, sys.Format(sp.SD, dim), sp.COV, 300*sp.COV)
		fmt.Fprintf(w, "  distribution at the limit: %s (any-mode probability %.3g)\n", sp.Description, sp.Probability)
	}
}

// DiffDoc compares one variant with the base, per mode.
type DiffDoc struct {
	Variant string                 `json:"variant"`
	Base    string                 `json:"base"`
	Modes   map[string]ModeDiffDoc `json:"modes"`
}

// ModeDiffDoc is the paired comparison of one mode.
type ModeDiffDoc struct {
	Difference float64  `json:"difference"`
	CILow      float64  `json:"ci_low"`
	CIHigh     float64  `json:"ci_high"`
	UnpairedLo float64  `json:"unpaired_ci_low"`
	UnpairedHi float64  `json:"unpaired_ci_high"`
	Ratio      *float64 `json:"ratio,omitempty"`
	PValue     float64  `json:"p_value"`
	Discordant int64    `json:"discordant_pairs"`
	Verdict    string   `json:"verdict"`
}

// VariantDoc is one variant's result in a comparison.
type VariantDoc struct {
	Name        string               `json:"name"`
	Scenario    ScenarioInfo         `json:"scenario"`
	Inputs      []InputRow           `json:"inputs"`
	Modes       map[string]ProbDoc   `json:"modes"`
	PreloadMean float64              `json:"preload_mean_N"`
	PreloadSD   float64              `json:"preload_sd_N"`
	Percentiles map[string][]float64 `json:"percentiles"`
}

// CompareDoc is the result of `boltrisk compare --json`.
type CompareDoc struct {
	SchemaVersion    int       `json:"schema_version"`
	Kind             string    `json:"kind"`
	ToolVersion      string    `json:"tool_version"`
	Samples          int64     `json:"samples"`
	Seed             uint64    `json:"seed"`
	Confidence       float64   `json:"confidence"`
	Partial          bool      `json:"partial"`
	ModeOrder        []string  `json:"mode_order"`
	PercentileLevels []float64 `json:"percentile_levels"`
	// BinnedSamples and BinStride: the samples behind the percentiles, as
	// in SimDoc (the base variant's count).
	BinnedSamples int64        `json:"binned_samples"`
	BinStride     int64        `json:"bin_stride"`
	Variants      []VariantDoc `json:"variants"`
	Differences   []DiffDoc    `json:"differences"`
	Warnings      []string     `json:"warnings"`
	Caution       string       `json:"caution"`
}

// Verdicts of a comparison.
const (
	Better       = "better"
	Worse        = "worse"
	NoDifference = "no significant difference"
	NoDiscordant = "no difference observed"
)

// Compare builds the comparison document; names label the variants.
func Compare(ss []*scenario.Scenario, names []string, pr *montecarlo.Paired, set montecarlo.Settings, version string) CompareDoc {
	doc := CompareDoc{SchemaVersion: SchemaVersion, Kind: "compare", ToolVersion: version, Samples: pr.Samples,
		Seed: set.Seed, Confidence: pr.Variants[0].Confidence, Partial: pr.Partial, PercentileLevels: Levels,
		BinnedSamples: pr.Variants[0].Binned, BinStride: pr.Variants[0].BinStride,
		Warnings: []string{}, Caution: Caution}
	for i, r := range pr.Variants {
		modes, order := resultModes(r)
		doc.ModeOrder = order
		vd := VariantDoc{Name: names[i], Scenario: Info(ss[i]), Inputs: Inputs(ss[i], units.SI), Modes: modes,
			PreloadMean: r.PreloadMean, PreloadSD: r.PreloadSD, Percentiles: map[string][]float64{}}
		for q := montecarlo.QPreload; q <= montecarlo.QClamp; q++ {
			vd.Percentiles[q.Key()] = percentiles(&r.Q[q])
		}
		doc.Variants = append(doc.Variants, vd)
		if r.Invalid > 0 {
			doc.Warnings = append(doc.Warnings, fmt.Sprintf("%s: %d samples outside the model's domain were left out", names[i], r.Invalid))
		}
	}
	conf := doc.Confidence
	base := pr.Variants[0]
	for v := 1; v < len(pr.Variants); v++ {
		dd := DiffDoc{Variant: names[v], Base: names[0], Modes: map[string]ModeDiffDoc{}}
		r := pr.Variants[v]
		add := func(key string, idx int, pb, pv float64) {
			d := montecarlo.PairedDifference(pr.Samples, pr.OnlyBase[v][idx], pr.OnlyVariant[v][idx], pb, pv, conf)
			md := ModeDiffDoc{Difference: d.D, CILow: d.Lo, CIHigh: d.Hi, UnpairedLo: d.UnpairedLo, UnpairedHi: d.UnpairedHi,
				PValue: d.PValue, Discordant: d.Discordant, Verdict: verdict(d, conf)}
			if !math.IsNaN(d.Ratio) {
				ratio := d.Ratio
				md.Ratio = &ratio
			}
			dd.Modes[key] = md
		}
		for i, m := range pr.Modes {
			add(m.Key(), int(m), base.Modes[i].Interval.P, r.Modes[i].Interval.P)
		}
		add("any", int(model.NumModes), base.Any.P, r.Any.P)
		doc.Differences = append(doc.Differences, dd)
	}
	return doc
}

func verdict(d montecarlo.Difference, conf float64) string {
	switch {
	case d.Discordant == 0:
		return NoDiscordant
	case d.PValue < 1-conf && d.D < 0:
		return Better
	case d.PValue < 1-conf && d.D > 0:
		return Worse
	}
	return NoDifference
}

// WriteCompare writes a comparison as text.
func WriteCompare(w io.Writer, doc CompareDoc, sys units.System) {
	fmt.Fprintf(w, "boltrisk compare — %s\n", strings.Join(variantNames(doc), " vs "))
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: interrupted after %d paired samples.\n", doc.Samples)
	}
	fmt.Fprintf(w, "\n%d paired samples, seed %d: every variant sees the same draws of every shared input (common random numbers).\n", doc.Samples, doc.Seed)
	F := func(v float64) string { return sys.Format(v, units.Force) }
	fmt.Fprintln(w, "\nPreload (residual, per bolt)")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  variant\tmean\tsd\tc.o.v.\t1 %\t99 %\t")
	for _, v := range doc.Variants {
		p := v.Percentiles["preload_N"]
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%.3g\t%s\t%s\t\n", v.Name, F(v.PreloadMean), F(v.PreloadSD), v.PreloadSD/v.PreloadMean, F(p[0]), F(p[4]))
	}
	tw.Flush()
	if note := BinnedNote(doc.BinnedSamples, doc.Samples, doc.BinStride); note != "" {
		fmt.Fprintf(w, "  (%s)\n", note)
	}
	fmt.Fprintln(w, "\nFailure probabilities")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "  mode\t")
	for _, v := range doc.Variants {
		fmt.Fprintf(tw, "%s\t", v.Name)
	}
	fmt.Fprintln(tw)
	for _, k := range doc.ModeOrder {
		fmt.Fprintf(tw, "  %s\t", k)
		for _, v := range doc.Variants {
			fmt.Fprintf(tw, "%s\t", FormatProb(v.Modes[k]))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	for _, dd := range doc.Differences {
		fmt.Fprintf(w, "\n%s against %s (paired difference, %.4g %% interval; exact McNemar test)\n", dd.Variant, dd.Base, 100*doc.Confidence)
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  mode\tdifference\tinterval\tratio\tverdict\t")
		for _, k := range doc.ModeOrder {
			md := dd.Modes[k]
			ratio := "-"
			if md.Ratio != nil {
				ratio = fmt.Sprintf("%.3g", *md.Ratio)
			}
			fmt.Fprintf(tw, "  %s\t%+.3e\t[%+.2e, %+.2e]\t%s\t%s\t\n", k, md.Difference, md.CILow, md.CIHigh, ratio, md.Verdict)
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
