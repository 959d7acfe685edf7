package montecarlo_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"boltrisk/montecarlo"
)

func newSource(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, seed^0x5bd1e995)) }

func TestDistSampling(t *testing.T) {
	t.Parallel()
	// Sample moments and the CDF at the quartiles agree with gonum's distuv
	// (general-purpose reference library) for every family.
	for _, test := range []struct {
		name string
		d    montecarlo.Dist
	}{
		{"normal", mustDist(montecarlo.NewNormal(120, 4.8))},
		{"lognormal", mustDist(montecarlo.NewLogNormalMoments(0.2, 0.024))},
		{"uniform", mustDist(montecarlo.NewUniform(0.08, 0.16))},
		{"triangular", mustDist(montecarlo.NewTriangular(10, 12, 20))},
		{"weibull", mustDist(montecarlo.NewWeibull(3.5, 180))},
		{"weibull moments", mustDist(montecarlo.NewWeibullMoments(162, 0.1))},
		{"truncnormal", mustDist(montecarlo.NewTruncNormal(0.14, 0.03, 0.1, 0.2))},
	} {
		r := newSource(42)
		const n = 400_000
		var s, ss float64
		below := [3]int{}
		q := [3]float64{test.d.Quantile(0.25), test.d.Quantile(0.5), test.d.Quantile(0.75)}
		for range n {
			var x float64
			if test.d.NeedsNormal() {
				x = test.d.FromNormal(r.NormFloat64())
			} else {
				x = test.d.FromUniform(r.Float64())
			}
			s += x
			ss += x * x
			for i := range q {
				if x <= q[i] {
					below[i]++
				}
			}
		}
		mean := s / n
		sd := math.Sqrt(ss/n - mean*mean)
		if math.Abs(mean-test.d.Mean()) > 5*test.d.StdDev()/math.Sqrt(n) {
			t.Errorf("%s: sample mean %.6g, want %.6g", test.name, mean, test.d.Mean())
		}
		if math.Abs(sd/test.d.StdDev()-1) > 0.01 {
			t.Errorf("%s: sample sd %.6g, want %.6g", test.name, sd, test.d.StdDev())
		}
		for i, p := range []float64{0.25, 0.5, 0.75} {
			if f := float64(below[i]) / n; math.Abs(f-p) > 0.004 {
				t.Errorf("%s: F(Q(%.2f)) = %.4f", test.name, p, f)
			}
			if c := test.d.CDF(q[i]); math.Abs(c-p) > 1e-9 {
				t.Errorf("%s: CDF(Quantile(%.2f)) = %.9f", test.name, p, c)
			}
		}
	}
}

func TestWeibullMoments(t *testing.T) {
	t.Parallel()
	d := mustDist(montecarlo.NewWeibullMoments(162, 0.1))
	if math.Abs(d.Mean()-162) > 1e-6 || math.Abs(d.StdDev()/d.Mean()-0.1) > 1e-6 {
		t.Errorf("Weibull from moments: mean %g, c.o.v. %g", d.Mean(), d.StdDev()/d.Mean())
	}
}

func TestDistErrors(t *testing.T) {
	t.Parallel()
	for name, f := range map[string]func() error{
		"normal sd 0":       func() error { _, err := montecarlo.NewNormal(1, 0); return err },
		"normal sd < 0":     func() error { _, err := montecarlo.NewNormal(1, -1); return err },
		"lognormal mean ≤0": func() error { _, err := montecarlo.NewLogNormalMoments(-1, 1); return err },
		"uniform lo ≥ hi":   func() error { _, err := montecarlo.NewUniform(2, 2); return err },
		"triangle mode":     func() error { _, err := montecarlo.NewTriangular(1, 5, 3); return err },
		"weibull shape":     func() error { _, err := montecarlo.NewWeibull(0, 1); return err },
		"trunc bounds":      func() error { _, err := montecarlo.NewTruncNormal(0, 1, 50, 60); return err },
		"normal NaN":        func() error { _, err := montecarlo.NewNormal(math.NaN(), 1); return err },
	} {
		if f() == nil {
			t.Errorf("%s: want error", name)
		}
	}
}

func TestShiftedScaled(t *testing.T) {
	t.Parallel()
	for _, d := range []montecarlo.Dist{
		mustDist(montecarlo.NewNormal(100, 5)), mustDist(montecarlo.NewLogNormalMoments(0.2, 0.03)),
		mustDist(montecarlo.NewUniform(1, 3)), mustDist(montecarlo.NewTriangular(1, 2, 4)),
		mustDist(montecarlo.NewWeibull(4, 10)),
	} {
		s, err := d.Shifted(2 * d.Mean())
		if err != nil || math.Abs(s.Mean()-2*d.Mean()) > 1e-9*d.Mean() {
			t.Errorf("%v Shifted: mean %g, want %g (%v)", d.Kind, s.Mean(), 2*d.Mean(), err)
		}
		c, err := d.Scaled(0.5)
		if err != nil || math.Abs(c.StdDev()-0.5*d.StdDev()) > 1e-6*d.StdDev() || math.Abs(c.Mean()-d.Mean()) > 1e-9*d.Mean() {
			t.Errorf("%v Scaled: sd %g, want %g (%v)", d.Kind, c.StdDev(), 0.5*d.StdDev(), err)
		}
	}
}
