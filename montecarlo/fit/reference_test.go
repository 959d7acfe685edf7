package fit

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo"
)

// Check values for the ball-bearing lives of Lieblein & Zelen (1956), 23
// values in millions of revolutions (testdata/fit/README.md).
//
// Published: Weibull MLE shape 2.10, scale 81.9 (Lawless, Statistical Models
// and Methods for Lifetime Data, 2nd ed., 2003, the ball-bearing example;
// from memory). The other values: (computed: SciPy 1.10.1 on the same 23
// values — the Weibull profile equation solved by brentq to 1e-15
// (weibull_min.fit with floc=0 stops at 2.10206, 81.8783), lognorm.fit
// with floc=0, numpy mean/std,
// kstest against the fitted lognormal, the A² formula on the fitted CDFs,
// truncnorm.logpdf maximised by Nelder–Mead, triang.logpdf maximised by
// Nelder–Mead from every order statistic as the mode).
func TestLiebleinZelenFits(t *testing.T) {
	t.Parallel()
	x := lz(t)
	if len(x) != 23 {
		t.Fatalf("%d values, want 23", len(x))
	}
	for _, c := range []struct {
		kind        montecarlo.Kind
		bounds      *Bounds
		a, b, c, ll float64
		tol         float64
	}{
		{montecarlo.Weibull, nil, 2.1020588752, 81.878334052, 0, -113.69129093, 1e-9},
		{montecarlo.LogNormal, nil, 4.1504544939, 0.52164933405, 0, -113.12856674, 1e-9},
		{montecarlo.Normal, nil, 72.224347826, 36.664669385, 0, -115.47729916, 1e-9},
		{montecarlo.TruncNormal, &Bounds{0, 1000}, 68.085911494, 40.536327374, 0, -114.71864722, 1e-6},
		{montecarlo.TruncNormal, &Bounds{0, math.Inf(1)}, 68.085911494, 40.536327374, 0, -114.71864722, 1e-6},
		{montecarlo.TruncNormal, &Bounds{15, 180}, 52.684673481, 51.774858688, 0, -112.99776602, 1e-6},
		// triangular: lower, upper, mode
		{montecarlo.Triangular, nil, 10.054524, 185.076169, 42.12, -113.16283857, 1e-5},
	} {
		d, ll, err := Estimate(c.kind, x, c.bounds)
		if err != nil {
			t.Fatalf("%v: %v", c.kind, err)
		}
		what := c.kind.String()
		near(t, what+" A", d.A, c.a, c.tol)
		near(t, what+" B", d.B, c.b, c.tol)
		if c.kind == montecarlo.Triangular {
			near(t, what+" mode", d.C, c.c, c.tol)
		}
		near(t, what+" log-likelihood", ll, c.ll, 1e-9)
	}
	// The published rounding of the Weibull fit (Lawless 2003; from memory).
	d, _, _ := Estimate(montecarlo.Weibull, x, nil)
	if math.Round(d.A*100)/100 != 2.10 || math.Round(d.B*10)/10 != 81.9 {
		t.Errorf("weibull %.4g, %.4g does not round to the published 2.10, 81.9", d.A, d.B)
	}
}

