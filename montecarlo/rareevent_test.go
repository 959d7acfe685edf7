package montecarlo_test

import (
	"context"
	"math"
	"reflect"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/problemtest"
	"boltrisk/montecarlo/scenario"
)

// within checks an estimate against an exact value within k reported c.o.v.
func within(t *testing.T, what string, p, cov, exact, k float64) {
	t.Helper()
	if !(math.Abs(math.Log(p/exact)) <= k*cov) {
		t.Errorf("%s: %.5g, exact %.5g: %.2f c.o.v. off (c.o.v. %.3g)", what, p, exact, math.Abs(math.Log(p/exact))/cov, cov)
	}
}

// lognormalSeparation at torque t: problemtest's closed form.
func lognormalAt(torque float64) (*montecarlo.Problem, float64) {
	p, exact := problemtest.LognormalSeparation()
	p.Base.Torque = torque
	return p, exact(torque)
}

func TestRareLognormalSeparation(t *testing.T) {
	t.Parallel()
	// The ratio of lognormals has an exact separation probability
	// (problemtest.LognormalSeparation); at the torques where it is 10⁻⁶
	// and 10⁻⁹ importance sampling and subset simulation must find it
	// within 3 reported c.o.v. (issue 12; false alarm ≈ 0.3 % per check for
	// near-normal log estimates).
	p0, _ := problemtest.LognormalSeparation()
	for _, target := range []float64{1e-6, 1e-9} {
		torque := problemtest.LognormalSeparationTorque(p0, target)
		p, exact := lognormalAt(torque)
		for _, m := range []montecarlo.Method{montecarlo.Importance, montecarlo.Subset} {
			if m == montecarlo.Subset && target < 1e-8 {
				continue // subset simulation is weak on ratios of lognormals at 10⁻⁹ (montecarlo/rare docs)
			}
			r, err := montecarlo.Estimate(context.Background(), p, montecarlo.Settings{Samples: 1e6, Seed: 3, Method: m, Modes: []model.Mode{model.Separation}, ProbabilitiesOnly: true})
			if err != nil {
				t.Fatal(err)
			}
			sep, _ := r.Mode(model.Separation)
			within(t, m.String()+" separation", sep.Estimate.P, sep.Estimate.COV, exact, 3)
			t.Logf("%s at %.0e: %.4g (exact %.4g), c.o.v. %.3f, %d evaluations", m, target, sep.Estimate.P, exact, sep.Estimate.COV, r.Evaluations)
		}
	}
}

