// Package report formats analysis results as documents: terminal text, JSON
// (with JSON Schemas generated from the document types), CSV, and the
// design-review report (Markdown and self-contained HTML with pictures).
// Documents format; they do not compute: every number comes from a result
// of the model, the estimators or the studies. Every document carries the
// caution; JSON fields name their units in their keys or in a unit field
// and are always in the internal SI system (N, mm, MPa, N·mm).
package report

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"
	"unicode/utf8"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

//go:generate go run ./schemagen

// Caution is printed with every analysis result.
const Caution = "CAUTION: these results are estimates that depend on the input scatter you described. " +
	"They do not replace the applicable codes and standards, test data, or review by a licensed or " +
	"otherwise qualified engineer; local codes govern."

// SchemaVersion is the version of every JSON document written here.
// Version 2: inputs structured, modes an ordered array of objects with key,
// c.o.v., interval kind, method and evaluations, percentiles with rank
// errors, no copy of the outer envelope inside a document.
const SchemaVersion = 2

// Envelope is what every JSON document starts with.
type Envelope struct {
	SchemaVersion int    `json:"schema_version"`
	Kind          string `json:"kind" jsonschema:"enum=nominal,enum=simulate,enum=sweep,enum=spread-limit,enum=compare,enum=fit,enum=life,enum=spec,enum=drivers"`
	ToolVersion   string `json:"tool_version"`
}

func envelope(kind, version string) Envelope {
	return Envelope{SchemaVersion: SchemaVersion, Kind: kind, ToolVersion: version}
}

// ScenarioInfo identifies the scenario in documents.
type ScenarioInfo struct {
	Name    string `json:"name"`
	Variant string `json:"variant,omitempty"`
	File    string `json:"file,omitempty"`
	SHA256  string `json:"sha256"`
}

// Info returns the identity of a scenario.
func Info(s *scenario.Scenario) ScenarioInfo {
	return ScenarioInfo{Name: s.Name, Variant: s.Variant, File: s.File, SHA256: s.SHA256}
}

// InputDoc is one input of the joint as documents show it.
type InputDoc struct {
	Path      string `json:"path"`
	Label     string `json:"label"`
	Dimension string `json:"dimension" jsonschema:"enum=number,enum=fraction,enum=force,enum=length,enum=stress,enum=torque,enum=stiffness,enum=temperature_difference,enum=thermal_expansion_coefficient"`
	// Unit of Nominal and of the distribution's parameters (internal SI);
	// empty for plain numbers and fractions.
	Unit         string   `json:"unit"`
	Nominal      float64  `json:"nominal"`
	PerBolt      bool     `json:"per_bolt"`
	Distribution *DistDoc `json:"distribution,omitempty"`
	// SharedBetweenBolts is the share of a per-bolt input's scatter common
	// to all bolts (their correlation in standard-normal space).
	SharedBetweenBolts float64 `json:"shared_between_bolts,omitempty"`
	Source             string  `json:"source,omitempty"`
	Display            string  `json:"display"` // value or distribution with units, for people
	// Data: the distribution was fitted to test data at load time.
	Data *DataDoc `json:"data,omitempty"`
}

// DistDoc is a distribution with its parameters in the input's unit.
type DistDoc struct {
	Family string `json:"family" jsonschema:"enum=normal,enum=lognormal,enum=uniform,enum=triangular,enum=weibull,enum=truncnormal,enum=student-t,enum=log-t"`
	// Parameters of the family: normal mean, sd; lognormal mu_log, sigma_log
	// (of ln X in the input's unit); uniform min, max; triangular min, mode,
	// max; weibull shape, scale; truncnormal mean, sd (of the parent), lower,
	// upper; student-t location, scale, dof; log-t mu_log, scale_log, dof
	// (of ln X). The log-t has no finite mean: mean holds its median; where
	// the sd is not finite (log-t; student-t with dof ≤ 2), sd holds half the
	// width of the central 68.27 % interval.
	Parameters map[string]float64 `json:"parameters"`
	Mean       float64            `json:"mean"`
	SD         float64            `json:"sd"`
}

// CorrelationDoc is one Gaussian-copula correlation.
type CorrelationDoc struct {
	Between [2]string `json:"between"`
	Rho     float64   `json:"rho"`
}

