// Package problemtest holds the uncertain-input problems with closed-form
// answers that the tests of the estimators and the studies share, and the
// checks they make against them.
package problemtest

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/model/jointtest"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
)

// Conf999 is the confidence of the exact-value checks: 99.9 % intervals,
// so that a fixed seed fails a check with probability ≈ 0.1 %.
const Conf999 = 0.999

// Joint returns reference case R1 with the preload given directly (40 kN).
func Joint() model.Inputs { return jointtest.R1Preload() }

// Field bindings of the inputs the tests vary.
var (
	Preload   = func(in *model.Inputs) *float64 { return &in.Preload }
	Axial     = func(in *model.Inputs) *float64 { return &in.AxialMax }
	Torque    = func(in *model.Inputs) *float64 { return &in.Torque }
	NutFactor = func(in *model.Inputs) *float64 { return &in.NutFactor }
)

// Must returns d, panicking on a construction error (fixed test inputs).
func Must(d montecarlo.Dist, err error) montecarlo.Dist {
	if err != nil {
		panic(err)
	}
	return d
}

// Contains fails the test when exact lies outside the estimate's interval.
func Contains(t *testing.T, what string, iv interval.Estimate, exact float64) {
	t.Helper()
	if !(iv.Lo <= exact && exact <= iv.Hi) {
		t.Errorf("%s: exact %.6g outside the interval [%.6g, %.6g] (estimate %.6g, %d/%d)", what, exact, iv.Lo, iv.Hi, iv.P, iv.Failures, iv.Samples)
	}
}

// LognormalSeparation is the closed-form separation case: torque fixed
// (varied by a sweep), K ~ LN(0.2, 15 %), P ~ LN(28 kN, 20 %), no
// embedding. Separation when P·(1 − C) ≥ T/(K·d), so
//
//	p(T) = 1 − Φ((ln(T/(d(1 − C))) − μP − μK)/√(σP² + σK²))
//
// with μ, σ of the logarithms. It returns the problem and p(T).
func LognormalSeparation() (*montecarlo.Problem, func(torque float64) float64) {
	in := Joint()
	in.Method, in.Torque, in.NutFactor, in.Preload = model.NutFactorMethod, 100e3, 0.2, 0
	k := Must(montecarlo.NewLogNormalMoments(0.2, 0.2*0.15))
	pl := Must(montecarlo.NewLogNormalMoments(28e3, 28e3*0.2))
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.nut_factor", Dist: k, Role: montecarlo.PerBolt, Field: NutFactor},
		{Name: "loads.axial_max", Dist: pl, Role: montecarlo.Load, Field: Axial},
	}}
	c := model.ComputeStiffness(&in).C
	d := in.Thread.D
	exact := func(t float64) float64 {
		return 1 - distuv.UnitNormal.CDF((math.Log(t/(d*(1-c)))-pl.A-k.A)/math.Hypot(pl.B, k.B))
	}
	return p, exact
}

// LognormalSeparationTorque returns the torque at which the separation
// probability of LognormalSeparation equals target:
// T* = d(1 − C)·exp(μP + μK + σ·Φ⁻¹(1 − p*)).
func LognormalSeparationTorque(p *montecarlo.Problem, target float64) float64 {
	k, pl := p.Vars[0].Dist, p.Vars[1].Dist
	c := model.ComputeStiffness(&p.Base).C
	return p.Base.Thread.D * (1 - c) * math.Exp(pl.A+k.A+math.Hypot(pl.B, k.B)*distuv.UnitNormal.Quantile(1-target))
}
