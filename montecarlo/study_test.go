package montecarlo_test

import (
	"context"
	"math"
	"reflect"
	"strconv"
	"testing"
	"time"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// lognormalCase is the closed-form separation case: torque fixed (varied by
// the sweep), K ~ LN, P ~ LN. Separation when P·(1 − C) ≥ T/(K·d):
//
//	p(T) = 1 − Φ((ln(T/(d(1 − C))) − μP − μK)/√(σP² + σK²))
func lognormalCase() (*montecarlo.Problem, func(torque float64) float64) {
	in := joint()
	in.Method, in.Torque, in.NutFactor = model.NutFactorMethod, 100e3, 0.2
	k := mustDist(montecarlo.NewLogNormalMoments(0.2, 0.2*0.15))
	pl := mustDist(montecarlo.NewLogNormalMoments(28e3, 28e3*0.2))
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.nut_factor", Dist: k, Role: montecarlo.PerBolt, Field: fNutFactor},
		{Name: "loads.axial_max", Dist: pl, Role: montecarlo.Load, Field: fAxial},
	}}
	c := model.ComputeStiffness(&in).C
	exact := func(t float64) float64 {
		return 1 - distuv.UnitNormal.CDF((math.Log(t/(12*(1-c)))-pl.A-k.A)/math.Hypot(pl.B, k.B))
	}
	return p, exact
}

func TestSweepClosedForm(t *testing.T) {
	t.Parallel()
	p, exact := lognormalCase()
	v := montecarlo.Vary{Kind: montecarlo.VaryInput, Path: "tightening.torque", Field: fTorque, Lo: 60e3, Hi: 160e3, Steps: 11}
	sw, err := montecarlo.RunSweep(context.Background(), p, v, montecarlo.Settings{Samples: 200_000, Seed: 21, Confidence: conf999, Modes: []model.Mode{model.Separation}})
	if err != nil {
		t.Fatal(err)
	}
	prev := 2.0
	for _, st := range sw.Steps {
		m, _ := st.Result.Mode(model.Separation)
		checkContains(t, "separation at T = "+fmtKNm(st.X), m.Interval, exact(st.X))
		// A higher preload lowers the probability of separation (Shigley Eq. 8-30);
		// with common random numbers the estimated curve is monotone too.
		if m.Interval.P > prev {
			t.Errorf("separation probability rose from %.4g to %.4g as the torque rose to %s", prev, m.Interval.P, fmtKNm(st.X))
		}
		prev = m.Interval.P
	}
	// Torque window for a target: the lower end solves p(T*) = p*, i.e.
	// T* = d(1 − C)·exp(μP + μK + σ·Φ⁻¹(1 − p*)), within the sweep's resolution.
	for _, target := range []float64{1e-2, 1e-3} {
		w := montecarlo.FindWindow(sw, target, false)
		k, pl := p.Vars[0].Dist, p.Vars[1].Dist
		c := model.ComputeStiffness(&p.Base).C
		tStar := 12 * (1 - c) * math.Exp(pl.A+k.A+math.Hypot(pl.B, k.B)*distuv.UnitNormal.Quantile(1-target))
		step := (v.Hi - v.Lo) / float64(v.Steps-1)
		if !w.Found || w.OpenLo || math.Abs(w.Lo-tStar) > step || !w.OpenHi {
			t.Errorf("target %g: window %+v, analytic lower end %s (step %s)", target, w, fmtKNm(tStar), fmtKNm(step))
		}
		if len(w.LoModes) != 1 || w.LoModes[0] != model.Separation {
			t.Errorf("lower end should be bounded by separation, got %v", w.LoModes)
		}
	}
	if w := montecarlo.FindWindow(sw, 1e-9, false); w.Found {
		t.Errorf("a target below every step must report no window, got %+v", w)
	}
}

func fmtKNm(nmm float64) string { return strconv.FormatFloat(nmm/1000, 'g', 4, 64) + " N·m" }

func TestSweepCommonRandomNumbers(t *testing.T) {
	t.Parallel()
	// The same seed at every step: a step repeated in another sweep gives the
	// same result bit for bit, and the any-mode curve of the load multiplier
	// is monotone (more load never makes a sample safer here).
	s, _ := scenario.Example("cover-flange")
	v := montecarlo.Vary{Kind: montecarlo.VaryLoad, Lo: 0.8, Hi: 1.4, Steps: 4}
	set := montecarlo.Settings{Samples: 50_000, Seed: 5}
	a, err := montecarlo.RunSweep(context.Background(), &s.Problem, v, set)
	if err != nil {
		t.Fatal(err)
	}
	set.Workers = 3
	b, _ := montecarlo.RunSweep(context.Background(), &s.Problem, v, set)
	for i := range a.Steps {
		if a.Steps[i].Result.Any != b.Steps[i].Result.Any || a.Steps[i].Result.PreloadMean != b.Steps[i].Result.PreloadMean {
			t.Errorf("step %d differs between worker counts", i)
		}
		if i > 0 && a.Steps[i].Result.Any.Failures < a.Steps[i-1].Result.Any.Failures {
			t.Errorf("any-mode failures fell from %d to %d as the load rose", a.Steps[i-1].Result.Any.Failures, a.Steps[i].Result.Any.Failures)
		}
	}
}

