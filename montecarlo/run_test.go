package montecarlo_test

import (
	"context"
	"errors"
	"math"
	"reflect"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/problemtest"
	"boltrisk/montecarlo/scenario"
)

var (
	joint      = problemtest.Joint
	fPreload   = problemtest.Preload
	fAxial     = problemtest.Axial
	fNutFactor = problemtest.NutFactor
	mustDist   = problemtest.Must
)

const conf999 = problemtest.Conf999

func run(t *testing.T, p *montecarlo.Problem, n int64, seed uint64, modes ...model.Mode) *montecarlo.Result {
	t.Helper()
	r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: n, Seed: seed, Confidence: conf999, Modes: modes})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func checkContains(t *testing.T, what string, iv interval.Estimate, exact float64) {
	t.Helper()
	problemtest.Contains(t, what, iv, exact)
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
	checkContains(t, "separation", m.Estimate, exact)
}

func TestSeparationLognormalRatio(t *testing.T) {
	t.Parallel()
	// Ratio of lognormals: Fi = T/(K·d) with K ~ LN(μK, σK), P ~ LN(μP, σP), T fixed.
	// Separation when P·(1 − C) ≥ T/(K·d) ⇔ ln P + ln K ≥ ln(T/(d(1 − C))):
	//   p = 1 − Φ((ln(T/(d(1 − C))) − μP − μK)/√(σP² + σK²))  (closed form,
	// problemtest.LognormalSeparation).
	p, exact := problemtest.LognormalSeparation()
	r := run(t, p, 400_000, 5)
	m, _ := r.Mode(model.Separation)
	checkContains(t, "separation (lognormal ratio)", m.Estimate, exact(p.Base.Torque))
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
	checkContains(t, "proof (uniform preload)", m.Estimate, exact)
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
	checkContains(t, "proof, joint of 6", m.Estimate, 1-math.Pow(1-pb, 6))
	bolt := m.Bolt
	checkContains(t, "proof, per bolt", bolt, pb)
	if m.Bolt.Samples != 6*r.Samples {
		t.Errorf("bolt evaluations %d, want 6 × %d", m.Bolt.Samples, r.Samples)
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
		iv := r.Modes[0].Estimate
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
	s, err := scenario.Example("bench-m12")
	if err != nil {
		t.Fatal(err)
	}
	r := run(t, &s.Problem, 4_000_000, 1, model.Fatigue, model.Separation, model.Proof)
	for _, c := range []struct {
		m     model.Mode
		exact float64
	}{{model.Fatigue, 4.52907e-2}, {model.Separation, 1.20344e-4}, {model.Proof, 3.05489e-2}} {
		m, _ := r.Mode(c.m)
		checkContains(t, c.m.Key(), m.Estimate, c.exact)
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
		t.Skip("2·10⁶ samples")
	}
	t.Parallel()
	// Above 2·2²⁰ samples the sketches take one chunk in k (here k = 2):
	// the failure counts still use every sample, the sketches hold exactly
	// the samples of the even chunks, the result is the same for any worker
	// count, and the percentiles agree with the exact normal quantiles.
	in := joint()
	sd := 3e3
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.preload", Dist: mustDist(montecarlo.NewNormal(40e3, sd)), Role: montecarlo.PerBolt, Field: fPreload},
	}}
	const n = 2*(1<<20) + 12345 // k = 2; a partial last chunk
	r := sameForWorkers(t, p, montecarlo.Settings{Samples: n, Seed: 4}, 1, 3)
	var binned int64 // the samples of chunks 0, 2, 4, …
	for c := int64(0); c*montecarlo.ChunkSize < n; c += 2 {
		binned += min(montecarlo.ChunkSize, n-c*montecarlo.ChunkSize)
	}
	if r.BinStride != 2 || r.Samples != n || r.Binned != binned {
		t.Fatalf("stride %d, samples %d, binned %d; want 2, %d, %d", r.BinStride, r.Samples, r.Binned, n, binned)
	}
	d := &r.Quantities[montecarlo.QPreload]
	if d.Sketch.Total() != r.Binned {
		t.Errorf("preload sketch holds %d values, binned %d", d.Sketch.Total(), r.Binned)
	}
	m, _ := r.Mode(model.Proof)
	if m.SF.Sketch.Total() != r.Binned || m.Estimate.Samples != n {
		t.Errorf("proof: sketch %d values, estimate %d samples", m.SF.Sketch.Total(), m.Estimate.Samples)
	}
	// Quantiles of N(40 kN, 3 kN) (closed form), within the rank error plus
	// five standard errors of a sample quantile, √(q(1−q)/n)/φ(z)·σ.
	for i, q := range montecarlo.Levels {
		z := distuv.UnitNormal.Quantile(q)
		want := 40e3 + sd*z
		pc := d.Percentiles[i]
		if pc.RankError > montecarlo.RankTolerance {
			t.Errorf("preload %g: rank error %g", q, pc.RankError)
		}
		tol := (pc.RankError + 5*math.Sqrt(q*(1-q)/float64(r.Binned))) / distuv.UnitNormal.Prob(z) * sd
		if got := pc.Value; math.Abs(got-want) > tol {
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
	if r.Samples != 50_000 || m.Estimate.Failures != 50_000 || r.Any.Failures != 50_000 {
		t.Errorf("samples %d, proof failures %d, any %d; want all 50000", r.Samples, m.Estimate.Failures, r.Any.Failures)
	}
}

func TestPrecisionStops(t *testing.T) {
	t.Parallel()
	in := joint()
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "loads.axial_max", Dist: mustDist(montecarlo.NewNormal(40e3, 6e3)), Role: montecarlo.Load, Field: fAxial},
	}}
	r, err := montecarlo.Run(context.Background(), p, montecarlo.Settings{Samples: 50_000_000, Seed: 1, Precision: 0.02, Modes: []model.Mode{model.Separation, model.Proof}})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Converged || r.Samples >= 50_000_000 || r.Any.COV > 0.02 {
		t.Errorf("precision 2 %%: converged %v after %d samples, c.o.v. %.4f", r.Converged, r.Samples, r.Any.COV)
	}
	for _, m := range r.Modes {
		if m.Estimate.Failures > 0 && m.Estimate.COV > 0.02 {
			t.Errorf("%s: c.o.v. %.4f", m.Mode, m.Estimate.COV)
		}
	}
}

func TestInterruptGivesPartial(t *testing.T) {
	t.Parallel()
	s, _ := scenario.Example("bench-m12")
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
		if math.IsNaN(m.Estimate.P) || math.IsNaN(m.Estimate.Hi) {
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
		{Samples: 10, Precision: 1.5}, {Samples: 10, Workers: -1}, {Samples: 10, Modes: []model.Mode{model.Slip}},
	} {
		if _, err := montecarlo.Run(context.Background(), p, s); err == nil {
			t.Errorf("settings %+v: want error", s)
		}
	}
}
