package model_test

import (
	"boltrisk/model"

	"math"
	"testing"
)

func TestPreloadMethodsKeepThreadTorsion(t *testing.T) {
	t.Parallel()
	// Angle-controlled and ultrasonic tightening still turn the nut: MG =
	// FM·(P/(2π) + 0.577·d2·μG) (VDI 2230-1 R13 thread term). M12 10.9 at
	// FM = 40 kN, μG = 0.12, by hand: MG/FM = 0.2785 + 0.5774·10.863·0.12 =
	// 1.0312 mm; τ = MG/(π·d0³/12) with d0 = 10.358 mm → 141.8 MPa;
	// σ = 40 000/84.27 = 474.7 MPa; √(σ² + 3τ²) = 534.5 MPa.
	in := r1()
	in.Method, in.Torque, in.NutFactor, in.Preload, in.ThreadFriction = model.DirectPreload, 0, 0, 40e3, 0.12
	var o model.Outcome
	model.Evaluate(&in, &o)
	d0 := in.StressDiameter()
	mg := 40e3 * (in.Thread.Pitch/(2*math.Pi) + 0.5773502691896258*in.Thread.PitchDia*0.12)
	sig, tau := 40e3/in.Thread.StressArea, mg*12/(math.Pi*d0*d0*d0)
	near(t, "MG", o.Bolt.ThreadTorque, mg, 1e-12)
	near(t, "σred", o.Demand[model.AssemblyYield], math.Sqrt(sig*sig+3*tau*tau), 1e-12)
	near(t, "σred value", o.Demand[model.AssemblyYield], 534.5, 0.001)
	// A tensioner (tension-controlled) applies no torsion: σred = σ = 474.7 MPa.
	in.Tensioned = true
	model.Evaluate(&in, &o)
	near(t, "tensioned", o.Demand[model.AssemblyYield], 474.7, 0.001)
}

func TestTappedHoleGrip(t *testing.T) {
	t.Parallel()
	// Shigley Table 8-7 (confirmed): a cap screw in a tapped member of
	// thickness t2 has the effective grip l′ = h + t2/2 for t2 < d, h + d/2
	// for t2 ≥ d. M12 through a 20 mm steel plate into cast iron:
	// t2 = 25 mm ≥ d: l′ = 20 + 6 = 26 mm; t2 = 8 mm < d: l′ = 20 + 4 = 24 mm.
	in := r1()
	in.StiffnessMethod = model.Frustum
	in.ShankInGrip = 0
	in.Layers[0] = model.Layer{Thickness: 20, Modulus: 207000}
	in.Layers[1] = model.Layer{Thickness: 25, Modulus: 100000}
	in.Tapped, in.Engagement, in.TappedShear = true, 16, 150
	s := model.ComputeStiffness(&in)
	near(t, "l′ (t2 ≥ d)", s.Grip, 26, 1e-12)
	near(t, "clamp length h", in.Grip(), 20, 1e-12)
	// Members over l′ (Shigley §8-5): two 30° frusta from dw = 18 mm meeting at
	// l′/2 = 13 mm: head cone in 13 mm of steel; the other through 6 mm of
	// cast iron and 7 mm of steel (Eq. 8-19, in series Eq. 8-18).
	a := math.Pi / 6
	k1 := model.FrustumStiffness(207000, 12, 18, 13, a)
	k2 := model.FrustumStiffness(100000, 12, 18, 6, a)
	k3 := model.FrustumStiffness(207000, 12, 18+2*6*math.Tan(a), 7, a)
	near(t, "km over l′", s.Km, 1/(1/k1+1/k2+1/k3), 1e-12)
	// Bolt: all of l′ threaded (Eq. 8-17 with ld = 0).
	near(t, "kb over l′", s.Kb, in.Thread.StressArea*207000/26, 1e-12)
	in.Layers[1].Thickness = 8
	near(t, "l′ (t2 < d)", model.ComputeStiffness(&in).Grip, 24, 1e-12)
}

