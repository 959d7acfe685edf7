package decide_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/problemtest"
	"boltrisk/montecarlo/scenario"
)

// TestDriversLinearLimitState checks every driver against the closed forms
// of a limit state linear in standard normals (reference-data-2.md §B.3,
// computed: for g = a0 + Σ ai·Ui, αi = −ai/‖a‖, E[Ui | g ≤ 0] = αi·φ(β)/Φ(−β),
// corr(Ui, g) = ai/‖a‖, Spearman (6/π)·asin(ρ/2) for a bivariate normal pair
// (Kendall & Stuart; Pearson 1907), omission: β with Ui = 0 is
// a0/√(‖a‖² − ai²)). problemtest.LognormalSeparation is such a case: the
// kernel's margin ln(Fi·(1−C)⁻¹/P) = a0 − σK·zK − σP·zP, with zK, zP the
// normal scores of the nut factor and the load.
func TestDriversLinearLimitState(t *testing.T) {
	if testing.Short() {
		t.Skip("statistical check")
	}
	t.Parallel()
	p, exact := problemtest.LognormalSeparation()
	p.Base.Torque = problemtest.LognormalSeparationTorque(p, 0.01)
	pf := exact(p.Base.Torque)
	beta := -distuv.UnitNormal.Quantile(pf)
	sK, sP := p.Vars[0].Dist.B, p.Vars[1].Dist.B
	h := math.Hypot(sK, sP)
	a0 := beta * h
	alpha := []float64{sK / h, sP / h} // α = −a/‖a‖ with a = (−σK, −σP)
	lambda := distuv.UnitNormal.Prob(beta) / pf
	const n = 1 << 20
	dr, err := decide.RunDrivers(context.Background(), p, decide.DriverOptions{
		Settings: montecarlo.Settings{Samples: n, Seed: 7, Workers: 2, Confidence: problemtest.Conf999, Modes: []model.Mode{model.Separation}}})
	if err != nil {
		t.Fatal(err)
	}
	if len(dr.Modes) != 2 || dr.Modes[0].Mode != model.Separation || !dr.Modes[1].Any {
		t.Fatalf("modes %+v", dr.Modes)
	}
	sep := dr.Modes[0]
	problemtest.Contains(t, "separation", sep.Estimate, pf)
	if !sep.DesignFound || math.Abs(sep.Beta-beta) > 1e-3 {
		t.Errorf("β %.5f (found %v), exact %.5f", sep.Beta, sep.DesignFound, beta)
	}
	for i, in := range sep.Inputs {
		if !in.HasAlpha || math.Abs(in.Alpha2-alpha[i]*alpha[i]) > 1e-3 || in.Sign != 1 {
			t.Errorf("%s: α² %.5f sign %d, exact %.5f, +1 (load-like)", in.Path, in.Alpha2, in.Sign, alpha[i]*alpha[i])
		}
		if want := alpha[i] * lambda; !(in.ShiftLo <= want && want <= in.ShiftHi) {
			t.Errorf("%s: conditional shift %.4f [%.4f, %.4f], exact %.4f", in.Path, in.Shift, in.ShiftLo, in.ShiftHi, want)
		}
		// Spearman of z with SF = exp(g): bivariate normal (z, g), ρ = −αi.
		// Standard error of Spearman's ρ about 1/√n (0.011 at n = 8192).
		if want := 6 / math.Pi * math.Asin(-alpha[i]/2); math.Abs(in.Spearman-want) > 4/math.Sqrt(float64(in.SpearmanN)) {
			t.Errorf("%s: Spearman %.4f over %d, exact %.4f", in.Path, in.Spearman, in.SpearmanN, want)
		}
		other := sP
		if i == 1 {
			other = sK
		}
		if want := distuv.UnitNormal.CDF(-a0 / other); !in.HasOmitted {
			t.Errorf("%s: no omission run", in.Path)
		} else {
			problemtest.Contains(t, in.Path+" omitted", in.Omitted, want)
		}
	}
	if any := dr.Modes[1]; any.DesignFound || any.Inputs[0].HasAlpha {
		t.Error("any mode has an α (a union has no single design point)")
	}
	if dr.Modes[1].Estimate.Failures != sep.Estimate.Failures {
		t.Error("any ≠ separation with one mode")
	}
	// The crude pass is the crude run: the same failures as montecarlo.Run.
	r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: n, Seed: 7, Workers: 1, ProbabilitiesOnly: true, Modes: []model.Mode{model.Separation}})
	if err != nil {
		t.Fatal(err)
	}
	if r.Any.Failures != sep.Estimate.Failures {
		t.Errorf("drivers' crude pass %d failures, crude run %d", sep.Estimate.Failures, r.Any.Failures)
	}
}

