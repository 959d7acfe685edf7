package fit

import (
	"errors"
	"math"
	"strings"
	"testing"

	"boltrisk/montecarlo"
)

// Families that need positive values refuse the others by name; the
// default set leaves them out with a note.
func TestPositiveFamiliesRefuseNonPositive(t *testing.T) {
	t.Parallel()
	x := []float64{-1.5, 0.3, 2.2, 1.1, 0.8, 1.9, 0.1}
	for _, k := range []montecarlo.Kind{montecarlo.LogNormal, montecarlo.Weibull} {
		_, _, err := Estimate(k, x, nil)
		if err == nil || !strings.Contains(err.Error(), k.String()+": value -1.5 is not > 0") {
			t.Errorf("%v of negative values: %v", k, err)
		}
		if _, err := Analyze(x, Options{Families: []montecarlo.Kind{montecarlo.Normal, k}}); err == nil || !strings.Contains(err.Error(), k.String()) {
			t.Errorf("%v named for negative values: %v", k, err)
		}
		if _, _, err := Estimate(k, []float64{0, 1, 2}, nil); err == nil {
			t.Errorf("%v of a zero value: no error", k)
		}
	}
	r, err := Analyze(x, Options{Bootstrap: 19})
	if err != nil {
		t.Fatal(err)
	}
	if r.Candidate(montecarlo.LogNormal) != nil || !strings.Contains(strings.Join(r.Notes, "\n"), "lognormal not fitted: lognormal: value -1.5") {
		t.Errorf("default families on negative data: notes %q", r.Notes)
	}
	noNaN(t, r)
}

func TestBadArguments(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4}
	for _, c := range []struct {
		name string
		err  error
		want string
	}{
		{"one value", func() error { _, err := Analyze([]float64{1}, Options{}); return err }(), "at least 2"},
		{"two values", func() error { _, err := Analyze([]float64{1, 2}, Options{}); return err }(), "at least 3"},
		{"constant", func() error { _, err := Analyze([]float64{2, 2, 2}, Options{}); return err }(), "constant"},
		{"huge", func() error { _, err := Analyze([]float64{1, 2, 1e200}, Options{}); return err }(), "another unit"},
		{"NaN", func() error { _, _, err := Estimate(montecarlo.Normal, []float64{1, math.NaN()}, nil); return err }(), "finite"},
		{"confidence", func() error { _, err := Analyze(x, Options{Confidence: 1.5}); return err }(), "confidence 1.5"},
		{"fixed family", func() error { _, _, err := Estimate(montecarlo.Fixed, x, nil); return err }(), "cannot fit the fixed family"},
		{"twice", func() error {
			_, err := Analyze(x, Options{Families: []montecarlo.Kind{montecarlo.Normal, montecarlo.Normal}})
			return err
		}(), "named twice"},
		{"truncnormal without bounds", func() error { _, _, err := Estimate(montecarlo.TruncNormal, x, nil); return err }(), "needs the truncation bounds"},
		{"value outside bounds", func() error { _, _, err := Estimate(montecarlo.TruncNormal, x, &Bounds{2, 10}); return err }(), "value 1 lies below the lower bound 2"},
		{"bounds reversed", func() error { _, _, err := Estimate(montecarlo.TruncNormal, x, &Bounds{10, 0}); return err }(), "must be below"},
		{"triangular of 2", func() error { _, _, err := Estimate(montecarlo.Triangular, []float64{1, 2}, nil); return err }(), "at least 3"},
	} {
		if c.err == nil || !strings.Contains(c.err.Error(), c.want) {
			t.Errorf("%s: %v, want an error with %q", c.name, c.err, c.want)
		}
	}
}

// Values piled at both ends of the bounds have no truncated-normal maximum
// at finite parameters (the best is a flat parent, σ → ∞).
func TestTruncNormalNoMaximum(t *testing.T) {
	t.Parallel()
	x := []float64{0.01, 0.02, 0.04, 0.05, 0.07, 0.1, 0.9, 0.92, 0.95, 0.97, 0.98, 0.99}
	_, _, err := Estimate(montecarlo.TruncNormal, x, &Bounds{0, 1})
	if !errors.Is(err, ErrNoMaximum) {
		t.Errorf("U-shaped data: %v, want ErrNoMaximum", err)
	}
	r, err := Analyze(x, Options{Bounds: &Bounds{0, 1}, Bootstrap: 19})
	if err != nil {
		t.Fatal(err)
	}
	if r.Candidate(montecarlo.TruncNormal) != nil || !strings.Contains(strings.Join(r.Notes, "\n"), "truncnormal not fitted") {
		t.Errorf("default families: truncnormal kept or not noted: %q", r.Notes)
	}
}