func TestWashersInTheGrip(t *testing.T) {
	t.Parallel()
	// A 3 mm steel washer under head and nut is a layer of the grip and of the
	// frusta (Shigley §8-4: the grip includes washers): the same km as two
	// 3 mm steel layers added to the stack.
	in := r1()
	in.StiffnessMethod = model.Frustum
	in.Washer = model.Washer{Thickness: 3, OuterDia: 24, InnerDia: 13, Modulus: 207000}
	in.NutWasher = in.Washer
	got := model.ComputeStiffness(&in)
	ref := r1()
	ref.StiffnessMethod = model.Frustum
	ref.NLayers = 4
	w := model.Layer{Thickness: 3, Modulus: 207000}
	ref.Layers[0], ref.Layers[1], ref.Layers[2], ref.Layers[3] = w, in.Layers[0], in.Layers[1], w
	want := model.ComputeStiffness(&ref)
	near(t, "km with washers", got.Km, want.Km, 1e-12)
	near(t, "kb with washers", got.Kb, want.Kb, 1e-12)
	near(t, "grip", in.Grip(), 36, 1e-12)
}

func TestTemperaturePreloadChange(t *testing.T) {
	t.Parallel()
	// ΔF = (Σ αi·ti − αb·lk)·ΔT·kb·km/(kb + km) over the clamp length lk
	// (VDI 2230-1 thermal preload change, formula from memory). A steel M12
	// (αb = 12·10⁻⁶/K, EN 1993-1-1 §3.2.6, secondary source) through two 15 mm
	// aluminium plates (α = 23.6·10⁻⁶/K, alloy 6061, Callister Table B.6,
	// secondary source; E = 71.7 GPa, Shigley Table A-5) heated by 80 K:
	// mismatch (23.6 − 12)·10⁻⁶·30·80 = 0.02784 mm. Aluminium members on a
	// steel bolt gain preload when heated.
	in := r1()
	in.StiffnessMethod = model.Frustum
	for i := range 2 {
		in.Layers[i] = model.Layer{Thickness: 15, Modulus: 71700, Expansion: 23.6e-6}
	}
	in.BoltExpansion = 12e-6
	var cold, hot model.Outcome
	model.Evaluate(&in, &cold)
	in.TemperatureChange = 80
	model.Evaluate(&in, &hot)
	s := hot.Stiffness
	want := 0.02784 * s.Kb * s.Km / (s.Kb + s.Km)
	near(t, "ΔF", hot.Bolt.Preload-cold.Bolt.Preload, want, 1e-9)
	if !(want > 0) {
		t.Error("aluminium members on a steel bolt must gain preload when heated")
	}
	// By hand: kb = Ad·At·E/(Ad·lt + At·ld) = 635.5 kN/mm (Eq. 8-17), km =
	// 865 kN/mm (two aluminium frusta, Eq. 8-19), kb·km/(kb + km) = 366.3 kN/mm:
	// ΔF = 0.02784 mm · 366.3 kN/mm = 10.20 kN.
	near(t, "ΔF value (kN)", want/1000, 10.20, 0.002)
	// The stiffness of a joint assembled cold serves every drawn ΔT (the
	// Monte Carlo driver computes it once when ΔT is the only uncertain input).
	in.TemperatureChange = 0
	s0 := model.ComputeStiffness(&in)
	in.TemperatureChange = 80
	var b model.BoltResult
	model.EvaluateBolt(&in, &s0, model.AllModes, &b)
	near(t, "ΔF with the cold stiffness", b.Preload-cold.Bolt.Preload, want, 1e-9)
	// Cooling loses it; the assembly preload is unchanged.
	in.TemperatureChange = -80
	model.Evaluate(&in, &hot)
	near(t, "cooling", cold.Bolt.Preload-hot.Bolt.Preload, want, 1e-9)
	near(t, "FM unchanged", hot.Bolt.AssemblyPreload, cold.Bolt.AssemblyPreload, 1e-15)
}

