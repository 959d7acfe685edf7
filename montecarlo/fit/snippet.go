package fit

import (
	"fmt"
	"math"
	"strings"

	"boltrisk/montecarlo"
)

// Snippet returns the scenario-file input of a fitted distribution in the
// quantity's unit, e.g. {dist: lognormal, mean: 31.2 kN, cov: 11.4%}:
// normal by mean and sd; lognormal by the mean and c.o.v. of the quantity
// itself; Weibull by shape and scale; truncnormal by the parent normal's
// mean and sd with lower and upper (an open side left out); uniform by min
// and max; triangular by min, mode and max. Values carry 4 significant
// digits (trailing zeros dropped), the c.o.v. too.
func Snippet(d montecarlo.Dist, q Quantity) string {
	f := q.Format
	switch d.Kind {
	case montecarlo.Normal:
		return fmt.Sprintf("{dist: normal, mean: %s, sd: %s}", f(d.A), f(d.B))
	case montecarlo.LogNormal:
		cov := math.Sqrt(math.Expm1(d.B * d.B))
		return fmt.Sprintf("{dist: lognormal, mean: %s, cov: %s%%}", f(d.Mean()), sig(100*cov, 4))
	case montecarlo.Weibull:
		return fmt.Sprintf("{dist: weibull, shape: %s, scale: %s}", sig(d.A, 4), f(d.B))
	case montecarlo.TruncNormal:
		var b strings.Builder
		fmt.Fprintf(&b, "{dist: truncnormal, mean: %s, sd: %s", f(d.A), f(d.B))
		// openBounds put an open side at μ ± 10σ or farther.
		if d.C > d.A-10*d.B+1e-9*math.Abs(d.B) {
			fmt.Fprintf(&b, ", lower: %s", f(d.C))
		}
		if d.D < d.A+10*d.B-1e-9*math.Abs(d.B) {
			fmt.Fprintf(&b, ", upper: %s", f(d.D))
		}
		b.WriteString("}")
		return b.String()
	case montecarlo.Uniform:
		return fmt.Sprintf("{dist: uniform, min: %s, max: %s}", f(d.A), f(d.B))
	case montecarlo.Triangular:
		return fmt.Sprintf("{dist: triangular, min: %s, mode: %s, max: %s}", f(d.A), f(d.C), f(d.B))
	}
	return f(d.A)
}
