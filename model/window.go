package model

import (
	"fmt"
	"math"

	"boltrisk/model/units"
)

// Window is the range of residual preload in which the tension-side modes
// are safe at the nominal loads. All forces in N.
type Window struct {
	// Lower limits: the least residual preload that avoids separation at Pmax,
	// (1 − Φ)·Pmax (Shigley Eq. 8-30 with n0 = 1), and, when the joint carries
	// shear with a slip factor, the least that avoids slip,
	// V/(μ·m·n) + (1 − Φ)·Pmax.
	SeparationMin float64
	SlipMin       float64
	// Upper limits: the largest residual preload below the proof load,
	// Sp·As − Φ·Pmax (Shigley Eq. 8-28 with np = 1), and the largest assembly
	// preload before von Mises yield in tightening, As·Sy/√(1 + 3k²) with
	// k = (MG/FM)·As/Wp, Wp = π·d0³/12 (VDI 2230-1 FMzul with ν = 1).
	ProofMax    float64
	AssemblyMax float64
	// BeneficialMax is the largest preload for which preload still improves
	// the Goodman factor of safety over an unpreloaded bolt,
	// (1 − Φ)·Sut·At (Shigley Eq. 8-50 with the load factor Φ = n·C in
	// place of C: at that preload the factor equals the unpreloaded one).
	BeneficialMax float64
	Lower, Upper  float64 // max of the lower limits, min of the upper limits
}

// PreloadWindow returns the preload window of a joint at its nominal values.
func PreloadWindow(in *Inputs) Window {
	s := ComputeStiffness(in)
	var w Window
	as := in.Thread.StressArea
	pmax := math.Max(in.AxialMax, 0)
	w.SeparationMin = (1 - s.Phi) * pmax
	if in.ShearLoad > 0 && in.SlipFactor > 0 && in.ShearPlanes > 0 {
		w.SlipMin = in.ShearLoad/(in.SlipFactor*in.ShearPlanes*float64(in.Bolts)) + w.SeparationMin
	}
	w.ProofMax = in.Proof*as - s.Phi*pmax
	// Torsion from the nominal tightening: MG/FM does not depend on FM.
	w.AssemblyMax = PermissibleAssemblyPreload(in, 1)
	w.BeneficialMax = (1 - s.Phi) * in.Tensile * as
	w.Lower = math.Max(w.SeparationMin, w.SlipMin)
	w.Upper = math.Min(w.ProofMax, w.AssemblyMax)
	return w
}

// Warning is a note on an input that is legal but outside common practice or
// outside the validity of a formula.
type Warning struct {
	Field   string
	Message string
}

func (w Warning) String() string { return w.Field + ": " + w.Message }

// Check returns warnings for a joint's nominal values, with quantities in
// the display units sys.
func Check(in *Inputs, sys units.System) []Warning {
	var ws []Warning
	add := func(field, format string, args ...any) {
		ws = append(ws, Warning{field, fmt.Sprintf(format, args...)})
	}
	L := func(v float64) string { return sys.Format(v, units.Length) }
	F := func(v float64) string { return sys.Format(v, units.Force) }
	d := in.Thread.D
	if in.ShearLoad > 0 && in.EdgeDistance > 0 && in.EdgeDistance < 1.5*d {
		add("plate.edge_distance", "%s is below 1.5·d = %s (common practice minimum against shear-out)", L(in.EdgeDistance), L(1.5*d))
	}
	if in.ShearLoad > 0 && in.ShearRule == EN1993 && in.EdgeDistance > 0 && in.EdgeDistance < 1.2*in.HoleDia {
		add("plate.edge_distance", "%s is below the EN 1993-1-8 Table 3.3 minimum 1.2·d0 = %s", L(in.EdgeDistance), L(1.2*in.HoleDia))
	}
	if in.Method == NutFactorMethod && (in.NutFactor < 0.08 || in.NutFactor > 0.40) {
		add("tightening.nut_factor", "%.3g lies outside 0.08–0.40, the range of published nut factors for steel fasteners (Shigley Table 8-15)", in.NutFactor)
	}
	if in.Method == NutFactorMethod && in.EquivalentFriction(in.NutFactor) < 0 {
		add("tightening.nut_factor", "%.3g is below the lead term alone (P/(2π·d) = %.3g); thread torsion taken as the lead term only", in.NutFactor, in.Thread.Pitch/twoPi/d)
	}
	if in.Criterion == Amplitude && d > 40 {
		add("bolt.thread", "the VDI 2230 endurance limit is stated for d ≤ 40 mm; d = %s", L(d))
	}
	if in.Tensile > 0 && in.Preload > 0 && in.Method == DirectPreload && in.Preload/in.Thread.StressArea >= in.Tensile {
		add("tightening.preload", "preload stress reaches the tensile strength")
	}
	var o Outcome
	Evaluate(in, &o)
	if !(o.Bolt.Preload > 0) {
		add("tightening.embedding", "no preload remains after embedding, relaxation and the service temperature change (assembly preload %s): the joint is loose", F(o.Bolt.AssemblyPreload))
	}
	w := PreloadWindow(in)
	if w.Lower > w.Upper {
		add("loads", "no preload satisfies both the lower limit %s (separation/slip) and the upper limit %s (proof/assembly yield)", F(w.Lower), F(w.Upper))
	}
	return ws
}