func TestThreadShearAreas(t *testing.T) {
	t.Parallel()
	// FED-STD-H28/2B shear areas at basic dimensions (Machinery's Handbook,
	// secondary source): ASs = π·n·Le·Kn·[1/(2n) + 0.57735·(Es − Kn)],
	// ASn = π·n·Le·Ds·[1/(2n) + 0.57735·(Ds − En)]; with the basic profile
	// these are 0.75·π·D1·Le and 0.875·π·d·Le (by hand).
	th, _ := model.LookupThread("M10")
	ext, internal := model.ThreadShearAreas(th, 10)
	d1 := 10 - 1.082532*1.5
	near(t, "ASs", ext, 0.75*math.Pi*d1*10, 2e-5)
	near(t, "ASn", internal, 0.875*math.Pi*10*10, 2e-5)
}

func TestThreadStrippingM10InAluminium(t *testing.T) {
	t.Parallel()
	// Length of engagement of an M10 8.8 (Rm 800 MPa, As 58.0 mm²) in
	// EN AW-6082 (Rm 290 MPa, VDI 2230-1 Table A9 as reproduced, secondary
	// source), Machinery's Handbook formulas (FED-STD-H28/2B, secondary
	// source) at basic size, worked by hand:
	//   Le = 2·At/(π·Kn·[1/2 + 0.57735·n·(Es − Kn)]) = 116/(π·8.376·0.7502) = 5.876 mm
	//   J = ASs·Rm,bolt/(ASn·Rm,tapped) = (0.75π·8.376·800)/(0.875π·10·290) = 1.981
	//   Le,tapped = J·Le = 11.64 mm
	// The factor 2 of the formula takes the shear strength as half the tensile
	// strength; with τ = 0.5·Rm the model's stripping force at that engagement
	// equals the bolt's minimum breaking load As·Rm.
	th, _ := model.LookupThread("M10")
	kn, es := 10-1.082532*1.5, th.PitchDia
	le := 2 * th.StressArea / (math.Pi * kn * (0.5 + 0.57735*(es-kn)/1.5))
	near(t, "Le", le, 5.876, 0.001)
	j := (0.75 * kn * 800) / (0.875 * 10 * 290)
	near(t, "J", j, 1.981, 0.001)
	near(t, "Le tapped", j*le, 11.64, 0.002)

	in := r1()
	in.Thread = th
	in.Proof, in.Yield, in.Tensile = 580, 640, 800
	in.BearingDia, in.HoleDia, in.ShankInGrip = 15, 11, 0
	in.StiffnessMethod = model.Frustum
	in.Layers[0] = model.Layer{Thickness: 15, Modulus: 207000}
	in.Layers[1] = model.Layer{Thickness: 20, Modulus: 71700}
	in.Tapped, in.Engagement, in.TappedShear = true, j*le, 0.5*290
	in.Torque = 40e3
	var o model.Outcome
	model.Evaluate(&in, &o)
	near(t, "stripping force = As·Rm", o.Capacity[model.ThreadStripping], th.StressArea*800, 0.001)
	// Demand: the larger of FM and the service bolt force (VDI 2230-1).
	near(t, "demand", o.Demand[model.ThreadStripping], math.Max(o.Bolt.AssemblyPreload, o.Bolt.BoltForce), 1e-12)
	// A nut of ISO 898-2 class 8 (proof stress taken as 800 MPa) instead.
	in.Tapped, in.NutProof = false, 800
	model.Evaluate(&in, &o)
	near(t, "nut proof load", o.Capacity[model.ThreadStripping], 800*th.StressArea, 1e-12)
	in.NutProof = 0
	model.Evaluate(&in, &o)
	if o.Active[model.ThreadStripping] {
		t.Error("no tapped hole and no nut class: thread stripping not checked")
	}
}