// TestSpearmanStored: the rank correlation of a stored sample with a tie,
// against scipy.stats.spearmanr 1.10.1 (Debian python3-scipy): 0.726112857875.
func TestSpearmanStored(t *testing.T) {
	t.Parallel()
	x := []float64{-0.0451, 0.3791, 1.6547, -1.7415, 1.4762, 0.6407, -0.0704, -1.2412, -0.5255, -0.9837, -1.022, -0.1757, 0.7707, -1.4445, -1.9097, -0.9587, -0.8875, -0.6014, -0.1717, 1.255, 0.0036, 0.0487, -0.029, 0.5343, 1.141, 1.0955, 0.6503, -1.1804, 0.6386, -0.135, 0.3399, 1.6353, -2.6409, -0.8176, 0.5519, -0.4231, -0.0317, -0.338, 1.9295, 0.2251}
	y := []float64{-0.2169, 0.053, 1.457, -2.3204, 0.8111, 1.3724, 0.0529, -2.3204, 0.6371, -2.2999, -0.5392, 0.9842, 1.7437, -0.5294, -2.502, 0.296, -0.6687, -1.0391, -0.3256, -0.1348, -0.4032, -0.472, 0.0478, 0.114, 1.08, 1.5029, -0.4273, -2.7621, 1.5809, -0.4558, 0.2875, -0.1352, -0.9643, -0.366, 0.2563, 1.0574, -0.1385, -0.778, 1.3132, 0.5633}
	if r := decide.Spearman(x, y); math.Abs(r-0.726112857875) > 1e-9 {
		t.Errorf("Spearman %.12f, scipy 0.726112857875", r)
	}
	if r := decide.Spearman([]float64{1, 1, 1}, []float64{1, 2, 3}); !math.IsNaN(r) {
		t.Errorf("constant series: %g, want NaN", r)
	}
}

// TestSpearmanB3: the rank correlations of reference-data-2.md §B.3
// (computed: (0.420146, −0.862556, 0.208798) for g = 2.5 + U1 − 2U2 + 0.5U3)
// from a seeded sample of 20 000, within four standard errors (1/√n).
func TestSpearmanB3(t *testing.T) {
	t.Parallel()
	const n = 20000
	r := rand.New(rand.NewPCG(3, 4))
	u := [3][]float64{}
	g := make([]float64, n)
	for j := range n {
		var v [4]float64
		for i := range v {
			v[i] = r.NormFloat64()
		}
		g[j] = 2.5 + v[0] - 2*v[1] + 0.5*v[2]
		for i := range 3 {
			u[i] = append(u[i], v[i])
		}
	}
	for i, want := range []float64{0.420146, -0.862556, 0.208798} {
		if got := decide.Spearman(u[i], g); math.Abs(got-want) > 4/math.Sqrt(n) {
			t.Errorf("U%d: Spearman %.4f, §B.3 %.6f", i+1, got, want)
		}
	}
}

