package report

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/life"
	"boltrisk/montecarlo/scenario"
	"boltrisk/plots"
)

// LifeDoc is the document of `boltrisk life`: the probability of fatigue
// failure within the design life, the reliability curve R(N) and B-lives.
type LifeDoc struct {
	Envelope
	Scenario ScenarioInfo `json:"scenario"`
	Joint    JointDoc     `json:"joint"`
	Inputs   []InputDoc   `json:"inputs"`
	// Curve is the finite-life S–N curve (fatigue.curve) and its source.
	Curve LifeCurveDoc `json:"curve"`
	// DesignLife is fatigue.design_life in cycles (and hours when given so).
	DesignLife LifeDesignDoc `json:"design_life"`
	// Spectrum lists the block spectrum's rows; empty for constant
	// amplitude between loads.axial_min and loads.axial_max.
	Spectrum []SpectrumRowDoc `json:"spectrum"`
	// CriticalDamage is the critical Miner sum and its source.
	CriticalDamage string `json:"critical_damage"`
	// Method is crude Monte Carlo: one life per sample, the first bolt
	// failure, counted on a log-cycle grid.
	Method           string  `json:"method" jsonschema:"enum=crude"`
	RequestedSamples int64   `json:"requested_samples"`
	Samples          int64   `json:"samples"`
	InvalidSamples   int64   `json:"invalid_samples"`
	Seed             uint64  `json:"seed"`
	Workers          int     `json:"workers"`
	Confidence       float64 `json:"confidence"`
	Partial          bool    `json:"partial"`
	// ExtrapolatedSamples are samples whose life lies beyond the curve's
	// validity range (VDI 2230 below 10⁴ cycles: the line extended;
	// Shigley below 10³: counted at 10³, an upper bound).
	ExtrapolatedSamples int64 `json:"extrapolated_samples"`
	// NominalLifeCycles is the life of the nominal joint on the median
	// curve with D_crit = 1; null for an infinite life.
	NominalLifeCycles *float64 `json:"nominal_life_cycles" jsonschema:"nullable"`
	// FailureWithinDesignLife is P(life ≤ design life), exact count with a
	// two-sided Clopper–Pearson interval.
	FailureWithinDesignLife LifeProbDoc `json:"failure_within_design_life"`
	// RareEstimate is the design-life probability estimated again by a
	// rare-event method (importance sampling or subset simulation, or crude
	// when auto found the budget enough) on the fatigue_life mode, when
	// few samples failed within the design life.
	RareEstimate *RareLifeDoc `json:"rare_estimate,omitempty"`
	// EverFails is the probability of a finite life (a sample above the
	// endurance limit).
	EverFails LifeProbDoc `json:"ever_fails"`
	B10       BLifeDoc    `json:"b10"`
	B1        BLifeDoc    `json:"b1"`
	// BLives holds every requested B_p life (B10 and B1 first).
	BLives []BLifeDoc `json:"b_lives"`
	// Reliability is R(N) = P(life > N) at ten grid points per decade, with
	// two-sided Clopper–Pearson bounds.
	Reliability []ReliabilityPointDoc `json:"reliability"`
	Warnings    []string              `json:"warnings"`
	Caution     string                `json:"caution"`
}

// RareLifeDoc is a rare-event estimate of P(failure within the design life).
type RareLifeDoc struct {
	Method      string   `json:"method" jsonschema:"enum=crude,enum=importance,enum=subset"`
	MethodNote  string   `json:"method_note,omitempty"`
	Probability float64  `json:"probability"`
	COV         *float64 `json:"cov" jsonschema:"nullable"`
	CILow       float64  `json:"ci_low"`
	CIHigh      float64  `json:"ci_high"`
	Evaluations int64    `json:"evaluations"`
}

// LifeCurveDoc names the curve.
type LifeCurveDoc struct {
	Key    string `json:"key" jsonschema:"enum=shigley,enum=vdi2230,enum=en1993-1-9"`
	Source string `json:"source"`
	// Rule says which rule of the curve the results used.
	Rule string `json:"rule"`
	// LifeSDLog10 is sd(log10 N) of the EN 1993-1-9 median curve (0 for the
	// other curves).
	LifeSDLog10 float64 `json:"life_sd_log10,omitempty"`
	Rolling     string  `json:"rolling,omitempty"`
}

// LifeDesignDoc is the design life.
type LifeDesignDoc struct {
	Cycles        float64 `json:"cycles"`
	Hours         float64 `json:"hours,omitempty"`
	CyclesPerHour float64 `json:"cycles_per_hour,omitempty"`
}