// Awkward samples give finite numbers or a clear error, never NaN.
func TestNeverNaN(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		x    []float64
	}{
		{"three values", []float64{1, 2, 4}},
		{"tiny spread", []float64{1e9, 1e9 + 1e-3, 1e9 + 2e-3, 1e9 + 5e-3, 1e9 + 1e-2}},
		{"large", []float64{1e90, 2e90, 3e90, 5e90, 8e90}},
		{"small", []float64{1e-90, 2e-90, 3e-90, 5e-90, 8e-90}},
		{"ties", []float64{1, 1, 1, 1, 2, 2, 2, 2}},
		{"outlier", []float64{10, 10.1, 10.2, 9.9, 9.8, 10.05, 1000}},
		{"wide", []float64{1e-3, 1, 1e3, 1e6, 1e9}},
	} {
		r, err := Analyze(c.x, Options{Bootstrap: 49, Seed: 1, Bounds: &Bounds{0, math.Inf(1)}})
		if err != nil {
			t.Logf("%s: %v", c.name, err)
			continue
		}
		t.Run(c.name, func(t *testing.T) { noNaN(t, r) })
		for _, cd := range r.Candidates {
			if pp, err := Probability(c.x, cd.Dist, 0, Quantity{}); err == nil {
				for _, b := range pp.Band {
					if math.IsNaN(b.Lo+b.Hi+b.P) || b.Lo > b.Hi {
						t.Errorf("%s %v: band point %+v", c.name, cd.Family, b)
						break
					}
				}
			}
		}
	}
}

func TestLogMassTails(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ a, b, want float64 }{
		// (computed: ln(Φ(b) − Φ(a)) with mpmath-free closed forms)
		{math.Inf(-1), math.Inf(1), 0},
		{math.Inf(-1), 0, math.Log(0.5)},
		{0, math.Inf(1), math.Log(0.5)},
		// Q(40) ≈ φ(40)/40·(1 − 1/40² + 3/40⁴): ln = −800 − ln(40√(2π)) + ln(1 − 1/1600 + …)
		{40, math.Inf(1), -800 - math.Log(40*math.Sqrt(2*math.Pi)) + math.Log1p(-1.0/1600+3.0/(1600*1600))},
		{-math.Inf(1), -40, -800 - math.Log(40*math.Sqrt(2*math.Pi)) + math.Log1p(-1.0/1600+3.0/(1600*1600))},
	} {
		if got := logMass(c.a, c.b); math.Abs(got-c.want) > 1e-9*math.Max(1, math.Abs(c.want)) {
			t.Errorf("logMass(%g, %g) = %.12g, want %.12g", c.a, c.b, got, c.want)
		}
	}
	// Across the switch to the series at z = 30 the two forms agree.
	if d := logQ(29.999999) - logQ(30.000001); math.Abs(d-30*2e-6) > 1e-6 {
		t.Errorf("logQ jumps at 30: difference %g", d)
	}
}

func TestLargeSampleSkipsBootstrap(t *testing.T) {
	t.Parallel()
	x := sample(must(montecarlo.NewNormal(30e3, 3e3)), LargeN+1, 4)
	r, err := Analyze(x, Options{Families: []montecarlo.Kind{montecarlo.Normal, montecarlo.LogNormal}})
	if err != nil {
		t.Fatal(err)
	}
	if r.Bootstrap != 0 || r.Candidates[0].AD.HasP || !strings.Contains(strings.Join(r.Notes, " "), "no bootstrap by default") {
		t.Errorf("large sample: %d replicates, notes %q", r.Bootstrap, r.Notes)
	}
	noNaN(t, r)
}

// A bounded family that wins AIC on a small series is not the one put into
// a scenario: the recommendation is the best open-tailed family.
func TestRecommendedIsOpenTailed(t *testing.T) {
	// The demo nut factors of testdata/fit/torque-tension-demo.csv (invented).
	k := []float64{0.187, 0.213, 0.198, 0.221, 0.176, 0.205, 0.192, 0.230, 0.201, 0.184, 0.209, 0.195}
	r, err := Analyze(k, Options{Bootstrap: -1})
	if err != nil {
		t.Fatal(err)
	}
	if r.Best().Family != montecarlo.Uniform {
		t.Fatalf("best by AIC is %v; the test expects the uniform to win on this series", r.Best().Family)
	}
	if got := r.Recommended().Family; !OpenTailed(got) {
		t.Errorf("recommended %v, want an open-tailed family", got)
	}
}