func TestRareIndependentBolts(t *testing.T) {
	t.Parallel()
	// n identical bolts, each drawing its own preload, with a fixed load:
	// "any bolt separates" = 1 − (1 − p)ⁿ with p the one-bolt probability
	// (independent events, closed form); at p ≈ 10⁻⁸, n = 8.
	in := problemtest.Joint()
	in.Bolts = 8
	c := model.ComputeStiffness(&in).C
	// Preload ~ N(μ, σ) per bolt; separation when Fi ≤ (1 − Φ)·P.
	const mu, sd = 40e3, 4e3
	beta := 5.612 // Φ(−5.612) ≈ 1e-8
	in.AxialMax = (mu - beta*sd) / (1 - c)
	p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
		{Name: "tightening.preload", Dist: problemtest.Must(montecarlo.NewNormal(mu, sd)), Role: montecarlo.PerBolt, Field: problemtest.Preload},
	}}
	pb := distuv.UnitNormal.CDF(-beta)
	exact := -math.Expm1(8 * math.Log1p(-pb))
	r, err := montecarlo.Estimate(context.Background(), p, montecarlo.Settings{Samples: 1e6, Seed: 5, Method: montecarlo.Importance, Modes: []model.Mode{model.Separation}, ProbabilitiesOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	within(t, "any of 8 bolts", r.Any.P, r.Any.COV, exact, 3)
	if n := len(r.Rare.DesignPoints); n != 8 {
		t.Errorf("%d design points, want one per bolt (8)", n)
	}
}

func TestRareBenchAnyMode(t *testing.T) {
	if testing.Short() {
		t.Skip("several thousand evaluations per method")
	}
	t.Parallel()
	// The benchmark case's any-mode probability 5.35727e-2 and separation
	// 1.20344e-4 (shared/bench README, by quadrature).
	s, _ := scenario.Example("bench-m12")
	modes := []model.Mode{model.Fatigue, model.Separation, model.Proof}
	for _, m := range []montecarlo.Method{montecarlo.Importance, montecarlo.Subset} {
		r, err := montecarlo.Estimate(context.Background(), &s.Problem, montecarlo.Settings{Samples: 1e7, Seed: 2, Method: m, Modes: modes, ProbabilitiesOnly: true})
		if err != nil {
			t.Fatal(err)
		}
		within(t, m.String()+" any", r.Any.P, r.Any.COV, 5.35727e-2, 3)
		sep, _ := r.Mode(model.Separation)
		within(t, m.String()+" separation", sep.Estimate.P, sep.Estimate.COV, 1.20344e-4, 3)
	}
}

func TestAutoChooses(t *testing.T) {
	t.Parallel()
	// A common failure goes to crude Monte Carlo, a rare one to importance
	// sampling; the note says why.
	p, _ := lognormalAt(100e3) // separation ≈ 2 %
	r, err := montecarlo.Estimate(context.Background(), p, montecarlo.Settings{Samples: 1e6, Seed: 1, Method: montecarlo.Auto})
	if err != nil || r.Method != "crude" || r.MethodNote == "" {
		t.Errorf("common failure: method %s (%q), %v", r.Method, r.MethodNote, err)
	}
	p0, _ := problemtest.LognormalSeparation()
	p, _ = lognormalAt(problemtest.LognormalSeparationTorque(p0, 1e-7))
	r, err = montecarlo.Estimate(context.Background(), p, montecarlo.Settings{Samples: 1e6, Seed: 1, Method: montecarlo.Auto, Modes: []model.Mode{model.Separation}})
	if err != nil || r.Method != "importance" {
		t.Errorf("rare failure: method %s (%q), %v", r.Method, r.MethodNote, err)
	}
	if !r.HasDistributions() || r.Rare.PercentileSamples == 0 {
		t.Error("a rare-event run must still give percentiles from a crude pass")
	}
}

func TestRareSameForWorkers(t *testing.T) {
	t.Parallel()
	s, _ := scenario.Example("cover-flange")
	for _, m := range []montecarlo.Method{montecarlo.Importance, montecarlo.Subset} {
		var first *montecarlo.Result
		for _, w := range []int{1, 2, 3} {
			r, err := montecarlo.Estimate(context.Background(), &s.Problem, montecarlo.Settings{Samples: 1e6, Seed: 4, Workers: w, Method: m,
				Modes: []model.Mode{model.Separation}, ProbabilitiesOnly: true})
			if err != nil {
				t.Fatal(err)
			}
			r.Elapsed, r.Workers = 0, 0
			if first == nil {
				first = r
			} else if !reflect.DeepEqual(first.Any, r.Any) || !reflect.DeepEqual(first.Modes, r.Modes) {
				t.Errorf("%s: workers %d differ", m, w)
			}
		}
	}
}

// coverFlangeAt returns the cover-flange example with the axial load mean
// set to mean (c.o.v. 10 % kept), separation only.
func coverFlangeAt(t *testing.T, mean float64) *montecarlo.Problem {
	t.Helper()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	p := s.Problem
	p.Vars = append([]montecarlo.Var(nil), p.Vars...)
	for i := range p.Vars {
		if p.Vars[i].Name == "loads.axial_max" {
			p.Vars[i].Dist = problemtest.Must(montecarlo.NewNormal(mean, 0.1*mean))
		}
	}
	p.Base.AxialMax = mean
	return &p
}

func TestRareCoverFlangeUnbiased(t *testing.T) {
	if testing.Short() {
		t.Skip("20 seeds")
	}
	t.Parallel()
	// Cover flange with the load mean at 11.5 kN: any of the 8 bolts
	// separates with probability 1.0127e-7 (quadrature over the shared load,
	// shared/bench/cf8_sep_quad.py 11500). Over 20 seeds the mean estimate
	// lies within 2 of its c.o.v.s (c.o.v./√20) of the exact value (issue
	// 12; false alarm ≈ 5 %, 2σ: re-run with another seed block before
	// doubting the method), and the observed spread matches the reported
	// c.o.v. within a factor 1.5 (20 seeds: the sample sd's own c.o.v. is
	// about 16 %).
	p := coverFlangeAt(t, 11.5e3)
	const exact, n = 1.0127e-7, 20
	var sum, ssq, covs float64
	for seed := range uint64(n) {
		r, err := montecarlo.Estimate(context.Background(), p, montecarlo.Settings{Samples: 1e6, Seed: 100 + seed, Method: montecarlo.Importance,
			Modes: []model.Mode{model.Separation}, ProbabilitiesOnly: true})
		if err != nil {
			t.Fatal(err)
		}
		sum += r.Any.P
		ssq += r.Any.P * r.Any.P
		covs += r.Any.COV
	}
	mean, cov := sum/n, covs/n
	spread := math.Sqrt(ssq/n-mean*mean) / mean
	t.Logf("mean %.5g (exact %.5g), observed spread %.3f, mean reported c.o.v. %.3f", mean, exact, spread, cov)
	if math.Abs(mean/exact-1) > 2*cov/math.Sqrt(n) {
		t.Errorf("mean over %d seeds %.5g, exact %.5g: off by more than 2 c.o.v. of the mean", n, mean, exact)
	}
	if spread/cov > 1.5 || cov/spread > 1.5 {
		t.Errorf("observed spread %.3f vs reported c.o.v. %.3f", spread, cov)
	}
}
