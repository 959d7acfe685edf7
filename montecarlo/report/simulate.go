package report

import (
	"fmt"
	"io"
	"text/tabwriter"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// Percentile levels reported for every tracked quantity.
var Levels = []float64{0.01, 0.05, 0.50, 0.95, 0.99}

// ProbDoc is one estimated probability (JSON contract of simulate: each mode
// and "any" carry probability, ci_low, ci_high, failures).
type ProbDoc struct {
	Title          string  `json:"title"`
	Probability    float64 `json:"probability"`
	CILow          float64 `json:"ci_low"`
	CIHigh         float64 `json:"ci_high"`
	Failures       int64   `json:"failures"`
	Samples        int64   `json:"samples"`
	UpperBoundOnly bool    `json:"upper_bound_only"`
	// Deterministic safety factor at nominal inputs (absent for "any").
	NominalSF *float64 `json:"nominal_safety_factor,omitempty"`
	// Safety-factor percentiles (levels in "percentile_levels").
	SFPercentiles []float64 `json:"safety_factor_percentiles,omitempty"`
	// Bolt-level estimate for joints whose bolts draw their own scatter.
	PerBolt *BoltProb `json:"per_bolt,omitempty"`
}

// BoltProb is the share of bolt evaluations that fail a bolt mode.
type BoltProb struct {
	Probability float64 `json:"probability"`
	CILow       float64 `json:"ci_low"`
	CIHigh      float64 `json:"ci_high"`
	Failures    int64   `json:"failures"`
	Bolts       int64   `json:"bolt_evaluations"`
}

// SimDoc is the result of `boltrisk simulate --json`.
type SimDoc struct {
	SchemaVersion  int          `json:"schema_version"`
	Kind           string       `json:"kind"`
	ToolVersion    string       `json:"tool_version"`
	Scenario       ScenarioInfo `json:"scenario"`
	Inputs         []InputRow   `json:"inputs"`
	Samples        int64        `json:"samples"`
	InvalidSamples int64        `json:"invalid_samples"`
	Seed           uint64       `json:"seed"`
	Confidence     float64      `json:"confidence"`
	Interval       string       `json:"interval_method"`
	Target         float64      `json:"target_rel_half_width,omitempty"`
	Converged      bool         `json:"target_met"`
	Partial        bool         `json:"partial"`
	BoltsPerSample int          `json:"bolt_evaluations_per_sample"`
	// BinnedSamples is the number of samples behind the percentiles: every
	// sample, or those of one chunk in BinStride in a large run.
	BinnedSamples    int64                `json:"binned_samples"`
	BinStride        int64                `json:"bin_stride"`
	Modes            map[string]ProbDoc   `json:"modes"`
	ModeOrder        []string             `json:"mode_order"`
	PercentileLevels []float64            `json:"percentile_levels"`
	Percentiles      map[string][]float64 `json:"percentiles"`
	PreloadMean      float64              `json:"preload_mean_N"`
	PreloadSD        float64              `json:"preload_sd_N"`
	Nominal          NominalDoc           `json:"nominal"`
	Warnings         []string             `json:"warnings"`
	Caution          string               `json:"caution"`
}

// Simulation builds the simulate document.
func Simulation(s *scenario.Scenario, r *montecarlo.Result, target float64, version string) SimDoc {
	nom := Nominal(s, version)
	doc := SimDoc{
		SchemaVersion: SchemaVersion, Kind: "simulate", ToolVersion: version,
		Scenario: Info(s), Inputs: nom.Inputs,
		Samples: r.Samples, InvalidSamples: r.Invalid, Seed: r.Seed, Confidence: r.Confidence,
		Interval: "wilson; one-sided clopper-pearson upper bound when no sample failed",
		Target:   target, Converged: r.Converged, Partial: r.Partial, BoltsPerSample: r.NBolts,
		BinnedSamples: r.Binned, BinStride: r.BinStride,
		Modes: map[string]ProbDoc{}, PercentileLevels: Levels, Percentiles: map[string][]float64{},
		PreloadMean: r.PreloadMean, PreloadSD: r.PreloadSD,
		Nominal: nom, Warnings: append([]string{}, nom.Warnings...), Caution: Caution,
	}
	for i := range r.Modes {
		mr := &r.Modes[i]
		pd := probDoc(mr.Mode.Title(), mr.Interval)
		sf := FiniteSF(mr.NominalSF)
		pd.NominalSF = &sf
		pd.SFPercentiles = percentiles(&mr.SF)
		if mr.BoltSamples > 0 {
			iv := montecarlo.Wilson(mr.BoltFailures, mr.BoltSamples, r.Confidence)
			pd.PerBolt = &BoltProb{Probability: iv.P, CILow: iv.Lo, CIHigh: iv.Hi, Failures: iv.Failures, Bolts: iv.Samples}
		}
		doc.Modes[mr.Mode.Key()] = pd
		doc.ModeOrder = append(doc.ModeOrder, mr.Mode.Key())
	}
	doc.Modes["any"] = probDoc("Any mode", r.Any)
	doc.ModeOrder = append(doc.ModeOrder, "any")
	for q := montecarlo.QPreload; q <= montecarlo.QClamp; q++ {
		doc.Percentiles[q.Key()] = percentiles(&r.Q[q])
	}
	if len(s.Problem.Vars) == 0 {
		doc.Warnings = append(doc.Warnings, "no input has a distribution: every sample is the nominal joint, so each mode fails in all samples or in none — give the scatter of the torque, nut factor or friction, loads and strengths")
	}
	if r.Invalid > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d samples lay outside the model's domain (e.g. a negative nut factor drawn from a normal distribution); they are counted here and left out of the probabilities — consider a lognormal or truncated distribution", r.Invalid))
	}
	return doc
}