// TestDriversBenchFORM: for the bench case (cover-flange separation, any of
// 8 bolts) the α² of the load, the torque and the nut factor match an
// independent FORM: OpenTURNS 1.20 (Debian python3-openturns, Cobyla from the
// mean), testdata/bench/drivers_openturns.py on shared/bench's cf8sep case —
// β 3.7603, α² load 0.2188, torque 0.0161, nut factor 0.7651 (computed) —
// and rank the inputs nut factor, load, torque.
func TestDriversBenchFORM(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	dr, err := decide.RunDrivers(context.Background(), &s.Problem, decide.DriverOptions{NoOmit: true,
		Settings: montecarlo.Settings{Samples: 1 << 14, Seed: 1, Workers: 2, Modes: []model.Mode{model.Separation}}})
	if err != nil {
		t.Fatal(err)
	}
	sep := dr.Modes[0]
	if !sep.DesignFound || math.Abs(sep.Beta-3.7603) > 2e-3 {
		t.Errorf("β %.4f, OpenTURNS 3.7603", sep.Beta)
	}
	want := map[string]float64{"loads.axial_max": 0.2188, "tightening.torque": 0.0161, "tightening.nut_factor": 0.7651, "fatigue.endurance": 0}
	got := map[string]float64{}
	for _, in := range sep.Inputs {
		got[in.Path] = in.Alpha2
		if w, ok := want[in.Path]; !ok || math.Abs(in.Alpha2-w) > 2e-3 {
			t.Errorf("%s: α² %.4f, OpenTURNS %.4f", in.Path, in.Alpha2, w)
		}
	}
	if !(got["tightening.nut_factor"] > got["loads.axial_max"] && got["loads.axial_max"] > got["tightening.torque"]) {
		t.Errorf("ranking %v, want nut factor, load, torque", got)
	}
}

// TestDriversImportance: the same closed forms (reference-data-2.md §B.3:
// E[Ui | g ≤ 0] = αi·φ(β)/Φ(−β)) at a small probability, 10⁻⁶, from
// importance sampling at the design point (99.9 % intervals).
func TestDriversImportance(t *testing.T) {
	t.Parallel()
	p, exact := problemtest.LognormalSeparation()
	p.Base.Torque = problemtest.LognormalSeparationTorque(p, 1e-6)
	pf := exact(p.Base.Torque)
	beta := -distuv.UnitNormal.Quantile(pf)
	sK, sP := p.Vars[0].Dist.B, p.Vars[1].Dist.B
	h := math.Hypot(sK, sP)
	lambda := distuv.UnitNormal.Prob(beta) / pf
	dr, err := decide.RunDrivers(context.Background(), p, decide.DriverOptions{Method: montecarlo.Importance,
		Settings: montecarlo.Settings{Samples: 1 << 20, Seed: 11, Workers: 2, Confidence: problemtest.Conf999, Modes: []model.Mode{model.Separation}}})
	if err != nil {
		t.Fatal(err)
	}
	if dr.Method != "importance" {
		t.Errorf("method %s", dr.Method)
	}
	sep := dr.Modes[0]
	problemtest.Contains(t, "separation (importance)", sep.Estimate, pf)
	for i, a := range []float64{sK / h, sP / h} {
		in := sep.Inputs[i]
		if want := a * lambda; !(in.ShiftLo <= want && want <= in.ShiftHi) {
			t.Errorf("%s: shift %.4f [%.4f, %.4f], exact %.4f", in.Path, in.Shift, in.ShiftLo, in.ShiftHi, want)
		}
		other := []float64{sP, sK}[i]
		problemtest.Contains(t, in.Path+" omitted (importance)", in.Omitted, distuv.UnitNormal.CDF(-beta*h/other))
		t.Logf("%s: shift %.4f [%.4f, %.4f] (exact %.4f); fixed at median %.4g (exact %.4g)", in.Path, in.Shift, in.ShiftLo, in.ShiftHi, a*lambda, in.Omitted.P, distuv.UnitNormal.CDF(-beta*h/other))
	}
}
