package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"boltrisk/model/units"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/scenario"
)

// CalloutDoc is the drawing callout a spec run found.
type CalloutDoc struct {
	// Quantity is what the callout sets: torque or preload (for
	// preload-controlled methods).
	Quantity string  `json:"quantity" jsonschema:"enum=torque,enum=preload"`
	Unit     string  `json:"unit"`    // of nominal and tolerance (internal SI)
	Nominal  float64 `json:"nominal"` // the geometric middle of the upper-bound window, three significant figures
	// Tolerance is the widest band ± (at 3σ, absolute) for which every mode
	// and any mode meet the target on their upper confidence bounds;
	// tolerance_relative the same relative to nominal. The true edge lies in
	// [tolerance_relative, tolerance_relative_misses).
	Tolerance              float64 `json:"tolerance"`
	ToleranceRelative      float64 `json:"tolerance_relative"`
	ToleranceRelativeMiss  float64 `json:"tolerance_relative_misses"`
	ToleranceAtSearchEnd   bool    `json:"tolerance_at_search_end"`
	PointToleranceRelative float64 `json:"tolerance_relative_point_estimate"`
	// Tool is the least precise candidate tool whose tolerance fits ("" none).
	Tool          string  `json:"tool,omitempty"`
	ToolTolerance float64 `json:"tool_tolerance_relative,omitempty"`
	// ScatterMultiple is tolerance_relative over the file's own scatter.
	ScatterMultiple float64 `json:"scatter_multiple"`
	// GoverningModes are above the target just beyond the tolerance edge.
	GoverningModes []string `json:"governing_modes"`
	// Modes are the estimates at the callout (nominal ± tolerance).
	Modes []ProbDoc `json:"modes"`
	Line  string    `json:"line"` // ready for the drawing
}

// ModeExcessDoc is a mode above the target at the best setting.
type ModeExcessDoc struct {
	Key         string  `json:"key"`
	Probability float64 `json:"probability"`
	Upper       float64 `json:"upper_bound"`
	Ratio       float64 `json:"upper_bound_over_target"`
}

// SuggestionDoc is a preset change and the least any-mode upper bound it reaches.
type SuggestionDoc struct {
	Change      string  `json:"change"`
	At          float64 `json:"at"` // the setting with the least upper bound
	Probability float64 `json:"probability"`
	Upper       float64 `json:"upper_bound"`
	Meets       bool    `json:"meets_target"`
	Improvement float64 `json:"improvement_factor"` // the file's estimate at its best setting over this one's (over its upper bound when none failed)
}

// ImpossibleDoc explains a target no setting meets.
type ImpossibleDoc struct {
	At          float64         `json:"best_setting"`
	Probability float64         `json:"probability"`
	Upper       float64         `json:"upper_bound"`
	Ratio       float64         `json:"upper_bound_over_target"`
	Modes       []ModeExcessDoc `json:"modes_above_target"`
	Suggestions []SuggestionDoc `json:"suggestions"`
	// SuggestionSamples is the sample count of each value of a
	// suggestion's grid of SuggestionSteps values.
	SuggestionSamples int64 `json:"suggestion_samples"`
	SuggestionSteps   int   `json:"suggestion_steps"`
}

// SpecDoc is the result of `boltrisk spec --json`.
type SpecDoc struct {
	Envelope
	Scenario   ScenarioInfo `json:"scenario"`
	Joint      JointDoc     `json:"joint"`
	Inputs     []InputDoc   `json:"inputs"`
	Target     float64      `json:"target_probability"`
	Input      string       `json:"input"` // the controlled input's path
	Unit       string       `json:"unit"`  // of the range, windows and settings
	RangeLo    float64      `json:"range_low"`
	RangeHi    float64      `json:"range_high"`
	Method     string       `json:"method"`
	MethodNote string       `json:"method_note,omitempty"`
	Samples    int64        `json:"samples_per_run"`
	Seed       uint64       `json:"seed"`
	Workers    int          `json:"workers"`
	Confidence float64      `json:"confidence"`
	Runs       int          `json:"runs"`
	Steps      int          `json:"grid_steps"`
	// FileTolerance is the file's scatter of the input as ± at 3σ, relative.
	FileTolerance float64 `json:"file_tolerance_relative"`
	// Windows of the nominal setting at the file's scatter (point
	// estimates, upper bounds).
	Window      *TargetWindowDoc `json:"window"`
	WindowUpper *TargetWindowDoc `json:"window_upper_bounds"`
	Feasible    bool             `json:"feasible"`
	// RangeTooNarrow: the upper-bound window reaches an end of the range.
	RangeTooNarrow bool           `json:"range_too_narrow"`
	Callout        *CalloutDoc    `json:"callout,omitempty"`
	Impossible     *ImpossibleDoc `json:"impossible,omitempty"`
	Warnings       []string       `json:"warnings"`
	Caution        string         `json:"caution"`
}

