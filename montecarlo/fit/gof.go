package fit

import (
	"math"

	"boltrisk/montecarlo"
)

// cdf2 returns F(x) and the survival S(x) = 1 − F(x) of the fitted family,
// each computed directly so that both tails keep their digits. It works on
// the plain parameters: no interface call per value.
func cdf2(kind montecarlo.Kind, p *params, x float64) (float64, float64) {
	switch kind {
	case montecarlo.Normal:
		z := (x - p.a) / p.b
		return 0.5 * math.Erfc(-z/math.Sqrt2), 0.5 * math.Erfc(z/math.Sqrt2)
	case montecarlo.LogNormal:
		if x <= 0 {
			return 0, 1
		}
		z := (math.Log(x) - p.a) / p.b
		return 0.5 * math.Erfc(-z/math.Sqrt2), 0.5 * math.Erfc(z/math.Sqrt2)
	case montecarlo.Weibull:
		if x <= 0 {
			return 0, 1
		}
		t := math.Pow(x/p.b, p.a)
		return -math.Expm1(-t), math.Exp(-t)
	case montecarlo.Uniform:
		f := math.Min(math.Max((x-p.a)/(p.b-p.a), 0), 1)
		return f, math.Min(math.Max((p.b-x)/(p.b-p.a), 0), 1)
	case montecarlo.Triangular:
		a, b, c := p.a, p.b, p.c
		switch {
		case x <= a:
			return 0, 1
		case x >= b:
			return 1, 0
		case x < c:
			f := (x - a) * (x - a) / ((b - a) * (c - a))
			return f, 1 - f
		}
		s := (b - x) * (b - x) / ((b - a) * (b - c))
		if b == c {
			s = 0
		}
		return 1 - s, s
	case montecarlo.TruncNormal:
		if x <= p.c {
			return 0, 1
		}
		if x >= p.d {
			return 1, 0
		}
		al, be, z := (p.c-p.a)/p.b, (p.d-p.a)/p.b, (x-p.a)/p.b
		lz := logMass(al, be)
		return math.Exp(logMass(al, z) - lz), math.Exp(logMass(z, be) - lz)
	}
	panic("fit: cdf of an unsupported family")
}

// tiny keeps the logarithms of the Anderson–Darling statistic finite for a
// value at or beyond the fitted support.
const tiny = 1e-300

// gofStats returns the Anderson–Darling and Kolmogorov–Smirnov statistics of
// the sorted sample s against the fitted family (Stephens, "EDF statistics
// for goodness of fit and some comparisons", JASA 69, 1974, eqs. for A² and D):
//
//	A² = −n − (1/n) Σ (2i − 1)·[ln F(x₍ᵢ₎) + ln S(x₍ₙ₊₁₋ᵢ₎)]
//	D  = max over i of max(i/n − F(x₍ᵢ₎), F(x₍ᵢ₎) − (i − 1)/n)
func gofStats(kind montecarlo.Kind, p *params, s []float64, f, sv []float64) (ad, ks float64) {
	n := len(s)
	fn := float64(n)
	for i, x := range s {
		f[i], sv[i] = cdf2(kind, p, x)
		if d := float64(i+1)/fn - f[i]; d > ks {
			ks = d
		}
		if d := f[i] - float64(i)/fn; d > ks {
			ks = d
		}
	}
	var sum float64
	for i := range n {
		sum += float64(2*i+1) * (math.Log(math.Max(f[i], tiny)) + math.Log(math.Max(sv[n-1-i], tiny)))
	}
	return -fn - sum/fn, ks
}
