package fit

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"boltrisk/montecarlo"
)

// Bounds are the truncation bounds of a truncated normal, in internal
// units; an open side is ±Inf.
type Bounds struct{ Lower, Upper float64 }

// ErrNoMaximum is returned when the likelihood of a family has no maximum at
// finite parameters for the data (a truncated normal whose parent runs off
// to infinity).
var ErrNoMaximum = errors.New("the likelihood has no maximum at finite parameters")

// params are a family's estimates in the layout of montecarlo.Dist (A, B,
// C, D) and the log-likelihood at the maximum.
type params struct {
	a, b, c, d float64
	ll         float64
}

// scratch is per-worker memory of the estimators.
type scratch struct {
	w []float64 // triangular: ln(b − x)
}

// nParams is the number of estimated parameters of a family.
func nParams(k montecarlo.Kind) int {
	if k == montecarlo.Triangular {
		return 3
	}
	return 2
}

// Estimate fits family kind to x (any order) and returns the fitted
// distribution and the log-likelihood at the maximum. Normal, lognormal,
// Weibull and truncated normal are maximum-likelihood fits; uniform takes
// the minimum-variance unbiased endpoints (its log-likelihood is that of
// the maximum, at the sample minimum and maximum); triangular is the
// maximum-likelihood fit with the mode at an order statistic. bounds are
// used by TruncNormal only (nil: the family is refused).
func Estimate(kind montecarlo.Kind, x []float64, bounds *Bounds) (montecarlo.Dist, float64, error) {
	if err := checkValues(x); err != nil {
		return montecarlo.Dist{}, 0, err
	}
	s := slices.Clone(x)
	slices.Sort(s)
	if err := admissible(kind, s, bounds); err != nil {
		return montecarlo.Dist{}, 0, err
	}
	p, err := estimate(kind, s, bounds, &scratch{})
	if err != nil {
		return montecarlo.Dist{}, 0, err
	}
	d, err := toDist(kind, p, bounds)
	return d, p.ll, err
}

// maxMagnitude bounds the data so that squares, products and moments of
// the fits stay finite.
const maxMagnitude = 1e100

// checkValues refuses too few, non-finite or constant values.
func checkValues(x []float64) error {
	if len(x) < 2 {
		return fmt.Errorf("fit: %d values: a fit needs at least 2", len(x))
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("fit: value %d is %v: values must be finite", i+1, v)
		}
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo == hi {
		return fmt.Errorf("fit: all %d values are %g: a constant sample has no scatter to fit", len(x), lo)
	}
	for _, v := range x {
		if a := math.Abs(v); a > maxMagnitude || a != 0 && a < 1/maxMagnitude {
			return fmt.Errorf("fit: value %g lies outside the magnitudes the fits handle (10⁻¹⁰⁰ … 10¹⁰⁰): express the data in another unit", v)
		}
	}
	return nil
}

// admissible says whether family kind can be fitted to the sorted sample.
func admissible(kind montecarlo.Kind, s []float64, bounds *Bounds) error {
	n := len(s)
	switch kind {
	case montecarlo.LogNormal, montecarlo.Weibull:
		if s[0] <= 0 {
			return fmt.Errorf("fit: %s: value %g is not > 0; a %s quantity is positive (drop %s from the families, or fit normal or truncnormal)", kind, s[0], kind, kind)
		}
	case montecarlo.TruncNormal:
		if bounds == nil {
			return fmt.Errorf("fit: truncnormal needs the truncation bounds (lower and/or upper)")
		}
		lo, hi := bounds.Lower, bounds.Upper
		if math.IsNaN(lo) || math.IsNaN(hi) || !(lo < hi) || math.IsInf(lo, 1) || math.IsInf(hi, -1) {
			return fmt.Errorf("fit: truncnormal: lower bound %g must be below upper bound %g", lo, hi)
		}
		if s[0] < lo {
			return fmt.Errorf("fit: truncnormal: value %g lies below the lower bound %g", s[0], lo)
		}
		if s[n-1] > hi {
			return fmt.Errorf("fit: truncnormal: value %g lies above the upper bound %g", s[n-1], hi)
		}
	case montecarlo.Triangular:
		if n < 3 {
			return fmt.Errorf("fit: triangular: %d values; its 3 parameters need at least 3", n)
		}
	case montecarlo.Normal, montecarlo.Uniform:
	default:
		return fmt.Errorf("fit: cannot fit the %s family (allowed: normal, lognormal, weibull, truncnormal, uniform, triangular)", kind)
	}
	return nil
}

