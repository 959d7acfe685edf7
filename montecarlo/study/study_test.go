package study_test

import (
	"context"
	"math"
	"strconv"
	"testing"
	"time"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/problemtest"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
)

func fmtKNm(nmm float64) string { return strconv.FormatFloat(nmm/1000, 'g', 4, 64) + " N·m" }

func torqueSweep(lo, hi float64, steps int) study.Vary {
	return study.Vary{Kind: study.Input, Path: "tightening.torque", Field: problemtest.Torque, Lo: lo, Hi: hi, Steps: steps}
}

func TestSweepClosedForm(t *testing.T) {
	t.Parallel()
	p, exact := problemtest.LognormalSeparation()
	v := torqueSweep(60e3, 160e3, 11)
	set := montecarlo.Settings{Samples: 200_000, Seed: 21, Confidence: problemtest.Conf999, Modes: []model.Mode{model.Separation}}
	sw, err := study.Run(context.Background(), p, v, set, 0)
	if err != nil {
		t.Fatal(err)
	}
	prev := 2.0
	for _, st := range sw.Steps {
		m, _ := st.Result.Mode(model.Separation)
		problemtest.Contains(t, "separation at T = "+fmtKNm(st.X), m.Estimate, exact(st.X))
		// A higher preload lowers the probability of separation (Shigley Eq. 8-30);
		// with common random numbers the estimated curve is monotone too.
		if m.Estimate.P > prev {
			t.Errorf("separation probability rose from %.4g to %.4g as the torque rose to %s", prev, m.Estimate.P, fmtKNm(st.X))
		}
		prev = m.Estimate.P
	}
	if w := study.FindWindow(sw, 1e-9, false); w.Found {
		t.Errorf("a target below every step must report no window, got %+v", w)
	}
}

func TestWindowEdgesRefined(t *testing.T) {
	t.Parallel()
	// The lower end of the torque window for a target solves p(T*) = p*
	// (problemtest.LognormalSeparationTorque, closed form). Bisected with
	// common random numbers, the point-estimate edge lies within its stated
	// resolution plus the sampling error of p at T* (5 standard errors,
	// converted to torque by the slope of p: false alarm ≪ 10⁻³), whatever
	// the step count; the upper-bound edge lies inside the point window.
	p, exact := problemtest.LognormalSeparation()
	set := montecarlo.Settings{Samples: 400_000, Seed: 7, Modes: []model.Mode{model.Separation}}
	for _, target := range []float64{1e-2, 1e-3} {
		tStar := problemtest.LognormalSeparationTorque(p, target)
		// Sampling error of the edge: se(p)/|dp/dT| at T*.
		se := math.Sqrt(target * (1 - target) / float64(set.Samples))
		slope := math.Abs(exact(tStar*1.001)-exact(tStar*0.999)) / (tStar * 0.002)
		for _, steps := range []int{5, 11} {
			sw, err := study.Run(context.Background(), p, torqueSweep(60e3, 160e3, steps), set, target)
			if err != nil {
				t.Fatal(err)
			}
			w, c := sw.Window, sw.Conservative
			if !w.Found || w.OpenLo || !w.OpenHi {
				t.Fatalf("target %g, %d steps: window %+v", target, steps, w)
			}
			if tol := w.Resolution + 5*se/slope; math.Abs(w.Lo-tStar) > tol {
				t.Errorf("target %g, %d steps: lower end %s, analytic %s ± %s", target, steps, fmtKNm(w.Lo), fmtKNm(tStar), fmtKNm(tol))
			}
			if w.Resolution > (160e3-60e3)*study.RefineRelative {
				t.Errorf("resolution %s not refined", fmtKNm(w.Resolution))
			}
			if len(w.LoModes) != 1 || w.LoModes[0] != model.Separation {
				t.Errorf("lower end should be bounded by separation, got %v", w.LoModes)
			}
			if c.Found && (c.Lo < w.Lo || c.Hi > w.Hi) {
				t.Errorf("upper-bound window [%s, %s] wider than the point window [%s, %s]", fmtKNm(c.Lo), fmtKNm(c.Hi), fmtKNm(w.Lo), fmtKNm(w.Hi))
			}
		}
	}
}

func TestInvalidStepsNeverBoundAWindow(t *testing.T) {
	t.Parallel()
	// Negative torques leave no valid sample (issue 11 item 2): those steps
	// are marked and the window neither includes nor stops at them as if
	// they met the target.
	s, _ := scenario.Example("cover-flange")
	v := study.Vary{Kind: study.Input, Path: "tightening.torque", Field: scenario.FieldPtrFunc("tightening.torque"), Lo: -10e3, Hi: 70e3, Steps: 9}
	sw, err := study.Run(context.Background(), &s.Problem, v, montecarlo.Settings{Samples: 20_000, Seed: 2}, 1e-2)
	if err != nil {
		t.Fatal(err)
	}
	if !sw.Steps[0].TooFewValid || sw.Steps[0].Result.Samples != 0 {
		t.Errorf("step at −10 N·m: %d valid samples, marked %v", sw.Steps[0].Result.Samples, sw.Steps[0].TooFewValid)
	}
	if w := sw.Window; w.Found && w.Lo < 0 {
		t.Errorf("window reaches %s, where no sample is valid", fmtKNm(w.Lo))
	}
}

