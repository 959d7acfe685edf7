package report

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
)

// NominalBody is the deterministic result of a joint at its nominal inputs.
type NominalBody struct {
	BoltStiffness   float64   `json:"bolt_stiffness_N_per_mm"`
	MemberStiffness float64   `json:"member_stiffness_N_per_mm"`
	JointConstant   float64   `json:"joint_constant"`
	LoadFactor      float64   `json:"load_factor"`
	AssemblyPreload float64   `json:"assembly_preload_N"`
	Preload         float64   `json:"preload_N"`
	ThreadTorque    float64   `json:"thread_torque_N_mm"`
	BoltForceMax    float64   `json:"bolt_force_max_N"`
	ClampMin        float64   `json:"clamp_force_min_N"`
	Window          WindowDoc `json:"preload_window"`
	Modes           []ModeDoc `json:"modes"` // active modes, report order
}

// NominalDoc is the document of `boltrisk nominal --json`.
type NominalDoc struct {
	Envelope
	Scenario ScenarioInfo `json:"scenario"`
	Joint    JointDoc     `json:"joint"`
	Inputs   []InputDoc   `json:"inputs"`
	NominalBody
	Checks
	// Life is the nominal service life when the scenario gives a curve and
	// a design life (fatigue.curve, fatigue.design_life).
	Life     *NominalLifeDoc `json:"service_life,omitempty"`
	Warnings []string        `json:"warnings"`
	Caution  string          `json:"caution"`
}

// NominalLifeDoc is the life of the nominal joint: inputs at their means,
// the median curve, a critical damage sum of 1 (Miner).
type NominalLifeDoc struct {
	Curve string `json:"curve"`
	// Cycles is the nominal life; null when it is infinite (below the
	// curve's endurance limit or cut-off).
	Cycles     *float64 `json:"cycles" jsonschema:"nullable"`
	DesignLife float64  `json:"design_life_cycles"`
	// Ratio is Cycles/DesignLife (null when infinite): a margin on life,
	// not a probability — 'boltrisk life' gives that.
	Ratio *float64 `json:"life_over_design_life" jsonschema:"nullable"`
}

// TighteningCheckDoc is the deterministic cross-check of the tightening a
// reviewer does by hand (VDI 2230-1 form): the permissible assembly preload
// FMzul and the tightening torque MA at utilisation ν = 0.9, the tightening
// factor αA of the tool, and an embedding estimate from VDI 2230-1 Table 5.
type TighteningCheckDoc struct {
	Utilisation        float64 `json:"utilisation"`
	ThreadFriction     float64 `json:"thread_friction"`
	PermissiblePreload float64 `json:"permissible_assembly_preload_N"`
	// TighteningTorque is MA at FMzul; 0 for preload-controlled methods.
	TighteningTorque float64 `json:"tightening_torque_N_mm"`
	Tool             string  `json:"tool,omitempty"`
	AlphaALow        float64 `json:"alpha_a_low,omitempty"`
	AlphaAHigh       float64 `json:"alpha_a_high,omitempty"`
	AlphaASource     string  `json:"alpha_a_source,omitempty"`
	// AlphaATool is (1 + t)/(1 − t) of the tool preset's own scatter ±t.
	AlphaATool        float64 `json:"alpha_a_of_tool_scatter,omitempty"`
	EmbeddingEstimate float64 `json:"embedding_estimate_mm"`
	EmbeddingLoss     float64 `json:"embedding_estimate_loss_N"`
	EmbeddingNote     string  `json:"embedding_estimate_note"`
	EmbeddingUsed     float64 `json:"embedding_used_mm"`
}

// NotCheckedDoc is a mode (by key) or topic that was not evaluated, and why.
type NotCheckedDoc struct {
	Key    string `json:"key"`
	Reason string `json:"reason"`
}

// Checks are the by-hand cross-checks of a scenario and what the tool did
// not check.
type Checks struct {
	TighteningCheck TighteningCheckDoc `json:"tightening_check"`
	NotChecked      []NotCheckedDoc    `json:"not_checked"`
}

