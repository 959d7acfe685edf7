package rare

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// normSF returns Φ(−x) = 1 − Φ(x), accurate in the far tail.
func normSF(x float64) float64 { return 0.5 * math.Erfc(x/math.Sqrt2) }

// zQuantile returns the two-sided standard-normal quantile at confidence conf.
func zQuantile(conf float64) float64 { return distuv.UnitNormal.Quantile(1 - (1-conf)/2) }

// tQuantile returns the two-sided Student-t quantile with nu degrees of
// freedom at confidence conf.
func tQuantile(conf float64, nu int) float64 {
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(nu)}.Quantile(1 - (1-conf)/2)
}

// logInterval returns the interval p·exp(∓q·s), s = √ln(1 + δ²): the
// interval of a lognormal estimator with c.o.v. δ, located at the estimate.
// It stays positive and is wider above than below, as the sampling
// distributions of importance-sampling and subset-simulation estimates are
// (right-skewed).
func logInterval(p, cov, q float64) (lo, hi float64) {
	s := math.Sqrt(math.Log1p(cov * cov))
	return p * math.Exp(-q*s), p * math.Exp(q*s)
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i, x := range a {
		s += x * b[i]
	}
	return s
}

func norm2(a []float64) float64 { return math.Sqrt(dot(a, a)) }