// SpectrumRowDoc is one row of the block spectrum: external axial loads per
// bolt (N), or a level multiplying loads.axial_max and axial_min.
type SpectrumRowDoc struct {
	MaxN   float64 `json:"max_N,omitempty"`
	MinN   float64 `json:"min_N,omitempty"`
	Level  float64 `json:"level,omitempty"`
	Cycles float64 `json:"cycles"`
}

// LifeProbDoc is a probability with its exact interval.
type LifeProbDoc struct {
	Probability float64 `json:"probability"`
	CILow       float64 `json:"ci_low"`
	CIHigh      float64 `json:"ci_high"`
	Failures    int64   `json:"failures"`
	Samples     int64   `json:"samples"`
}

// BLifeDoc is a B_p life: the life by which a fraction P has failed.
type BLifeDoc struct {
	P float64 `json:"p"`
	// Status: reached, beyond grid (above 10¹² cycles) or not reached
	// (fewer than p·n samples fail at all).
	Status string `json:"status" jsonschema:"enum=reached,enum=beyond grid,enum=not reached"`
	// Cycles is the estimate (the grid cell of the ⌈p·n⌉-th smallest life);
	// null unless reached.
	Cycles *float64 `json:"cycles" jsonschema:"nullable"`
	// Lower and Upper are one-sided distribution-free bounds at Confidence
	// (order statistics, at most one grid step conservative); null when
	// none exists or it is infinite.
	Lower      *float64 `json:"lower" jsonschema:"nullable"`
	Upper      *float64 `json:"upper" jsonschema:"nullable"`
	Confidence float64  `json:"confidence"`
}

// ReliabilityPointDoc is R(N) at one number of cycles.
type ReliabilityPointDoc struct {
	Cycles      float64 `json:"cycles"`
	Reliability float64 `json:"reliability"`
	Lower       float64 `json:"lower"`
	Upper       float64 `json:"upper"`
}

func lifeProb(p life.Proportion) LifeProbDoc {
	return LifeProbDoc{Probability: p.P, CILow: p.Lower, CIHigh: p.Upper, Failures: p.Count, Samples: p.N}
}

func bLifeDoc(b montecarlo.BLifeEstimate) BLifeDoc {
	d := BLifeDoc{P: b.P, Status: b.Status.String(), Cycles: finite(b.Cycles), Upper: finite(b.Upper), Confidence: b.Confidence}
	if b.LowerRank > 0 {
		d.Lower = finite(b.Lower)
	}
	return d
}

// curveRule says which rule of the curve a result used.
func curveRule(spec *montecarlo.LifeSpec) string {
	switch spec.Curve {
	case montecarlo.CurveShigley:
		return "Sf = a·N^b between 10³ and 10⁶ cycles with σrev = σa/(1 − σm/Sut) (Goodman); σrev ≤ Se: no damage; f fixed at the nominal Sut"
	case montecarlo.CurveVDI2230:
		r := "SV: N = 2·10⁶·(σASV/σa)³"
		if spec.Rolling == 1 {
			r = "SG: N = 2·10⁶·(σASG/σa)⁶, σASG = (2 − FSm/F0.2min)·σASV"
		}
		return r + "; σa ≤ σAS: no damage; the endurance input scales the curve"
	}
	if spec.Spectrum() {
		return "variable amplitude: m = 3 above ΔσD, m = 5 between ΔσL and ΔσD, ranges below ΔσL do no damage"
	}
	return "constant amplitude: m = 3, ranges below ΔσD do no damage"
}

