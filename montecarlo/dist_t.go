package montecarlo

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// The Student t and log-t families are the posterior predictive laws of a
// small normal or lognormal test series (montecarlo/fit.NewPredictive;
// Gelman et al., Bayesian Data Analysis, 3rd ed., 2013, §3.2). Parameters:
//
//	StudentT: A = location, B = scale, C = degrees of freedom ν
//	LogT:     A = location, B = scale of ln X, C = degrees of freedom ν
//
// Their native variate is a uniform (inverse CDF by gonum's
// distuv.StudentsT); from a standard normal z the map is x = F⁻¹(Φ(z)),
// taken in the lower tail of the t for either sign of z so that the tails
// keep their precision.
//
// The log-t has no finite mean for any ν, and the Student t no finite
// variance for ν ≤ 2: Mean returns the median for the log-t (the centre
// used as the nominal value), and StdDev returns, where the standard
// deviation is not finite, half the width of the central 68.27 % interval
// (the standard deviation of a normal law with those quartiles of ±1σ).

// NewStudentT returns the Student t distribution with the given location,
// scale > 0 and degrees of freedom ν > 0.
func NewStudentT(loc, scale, nu float64) (Dist, error) {
	if !finite(loc, scale, nu) || !(scale > 0) || !(nu > 0) {
		return Dist{}, fmt.Errorf("student-t: scale and degrees of freedom must be > 0, got %g and %g", scale, nu)
	}
	return Dist{Kind: StudentT, A: loc, B: scale, C: nu}, nil
}

// NewLogT returns the log-t distribution: ln X is Student t with location
// loc, scale > 0 and ν > 0 degrees of freedom.
func NewLogT(loc, scale, nu float64) (Dist, error) {
	if !finite(loc, scale, nu) || !(scale > 0) || !(nu > 0) {
		return Dist{}, fmt.Errorf("log-t: scale and degrees of freedom must be > 0, got %g and %g", scale, nu)
	}
	return Dist{Kind: LogT, A: loc, B: scale, C: nu}, nil
}

// stdT is the standard t of the family.
func (d *Dist) stdT() distuv.StudentsT { return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: d.C} }

// tFromUniform maps u in (0, 1) to a standard t variate, always through the
// lower tail.
func (d *Dist) tFromUniform(u float64) float64 {
	t := d.stdT()
	if u <= 0.5 {
		return t.Quantile(u)
	}
	return -t.Quantile(1 - u)
}

// tFromNormal maps a standard normal z to the standard t variate of the
// same probability, F⁻¹(Φ(z)), through the lower tail of both.
func (d *Dist) tFromNormal(z float64) float64 {
	t := d.stdT()
	if z <= 0 {
		return t.Quantile(0.5 * math.Erfc(-z/math.Sqrt2))
	}
	return -t.Quantile(0.5 * math.Erfc(z/math.Sqrt2))
}

func (d *Dist) tSample(t float64) float64 {
	if d.Kind == LogT {
		return math.Exp(d.A + d.B*t)
	}
	return d.A + d.B*t
}

// tCDF is P(X ≤ x) of the Student t or log-t.
func (d *Dist) tCDF(x float64) float64 {
	if d.Kind == LogT {
		if x <= 0 {
			return 0
		}
		x = math.Log(x)
	}
	return d.stdT().CDF((x - d.A) / d.B)
}

// tMean is the mean of the Student t (its centre for ν ≤ 1) or the median
// of the log-t.
func (d *Dist) tMean() float64 {
	if d.Kind == LogT {
		return math.Exp(d.A)
	}
	return d.A
}

// tStdDev is the standard deviation where finite, else half the width of
// the central 68.27 % interval.
func (d *Dist) tStdDev() float64 {
	if d.Kind == StudentT && d.C > 2 {
		return d.B * math.Sqrt(d.C/(d.C-2))
	}
	const p = 0.15865525393145705 // Φ(−1)
	return (d.tSample(-d.stdT().Quantile(p)) - d.tSample(d.stdT().Quantile(p))) / 2
}

func (d *Dist) tDescribe(f func(float64) string) string {
	if d.Kind == LogT {
		return fmt.Sprintf("log-t(%g d.o.f., median %s, scale of ln X %.4g)", d.C, f(math.Exp(d.A)), d.B)
	}
	return fmt.Sprintf("student-t(%g d.o.f., location %s, scale %s)", d.C, f(d.A), f(d.B))
}
