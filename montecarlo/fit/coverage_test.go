package fit

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/rng"
)

// sample draws n values from d with the given seed.
func sample(d montecarlo.Dist, n int, seed uint64) []float64 {
	var p rand.PCG
	rng.Seed(&p, seed, 0)
	x := make([]float64, n)
	for i := range x {
		x[i] = d.FromUniform(rng.Unit(&p))
	}
	return x
}

func must(d montecarlo.Dist, err error) montecarlo.Dist {
	if err != nil {
		panic(err)
	}
	return d
}

// truths are the synthetic populations of the statistical tests (invented
// for testing), with the true parameters in the order of Candidate.Params.
var truths = []struct {
	d      montecarlo.Dist
	n      int
	bounds *Bounds
	params []float64
	trials int // trials of the coverage test
	boot   int // replicates per trial
}{
	{must(montecarlo.NewNormal(30e3, 3e3)), 20, nil, []float64{30e3, 3e3}, 400, 199},
	{montecarlo.Dist{Kind: montecarlo.LogNormal, A: math.Log(0.18), B: 0.12}, 20, nil, []float64{math.Log(0.18), 0.12}, 400, 199},
	{must(montecarlo.NewWeibull(2.1, 82)), 20, nil, []float64{2.1, 82}, 400, 199},
	{must(montecarlo.NewUniform(10, 14)), 20, nil, []float64{10, 14}, 400, 199},
	{must(montecarlo.NewTriangular(10, 11, 14)), 30, nil, []float64{10, 11, 14}, 200, 99},
	{must(montecarlo.NewTruncNormal(100, 10, 90, 130)), 30, &Bounds{90, 130}, []float64{100, 10}, 150, 99},
}

// TestCoverage checks that the intervals of the parameters, the mean and
// the c.o.v. cover the true values at about the nominal 90 %, and that the
// bootstrap p-values are about uniform under the null (the share below
// 0.10 is about 0.10). Coverage is counted over independent trials; the
// bounds [0.80, 0.97] lie at least 4.8 binomial standard deviations from
// 0.90 for 400 trials, 3.6 for 150: a false alarm rate below 10⁻³ per
// check for an exactly nominal interval. Intervals from exact pivots
// (normal, lognormal and Weibull parameters, the uniform ends) are also held
// to [0.84, 0.95]. The p-value share below 0.10 is held to [0.03, 0.19]
// (≥ 3.7 standard deviations at 150 trials). The triangular's lower end and
// mode are exempt (see below). About 30 checks: a false alarm in well under
// 1 % of runs.
func TestCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("long statistical test")
	}
	t.Parallel()
	for _, tr := range truths {
		t.Run(tr.d.Kind.String(), func(t *testing.T) {
			t.Parallel()
			k := tr.d.Kind
			nq := len(tr.params) + 2
			hits := make([]int, nq)
			nCOV, lowP := 0, 0
			mean, sd := tr.d.Mean(), tr.d.StdDev()
			for trial := range tr.trials {
				x := sample(tr.d, tr.n, uint64(1000+trial))
				r, err := Analyze(x, Options{Families: []montecarlo.Kind{k}, Bounds: tr.bounds, Bootstrap: tr.boot, Seed: uint64(trial), Workers: 1})
				if err != nil {
					t.Fatalf("trial %d: %v", trial, err)
				}
				noNaN(t, r)
				c := r.Candidates[0]
				for i, p := range c.Params {
					if p.Lo <= tr.params[i] && tr.params[i] <= p.Hi {
						hits[i]++
					}
				}
				if c.Mean.Lo <= mean && mean <= c.Mean.Hi {
					hits[nq-2]++
				}
				if c.COV.Interval {
					nCOV++
					if c.COV.Lo <= sd/mean && sd/mean <= c.COV.Hi {
						hits[nq-1]++
					}
				}
				if c.AD.P <= 0.10 {
					lowP++
				}
			}
			names := []string{}
			for _, q := range quantities(k).params {
				names = append(names, q.name)
			}
			names = append(names, "mean", "c.o.v.")
			exact := k == montecarlo.Normal || k == montecarlo.LogNormal || k == montecarlo.Weibull || k == montecarlo.Uniform
			// The triangular likelihood is irregular (the mode sits on an
			// order statistic, the lower end often on the smallest value):
			// the intervals of lower and mode under-cover (about 0.6 here)
			// and the p-values are conservative. Only logged.
			irregular := func(i int) bool { return k == montecarlo.Triangular && i < 2 }
			for i, h := range hits {
				m := tr.trials
				if i == nq-1 {
					m = nCOV
				}
				rate := float64(h) / float64(m)
				t.Logf("%s %s: coverage %.3f over %d trials", k, names[i], rate, m)
				lo, hi := 0.80, 0.97
				if exact && i < len(tr.params) {
					lo, hi = 0.84, 0.95
				}
				if !irregular(i) && (rate < lo || rate > hi) {
					t.Errorf("%s %s: coverage %.3f of nominal 0.90 over %d trials, outside [%g, %g]", k, names[i], rate, m, lo, hi)
				}
			}
			share := float64(lowP) / float64(tr.trials)
			t.Logf("%s: share of AD p-values ≤ 0.10: %.3f", k, share)
			if share > 0.19 || share < 0.03 && k != montecarlo.Triangular {
				t.Errorf("%s: %.3f of the AD p-values under the null are ≤ 0.10, want about 0.10", k, share)
			}
		})
	}
}