// estimate fits kind to the sorted, admissible sample s.
func estimate(kind montecarlo.Kind, s []float64, bounds *Bounds, sc *scratch) (params, error) {
	switch kind {
	case montecarlo.Normal:
		m, sd := meanSD(s, false)
		return params{a: m, b: sd, ll: normalLL(len(s), sd)}, nil
	case montecarlo.LogNormal:
		m, sd := meanSD(s, true)
		var sl float64
		for _, v := range s {
			sl += math.Log(v)
		}
		return params{a: m, b: sd, ll: normalLL(len(s), sd) - sl}, nil
	case montecarlo.Weibull:
		return weibullMLE(s)
	case montecarlo.Uniform:
		return uniformFit(s), nil
	case montecarlo.Triangular:
		return triangularMLE(s, sc)
	case montecarlo.TruncNormal:
		return truncNormalMLE(s, *bounds)
	}
	panic("fit: estimate of an unsupported family")
}

// toDist builds the montecarlo distribution of the estimates.
func toDist(kind montecarlo.Kind, p params, bounds *Bounds) (montecarlo.Dist, error) {
	switch kind {
	case montecarlo.Normal:
		return montecarlo.NewNormal(p.a, p.b)
	case montecarlo.LogNormal:
		if !(p.b > 0) {
			return montecarlo.Dist{}, fmt.Errorf("fit: lognormal: σ of ln X is %g", p.b)
		}
		return montecarlo.Dist{Kind: montecarlo.LogNormal, A: p.a, B: p.b}, nil
	case montecarlo.Weibull:
		return montecarlo.NewWeibull(p.a, p.b)
	case montecarlo.Uniform:
		return montecarlo.NewUniform(p.a, p.b)
	case montecarlo.Triangular:
		return montecarlo.NewTriangular(p.a, p.c, p.b)
	case montecarlo.TruncNormal:
		lo, hi := openBounds(p.a, p.b, *bounds)
		return montecarlo.NewTruncNormal(p.a, p.b, lo, hi)
	}
	panic("fit: toDist of an unsupported family")
}

// openBounds replaces an open side by μ ± 10σ, as the scenario loader does
// for a missing bound (the mass beyond is below 10⁻²³).
func openBounds(mu, sigma float64, b Bounds) (float64, float64) {
	lo, hi := b.Lower, b.Upper
	if math.IsInf(lo, -1) {
		lo = math.Min(mu-10*sigma, b.Upper-sigma)
	}
	if math.IsInf(hi, 1) {
		hi = math.Max(mu+10*sigma, b.Lower+sigma)
	}
	return lo, hi
}

// meanSD returns the mean and the maximum-likelihood standard deviation
// (divisor n) of s or of ln s, in two passes.
func meanSD(s []float64, logs bool) (float64, float64) {
	var sum float64
	for _, v := range s {
		if logs {
			v = math.Log(v)
		}
		sum += v
	}
	m := sum / float64(len(s))
	var ss, c float64
	for _, v := range s {
		if logs {
			v = math.Log(v)
		}
		d := v - m
		ss += d * d
		c += d
	}
	n := float64(len(s))
	return m, math.Sqrt(math.Max((ss-c*c/n)/n, 0))
}

// normalLL is the normal log-likelihood at the maximum: −n/2·(ln 2πσ̂² + 1).
func normalLL(n int, sd float64) float64 {
	return -float64(n) / 2 * (math.Log(2*math.Pi*sd*sd) + 1)
}