// ChecksOf fills the checks of a scenario whose nominal stiffness is st.
func ChecksOf(s *scenario.Scenario, st model.Stiffness) Checks {
	c := Checks{TighteningCheck: tighteningCheck(s, st), NotChecked: []NotCheckedDoc{}}
	for _, u := range s.NotChecked() {
		c.NotChecked = append(c.NotChecked, NotCheckedDoc{Key: u.Key, Reason: u.Reason})
	}
	return c
}

// writeChecks writes the tightening cross-check and the not-checked list.
func writeChecks(w io.Writer, c Checks, sys units.System) {
	writeTighteningCheck(w, c.TighteningCheck, sys)
	writeNotChecked(w, c.NotChecked)
}

// tighteningCheck fills the tightening cross-check of a scenario.
func tighteningCheck(s *scenario.Scenario, st model.Stiffness) TighteningCheckDoc {
	in := s.Inputs()
	const nu = 0.9 // VDI 2230-1 utilisation of Rp0.2 in tightening
	fm := model.PermissibleAssemblyPreload(in, nu)
	fz := model.EmbeddingEstimateOf(in, s.Roughness, in.ShearLoad > 0)
	d := TighteningCheckDoc{Utilisation: nu, ThreadFriction: in.TorsionFriction(), PermissiblePreload: fm,
		TighteningTorque: in.TorqueFor(fm), EmbeddingEstimate: fz.Total, EmbeddingLoss: st.PreloadLoss(fz.Total),
		EmbeddingNote: "VDI 2230-1 Table 5 (from memory): " + fz.Describe(), EmbeddingUsed: in.Embedding}
	if t, ok := s.ToolPreset(); ok {
		d.Tool, d.AlphaALow, d.AlphaAHigh, d.AlphaASource, d.AlphaATool = t.Name, t.AlphaALo, t.AlphaAHi, t.AlphaASource, t.AlphaA()
	}
	return d
}

// WindowDoc is the preload window in N.
type WindowDoc struct {
	Lower         float64 `json:"lower_N"`
	Upper         float64 `json:"upper_N"`
	SeparationMin float64 `json:"separation_min_N"`
	SlipMin       float64 `json:"slip_min_N"`
	ProofMax      float64 `json:"proof_max_N"`
	AssemblyMax   float64 `json:"assembly_max_N"`
	BeneficialMax float64 `json:"goodman_beneficial_max_N"`
	Contains      bool    `json:"contains_preload"`
}

// ModeDoc is one failure mode at nominal values. Demand and capacity are in
// Unit ("MPa" or "N"); margin = capacity − demand; the mode fails when the
// capacity does not exceed the demand.
type ModeDoc struct {
	Key          string  `json:"key"`
	Title        string  `json:"title"`
	Demand       float64 `json:"demand"`
	Capacity     float64 `json:"capacity"`
	Unit         string  `json:"unit"`
	SafetyFactor float64 `json:"safety_factor"`
	Margin       float64 `json:"margin"`
	Fails        bool    `json:"fails"`
}

// Body documents a nominal evaluation.
func Body(n model.Nominal) NominalBody {
	o, w := &n.Outcome, n.Window
	b := NominalBody{
		BoltStiffness: o.Stiffness.Kb, MemberStiffness: o.Stiffness.Km,
		JointConstant: o.Stiffness.C, LoadFactor: o.Stiffness.Phi,
		AssemblyPreload: o.Bolt.AssemblyPreload, Preload: o.Bolt.Preload,
		ThreadTorque: o.Bolt.ThreadTorque, BoltForceMax: o.Bolt.BoltForce, ClampMin: o.Bolt.Clamp,
		Window: WindowDoc{Lower: w.Lower, Upper: w.Upper, SeparationMin: w.SeparationMin, SlipMin: w.SlipMin,
			ProofMax: w.ProofMax, AssemblyMax: w.AssemblyMax, BeneficialMax: w.BeneficialMax,
			Contains: o.Bolt.Preload >= w.Lower && o.Bolt.Preload <= w.Upper},
		Modes: []ModeDoc{},
	}
	for m := range model.NumModes {
		if !o.Active[m] {
			continue
		}
		u, _ := units.SI.Unit(m.Dim())
		b.Modes = append(b.Modes, ModeDoc{Key: m.Key(), Title: m.Title(), Demand: o.Demand[m], Capacity: o.Capacity[m], Unit: u,
			SafetyFactor: FiniteSF(o.SafetyFactor(m)), Margin: o.Margin(m), Fails: o.Fails(m)})
	}
	return b
}

