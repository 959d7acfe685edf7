package life

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"boltrisk/model/fatigue"
	"boltrisk/montecarlo/rng"

	"gonum.org/v1/gonum/stat/distuv"
)

// The A3 case of reference-data-2 (computed): an M12 bolt rolled before heat
// treatment (VDI 2230-1 curve, not confirmed against the published text) at
// σa = 60 MPa whose strength is log-normal with median σASV = 48.875 MPa and
// c.o.v. 0.10. Then ln N ~ Normal(ln N50, 3ζ) below ND = 2·10⁶ and the life
// is +Inf for strengths ≥ σa, so R(N) is flat at R(ND) = 0.019896 beyond ND.
var a3Zeta = math.Sqrt(math.Log(1.01))

// a3Reliability returns the closed-form R(N) of the A3 case.
func a3Reliability(n float64) float64 {
	r, _ := a3.Reliability(min(n, fatigue.VDIKneeCycles))
	return r
}

// simulateA3 adds n simulated lives of the A3 case, drawn from src.
func simulateA3(t testing.TB, a *Accumulator, n int, src *rand.Rand) {
	t.Helper()
	v, err := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	if err != nil {
		t.Fatal(err)
	}
	c := fatigue.Cycle{Amplitude: 60}
	for range n {
		s, err := v.Scaled(math.Exp(a3Zeta * src.NormFloat64()))
		if err != nil {
			t.Fatal(err)
		}
		l, err := s.Life(c)
		if err != nil {
			t.Fatal(err) // a life below 10⁴ needs a strength 15.6 sd below the median
		}
		a.Add(l.Cycles)
	}
}

func gridIndex(t testing.TB, a *Accumulator, n float64) int {
	t.Helper()
	for j, g := range a.points {
		if math.Abs(g/n-1) < 1e-12 {
			return j
		}
	}
	t.Fatalf("%g is not a grid point", n)
	return 0
}

// Simulated lives reproduce the closed form: R(N) at three grid points and
// the design-life failure probability lie within their 99.9 % intervals,
// and B10 lies between its 99.9 % lower and upper bounds. False-alarm rate
// for an arbitrary seed ≤ 0.6 % (union bound: four two-sided 99.9 %
// intervals and two one-sided 99.9 % bounds); the seed here is fixed.
func TestSimulatedLognormalLife(t *testing.T) {
	t.Parallel()
	const n, conf = 200_000, 0.999
	a := mustAcc(t, DefaultGrid, 5e5)
	simulateA3(t, a, n, rand.New(rand.NewPCG(rng.StreamSeed(2024, 1))))
	curve, err := a.Reliability(conf)
	if err != nil {
		t.Fatal(err)
	}
	for _, nn := range []float64{math.Pow(10, 5.7), 1e6, math.Pow(10, 6.5)} {
		p := curve[gridIndex(t, a, nn)]
		want := a3Reliability(p.Cycles)
		if !(p.Lower <= want && want <= p.Upper) {
			t.Errorf("R(%.4g): closed form %.6f outside [%.6f, %.6f] (estimate %.6f)", p.Cycles, want, p.Lower, p.Upper, p.Reliability)
		}
	}
	// beyond ND the curve is flat: R(10^6.5) = R(10^12) (reference-data-2 A3: 0.019896)
	if flat, top := curve[gridIndex(t, a, math.Pow(10, 6.5))], curve[len(curve)-1]; flat.Failures != top.Failures {
		t.Errorf("R not flat beyond ND: %d vs %d failures", flat.Failures, top.Failures)
	}
	d, _ := a.DesignFailure(conf)
	if want := 1 - a3Reliability(5e5); !(d.Lower <= want && want <= d.Upper) { // 1 − 0.995011
		t.Errorf("P(life ≤ 5e5): closed form %.6f outside [%.6f, %.6f]", want, d.Lower, d.Upper)
	}
	b, err := a.BLife(0.1, conf)
	if err != nil {
		t.Fatal(err)
	}
	if want := 7.36683e5; !(b.Lower <= want && want <= b.Upper) { // reference-data-2 A3
		t.Errorf("B10 %.6g outside [%.6g, %.6g]", want, b.Lower, b.Upper)
	}
}