// Life builds the document of a service-life run.
func Life(s *scenario.Scenario, r *montecarlo.LifeResult, requested int64, version string) LifeDoc {
	spec := &r.Spec
	doc := LifeDoc{
		Envelope: envelope("life", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		Curve:          LifeCurveDoc{Key: spec.Curve.Key(), Source: scenario.CurveSource[spec.Curve.Key()], Rule: curveRule(spec)},
		DesignLife:     LifeDesignDoc{Cycles: spec.DesignLife, Hours: spec.Hours, CyclesPerHour: spec.CycleRate},
		Spectrum:       []SpectrumRowDoc{},
		CriticalDamage: s.SourceOf("fatigue.critical_damage"),
		Method:         "crude", RequestedSamples: requested, Samples: r.Samples, InvalidSamples: r.Invalid,
		Seed: r.Seed, Workers: r.Workers, Confidence: r.Confidence, Partial: r.Partial,
		ExtrapolatedSamples:     r.Extrapolated + r.Clamped,
		NominalLifeCycles:       finite(r.NominalLife),
		FailureWithinDesignLife: lifeProb(r.DesignFailure), EverFails: lifeProb(r.EverFails),
		BLives: []BLifeDoc{}, Reliability: []ReliabilityPointDoc{},
		Warnings: warnings(s), Caution: Caution,
	}
	if spec.Curve == montecarlo.CurveEN1993 {
		doc.Curve.LifeSDLog10 = spec.LifeSD
	}
	if rr := r.Rare; rr != nil {
		e := rr.Estimate
		doc.RareEstimate = &RareLifeDoc{Method: rr.Method, MethodNote: rr.Note, Probability: e.P, COV: finite(e.COV), CILow: e.Lo, CIHigh: e.Hi, Evaluations: rr.Evaluations}
	}
	if spec.Curve == montecarlo.CurveVDI2230 {
		doc.Curve.Rolling = spec.Rolling.String()
	}
	if !spec.Spectrum() || spec.Critical == nil {
		doc.CriticalDamage = "not used (constant amplitude)"
		if spec.Spectrum() {
			doc.CriticalDamage = scenario.CriticalDamageDefault
		}
	}
	for _, b := range spec.Blocks {
		row := SpectrumRowDoc{MaxN: b.Max, MinN: b.Min, Cycles: b.Count}
		if b.Level {
			row = SpectrumRowDoc{Level: b.Max, Cycles: b.Count}
		}
		doc.Spectrum = append(doc.Spectrum, row)
	}
	for _, b := range r.BLives {
		doc.BLives = append(doc.BLives, bLifeDoc(b))
		switch b.P {
		case 0.1:
			doc.B10 = bLifeDoc(b)
		case 0.01:
			doc.B1 = bLifeDoc(b)
		}
	}
	step := max(len(r.Reliability)/((int(math.Round(math.Log10(r.GridMax/r.GridMin))))*10), 1)
	for i := 0; i < len(r.Reliability); i += step {
		p := r.Reliability[i]
		doc.Reliability = append(doc.Reliability, ReliabilityPointDoc{Cycles: p.Cycles, Reliability: p.Reliability, Lower: p.Lower, Upper: p.Upper})
	}
	if n := r.Extrapolated; n > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d samples have lives below the curve's finite-life range (VDI 2230: about 10⁴ cycles); their lives come from the line extended and are not confirmed", n))
	}
	if n := r.Clamped; n > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d samples lie in the low-cycle region of the Shigley line (below 10³ cycles); their lives are counted at 10³ cycles, an upper bound", n))
	}
	if r.Invalid > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d samples lie outside the model's or the curve's domain and are not counted", r.Invalid))
	}
	if r.RareError != "" {
		doc.Warnings = append(doc.Warnings, "the rare-event estimate of the design-life probability failed: "+r.RareError)
	}
	if r.DesignFailure.Count == 0 && r.Rare == nil {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("no sample failed within the design life: only the upper bound %.3g informs; a smaller probability needs more samples (about 3/p for p)", r.DesignFailure.Upper))
	}
	return doc
}

func cyclesText(v *float64) string {
	if v == nil {
		return "—"
	}
	return fmt.Sprintf("%.4g", *v)
}

