package decide_test

import (
	"context"
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/problemtest"
)

// separationWithTorque is problemtest.LognormalSeparation with a normal
// torque scatter of relative tolerance tol at ±3σ about t0, and the exact
// separation probability for a nominal torque t and tolerance u:
//
//	p(t, u) = ∫ φ(z)·p_fixed(t·(1 + u·z/3)) dz
//
// (p_fixed the closed form of LognormalSeparation, worked by hand from
// the lognormal separation condition P·K·d·(1 − Φ) ≥ T), integrated by the
// trapezoid rule over z ∈ [−8, 8].
func separationWithTorque(t0, tol float64) (*montecarlo.Problem, func(t, u float64) float64) {
	p, fixed := problemtest.LognormalSeparation()
	p.Base.Torque = t0
	p.Vars = append(p.Vars, montecarlo.Var{Name: "tightening.torque", Dist: problemtest.Must(montecarlo.NewNormal(t0, tol*t0/3)),
		Role: montecarlo.PerBolt, Field: problemtest.Torque})
	exact := func(t, u float64) float64 {
		const n = 4000
		s := 0.0
		for i := 0; i <= n; i++ {
			z := -8 + 16*float64(i)/n
			w := 1.0
			if i == 0 || i == n {
				w = 0.5
			}
			if x := t * (1 + u*z/3); x > 0 {
				s += w * distuv.UnitNormal.Prob(z) * fixed(x)
			} else {
				s += w * distuv.UnitNormal.Prob(z)
			}
		}
		return s * 16 / n
	}
	return p, exact
}