// JointDoc describes the joint beyond its scalar inputs.
type JointDoc struct {
	Thread          string  `json:"thread"`
	Series          string  `json:"series"`
	Bolts           int     `json:"bolts"`
	PropertyClass   string  `json:"property_class,omitempty"`
	StressAreaMM2   float64 `json:"stress_area_mm2"`
	GripMM          float64 `json:"grip_mm"`
	Layers          int     `json:"layers"`
	StiffnessMethod string  `json:"stiffness_method"`
	Tightening      string  `json:"tightening_method"`
	Condition       string  `json:"condition,omitempty"`
	Tool            string  `json:"tool,omitempty"`
	Criterion       string  `json:"fatigue_criterion"`
	ShearRule       string  `json:"shear_resistance,omitempty"`
	// TappedHole: cap screws into the last layer (not part of the grip).
	TappedHole bool `json:"tapped_hole"`
	// Washers under the head and the nut, each in the grip.
	HeadWasher   bool             `json:"head_washer"`
	NutWasher    bool             `json:"nut_washer"`
	Correlations []CorrelationDoc `json:"correlations,omitempty"`
}

// internalUnit names the internal unit of a dimension (the unit of JSON values).
func internalUnit(d units.Dim) string {
	return map[units.Dim]string{units.Force: "N", units.Length: "mm", units.Stress: "MPa", units.Torque: "N*mm", units.Stiffness: "N/mm",
		units.TempDiff: "K", units.Expansion: "1/K"}[d]
}

// distDoc documents a distribution.
func distDoc(d *montecarlo.Dist) *DistDoc {
	p := map[string]float64{}
	switch d.Kind {
	case montecarlo.Normal:
		p["mean"], p["sd"] = d.A, d.B
	case montecarlo.LogNormal:
		p["mu_log"], p["sigma_log"] = d.A, d.B
	case montecarlo.Uniform:
		p["min"], p["max"] = d.A, d.B
	case montecarlo.Triangular:
		p["min"], p["mode"], p["max"] = d.A, d.C, d.B
	case montecarlo.Weibull:
		p["shape"], p["scale"] = d.A, d.B
	case montecarlo.TruncNormal:
		p["mean"], p["sd"], p["lower"], p["upper"] = d.A, d.B, d.C, d.D
	case montecarlo.StudentT:
		p["location"], p["scale"], p["dof"] = d.A, d.B, d.C
	case montecarlo.LogT:
		p["mu_log"], p["scale_log"], p["dof"] = d.A, d.B, d.C
	}
	return &DistDoc{Family: d.Kind.String(), Parameters: p, Mean: d.Mean(), SD: d.StdDev()}
}

// Inputs documents the inputs the reports show for a scenario (its
// registry's display rules), values and distributions in the system sys
// for the display strings.
func Inputs(s *scenario.Scenario, sys units.System) []InputDoc {
	var out []InputDoc
	in := s.Inputs()
	for _, f := range s.Shown() {
		if s.CaseHeld(f.Path) {
			continue
		}
		d := InputDoc{Path: f.Path, Label: f.Label, Dimension: f.Dim.Key(), Unit: internalUnit(f.Dim),
			Nominal: *scenario.FieldPtr(in, f.Path), PerBolt: f.Role&montecarlo.PerBolt != 0,
			Source: s.Sources[f.Path], Display: s.Describe(f.Path, sys)}
		if v, ok := s.Uncertain(f.Path); ok {
			d.Distribution = distDoc(&v.Dist)
			d.SharedBetweenBolts = v.Shared
		}
		d.Data = dataDoc(s, f.Path, sys)
		out = append(out, d)
	}
	return append(out, caseInputs(s, sys)...)
}

// Joint documents the joint's description.
func Joint(s *scenario.Scenario) JointDoc {
	in := s.Inputs()
	j := JointDoc{Thread: in.Thread.Name, Series: in.Thread.Series, Bolts: in.Bolts, PropertyClass: s.ClassName,
		StressAreaMM2: in.Thread.StressArea, GripMM: in.Grip(), Layers: in.NLayers, StiffnessMethod: in.StiffnessMethod.String(),
		Tightening: in.Method.String(), Condition: s.ConditionName, Tool: s.ToolName, Criterion: in.Criterion.String()}
	if in.ShearLoad > 0 {
		j.ShearRule = in.ShearRule.String()
	}
	j.TappedHole, j.HeadWasher, j.NutWasher = in.Tapped, in.Washer.Present(), in.NutWasher.Present()
	for _, c := range s.Problem.Corr {
		j.Correlations = append(j.Correlations, CorrelationDoc{Between: [2]string{s.Problem.Vars[c.I].Name, s.Problem.Vars[c.J].Name}, Rho: c.Rho})
	}
	return j
}