func probDoc(title string, iv montecarlo.Interval) ProbDoc {
	return ProbDoc{Title: title, Probability: iv.P, CILow: iv.Lo, CIHigh: iv.Hi, Failures: iv.Failures, Samples: iv.Samples, UpperBoundOnly: iv.UpperOnly}
}

func percentiles(h *montecarlo.Histogram) []float64 {
	out := make([]float64, len(Levels))
	for i, l := range Levels {
		out[i] = FiniteSF(h.Quantile(l))
	}
	return out
}

// FormatProb writes a probability for people: "4.53e-02", or "< 3.0e-06"
// when no sample failed.
func FormatProb(p ProbDoc) string {
	if p.UpperBoundOnly {
		return fmt.Sprintf("< %.1e", p.CIHigh)
	}
	return fmt.Sprintf("%.3e", p.Probability)
}

// WriteSimulation writes the simulate result as terminal text.
func WriteSimulation(w io.Writer, s *scenario.Scenario, doc SimDoc, sys units.System) {
	title(w, "simulate", s)
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: the run was interrupted after %d samples; the estimates below use only those.\n", doc.Samples+doc.InvalidSamples)
	}
	fmt.Fprintln(w, "\nInputs")
	writeRows(w, Inputs(s, sys))
	F := func(v float64) string { return sys.Format(v, units.Force) }
	n := doc.Nominal
	fmt.Fprintf(w, "\nNominal joint: C = %.4f, preload %s (assembly %s), preload window %s … %s\n",
		n.JointConstant, F(n.Preload), F(n.AssemblyPreload), F(n.Window.Lower), F(n.Window.Upper))
	fmt.Fprintf(w, "\nFailure probabilities: %d samples, seed %d, %.4g %% intervals", doc.Samples, doc.Seed, 100*doc.Confidence)
	if doc.Target > 0 {
		if doc.Converged {
			fmt.Fprintf(w, ", target ±%.3g %% met", 100*doc.Target)
		} else {
			fmt.Fprintf(w, ", target ±%.3g %% NOT met within the sample cap", 100*doc.Target)
		}
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  mode\tprobability\tinterval\tfailures / samples\tnominal SF\t")
	for _, k := range doc.ModeOrder {
		p := doc.Modes[k]
		iv := fmt.Sprintf("[%.2e, %.2e]", p.CILow, p.CIHigh)
		if p.UpperBoundOnly {
			iv = "(none failed; one-sided bound)"
		}
		sf := ""
		if p.NominalSF != nil {
			sf = fmtSF(*p.NominalSF)
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%d / %d\t%s\t\n", k, FormatProb(p), iv, p.Failures, p.Samples, sf)
	}
	tw.Flush()
	if doc.BoltsPerSample > 1 {
		fmt.Fprintf(w, "\nEach of the %d bolts draws its own assembly scatter; a joint fails a bolt mode when any bolt does.\n", doc.BoltsPerSample)
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "  mode\tper-bolt probability\tinterval\t")
		for _, k := range doc.ModeOrder {
			if pb := doc.Modes[k].PerBolt; pb != nil {
				p := ProbDoc{Probability: pb.Probability, CILow: pb.CILow, CIHigh: pb.CIHigh, UpperBoundOnly: pb.Failures == 0}
				fmt.Fprintf(tw, "  %s\t%s\t[%.2e, %.2e]\t\n", k, FormatProb(p), pb.CILow, pb.CIHigh)
			}
		}
		tw.Flush()
	}
	fmt.Fprintln(w, "\nPercentiles")
	if note := BinnedNote(doc.BinnedSamples, doc.Samples, doc.BinStride); note != "" {
		fmt.Fprintf(w, "  (%s)\n", note)
	}
	if doc.BoltsPerSample > 1 {
		fmt.Fprintln(w, "  (forces: every bolt of each sample; safety factors: the joint, i.e. its worst bolt)")
	}
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "  quantity\t")
	for _, l := range Levels {
		fmt.Fprintf(tw, "%g %%\t", 100*l)
	}
	fmt.Fprintln(tw)
	for _, q := range []struct {
		key, label string
	}{{"preload_N", "residual preload"}, {"bolt_force_N", "largest bolt force"}, {"clamp_force_N", "least clamp force"}} {
		fmt.Fprintf(tw, "  %s\t", q.label)
		for _, v := range doc.Percentiles[q.key] {
			fmt.Fprintf(tw, "%s\t", F(v))
		}
		fmt.Fprintln(tw)
	}
	for _, k := range doc.ModeOrder {
		p := doc.Modes[k]
		if p.SFPercentiles == nil {
			continue
		}
		fmt.Fprintf(tw, "  SF %s\t", k)
		for _, v := range p.SFPercentiles {
			fmt.Fprintf(tw, "%.3f\t", v)
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	fmt.Fprintf(w, "  preload mean %s, standard deviation %s (c.o.v. %.3g)\n", F(doc.PreloadMean), F(doc.PreloadSD), doc.PreloadSD/doc.PreloadMean)
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

// BinnedNote says how many samples the percentiles and histograms rest on
// when a large run binned only some of its chunks; "" when it binned all.
func BinnedNote(binned, samples, stride int64) string {
	if binned >= samples || stride <= 1 {
		return ""
	}
	return fmt.Sprintf("percentiles and histograms from %d of the %d samples (one chunk in %d); the probabilities count every sample", binned, samples, stride)
}
