package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
	"boltrisk/montecarlo/scenario"
)

// ProbDoc is one estimated probability: a mode, or "any" (JSON contract of
// simulate: key, probability, cov, ci_low, ci_high, failures).
type ProbDoc struct {
	Key         string  `json:"key"`
	Title       string  `json:"title"`
	Probability float64 `json:"probability"`
	// COV is the coefficient of variation of the estimate; null when no
	// sample failed (the estimate is 0 and only the upper bound informs).
	COV    *float64 `json:"cov" jsonschema:"nullable"`
	CILow  float64  `json:"ci_low"`
	CIHigh float64  `json:"ci_high"`
	// Interval names how the bounds were computed: wilson,
	// clopper-pearson, one-sided-upper (no failure: ci_high is the one-sided
	// bound) or lognormal-cov (rare-event estimators, from the c.o.v.).
	Interval       string `json:"interval" jsonschema:"enum=wilson,enum=clopper-pearson,enum=one-sided-upper,enum=lognormal-cov"`
	Failures       int64  `json:"failures"`
	Samples        int64  `json:"samples"`
	UpperBoundOnly bool   `json:"upper_bound_only"`
	// Deterministic safety factor at nominal inputs (absent for "any").
	NominalSF *float64 `json:"nominal_safety_factor,omitempty"`
	// Safety-factor percentiles at the document's percentile_levels.
	SFPercentiles *PercentilesDoc `json:"safety_factor_percentiles,omitempty"`
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

// PercentilesDoc is the sampled distribution of one output at the levels
// of the document: values and their rank errors (each value is an exact
// empirical quantile of the binned samples at a level within ± its rank
// error of the nominal level).
type PercentilesDoc struct {
	Key        string    `json:"key,omitempty"`
	Title      string    `json:"title,omitempty"`
	Unit       string    `json:"unit,omitempty"`
	Values     []float64 `json:"values"`
	RankErrors []float64 `json:"rank_errors"`
}

// SimDoc is the result of `boltrisk simulate --json`.
type SimDoc struct {
	Envelope
	Scenario ScenarioInfo `json:"scenario"`
	Joint    JointDoc     `json:"joint"`
	Inputs   []InputDoc   `json:"inputs"`
	// Method is the estimator used: crude, importance or subset.
	Method      string `json:"method" jsonschema:"enum=crude,enum=importance,enum=subset"`
	MethodNote  string `json:"method_note,omitempty"` // why auto chose it
	Evaluations int64  `json:"evaluations"`           // evaluations of the joint model
	// RequestedSamples is the sample budget; Samples the valid samples,
	// InvalidSamples those outside the model's domain.
	RequestedSamples int64   `json:"requested_samples"`
	Samples          int64   `json:"samples"`
	InvalidSamples   int64   `json:"invalid_samples"`
	Seed             uint64  `json:"seed"`
	Workers          int     `json:"workers"`
	Confidence       float64 `json:"confidence"`
	IntervalMethod   string  `json:"interval_method" jsonschema:"enum=auto,enum=wilson,enum=exact"`
	Precision        float64 `json:"precision,omitempty"` // the stopping rule's target c.o.v.
	PrecisionMet     bool    `json:"precision_met"`
	Partial          bool    `json:"partial"`
	BoltsPerSample   int     `json:"bolt_evaluations_per_sample"`
	// BinnedSamples is the number of samples behind the percentiles: every
	// sample, or those of one chunk in BinStride in a large run.
	BinnedSamples    int64            `json:"binned_samples"`
	BinStride        int64            `json:"bin_stride"`
	Modes            []ProbDoc        `json:"modes"` // reported modes in report order, then "any"
	PercentileLevels []float64        `json:"percentile_levels"`
	Percentiles      []PercentilesDoc `json:"percentiles"`
	PreloadMean      float64          `json:"preload_mean_N"`
	PreloadSD        float64          `json:"preload_sd_N"`
	Nominal          NominalBody      `json:"nominal"`
	Warnings         []string         `json:"warnings"`
	Caution          string           `json:"caution"`
}

// Run describes the request of a run beyond its result.
type Run struct {
	Samples  int64
	Interval interval.Method
	Note     string // why the method was chosen
}

// Simulation builds the simulate document.
func Simulation(s *scenario.Scenario, r *montecarlo.Result, run Run, version string) SimDoc {
	doc := SimDoc{
		Envelope: envelope("simulate", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		Method: r.Method, MethodNote: run.Note, Evaluations: r.Evaluations,
		RequestedSamples: run.Samples, Samples: r.Samples, InvalidSamples: r.Invalid, Seed: r.Seed, Workers: r.Workers,
		Confidence: r.Confidence, IntervalMethod: run.Interval.String(), Precision: r.Precision, PrecisionMet: r.Converged,
		Partial: r.Partial, BoltsPerSample: r.NBolts,
		BinnedSamples: r.Binned, BinStride: r.BinStride, Modes: modeProbs(r, true),
		PercentileLevels: montecarlo.Levels, Percentiles: []PercentilesDoc{},
		PreloadMean: r.PreloadMean, PreloadSD: r.PreloadSD,
		Nominal: Body(r.Nominal), Warnings: warnings(s), Caution: Caution,
	}
	if r.HasDistributions() {
		for q := montecarlo.QPreload; q < montecarlo.NumQuantities; q++ {
			p := percentilesDoc(r.Quantities[q].Percentiles)
			p.Key, p.Title, p.Unit = q.Key(), q.Title(), "N"
			doc.Percentiles = append(doc.Percentiles, p)
		}
	}
	doc.Warnings = append(doc.Warnings, runWarnings(s, r)...)
	return doc
}

// runWarnings are the warnings a run's outcome raises.
func runWarnings(s *scenario.Scenario, r *montecarlo.Result) []string {
	var out []string
	if len(s.Problem.Vars) == 0 {
		out = append(out, "no input has a distribution: every sample is the nominal joint, so each mode fails in all samples or in none — give the scatter of the torque, nut factor or friction, loads and strengths")
	}
	if r.Invalid > 0 {
		out = append(out, fmt.Sprintf("%d of %d samples lay outside the model's domain (e.g. a negative nut factor drawn from a normal distribution); they are counted here and left out of the probabilities — consider a lognormal or truncated distribution", r.Invalid, r.Invalid+r.Samples))
	}
	if r.Precision > 0 && !r.Converged && !r.Partial {
		out = append(out, fmt.Sprintf("the precision target (c.o.v. ≤ %.3g) was not reached within the sample cap of %d; the c.o.v. reached is given per mode — raise --samples or choose a rare-event method", r.Precision, r.Samples+r.Invalid))
	}
	return out
}

// modeProbs documents the result's modes and, last, "any".
func modeProbs(r *montecarlo.Result, detail bool) []ProbDoc {
	var out []ProbDoc
	for i := range r.Modes {
		mr := &r.Modes[i]
		pd := probDoc(mr.Mode.Key(), mr.Mode.Title(), mr.Estimate)
		if detail {
			sf := FiniteSF(mr.NominalSF)
			pd.NominalSF = &sf
			if r.HasDistributions() {
				p := percentilesDoc(mr.SF.Percentiles)
				pd.SFPercentiles = &p
			}
			if mr.Bolt.Samples > 0 {
				b := mr.Bolt
				pd.PerBolt = &BoltProb{Probability: b.P, CILow: b.Lo, CIHigh: b.Hi, Failures: b.Failures, Bolts: b.Samples}
			}
		}
		out = append(out, pd)
	}
	return append(out, probDoc("any", "Any mode", r.Any))
}

func probDoc(key, title string, e interval.Estimate) ProbDoc {
	return ProbDoc{Key: key, Title: title, Probability: e.P, COV: finite(e.COV), CILow: e.Lo, CIHigh: e.Hi,
		Interval: e.Kind.Name(), Failures: e.Failures, Samples: e.Samples, UpperBoundOnly: e.UpperOnly()}
}

func percentilesDoc(ps []quantile.Percentile) PercentilesDoc {
	d := PercentilesDoc{Values: []float64{}, RankErrors: []float64{}}
	for _, p := range ps {
		d.Values = append(d.Values, FiniteSF(p.Value))
		d.RankErrors = append(d.RankErrors, p.RankError)
	}
	return d
}

// FormatProb writes a probability for people: "4.53e-02", or "< 3.0e-06"
// when no sample failed.
func FormatProb(p ProbDoc) string {
	if p.UpperBoundOnly {
		return fmt.Sprintf("< %.1e", p.CIHigh)
	}
	return fmt.Sprintf("%.3e", p.Probability)
}

// formatInterval writes the interval of an estimate, saying which it is;
// never "[0, 0]".
func formatInterval(p ProbDoc) string {
	switch p.Interval {
	case interval.KindOneSided.Name():
		return fmt.Sprintf("≤ %.2e (one-sided; none failed)", p.CIHigh)
	case interval.KindExact.Name():
		return fmt.Sprintf("[%.2e, %.2e] exact", p.CILow, p.CIHigh)
	}
	return fmt.Sprintf("[%.2e, %.2e]", p.CILow, p.CIHigh)
}

func formatCOV(p ProbDoc) string {
	if p.COV == nil {
		return "-"
	}
	return fmt.Sprintf("%.3g", *p.COV)
}

// intervalNote says how the intervals of a document were computed.
func intervalNote(method string, conf float64) string {
	base := fmt.Sprintf("%.4g %% intervals: ", 100*conf)
	switch method {
	case "wilson":
		return base + "Wilson score; where no sample failed, the one-sided exact upper bound"
	case "exact":
		return base + "exact Clopper–Pearson; where no sample failed, the one-sided exact upper bound"
	}
	return base + fmt.Sprintf("exact Clopper–Pearson below %d failures (marked exact), Wilson score above; where no sample failed, the one-sided exact upper bound", interval.ExactBelow)
}

// WriteSimulation writes the simulate result as terminal text.
func WriteSimulation(w io.Writer, s *scenario.Scenario, doc SimDoc, sys units.System) {
	title(w, "simulate", s)
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: the run was interrupted after %d samples; the estimates below use only those.\n", doc.Samples+doc.InvalidSamples)
	}
	writeInputs(w, doc.Joint, Inputs(s, sys), sys)
	F := func(v float64) string { return sys.Format(v, units.Force) }
	n := doc.Nominal
	fmt.Fprintf(w, "\nNominal joint: C = %.4f, preload %s (assembly %s), preload window %s … %s\n",
		n.JointConstant, F(n.Preload), F(n.AssemblyPreload), F(n.Window.Lower), F(n.Window.Upper))
	fmt.Fprintf(w, "\nFailure probabilities (%s): %d valid of %d samples requested, seed %d, %d workers\n",
		methodName(doc.Method), doc.Samples, doc.RequestedSamples, doc.Seed, doc.Workers)
	if doc.MethodNote != "" {
		fmt.Fprintf(w, "  method: %s\n", doc.MethodNote)
	}
	fmt.Fprintf(w, "  %s\n", intervalNote(doc.IntervalMethod, doc.Confidence))
	if doc.Precision > 0 {
		if doc.PrecisionMet {
			fmt.Fprintf(w, "  precision target c.o.v. ≤ %.3g met\n", doc.Precision)
		} else {
			fmt.Fprintf(w, "  precision target c.o.v. ≤ %.3g NOT met within the sample cap\n", doc.Precision)
		}
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  mode\tprobability\tc.o.v.\tinterval\tfailures / samples\tnominal SF\t")
	for _, p := range doc.Modes {
		sf := ""
		if p.NominalSF != nil {
			sf = fmtSF(*p.NominalSF)
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%d / %d\t%s\t\n", p.Title, FormatProb(p), formatCOV(p), formatInterval(p), p.Failures, p.Samples, sf)
	}
	tw.Flush()
	if doc.BoltsPerSample > 1 {
		fmt.Fprintf(w, "\nEach of the %d bolts draws its own assembly scatter; a joint fails a bolt mode when any bolt does.\n", doc.BoltsPerSample)
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "  mode\tper-bolt probability\tinterval\t")
		for _, p := range doc.Modes {
			if pb := p.PerBolt; pb != nil {
				q := ProbDoc{Probability: pb.Probability, CILow: pb.CILow, CIHigh: pb.CIHigh, UpperBoundOnly: pb.Failures == 0}
				fmt.Fprintf(tw, "  %s\t%s\t[%.2e, %.2e]\t\n", p.Title, FormatProb(q), pb.CILow, pb.CIHigh)
			}
		}
		tw.Flush()
	}
	if len(doc.Percentiles) > 0 {
		writePercentiles(w, doc, sys)
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

func methodName(m string) string {
	switch m {
	case "importance":
		return "importance sampling"
	case "subset":
		return "subset simulation"
	}
	return "crude Monte Carlo"
}

func writePercentiles(w io.Writer, doc SimDoc, sys units.System) {
	F := func(v float64) string { return sys.Format(v, units.Force) }
	fmt.Fprintln(w, "\nPercentiles")
	fmt.Fprintf(w, "  (%s)\n", percentileNote(doc.BinnedSamples, doc.Samples, doc.BinStride, maxRankError(doc)))
	if doc.BoltsPerSample > 1 {
		fmt.Fprintln(w, "  (forces: one bolt of each sample, the bolts in turn; safety factors: the joint, i.e. its worst bolt)")
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "  quantity\t")
	for _, l := range doc.PercentileLevels {
		fmt.Fprintf(tw, "%g %%\t", 100*l)
	}
	fmt.Fprintln(tw)
	for _, q := range doc.Percentiles {
		fmt.Fprintf(tw, "  %s\t", q.Title)
		for _, v := range q.Values {
			fmt.Fprintf(tw, "%s\t", F(v))
		}
		fmt.Fprintln(tw)
	}
	for _, p := range doc.Modes {
		if p.SFPercentiles == nil {
			continue
		}
		fmt.Fprintf(tw, "  safety factor, %s\t", strings.ToLower(p.Title))
		for _, v := range p.SFPercentiles.Values {
			fmt.Fprintf(tw, "%.3f\t", v)
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	fmt.Fprintf(w, "  preload mean %s, standard deviation %s (c.o.v. %.3g)\n", F(doc.PreloadMean), F(doc.PreloadSD), doc.PreloadSD/doc.PreloadMean)
}

// maxRankError is the largest rank error of the document's percentiles.
func maxRankError(doc SimDoc) float64 {
	m := 0.0
	for _, q := range doc.Percentiles {
		for _, e := range q.RankErrors {
			m = max(m, e)
		}
	}
	for _, p := range doc.Modes {
		if p.SFPercentiles != nil {
			for _, e := range p.SFPercentiles.RankErrors {
				m = max(m, e)
			}
		}
	}
	return m
}

// percentileNote says what the percentiles rest on.
func percentileNote(binned, samples, stride int64, rankErr float64) string {
	s := fmt.Sprintf("each an exact quantile of the binned samples at a level within ±%.2g of its nominal level", rankErr)
	if binned >= samples || stride <= 1 {
		return s + "; every sample binned"
	}
	return s + fmt.Sprintf("; from %d of the %d samples (one chunk in %d) — the probabilities count every sample", binned, samples, stride)
}
