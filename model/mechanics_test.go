package model_test

import (
	"boltrisk/model"

	"math"
	"testing"
)

func TestJointConstantR1(t *testing.T) {
	t.Parallel()
	in := r1()
	s := model.ComputeStiffness(&in)
	// Shigley Eq. 8-17, worked by hand from the formula:
	// kb = Ad·At·E/(Ad·lt + At·ld), Ad = π·12²/4, At = 84.27 (formula value), ld = 10, lt = 20.
	ad, at := math.Pi*36, in.Thread.StressArea
	near(t, "kb", s.Kb, ad*at*207000/(ad*20+at*10), 1e-12)
	// Wileman et al. (Shigley Eq. 8-23, Table 8-8 steel A = 0.78715, B = 0.62873).
	near(t, "km", s.Km, 207000*12*0.78715*math.Exp(0.62873*12/30), 1e-12)
	// shared/bench README, case R1: C ≈ 0.2017.
	near(t, "C", s.C, 0.2017, 5e-4)
}

func TestFrustumTwoEqualMembers(t *testing.T) {
	t.Parallel()
	// Two equal members, washer face 1.5·d, α = 30°: Shigley Eq. 8-22
	//   km = 0.5774·π·E·d / (2·ln[5·(0.5774·l + 0.5·d)/(0.5774·l + 2.5·d)])
	// must equal the layered frustum sum over two layers of l/2.
	for _, test := range []struct{ d, l, e float64 }{
		{12, 30, 207000}, {16, 40, 207000}, {20, 25, 71700}, {8, 60, 100000},
	} {
		in := model.Inputs{NLayers: 2, BearingDia: 1.5 * test.d}
		in.Thread.D = test.d
		in.Layers[0] = model.Layer{Thickness: test.l / 2, Modulus: test.e}
		in.Layers[1] = model.Layer{Thickness: test.l / 2, Modulus: test.e}
		want := 0.5774 * math.Pi * test.e * test.d / (2 * math.Log(5*(0.5774*test.l+0.5*test.d)/(0.5774*test.l+2.5*test.d)))
		near(t, "km Eq. 8-22", model.ComputeStiffness(&in).Km, want, 2e-4)
		// Splitting one member into two layers of the same material changes nothing.
		in.NLayers = 3
		in.Layers[2] = in.Layers[1]
		in.Layers[1].Thickness, in.Layers[2].Thickness = test.l/6, test.l/3
		near(t, "km three layers", model.ComputeStiffness(&in).Km, want, 2e-4)
	}
}

func TestFrustumMixedMaterials(t *testing.T) {
	t.Parallel()
	// Shigley §8-5 procedure for a 20 mm steel plate on a 25 mm cast-iron
	// member: the mid-plane lies at l/2 = 22.5 mm, inside the cast iron. The
	// head-side cone runs through 20 mm of steel, then 2.5 mm of cast iron
	// (narrow end dw + 2·20·tan 30°); the nut-side cone runs through 22.5 mm of
	// cast iron. Three frusta (Eq. 8-19) in series (Eq. 8-18).
	d, dw := 12.0, 18.0
	t1, t2 := 20.0, 25.0
	l := t1 + t2
	es, ec := 207000.0, 100000.0
	k1 := model.FrustumStiffness(es, d, dw, t1, math.Pi/6)
	k2 := model.FrustumStiffness(ec, d, dw+2*t1*math.Tan(math.Pi/6), l/2-t1, math.Pi/6)
	k3 := model.FrustumStiffness(ec, d, dw, l/2, math.Pi/6)
	want := 1 / (1/k1 + 1/k2 + 1/k3)
	in := model.Inputs{NLayers: 2, BearingDia: dw}
	in.Thread.D = d
	in.Layers[0] = model.Layer{Thickness: t1, Modulus: es}
	in.Layers[1] = model.Layer{Thickness: t2, Modulus: ec}
	near(t, "km mixed", model.ComputeStiffness(&in).Km, want, 1e-12)
	// Eq. 8-20 written out for the cast-iron frustum (0.5774 = tan 30°).
	num := (1.155*l/2 + dw - d) * (dw + d)
	den := (1.155*l/2 + dw + d) * (dw - d)
	near(t, "Eq. 8-20", k3, 0.5774*math.Pi*ec*d/math.Log(num/den), 2e-4)
}