// solve bisects f(x) = 0 on [a, b] (f changes sign).
func solve(f func(float64) float64, a, b float64) float64 {
	fa := f(a)
	for range 200 {
		m := (a + b) / 2
		if fm := f(m); (fm > 0) == (fa > 0) {
			a, fa = m, fm
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

// TestSpecLognormalSeparation checks the torque edge and the tolerance edge
// against the closed form (problemtest.LognormalSeparation, worked by hand:
// the edge where P(P·K·d·(1 − Φ) ≥ T) = target). The point-estimate edge
// must lie within its bisection resolution plus four standard errors of
// sampling (the c.o.v. of the estimate divided by the slope of ln p in
// ln T) of the exact edge; the upper-bound edge must lie inside it.
func TestSpecLognormalSeparation(t *testing.T) {
	if testing.Short() {
		t.Skip("statistical check")
	}
	t.Parallel()
	const target, tol0 = 1e-3, 0.06
	p0, _ := problemtest.LognormalSeparation()
	tStar := problemtest.LognormalSeparationTorque(p0, target) // fixed-torque edge, for the range
	p, exact := separationWithTorque(tStar, tol0)
	// Exact edge of the nominal torque at the file's tolerance.
	edge := solve(func(x float64) float64 { return math.Log(exact(x, tol0) / target) }, 0.5*tStar, 2*tStar)
	o := decide.SpecOptions{Target: target, Path: "tightening.torque", Field: problemtest.Torque,
		Lo: 0.8 * edge, Hi: 1.3 * edge, Steps: 9,
		Settings: montecarlo.Settings{Samples: 4 << 20, Seed: 13, Workers: 2, Modes: []model.Mode{model.Separation}}}
	sp, err := decide.RunSpec(context.Background(), p, o)
	if err != nil {
		t.Fatal(err)
	}
	if !sp.Feasible || !sp.RangeHi || sp.RangeLo {
		t.Fatalf("feasible %v, open ends lo %v hi %v: want a window closed below by separation, open above", sp.Feasible, sp.RangeLo, sp.RangeHi)
	}
	w, c := sp.Sweep.Window, sp.Sweep.Conservative
	// Sampling error of the edge: c.o.v. of p at n samples over |d ln p / d ln T|.
	slope := math.Abs(math.Log(exact(edge*1.001, tol0)/exact(edge/1.001, tol0)) / math.Log(1.001*1.001))
	se := edge * math.Sqrt((1-target)/(target*float64(o.Settings.Samples))) / slope
	if d := math.Abs(w.Lo - edge); d > w.Resolution+4*se {
		t.Errorf("point-estimate torque edge %.6g N·mm, exact %.6g: off by %.3g, more than resolution %.3g + 4·%.3g", w.Lo, edge, d, w.Resolution, se)
	}
	if c.Lo < edge-w.Resolution-4*se {
		t.Errorf("upper-bound edge %.6g lies below the exact edge %.6g", c.Lo, edge)
	}
	if c.Lo < w.Lo {
		t.Errorf("upper-bound edge %.6g outside the point edge %.6g", c.Lo, w.Lo)
	}
	// Tolerance edge at the callout's nominal.
	if !sp.Point.Found || sp.Point.AtMax {
		t.Fatalf("tolerance edge not bracketed: %+v", sp.Point)
	}
	uStar := solve(func(u float64) float64 { return math.Log(exact(sp.Nominal, u) / target) }, decide.MinTolerance, decide.MaxTolerance)
	du := 1.001
	slopeU := math.Abs(math.Log(exact(sp.Nominal, uStar*du)/exact(sp.Nominal, uStar/du)) / math.Log(du*du))
	seU := uStar * math.Sqrt((1-target)/(target*float64(o.Settings.Samples))) / slopeU
	if !(sp.Point.Meets-4*seU <= uStar && uStar <= sp.Point.Misses+4*seU) {
		t.Errorf("point tolerance edge [%.5g, %.5g), exact %.5g (±%.2g sampling)", sp.Point.Meets, sp.Point.Misses, uStar, seU)
	}
	if sp.Upper.Meets > sp.Point.Misses {
		t.Errorf("upper-bound tolerance %.5g wider than the point edge %.5g", sp.Upper.Meets, sp.Point.Misses)
	}
	if sp.AtCallout == nil || sp.AtCallout.Any.Hi > target {
		t.Errorf("the run at the callout does not meet the target: %+v", sp.AtCallout)
	}
	t.Logf("torque edge: exact %.2f N·m, point %.2f, upper %.2f (resolution %.3f); tolerance at %.2f N·m: exact ±%.4f, point [%.4f, %.4f), upper %.4f; %d runs",
		edge/1e3, w.Lo/1e3, c.Lo/1e3, w.Resolution/1e3, sp.Nominal/1e3, uStar, sp.Point.Meets, sp.Point.Misses, sp.Upper.Meets, sp.Runs)
}

// TestSpecBadOptions: a target outside (0, 1), an empty or inverted range,
// an input without scatter.
func TestSpecBadOptions(t *testing.T) {
	t.Parallel()
	p, _ := separationWithTorque(100e3, 0.06)
	fixed, _ := problemtest.LognormalSeparation()
	base := decide.SpecOptions{Target: 1e-3, Path: "tightening.torque", Field: problemtest.Torque, Lo: 50e3, Hi: 150e3}
	for _, tc := range []struct {
		name string
		p    *montecarlo.Problem
		mod  func(*decide.SpecOptions)
	}{
		{"target zero", p, func(o *decide.SpecOptions) { o.Target = 0 }},
		{"target one", p, func(o *decide.SpecOptions) { o.Target = 1 }},
		{"target NaN", p, func(o *decide.SpecOptions) { o.Target = math.NaN() }},
		{"inverted range", p, func(o *decide.SpecOptions) { o.Lo, o.Hi = 150e3, 50e3 }},
		{"negative range", p, func(o *decide.SpecOptions) { o.Lo = -1 }},
		{"no scatter", fixed, func(o *decide.SpecOptions) {}},
		{"steps", p, func(o *decide.SpecOptions) { o.Steps = 2 }},
	} {
		o := base
		o.Settings = montecarlo.Settings{Samples: 1000, Seed: 1}
		tc.mod(&o)
		if _, err := decide.RunSpec(context.Background(), tc.p, o); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}
