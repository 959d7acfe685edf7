// Package report writes analysis results as terminal text and as JSON
// documents. Every document carries the caution; JSON fields name their
// units in their keys and are always in SI (N, mm, MPa, N·mm).
package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
)

// Caution is printed with every analysis result.
const Caution = "CAUTION: these results are estimates that depend on the input scatter you described. " +
	"They do not replace the applicable codes and standards, test data, or review by a licensed or " +
	"otherwise qualified engineer; local codes govern."

// SchemaVersion is the version of every JSON document written here.
const SchemaVersion = 1

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

// InputRow is one echoed input: a label and its value with units (or its
// distribution), plus where the value came from.
type InputRow struct {
	Label  string `json:"label"`
	Value  string `json:"value"`
	Source string `json:"source,omitempty"`
}

// Inputs echoes the scenario's inputs with units in the chosen system.
func Inputs(s *scenario.Scenario, sys units.System) []InputRow {
	in := s.Inputs()
	var rows []InputRow
	add := func(label, value, source string) { rows = append(rows, InputRow{label, value, source}) }
	val := func(path string) string {
		dim := scenario.FieldDim(path)
		f := func(v float64) string { return sys.Format(v, dim) }
		if v, ok := s.Uncertain(path); ok {
			return v.Dist.Describe(f)
		}
		return f(*scenario.FieldPtr(in, path))
	}
	th := in.Thread
	bolt := fmt.Sprintf("%s (%s), %d bolt", th.Name, th.Series, in.Bolts)
	if in.Bolts > 1 {
		bolt += "s"
	}
	add("bolt", bolt, "")
	add("thread", fmt.Sprintf("d %s, P %s, d2 %s, d3 %s, As %s mm²", sys.Format(th.D, units.Length), sys.Format(th.Pitch, units.Length),
		sys.Format(th.PitchDia, units.Length), sys.Format(th.MinorDia, units.Length), units.Sig(th.StressArea, 4)), "ISO 724 / ASME B1.1 formulas")
	cls := "given"
	if s.ClassName != "" {
		cls = "class " + s.ClassName
	}
	add("proof strength", val("bolt.proof_strength"), cls)
	add("yield strength", val("bolt.yield_strength"), cls)
	add("tensile strength", val("bolt.tensile_strength"), cls)
	add("bolt modulus", val("bolt.modulus"), "")
	add("shank in grip", val("bolt.shank_in_grip"), "")
	add("bearing / hole dia.", val("bolt.bearing_diameter")+" / "+val("bolt.hole_diameter"), "")
	var ls []string
	for i := range in.NLayers {
		p := fmt.Sprintf("members.layers.%d.", i+1)
		ls = append(ls, val(p+"thickness")+" @ E "+val(p+"modulus"))
	}
	add("members", strings.Join(ls, " + "), in.StiffnessMethod.String()+" method, grip "+sys.Format(in.Grip(), units.Length))
	if in.MemberStiffness > 0 {
		add("member stiffness", val("members.stiffness"), "given")
	}
	if in.LoadIntroduction > 0 && in.LoadIntroduction != 1 {
		add("load introduction n", val("members.load_introduction"), "VDI 2230")
	}
	src := func(preset, name string) string {
		if name == "" {
			return ""
		}
		return preset + " " + name
	}
	switch in.Method {
	case model.NutFactorMethod:
		add("torque", val("tightening.torque"), src("tool", s.ToolName))
		add("nut factor", val("tightening.nut_factor"), src("condition", s.ConditionName))
	case model.FrictionMethod:
		add("torque", val("tightening.torque"), src("tool", s.ToolName))
		add("thread friction", val("tightening.thread_friction"), src("condition", s.ConditionName))
		add("head friction", val("tightening.head_friction"), src("condition", s.ConditionName))
	default:
		add("preload", val("tightening.preload"), src("tool", s.ToolName))
	}
	if in.Embedding > 0 {
		add("embedding", val("tightening.embedding"), "")
	}
	if in.Relaxation > 0 {
		add("relaxation", val("tightening.relaxation"), "")
	}
	add("axial load per bolt", val("loads.axial_min")+" … "+val("loads.axial_max"), "")
	if in.ShearLoad > 0 {
		add("shear load on joint", val("loads.shear"), fmt.Sprintf("%g shear plane(s), threads in plane: %v", in.ShearPlanes, in.ThreadsInShearPlane))
		add("plate", fmt.Sprintf("t %s, width %s, e1 %s", val("plate.thickness"), val("plate.width"), val("plate.edge_distance")), in.ShearRule.String()+" resistance")
		add("plate strengths", val("plate.yield_strength")+" / "+val("plate.tensile_strength"), "yield / tensile")
		if in.SlipFactor > 0 {
			add("slip factor", val("plate.slip_factor"), "")
		}
	}
	if in.AxialMax > in.AxialMin {
		add("endurance strength", val("fatigue.endurance"), s.EnduranceNote)
		add("fatigue criterion", in.Criterion.String(), "")
	}
	for _, c := range s.Problem.Corr {
		add("correlation", fmt.Sprintf("%s ~ %s: ρ = %g", s.Problem.Vars[c.I].Name, s.Problem.Vars[c.J].Name, c.Rho), "Gaussian copula")
	}
	return rows
}

// writeRows writes label/value/source rows aligned.
func writeRows(w io.Writer, rows []InputRow) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, r := range rows {
		if r.Source != "" {
			fmt.Fprintf(tw, "  %s\t%s\t(%s)\n", r.Label, r.Value, r.Source)
		} else {
			fmt.Fprintf(tw, "  %s\t%s\n", r.Label, r.Value)
		}
	}
	tw.Flush()
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