// jointLines describes the joint in a few lines of text.
func jointLines(j JointDoc, sys units.System) []string {
	bolt := fmt.Sprintf("%s (%s), %d bolt", j.Thread, j.Series, j.Bolts)
	if j.Bolts > 1 {
		bolt += "s"
	}
	if j.PropertyClass != "" {
		bolt += ", class " + j.PropertyClass
	}
	clamped := fmt.Sprintf("%d layer(s)", j.Layers)
	if j.TappedHole {
		clamped = fmt.Sprintf("%d layer(s) into layer %d (tapped)", j.Layers-1, j.Layers)
	}
	if j.HeadWasher && j.NutWasher {
		clamped += ", washers under head and nut"
	} else if j.HeadWasher {
		clamped += ", washer under the head"
	} else if j.NutWasher {
		clamped += ", washer under the nut"
	}
	lines := []string{bolt,
		fmt.Sprintf("grip %s: %s, %s stiffness; tightening by %s", sys.Format(j.GripMM, units.Length), clamped, j.StiffnessMethod, j.Tightening)}
	var presets []string
	if j.Condition != "" {
		presets = append(presets, "condition "+j.Condition)
	}
	if j.Tool != "" {
		presets = append(presets, "tool "+j.Tool)
	}
	if len(presets) > 0 {
		lines = append(lines, "presets: "+strings.Join(presets, ", "))
	}
	for _, c := range j.Correlations {
		lines = append(lines, fmt.Sprintf("correlation %s ~ %s: ρ = %g (Gaussian copula)", c.Between[0], c.Between[1], c.Rho))
	}
	return lines
}

// WriteJSON writes any document as indented JSON.
func WriteJSON(w io.Writer, doc any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}

// title writes the heading of a report.
func title(w io.Writer, verb string, s *scenario.Scenario) {
	fmt.Fprintf(w, "boltrisk %s — %s\n", verb, titleOf(s))
	if s.File != "" {
		fmt.Fprintf(w, "scenario file %s (sha256 %.12s…)\n", s.File, s.SHA256)
	}
}

func titleOf(s *scenario.Scenario) string {
	t := s.Name
	if t == "" {
		t = "(unnamed scenario)"
	}
	if s.Variant != "" {
		t += " — " + s.Variant
	}
	return t
}

// writeInputs writes the joint and its inputs aligned.
func writeInputs(w io.Writer, j JointDoc, inputs []InputDoc, sys units.System) {
	fmt.Fprintln(w, "\nJoint")
	for _, l := range jointLines(j, sys) {
		fmt.Fprintln(w, "  "+l)
	}
	fmt.Fprintln(w, "\nInputs")
	rows := make([][]string, 0, len(inputs))
	for _, r := range inputs {
		src := ""
		if r.Source != "" {
			src = "(" + r.Source + ")"
		}
		rows = append(rows, []string{r.Label, r.Display, src})
	}
	writeColumns(w, rows)
	writeDataLines(w, inputs) // fitdata.go
}

// writeColumns writes rows of cells indented by two spaces, each column as
// wide as its widest cell and two spaces apart, without trailing blanks
// (text/tabwriter breaks a column at every line that has fewer cells).
func writeColumns(w io.Writer, rows [][]string) {
	var width []int
	for _, r := range rows {
		for i, c := range r {
			if i == len(width) {
				width = append(width, 0)
			}
			width[i] = max(width[i], utf8.RuneCountInString(c))
		}
	}
	for _, r := range rows {
		line := " "
		for i, c := range r {
			line += " " + c
			if i < len(r)-1 {
				line += strings.Repeat(" ", width[i]-utf8.RuneCountInString(c)+1)
			}
		}
		fmt.Fprintln(w, strings.TrimRight(line, " "))
	}
}

// WriteCaution writes the caution wrapped to 78 columns.
func WriteCaution(w io.Writer) {
	fmt.Fprintln(w)
	line := ""
	for _, word := range strings.Fields(Caution) {
		if len(line)+len(word)+1 > 78 {
			fmt.Fprintln(w, line)
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += word
	}
	fmt.Fprintln(w, line)
}

func writeWarnings(w io.Writer, ws []string) {
	if len(ws) == 0 {
		return
	}
	fmt.Fprintln(w, "\nWarnings")
	for _, s := range ws {
		fmt.Fprintln(w, "  - "+s)
	}
}

// SFCap stands for an infinite safety factor (a mode with no demand, such
// as proof with neither preload nor load) in documents: JSON has no infinity.
const SFCap = 1e9

// FiniteSF caps a safety factor at SFCap and maps NaN to 0.
func FiniteSF(v float64) float64 {
	switch {
	case math.IsNaN(v):
		return 0
	case v > SFCap:
		return SFCap
	}
	return v
}

func fmtSF(v float64) string {
	if math.IsInf(v, 1) || v > 1e6 {
		return "> 1e6"
	}
	return fmt.Sprintf("%.3f", v)
}

// finite returns v, or nil for a value JSON cannot hold (an infinite c.o.v.).
func finite(v float64) *float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return nil
	}
	return &v
}
