package fit

import (
	"fmt"

	"boltrisk/montecarlo"
)

// MinPredictive is the least number of values for a posterior predictive:
// with n − 1 ≥ 3 degrees of freedom the Student t has a finite variance.
const MinPredictive = 4

// CheckFamily says, as a [*DataError] naming the file, the row and the
// column, why family kind cannot be fitted to the column: a value ≤ 0 for a
// lognormal or Weibull fit (the first such row), too few values for the
// family's parameters.
func (c *Column) CheckFamily(kind montecarlo.Kind) error {
	switch kind {
	case montecarlo.LogNormal, montecarlo.Weibull:
		bad, first := 0, -1
		for i, v := range c.Values {
			if !(v > 0) {
				if first < 0 {
					first = i
				}
				bad++
			}
		}
		if bad > 0 {
			row := 0
			if first < len(c.Lines) {
				row = int(c.Lines[first])
			}
			more := ""
			if bad > 1 {
				more = fmt.Sprintf(" (and %d more values ≤ 0)", bad-1)
			}
			return &DataError{File: c.File, Row: row, Column: c.Name, Msg: fmt.Sprintf("value %s is not > 0%s: a %s quantity is positive; fit normal (or truncnormal with bounds) instead", c.Format(c.Values[first]), more, kind)}
		}
	case montecarlo.Triangular:
		if len(c.Values) < 3 {
			return &DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("%d values: a triangular fit has 3 parameters and needs at least 3", len(c.Values))}
		}
	}
	return nil
}

// CheckPredictive says why the posterior predictive of family kind cannot
// be formed from the column: a family other than normal and lognormal, or
// fewer than [MinPredictive] values.
func (c *Column) CheckPredictive(kind montecarlo.Kind) error {
	switch kind {
	case montecarlo.Normal, montecarlo.LogNormal:
	default:
		return &DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("predictive: true is defined for normal and lognormal data only (a Student t under the non-informative prior, Gelman et al., Bayesian Data Analysis, 3rd ed., §3.2), not for %s: use family: normal or lognormal, or drop predictive to use the plug-in %s fit", kind, kind)}
	}
	if len(c.Values) < MinPredictive {
		return &DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("%d values: the posterior predictive needs at least %d (n − 1 ≥ 3 degrees of freedom for a finite variance)", len(c.Values), MinPredictive)}
	}
	return c.CheckFamily(kind)
}

// Dist returns the posterior predictive as a distribution for sampling:
// a Student t for normal data, a log-t for lognormal data.
func (p Predictive) Dist() (montecarlo.Dist, error) {
	if p.Family == montecarlo.LogNormal {
		return montecarlo.NewLogT(p.Loc, p.Scale, p.DF)
	}
	return montecarlo.NewStudentT(p.Loc, p.Scale, p.DF)
}