// weibullMLE solves the profile equation of the shape k (the likelihood
// equations of Lawless 2003, ch. 5, with λ eliminated; from memory):
//
//	g(k) = Σ xᵢᵏ ln xᵢ / Σ xᵢᵏ − 1/k − mean(ln x) = 0,   λ = (Σ xᵢᵏ / n)^(1/k)
//
// g rises with k (g' > 0, below) from −∞ to max ln x − mean ln x > 0, so
// the root is unique;
// it is found by Newton steps kept inside a bracket (bisection when a step
// leaves it). The data are scaled by their maximum so that xᵏ ≤ 1.
func weibullMLE(s []float64) (params, error) {
	n := float64(len(s))
	lmax := math.Log(s[len(s)-1])
	var ybar, yy float64
	for _, v := range s {
		y := math.Log(v) - lmax
		ybar += y
		yy += y * y
	}
	ybar /= n
	sdy := math.Sqrt(math.Max(yy/n-ybar*ybar, 0))
	if !(sdy > 0) {
		return params{}, fmt.Errorf("fit: weibull: the values do not scatter")
	}
	// g and g' at k.
	g := func(k float64) (float64, float64) {
		var s0, s1, s2 float64
		for _, v := range s {
			y := math.Log(v) - lmax
			w := math.Exp(k * y)
			s0 += w
			s1 += w * y
			s2 += w * y * y
		}
		m1 := s1 / s0
		return m1 - 1/k - ybar, s2/s0 - m1*m1 + 1/(k*k)
	}
	k := math.Pi / math.Sqrt(6) / sdy // Menon's (1963) log-moment estimate
	lo, hi := k, k
	for i := 0; ; i++ {
		if v, _ := g(lo); v < 0 {
			break
		}
		lo /= 2
		if i > 200 {
			return params{}, fmt.Errorf("fit: weibull: no bracket for the shape")
		}
	}
	for i := 0; ; i++ {
		if v, _ := g(hi); v > 0 {
			break
		}
		hi *= 2
		if i > 200 {
			return params{}, fmt.Errorf("fit: weibull: no bracket for the shape")
		}
	}
	for range 200 {
		v, dv := g(k)
		if v == 0 {
			break
		}
		if v < 0 {
			lo = k
		} else {
			hi = k
		}
		next := k - v/dv
		if !(next > lo && next < hi) {
			next = (lo + hi) / 2
		}
		done := math.Abs(next-k) <= 1e-13*k || hi-lo <= 1e-14*k
		k = next
		if done {
			break
		}
	}
	var s0, sl float64
	for _, v := range s {
		l := math.Log(v)
		s0 += math.Exp(k * (l - lmax))
		sl += l
	}
	lam := math.Exp(lmax + math.Log(s0/n)/k)
	// ℓ = n ln k − n k ln λ + (k − 1) Σ ln x − Σ (x/λ)ᵏ, the last sum being n at the MLE.
	ll := n*math.Log(k) - n*k*math.Log(lam) + (k-1)*sl - n
	if !(k > 0) || !(lam > 0) || math.IsInf(k, 0) || math.IsInf(lam, 0) {
		return params{}, fmt.Errorf("fit: weibull: no finite estimate")
	}
	return params{a: k, b: lam, ll: ll}, nil
}

// uniformFit takes the minimum-variance unbiased endpoints from the sample
// minimum and maximum (Johnson, Kotz & Balakrishnan, Continuous Univariate
// Distributions vol. 2, 2nd ed. 1995, ch. 26):
//
//	â = (n·x₍₁₎ − x₍ₙ₎)/(n − 1),   b̂ = (n·x₍ₙ₎ − x₍₁₎)/(n − 1)
//
// that is, each end moved out by the range/(n − 1). The log-likelihood is
// that of the maximum-likelihood fit [x₍₁₎, x₍ₙ₎]: −n·ln(x₍ₙ₎ − x₍₁₎).
func uniformFit(s []float64) params {
	n := float64(len(s))
	lo, hi := s[0], s[len(s)-1]
	w := (hi - lo) / (n - 1)
	return params{a: lo - w, b: hi + w, ll: -n * math.Log(hi-lo)}
}