func TestGoodmanGerberASME(t *testing.T) {
	t.Parallel()
	// Repeated loading (q = 1): Shigley Eqs. 8-45, 8-46, 8-47 written out.
	for _, test := range []struct{ se, sut, sp, si, sa float64 }{
		{162, 1040, 830, 593.3, 35.9}, // R1 nominal stresses
		{129, 830, 600, 450, 20},
		{18.6 * ksi, 120 * ksi, 85 * ksi, 60 * ksi, 5 * ksi},
	} {
		se, sut, sp, si, sa := test.se, test.sut, test.sp, test.si, test.sa
		good := se * (sut - si) / (sa * (sut + se))
		gerb := (sut*math.Sqrt(sut*sut+4*se*(se+si)) - sut*sut - 2*si*se) / (2 * sa * se)
		asme := se / (sa * (sp*sp + se*se)) * (sp*math.Sqrt(sp*sp+se*se-si*si) - si*se)
		near(t, "Goodman 8-45", model.StrengthAmplitude(model.Goodman, se, sut, sp, si, 1)/sa, good, 1e-12)
		near(t, "Gerber 8-46", model.StrengthAmplitude(model.Gerber, se, sut, sp, si, 1)/sa, gerb, 1e-9)
		near(t, "ASME-elliptic 8-47", model.StrengthAmplitude(model.ASMEElliptic, se, sut, sp, si, 1)/sa, asme, 1e-9)
	}
	// General load line, Goodman: Shigley Eq. 8-38
	//   nf = Se(Sut − σi)/(Sut·σa + Se(σm − σi)), C = 0.25, P 5…15 kN, At = 84.27.
	c, at, fi := 0.25, 84.27, 45000.0
	pmin, pmax := 5000.0, 15000.0
	sa := c * (pmax - pmin) / (2 * at)
	sm := c*(pmax+pmin)/(2*at) + fi/at
	si := fi / at
	want := 162 * (1040 - si) / (1040*sa + 162*(sm-si))
	got := model.StrengthAmplitude(model.Goodman, 162, 1040, 830, si, (pmax+pmin)/(pmax-pmin)) / sa
	near(t, "Goodman 8-38", got, want, 1e-12)
	// Gerber general line checked by substitution into Sa/Se + (Sm/Sut)² = 1.
	q := (pmax + pmin) / (pmax - pmin)
	a := model.StrengthAmplitude(model.Gerber, 162, 1040, 830, si, q)
	if r := a/162 + math.Pow((si+q*a)/1040, 2); math.Abs(r-1) > 1e-12 {
		t.Errorf("Gerber point off its line: %g", r)
	}
	a = model.StrengthAmplitude(model.ASMEElliptic, 162, 1040, 830, si, q)
	if r := math.Pow(a/162, 2) + math.Pow((si+q*a)/830, 2); math.Abs(r-1) > 1e-12 {
		t.Errorf("ASME-elliptic point off its line: %g", r)
	}
	// Preload already at Sut leaves no amplitude.
	if v := model.StrengthAmplitude(model.Goodman, 162, 1040, 830, 1100, 1); v != 0 {
		t.Errorf("σi > Sut: got Sa = %g, want 0", v)
	}
}

func TestGoodmanWithLoads(t *testing.T) {
	t.Parallel()
	// Shigley Eq. 8-48: nf = 2·Se·(Sut·At − Fi)/(C·P·(Sut + Se)) for 0…P.
	in := r1()
	var o model.Outcome
	model.Evaluate(&in, &o)
	fi, c, at := o.Bolt.Preload, o.Stiffness.C, in.Thread.StressArea
	want := 2 * 162 * (1040*at - fi) / (c * 30000 * (1040 + 162))
	near(t, "nf Eq. 8-48", o.SafetyFactor(model.Fatigue), want, 1e-12)
	// Fi = T/(K·d) = 120 N·m/(0.2·12 mm) = 50 kN (Shigley Eq. 8-27).
	near(t, "Fi", fi, 50000, 1e-12)
	// Separation factor n0 = Fi/(P(1 − C)), Eq. 8-30; load factor vs proof np, Eq. 8-28.
	near(t, "n0", o.SafetyFactor(model.Separation), fi/(30000*(1-c)), 1e-12)
	near(t, "np", o.SafetyFactor(model.Proof), 830*at/(c*30000+fi), 1e-12)
	// Preload beneficial up to (1 − C)·Sut·At, Eq. 8-50.
	near(t, "beneficial", model.PreloadWindow(&in).BeneficialMax, (1-c)*1040*at, 1e-12)
}

