// Package interval holds the estimates of a failure probability from
// counts: the point estimate, its coefficient of variation, and confidence
// intervals (Wilson score, exact Clopper–Pearson, the one-sided exact bound
// when nothing failed), and the paired comparison of two proportions
// (Newcombe's hybrid score interval, McNemar's exact test).
package interval

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Method selects how the interval of a proportion is computed.
type Method uint8

const (
	// Auto: the exact Clopper–Pearson interval below ExactBelow failures, the
	// Wilson score interval from there on, and the one-sided exact upper
	// bound when no sample failed.
	Auto Method = iota
	Wilson
	Exact
)

// ExactBelow is the number of failures below which Auto uses the exact
// interval: the Wilson interval's coverage is uneven for few failures
// (Brown, Cai & DasGupta 2001, Statist. Sci. 16:101–133; common practice).
const ExactBelow = 20

// ParseMethod reads "auto", "wilson" or "exact".
func ParseMethod(s string) (Method, error) {
	switch s {
	case "auto", "":
		return Auto, nil
	case "wilson":
		return Wilson, nil
	case "exact", "clopper-pearson":
		return Exact, nil
	}
	return 0, fmt.Errorf("unknown interval method %q (allowed: auto, exact, wilson)", s)
}

func (m Method) String() string { return [...]string{"auto", "wilson", "exact"}[m] }

// Kind names the interval actually computed for an estimate.
type Kind uint8

const (
	KindWilson    Kind = iota // two-sided Wilson score interval
	KindExact                 // two-sided Clopper–Pearson interval
	KindOneSided              // no failure: [0, one-sided exact upper bound]
	KindNormalLog             // two-sided interval of a sampling estimator from its c.o.v. (log-normal)
)

// Name returns the JSON name of the kind.
func (k Kind) Name() string {
	return [...]string{"wilson", "clopper-pearson", "one-sided-upper", "lognormal-cov"}[k]
}

// Estimate is a failure probability estimated from counts (or, for the
// rare-event estimators, from weighted samples).
type Estimate struct {
	Failures int64
	Samples  int64
	P        float64 // point estimate
	// COV is the coefficient of variation of the estimator, sd/mean; +Inf
	// when nothing failed (the estimate is 0).
	COV    float64
	Lo, Hi float64 // bounds at the confidence
	Kind   Kind
}

// UpperOnly reports whether only the upper bound is informative: nothing
// failed, Lo = 0 and Hi is the one-sided bound.
func (e Estimate) UpperOnly() bool { return e.Kind == KindOneSided }

// Proportion estimates a probability from k failures in n samples at
// two-sided confidence conf with method m.
func Proportion(k, n int64, conf float64, m Method) Estimate {
	e := Estimate{Failures: k, Samples: n, COV: math.Inf(1), Hi: 1}
	if n <= 0 {
		e.Kind = KindOneSided
		return e
	}
	nf := float64(n)
	e.P = float64(k) / nf
	if k > 0 {
		e.COV = math.Sqrt((1 - e.P) / (nf * e.P))
	}
	switch {
	case k == 0:
		e.Kind, e.Hi = KindOneSided, OneSidedUpper(n, conf)
	case m == Exact || m == Auto && k < ExactBelow:
		e.Kind = KindExact
		e.Lo, e.Hi = ClopperPearson(k, n, conf)
	default:
		e.Kind = KindWilson
		e.Lo, e.Hi = WilsonInterval(k, n, conf)
	}
	return e
}

// z returns the two-sided normal quantile of confidence conf.
func z(conf float64) float64 { return distuv.UnitNormal.Quantile(1 - (1-conf)/2) }

// WilsonInterval returns the Wilson score interval (Wilson 1927, J. Amer.
// Statist. Assoc. 22:209–212) for k of n at two-sided confidence conf:
//
//	centre = (p̂ + z²/2n)/(1 + z²/n),  half = z·√(p̂(1−p̂)/n + z²/4n²)/(1 + z²/n)
func WilsonInterval(k, n int64, conf float64) (lo, hi float64) {
	nf := float64(n)
	p := float64(k) / nf
	zz := z(conf)
	z2 := zz * zz
	den := 1 + z2/nf
	c := (p + z2/(2*nf)) / den
	h := zz * math.Sqrt(p*(1-p)/nf+z2/(4*nf*nf)) / den
	return math.Max(0, c-h), math.Min(1, c+h)
}

// ClopperPearson returns the exact two-sided interval (Clopper & Pearson
// 1934, Biometrika 26:404–413) from Beta quantiles:
//
//	lo = B(α/2; k, n − k + 1),  hi = B(1 − α/2; k + 1, n − k),  α = 1 − conf
func ClopperPearson(k, n int64, conf float64) (lo, hi float64) {
	a := 1 - conf
	kf, nf := float64(k), float64(n)
	if k > 0 {
		lo = distuv.Beta{Alpha: kf, Beta: nf - kf + 1}.Quantile(a / 2)
	}
	hi = 1
	if k < n {
		hi = distuv.Beta{Alpha: kf + 1, Beta: nf - kf}.Quantile(1 - a/2)
	}
	return lo, hi
}

// OneSidedUpper returns the exact one-sided upper bound at confidence conf
// when none of n samples failed: 1 − (1 − conf)^(1/n), ≈ 3/n at 95 % (the
// "rule of three"; Jovanovic & Levy 1997, Am. Stat. 51:137–139).
func OneSidedUpper(n int64, conf float64) float64 {
	return -math.Expm1(math.Log(1-conf) / float64(n))
}

// FromCOV returns the interval of an unbiased estimator with estimate p and
// coefficient of variation cov at two-sided confidence conf, taking the
// estimator as log-normal (so that the bounds stay positive and skew right
// like a sampling distribution of a small probability):
//
//	[p·exp(−z·s − s²/2), p·exp(z·s − s²/2)],  s² = ln(1 + cov²)
func FromCOV(p, cov, conf float64) (lo, hi float64) {
	if !(p > 0) || math.IsInf(cov, 0) || math.IsNaN(cov) {
		return 0, 1
	}
	s2 := math.Log1p(cov * cov)
	s := math.Sqrt(s2)
	zz := z(conf)
	return p * math.Exp(-zz*s-s2/2), math.Min(1, p*math.Exp(zz*s-s2/2))
}
