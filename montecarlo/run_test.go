package montecarlo_test

import (
	"context"
	"errors"
	"math"
	"reflect"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/model/jointtest"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// joint returns reference case R1 with the preload given directly (40 kN).
func joint() model.Inputs { return jointtest.R1Preload() }

func field(f func(in *model.Inputs) *float64) func(in *model.Inputs) *float64 { return f }

var (
	fPreload   = field(func(in *model.Inputs) *float64 { return &in.Preload })
	fAxial     = field(func(in *model.Inputs) *float64 { return &in.AxialMax })
	fTorque    = field(func(in *model.Inputs) *float64 { return &in.Torque })
	fNutFactor = field(func(in *model.Inputs) *float64 { return &in.NutFactor })
)

func mustDist(d montecarlo.Dist, err error) montecarlo.Dist {
	if err != nil {
		panic(err)
	}
	return d
}

// z999 is the two-sided 99.9 % normal quantile: the exact-value checks use
// 99.9 % intervals, so that a fixed seed fails them with probability ≈ 0.1 %
// per check.
const conf999 = 0.999

func run(t *testing.T, p *montecarlo.Problem, n int64, seed uint64, modes ...model.Mode) *montecarlo.Result {
	t.Helper()
	r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: n, Seed: seed, Confidence: conf999, Modes: modes})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func checkContains(t *testing.T, what string, iv montecarlo.Interval, exact float64) {
	t.Helper()
	if !(iv.Lo <= exact && exact <= iv.Hi) {
		t.Errorf("%s: exact %.6g outside the 99.9 %% interval [%.6g, %.6g] (estimate %.6g, %d/%d)", what, exact, iv.Lo, iv.Hi, iv.P, iv.Failures, iv.Samples)
	}
}

func TestSeparationNormalLoad(t *testing.T) {
	t.Parallel()
	// Linear margin of a normal variable: preload fixed, P ~ N(μ, σ).
	// Separation when P ≥ Fi/(1 − C): p = 1 − Φ((Fi/(1 − C) − μ)/σ)  (closed form).
	in := joint()
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "loads.axial_max", Dist: mustDist(montecarlo.NewNormal(40e3, 6e3)), Role: montecarlo.Load, Field: fAxial},
	}}
	s := model.ComputeStiffness(&in)
	exact := 1 - distuv.UnitNormal.CDF((40e3/(1-s.C)-40e3)/6e3)
	r := run(t, p, 400_000, 3)
	m, _ := r.Mode(model.Separation)
	checkContains(t, "separation", m.Interval, exact)
}

func TestSeparationLognormalRatio(t *testing.T) {
	t.Parallel()
	// Ratio of lognormals: Fi = T/(K·d) with K ~ LN(μK, σK), P ~ LN(μP, σP), T fixed.
	// Separation when P·(1 − C) ≥ T/(K·d) ⇔ ln P + ln K ≥ ln(T/(d(1 − C))):
	//   p = 1 − Φ((ln(T/(d(1 − C))) − μP − μK)/√(σP² + σK²))  (closed form,
	// lognormalCase in study_test.go).
	p, exact := lognormalCase()
	r := run(t, p, 400_000, 5)
	m, _ := r.Mode(model.Separation)
	checkContains(t, "separation (lognormal ratio)", m.Interval, exact(p.Base.Torque))
}

func TestProofUniformPreload(t *testing.T) {
	t.Parallel()
	// Uniform preload on [a, b], P fixed: proof fails when Fi + C·P ≥ Sp·As:
	//   p = (b − (Sp·As − C·P))/(b − a)  (closed form).
	in := joint()
	a, b := 50e3, 70e3
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.preload", Dist: mustDist(montecarlo.NewUniform(a, b)), Role: montecarlo.PerBolt, Field: fPreload},
	}}
	s := model.ComputeStiffness(&in)
	exact := (b - (830*in.Thread.StressArea - s.C*30e3)) / (b - a)
	r := run(t, p, 200_000, 7)
	m, _ := r.Mode(model.Proof)
	checkContains(t, "proof (uniform preload)", m.Interval, exact)
}

func TestSeveralBoltsBinomial(t *testing.T) {
	t.Parallel()
	// Each of n bolts draws its own preload; the load is fixed, so bolts fail
	// independently: P(joint) = 1 − (1 − p)^n with p the single-bolt
	// probability  (closed form). Preload ~ N(60, 4) kN, proof at Sp·As − C·P.
	in := joint()
	in.Bolts = 6
	d := mustDist(montecarlo.NewNormal(60e3, 4e3))
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{{Name: "tightening.preload", Dist: d, Role: montecarlo.PerBolt, Field: fPreload}}}
	s := model.ComputeStiffness(&in)
	pb := 1 - distuv.UnitNormal.CDF((830*in.Thread.StressArea-s.C*30e3-60e3)/4e3)
	r := run(t, p, 200_000, 11)
	m, _ := r.Mode(model.Proof)
	checkContains(t, "proof, joint of 6", m.Interval, 1-math.Pow(1-pb, 6))
	bolt := montecarlo.Wilson(m.BoltFailures, m.BoltSamples, conf999)
	checkContains(t, "proof, per bolt", bolt, pb)
	if m.BoltSamples != 6*r.Samples {
		t.Errorf("bolt evaluations %d, want 6 × %d", m.BoltSamples, r.Samples)
	}
}

