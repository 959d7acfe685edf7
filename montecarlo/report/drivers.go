package report

import (
	"fmt"
	"io"

	"boltrisk/model/units"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/scenario"
	"boltrisk/plots"
)

// InputDriverDoc is what one uncertain input contributes to one mode.
type InputDriverDoc struct {
	Input   string `json:"input"`
	PerBolt bool   `json:"per_bolt"` // grouped over the bolts
	// Alpha2 is the FORM importance factor α² at the mode's design point
	// (absent without one: any mode, not found, not rare); AlphaSign +1
	// load-like (raising the input lowers the margin), −1 resistance-like.
	Alpha2    *float64 `json:"alpha2,omitempty"`
	AlphaSign int      `json:"alpha_sign,omitempty"`
	// Shift is the mean normal score of the input over the failed samples
	// (standard deviations; (x − μ)/σ for a normal input), with its
	// interval at the document's confidence and the failures behind it.
	Shift     float64 `json:"failure_shift_sd"`
	ShiftLow  float64 `json:"failure_shift_ci_low"`
	ShiftHigh float64 `json:"failure_shift_ci_high"`
	ShiftN    int64   `json:"failure_shift_count"`
	// Spearman is the rank correlation of the input with the mode's safety
	// factor over the subsample (any mode: the least safety factor).
	Spearman  float64 `json:"spearman"`
	SpearmanN int     `json:"spearman_samples"`
	// Omitted is the probability with the input fixed at its median, the
	// same random streams (omission sensitivity).
	Omitted *ProbDoc `json:"fixed_at_median,omitempty"`
}

// ModeDriversDoc is the drivers of one mode ("any" last).
type ModeDriversDoc struct {
	Key         string           `json:"key"`
	Title       string           `json:"title"`
	Probability ProbDoc          `json:"probability"`
	Beta        *float64         `json:"beta,omitempty"` // Hasofer–Lind index of the design point
	DesignNote  string           `json:"design_point_note,omitempty"`
	Inputs      []InputDriverDoc `json:"inputs"`
}

// DriversBody is the drivers study, inside the drivers document and
// simulate's with --drivers.
type DriversBody struct {
	Samples    int64   `json:"samples"`
	Invalid    int64   `json:"invalid_samples"`
	Subsample  int     `json:"rank_subsample"`
	Seed       uint64  `json:"seed"`
	Confidence float64 `json:"confidence"`
	OmitRuns   int     `json:"omission_runs"`
	// Method of the estimates, shifts and omission runs: crude or
	// importance (then ShiftNote says how the shifts were formed).
	Method    string           `json:"method" jsonschema:"enum=crude,enum=importance"`
	ShiftNote string           `json:"shift_note,omitempty"`
	Modes     []ModeDriversDoc `json:"modes"`
}

// DriversDoc is the result of `boltrisk drivers --json`.
type DriversDoc struct {
	Envelope
	Scenario ScenarioInfo `json:"scenario"`
	Joint    JointDoc     `json:"joint"`
	Inputs   []InputDoc   `json:"inputs"`
	DriversBody
	Warnings []string `json:"warnings"`
	Caution  string   `json:"caution"`
}

// DriversBodyOf formats a drivers study.
func DriversBodyOf(d *decide.Drivers) DriversBody {
	b := DriversBody{Samples: d.Samples, Invalid: d.Invalid, Subsample: d.Subsample, Seed: d.Seed, Confidence: d.Confidence, OmitRuns: d.OmitRuns,
		Method: d.Method, ShiftNote: d.ShiftNote}
	for _, m := range d.Modes {
		key, title := "any", "Any mode"
		if !m.Any {
			key, title = m.Mode.Key(), m.Mode.Title()
		}
		md := ModeDriversDoc{Key: key, Title: title, Probability: probDoc(key, title, m.Estimate), DesignNote: m.DesignNote}
		if m.DesignFound {
			md.Beta = finite(m.Beta)
		}
		for _, in := range m.Inputs {
			id := InputDriverDoc{Input: in.Path, PerBolt: in.PerBolt, Shift: in.Shift, ShiftLow: in.ShiftLo, ShiftHigh: in.ShiftHi, ShiftN: in.ShiftN,
				Spearman: in.Spearman, SpearmanN: in.SpearmanN}
			if in.HasAlpha {
				id.Alpha2, id.AlphaSign = finite(in.Alpha2), in.Sign
			}
			if in.HasOmitted {
				p := probDoc(key, title, in.Omitted)
				id.Omitted = &p
			}
			md.Inputs = append(md.Inputs, id)
		}
		b.Modes = append(b.Modes, md)
	}
	return b
}