func TestLiebleinZelenGoodnessOfFit(t *testing.T) {
	t.Parallel()
	r, err := Analyze(lz(t), Options{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	noNaN(t, r)
	ln := r.Candidate(montecarlo.LogNormal)
	// KS of the fitted lognormal: 0.0898 (computed: scipy.stats.kstest,
	// SciPy 1.10.1; D = 0.089787).
	near(t, "KS lognormal", ln.KS.Stat, 0.08978695441, 1e-8)
	// A² of the fitted lognormal, normal and Weibull (computed: Stephens'
	// A² formula with SciPy 1.10.1 CDFs at the MLE).
	near(t, "AD lognormal", ln.AD.Stat, 0.18881503565, 1e-8)
	near(t, "AD normal", r.Candidate(montecarlo.Normal).AD.Stat, 0.61086015696, 1e-8)
	near(t, "AD weibull", r.Candidate(montecarlo.Weibull).AD.Stat, 0.32860975292, 1e-8)
	near(t, "KS weibull", r.Candidate(montecarlo.Weibull).KS.Stat, 0.15108756259, 1e-8)
	// AIC = 2k − 2ℓ (computed from the SciPy log-likelihoods above):
	// lognormal 230.2571 < Weibull 231.3826 < normal 234.9546.
	near(t, "AIC lognormal", ln.AIC, 230.25713347, 1e-9)
	near(t, "BIC lognormal", ln.BIC, 232.52812191, 1e-9)
	if r.Best().Family != montecarlo.LogNormal || r.Candidate(montecarlo.Weibull).DeltaAIC > 1.2 {
		t.Errorf("best by AIC is %v, want lognormal narrowly ahead of Weibull", r.Best().Family)
	}
	// The lognormal and Weibull fits are not rejected; the uniform is.
	if ln.AD.P < 0.2 || r.Candidate(montecarlo.Uniform).AD.P > 0.05 {
		t.Errorf("AD p-values: lognormal %g, uniform %g", ln.AD.P, r.Candidate(montecarlo.Uniform).AD.P)
	}
}

// The posterior predictive of the log lives (computed: scipy.stats.t with
// n − 1 = 22 d.o.f., location mean ln x = 4.150454, scale s·√(1 + 1/n),
// s the sample sd of ln x with divisor n − 1, SciPy 1.10.1).
func TestLiebleinZelenPredictive(t *testing.T) {
	t.Parallel()
	x := lz(t)
	p, err := NewPredictive(montecarlo.LogNormal, x)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "P(X < 20) predictive", p.CDF(20), 0.022791131093, 1e-7)
	near(t, "1 % predictive quantile", p.Quantile(0.01), 16.180494987, 1e-7)
	near(t, "survival + CDF", p.Survival(20)+p.CDF(20), 1, 1e-14)
	// The plug-in lognormal with the MLE σ is lighter in the tail: 0.0134.
	d, _, _ := Estimate(montecarlo.LogNormal, x, nil)
	near(t, "P(X < 20) plug-in", d.CDF(20), 0.013428202863, 1e-7)
	if p.DF != 22 {
		t.Errorf("d.o.f. %g, want 22", p.DF)
	}
	if _, err := NewPredictive(montecarlo.Weibull, x); err == nil {
		t.Error("weibull predictive: want an error")
	}
	if _, err := NewPredictive(montecarlo.LogNormal, []float64{1, -2, 3}); err == nil {
		t.Error("lognormal predictive of a negative value: want an error")
	}
	// Normal data: the same t on x itself.
	q, _ := NewPredictive(montecarlo.Normal, x)
	tt := distuv.StudentsT{Mu: 72.224347826, Sigma: 37.488697427 * math.Sqrt(1+1.0/23), Nu: 22}
	near(t, "normal predictive quantile", q.Quantile(0.05), tt.Quantile(0.05), 1e-8)
}

// gonum's distuv.Normal.Fit (a conjugate update from an empty prior) gives
// the maximum-likelihood estimates: the same mean and sd (divisor n).
func TestNormalAgreesWithGonum(t *testing.T) {
	t.Parallel()
	x := lz(t)
	var g distuv.Normal
	g.Fit(x, nil)
	d, _, _ := Estimate(montecarlo.Normal, x, nil)
	near(t, "mean", d.A, g.Mu, 1e-14)
	near(t, "sd", d.B, g.Sigma, 1e-13)
	// and the lognormal is the normal of ln x.
	lx := make([]float64, len(x))
	for i, v := range x {
		lx[i] = math.Log(v)
	}
	g.Fit(lx, nil)
	l, _, _ := Estimate(montecarlo.LogNormal, x, nil)
	near(t, "lognormal μ", l.A, g.Mu, 1e-14)
	near(t, "lognormal σ", l.B, g.Sigma, 1e-13)
}

// BenchmarkAnalyze fits the five default families to the 23 lives with the
// default 999 bootstrap replicates each.
func BenchmarkAnalyze(b *testing.B) {
	x := lz(b)
	for b.Loop() {
		if _, err := Analyze(x, Options{Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}