func TestTorquePreload(t *testing.T) {
	t.Parallel()
	in := r1()
	th := in.Thread
	// VDI 2230-1 R13 with its rounded constants (from memory):
	// MA = FM·(0.16·P + 0.58·d2·μG + DKm/2·μK), DKm = (dW + dh)/2.
	dkm := (in.BearingDia + in.HoleDia) / 2
	for _, mu := range []float64{0.08, 0.12, 0.16} {
		want := 0.16*th.Pitch + 0.58*th.PitchDia*mu + dkm/2*mu
		near(t, "torque per unit preload", in.NutFactorOf(mu, mu)*th.D, want, 0.005)
		// ISO 16047 total friction inverts it exactly.
		near(t, "μtot", in.EquivalentFriction(in.NutFactorOf(mu, mu)), mu, 1e-12)
	}
	// Shigley p.438: K ≈ 0.20 for f = fc = 0.15, nearly independent of size (confirmed).
	for _, name := range []string{"M8", "M12", "M20", "1/2-13 UNC"} {
		th, _ := model.LookupThread(name)
		x := model.Inputs{Thread: th, BearingDia: 1.5 * th.D, HoleDia: 1.08 * th.D}
		near(t, name+" K(0.15)", x.NutFactorOf(0.15, 0.15), 0.20, 0.08)
	}
	// Friction method and nut-factor method agree when K is derived from μ.
	in.Method = model.FrictionMethod
	in.ThreadFriction, in.HeadFriction = 0.12, 0.12
	var a, b model.Outcome
	model.Evaluate(&in, &a)
	in.Method = model.NutFactorMethod
	in.NutFactor = in.NutFactorOf(0.12, 0.12)
	model.Evaluate(&in, &b)
	near(t, "FM agree", a.Bolt.AssemblyPreload, b.Bolt.AssemblyPreload, 1e-12)
	near(t, "MG agree", a.Bolt.ThreadTorque, b.Bolt.ThreadTorque, 1e-12)
	near(t, "TorqueFor", in.TorqueFor(b.Bolt.AssemblyPreload), in.Torque, 1e-12)
}

func TestVDIPermissibleAssemblyPreload(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 FMzul = As·ν·Rp0.2/√(1 + 3·[3/2·(d2/d0)·(P/(π·d2) + 1.155·μG)]²):
	// published 41.9 kN for M12 8.8, μG = 0.14, ν = 0.9 (reference sheet §4.6,
	// confirmed indirectly); derived table values M16 0.10 → 82.9 kN, M8 0.08 → 19.6 kN.
	for _, test := range []struct {
		thread string
		mu, kN float64
	}{
		{"M12", 0.14, 41.9}, {"M16", 0.10, 82.9}, {"M8", 0.08, 19.6}, {"M24", 0.16, 172.8},
	} {
		th, _ := model.LookupThread(test.thread)
		in := model.Inputs{Thread: th, Yield: 640, Method: model.FrictionMethod, ThreadFriction: test.mu,
			HeadFriction: test.mu, BearingDia: 1.5 * th.D, HoleDia: th.D + 1, NLayers: 1, Bolts: 1}
		in.Layers[0] = model.Layer{Thickness: 2 * th.D, Modulus: 207000}
		got := 0.9 * model.PreloadWindow(&in).AssemblyMax / 1000
		near(t, test.thread+" FMzul", got, test.kN, 0.003)
	}
}

func TestEmbeddingLoss(t *testing.T) {
	t.Parallel()
	// VDI 2230-1: FZ = fZ·kb·km/(kb + km) (from memory).
	in := r1()
	in.Embedding = 0.011 // 11 µm
	var o model.Outcome
	model.Evaluate(&in, &o)
	s := o.Stiffness
	near(t, "Fi after embedding", o.Bolt.Preload, 50000-0.011*s.Kb*s.Km/(s.Kb+s.Km), 1e-12)
	in.Relaxation = 0.05
	model.Evaluate(&in, &o)
	near(t, "Fi after relaxation", o.Bolt.Preload, 50000*0.95-0.011*s.Kb*s.Km/(s.Kb+s.Km), 1e-12)
}

