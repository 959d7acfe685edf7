package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
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
	BinnedSamples int64     `json:"binned_samples"`
	BinStride     int64     `json:"bin_stride"`
	Modes         []ProbDoc `json:"modes"` // reported modes in report order, then "any"
	// Cases are the per-load-case probabilities (files with loads.cases).
	Cases            []CaseDoc        `json:"cases,omitempty"`
	PercentileLevels []float64        `json:"percentile_levels"`
	Percentiles      []PercentilesDoc `json:"percentiles"`
	// PercentileSource says where the percentiles come from: "every
	// sample", "binned chunks", or a crude pass of a rare-event run.
	PercentileSource string           `json:"percentile_source"`
	PreloadMean      float64          `json:"preload_mean_N"`
	PreloadSD        float64          `json:"preload_sd_N"`
	DesignPoints     []DesignPointDoc `json:"design_points,omitempty"`
	Diagnostics      []DiagnosticsDoc `json:"diagnostics,omitempty"`
	Nominal          NominalBody      `json:"nominal"`
	Checks
	Warnings []string `json:"warnings"`
	Caution  string   `json:"caution"`

	Drivers *DriversBody `json:"drivers,omitempty"` // with --drivers: what drives each mode
}

// Run describes the request of a run beyond its result.
type Run struct {
	Samples  int64
	Interval interval.Method
}

// DesignPointDoc is a mode's Hasofer–Lind design point for one bolt (FORM).
type DesignPointDoc struct {
	Mode string  `json:"mode"`
	Bolt int     `json:"bolt"` // counting from 1; 0 for a joint-level mode
	Beta float64 `json:"beta"`
	// FORMApproximation is Φ(−β): a first-order approximation, not an
	// estimate (no error bar); 0 when the search did not converge.
	FORMApproximation float64          `json:"form_approximation"`
	Converged         bool             `json:"converged"`
	Message           string           `json:"message,omitempty"`
	Evaluations       int64            `json:"evaluations"`
	Inputs            []DesignInputDoc `json:"inputs"`
}

// DesignInputDoc is one input at a design point.
type DesignInputDoc struct {
	Path string `json:"path"`
	Bolt int    `json:"bolt"` // counting from 1; 0 for a shared input
	// Value in the input's SI unit; null for the shared part of a per-bolt
	// input (a coordinate, not a value).
	Value *float64 `json:"value"`
	U     float64  `json:"u"`     // standard-normal coordinate
	Alpha float64  `json:"alpha"` // direction cosine: α > 0 load-like, α < 0 resistance-like; α² the FORM importance factor
}

// DiagnosticsDoc describes the weights or runs behind one rare-event estimate.
type DiagnosticsDoc struct {
	Key string `json:"key"`
	// Importance sampling: the effective sample size of the failed samples
	// (Kish) and the largest weight's share of the estimate.
	EffectiveSamples float64 `json:"effective_samples,omitempty"`
	MaxWeightShare   float64 `json:"max_weight_share,omitempty"`
	Degenerate       bool    `json:"degenerate,omitempty"`
	// Subset simulation: the independent runs behind the c.o.v.
	Runs     int      `json:"runs,omitempty"`
	Levels   int      `json:"levels,omitempty"`
	Warnings []string `json:"warnings,omitempty"`
}