func TestSweepCommonRandomNumbers(t *testing.T) {
	t.Parallel()
	// The same seed at every step: a step repeated in another sweep gives the
	// same result bit for bit, and the any-mode curve of the load multiplier
	// is monotone (more load never makes a sample safer here).
	s, _ := scenario.Example("cover-flange")
	v := study.Vary{Kind: study.Load, Lo: 0.8, Hi: 1.4, Steps: 4}
	set := montecarlo.Settings{Samples: 50_000, Seed: 5}
	a, err := study.Run(context.Background(), &s.Problem, v, set, 0)
	if err != nil {
		t.Fatal(err)
	}
	set.Workers = 3
	b, _ := study.Run(context.Background(), &s.Problem, v, set, 0)
	for i := range a.Steps {
		if a.Steps[i].Result.Any != b.Steps[i].Result.Any || a.Steps[i].Result.PreloadMean != b.Steps[i].Result.PreloadMean {
			t.Errorf("step %d differs between worker counts", i)
		}
		if i > 0 && a.Steps[i].Result.Any.Failures < a.Steps[i-1].Result.Any.Failures {
			t.Errorf("any-mode failures fell from %d to %d as the load rose", a.Steps[i-1].Result.Any.Failures, a.Steps[i].Result.Any.Failures)
		}
	}
}

func TestTorqueScatterTrend(t *testing.T) {
	t.Parallel()
	// Tighter torque scatter narrows the preload distribution (VDI 2230-1
	// Table A8: a more precise method has a smaller tightening factor αA).
	s, _ := scenario.Example("cover-flange")
	v := study.Vary{Kind: study.Spread, Path: "tightening.torque", Lo: 0.2, Hi: 3, Steps: 3}
	sw, err := study.Run(context.Background(), &s.Problem, v, montecarlo.Settings{Samples: 50_000, Seed: 4}, 0)
	if err != nil {
		t.Fatal(err)
	}
	for i := 1; i < len(sw.Steps); i++ {
		if !(sw.Steps[i].Result.PreloadSD > sw.Steps[i-1].Result.PreloadSD) {
			t.Errorf("preload sd did not grow with torque scatter: %v → %v", sw.Steps[i-1].Result.PreloadSD, sw.Steps[i].Result.PreloadSD)
		}
	}
}

func TestSpreadLimit(t *testing.T) {
	t.Parallel()
	// Preload ~ N(60 kN, σ) per bolt, fixed load: proof fails when
	// Fi ≥ Sp·As − C·P = F*. The largest σ meeting p* is (F* − 60 kN)/Φ⁻¹(1 − p*)
	// (closed form); the bisection finds the spread factor within its resolution.
	in := problemtest.Joint()
	d := problemtest.Must(montecarlo.NewNormal(60e3, 1e3))
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{{Name: "tightening.preload", Dist: d, Role: montecarlo.PerBolt, Field: problemtest.Preload}}}
	c := model.ComputeStiffness(&in).C
	fStar := 830*in.Thread.StressArea - c*30e3
	const target = 1e-2
	want := (fStar - 60e3) / distuv.UnitNormal.Quantile(1-target) / 1e3
	sl, err := study.FindSpreadLimit(context.Background(), p, "tightening.preload", target, montecarlo.Settings{Samples: 100_000, Seed: 3, Modes: []model.Mode{model.Proof}})
	if err != nil {
		t.Fatal(err)
	}
	if sl.Below || sl.Above || math.Abs(sl.Factor/want-1) > 0.03 {
		t.Errorf("spread factor %.4g, want %.4g (σ = %.4g kN)", sl.Factor, want, want)
	}
}

func TestStudyBadInput(t *testing.T) {
	t.Parallel()
	p, _ := problemtest.LognormalSeparation()
	ctx := context.Background()
	set := montecarlo.Settings{Samples: 1000}
	for name, v := range map[string]study.Vary{
		"lo ≥ hi":          {Kind: study.Input, Path: "tightening.torque", Field: problemtest.Torque, Lo: 5, Hi: 5, Steps: 3},
		"steps < 2":        {Kind: study.Input, Path: "tightening.torque", Field: problemtest.Torque, Lo: 1, Hi: 5, Steps: 1},
		"spread of fixed":  {Kind: study.Spread, Path: "tightening.torque", Lo: 0.5, Hi: 2, Steps: 3},
		"load multiplier0": {Kind: study.Load, Lo: 0, Hi: 2, Steps: 3},
		"no field":         {Kind: study.Input, Path: "nothing", Lo: 1, Hi: 2, Steps: 3},
	} {
		if _, err := study.Run(ctx, p, v, set, 0); err == nil {
			t.Errorf("%s: want error", name)
		}
	}
	if _, err := study.Run(ctx, p, torqueSweep(1, 5, 3), set, 1.5); err == nil {
		t.Error("target 1.5: want error")
	}
}

// BenchmarkSweep21 measures a 21-step sweep of the benchmark case at 10⁶
// samples a step against 21 separate 10⁶-sample runs, reporting the ratio
// (target ≤ 1.5).
func BenchmarkSweep21(b *testing.B) {
	s, _ := scenario.Example("bench-m12")
	v := torqueSweep(60e3, 160e3, 21)
	set := montecarlo.Settings{Samples: 1_000_000, Seed: 1}
	var sweep, separate time.Duration
	for b.Loop() {
		t0 := time.Now()
		if _, err := study.Run(context.Background(), &s.Problem, v, set, 0); err != nil {
			b.Fatal(err)
		}
		sweep += time.Since(t0)
		t0 = time.Now()
		for _, x := range v.Values() {
			q, _ := v.Apply(&s.Problem, x)
			if _, err := montecarlo.Run(context.Background(), q, set); err != nil {
				b.Fatal(err)
			}
		}
		separate += time.Since(t0)
	}
	b.ReportMetric(sweep.Seconds()/separate.Seconds(), "sweep/separate")
	b.ReportMetric(21e6*float64(b.N)/sweep.Seconds(), "samples/s")
}
