package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
)

// VaryDoc describes the varied quantity of a sweep.
type VaryDoc struct {
	Input  string    `json:"input"`                                                                    // input path, "load" or "spread:<path>"
	Kind   string    `json:"kind" jsonschema:"enum=value,enum=load-multiplier,enum=spread-multiplier"` // what is varied
	Unit   string    `json:"unit"`                                                                     // of values (internal SI: N, mm, MPa, N*mm; "" for multipliers)
	Values []float64 `json:"values"`
}

// StepDoc is one step of a sweep.
type StepDoc struct {
	Value          float64 `json:"value"`
	ValidSamples   int64   `json:"valid_samples"`
	InvalidSamples int64   `json:"invalid_samples"`
	// TooFewValid: less than half the samples were valid; the step bounds
	// no window.
	TooFewValid bool      `json:"too_few_valid"`
	Modes       []ProbDoc `json:"modes"`
}

// TargetWindowDoc is the range of the varied value meeting a target probability.
type TargetWindowDoc struct {
	Target float64 `json:"target_probability"`
	Found  bool    `json:"found"`
	// Lower and Upper are the outermost values known to meet the target;
	// each closed end lies within Resolution of the first value known to
	// miss it (edges refined by bisection with common random numbers).
	Lower           float64  `json:"lower"`
	Upper           float64  `json:"upper"`
	Resolution      float64  `json:"resolution"`
	Bisections      int      `json:"bisection_runs"`
	LowerOpen       bool     `json:"lower_at_range_end"`
	UpperOpen       bool     `json:"upper_at_range_end"`
	LowerInvalid    bool     `json:"lower_at_invalid_step"`
	UpperInvalid    bool     `json:"upper_at_invalid_step"`
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
	Description string  `json:"distribution"`
	Below       bool    `json:"even_least_spread_misses"`
	Above       bool    `json:"even_largest_spread_meets"`
	Runs        int     `json:"runs"`
}

// SweepDoc is the result of `boltrisk sweep --json`.
type SweepDoc struct {
	Envelope
	Scenario       ScenarioInfo     `json:"scenario"`
	Joint          JointDoc         `json:"joint"`
	Inputs         []InputDoc       `json:"inputs"`
	Vary           *VaryDoc         `json:"vary,omitempty"`
	SamplesPerStep int64            `json:"samples_per_step"`
	Seed           uint64           `json:"seed"`
	Workers        int              `json:"workers"`
	Confidence     float64          `json:"confidence"`
	Partial        bool             `json:"partial"`
	Steps          []StepDoc        `json:"steps,omitempty"`
	Window         *TargetWindowDoc `json:"window,omitempty"`
	Conservative   *TargetWindowDoc `json:"window_upper_bounds,omitempty"`
	Spread         *SpreadDoc       `json:"spread_limit,omitempty"`
	Warnings       []string         `json:"warnings"`
	Caution        string           `json:"caution"`
}

func windowDoc(w *study.Window) *TargetWindowDoc {
	if w == nil {
		return nil
	}
	d := &TargetWindowDoc{Target: w.Target, Found: w.Found, Lower: w.Lo, Upper: w.Hi, Resolution: w.Resolution, Bisections: w.Bisections,
		LowerOpen: w.OpenLo, UpperOpen: w.OpenHi, LowerInvalid: w.LoInvalid, UpperInvalid: w.HiInvalid,
		Best: w.Best, BestProbability: w.BestP, LowerBoundModes: modeKeys(w.LoModes), UpperBoundModes: modeKeys(w.HiModes),
		LowerCombined: w.LoCombined, UpperCombined: w.HiCombined}
	return d
}

func modeKeys(ms []model.Mode) []string {
	out := []string{}
	for _, m := range ms {
		out = append(out, m.Key())
	}
	return out
}

// Sweep builds the sweep document.
func Sweep(s *scenario.Scenario, sw *study.Sweep, version string) SweepDoc {
	set := sw.Settings
	doc := SweepDoc{Envelope: envelope("sweep", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		SamplesPerStep: set.Samples, Seed: set.Seed, Workers: set.Workers, Confidence: set.Confidence,
		Partial: sw.Partial, Warnings: warnings(s), Caution: Caution}
	doc.Vary = varyDoc(&sw.Vary)
	for _, st := range sw.Steps {
		r := st.Result
		doc.Steps = append(doc.Steps, StepDoc{Value: st.X, ValidSamples: r.Samples, InvalidSamples: r.Invalid, TooFewValid: st.TooFewValid, Modes: modeProbs(r, false)})
	}
	doc.Window, doc.Conservative = windowDoc(sw.Window), windowDoc(sw.Conservative)
	fx := doc.Vary.formatter(units.SI)
	var few, some []string
	for _, st := range doc.Steps {
		switch {
		case st.TooFewValid:
			few = append(few, fx(st.Value))
		case st.InvalidSamples > 0:
			some = append(some, fmt.Sprintf("%s (%d)", fx(st.Value), st.InvalidSamples))
		}
	}
	if len(few) > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("fewer than %.0f %% of the samples were valid at %s: those steps are reported but bound no window", 100*study.MinValidShare, strings.Join(few, ", ")))
	}
	if len(some) > 0 {
		doc.Warnings = append(doc.Warnings, "samples outside the model's domain were left out at "+strings.Join(some, ", "))
	}
	return doc
}

