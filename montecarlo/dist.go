package montecarlo

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// Kind is a distribution family.
type Kind uint8

const (
	Fixed Kind = iota
	Normal
	LogNormal
	Uniform
	Triangular
	Weibull
	TruncNormal
	StudentT // posterior predictive of normal data (dist_t.go)
	LogT     // posterior predictive of lognormal data: ln X Student t (dist_t.go)
)

var kindNames = [...]string{"fixed", "normal", "lognormal", "uniform", "triangular", "weibull", "truncnormal", "student-t", "log-t"}

func (k Kind) String() string { return kindNames[k] }

// ParseKind reads a family name.
func ParseKind(s string) (Kind, error) {
	for i, n := range kindNames {
		if n == s {
			return Kind(i), nil
		}
	}
	switch s {
	case "gaussian":
		return Normal, nil
	case "log-normal":
		return LogNormal, nil
	case "truncated-normal", "truncated_normal":
		return TruncNormal, nil
	}
	return 0, fmt.Errorf("unknown distribution %q (allowed: normal, lognormal, uniform, triangular, weibull, truncnormal)", s)
}

// Dist is a univariate distribution in model units. Build one with the
// New* constructors, which validate the parameters.
type Dist struct {
	Kind Kind
	// Parameters of the family:
	//   Fixed: A = value
	//   Normal: A = mean μ, B = standard deviation σ
	//   LogNormal: A = μ, B = σ of ln X
	//   Uniform: A = lower, B = upper
	//   Triangular: A = lower, B = upper, C = mode
	//   Weibull: A = shape k, B = scale λ
	//   TruncNormal: A = μ, B = σ of the parent normal, C = lower, D = upper
	//   StudentT: A = location, B = scale, C = d.o.f.; LogT: the same of ln X
	A, B, C, D float64
	pLo, pHi   float64 // TruncNormal: Φ at the bounds
	tab        *tTable // StudentT, LogT: the map from a standard normal (dist_t.go)
}

func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// NewFixed returns a distribution with all mass at v.
func NewFixed(v float64) Dist { return Dist{Kind: Fixed, A: v} }

// NewNormal returns the normal distribution with mean and sd > 0.
func NewNormal(mean, sd float64) (Dist, error) {
	if !finite(mean, sd) || !(sd > 0) {
		return Dist{}, fmt.Errorf("normal: standard deviation must be > 0, got %g", sd)
	}
	return Dist{Kind: Normal, A: mean, B: sd}, nil
}

// NewLogNormalMoments returns the lognormal distribution with the given mean
// and standard deviation of X itself (not of ln X):
//
//	σ² = ln(1 + (sd/mean)²),  μ = ln(mean) − σ²/2
func NewLogNormalMoments(mean, sd float64) (Dist, error) {
	if !finite(mean, sd) || !(mean > 0) {
		return Dist{}, fmt.Errorf("lognormal: mean must be > 0 (a lognormal quantity is positive), got %g", mean)
	}
	if !(sd > 0) {
		return Dist{}, fmt.Errorf("lognormal: standard deviation must be > 0, got %g", sd)
	}
	s2 := math.Log1p(sd * sd / (mean * mean))
	return Dist{Kind: LogNormal, A: math.Log(mean) - s2/2, B: math.Sqrt(s2)}, nil
}

// NewUniform returns the uniform distribution on [lo, hi], lo < hi.
func NewUniform(lo, hi float64) (Dist, error) {
	if !finite(lo, hi) || !(lo < hi) {
		return Dist{}, fmt.Errorf("uniform: lower bound %g must be below upper bound %g", lo, hi)
	}
	return Dist{Kind: Uniform, A: lo, B: hi}, nil
}

// NewTriangular returns the triangular distribution on [lo, hi] with the given mode.
func NewTriangular(lo, mode, hi float64) (Dist, error) {
	if !finite(lo, mode, hi) || !(lo < hi) || mode < lo || mode > hi {
		return Dist{}, fmt.Errorf("triangular: need lower < upper and lower ≤ mode ≤ upper, got %g, %g, %g", lo, mode, hi)
	}
	return Dist{Kind: Triangular, A: lo, B: hi, C: mode}, nil
}