// acceptance returns the range [lo, hi] of a Bin(trials, p) count outside
// which each tail has probability ≤ tail.
func acceptance(trials int, p, tail float64) (lo, hi int) {
	b := distuv.Binomial{N: float64(trials), P: p}
	for lo = 0; lo < trials && b.CDF(float64(lo)) <= tail; lo++ {
	}
	for hi = trials; hi > 0 && 1-b.CDF(float64(hi-1)) <= tail; hi-- {
	}
	return lo, hi
}

// cpCoverage returns the exact coverage probability of the two-sided
// Clopper–Pearson interval for a true probability q with n trials.
func cpCoverage(n int64, q, conf float64) float64 {
	b := distuv.Binomial{N: float64(n), P: q}
	var c float64
	for x := int64(0); x <= n; x++ {
		lo, hi, _ := ClopperPearson(x, n, conf)
		if lo <= q && q <= hi {
			c += b.Prob(float64(x))
		}
	}
	return c
}

// Over many seeds, the 95 % intervals cover the closed-form R(N) and the
// 95 % lower bound covers the closed-form B10 at their exact coverage rates
// (computed for the test's n and grid; ≥ 0.95 by construction). Each of the
// four checks has a false-alarm rate ≤ 10⁻³ (two tails of 5·10⁻⁴ of the
// binomial count of covering seeds), ≤ 4·10⁻³ together.
func TestCoverageOverSeeds(t *testing.T) {
	if testing.Short() {
		t.Skip("statistical test: 6·10⁶ simulated lives")
	}
	t.Parallel()
	const seeds, n, conf = 3000, 1000, 0.95
	b10, _ := a3.BLife(0.1) // closed form (reference-data-2 A3: 7.36683e5)
	fine := Grid{MinExp: 5, MaxExp: 7, PerDecade: 1000}
	def := mustAcc(t, DefaultGrid, 5e5)
	fin := mustAcc(t, fine, 5e5)
	rN := []float64{math.Pow(10, 5.7), 1e6}
	var coverR [2]int
	var coverDef, coverFine int
	for s := range seeds {
		def.Reset()
		simulateA3(t, def, n, rand.New(rand.NewPCG(rng.StreamSeed(77, uint64(s)))))
		fin.Reset()
		simulateA3(t, fin, n, rand.New(rand.NewPCG(rng.StreamSeed(77, uint64(s))))) // the same lives on the fine grid
		for i, nn := range rN {
			j := gridIndex(t, def, nn)
			lo, hi, _ := ClopperPearson(def.FailuresBy(j), n, conf)
			if q := 1 - a3Reliability(def.points[j]); lo <= q && q <= hi {
				coverR[i]++
			}
		}
		if b, _ := def.BLife(0.1, conf); b.Lower <= b10 {
			coverDef++
		}
		if b, _ := fin.BLife(0.1, conf); b.Lower <= b10 {
			coverFine++
		}
	}
	check := func(what string, got int, exact float64) {
		t.Helper()
		lo, hi := acceptance(seeds, exact, 5e-4)
		t.Logf("%s: covered %d of %d (%.4f), exact coverage %.4f, accepted %d…%d", what, got, seeds, float64(got)/seeds, exact, lo, hi)
		if got < lo || got > hi {
			t.Errorf("%s: covered %d of %d, outside %d…%d for exact coverage %.4f", what, got, seeds, lo, hi, exact)
		}
	}
	for i, nn := range rN {
		j := gridIndex(t, def, nn)
		check(fmt.Sprintf("R interval at N = %.4g", def.points[j]), coverR[i], cpCoverage(n, 1-a3Reliability(def.points[j]), conf))
	}
	// the grid bound's exact coverage: Lower ≤ B10 ⇔ the r-th smallest life ≤ g_{a+1}, the first grid point above B10
	r, rc := LowerRank(n, 0.1, conf)
	if r != 85 {
		t.Fatalf("rank %d, want 85 (reference-data-2 A5)", r)
	}
	for _, g := range []struct {
		name string
		acc  *Accumulator
		got  int
	}{{"B10 lower bound, default grid (100 per decade)", def, coverDef}, {"B10 lower bound, 1000 per decade", fin, coverFine}} {
		up := g.acc.points[0]
		for _, p := range g.acc.points {
			if p > b10 {
				up = p
				break
			}
		}
		exact := binomAtLeast(n, r, 1-a3Reliability(up))
		if exact < rc {
			t.Fatalf("%s: grid coverage %.4f below the order statistic's %.4f", g.name, exact, rc)
		}
		check(g.name, g.got, exact)
	}
}