// Drivers builds the drivers document.
func Drivers(s *scenario.Scenario, d *decide.Drivers, version string) DriversDoc {
	return DriversDoc{Envelope: envelope("drivers", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		DriversBody: DriversBodyOf(d), Warnings: warnings(s), Caution: Caution}
}

// DriversSections are the drivers as review sections, one table per mode.
func DriversSections(b DriversBody) []Section {
	from := fmt.Sprintf("From a crude run of %d valid samples (seed %d)", b.Samples, b.Seed)
	if b.Method == "importance" {
		from = fmt.Sprintf("From importance sampling at the design points, %d valid samples (seed %d; %s)", b.Samples, b.Seed, b.ShiftNote)
	}
	out := []Section{{Heading: "What drives each mode", Paragraphs: []string{fmt.Sprintf(
		"%s: α² with its sign from each mode's FORM design point (Hasofer–Lind; + load-like, − resistance-like; a union such as any mode has no single design point); "+
			"the failure-conditional shift, the mean normal score of each input over the failed samples in standard deviations, with its %.4g %% interval; "+
			"Spearman's rank correlation of each input with the mode's safety factor over the first %d samples; and the probability with the input fixed at its median (the same random numbers). Per-bolt inputs are grouped over the bolts.",
		from, 100*b.Confidence, b.Subsample)}}}
	for _, m := range b.Modes {
		head := fmt.Sprintf("%s: %s", m.Title, FormatProb(m.Probability))
		if m.Beta != nil {
			head += fmt.Sprintf(", β = %.3f", *m.Beta)
		} else if m.DesignNote != "" {
			head += " (no design point: " + m.DesignNote + ")"
		}
		t := &Table{Header: []string{"input", "α²", "shift (sd)", "interval", "Spearman", "fixed at median"}}
		for _, in := range m.Inputs {
			a := "-"
			if in.Alpha2 != nil {
				sign := "+"
				if in.AlphaSign < 0 {
					sign = "−"
				}
				a = fmt.Sprintf("%s%.3f", sign, *in.Alpha2)
			}
			shift, iv := "-", "-"
			if in.ShiftN > 0 {
				shift, iv = fmt.Sprintf("%+.3f", in.Shift), fmt.Sprintf("[%+.3f, %+.3f] (%d)", in.ShiftLow, in.ShiftHigh, in.ShiftN)
			}
			om := "-"
			if in.Omitted != nil {
				om = FormatProb(*in.Omitted)
			}
			name := in.Input
			if in.PerBolt {
				name += " (per bolt)"
			}
			t.Rows = append(t.Rows, []string{name, a, shift, iv, fmt.Sprintf("%+.3f", in.Spearman), om})
		}
		out = append(out, Section{Heading: head, Table: t})
	}
	return out
}

// WriteDriversBody writes the drivers as text.
func WriteDriversBody(w io.Writer, b DriversBody) {
	for i, sec := range DriversSections(b) {
		writeTextSection(w, sec)
		if i < len(b.Modes) {
			fmt.Fprintln(w)
		}
	}
}

// WriteDrivers writes the drivers document as text.
func WriteDrivers(w io.Writer, s *scenario.Scenario, doc DriversDoc, sys units.System) {
	title(w, "drivers", s)
	WriteDriversBody(w, doc.DriversBody)
	fmt.Fprintln(w)
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

// DriversFigure draws one bar group per mode: each input's
// failure-conditional shift in standard deviations.
func DriversFigure(b DriversBody) (Figure, error) {
	if len(b.Modes) == 0 {
		return Figure{}, fmt.Errorf("no modes")
	}
	var series []string
	for _, in := range b.Modes[0].Inputs {
		series = append(series, scenario.FieldLabel(in.Input))
	}
	var groups []plots.BarGroup
	for _, m := range b.Modes {
		g := plots.BarGroup{Name: m.Title}
		for _, in := range m.Inputs {
			g.Values = append(g.Values, in.Shift)
		}
		groups = append(groups, g)
	}
	p, err := plots.BarGroupPlot("What drives each mode", "mean over failures (standard deviations)", series, groups)
	if err != nil {
		return Figure{}, err
	}
	return figure(p, "drivers.png", "Failure-conditional shift of each uncertain input, one group of bars per mode: how far from its median, in standard deviations, the input lies on average when the mode fails (+: failures come with high values).")
}

// DriversReview assembles the review document of a drivers study.
func DriversReview(s *scenario.Scenario, doc DriversDoc, figs []Figure, prov Provenance, sys units.System) *Review {
	r := &Review{Title: "Bolted-joint risk drivers: " + titleOf(s), Caution: Caution, Figures: figs, Provenance: prov.rows()}
	r.Sections = append(r.Sections, inputsSection(s, doc.Joint, sys))
	r.Sections = append(r.Sections, DriversSections(doc.DriversBody)...)
	r.Sections = append(r.Sections, warningsSection(doc.Warnings)...)
	return r
}