// triangularMLE maximises the triangular likelihood. For given ends (a, b)
// the maximum over the mode lies at an order statistic x₍ᵣ₎ (van Dorp &
// Kotz, "The standard two-sided power distribution and its properties",
// Amer. Statist. 56(2), 2002, with the triangle as power 2), found by one
// pass over r; the ends are found by Nelder–Mead over
// a = x₍₁₎ − R·eᵘ, b = x₍ₙ₎ + R·eᵛ (R the range).
func triangularMLE(s []float64, sc *scratch) (params, error) {
	n := len(s)
	if cap(sc.w) < n {
		sc.w = make([]float64, n)
	}
	lb := sc.w[:n]
	x1, xn := s[0], s[n-1]
	r := xn - x1
	ends := func(u, v float64) (float64, float64) {
		return x1 - r*math.Exp(math.Max(u, -40)), xn + r*math.Exp(math.Max(v, -40))
	}
	// profile returns the log-likelihood maximised over the mode, and the mode.
	profile := func(a, b float64) (float64, float64) {
		var tot float64
		for i, x := range s {
			lb[i] = math.Log(b - x)
			tot += lb[i]
		}
		best, mode := math.Inf(-1), s[0]
		var pa, pb float64 // Σ ln(x − a) over i < r, Σ ln(b − x) over i ≤ r
		for i, x := range s {
			la := math.Log(x - a)
			pb += lb[i]
			l := pa + (tot - pb)
			if i > 0 {
				l -= float64(i) * la
			}
			if i < n-1 {
				l -= float64(n-1-i) * lb[i]
			}
			if l > best {
				best, mode = l, x
			}
			pa += la
		}
		fn := float64(n)
		return best + fn*math.Ln2 - fn*math.Log(b-a), mode
	}
	obj := func(u, v float64) float64 {
		a, b := ends(u, v)
		l, _ := profile(a, b)
		if math.IsInf(l, -1) || math.IsNaN(l) {
			return math.Inf(1)
		}
		return -l / float64(n)
	}
	z0 := -0.5 * math.Log(float64(n))
	u, v, _ := nelderMead2(obj, z0, z0, 0.5, 0.5, 1e-12, 1e-6, 2000)
	a, b := ends(u, v)
	ll, mode := profile(a, b)
	if math.IsInf(ll, 0) || math.IsNaN(ll) {
		return params{}, fmt.Errorf("fit: triangular: no finite maximum of the likelihood")
	}
	if a > mode { // a rounded onto the mode at the lowest value
		a = mode
	}
	return params{a: a, b: b, c: mode, ll: ll}, nil
}