func TestSeparatedJoint(t *testing.T) {
	t.Parallel()
	// Shigley §8-7 (confirmed): once P ≥ Fi/(1 − C) the members no longer
	// touch, the bolt carries the whole external load, Fb = P, and the clamp
	// force is 0. R1 with a direct preload of 10 kN under 50 kN per bolt
	// (C = 0.2017 < 1 − 10/50): Fb = 50 kN, not Fi + C·P = 20.1 kN.
	in := r1()
	in.Method, in.Torque, in.Preload = model.DirectPreload, 0, 10e3
	in.AxialMax = 50e3
	var o model.Outcome
	model.Evaluate(&in, &o)
	near(t, "Fb separated", o.Bolt.BoltForce, 50e3, 1e-12)
	if o.Bolt.Clamp != 0 {
		t.Errorf("clamp force after separation: got %g N, want 0", o.Bolt.Clamp)
	}
	// Proof demand is the physical bolt force (Shigley Eq. 8-28 with Fb = P).
	near(t, "proof demand", o.Demand[model.Proof], 50e3, 1e-12)
	if o.Demand[model.ServiceYield] < 50e3/in.Thread.StressArea {
		t.Error("service yield must use the physical bolt force")
	}
	if !o.Fails(model.Separation) {
		t.Error("separation must fail at P = 50 kN > Fi/(1 − C)")
	}
	// Fatigue over the actual cycle 5 … 50 kN, which separates at the top:
	// Fb(5 kN) = Fi + C·5 kN (closed), Fb(50 kN) = 50 kN; σa, σm from these,
	// Goodman on the load line from σi through (σm, σa) (Shigley Eq. 8-38
	// with q = (σm − σi)/σa), computed by hand here.
	in.AxialMin = 5e3
	model.Evaluate(&in, &o)
	c, as := o.Stiffness.C, in.Thread.StressArea
	fmin, fmax := 10e3+c*5e3, 50e3
	sa := (fmax - fmin) / (2 * as)
	sm := (fmax + fmin) / (2 * as)
	si := 10e3 / as
	want := 162 * (1040 - si) / (1040*sa + 162*(sm-si)) // nf, Eq. 8-38
	near(t, "σa separated cycle", o.Demand[model.Fatigue], sa, 1e-12)
	near(t, "nf separated cycle", o.SafetyFactor(model.Fatigue), want, 1e-12)
	// A loose bolt (Fi = 0) carries the external load alone: σa = (Pmax − Pmin)/(2As).
	in.Preload = 0
	in.Method = model.DirectPreload
	model.Evaluate(&in, &o)
	near(t, "σa loose", o.Demand[model.Fatigue], 45e3/(2*as), 1e-12)
	near(t, "nf loose", o.SafetyFactor(model.Fatigue), 162*1040/(1040*45e3/(2*as)+162*(55e3/(2*as))), 1e-12)
}

func TestBeneficialPreloadWithLoadIntroduction(t *testing.T) {
	t.Parallel()
	// Shigley Eq. 8-50 with the load factor Φ = n·C: preload improves the
	// Goodman factor up to Fi = (1 − Φ)·Sut·At, where Eq. 8-48 (with Φ in place
	// of C) equals the unpreloaded factor of Eq. 8-49. Worked by hand for R1
	// with n = 0.5.
	in := r1()
	in.LoadIntroduction = 0.5
	s := model.ComputeStiffness(&in)
	at := in.Thread.StressArea
	fi := model.PreloadWindow(&in).BeneficialMax
	near(t, "beneficial max", fi, (1-0.5*s.C)*1040*at, 1e-12)
	nf := 2 * 162 * (1040*at - fi) / (s.Phi * 30e3 * (1040 + 162)) // Eq. 8-48
	nf0 := 2 * 162 * 1040 * at / (30e3 * (1040 + 162))             // Eq. 8-49
	near(t, "nf at the beneficial preload = nf unpreloaded", nf, nf0, 1e-12)
	// The model's own factor at that preload (closed joint) agrees.
	in.Method, in.Torque, in.NutFactor, in.Preload = model.DirectPreload, 0, 0, fi
	in.Proof, in.Yield, in.Tensile = 5000, 5000, 1040 // keep the bolt elastic for the check
	var o model.Outcome
	model.Evaluate(&in, &o)
	near(t, "model nf", o.SafetyFactor(model.Fatigue), nf0, 1e-9)
}
