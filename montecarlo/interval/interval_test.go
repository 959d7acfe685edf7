package interval_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo/interval"
)

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.6g, want %.6g (±%.2g %%)", what, got, want, 100*rel)
	}
}

func TestIntervalsAtOneMillion(t *testing.T) {
	t.Parallel()
	// 95 % intervals for k failures in n = 10⁶ (shared/reliability-methods.md
	// §2.8, computed there with SciPy; 4 significant digits).
	for _, test := range []struct {
		k                    int64
		wLo, wHi, cpLo, cpHi float64
	}{
		{1, 1.765e-7, 5.665e-6, 2.53e-8, 5.572e-6},
		{5, 2.136e-6, 1.171e-5, 1.623e-6, 1.167e-5},
		{20, 1.295e-5, 3.089e-5, 1.222e-5, 3.089e-5},
		{100, 8.223e-5, 1.216e-4, 8.136e-5, 1.216e-4},
	} {
		lo, hi := interval.WilsonInterval(test.k, 1e6, 0.95)
		near(t, "Wilson lo", lo, test.wLo, 2e-3)
		near(t, "Wilson hi", hi, test.wHi, 2e-3)
		lo, hi = interval.ClopperPearson(test.k, 1e6, 0.95)
		near(t, "Clopper–Pearson lo", lo, test.cpLo, 3e-3)
		near(t, "Clopper–Pearson hi", hi, test.cpHi, 2e-3)
	}
	// No failure: the one-sided 95 % bound 2.996e-6 (same table), 1 − 0.05^(1/n).
	e := interval.Proportion(0, 1e6, 0.95, interval.Auto)
	if !e.UpperOnly() || e.Lo != 0 || !math.IsInf(e.COV, 1) {
		t.Errorf("k = 0: %+v", e)
	}
	near(t, "one-sided bound", e.Hi, 2.996e-6, 1e-3)
	// Wilson 10 of 100 at 95 %: [0.0552, 0.1744] (Newcombe 1998, Statist.
	// Med. 17:857–872, Table I, method 3; from memory, recomputed here).
	lo, hi := interval.WilsonInterval(10, 100, 0.95)
	near(t, "Wilson 10/100 lo", lo, 0.0552, 1e-3)
	near(t, "Wilson 10/100 hi", hi, 0.1744, 1e-3)
}

func TestAutoMethod(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		k    int64
		m    interval.Method
		want interval.Kind
	}{
		{0, interval.Auto, interval.KindOneSided},
		{0, interval.Wilson, interval.KindOneSided},
		{1, interval.Auto, interval.KindExact},
		{19, interval.Auto, interval.KindExact},
		{20, interval.Auto, interval.KindWilson},
		{20, interval.Exact, interval.KindExact},
		{3, interval.Wilson, interval.KindWilson},
	} {
		if got := interval.Proportion(test.k, 1000, 0.95, test.m).Kind; got != test.want {
			t.Errorf("k = %d, %v: %s, want %s", test.k, test.m, got.Name(), test.want.Name())
		}
	}
	// c.o.v. of the crude estimator √((1 − p)/(n·p)).
	e := interval.Proportion(100, 1e6, 0.95, interval.Auto)
	near(t, "c.o.v.", e.COV, math.Sqrt((1-1e-4)/100), 1e-12)
}

func TestExactCoverage(t *testing.T) {
	// The Clopper–Pearson interval covers at least its nominal rate for
	// every p (Clopper & Pearson 1934): exact binomial sum over k for n = 200
	// at p = 0.01, 0.03, 0.1 — no sampling, so no false alarms.
	t.Parallel()
	for _, p := range []float64{0.01, 0.03, 0.1} {
		const n = 200
		bin := distuv.Binomial{N: n, P: p}
		cover := 0.0
		for k := int64(0); k <= n; k++ {
			lo, hi := interval.ClopperPearson(k, n, 0.95)
			if lo <= p && p <= hi {
				cover += bin.Prob(float64(k))
			}
		}
		if cover < 0.95 {
			t.Errorf("p = %g: coverage %.4f below 0.95", p, cover)
		}
	}
}