// Data far from a family give small p-values: exponential lives (Weibull
// k = 1, invented) fitted as normal or uniform, normal data as uniform.
func TestWrongFamilyRejected(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		truth montecarlo.Dist
		fam   montecarlo.Kind
	}{
		{must(montecarlo.NewWeibull(1, 100)), montecarlo.Normal},
		{must(montecarlo.NewWeibull(1, 100)), montecarlo.Uniform},
		{must(montecarlo.NewNormal(0, 1)), montecarlo.Uniform},
	} {
		x := sample(c.truth, 100, 7)
		r, err := Analyze(x, Options{Families: []montecarlo.Kind{c.fam}, Bootstrap: 199, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		if p := r.Candidates[0].AD.P; p > 0.01 {
			t.Errorf("%v data fitted as %v: AD p = %g, want ≤ 0.01", c.truth.Kind, c.fam, p)
		}
	}
}

// The bootstrap gives the same bits for any number of workers: replicate i
// draws from stream i.
func TestWorkersDoNotChangeResults(t *testing.T) {
	t.Parallel()
	x := lz(t)
	var first *Result
	for _, w := range []int{1, 2, 5} {
		r, err := Analyze(x, Options{Bootstrap: 99, Seed: 42, Workers: w, Bounds: &Bounds{0, 1000}})
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = r
			continue
		}
		if !reflect.DeepEqual(first, r) {
			t.Errorf("%d workers give another result than 1", w)
		}
	}
	r, _ := Analyze(x, Options{Bootstrap: 99, Seed: 43})
	if reflect.DeepEqual(first.Candidates[0].Params, r.Candidates[0].Params) {
		t.Error("another seed gives the same intervals")
	}
}

func TestAnalyzeProgress(t *testing.T) {
	t.Parallel()
	var calls, done, total int
	x := []float64{0.01, 0.02, 0.04, 0.05, 0.07, 0.1, 0.9, 0.92, 0.95, 0.97, 0.98, 0.99}
	// truncnormal fails on these values and lognormal/Weibull are fitted:
	// the count still reaches the total.
	_, err := Analyze(x, Options{Bootstrap: 99, Bounds: &Bounds{0, 1}, Progress: func(d, n int) { calls++; done, total = d, n }})
	if err != nil {
		t.Fatal(err)
	}
	if total != 6*99 || done != total || calls < 6 {
		t.Errorf("progress %d of %d in %d calls", done, total, calls)
	}
}
