package model_test

import (
	"boltrisk/model"

	"math"
	"testing"
)

// shearJoint returns a single-bolt lap joint loaded only in shear.
func shearJoint(thread, class string, rule model.ShearRule, fy, fu, t, e1, e2, w, v float64) model.Inputs {
	th, _ := model.LookupThread(thread)
	c, _ := model.LookupClass(class, th.D)
	in := model.Inputs{Thread: th, Bolts: 1, Proof: c.Proof, Yield: c.Yield, Tensile: c.Tensile, AlphaV: c.AlphaV, FubNominal: c.NominalTensile,
		BoltModulus: 207000, BearingDia: 1.5 * th.D, HoleDia: th.D + 2, NLayers: 2,
		Method: model.DirectPreload, Preload: 0.7 * c.Tensile * th.StressArea, TorsionFactor: 0.5, Endurance: 100,
		ShearLoad: v, ShearPlanes: 1, ShearRule: rule, PlateThickness: t, PlateWidth: w,
		EdgeDistance: e1, SideDistance: e2, PlateYield: fy, PlateTensile: fu}
	in.Layers[0] = model.Layer{Thickness: t, Modulus: 210000}
	in.Layers[1] = model.Layer{Thickness: t, Modulus: 210000}
	return in
}

func TestShearEN1993(t *testing.T) {
	t.Parallel()
	// EN 1993-1-8:2005 Table 3.4 (confirmed) with γM2 = 1, worked by hand:
	// M20 10.9 in S355 (fu = 490 MPa), d0 = 22, t = 10, e1 = 40, e2 = 35, w = 100.
	in := shearJoint("M20", "10.9", model.EN1993, 355, 490, 10, 40, 35, 100, 50e3)
	var o model.Outcome
	model.Evaluate(&in, &o)
	// Shank in the shear plane: Fv = 0.6·fub·A = 0.6·1000·π·20²/4 = 188.5 kN.
	near(t, "Fv shank", o.Capacity[model.BoltShear], 0.6*1000*math.Pi*100, 1e-12)
	// Bearing: αd = e1/(3·d0) = 0.6061, αb = min(αd, fub/fu, 1) = 0.6061,
	// k1 = min(2.8·35/22 − 1.7, 2.5) = 2.5: Fb = 2.5·0.6061·490·20·10 = 148.5 kN.
	near(t, "Fb", o.Capacity[model.PlateBearing], 2.5*(40.0/66)*490*20*10, 1e-12)
	near(t, "Fb value", o.Capacity[model.PlateBearing]/1000, 148.5, 0.001)
	// Net section: Nu = 0.9·Anet·fu = 0.9·(100 − 22)·10·490 = 343.98 kN.
	near(t, "Nu", o.Capacity[model.NetSection], 0.9*78*10*490, 1e-12)
	if o.Active[model.BoltBearing] || o.Active[model.TearOut] {
		t.Error("en1993: bolt bearing and tear-out are covered by the bearing resistance")
	}
	// Threads in the shear plane, class 10.9: αv = 0.5 on As (245 mm²) → 122.5 kN.
	in.ThreadsInShearPlane = true
	model.Evaluate(&in, &o)
	near(t, "Fv thread 10.9", o.Capacity[model.BoltShear]/1000, 0.5*1000*in.Thread.StressArea/1000, 1e-12)
	near(t, "Fv thread 10.9 value", o.Capacity[model.BoltShear]/1000, 122.4, 0.002)
	// Class 8.8 threads: αv = 0.6 → M16 8.8 As 157: 0.6·800·156.67 = 75.2 kN.
	in = shearJoint("M16", "8.8", model.EN1993, 355, 490, 10, 40, 35, 100, 50e3)
	in.ThreadsInShearPlane = true
	model.Evaluate(&in, &o)
	near(t, "Fv thread 8.8", o.Capacity[model.BoltShear]/1000, 75.2, 0.002)
}