func TestFromCOV(t *testing.T) {
	t.Parallel()
	// Log-normal estimator with c.o.v. 10 %: s = √ln(1.01), the bounds
	// straddle p and their geometric mean is p·e^(−s²/2).
	lo, hi := interval.FromCOV(1e-7, 0.1, 0.95)
	s2 := math.Log(1.01)
	near(t, "geometric mean", math.Sqrt(lo*hi), 1e-7*math.Exp(-s2/2), 1e-12)
	near(t, "upper/lower", hi/lo, math.Exp(2*1.959964*math.Sqrt(s2)), 1e-6)
}

func TestPairedDifference(t *testing.T) {
	t.Parallel()
	// Unpaired square-and-add interval for 56/70 − 48/80 at 95 %:
	// [0.0524, 0.3339] (Newcombe 1998, Statist. Med. 17:873–890, Table II,
	// method 10; from memory, equal to the value computed from the formula).
	lo, hi := interval.UnpairedDifference(56, 70, 48, 80, 0.95)
	near(t, "unpaired lo", lo, 0.0524, 2e-3)
	near(t, "unpaired hi", hi, 0.3339, 1e-3)
	// Paired table (both 10, variant only 15, base only 5, neither 20):
	// D = 0.2, [0.025838, 0.356937] (computed from Newcombe 1998,
	// Statist. Med. 17:2635–2650, method 10, with the corrected φ as
	// transcribed in R packages diffdepprop and biostatUZH: secondary source).
	d := interval.PairedDifference(interval.Pairs{N: 50, Both: 10, OnlyVariant: 15, OnlyBase: 5}, 0.95)
	near(t, "D", d.D, 0.2, 1e-12)
	near(t, "paired lo", d.Lo, 0.025838, 1e-4)
	near(t, "paired hi", d.Hi, 0.356937, 1e-4)
	// Both 1, variant only 1, base only 7, neither 12 (the Bentur et al. 2009
	// table of Fagerland, Lydersen & Laake 2017, ch. 8): D = −0.285714,
	// [−0.506920, −0.025559] (computed likewise).
	d = interval.PairedDifference(interval.Pairs{N: 21, Both: 1, OnlyVariant: 1, OnlyBase: 7}, 0.95)
	near(t, "paired lo", d.Lo, -0.506920, 1e-5)
	near(t, "paired hi", d.Hi, -0.025559, 1e-4)
	// McNemar exact: 1 vs 7 discordant: 2·P(X ≤ 1 | 8, ½) = 2·9/256 = 0.0703125.
	near(t, "McNemar p", d.PValue, 0.0703125, 1e-9)
	// No discordant pair: D = 0, p-value 1, an interval of positive width.
	d = interval.PairedDifference(interval.Pairs{N: 1000, Both: 30}, 0.95)
	if d.D != 0 || d.PValue != 1 || !(d.Lo < 0 && d.Hi > 0) {
		t.Errorf("no discordant pairs: %+v", d)
	}
}

func TestPairedCoverage(t *testing.T) {
	// Coverage of the paired interval over 2000 simulated tables (n = 2000,
	// marginals 0.02 and 0.03, strongly associated outcomes): near the
	// nominal 95 %; the test fails below 93 % or above 98.5 % (the binomial
	// sd of the observed rate is 0.5 %: false alarm ≈ 10⁻⁴).
	if testing.Short() {
		t.Skip("statistical")
	}
	t.Parallel()
	rnd := rand.New(rand.NewPCG(7, 11))
	const n, reps = 2000, 2000
	// Cell probabilities: both 0.015, base only 0.005, variant only 0.015.
	pb, pv, pboth := 0.005, 0.015, 0.015
	covered := 0
	for range reps {
		var pr interval.Pairs
		pr.N = n
		for range n {
			u := rnd.Float64()
			switch {
			case u < pboth:
				pr.Both++
			case u < pboth+pb:
				pr.OnlyBase++
			case u < pboth+pb+pv:
				pr.OnlyVariant++
			}
		}
		d := interval.PairedDifference(pr, 0.95)
		if truth := pv - pb; d.Lo <= truth && truth <= d.Hi {
			covered++
		}
	}
	if rate := float64(covered) / reps; rate < 0.93 || rate > 0.985 {
		t.Errorf("coverage %.3f", rate)
	}
}
