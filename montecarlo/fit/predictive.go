package fit

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo"
)

// Predictive is the posterior predictive distribution of one more value
// from a normal (or, on the log scale, lognormal) population whose mean and
// standard deviation are both unknown, under the standard non-informative
// prior p(μ, σ²) ∝ 1/σ² (Gelman et al., Bayesian Data Analysis, 3rd ed.,
// 2013, §3.2): a Student t with n − 1 degrees of freedom, location x̄ and
// scale s·√(1 + 1/n), s the sample standard deviation (divisor n − 1).
// For lognormal data the t holds for ln X (a log-t law: its quantiles and
// probabilities are finite, its mean is not).
type Predictive struct {
	Family montecarlo.Kind // Normal, or LogNormal (t on ln X)
	N      int
	DF     float64 // n − 1
	Loc    float64 // x̄ (of ln x for lognormal), internal units
	Scale  float64 // s·√(1 + 1/n)
}

// NewPredictive returns the posterior predictive of family kind (normal or
// lognormal) for the sample x (internal units, at least 2 values).
func NewPredictive(kind montecarlo.Kind, x []float64) (Predictive, error) {
	switch kind {
	case montecarlo.Normal, montecarlo.LogNormal:
	default:
		return Predictive{}, fmt.Errorf("fit: posterior predictive: %s is not supported; it is given in closed form for normal and lognormal data only (a Student t under the non-informative prior, Gelman et al. 2013 §3.2): use the fitted %s, or fit a lognormal", kind, kind)
	}
	if err := checkValues(x); err != nil {
		return Predictive{}, err
	}
	if kind == montecarlo.LogNormal {
		for _, v := range x {
			if !(v > 0) {
				return Predictive{}, fmt.Errorf("fit: posterior predictive: lognormal: value %g is not > 0; a lognormal quantity is positive", v)
			}
		}
	}
	m, sd := meanSD(x, kind == montecarlo.LogNormal)
	n := float64(len(x))
	s := sd * math.Sqrt(n/(n-1))
	return Predictive{Family: kind, N: len(x), DF: n - 1, Loc: m, Scale: s * math.Sqrt(1+1/n)}, nil
}

func (p Predictive) t() distuv.StudentsT {
	return distuv.StudentsT{Mu: p.Loc, Sigma: p.Scale, Nu: p.DF}
}

// CDF returns P(X ≤ x).
func (p Predictive) CDF(x float64) float64 {
	if p.Family == montecarlo.LogNormal {
		if x <= 0 {
			return 0
		}
		x = math.Log(x)
	}
	return p.t().CDF(x)
}

// Survival returns P(X > x).
func (p Predictive) Survival(x float64) float64 {
	if p.Family == montecarlo.LogNormal {
		if x <= 0 {
			return 1
		}
		x = math.Log(x)
	}
	return p.t().Survival(x)
}

// Quantile returns the q-quantile, 0 < q < 1.
func (p Predictive) Quantile(q float64) float64 {
	if !(q > 0 && q < 1) {
		panic("fit: Predictive.Quantile: probability outside (0, 1)")
	}
	v := p.t().Quantile(q)
	if p.Family == montecarlo.LogNormal {
		return math.Exp(v)
	}
	return v
}

// Describe writes the law, e.g. "Student t (22 d.o.f.) on ln X, location
// 4.150, scale 0.5452", with the location formatted by f for normal data.
func (p Predictive) Describe(q Quantity) string {
	if p.Family == montecarlo.LogNormal {
		return fmt.Sprintf("log-Student t: ln X ~ t(%g d.o.f., location %.4g, scale %.4g); median %s", p.DF, p.Loc-math.Log(q.scale()), p.Scale, q.Format(math.Exp(p.Loc)))
	}
	return fmt.Sprintf("Student t (%g d.o.f., location %s, scale %s)", p.DF, q.Format(p.Loc), q.Format(p.Scale))
}
