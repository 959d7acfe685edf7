package life

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
)

// Lognormal is a log-normal life: ln N ~ Normal(Mu, Sigma).
type Lognormal struct {
	Mu, Sigma float64
}

// LognormalFromMedian returns the log-normal life with median n50 and
// standard deviation sdLn of ln N.
func LognormalFromMedian(n50, sdLn float64) Lognormal {
	return Lognormal{Mu: math.Log(n50), Sigma: sdLn}
}

func (l Lognormal) validate() error {
	if math.IsNaN(l.Mu) || math.IsInf(l.Mu, 0) || !(l.Sigma > 0 && l.Sigma < math.Inf(1)) {
		return fmt.Errorf("life: log-normal μ = %g, σ = %g: allowed a finite μ and a finite σ > 0", l.Mu, l.Sigma)
	}
	return nil
}

// BLife returns B_p = exp(μ + z_p·σ), z_p = Φ⁻¹(p) (standard).
func (l Lognormal) BLife(p float64) (float64, error) {
	if err := l.validate(); err != nil {
		return 0, err
	}
	if err := checkP(p); err != nil {
		return 0, err
	}
	return math.Exp(l.Mu + mathext.NormalQuantile(p)*l.Sigma), nil
}

// Reliability returns R(N) = 1 − Φ((ln N − μ)/σ) for N > 0.
func (l Lognormal) Reliability(n float64) (float64, error) {
	if err := l.validate(); err != nil {
		return 0, err
	}
	if !(n > 0) {
		return 0, fmt.Errorf("life: cycles %g: allowed N > 0", n)
	}
	return 0.5 * math.Erfc((math.Log(n)-l.Mu)/(l.Sigma*math.Sqrt2)), nil
}

// Weibull is a two-parameter Weibull life with scale Eta (cycles) and
// shape Beta: R(t) = exp(−(t/η)^β) (secondary source: reliability-library
// docs citing Meeker & Escobar 1998, Nelson 1982, Lawless 2003).
type Weibull struct {
	Eta, Beta float64
}

func (w Weibull) validate() error {
	if !(w.Eta > 0 && w.Eta < math.Inf(1) && w.Beta > 0 && w.Beta < math.Inf(1)) {
		return fmt.Errorf("life: Weibull η = %g, β = %g: allowed finite η > 0 and β > 0", w.Eta, w.Beta)
	}
	return nil
}

// BLife returns B_p = η·(−ln(1 − p))^(1/β).
func (w Weibull) BLife(p float64) (float64, error) {
	if err := w.validate(); err != nil {
		return 0, err
	}
	if err := checkP(p); err != nil {
		return 0, err
	}
	return w.Eta * math.Pow(-math.Log1p(-p), 1/w.Beta), nil
}

// MTTF returns the mean life η·Γ(1 + 1/β).
func (w Weibull) MTTF() (float64, error) {
	if err := w.validate(); err != nil {
		return 0, err
	}
	return w.Eta * math.Gamma(1+1/w.Beta), nil
}

// Reliability returns R(t) = exp(−(t/η)^β) for t ≥ 0.
func (w Weibull) Reliability(t float64) (float64, error) {
	if err := w.validate(); err != nil {
		return 0, err
	}
	if !(t >= 0) {
		return 0, fmt.Errorf("life: cycles %g: allowed t ≥ 0", t)
	}
	return math.Exp(-math.Pow(t/w.Eta, w.Beta)), nil
}

// SuccessRun returns the number of units that must survive a test without
// failure to demonstrate reliability R at confidence C,
// n = ln(1 − C)/ln R (from memory; exact binomial algebra: R^n = 1 − C),
// and that number rounded up to whole units.
func SuccessRun(reliability, confidence float64) (n float64, units int64, err error) {
	if !(reliability > 0 && reliability < 1) {
		return 0, 0, fmt.Errorf("life: reliability %g: allowed 0 < R < 1", reliability)
	}
	if err := checkConf(confidence); err != nil {
		return 0, 0, err
	}
	n = math.Log1p(-confidence) / math.Log(reliability)
	return n, int64(math.Ceil(n)), nil
}
