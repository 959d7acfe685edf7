package rng

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestZigguratConstants(t *testing.T) {
	// Re-derive Marsaglia & Tsang's constants from the layer equations with
	// f(x) = Exp(−x²/2): the base layer holds r·f(r) plus the tail
	// ∫ᵣ^∞ f = √(2π)·Q(r) (gonum's normal survival function as reference),
	// and the recursion from r upwards must close the top layer,
	// x₁·(1 − f(x₁)) = v.
	f := func(x float64) float64 { return math.Exp(-x * x / 2) }
	v := zigR*f(zigR) + math.Sqrt(2*math.Pi)*distuv.UnitNormal.Survival(zigR)
	if math.Abs(v/zigV-1) > 1e-12 {
		t.Errorf("base layer area %.15g, want v = %.15g", v, zigV)
	}
	x := zigR
	for range zigLayers - 2 {
		x = math.Sqrt(-2 * math.Log(zigV/x+f(x)))
	}
	if top := x * (1 - f(x)); math.Abs(top/zigV-1) > 1e-8 {
		t.Errorf("top layer area %.10g, want %.10g", top, zigV)
	}
	if zigF[0] != 1 || zigK[1] != 0 || zigW[zigLayers-1]*zigScale != zigR {
		t.Errorf("table ends: f[0] %g, k[1] %d, w[127]·2⁵³ %g", zigF[0], zigK[1], zigW[zigLayers-1]*zigScale)
	}
}

func TestNormalsDistribution(t *testing.T) {
	// 2²¹ draws against the standard normal CDF (gonum distuv):
	// Kolmogorov–Smirnov √n·D below 1.95, the 0.1 % critical value of the
	// Kolmogorov distribution (common practice); the share beyond the
	// ziggurat's tail start r and beyond 4 (both drawn by the slow path)
	// within 4.5 binomial standard errors of the exact 2·Q(x).
	const n = 1 << 21
	var p rand.PCG
	p.Seed(1, 2)
	z := make([]float64, n)
	Normals(&p, z[:n/2], 1)
	Normals(&p, z[n/2:], 2) // strided, as the runner fills its rows
	Normals(&p, z[n/2+1:], 2)
	var sum, ssq float64
	for _, x := range z {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			t.Fatalf("non-finite draw %g", x)
		}
		sum += x
		ssq += x * x
	}
	mean, variance := sum/n, ssq/n-(sum/n)*(sum/n)
	// Standard errors: 1/√n for the mean, √(2/n) for the variance.
	if math.Abs(mean) > 4.5/math.Sqrt(n) || math.Abs(variance-1) > 4.5*math.Sqrt(2.0/n) {
		t.Errorf("mean %.3g, variance %.5g", mean, variance)
	}
	slices.Sort(z)
	d := 0.0
	for i, x := range z {
		c := distuv.UnitNormal.CDF(x)
		d = math.Max(d, math.Max(float64(i+1)/n-c, c-float64(i)/n))
	}
	if ks := math.Sqrt(n) * d; ks > 1.95 {
		t.Errorf("Kolmogorov–Smirnov √n·D = %.3f, above the 0.1 %% critical value 1.95", ks)
	}
	for _, lim := range []float64{zigR, 4} {
		k := 0
		for _, x := range z {
			if math.Abs(x) > lim {
				k++
			}
		}
		q := 2 * distuv.UnitNormal.Survival(lim)
		if se := math.Sqrt(q * (1 - q) / n); math.Abs(float64(k)/n-q) > 4.5*se {
			t.Errorf("P(|Z| > %g) = %.4g, want %.4g ± %.2g", lim, float64(k)/n, q, se)
		}
	}
}

func TestUnitOpen(t *testing.T) {
	// The extreme 64-bit draws map strictly inside (0, 1).
	for _, u := range []uint64{0, 1 << 12, math.MaxUint64, math.MaxUint64 - 1<<12} {
		x := (float64(u>>12) + 0.5) * 0x1p-52
		if !(x > 0 && x < 1) {
			t.Errorf("draw %#x maps to %g", u, x)
		}
	}
	var p rand.PCG
	for range 1000 {
		if x := Unit(&p); !(x > 0 && x < 1) {
			t.Fatalf("unit %g", x)
		}
	}
}

func TestExp(t *testing.T) {
	// Against math.Exp (the reference): relative error at most 2⁻⁵¹ inside
	// the table range, identical results outside it.
	worst := 0.0
	check := func(x float64) {
		got, want := Exp(x), math.Exp(x)
		if math.Abs(x) >= 700 || math.IsNaN(x) {
			if !(got == want || math.IsNaN(got) && math.IsNaN(want)) {
				t.Errorf("Exp(%g) = %g, math.Exp %g", x, got, want)
			}
			return
		}
		worst = math.Max(worst, math.Abs(got-want)/want)
	}
	var p rand.PCG
	p.Seed(3, 4)
	for range 1 << 20 {
		check(-700 + 1400*Unit(&p))
		check(-3 + 6*Unit(&p)) // the range of lognormal draws
	}
	for _, x := range []float64{0, math.Copysign(0, -1), 1, -1, math.Ln2, 1e-300, -1e-300, 699.99, -699.99, 700, -700,
		709.78, 710, -745, -746, math.Inf(1), math.Inf(-1), math.NaN()} {
		check(x)
	}
	if worst > 0x1p-51 {
		t.Errorf("largest relative error %.3g, want ≤ 2⁻⁵¹ = %.3g", worst, 0x1p-51)
	}
	if Exp(0) != 1 {
		t.Errorf("Exp(0) = %v", Exp(0))
	}
}

// BenchmarkVariates compares the runner's variates with the standard
// library's (the figures quoted in variates.go).
func BenchmarkVariates(b *testing.B) {
	col := make([]float64, 256)
	var p rand.PCG
	r := rand.New(&p)
	per := func(b *testing.B) {
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(col)), "ns/value")
	}
	b.Run("normals", func(b *testing.B) {
		for b.Loop() {
			Normals(&p, col, 1)
		}
		per(b)
	})
	b.Run("NormFloat64", func(b *testing.B) {
		for b.Loop() {
			for j := range col {
				col[j] = r.NormFloat64()
			}
		}
		per(b)
	})
	Normals(&p, col, 1)
	out := make([]float64, len(col))
	b.Run("exp", func(b *testing.B) {
		for b.Loop() {
			for j, z := range col {
				out[j] = Exp(-1.6 + 0.12*z)
			}
		}
		per(b)
	})
	b.Run("math.Exp", func(b *testing.B) {
		for b.Loop() {
			for j, z := range col {
				out[j] = math.Exp(-1.6 + 0.12*z)
			}
		}
		per(b)
	})
}
