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
	Warnings []string `json:"warnings"`
	Caution  string   `json:"caution"`
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
		NominalBody: Body(n), Warnings: warnings(s), Caution: Caution}
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