// Simulation builds the simulate document.
func Simulation(s *scenario.Scenario, r *montecarlo.Result, run Run, version string) SimDoc {
	doc := SimDoc{
		Envelope: envelope("simulate", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		Method: r.Method, MethodNote: r.MethodNote, Evaluations: r.Evaluations,
		RequestedSamples: run.Samples, Samples: r.Samples, InvalidSamples: r.Invalid, Seed: r.Seed, Workers: r.Workers,
		Confidence: r.Confidence, IntervalMethod: run.Interval.String(), Precision: r.Precision, PrecisionMet: r.Converged,
		Partial: r.Partial, BoltsPerSample: r.NBolts,
		BinnedSamples: r.Binned, BinStride: r.BinStride, Modes: modeProbs(r, true),
		PercentileLevels: montecarlo.Levels, Percentiles: []PercentilesDoc{},
		PreloadMean: r.PreloadMean, PreloadSD: r.PreloadSD,
		Nominal: Body(r.Nominal), Checks: ChecksOf(s, r.Nominal.Outcome.Stiffness), Warnings: warnings(s), Caution: Caution,
	}
	if r.HasDistributions() {
		for q := montecarlo.QPreload; q < montecarlo.NumQuantities; q++ {
			p := percentilesDoc(r.Quantities[q].Percentiles)
			p.Key, p.Title, p.Unit = q.Key(), q.Title(), "N"
			doc.Percentiles = append(doc.Percentiles, p)
		}
	}
	doc.PercentileSource = percentileSource(r)
	doc.Cases = caseDocs(r)
	if r.Rare != nil {
		doc.DesignPoints, doc.Diagnostics = rareDocs(r.Rare)
		doc.Warnings = append(doc.Warnings, r.Rare.Warnings...)
	}
	doc.Warnings = append(doc.Warnings, runWarnings(s, r)...)
	return doc
}

func percentileSource(r *montecarlo.Result) string {
	switch {
	case !r.HasDistributions():
		return "none"
	case r.Rare != nil:
		return fmt.Sprintf("a crude Monte Carlo pass of %d samples (the probabilities come from %s)", r.Rare.PercentileSamples, methodName(r.Method))
	case r.Binned < r.Samples:
		return fmt.Sprintf("%d of the %d samples (one chunk in %d)", r.Binned, r.Samples, r.BinStride)
	}
	return "every sample"
}

// rareDocs documents a rare-event run's design points and diagnostics.
func rareDocs(ri *montecarlo.RareInfo) ([]DesignPointDoc, []DiagnosticsDoc) {
	var dps []DesignPointDoc
	for _, d := range ri.DesignPoints {
		dd := DesignPointDoc{Mode: d.Mode.Key(), Bolt: d.Bolt + 1, Beta: d.Beta, FORMApproximation: d.FORM, Converged: d.Converged,
			Message: d.Message, Evaluations: d.Evaluations, Inputs: []DesignInputDoc{}}
		for _, in := range d.Inputs {
			di := DesignInputDoc{Path: in.Path, Bolt: in.Bolt + 1, U: in.U, Alpha: in.Alpha}
			if !in.Part {
				v := in.Value
				di.Value = &v
			}
			dd.Inputs = append(dd.Inputs, di)
		}
		dps = append(dps, dd)
	}
	var diags []DiagnosticsDoc
	for _, ev := range ri.Events {
		d := DiagnosticsDoc{Key: ev.Event, Warnings: ev.Warnings}
		if im := ev.Importance; im != nil {
			d.EffectiveSamples, d.MaxWeightShare, d.Degenerate = im.ESS, im.MaxShare, im.Degenerate
		}
		if sd := ev.Subset; sd != nil {
			d.Runs = len(sd.Runs)
			for _, run := range sd.Runs {
				d.Levels = max(d.Levels, run.Levels)
			}
		}
		diags = append(diags, d)
	}
	return dps, diags
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

// countsCell is the "failures / samples" cell of a mode; "—" when the
// estimate is no count (subset simulation: a product of level shares).
func countsCell(p ProbDoc) string {
	if p.Samples == 0 {
		return "—"
	}
	return fmt.Sprintf("%d / %d", p.Failures, p.Samples)
}

func formatCOV(p ProbDoc) string {
	if p.COV == nil {
		return "-"
	}
	return fmt.Sprintf("%.3g", *p.COV)
}

// methodIntervalNote says how a run's intervals were computed.
func methodIntervalNote(method, interval string, conf float64) string {
	switch method {
	case "importance":
		return fmt.Sprintf("%.4g %% intervals: log-normal around the estimate from its c.o.v. (the weights' standard error); failures / samples count the samples from the importance density", 100*conf)
	case "subset":
		return fmt.Sprintf("%.4g %% intervals: log-normal around the mean of independent runs from their c.o.v. (the spread of the runs, not the single-run formula)", 100*conf)
	}
	return intervalNote(interval, conf)
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
	if doc.Method == "crude" {
		fmt.Fprintf(w, "\nFailure probabilities (%s): %d valid of %d samples requested, seed %d, %d workers\n",
			methodName(doc.Method), doc.Samples, doc.RequestedSamples, doc.Seed, doc.Workers)
	} else {
		fmt.Fprintf(w, "\nFailure probabilities (%s): %d evaluations of the joint model (cap %d), seed %d, %d workers\n",
			methodName(doc.Method), doc.Evaluations, doc.RequestedSamples, doc.Seed, doc.Workers)
	}
	if doc.MethodNote != "" {
		fmt.Fprintf(w, "  method: %s\n", doc.MethodNote)
	}
	fmt.Fprintf(w, "  %s\n", methodIntervalNote(doc.Method, doc.IntervalMethod, doc.Confidence))
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
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\t\n", p.Title, FormatProb(p), formatCOV(p), formatInterval(p), countsCell(p), sf)
	}
	tw.Flush()
	perBolt := false
	for _, p := range doc.Modes {
		perBolt = perBolt || p.PerBolt != nil
	}
	if perBolt {
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
	writeCases(w, doc.Cases)
	if len(doc.DesignPoints) > 0 {
		writeDesignPoints(w, doc.DesignPoints, sys)
	}
	if len(doc.Percentiles) > 0 {
		writePercentiles(w, doc, sys)
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

func hasBolt(dps []DesignPointDoc, b int) bool {
	for _, d := range dps {
		if d.Bolt == b {
			return true
		}
	}
	return false
}

// writeDesignPoints lists the design points of bolt 1 (and the joint
// modes): the others are the same with the bolts swapped.
func writeDesignPoints(w io.Writer, dps []DesignPointDoc, sys units.System) {
	fmt.Fprintln(w, "\nDesign points (Hasofer–Lind, improved HL-RF; FORM Φ(−β) is a first-order approximation, not an estimate)")
	for _, d := range dps {
		if d.Bolt > 1 {
			continue
		}
		m, _ := model.ParseMode(d.Mode)
		who := m.Title()
		if d.Bolt == 1 && hasBolt(dps, 2) {
			who += ", bolt 1 (every bolt alike)"
		}
		if !d.Converged {
			fmt.Fprintf(w, "  %s: not found (%s)\n", who, d.Message)
			continue
		}
		fmt.Fprintf(w, "  %s: β = %.3f, Φ(−β) ≈ %.3e\n", who, d.Beta, d.FORMApproximation)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for _, in := range d.Inputs {
			if in.Value == nil || in.Bolt > 1 || in.Alpha == 0 {
				continue
			}
			fmt.Fprintf(tw, "    %s\t%s\tu = %+.2f\tα² = %.3f\n", in.Path, sys.Format(*in.Value, scenario.FieldDim(in.Path)), in.U, in.Alpha*in.Alpha)
		}
		tw.Flush()
	}
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
	fmt.Fprintf(w, "  (from %s; %s)\n", doc.PercentileSource, percentileNote(maxRankError(doc)))
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

// percentileNote says how accurate the percentiles are.
func percentileNote(rankErr float64) string {
	if rankErr == 0 {
		return "each an exact quantile of those samples"
	}
	return fmt.Sprintf("each an exact quantile of those samples at a level within ±%.2g of its nominal level", rankErr)
}