func TestCopulaCorrelation(t *testing.T) {
	t.Parallel()
	// Gaussian copula: normal marginals keep Pearson correlation ρ; uniform
	// marginals get (6/π)·asin(ρ/2) (Kruskal 1958, J. Amer. Statist. Assoc. 53:814).
	c, err := montecarlo.NewCopula(2, []montecarlo.Correlation{{I: 0, J: 1, Rho: 0.7}})
	if err != nil {
		t.Fatal(err)
	}
	src := newSource(1)
	const n = 400_000
	var sxy, sx, sy, sxx, syy float64
	var uxy, ux, uy, uxx, uyy float64
	eps := make([]float64, 2)
	for range n {
		eps[0], eps[1] = src.NormFloat64(), src.NormFloat64()
		c.Mix(eps)
		x, y := eps[0], eps[1]
		sx, sy, sxy, sxx, syy = sx+x, sy+y, sxy+x*y, sxx+x*x, syy+y*y
		u, v := distuv.UnitNormal.CDF(x), distuv.UnitNormal.CDF(y)
		ux, uy, uxy, uxx, uyy = ux+u, uy+v, uxy+u*v, uxx+u*u, uyy+v*v
	}
	corr := func(sxy, sx, sy, sxx, syy float64) float64 {
		return (sxy/n - sx*sy/n/n) / math.Sqrt((sxx/n-sx*sx/n/n)*(syy/n-sy*sy/n/n))
	}
	if r := corr(sxy, sx, sy, sxx, syy); math.Abs(r-0.7) > 0.005 {
		t.Errorf("normal marginals: correlation %.4f, want 0.7", r)
	}
	want := 6 / math.Pi * math.Asin(0.35)
	if r := corr(uxy, ux, uy, uxx, uyy); math.Abs(r-want) > 0.005 {
		t.Errorf("uniform marginals: correlation %.4f, want %.4f", r, want)
	}
	if _, err := montecarlo.NewCopula(3, []montecarlo.Correlation{{0, 1, 0.9}, {0, 2, 0.9}, {1, 2, -0.9}}); err == nil {
		t.Error("want not-positive-definite error")
	}
}

func TestIntervalCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("400 runs")
	}
	t.Parallel()
	// 400 runs of 4000 samples with different seeds on the normal-load case
	// (exact p from the closed form). The count of 95 % intervals covering the
	// exact value is Binomial(400, ≈0.95); fewer than 366 (mean − 3.9σ)
	// has probability < 1e-4 under nominal coverage: the stated false-alarm rate.
	in := joint()
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "loads.axial_max", Dist: mustDist(montecarlo.NewNormal(40e3, 6e3)), Role: montecarlo.Load, Field: fAxial},
	}}
	s := model.ComputeStiffness(&in)
	exact := 1 - distuv.UnitNormal.CDF((40e3/(1-s.C)-40e3)/6e3) // ≈ 0.023
	covered := 0
	const runs = 400
	for seed := range uint64(runs) {
		r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: 4000, Seed: 1000 + seed, Workers: 1, Modes: []model.Mode{model.Separation}})
		if err != nil {
			t.Fatal(err)
		}
		iv := r.Modes[0].Interval
		if iv.Lo <= exact && exact <= iv.Hi {
			covered++
		}
	}
	t.Logf("coverage %d/%d = %.3f at p = %.4f", covered, runs, float64(covered)/runs, exact)
	if covered < 366 || covered == runs {
		t.Errorf("coverage %d/%d outside the plausible range for a 95 %% interval", covered, runs)
	}
}

func TestR1AgainstReference(t *testing.T) {
	if testing.Short() {
		t.Skip("4·10⁶ samples")
	}
	t.Parallel()
	// shared/bench README, case R1: exact probabilities by numerical
	// integration over (T, K, P): fatigue 4.52907e-2, separation 1.20344e-4,
	// proof 3.05489e-2, any of the three 5.35727e-2.
	s, err := scenario.Example("r1")
	if err != nil {
		t.Fatal(err)
	}
	r := run(t, &s.Problem, 4_000_000, 1, model.Fatigue, model.Separation, model.Proof)
	for _, c := range []struct {
		m     model.Mode
		exact float64
	}{{model.Fatigue, 4.52907e-2}, {model.Separation, 1.20344e-4}, {model.Proof, 3.05489e-2}} {
		m, _ := r.Mode(c.m)
		checkContains(t, c.m.Key(), m.Interval, c.exact)
	}
	checkContains(t, "any", r.Any, 5.35727e-2)
}