// WriteLife writes the text report of a service-life run.
func WriteLife(w io.Writer, s *scenario.Scenario, doc LifeDoc, sys units.System) {
	title(w, "life", s)
	if doc.Partial {
		fmt.Fprintf(w, "\nPARTIAL RESULT: the run was interrupted after %d samples; the estimates below use only those.\n", doc.Samples+doc.InvalidSamples)
	}
	writeInputs(w, doc.Joint, Inputs(s, sys), sys)
	fmt.Fprintf(w, "\nCurve %s: %s\n  rule: %s\n", doc.Curve.Key, doc.Curve.Source, doc.Curve.Rule)
	if doc.Curve.LifeSDLog10 > 0 {
		fmt.Fprintf(w, "  median curve for sd(log10 N) = %.3g, category read as mean − 2 sd (from memory); life scatter log-normal\n", doc.Curve.LifeSDLog10)
	}
	dl := fmt.Sprintf("%.4g cycles", doc.DesignLife.Cycles)
	if doc.DesignLife.Hours > 0 {
		dl += fmt.Sprintf(" (%.4g h at %.4g cycles/h)", doc.DesignLife.Hours, doc.DesignLife.CyclesPerHour)
	}
	fmt.Fprintf(w, "Design life %s\n", dl)
	if len(doc.Spectrum) > 0 {
		fmt.Fprintf(w, "Load spectrum, per pass (external axial load per bolt); Palmgren–Miner damage, critical sum %s\n", doc.CriticalDamage)
		for i, r := range doc.Spectrum {
			if r.Level > 0 {
				fmt.Fprintf(w, "  %d. %.4g × the case's loads, %.4g cycles\n", i+1, r.Level, r.Cycles)
			} else {
				fmt.Fprintf(w, "  %d. %s … %s, %.4g cycles\n", i+1, sys.Format(r.MinN, units.Force), sys.Format(r.MaxN, units.Force), r.Cycles)
			}
		}
	} else {
		fmt.Fprintf(w, "Constant amplitude between loads.axial_min and loads.axial_max\n")
	}
	fmt.Fprintf(w, "Nominal life (inputs at their means, median curve): %s cycles\n", map[bool]string{true: "infinite", false: cyclesText(doc.NominalLifeCycles)}[doc.NominalLifeCycles == nil])
	fmt.Fprintf(w, "\nService life (crude Monte Carlo): %d valid of %d samples requested, seed %d, %d workers; the joint fails at its first bolt's fatigue failure\n",
		doc.Samples, doc.RequestedSamples, doc.Seed, doc.Workers)
	conf := 100 * doc.Confidence
	p := doc.FailureWithinDesignLife
	fmt.Fprintf(w, "  P(fatigue failure within the design life) = %.4g   %g %% interval %.4g … %.4g (Clopper–Pearson), %d of %d\n",
		p.Probability, conf, p.CILow, p.CIHigh, p.Failures, p.Samples)
	if rr := doc.RareEstimate; rr != nil {
		cov := "-"
		if rr.COV != nil {
			cov = fmt.Sprintf("%.3g", *rr.COV)
		}
		fmt.Fprintf(w, "  few failures: estimated again by %s on the fatigue_life mode: %.4g, c.o.v. %s, %g %% interval %.4g … %.4g, %d evaluations\n",
			methodName(rr.Method), rr.Probability, cov, conf, rr.CILow, rr.CIHigh, rr.Evaluations)
	}
	e := doc.EverFails
	fmt.Fprintf(w, "  P(finite life at all)                      = %.4g   %g %% interval %.4g … %.4g\n", e.Probability, conf, e.CILow, e.CIHigh)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "  life\testimate, cycles\t%g %% lower bound\t%g %% upper bound\tstatus\t\n", conf, conf)
	for _, b := range doc.BLives {
		fmt.Fprintf(tw, "  B%s\t%s\t%s\t%s\t%s\t\n", bName(b.P), cyclesText(b.Cycles), cyclesText(b.Lower), cyclesText(b.Upper), b.Status)
	}
	tw.Flush()
	fmt.Fprintf(w, "  bounds: one-sided, distribution-free (order statistics), at most one grid step (×%.4g) conservative\n", math.Pow(10, 0.01))
	fmt.Fprintf(w, "\nReliability R(N) = P(life > N), %g %% Clopper–Pearson interval:\n", conf)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  cycles\tR(N)\tlower\tupper\t")
	first, last := -1, -1 // the rows where R changes, a decade either side
	for i, r := range doc.Reliability {
		if r.Reliability < 1 && first < 0 {
			first = i
		}
		if i > 0 && r.Reliability != doc.Reliability[i-1].Reliability {
			last = i
		}
	}
	for i, r := range doc.Reliability {
		e := math.Log10(r.Cycles)
		frac := e - math.Floor(e+1e-9)
		if first >= 0 && (i < first-10 || i > last+10) {
			continue
		}
		if frac < 1e-6 || math.Abs(frac-0.5) < 1e-6 {
			fmt.Fprintf(tw, "  %.3g\t%.5f\t%.5f\t%.5f\t\n", r.Cycles, r.Reliability, r.Lower, r.Upper)
		}
	}
	tw.Flush()
	if len(doc.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings:")
		for _, m := range doc.Warnings {
			fmt.Fprintf(w, "  - %s\n", m)
		}
	}
	fmt.Fprintf(w, "\n%s\n", Caution)
}

// bName writes a B-life's percentage: 10, 1, 0.1.
func bName(p float64) string { return strings.TrimSuffix(fmt.Sprintf("%g", 100*p), ".0") }

