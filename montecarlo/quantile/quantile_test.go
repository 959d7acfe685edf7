package quantile_test

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat"

	"boltrisk/montecarlo/quantile"
)

// levels are the reported percentile levels of the tool.
var levels = []float64{0.01, 0.05, 0.5, 0.95, 0.99}

// checkBound checks the rank-error contract against gonum's empirical
// quantile (the inverse of the empirical CDF) of the stored values: the
// reported value lies between the empirical quantiles at p ± RankError, and
// RankError is at most eps.
func checkBound(t *testing.T, name string, h *quantile.Sketch, sorted []float64, eps float64) {
	t.Helper()
	for _, p := range levels {
		q := h.Quantile(p)
		if q.RankError > eps {
			t.Errorf("%s: p = %g: rank error %.2g above %.2g", name, p, q.RankError, eps)
		}
		lo := stat.Quantile(math.Max(p-q.RankError, 1e-12), stat.Empirical, sorted, nil)
		hi := stat.Quantile(math.Min(p+q.RankError, 1), stat.Empirical, sorted, nil)
		if !(lo <= q.Value && q.Value <= hi) {
			t.Errorf("%s: p = %g: %.6g outside the empirical quantiles [%.6g, %.6g] at p ± %.2g", name, p, q.Value, lo, hi, q.RankError)
		}
	}
}

func TestRankErrorAgainstEmpiricalQuantiles(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(3, 5))
	cases := []struct {
		name string
		draw func() float64
		eps  float64
	}{
		{"normal", func() float64 { return 50e3 + 5e3*rnd.NormFloat64() }, 1e-3},
		{"lognormal sigma 1", func() float64 { return math.Exp(rnd.NormFloat64()) }, 1e-3},
		// 1/K with K normal at 30 % c.o.v.: the preload of a torqued bolt
		// with a normal nut factor, the heavy-tailed case of issue 11.
		{"reciprocal of a 30 % normal", func() float64 {
			k := 0.2 + 0.06*rnd.NormFloat64()
			if k <= 0 {
				return math.NaN()
			}
			return 1 / k
		}, 1e-3},
		// The bound holds always; its size for the heaviest tails and for
		// atoms mixed with other values needs the second pass (TestRefine).
		{"Cauchy", func() float64 { return math.Tan(math.Pi * (rnd.Float64() - 0.5)) }, 3e-3},
		{"atom at zero", func() float64 { return math.Max(0, 1+rnd.NormFloat64()*2) }, 1},
		{"constant", func() float64 { return 7 }, 0},
	}
	for _, c := range cases {
		pilot := make([]float64, 4096)
		for i := range pilot {
			pilot[i] = c.draw()
		}
		h := quantile.FromPilot(pilot, quantile.Bins)
		var vals []float64
		for range 200_000 {
			x := c.draw()
			h.Add(x)
			if !math.IsNaN(x) {
				vals = append(vals, x)
			} else {
				vals = append(vals, math.Inf(1)) // NaN counts above the range, like +Inf
			}
		}
		slices.Sort(vals)
		checkBound(t, c.name, &h, vals, c.eps)
	}
}

func TestMergeIsOrderFree(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(1, 2))
	base := quantile.New(0, 1, -3, 3, 64)
	parts := make([]quantile.Sketch, 5)
	for i := range parts {
		parts[i] = base.Empty()
		for range 1000 {
			parts[i].Add(3 * rnd.NormFloat64())
		}
	}
	a, b := base.Empty(), base.Empty()
	for i := range parts {
		a.Merge(&parts[i])
		b.Merge(&parts[len(parts)-1-i])
	}
	if !slices.Equal(a.Counts, b.Counts) || a.Under != b.Under || a.OverMax != b.OverMax {
		t.Error("merge depends on order")
	}
	if a.Total() != 5000 {
		t.Errorf("total %d", a.Total())
	}
}

func TestTransformRoundTrip(t *testing.T) {
	t.Parallel()
	h := quantile.New(10, 2, -20, 20, 16)
	for _, x := range []float64{-1e9, -1e3, -3, 8, 10, 11.5, 12, 13, 1e3, 1e12} {
		if got := h.X(h.T(x)); math.Abs(got-x) > 1e-9*math.Max(1, math.Abs(x)) {
			t.Errorf("X(T(%g)) = %g", x, got)
		}
	}
	// Monotone.
	prev := math.Inf(-1)
	for x := -100.0; x < 100; x += 0.37 {
		if tt := h.T(x); !(tt > prev) {
			t.Fatalf("T not increasing at %g", x)
		} else {
			prev = tt
		}
	}
}

func TestBarsKeepCounts(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(9, 9))
	pilot := make([]float64, 4096)
	for i := range pilot {
		pilot[i] = rnd.NormFloat64()
	}
	h := quantile.FromPilot(pilot, quantile.Bins)
	for range 100_000 {
		h.Add(rnd.NormFloat64())
	}
	lo, hi := h.Range()
	bars := h.Bars(lo, math.Nextafter(hi, math.Inf(1)), 60)
	sum := 0.0
	for _, b := range bars {
		sum += b.Count
	}
	if got := sum + float64(h.Under+h.Over); math.Abs(got-100_000) > 1e-6 {
		t.Errorf("bars hold %.3f values, want 100000", got)
	}
	// A bar over [−0.5, 0.5) holds about 38.3 % of a standard normal.
	share := 0.0
	for _, b := range h.Bars(-0.5, 0.5, 1) {
		share += b.Count / 100_000
	}
	if math.Abs(share-0.3829) > 0.01 {
		t.Errorf("share in [−0.5, 0.5): %.4f", share)
	}
}

func TestRefine(t *testing.T) {
	t.Parallel()
	// A second pass over the same values resolves an atom mixed with other
	// values in one bin: 30 % of the values are exactly 0.
	draw := func(rnd *rand.Rand) float64 { return math.Max(0, 1+rnd.NormFloat64()*2) }
	rnd := rand.New(rand.NewPCG(4, 4))
	pilot := make([]float64, 4096)
	for i := range pilot {
		pilot[i] = draw(rnd)
	}
	h := quantile.FromPilot(pilot, quantile.Bins)
	var vals []float64
	pass := func(f func(float64)) {
		rnd := rand.New(rand.NewPCG(8, 8)) // the same stream: the same values
		for range 100_000 {
			f(draw(rnd))
		}
	}
	pass(func(x float64) { h.Add(x); vals = append(vals, x) })
	slices.Sort(vals)
	q := h.Quantile(0.01)
	if q.RankError < 0.01 {
		t.Fatalf("the atom should make the first pass loose, rank error %g", q.RankError)
	}
	for q.RankError > 1e-3 {
		fine := quantile.Refine(q.Cell, quantile.Bins)
		pass(func(x float64) {
			if fine.Contains(x) {
				fine.Add(x)
			}
		})
		if fine.Total() != q.Cell.Count {
			t.Fatalf("second pass saw %d values, the cell holds %d", fine.Total(), q.Cell.Count)
		}
		q = fine.QuantileWithin(0.01, q.Cell.Below, h.Total())
	}
	if q.Value != 0 || q.RankError != 0 {
		t.Errorf("refined 1 %% point %g (rank error %g), want exactly 0", q.Value, q.RankError)
	}
	if want := stat.Quantile(0.01, stat.Empirical, vals, nil); q.Value != want {
		t.Errorf("refined %g, empirical %g", q.Value, want)
	}
}