func varyDoc(v *study.Vary) *VaryDoc {
	d := &VaryDoc{Values: v.Values()}
	switch v.Kind {
	case study.Input:
		d.Input, d.Kind = v.Path, "value"
		d.Unit = internalUnit(scenario.FieldDim(v.Path))
	case study.Load:
		d.Input, d.Kind = "load", "load-multiplier"
	case study.Spread:
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

// SpreadLimit builds the document of a spread-limit search.
func SpreadLimit(s *scenario.Scenario, sl *study.SpreadLimit, samples int64, seed uint64, conf float64, version string) SweepDoc {
	doc := SweepDoc{Envelope: envelope("spread-limit", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		SamplesPerStep: samples, Seed: seed, Confidence: conf, Warnings: warnings(s), Caution: Caution}
	dim := scenario.FieldDim(sl.Path)
	d := sl.Dist
	doc.Spread = &SpreadDoc{Input: sl.Path, Target: sl.Target, Factor: sl.Factor, SD: d.StdDev(), COV: d.StdDev() / d.Mean(),
		Unit: internalUnit(dim), Probability: sl.P, Below: sl.Below, Above: sl.Above, Runs: sl.Runs,
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
	if len(doc.Steps) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprint(tw, "  ", shortName(v.Input), "\tvalid\t")
		for _, p := range doc.Steps[0].Modes {
			fmt.Fprintf(tw, "%s\t", p.Key)
		}
		fmt.Fprintln(tw)
		for _, st := range doc.Steps {
			valid := fmt.Sprint(st.ValidSamples)
			if st.TooFewValid {
				valid += " (too few)"
			}
			fmt.Fprintf(tw, "  %s\t%s\t", fx(st.Value), valid)
			for _, p := range st.Modes {
				fmt.Fprintf(tw, "%s\t", FormatProb(p))
			}
			fmt.Fprintln(tw)
		}
		tw.Flush()
	}
	if doc.Window != nil {
		writeWindow(w, doc.Window, fx, "point estimates")
		writeWindow(w, doc.Conservative, fx, fmt.Sprintf("upper %.4g %% bounds", 100*doc.Confidence))
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

// Bound says what limits one end of a window.
func Bound(open, invalid, combined bool, modes []string) string {
	switch {
	case invalid:
		return "a step with too few valid samples: no end can be stated beyond it"
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

// windowText describes a window in one paragraph.
func windowText(d *TargetWindowDoc, fx func(float64) string, basis string) string {
	if !d.Found {
		return fmt.Sprintf("No value in the swept range meets the failure probability %.3g (%s); the least any-mode probability is %.3g at %s.", d.Target, basis, d.BestProbability, fx(d.Best))
	}
	return fmt.Sprintf("Window for a failure probability ≤ %.3g (%s): %s to %s, each closed end refined to ±%s. Lower end: %s. Upper end: %s. Least any-mode probability %.3g at %s.",
		d.Target, basis, fx(d.Lower), fx(d.Upper), fx(d.Resolution),
		Bound(d.LowerOpen, d.LowerInvalid, d.LowerCombined, d.LowerBoundModes), Bound(d.UpperOpen, d.UpperInvalid, d.UpperCombined, d.UpperBoundModes),
		d.BestProbability, fx(d.Best))
}

func writeWindow(w io.Writer, d *TargetWindowDoc, fx func(float64) string, basis string) {
	fmt.Fprintf(w, "\nWindow for a failure probability ≤ %.3g (%s):\n", d.Target, basis)
	if !d.Found {
		fmt.Fprintf(w, "  NO value in the swept range meets the target; the least any-mode probability is %.3g at %s.\n", d.BestProbability, fx(d.Best))
		return
	}
	fmt.Fprintf(w, "  from %s (%s)\n  to   %s (%s)\n", fx(d.Lower), Bound(d.LowerOpen, d.LowerInvalid, d.LowerCombined, d.LowerBoundModes),
		fx(d.Upper), Bound(d.UpperOpen, d.UpperInvalid, d.UpperCombined, d.UpperBoundModes))
	fmt.Fprintf(w, "  closed ends refined by bisection to within %s (%d runs, common random numbers)\n", fx(d.Resolution), d.Bisections)
	fmt.Fprintf(w, "  least any-mode probability %.3g at %s\n", d.BestProbability, fx(d.Best))
}

func spreadText(sp *SpreadDoc, sys units.System) string {
	dim := scenario.FieldDim(sp.Input)
	switch {
	case sp.Below:
		return fmt.Sprintf("Even 1/64 of the scenario's scatter of %s misses the target %.3g (probability %.3g): the nominal design itself must change.", sp.Input, sp.Target, sp.Probability)
	case sp.Above:
		return fmt.Sprintf("The target %.3g holds even at 16 times the scenario's scatter of %s (probability %.3g): scatter of this input does not govern.", sp.Target, sp.Input, sp.Probability)
	}
	return fmt.Sprintf("The largest scatter of %s meeting the failure probability %.3g is %.3g times the scenario's: standard deviation %s, c.o.v. %.3g (±%.3g %% at 3σ), distribution %s (any-mode probability %.3g).",
		sp.Input, sp.Target, sp.Factor, sys.Format(sp.SD, dim), sp.COV, 300*sp.COV, sp.Description, sp.Probability)
}

func writeSpread(w io.Writer, doc SweepDoc, sys units.System) {
	fmt.Fprintf(w, "\nLargest scatter (%d runs of %d samples, seed %d, common random numbers):\n  %s\n", doc.Spread.Runs, doc.SamplesPerStep, doc.Seed, spreadText(doc.Spread, sys))
}