// sameForWorkers runs p with each worker count and reports any result that
// differs from the first (timing and worker count aside); it returns the
// first result.
func sameForWorkers(t *testing.T, p *montecarlo.Problem, set montecarlo.Settings, workers ...int) *montecarlo.Result {
	t.Helper()
	var first *montecarlo.Result
	for _, w := range workers {
		set.Workers = w
		r, err := montecarlo.Run(context.Background(), p, set)
		if err != nil {
			t.Fatal(err)
		}
		r.Elapsed, r.Workers = 0, 0
		if first == nil {
			first = r
		} else if !reflect.DeepEqual(first, r) {
			t.Errorf("workers %d: result differs from workers %d", w, workers[0])
		}
	}
	return first
}

func TestSameSeedAnyWorkers(t *testing.T) {
	t.Parallel()
	// Contract: the same seed gives bit-identical results for any worker count.
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	first := sameForWorkers(t, &s.Problem, montecarlo.Settings{Samples: 150_000, Seed: 9}, 1, 2, 3, 5)
	r, _ := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 150_000, Seed: 10})
	if r.Any.Failures == first.Any.Failures && r.PreloadMean == first.PreloadMean {
		t.Error("a different seed gave the same result")
	}
}

func TestLargeRunBinsSomeChunks(t *testing.T) {
	if testing.Short() {
		t.Skip("4·10⁶ samples")
	}
	t.Parallel()
	// Above 2·2²¹ samples the histograms take one chunk in k (here k = 2):
	// the failure counts still use every sample, the histograms hold exactly
	// the samples of the even chunks, the result is the same for any worker
	// count, and the percentiles agree with the exact normal quantiles to
	// within a bin.
	in := joint()
	sd := 3e3
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.preload", Dist: mustDist(montecarlo.NewNormal(40e3, sd)), Role: montecarlo.PerBolt, Field: fPreload},
	}}
	const n = 2*(1<<21) + 12345 // k = 2; a partial last chunk
	r := sameForWorkers(t, p, montecarlo.Settings{Samples: n, Seed: 4}, 1, 3)
	var binned int64 // the samples of chunks 0, 2, 4, …
	for c := int64(0); c*montecarlo.ChunkSize < n; c += 2 {
		binned += min(montecarlo.ChunkSize, n-c*montecarlo.ChunkSize)
	}
	if r.BinStride != 2 || r.Samples != n || r.Binned != binned {
		t.Fatalf("stride %d, samples %d, binned %d; want 2, %d, %d", r.BinStride, r.Samples, r.Binned, n, binned)
	}
	h := &r.Q[montecarlo.QPreload]
	if h.Total() != r.Binned {
		t.Errorf("preload histogram holds %d values, binned %d", h.Total(), r.Binned)
	}
	m, _ := r.Mode(model.Proof)
	if m.SF.Total() != r.Binned || m.Interval.Samples != n {
		t.Errorf("proof: histogram %d values, interval %d samples", m.SF.Total(), m.Interval.Samples)
	}
	// Quantiles of N(40 kN, 3 kN) (closed form), within a bin width plus
	// five standard errors of a sample quantile, √(q(1−q)/n)/φ(z)·σ.
	for _, q := range []float64{0.01, 0.5, 0.99} {
		z := distuv.UnitNormal.Quantile(q)
		want := 40e3 + sd*z
		tol := h.Width() + 5*math.Sqrt(q*(1-q)/float64(r.Binned))/distuv.UnitNormal.Prob(z)*sd
		if got := h.Quantile(q); math.Abs(got-want) > tol {
			t.Errorf("preload %g-quantile %.1f N, want %.1f ± %.1f", q, got, want, tol)
		}
	}
}