// NewWeibull returns the two-parameter Weibull distribution, shape k > 0, scale λ > 0.
func NewWeibull(shape, scale float64) (Dist, error) {
	if !finite(shape, scale) || !(shape > 0) || !(scale > 0) {
		return Dist{}, fmt.Errorf("weibull: shape and scale must be > 0, got %g and %g", shape, scale)
	}
	return Dist{Kind: Weibull, A: shape, B: scale}, nil
}

// NewWeibullMoments returns the Weibull distribution with the given mean and
// coefficient of variation, solving c.o.v.² = Γ(1+2/k)/Γ(1+1/k)² − 1 for k by
// bisection.
func NewWeibullMoments(mean, cov float64) (Dist, error) {
	if !finite(mean, cov) || !(mean > 0) || !(cov > 0) || cov > 10 {
		return Dist{}, fmt.Errorf("weibull: need mean > 0 and 0 < c.o.v. ≤ 10, got %g and %g", mean, cov)
	}
	f := func(k float64) float64 {
		g1 := math.Gamma(1 + 1/k)
		return math.Gamma(1+2/k)/(g1*g1) - 1 - cov*cov
	}
	lo, hi := 0.05, 500.0 // c.o.v. falls as k rises
	for range 200 {
		mid := math.Sqrt(lo * hi)
		if f(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	k := math.Sqrt(lo * hi)
	return NewWeibull(k, mean/math.Gamma(1+1/k))
}

// NewTruncNormal returns the normal distribution (parent mean, sd) truncated
// to [lo, hi].
func NewTruncNormal(mean, sd, lo, hi float64) (Dist, error) {
	if !finite(mean, sd, lo, hi) || !(sd > 0) {
		return Dist{}, fmt.Errorf("truncnormal: standard deviation must be > 0, got %g", sd)
	}
	if !(lo < hi) {
		return Dist{}, fmt.Errorf("truncnormal: lower bound %g must be below upper bound %g", lo, hi)
	}
	d := Dist{Kind: TruncNormal, A: mean, B: sd, C: lo, D: hi}
	d.pLo = distuv.UnitNormal.CDF((lo - mean) / sd)
	d.pHi = distuv.UnitNormal.CDF((hi - mean) / sd)
	if !(d.pHi-d.pLo > 1e-12) {
		return Dist{}, fmt.Errorf("truncnormal: bounds [%g, %g] hold no probability of the parent normal", lo, hi)
	}
	return d, nil
}

// NeedsNormal reports whether samples are drawn from a standard normal
// variate (true) or from a uniform one (false).
func (d *Dist) NeedsNormal() bool {
	return d.Kind == Normal || d.Kind == LogNormal || d.Kind == StudentT || d.Kind == LogT
}

// FromNormal maps a standard normal variate z to a sample.
// Valid for Normal and LogNormal; others go through Φ(z).
func (d *Dist) FromNormal(z float64) float64 {
	switch d.Kind {
	case Normal:
		return d.A + d.B*z
	case LogNormal:
		return math.Exp(d.A + d.B*z)
	case Fixed:
		return d.A
	case StudentT, LogT:
		return d.tSample(d.tFromNormal(z))
	}
	return d.FromUniform(0.5 * math.Erfc(-z/math.Sqrt2))
}

// FromUniform maps a uniform variate u in (0, 1) to a sample by the inverse CDF.
func (d *Dist) FromUniform(u float64) float64 {
	switch d.Kind {
	case Uniform:
		return d.A + (d.B-d.A)*u
	case Triangular:
		lo, hi, c := d.A, d.B, d.C
		fc := (c - lo) / (hi - lo)
		if u < fc {
			return lo + math.Sqrt(u*(hi-lo)*(c-lo))
		}
		return hi - math.Sqrt((1-u)*(hi-lo)*(hi-c))
	case Weibull:
		return d.B * math.Pow(-math.Log1p(-u), 1/d.A)
	case TruncNormal:
		p := d.pLo + u*(d.pHi-d.pLo)
		x := d.A + d.B*mathext.NormalQuantile(p)
		return math.Min(math.Max(x, d.C), d.D)
	case Normal, LogNormal:
		return d.FromNormal(mathext.NormalQuantile(u))
	case StudentT, LogT:
		return d.tSample(d.tFromUniform(u))
	}
	return d.A
}

// distuvOf returns the gonum distribution for moments and quantiles.
func (d *Dist) distuvOf() interface {
	Mean() float64
	StdDev() float64
	Quantile(float64) float64
	CDF(float64) float64
} {
	switch d.Kind {
	case Normal:
		return distuv.Normal{Mu: d.A, Sigma: d.B}
	case LogNormal:
		return distuv.LogNormal{Mu: d.A, Sigma: d.B}
	case Uniform:
		return distuv.Uniform{Min: d.A, Max: d.B}
	case Triangular:
		return distuv.NewTriangle(d.A, d.B, d.C, nil)
	case Weibull:
		return distuv.Weibull{K: d.A, Lambda: d.B}
	}
	return nil
}

// Mean returns the mean of the distribution.
func (d *Dist) Mean() float64 {
	switch d.Kind {
	case Fixed:
		return d.A
	case TruncNormal:
		// E[X] = μ + σ·(φ(α) − φ(β))/(Φ(β) − Φ(α))
		a, b := (d.C-d.A)/d.B, (d.D-d.A)/d.B
		return d.A + d.B*(distuv.UnitNormal.Prob(a)-distuv.UnitNormal.Prob(b))/(d.pHi-d.pLo)
	case StudentT, LogT:
		return d.tMean()
	}
	return d.distuvOf().Mean()
}

// StdDev returns the standard deviation.
func (d *Dist) StdDev() float64 {
	switch d.Kind {
	case Fixed:
		return 0
	case TruncNormal:
		a, b := (d.C-d.A)/d.B, (d.D-d.A)/d.B
		z := d.pHi - d.pLo
		pa, pb := distuv.UnitNormal.Prob(a), distuv.UnitNormal.Prob(b)
		t := (a*pa - b*pb) / z
		m := (pa - pb) / z
		return d.B * math.Sqrt(1+t-m*m)
	case StudentT, LogT:
		return d.tStdDev()
	}
	return d.distuvOf().StdDev()
}

// Quantile returns the p-quantile.
func (d *Dist) Quantile(p float64) float64 {
	switch d.Kind {
	case Fixed:
		return d.A
	case TruncNormal, StudentT, LogT:
		return d.FromUniform(p)
	}
	return d.distuvOf().Quantile(p)
}

// CDF returns P(X ≤ x).
func (d *Dist) CDF(x float64) float64 {
	switch d.Kind {
	case Fixed:
		if x < d.A {
			return 0
		}
		return 1
	case TruncNormal:
		if x <= d.C {
			return 0
		}
		if x >= d.D {
			return 1
		}
		return (distuv.UnitNormal.CDF((x-d.A)/d.B) - d.pLo) / (d.pHi - d.pLo)
	case StudentT, LogT:
		return d.tCDF(x)
	}
	return d.distuvOf().CDF(x)
}

// Describe returns a one-line description such as "normal(mean 120, sd 4.8)"
// with values formatted by f.
func (d *Dist) Describe(f func(float64) string) string {
	switch d.Kind {
	case Fixed:
		return f(d.A)
	case Normal:
		return fmt.Sprintf("normal(mean %s, sd %s)", f(d.A), f(d.B))
	case LogNormal:
		return fmt.Sprintf("lognormal(mean %s, sd %s)", f(d.Mean()), f(d.StdDev()))
	case Uniform:
		return fmt.Sprintf("uniform(%s … %s)", f(d.A), f(d.B))
	case Triangular:
		return fmt.Sprintf("triangular(%s, mode %s, %s)", f(d.A), f(d.C), f(d.B))
	case Weibull:
		return fmt.Sprintf("weibull(shape %.4g, scale %s)", d.A, f(d.B))
	case TruncNormal:
		return fmt.Sprintf("truncnormal(mean %s, sd %s, within %s … %s)", f(d.A), f(d.B), f(d.C), f(d.D))
	case StudentT, LogT:
		return d.tDescribe(f)
	}
	return "?"
}

// Shifted returns the distribution moved so that its mean becomes mean
// (location families) or scaled to it (lognormal, Weibull), keeping the
// shape; studies use it to vary a nominal value while keeping the scatter.
func (d Dist) Shifted(mean float64) (Dist, error) {
	old := d.Mean()
	switch d.Kind {
	case Fixed:
		return NewFixed(mean), nil
	case Normal, StudentT:
		d.A = mean
		return d, nil
	case LogNormal, LogT:
		if !(mean > 0) {
			return Dist{}, fmt.Errorf("lognormal: mean must be > 0, got %g", mean)
		}
		d.A += math.Log(mean / old)
		return d, nil
	case Weibull:
		if !(mean > 0) {
			return Dist{}, fmt.Errorf("weibull: mean must be > 0, got %g", mean)
		}
		d.B *= mean / old
		return d, nil
	case Uniform:
		return NewUniform(d.A+mean-old, d.B+mean-old)
	case Triangular:
		return NewTriangular(d.A+mean-old, d.C+mean-old, d.B+mean-old)
	case TruncNormal:
		return NewTruncNormal(d.A+mean-old, d.B, d.C+mean-old, d.D+mean-old)
	}
	return d, nil
}

// Multiplied returns the distribution of f·X for f > 0: the mean and the
// spread scale together, the coefficient of variation and the family stay.
// Studies use it to vary a nominal value at constant relative scatter.
func (d Dist) Multiplied(f float64) (Dist, error) {
	if !(f > 0) || math.IsInf(f, 0) {
		return Dist{}, fmt.Errorf("multiplier must be > 0, got %g", f)
	}
	switch d.Kind {
	case Fixed:
		d.A *= f
	case Normal, StudentT:
		d.A, d.B = d.A*f, d.B*f
	case LogNormal, LogT:
		d.A += math.Log(f)
	case Uniform:
		d.A, d.B = d.A*f, d.B*f
	case Triangular:
		d.A, d.B, d.C = d.A*f, d.B*f, d.C*f
	case Weibull:
		d.B *= f
	case TruncNormal:
		return NewTruncNormal(d.A*f, d.B*f, d.C*f, d.D*f)
	}
	return d, nil
}

// Scaled returns the distribution with its spread about the mean multiplied
// by f > 0 (the mean kept); studies use it to vary a tolerance width.
func (d Dist) Scaled(f float64) (Dist, error) {
	if !(f > 0) {
		return Dist{}, fmt.Errorf("scale factor must be > 0, got %g", f)
	}
	m := d.Mean()
	switch d.Kind {
	case Fixed:
		return d, nil
	case Normal, StudentT:
		d.B *= f
		return d, nil
	case LogT: // the spread of ln X, the median kept
		d.B *= f
		return d, nil
	case LogNormal:
		return NewLogNormalMoments(m, d.StdDev()*f)
	case Weibull:
		return NewWeibullMoments(m, d.StdDev()*f/m)
	case Uniform:
		return NewUniform(m+(d.A-m)*f, m+(d.B-m)*f)
	case Triangular:
		return NewTriangular(m+(d.A-m)*f, m+(d.C-m)*f, m+(d.B-m)*f)
	case TruncNormal:
		return NewTruncNormal(m+(d.A-m)*f, d.B*f, m+(d.C-m)*f, m+(d.D-m)*f)
	}
	return d, nil
}
