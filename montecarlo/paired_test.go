package montecarlo_test

import (
	"context"
	"math"
	"reflect"
	"testing"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/problemtest"
	"boltrisk/montecarlo/scenario"
)

func TestPairedNarrowerThanUnpaired(t *testing.T) {
	t.Parallel()
	// Why common random numbers: two nut-factor scatters on the same draws
	// fail together most of the time, so the paired interval of the difference
	// is much narrower than two independent runs would give.
	p, _ := problemtest.LognormalSeparation()
	q := &montecarlo.Problem{Base: p.Base, Vars: append([]montecarlo.Var(nil), p.Vars...)}
	k, _ := q.Vars[0].Dist.Multiplied(0.95) // 5 % lower nut factor: more preload
	q.Vars[0].Dist = k
	set := montecarlo.Settings{Samples: 200_000, Seed: 8, Modes: []model.Mode{model.Separation}}
	pr, err := montecarlo.RunPaired(context.Background(), []*montecarlo.Problem{p, q}, set)
	if err != nil {
		t.Fatal(err)
	}
	d := pr.Difference(1, model.Separation)
	paired, unpaired := d.Hi-d.Lo, d.UnpairedHi-d.UnpairedLo
	t.Logf("difference %.3g, paired width %.3g, unpaired %.3g", d.D, paired, unpaired)
	// A lower nut factor raises every bolt's preload, so every sample that
	// separates in the variant separates in the base too (nested outcomes):
	// then Var_paired ≈ |D|/n and Var_unpaired ≈ (p0 + p1)/n for small p, and
	// the width ratio is √(|D|/(p0 + p1)) (binomial variances, worked by
	// hand); the score intervals follow it within 5 %.
	p0, p1 := pr.Variants[0].Modes[0].Estimate.P, pr.Variants[1].Modes[0].Estimate.P
	if n := pr.Pairs[1][model.Separation].OnlyVariant; n != 0 {
		t.Errorf("outcomes not nested: %d samples separate only in the variant", n)
	}
	want := math.Sqrt(math.Abs(d.D) / (p0*(1-p0) + p1*(1-p1)) * (1 - math.Abs(d.D)))
	if !(paired < unpaired) || math.Abs(paired/unpaired/want-1) > 0.05 {
		t.Errorf("width ratio paired/unpaired %.4f, want %.4f", paired/unpaired, want)
	}
	if !(d.D < 0 && d.Hi < 0 && d.PValue < 1e-6) {
		t.Errorf("more preload must lower separation significantly: %+v", d)
	}
	// The counts are those of separate runs with the same seed (common
	// random numbers): the lock-step base draws what a run of it draws.
	for i, pp := range []*montecarlo.Problem{p, q} {
		r, _ := montecarlo.Run(context.Background(), pp, set)
		if a, b := r.Modes[0].Estimate.Failures, pr.Variants[i].Modes[0].Estimate.Failures; a != b {
			t.Errorf("variant %d: lock-step %d failures, separate run %d", i, b, a)
		}
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

func TestPairedOwnPercentiles(t *testing.T) {
	t.Parallel()
	// Each variant keeps its own sketch ranges: a variant with a far wider
	// nut-factor scatter does not coarsen the base's percentiles, which equal
	// those of a separate run of the base (same draws, same pilot).
	s, _ := scenario.Example("cover-flange")
	base := &s.Problem
	wide := &montecarlo.Problem{Base: base.Base, Vars: append([]montecarlo.Var(nil), base.Vars...), Corr: base.Corr}
	for i := range wide.Vars {
		if wide.Vars[i].Name == "tightening.nut_factor" {
			wide.Vars[i].Dist, _ = wide.Vars[i].Dist.Scaled(3)
		}
	}
	set := montecarlo.Settings{Samples: 50_000, Seed: 3}
	pr, err := montecarlo.RunPaired(context.Background(), []*montecarlo.Problem{base, wide}, set)
	if err != nil {
		t.Fatal(err)
	}
	r, _ := montecarlo.Run(context.Background(), base, set)
	for i, pc := range r.Quantities[montecarlo.QPreload].Percentiles {
		if got := pr.Variants[0].Quantities[montecarlo.QPreload].Percentiles[i]; got.Value != pc.Value {
			t.Errorf("base preload percentile %g: paired %.6g, separate %.6g", pc.Level, got.Value, pc.Value)
		}
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
}

func TestPairedBadInput(t *testing.T) {
	t.Parallel()
	p, _ := problemtest.LognormalSeparation()
	ctx := context.Background()
	set := montecarlo.Settings{Samples: 1000}
	if _, err := montecarlo.RunPaired(ctx, []*montecarlo.Problem{p}, set); err == nil {
		t.Error("one variant: want error")
	}
	q := *p
	q.Base.Bolts = 4
	if _, err := montecarlo.RunPaired(ctx, []*montecarlo.Problem{p, &q}, set); err == nil {
		t.Error("different bolt counts: want error")
	}
}