func TestSpreadLimit(t *testing.T) {
	t.Parallel()
	// Preload ~ N(60 kN, σ) per bolt, fixed load: proof fails when
	// Fi ≥ Sp·As − C·P = F*. The largest σ meeting p* is (F* − 60 kN)/Φ⁻¹(1 − p*)
	// (closed form); the bisection finds the spread factor within its resolution.
	in := joint()
	d := mustDist(montecarlo.NewNormal(60e3, 1e3))
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{{Name: "tightening.preload", Dist: d, Role: montecarlo.PerBolt, Field: fPreload}}}
	c := model.ComputeStiffness(&in).C
	fStar := 830*in.Thread.StressArea - c*30e3
	const target = 1e-2
	want := (fStar - 60e3) / distuv.UnitNormal.Quantile(1-target) / 1e3
	sl, err := montecarlo.FindSpreadLimit(context.Background(), p, "tightening.preload", target, montecarlo.Settings{Samples: 100_000, Seed: 3, Modes: []model.Mode{model.Proof}})
	if err != nil {
		t.Fatal(err)
	}
	if sl.Below || sl.Above || math.Abs(sl.Factor/want-1) > 0.03 {
		t.Errorf("spread factor %.4g, want %.4g (σ = %.4g kN)", sl.Factor, want, want)
	}
}

func TestPairedNarrowerThanUnpaired(t *testing.T) {
	t.Parallel()
	// Why common random numbers: two nut-factor scatters on the same draws
	// fail together most of the time, so the paired interval of the difference
	// is much narrower than two independent runs would give.
	p, _ := lognormalCase()
	q := &montecarlo.Problem{Base: p.Base, Vars: append([]montecarlo.Var(nil), p.Vars...)}
	k, _ := q.Vars[0].Dist.Multiplied(0.95) // 5 % lower nut factor: more preload
	q.Vars[0].Dist = k
	pr, err := montecarlo.RunPaired(context.Background(), []*montecarlo.Problem{p, q}, montecarlo.Settings{Samples: 200_000, Seed: 8, Modes: []model.Mode{model.Separation}})
	if err != nil {
		t.Fatal(err)
	}
	i := int(model.Separation)
	d := montecarlo.PairedDifference(pr.Samples, pr.OnlyBase[1][i], pr.OnlyVariant[1][i], pr.Variants[0].Modes[0].Interval.P, pr.Variants[1].Modes[0].Interval.P, 0.95)
	paired, unpaired := d.Hi-d.Lo, d.UnpairedHi-d.UnpairedLo
	t.Logf("difference %.3g, paired width %.3g, unpaired %.3g", d.D, paired, unpaired)
	// A lower nut factor raises every bolt's preload, so every sample that
	// separates in the variant separates in the base too (nested outcomes):
	// then Var_paired ≈ |D|/n and Var_unpaired ≈ (p0 + p1)/n for small p, and
	// the width ratio is √(|D|/(p0 + p1)) (binomial variances, worked by hand).
	p0, p1 := pr.Variants[0].Modes[0].Interval.P, pr.Variants[1].Modes[0].Interval.P
	if pr.OnlyVariant[1][i] != 0 {
		t.Errorf("outcomes not nested: %d samples separate only in the variant", pr.OnlyVariant[1][i])
	}
	want := math.Sqrt(math.Abs(d.D) / (p0*(1-p0) + p1*(1-p1)) * (1 - math.Abs(d.D)))
	if !(paired < unpaired) || math.Abs(paired/unpaired-want) > 0.02 {
		t.Errorf("width ratio paired/unpaired %.4f, want %.4f", paired/unpaired, want)
	}
	if !(d.D < 0 && d.Hi < 0 && d.PValue < 1e-6) {
		t.Errorf("more preload must lower separation significantly: %+v", d)
	}
	// The counts are those of separate runs with the same seed (common random numbers).
	r0, _ := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: 200_000, Seed: 8, Modes: []model.Mode{model.Separation}})
	if r0.Modes[0].Interval.Failures != pr.Variants[0].Modes[0].Interval.Failures {
		t.Errorf("lock-step base %d failures, separate run %d", pr.Variants[0].Modes[0].Interval.Failures, r0.Modes[0].Interval.Failures)
	}
}