func TestSlipEN1993(t *testing.T) {
	t.Parallel()
	// EN 1993-1-8 §3.9 (secondary source): Fs = ks·n·μ·Fp,C/γM3 with
	// Fp,C = 0.7·fub·As. M20 10.9, class A surface μ = 0.5, one friction
	// surface, ks = 1, γM3 = 1: Fp,C = 171.5 kN → Fs = 85.7 kN.
	in := shearJoint("M20", "10.9", model.EN1993, 355, 490, 10, 40, 35, 100, 50e3)
	in.SlipFactor = 0.5
	in.Preload = 0.7 * 1000 * in.Thread.StressArea // fub = 1000 MPa, EN 1993-1-8 Table 3.1
	var o model.Outcome
	model.Evaluate(&in, &o)
	near(t, "Fp,C", o.Bolt.Preload/1000, 171.4, 0.002)
	near(t, "Fs", o.Capacity[model.Slip]/1000, 0.5*0.7*1000*in.Thread.StressArea/1000, 1e-12)
	// Two friction surfaces, three bolts: capacity scales with n and bolts.
	in.ShearPlanes, in.Bolts = 2, 3
	model.Evaluate(&in, &o)
	near(t, "Fs 2×3", o.Capacity[model.Slip]/1000, 6*0.5*0.7*in.Thread.StressArea, 1e-12)
	// An axial load lowers the clamp by (1 − Φ)·P per bolt.
	in.AxialMax = 20e3
	model.Evaluate(&in, &o)
	want := 2 * 0.5 * 3 * (o.Bolt.Preload - (1-o.Stiffness.Phi)*20e3)
	near(t, "Fs with tension", o.Capacity[model.Slip], want, 1e-12)
}

func TestShearAISC360(t *testing.T) {
	t.Parallel()
	// AISC 360-16 J3, nominal strengths (φ = 1), worked by hand for a 3/4 in
	// A325 bolt in a 1/2 in A36 plate (Fu = 58 ksi), lc from 1.5 in edge distance
	// and a 13/16 in standard hole.
	in := shearJoint("3/4-10 UNC", "A325", model.AISC360, 36*ksi, 58*ksi, 12.7, 1.5*25.4, 1.5*25.4, 0, 10*kip)
	in.HoleDia = 13.0 / 16 * 25.4
	in.ThreadsInShearPlane = true
	var o model.Outcome
	model.Evaluate(&in, &o)
	ab := math.Pi / 4 * 0.75 * 0.75
	// Table J3.2 Group A, threads included: Fnv = 54 ksi (confirmed) → Rn = 54·0.4418 = 23.86 kip.
	near(t, "Rn shear N", o.Capacity[model.BoltShear]/kip, 54*ab, 1e-3)
	// Bearing 2.4·d·t·Fu = 2.4·0.75·0.5·58 = 52.2 kip (J3.10, deformation a design consideration).
	near(t, "Rn bearing", o.Capacity[model.PlateBearing]/kip, 52.2, 1e-3)
	// Tear-out 1.2·lc·t·Fu, lc = 1.5 − 13/32 = 1.09375 in → 38.06 kip.
	near(t, "Rn tear-out", o.Capacity[model.TearOut]/kip, 1.2*1.09375*0.5*58, 1e-3)
	// Threads excluded: Table J3.2 gives Fnv = 68 ksi; 0.563·Fu = 67.56 ksi (threaded-parts row).
	in.ThreadsInShearPlane = false
	model.Evaluate(&in, &o)
	near(t, "Rn shear X", o.Capacity[model.BoltShear]/kip, 68*ab, 0.007)
	// Slip J3.8: Rn = μ·Du·hf·Tb·ns; with the installed pretension Du·Tb
	// (Du = 1.13, Tb = 28 kip, μ = 0.30 class A): 9.49 kip.
	in.Method, in.Preload, in.SlipFactor = model.DirectPreload, 1.13*28*kip, 0.30
	model.Evaluate(&in, &o)
	near(t, "Rn slip", o.Capacity[model.Slip]/kip, 0.30*1.13*28, 1e-9)
}