func TestNoScatterRunsEverySample(t *testing.T) {
	t.Parallel()
	// A problem without uncertain inputs is the nominal joint in every
	// sample: every sample is counted, and the modes that fail nominally
	// fail in all of them.
	in := joint()
	in.Preload = 75e3 // above the proof load Sp·As − C·P ≈ 63.9 kN
	r, err := montecarlo.Run(context.Background(), &montecarlo.Problem{Base: in}, montecarlo.Settings{Samples: 50_000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	m, _ := r.Mode(model.Proof)
	if r.Samples != 50_000 || m.Interval.Failures != 50_000 || r.Any.Failures != 50_000 {
		t.Errorf("samples %d, proof failures %d, any %d; want all 50000", r.Samples, m.Interval.Failures, r.Any.Failures)
	}
}

func TestTargetStops(t *testing.T) {
	t.Parallel()
	in := joint()
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "loads.axial_max", Dist: mustDist(montecarlo.NewNormal(40e3, 6e3)), Role: montecarlo.Load, Field: fAxial},
	}}
	r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: 50_000_000, Seed: 1, Target: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Converged || r.Samples >= 50_000_000 || r.Any.RelHalfWidth() > 0.05 {
		t.Errorf("target 5 %%: converged %v after %d samples, rel. half-width %.3f", r.Converged, r.Samples, r.Any.RelHalfWidth())
	}
}

func TestInterruptGivesPartial(t *testing.T) {
	t.Parallel()
	s, _ := scenario.Example("r1")
	ctx, cancel := context.WithCancel(context.Background())
	set := montecarlo.Settings{Samples: 1e9, Seed: 1, Workers: 2, Progress: func(done, total int64) {
		if done > 1_000_000 {
			cancel()
		}
	}}
	r, err := montecarlo.Run(ctx, &s.Problem, set)
	if !errors.Is(err, montecarlo.ErrInterrupted) || r == nil || !r.Partial {
		t.Fatalf("want a partial result and ErrInterrupted, got %v", err)
	}
	if r.Samples < 1_000_000 || r.Samples > 10_000_000 {
		t.Errorf("partial result has %d samples", r.Samples)
	}
	if r.Any.P <= 0 || math.IsNaN(r.Any.P) {
		t.Errorf("partial result has no usable estimate: %+v", r.Any)
	}
}

func TestInvalidSamplesCounted(t *testing.T) {
	t.Parallel()
	// A normal nut factor with c.o.v. 50 % goes negative in Φ(−2) ≈ 2.3 % of
	// samples: they are counted as invalid, never tallied as safe or failed.
	in := joint()
	in.Method, in.Torque, in.NutFactor = model.NutFactorMethod, 100e3, 0.2
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.nut_factor", Dist: mustDist(montecarlo.NewNormal(0.2, 0.1)), Role: montecarlo.PerBolt, Field: fNutFactor},
	}}
	r := run(t, p, 100_000, 1)
	frac := float64(r.Invalid) / 100_000
	if math.Abs(frac-distuv.UnitNormal.CDF(-2)) > 0.003 {
		t.Errorf("invalid fraction %.4f, want ≈ %.4f", frac, distuv.UnitNormal.CDF(-2))
	}
	if r.Samples+r.Invalid != 100_000 {
		t.Errorf("samples %d + invalid %d ≠ 100000", r.Samples, r.Invalid)
	}
	for _, m := range r.Modes {
		if math.IsNaN(m.Interval.P) || math.IsNaN(m.Interval.Hi) {
			t.Errorf("%s: NaN in result", m.Mode.Key())
		}
	}
}

func TestBadSettings(t *testing.T) {
	t.Parallel()
	in := joint()
	p := &montecarlo.Problem{Base: in}
	for _, s := range []montecarlo.Settings{
		{Samples: 0}, {Samples: -5}, {Samples: 2e11}, {Samples: 10, Confidence: 1}, {Samples: 10, Confidence: -0.1},
		{Samples: 10, Target: 1.5}, {Samples: 10, Workers: -1}, {Samples: 10, Modes: []model.Mode{model.Slip}},
	} {
		if _, err := montecarlo.Run(context.Background(), p, s); err == nil {
			t.Errorf("settings %+v: want error", s)
		}
	}
}

func TestWilson(t *testing.T) {
	t.Parallel()
	// Wilson score interval, 95 %: 10 of 100 → [0.0552, 0.1744] (Newcombe 1998,
	// Statistics in Medicine 17:857, Table I, method 3, values recomputed here
	// from the formula, from memory of the table).
	iv := montecarlo.Wilson(10, 100, 0.95)
	if math.Abs(iv.Lo-0.0552) > 5e-4 || math.Abs(iv.Hi-0.1744) > 5e-4 {
		t.Errorf("Wilson(10, 100) = [%.4f, %.4f], want [0.0552, 0.1744]", iv.Lo, iv.Hi)
	}
	// Zero failures: one-sided exact bound 1 − 0.05^(1/n) ≈ 3/n ("rule of three",
	// Hanley & Lippman-Hand 1983, JAMA 249:1743).
	iv = montecarlo.Wilson(0, 1_000_000, 0.95)
	if !iv.UpperOnly || iv.Lo != 0 || math.Abs(iv.Hi-2.9957e-6) > 1e-9 {
		t.Errorf("Wilson(0, 1e6) = %+v, want upper bound 2.9957e-6", iv)
	}
}