// Nominal documents a scenario's nominal evaluation n.
func Nominal(s *scenario.Scenario, n model.Nominal, version string) NominalDoc {
	return NominalDoc{Envelope: envelope("nominal", version), Scenario: Info(s), Joint: Joint(s), Inputs: Inputs(s, units.SI),
		NominalBody: Body(n), Checks: ChecksOf(s, n.Outcome.Stiffness), Life: nominalLife(s), Warnings: warnings(s), Caution: Caution}
}

// nominalLife is the nominal service life of a scenario with a life, or nil.
func nominalLife(s *scenario.Scenario) *NominalLifeDoc {
	if s.Life == nil || !(s.Life.DesignLife > 0) {
		return nil
	}
	n, err := s.Life.NominalLife(s.Inputs())
	if err != nil { // the loader has checked the nominal life; nothing to show otherwise
		return nil
	}
	d := &NominalLifeDoc{Curve: s.Life.Curve.Key(), Cycles: finite(n), DesignLife: s.Life.DesignLife}
	if d.Cycles != nil {
		r := n / s.Life.DesignLife
		d.Ratio = &r
	}
	return d
}

// warnings lists the scenario's warnings.
func warnings(s *scenario.Scenario) []string {
	out := []string{}
	for _, w := range s.Warnings {
		out = append(out, w.String())
	}
	return out
}

// WriteNominal writes the nominal result as terminal text.
func WriteNominal(w io.Writer, s *scenario.Scenario, doc NominalDoc, sys units.System) {
	title(w, "nominal", s)
	writeInputs(w, doc.Joint, Inputs(s, sys), sys)
	writeNominalBody(w, doc.NominalBody, sys)
	writeChecks(w, doc.Checks, sys)
	if l := doc.Life; l != nil {
		life := "infinite (below the curve's endurance limit or cut-off)"
		if l.Cycles != nil {
			life = fmt.Sprintf("%.3g cycles, %.3g × the design life", *l.Cycles, *l.Ratio)
		}
		fmt.Fprintf(w, "\nService life (curve %s; inputs at their means, median curve, critical damage 1): %s of %.3g cycles; 'boltrisk life' gives the probability of failure within it\n",
			l.Curve, life, l.DesignLife)
	}
	writeWarnings(w, doc.Warnings)
	WriteCaution(w)
}

func writeNominalBody(w io.Writer, doc NominalBody, sys units.System) {
	F := func(v float64) string { return sys.Format(v, units.Force) }
	fmt.Fprintln(w, "\nStiffness and preload")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  bolt stiffness kb\t%s\n", sys.Format(doc.BoltStiffness, units.Stiffness))
	fmt.Fprintf(tw, "  member stiffness km\t%s\n", sys.Format(doc.MemberStiffness, units.Stiffness))
	fmt.Fprintf(tw, "  joint constant C\t%.4f", doc.JointConstant)
	if math.Abs(doc.LoadFactor-doc.JointConstant) > 1e-12 {
		fmt.Fprintf(tw, "  (load factor Φ = n·C = %.4f)", doc.LoadFactor)
	}
	fmt.Fprintln(tw)
	fmt.Fprintf(tw, "  assembly preload FM\t%s\n", F(doc.AssemblyPreload))
	fmt.Fprintf(tw, "  residual preload Fi\t%s\n", F(doc.Preload))
	if doc.ThreadTorque > 0 {
		fmt.Fprintf(tw, "  thread torque MG\t%s\n", sys.Format(doc.ThreadTorque, units.Torque))
	}
	fmt.Fprintf(tw, "  largest bolt force\t%s\n", F(doc.BoltForceMax))
	fmt.Fprintf(tw, "  least clamp force\t%s\n", F(doc.ClampMin))
	tw.Flush()
	wd := doc.Window
	fmt.Fprintln(w, "\nPreload window (residual preload)")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  least, against separation\t%s\n", F(wd.SeparationMin))
	if wd.SlipMin > 0 {
		fmt.Fprintf(tw, "  least, against slip\t%s\n", F(wd.SlipMin))
	}
	fmt.Fprintf(tw, "  greatest, below proof load\t%s\n", F(wd.ProofMax))
	fmt.Fprintf(tw, "  greatest, assembly yield\t%s\t(assembly preload)\n", F(wd.AssemblyMax))
	fmt.Fprintf(tw, "  preload still helps Goodman up to\t%s\t(Shigley Eq. 8-50)\n", F(wd.BeneficialMax))
	verdict := "inside"
	if !wd.Contains {
		verdict = "OUTSIDE"
	}
	fmt.Fprintf(tw, "  window\t%s … %s\tnominal preload %s is %s\n", F(wd.Lower), F(wd.Upper), F(doc.Preload), verdict)
	tw.Flush()

	fmt.Fprintln(w, "\nFailure modes (nominal)")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  mode\tdemand\tcapacity\tsafety factor\tresult\t")
	for _, row := range modeRows(doc, sys) {
		fmt.Fprintf(tw, "  %s\t\n", strings.Join(row, "\t"))
	}
	tw.Flush()
}

