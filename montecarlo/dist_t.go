package montecarlo

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/stat/distuv"
)

// The Student t and log-t families are the posterior predictive laws of a
// small normal or lognormal test series (montecarlo/fit.NewPredictive;
// Gelman et al., Bayesian Data Analysis, 3rd ed., 2013, §3.2). Parameters:
//
//	StudentT: A = location, B = scale, C = degrees of freedom ν
//	LogT:     A = location, B = scale of ln X, C = degrees of freedom ν
//
// Their native variate is a standard normal z (NeedsNormal), mapped by
// x = F⁻¹(Φ(z)), taken in the lower tail of the t for either sign of z so
// that the tails keep their precision, through a table (below); from a
// uniform u the map is gonum's distuv.StudentsT quantile.
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
	return Dist{Kind: StudentT, A: loc, B: scale, C: nu, tab: tTableOf(nu)}, nil
}

// NewLogT returns the log-t distribution: ln X is Student t with location
// loc, scale > 0 and ν > 0 degrees of freedom.
func NewLogT(loc, scale, nu float64) (Dist, error) {
	if !finite(loc, scale, nu) || !(scale > 0) || !(nu > 0) {
		return Dist{}, fmt.Errorf("log-t: scale and degrees of freedom must be > 0, got %g and %g", scale, nu)
	}
	return Dist{Kind: LogT, A: loc, B: scale, C: nu, tab: tTableOf(nu)}, nil
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
// same probability, F⁻¹(Φ(z)): from the table of the distribution where
// it has one and |z| < tZMax, else exactly.
func (d *Dist) tFromNormal(z float64) float64 {
	if tb := d.tab; tb != nil && z > -tZMax && z < tZMax {
		return tb.at(z)
	}
	return tExact(d.C, z)
}

// tExact is F⁻¹(Φ(z)) of the standard t with nu degrees of freedom,
// through the lower tail of both: gonum's quantile (whose inverse
// incomplete beta function loses accuracy deep in the tails at many
// degrees of freedom), polished by Newton steps on ln F(t) = ln Φ(z)
// with gonum's CDF and density.
func tExact(nu, z float64) float64 {
	if z > 0 {
		return -tExact(nu, -z)
	}
	if z == 0 {
		return 0
	}
	st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
	p := 0.5 * math.Erfc(-z/math.Sqrt2)
	lp := math.Log(p)
	t := st.Quantile(p)
	if math.IsInf(t, 0) || math.IsNaN(t) || t >= 0 {
		t = z // the normal limit
	}
	for range 8 {
		f := st.CDF(t)
		if !(f > 0) {
			break
		}
		step := (math.Log(f) - lp) * f / st.Prob(t)
		if math.IsNaN(step) || math.IsInf(step, 0) {
			break
		}
		for t-step >= 0 { // stay in the lower tail
			step /= 2
		}
		t -= step
		if math.Abs(step) <= 1e-14*math.Abs(t) {
			break
		}
	}
	return t
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

// The map z ↦ F⁻¹(Φ(z)) costs tens of microseconds through the inverse
// incomplete beta function, too slow for the sampling loop. A table of the
// standard t's map at z = −tZMax + i·tStep holds its values and slopes
// dt/dz = φ(z)/f(t) (exact, from gonum), and a cubic Hermite interpolant
// between them gives the map to a relative error below 10⁻⁶ for ν ≥ 3 and
// 10⁻⁸ for ν ≥ 11 (tested);
// beyond |z| ≥ tZMax (probability 10⁻¹⁹) it is computed exactly. Tables
// depend on ν only and are shared.
const (
	tZMax  = 9.0
	tStep  = 1.0 / 32
	tNodes = int(2*tZMax/tStep) + 1
)

type tTable struct {
	t, dt [tNodes]float64
}

var tTables struct {
	sync.Mutex
	m map[float64]*tTable
}

// tTableOf returns the table of the standard t with nu degrees of freedom.
func tTableOf(nu float64) *tTable {
	tTables.Lock()
	defer tTables.Unlock()
	if tb, ok := tTables.m[nu]; ok {
		return tb
	}
	tb := &tTable{}
	st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
	for i := range tNodes {
		z := -tZMax + float64(i)*tStep
		t := tExact(nu, z)
		tb.t[i] = t
		tb.dt[i] = math.Exp(-z*z/2) / math.Sqrt(2*math.Pi) / st.Prob(t)
	}
	if tTables.m == nil {
		tTables.m = map[float64]*tTable{}
	}
	tTables.m[nu] = tb
	return tb
}

// at interpolates the map at z, −tZMax < z < tZMax.
func (tb *tTable) at(z float64) float64 {
	x := (z + tZMax) / tStep
	i := int(x)
	if i >= tNodes-1 {
		i = tNodes - 2
	}
	s := x - float64(i)
	s2, s3 := s*s, s*s*s
	h00 := 2*s3 - 3*s2 + 1
	h10 := s3 - 2*s2 + s
	h01 := -2*s3 + 3*s2
	h11 := s3 - s2
	return h00*tb.t[i] + h10*tStep*tb.dt[i] + h01*tb.t[i+1] + h11*tStep*tb.dt[i+1]
}