func TestHeadPressure(t *testing.T) {
	t.Parallel()
	// VDI 2230-1: p = max(FM, Fb)/Ap, Ap = π/4·(dW² − dh²), against pG.
	// R1 on S235JR (pG = 490 MPa, VDI 2230-1 Table A9 as reproduced,
	// secondary source): Ap = π/4·(18² − 13²) = 121.7 mm²; Fb = 50 kN +
	// 0.2017·30 kN = 56.05 kN → p = 460.4 MPa.
	in := r1()
	in.Layers[0].PressureLimit, in.Layers[1].PressureLimit = 490, 490
	var o model.Outcome
	model.Evaluate(&in, &o)
	ap := math.Pi / 4 * (18*18 - 13*13)
	near(t, "p", o.Demand[model.HeadPressure], o.Bolt.BoltForce/ap, 1e-12)
	near(t, "p value", o.Demand[model.HeadPressure], 460.4, 0.001)
	near(t, "pG", o.Capacity[model.HeadPressure], 490, 0)
	// A 24 mm washer spreads the load on the plate: Ap = π/4·(24² − 13²).
	in.Washer = model.Washer{Thickness: 3, OuterDia: 24, InnerDia: 13, Modulus: 207000}
	in.NutWasher = in.Washer
	model.Evaluate(&in, &o)
	near(t, "p under washer", o.Demand[model.HeadPressure], o.Bolt.BoltForce/(math.Pi/4*(24*24-13*13)), 1e-12)
	// A face on a weaker material governs (here the nut side on aluminium
	// AW-6082, pG = 260 MPa).
	in.Washer, in.NutWasher = model.Washer{}, model.Washer{}
	in.Layers[1].PressureLimit = 260
	model.Evaluate(&in, &o)
	near(t, "governing face", o.Capacity[model.HeadPressure], 260, 0)
	in.Layers[0].PressureLimit, in.Layers[1].PressureLimit = 0, 0
	model.Evaluate(&in, &o)
	if o.Active[model.HeadPressure] {
		t.Error("no limiting pressure known: head pressure not checked")
	}
}

func TestPermissibleAssemblyPreloadAtNu09(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 FMzul at ν = 0.9: published 41.9 kN for M12 8.8, μG = 0.14
	// (reference sheet §4.6, confirmed indirectly), called directly.
	th, _ := model.LookupThread("M12")
	in := model.Inputs{Thread: th, Yield: 640, Method: model.FrictionMethod, ThreadFriction: 0.14, HeadFriction: 0.14,
		BearingDia: 18, HoleDia: 13}
	near(t, "FMzul", model.PermissibleAssemblyPreload(&in, 0.9)/1000, 41.9, 0.003)
	near(t, "μG used", in.TorsionFriction(), 0.14, 1e-12)
	// MA = FMzul·(P/(2π) + 0.577·d2·μG + DKm/2·μK) (VDI 2230-1 R13, exact
	// constants), DKm = (18 + 13)/2.
	fm := model.PermissibleAssemblyPreload(&in, 0.9)
	want := fm * (1.75/(2*math.Pi) + 0.5773502691896258*th.PitchDia*0.14 + 15.5/2*0.14)
	near(t, "MA", in.TorqueFor(fm), want, 1e-12)
	// A tensioner: no torsion, FMzul = ν·As·Rp0.2.
	in.Method, in.Tensioned = model.DirectPreload, true
	near(t, "FMzul tensioned", model.PermissibleAssemblyPreload(&in, 0.9), 0.9*th.StressArea*640, 1e-12)
}

func TestEmbeddingEstimateTable5(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 Table 5 (from memory), Rz 10–40 µm, axial: 3 µm in the
	// thread, 3 per bearing face, 2 per inner interface. Through-bolt in two
	// layers: 3 + 2·3 + 1·2 = 11 µm.
	in := r1()
	e := model.EmbeddingEstimateOf(&in, 0.016, false)
	near(t, "fZ through-bolt", e.Total, 0.011, 1e-12)
	// Transverse load, Rz < 10 µm: 3 + 2·3 + 1·2 = 11 µm as well; Rz 40–160,
	// axial: 3 + 2·4 + 1·3 = 14 µm.
	near(t, "fZ fine transverse", model.EmbeddingEstimateOf(&in, 0.006, true).Total, 0.011, 1e-12)
	near(t, "fZ rough axial", model.EmbeddingEstimateOf(&in, 0.1, false).Total, 0.014, 1e-12)
	// Cap screw with a head washer: one bearing face, interfaces layer/layer
	// and washer/layer: 3 + 3 + 2·2 = 10 µm.
	in.Tapped, in.Engagement = true, 10
	in.Washer = model.Washer{Thickness: 2, OuterDia: 24, InnerDia: 13, Modulus: 207000}
	near(t, "fZ cap screw", model.EmbeddingEstimateOf(&in, 0, false).Total, 0.010, 1e-12)
}