// truncNormalMLE maximises the truncated-normal likelihood over (μ, ln σ)
// by Nelder–Mead polished by Newton steps on the analytic gradient, the
// data standardised first:
//
//	ℓ = −n ln σ − ½ Σ zᵢ² − n ln(Φ(β) − Φ(α)) − (n/2) ln 2π,
//	zᵢ = (xᵢ − μ)/σ, α = (lower − μ)/σ, β = (upper − μ)/σ
//
// The maximum may lie at infinity (data flat or rising towards a bound):
// then [ErrNoMaximum] is returned.
func truncNormalMLE(s []float64, bd Bounds) (params, error) {
	n := float64(len(s))
	m0, s0 := meanSD(s, false)
	if !(s0 > 0) {
		return params{}, fmt.Errorf("fit: truncnormal: the values do not scatter")
	}
	lo, hi := (bd.Lower-m0)/s0, (bd.Upper-m0)/s0
	var sz, szz float64 // Σ t, Σ t² of the standardised data (0 and n up to rounding)
	for _, v := range s {
		t := (v - m0) / s0
		sz += t
		szz += t * t
	}
	// ℓ/n as a function of (μ, η = ln σ) in standardised units.
	eval := func(mu, eta float64) (f, dmu, deta float64) {
		sig := math.Exp(eta)
		al, be := (lo-mu)/sig, (hi-mu)/sig
		lz := logMass(al, be)
		// Σ zᵢ = (Σt − nμ)/σ, Σ zᵢ² = (Σt² − 2μΣt + nμ²)/σ²
		z1 := (sz - n*mu) / sig
		z2 := (szz - 2*mu*sz + n*mu*mu) / (sig * sig)
		f = -eta - z2/(2*n) - lz
		ra, rb := millsTerm(al, lz), millsTerm(be, lz) // φ(α)/Z, φ(β)/Z
		dmu = (z1/n + (rb - ra)) / sig
		var aa, bb float64
		if !math.IsInf(al, 0) {
			aa = al * ra
		}
		if !math.IsInf(be, 0) {
			bb = be * rb
		}
		deta = -1 + z2/n + (bb - aa)
		return f, dmu, deta
	}
	negf := func(mu, eta float64) float64 {
		f, _, _ := eval(mu, eta)
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return math.Inf(1)
		}
		return -f
	}
	mu, eta, _ := nelderMead2(negf, 0, 0, 0.3, 0.3, 1e-13, 1e-7, 4000)
	// Newton steps on the analytic gradient polish the simplex's optimum;
	// the Hessian by central differences of the gradient.
	for range 8 {
		_, g0, g1 := eval(mu, eta)
		const h = 1e-5
		_, a0, a1 := eval(mu+h, eta)
		_, b0, b1 := eval(mu-h, eta)
		_, c0, c1 := eval(mu, eta+h)
		_, d0, d1 := eval(mu, eta-h)
		h00, h01 := (a0-b0)/(2*h), (a1-b1)/(2*h)
		h10, h11 := (c0-d0)/(2*h), (c1-d1)/(2*h)
		h01 = (h01 + h10) / 2
		det := h00*h11 - h01*h01
		if !(h00 < 0 && det > 0) {
			break // not concave here: keep the simplex's point
		}
		dm := -(h11*g0 - h01*g1) / det
		de := -(-h01*g0 + h00*g1) / det
		if math.IsNaN(dm) || math.IsNaN(de) || negf(mu+dm, eta+de) > negf(mu, eta)+1e-15 {
			break
		}
		mu, eta = mu+dm, eta+de
		if math.Hypot(dm, de) < 1e-12 {
			break
		}
	}
	f, dm, de := eval(mu, eta)
	if math.Abs(mu) > 50 || eta > math.Log(50) || math.IsNaN(f) || math.Hypot(dm, de) > 1e-6 {
		return params{}, fmt.Errorf("fit: truncnormal: %w (the values look flat or rising towards a bound; fit uniform or normal instead)", ErrNoMaximum)
	}
	sig := math.Exp(eta)
	ll := n*(f-0.5*math.Log(2*math.Pi)) - n*math.Log(s0)
	return params{a: m0 + s0*mu, b: s0 * sig, c: bd.Lower, d: bd.Upper, ll: ll}, nil
}

// millsTerm returns φ(z)/Z from ln Z, 0 at an open bound.
func millsTerm(z, lz float64) float64 {
	if math.IsInf(z, 0) {
		return 0
	}
	return math.Exp(-z*z/2 - 0.5*math.Log(2*math.Pi) - lz)
}

// logQ returns ln Q(z), Q(z) = 1 − Φ(z), accurate far in the upper tail:
// beyond z = 30, where erfc nears underflow, the asymptotic series of the
// Mills ratio (Abramowitz & Stegun 26.2.12) to z⁻⁶.
func logQ(z float64) float64 {
	if math.IsInf(z, 1) {
		return math.Inf(-1)
	}
	if z < 30 {
		return math.Log(0.5 * math.Erfc(z/math.Sqrt2))
	}
	z2 := z * z
	return -z2/2 - math.Log(z*math.Sqrt(2*math.Pi)) + math.Log1p(-1/z2+3/(z2*z2)-15/(z2*z2*z2))
}

// log1mexp returns ln(1 − eˣ) for x ≤ 0 (Mächler, "Accurately computing
// log(1 − exp(−|a|))", Rmpfr vignette, 2012).
func log1mexp(x float64) float64 {
	if x > -math.Ln2 {
		return math.Log(-math.Expm1(x))
	}
	return math.Log1p(-math.Exp(x))
}

// logMass returns ln(Φ(b) − Φ(a)) for a < b, accurate in both tails.
func logMass(a, b float64) float64 {
	if a > 0 {
		la, lb := logQ(a), logQ(b)
		return la + log1mexp(lb-la)
	}
	if b < 0 {
		return logMass(-b, -a)
	}
	return math.Log(0.5*math.Erfc(-b/math.Sqrt2) - 0.5*math.Erfc(-a/math.Sqrt2))
}