func TestPairedWorkers(t *testing.T) {
	t.Parallel()
	s, _ := scenario.Example("cover-flange")
	ps := []*montecarlo.Problem{&s.Problem, &s.Variants[0].Problem}
	a, err := montecarlo.RunPaired(context.Background(), ps, montecarlo.Settings{Samples: 40_000, Seed: 2, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := montecarlo.RunPaired(context.Background(), ps, montecarlo.Settings{Samples: 40_000, Seed: 2, Workers: 3})
	a.Elapsed, b.Elapsed = 0, 0
	for i := range a.Variants {
		a.Variants[i].Elapsed, b.Variants[i].Elapsed = 0, 0
		a.Variants[i].Workers, b.Variants[i].Workers = 0, 0
	}
	if !reflect.DeepEqual(a, b) {
		t.Error("paired result depends on the worker count")
	}
}

func TestPublishedTrends(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	dry, oiled := s, s.Variants[0]
	// Lubrication lowers the nut factor (Shigley Table 8-15: 0.20 dry steel,
	// 0.18 lubricated) and so raises the preload at the same torque, and
	// narrows its scatter (Shigley Tables 8-13/8-14: c.o.v. 0.143 dry vs
	// 0.084 lubricated, Blake & Kurtz data).
	if !(oiled.Inputs().NutFactor < dry.Inputs().NutFactor) {
		t.Error("oiled nut factor not below dry")
	}
	pr, err := montecarlo.RunPaired(context.Background(), []*montecarlo.Problem{&dry.Problem, &oiled.Problem}, montecarlo.Settings{Samples: 100_000, Seed: 4})
	if err != nil {
		t.Fatal(err)
	}
	rd, ro := pr.Variants[0], pr.Variants[1]
	if !(ro.PreloadMean > rd.PreloadMean) {
		t.Errorf("oiled mean preload %.0f not above dry %.0f", ro.PreloadMean, rd.PreloadMean)
	}
	if !(ro.PreloadSD/ro.PreloadMean < rd.PreloadSD/rd.PreloadMean) {
		t.Error("oiled preload scatter not below dry")
	}
	// Tighter torque scatter narrows the preload distribution (VDI 2230-1
	// Table A8: a more precise method has a smaller tightening factor αA).
	v := montecarlo.Vary{Kind: montecarlo.VarySpread, Path: "tightening.torque", Lo: 0.2, Hi: 3, Steps: 3}
	sw, err := montecarlo.RunSweep(context.Background(), &s.Problem, v, montecarlo.Settings{Samples: 50_000, Seed: 4})
	if err != nil {
		t.Fatal(err)
	}
	for i := 1; i < len(sw.Steps); i++ {
		if !(sw.Steps[i].Result.PreloadSD > sw.Steps[i-1].Result.PreloadSD) {
			t.Errorf("preload sd did not grow with torque scatter: %v → %v", sw.Steps[i-1].Result.PreloadSD, sw.Steps[i].Result.PreloadSD)
		}
	}
}

func TestStudyBadInput(t *testing.T) {
	t.Parallel()
	p, _ := lognormalCase()
	ctx := context.Background()
	set := montecarlo.Settings{Samples: 1000}
	for name, v := range map[string]montecarlo.Vary{
		"lo ≥ hi":          {Kind: montecarlo.VaryInput, Path: "tightening.torque", Field: fTorque, Lo: 5, Hi: 5, Steps: 3},
		"steps < 2":        {Kind: montecarlo.VaryInput, Path: "tightening.torque", Field: fTorque, Lo: 1, Hi: 5, Steps: 1},
		"spread of fixed":  {Kind: montecarlo.VarySpread, Path: "tightening.torque", Lo: 0.5, Hi: 2, Steps: 3},
		"load multiplier0": {Kind: montecarlo.VaryLoad, Lo: 0, Hi: 2, Steps: 3},
		"no field":         {Kind: montecarlo.VaryInput, Path: "nothing", Lo: 1, Hi: 2, Steps: 3},
	} {
		if _, err := montecarlo.RunSweep(ctx, p, v, set); err == nil {
			t.Errorf("%s: want error", name)
		}
	}
	if _, err := montecarlo.RunPaired(ctx, []*montecarlo.Problem{p}, set); err == nil {
		t.Error("one variant: want error")
	}
	q := *p
	q.Base.Bolts = 4
	if _, err := montecarlo.RunPaired(ctx, []*montecarlo.Problem{p, &q}, set); err == nil {
		t.Error("different bolt counts: want error")
	}
}

// BenchmarkSweep21 measures a 21-step sweep of R1 at 10⁶ samples a step
// against 21 separate 10⁶-sample runs, reporting the ratio (issue target ≤ 1.5).
func BenchmarkSweep21(b *testing.B) {
	s, _ := scenario.Example("r1")
	v := montecarlo.Vary{Kind: montecarlo.VaryInput, Path: "tightening.torque", Field: fTorque, Lo: 60e3, Hi: 160e3, Steps: 21}
	set := montecarlo.Settings{Samples: 1_000_000, Seed: 1}
	var sweep, separate time.Duration
	for b.Loop() {
		t0 := time.Now()
		if _, err := montecarlo.RunSweep(context.Background(), &s.Problem, v, set); err != nil {
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