// modeRows returns, per mode at nominal values: key, demand, capacity,
// safety factor and "ok" or "FAILS", formatted in the display units.
func modeRows(doc NominalBody, sys units.System) [][]string {
	var rows [][]string
	for _, md := range doc.Modes {
		m, _ := model.ParseMode(md.Key)
		dim := m.Dim()
		res := "ok"
		if md.Fails {
			res = "FAILS"
		}
		rows = append(rows, []string{md.Title, sys.Format(md.Demand, dim), sys.Format(md.Capacity, dim), fmtSF(md.SafetyFactor), res})
	}
	return rows
}

// tighteningRows are the rows of the tightening cross-check: quantity,
// value and note, formatted in the display units.
func tighteningRows(d TighteningCheckDoc, sys units.System) [][]string {
	F := func(v float64) string { return sys.Format(v, units.Force) }
	rows := [][]string{{"permissible assembly preload FMzul", F(d.PermissiblePreload), fmt.Sprintf("ν = %g, μG = %.3g", d.Utilisation, d.ThreadFriction)}}
	if d.TighteningTorque > 0 {
		rows = append(rows, []string{"tightening torque MA at FMzul", sys.Format(d.TighteningTorque, units.Torque), ""})
	} else {
		rows = append(rows, []string{"tightening torque MA at FMzul", "—", "preload-controlled tightening"})
	}
	if d.Tool != "" {
		rows = append(rows, []string{"tightening factor αA, " + d.Tool, fmt.Sprintf("%.3g – %.3g", d.AlphaALow, d.AlphaAHigh),
			fmt.Sprintf("VDI 2230-1 Table A8; the preset's own scatter alone gives %.3g", d.AlphaATool)})
	}
	rows = append(rows, []string{"embedding estimate fZ", sys.Format(d.EmbeddingEstimate, units.Length), F(d.EmbeddingLoss) + " lost; " + d.EmbeddingNote})
	used := "none"
	if d.EmbeddingUsed > 0 {
		used = sys.Format(d.EmbeddingUsed, units.Length)
	}
	return append(rows, []string{"embedding used in the model", used, ""})
}

// writeTighteningCheck writes the tightening cross-check rows.
func writeTighteningCheck(w io.Writer, d TighteningCheckDoc, sys units.System) {
	fmt.Fprintln(w, "\nTightening cross-check (VDI 2230-1)")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, r := range tighteningRows(d, sys) {
		if r[2] == "" {
			fmt.Fprintf(tw, "  %s\t%s\n", r[0], r[1])
			continue
		}
		note := "(" + r[2] + ")"
		if r[0] == "embedding estimate fZ" {
			note = r[2]
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", r[0], r[1], note)
	}
	tw.Flush()
}

// writeNotChecked writes the modes and topics that were not evaluated.
func writeNotChecked(w io.Writer, list []NotCheckedDoc) {
	if len(list) == 0 {
		return
	}
	fmt.Fprintln(w, "\nNot checked")
	for _, u := range list {
		fmt.Fprintf(w, "  - %s: %s\n", u.Key, u.Reason)
	}
}