// LifeFigures draw R(N) with its confidence band on a log-cycles axis, the
// design life and the B-lives marked, and the same as 1 − R(N) on a log
// probability axis (when any sample failed).
func LifeFigures(s *scenario.Scenario, r *montecarlo.LifeResult) ([]Figure, error) {
	spec := plots.ReliabilitySpec{Title: "Reliability against cycles (" + titleOf(s) + ")", DesignLife: r.Spec.DesignLife}
	lo, hi := -1, -1
	for i, p := range r.Reliability {
		if p.Failures > 0 && lo < 0 {
			lo = i
		}
		if p.Failures < r.Samples {
			hi = i
		}
	}
	if lo < 0 { // nothing failed: show the grid around the design life
		lo, hi = 0, len(r.Reliability)-1
	}
	lo, hi = max(lo-50, 0), min(hi+50, len(r.Reliability)-1)
	for _, p := range r.Reliability[lo : hi+1] {
		spec.N = append(spec.N, p.Cycles)
		spec.R = append(spec.R, p.Reliability)
		spec.Lo = append(spec.Lo, p.Lower)
		spec.Hi = append(spec.Hi, p.Upper)
	}
	for _, b := range r.BLives {
		if b.Status == life.Reached {
			spec.Marks = append(spec.Marks, plots.LifeMark{Label: "B" + bName(b.P), N: b.Cycles, R: 1 - b.P})
		}
	}
	p, err := plots.ReliabilityPlot(spec)
	if err != nil {
		return nil, err
	}
	caption := fmt.Sprintf("R(N), the probability of surviving N cycles, with its %g %% Clopper–Pearson band; the dashed line marks the design life, the markers the B-lives.", 100*r.Confidence)
	rel, err := figure(p, "reliability.png", caption)
	if err != nil {
		return nil, err
	}
	figs := []Figure{rel}
	spec.Unreliability = true
	spec.Title = "Probability of failure against cycles (" + titleOf(s) + ")"
	if p, err := plots.ReliabilityPlot(spec); err == nil { // none when nothing failed
		f, err := figure(p, "unreliability.png", fmt.Sprintf("The same curve as the probability of failure by N cycles, 1 − R(N), on a log axis, so that the early failures around the design life show; %g %% band.", 100*r.Confidence))
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	return figs, nil
}

// LifeReview assembles the design-review document of a service-life run.
func LifeReview(s *scenario.Scenario, doc LifeDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint service-life review: " + titleOf(s), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	r.Subtitle = fmt.Sprintf("Crude Monte Carlo estimate from %d valid of %d requested samples (seed %d).", doc.Samples, doc.RequestedSamples, doc.Seed)
	if doc.Partial {
		r.Subtitle += " PARTIAL RESULT: the run was interrupted."
	}
	r.Sections = append(r.Sections, inputsSection(s, doc.Joint, sys))
	r.Sections = append(r.Sections, LifeSection(doc, sys))
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}

func rareLine(doc LifeDoc) string {
	rr := doc.RareEstimate
	if rr == nil {
		return "The estimator is crude Monte Carlo: lives counted exactly on a log-cycle grid."
	}
	return fmt.Sprintf("Few samples failed within the design life: estimated again by %s on the fatigue_life mode, %.4g (%g %% interval %.4g … %.4g, %d evaluations).",
		methodName(rr.Method), rr.Probability, 100*doc.Confidence, rr.CILow, rr.CIHigh, rr.Evaluations)
}

// LifeSection is the review-report section of a service-life result.
func LifeSection(doc LifeDoc, sys units.System) Section {
	conf := 100 * doc.Confidence
	p := doc.FailureWithinDesignLife
	para := []string{
		fmt.Sprintf("Curve %s: %s. Rule: %s.", doc.Curve.Key, doc.Curve.Source, doc.Curve.Rule),
		fmt.Sprintf("Design life %.4g cycles. Probability of fatigue failure within it: %.4g (%g %% Clopper–Pearson interval %.4g … %.4g; %d of %d samples).", doc.DesignLife.Cycles, p.Probability, conf, p.CILow, p.CIHigh, p.Failures, p.Samples),
		rareLine(doc),
		"B-life bounds are one-sided and distribution-free (order statistics of the simulated lives), at most one grid step conservative.",
	}
	if len(doc.Spectrum) > 0 {
		para = append(para, fmt.Sprintf("Block spectrum of %d rows per pass, damage summed by the Palmgren–Miner rule; critical sum %s.", len(doc.Spectrum), doc.CriticalDamage))
	}
	t := &Table{Header: []string{"life", "estimate (cycles)", fmt.Sprintf("%g %% lower bound", conf), fmt.Sprintf("%g %% upper bound", conf), "status"}}
	for _, b := range doc.BLives {
		t.Rows = append(t.Rows, []string{"B" + bName(b.P), cyclesText(b.Cycles), cyclesText(b.Lower), cyclesText(b.Upper), b.Status})
	}
	return Section{Heading: "Service life", Paragraphs: para, Table: t}
}