func TestShearYieldRule(t *testing.T) {
	t.Parallel()
	// Machine-design checks (Shigley §8-12, distortion energy Ssy = 0.577·Sy,
	// Eq. 5-21), worked by hand: 2 × M12 8.8, shank in the plane, 10 mm plates
	// with Sy = 355 MPa, e1 = 20 mm, width 80 mm, V = 30 kN.
	in := shearJoint("M12", "8.8", model.YieldRule, 355, 490, 10, 20, 20, 80, 30e3)
	in.Bolts = 2
	in.HoleDia = 13
	var o model.Outcome
	model.Evaluate(&in, &o)
	near(t, "bolt shear", o.Capacity[model.BoltShear], 2*math.Pi*36*640/math.Sqrt(3), 1e-12)
	near(t, "bolt bearing", o.Capacity[model.BoltBearing], 2*12*10*640, 1e-12)
	near(t, "plate bearing", o.Capacity[model.PlateBearing], 2*12*10*355, 1e-12)
	near(t, "net section", o.Capacity[model.NetSection], (80-2*13)*10*355, 1e-12)
	near(t, "tear-out", o.Capacity[model.TearOut], 2*2*(20-6)*10*355/math.Sqrt(3), 1e-12)
	// Threads in the plane: minor-diameter area.
	in.ThreadsInShearPlane = true
	model.Evaluate(&in, &o)
	near(t, "bolt shear thread", o.Capacity[model.BoltShear], 2*in.Thread.MinorArea*640/math.Sqrt(3), 1e-12)
	if !o.Fails(model.Slip) && o.Active[model.Slip] {
		t.Error("no slip factor: slip must be inactive")
	}
}

func TestSeveralBolts(t *testing.T) {
	t.Parallel()
	// A joint fails a bolt mode when any bolt does; demand/capacity come from
	// the bolt with the smallest safety factor; slip sums the clamp forces.
	in := shearJoint("M12", "8.8", model.YieldRule, 355, 490, 10, 20, 20, 80, 30e3)
	in.Bolts, in.SlipFactor = 3, 0.3
	s := model.ComputeStiffness(&in)
	bolts := make([]model.BoltResult, 3)
	for i, f := range []float64{30e3, 10e3, 40e3} {
		in.Preload = f
		model.EvaluateBolt(&in, &s, model.AllModes, &bolts[i])
	}
	var o model.Outcome
	model.EvaluateJoint(&in, &s, bolts, &o)
	o.Bolt = bolts[0]
	if o.Demand[model.Proof] != bolts[2].Demand[model.Proof] {
		t.Errorf("proof: governing bolt should be the 40 kN one")
	}
	near(t, "slip capacity", o.Capacity[model.Slip], 0.3*80e3, 1e-12)
}

func TestWindow(t *testing.T) {
	t.Parallel()
	in := r1()
	w := model.PreloadWindow(&in)
	s := model.ComputeStiffness(&in)
	near(t, "separation min", w.SeparationMin, (1-s.C)*30000, 1e-12)
	near(t, "proof max", w.ProofMax, 830*in.Thread.StressArea-s.C*30000, 1e-12)
	if !(w.Lower < 50000 && 50000 < w.Upper) {
		t.Errorf("R1 nominal preload 50 kN should lie inside %v", w)
	}
}

func TestEvaluateDoesNotAllocate(t *testing.T) {
	in := r1()
	var o model.Outcome
	if n := testing.AllocsPerRun(100, func() { model.Evaluate(&in, &o) }); n != 0 {
		t.Errorf("Evaluate allocates %v times per call", n)
	}
}

func BenchmarkEvaluate(b *testing.B) {
	in := r1()
	var o model.Outcome
	b.ReportAllocs()
	for b.Loop() {
		model.Evaluate(&in, &o)
	}
}

func TestOneBoltJointIsTheBolt(t *testing.T) {
	t.Parallel()
	// EvaluateJoint documents that with one result and no shear load the
	// joint's modes are the bolt's; the Monte Carlo runner relies on it.
	for _, in := range []model.Inputs{r1(), func() model.Inputs { x := r1(); x.AxialMax, x.AxialMin = 0, 0; return x }(),
		func() model.Inputs { x := r1(); x.Method, x.Preload = model.DirectPreload, 40e3; return x }()} {
		s := model.ComputeStiffness(&in)
		var b [1]model.BoltResult
		model.EvaluateBolt(&in, &s, model.AllModes, &b[0])
		var o model.Outcome
		model.EvaluateJoint(&in, &s, b[:], &o)
		if o.Demand != b[0].Demand || o.Capacity != b[0].Capacity || o.Active != b[0].Active || o.Invalid != b[0].Invalid {
			t.Errorf("joint of one bolt differs from the bolt:\n%+v\n%+v", o, b[0])
		}
	}
}