// SpecFacts are the presets the callout line names.
type SpecFacts struct {
	Condition string // condition preset ("" none)
	Tool      string // the file's tool ("" none)
}

// Spec builds the spec document.
func Spec(s *scenario.Scenario, sp *decide.Spec, version string) SpecDoc {
	set := sp.Settings
	dim := scenario.FieldDim(sp.Path)
	doc := SpecDoc{Envelope: envelope("spec", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		Target: sp.Target, Input: sp.Path, Unit: internalUnit(dim), RangeLo: sp.Lo, RangeHi: sp.Hi, Method: set.Method.String(), MethodNote: sp.MethodNote,
		Samples: set.Samples, Seed: set.Seed, Workers: set.Workers, Confidence: set.Confidence, Runs: sp.Runs, Steps: len(sp.Sweep.Steps),
		FileTolerance: sp.FileTolerance, Feasible: sp.Feasible, RangeTooNarrow: sp.RangeLo || sp.RangeHi,
		Warnings: warnings(s), Caution: Caution}
	doc.Window, doc.WindowUpper = windowDoc(sp.Sweep.Window), windowDoc(sp.Sweep.Conservative)
	if sp.Feasible {
		q := "torque"
		if sp.Path == "tightening.preload" {
			q = "preload"
		}
		c := &CalloutDoc{Quantity: q, Unit: doc.Unit, Nominal: sp.Nominal, ToleranceRelative: sp.Upper.Meets, ToleranceRelativeMiss: sp.Upper.Misses,
			Tolerance: sp.Upper.Meets * sp.Nominal, ToleranceAtSearchEnd: sp.Upper.AtMax, PointToleranceRelative: sp.Point.Meets,
			Tool: sp.Tool, ToolTolerance: sp.ToolTolerance, ScatterMultiple: sp.Multiple, GoverningModes: modeKeys(sp.Upper.Modes)}
		if sp.AtCallout != nil {
			c.Modes = modeProbs(sp.AtCallout, false)
		}
		doc.Callout = c
		if !sp.Upper.Found {
			doc.Warnings = append(doc.Warnings, fmt.Sprintf("even a tolerance of ±%.2g %% misses the target at the callout's nominal: the window holds only at the file's scatter by its edges", 100*decide.MinTolerance))
		}
	}
	if imp := sp.Impossible; imp != nil {
		d := &ImpossibleDoc{At: imp.At, Probability: imp.P, Upper: imp.Hi, Ratio: imp.Ratio, SuggestionSamples: imp.AltSamples, SuggestionSteps: min(len(sp.Sweep.Steps), decide.AltSteps),
			Modes: []ModeExcessDoc{}, Suggestions: []SuggestionDoc{}}
		for _, m := range imp.Modes {
			d.Modes = append(d.Modes, ModeExcessDoc{Key: m.Mode.Key(), Probability: m.P, Upper: m.Hi, Ratio: m.Ratio})
		}
		for _, g := range imp.Suggestions {
			d.Suggestions = append(d.Suggestions, SuggestionDoc{Change: g.Label, At: g.At, Probability: g.P, Upper: g.Hi, Meets: g.Meets, Improvement: g.Improves})
		}
		doc.Impossible = d
	}
	if doc.Callout != nil {
		doc.Callout.Line = CalloutLine(doc, s.ConditionName, units.SI)
	}
	return doc
}

// floorSig rounds v down to n significant figures (a tolerance printed on
// a drawing must not be wider than the one found).
func floorSig(v float64, n int) float64 {
	if !(v > 0) || math.IsInf(v, 0) {
		return v
	}
	e := math.Pow(10, float64(n)-1-math.Floor(math.Log10(v)))
	return math.Floor(v*e*(1+1e-12)) / e
}

// CalloutLine is the one line for the drawing, in the display units.
func CalloutLine(doc SpecDoc, condition string, sys units.System) string {
	c := doc.Callout
	dim := scenario.FieldDim(doc.Input)
	u, f := sys.Unit(dim)
	nom, tol := c.Nominal/f, floorSig(c.Tolerance/f, 2)
	if dim == units.Force && nom >= 1000 {
		nom, tol, u = nom/1000, tol/1000, map[string]string{"N": "kN", "lbf": "kip"}[u]
	}
	u = strings.ReplaceAll(u, "*", "·") // typeset for the drawing: N·m, lbf·ft
	what := "Torque"
	if c.Quantity == "preload" {
		what = "Preload"
	}
	var how []string
	switch {
	case c.Tool != "":
		how = append(how, "tool "+c.Tool+" or more precise")
	default:
		how = append(how, fmt.Sprintf("a tool holding ±%.3g %% at 3σ", 100*floorSig(c.ToleranceRelative, 2)))
	}
	if condition != "" {
		how = append(how, condition+" threads")
	}
	return fmt.Sprintf("%s %s %s ± %s %s (±3σ; %s) — probability of any failure at most %s at %.4g %% confidence (upper bound)",
		what, units.Sig(nom, 3), u, units.Sig(tol, 2), u, strings.Join(how, ", "), fmtTarget(doc.Target), 100*doc.Confidence)
}

func fmtTarget(p float64) string { return fmt.Sprintf("%.2g", p) }

// WriteSpec writes the spec document as text.
func WriteSpec(w io.Writer, s *scenario.Scenario, doc SpecDoc, sys units.System) {
	title(w, "spec", s)
	dim := scenario.FieldDim(doc.Input)
	fx := func(v float64) string { return sys.Format(v, dim) }
	fmt.Fprintf(w, "Target: every mode and any mode at or below %s on the upper %.4g %% bound; %s searched over %s … %s.\n",
		fmtTarget(doc.Target), 100*doc.Confidence, doc.Input, fx(doc.RangeLo), fx(doc.RangeHi))
	fmt.Fprintf(w, "%s, %d samples per run, seed %d, %d runs with the same random streams (common random numbers).\n", methodName(doc.Method), doc.Samples, doc.Seed, doc.Runs)
	if doc.MethodNote != "" {
		fmt.Fprintf(w, "  method: %s\n", doc.MethodNote)
	}
	fmt.Fprintln(w)
	for _, sec := range specSections(doc, sys) {
		writeTextSection(w, sec)
		fmt.Fprintln(w)
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

// writeTextSection writes a review section as text: the heading, its
// paragraphs indented, its table in aligned columns.
func writeTextSection(w io.Writer, sec Section) {
	fmt.Fprintln(w, sec.Heading)
	for _, p := range sec.Paragraphs {
		fmt.Fprintf(w, "  %s\n", p)
	}
	if sec.Table != nil {
		rows := append([][]string{sec.Table.Header}, sec.Table.Rows...)
		for i := range rows {
			rows[i] = append([]string{" "}, rows[i]...)
		}
		writeColumns(w, rows)
	}
}

// specSections are the sections of the spec result (text and review).
func specSections(doc SpecDoc, sys units.System) []Section {
	dim := scenario.FieldDim(doc.Input)
	fx := func(v float64) string { return sys.Format(v, dim) }
	var out []Section
	win := Section{Heading: fmt.Sprintf("Window of the nominal %s at the file's scatter (±%.3g %% at 3σ)", strings.TrimPrefix(doc.Input, "tightening."), 100*doc.FileTolerance)}
	for i, wd := range []*TargetWindowDoc{doc.Window, doc.WindowUpper} {
		basis := "point estimates"
		if i == 1 {
			basis = fmt.Sprintf("upper %.4g %% bounds", 100*doc.Confidence)
		}
		win.Paragraphs = append(win.Paragraphs, windowText(wd, fx, basis))
	}
	out = append(out, win)
	if c := doc.Callout; c != nil {
		sec := Section{Heading: "Callout for the drawing", Paragraphs: []string{c.Line}}
		gov := "none above the target within the search"
		if len(c.GoverningModes) > 0 {
			gov = strings.Join(c.GoverningModes, ", ")
		}
		tol := fmt.Sprintf("widest tolerance ±%s (±%.3g %% at 3σ; the edge lies below ±%.3g %%), %.3g × the file's scatter; from the point estimates ±%.3g %%; governed by %s",
			fx(c.Tolerance), 100*c.ToleranceRelative, 100*c.ToleranceRelativeMiss, c.ScatterMultiple, 100*c.PointToleranceRelative, gov)
		if c.ToleranceAtSearchEnd {
			tol = fmt.Sprintf("every tolerance up to ±%.3g %% meets the target (the end of the search)", 100*c.ToleranceRelative)
		}
		sec.Paragraphs = append(sec.Paragraphs, "nominal "+fx(c.Nominal)+" (the geometric middle of the upper-bound window); "+tol+".")
		if c.Tool != "" {
			sec.Paragraphs = append(sec.Paragraphs, fmt.Sprintf("least precise tool that fits: %s (±%.3g %%)", c.Tool, 100*c.ToolTolerance))
		} else {
			sec.Paragraphs = append(sec.Paragraphs, "no candidate tool is precise enough for this tolerance")
		}
		t := &Table{Header: []string{"mode", "probability at the callout", "upper bound", "meets"}}
		for _, p := range c.Modes {
			ok := "yes"
			if p.CIHigh > doc.Target {
				ok = "NO"
			}
			t.Rows = append(t.Rows, []string{p.Title, FormatProb(p), fmt.Sprintf("%.2e", p.CIHigh), ok})
		}
		sec.Table = t
		out = append(out, sec)
	}
	if imp := doc.Impossible; imp != nil {
		sec := Section{Heading: "No setting meets the target"}
		var ms []string
		for _, m := range imp.Modes {
			ms = append(ms, fmt.Sprintf("%s %.2e (%.3g × the target)", m.Key, m.Upper, m.Ratio))
		}
		why := "no single mode exceeds the target there; only their combination does"
		if len(ms) > 0 {
			why = "above the target there: " + strings.Join(ms, "; ")
		}
		sec.Paragraphs = append(sec.Paragraphs, fmt.Sprintf("the least any-mode upper bound is %.2e at %s, %.3g × the target; %s.", imp.Upper, fx(imp.At), imp.Ratio, why))
		if len(imp.Suggestions) > 0 {
			t := &Table{Header: []string{"change", "least upper bound", "at", "improvement", "meets"}}
			for _, g := range imp.Suggestions {
				ok := "no"
				if g.Meets {
					ok = "yes"
				}
				t.Rows = append(t.Rows, []string{g.Change, fmt.Sprintf("%.2e", g.Upper), fx(g.At), fmt.Sprintf("%.3g ×", g.Improvement), ok})
			}
			sec.Table = t
			best := imp.Suggestions[0]
			sec.Paragraphs = append(sec.Paragraphs, fmt.Sprintf("the preset change that helps most: %s (least upper bound %.2e, %.3g × better; %d samples per value of a %d-value grid over the range rescaled to the same preloads).",
				best.Change, best.Upper, best.Improvement, imp.SuggestionSamples, imp.SuggestionSteps))
		}
		out = append(out, sec)
	}
	return out
}

// SpecReview assembles the review document of a spec run.
func SpecReview(s *scenario.Scenario, doc SpecDoc, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint callout: " + titleOf(s), Caution: Caution, Provenance: prov.rows()}
	r.Subtitle = fmt.Sprintf("Target %s for every mode and any mode on the upper %.4g %% bound; %s, %d samples per run, seed %d, common random numbers.",
		fmtTarget(doc.Target), 100*doc.Confidence, methodName(doc.Method), doc.Samples, doc.Seed)
	r.Sections = append(r.Sections, inputsSection(s, doc.Joint, sys))
	r.Sections = append(r.Sections, specSections(doc, sys)...)
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}
