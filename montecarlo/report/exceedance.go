package report

import (
	"fmt"
	"math"
	"strconv"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
	"boltrisk/montecarlo/scenario"
	"boltrisk/plots"
)

// Exceedance reads the share of values below x off a sketch, at the
// sketch's own bin edges, where the count of values below is exact: each
// point holds Count of N values with its interval at confidence conf by
// method (Wilson or Clopper–Pearson as for every probability of the run;
// the one-sided bound where nothing lay below). The first point is the
// lowest value with count 0; then the lower edge of the bins (the values
// below the bins counted together), then the edges where the count
// changed, thinned to steps of 5 % in count or 1/400 of the range in x,
// up to a share of 0.9995.
func Exceedance(sk *quantile.Sketch, conf float64, method interval.Method) []plots.ExceedancePoint {
	n := sk.Total()
	if n == 0 || len(sk.Counts) == 0 {
		return nil
	}
	point := func(x float64, k int64) plots.ExceedancePoint {
		e := interval.Proportion(k, n, conf, method)
		return plots.ExceedancePoint{X: x, Count: k, N: n, P: e.P, Lo: e.Lo, Hi: e.Hi, UpperOnly: e.UpperOnly()}
	}
	nb := len(sk.Counts)
	edge := func(i int) float64 { return sk.X(sk.TLo + (sk.THi-sk.TLo)*float64(i)/float64(nb)) }
	var out []plots.ExceedancePoint
	if !math.IsInf(sk.Lowest, 0) {
		out = append(out, point(sk.Lowest, 0))
	}
	lo, hi := edge(0), edge(nb)
	if r0, r1 := sk.Range(); r1 > r0 && !math.IsInf(r0, 0) && !math.IsInf(r1, 0) {
		lo, hi = math.Max(lo, r0), math.Min(hi, r1)
	}
	span := hi - lo
	k := sk.Under
	if k > 0 {
		out = append(out, point(edge(0), k))
	}
	if len(out) == 0 {
		out = append(out, point(edge(0), k))
	}
	last := out[len(out)-1]
	for i := 1; i <= nb; i++ {
		k += sk.Counts[i-1]
		if k == last.Count {
			continue
		}
		x := edge(i)
		if x-last.X < span/400 && float64(k) < 1.05*float64(last.Count) {
			continue
		}
		last = point(x, k)
		out = append(out, last)
		if float64(k) >= 0.9995*float64(n) {
			break
		}
	}
	return out
}

// bandLabel names the pointwise band of an exceedance picture.
func bandLabel(conf float64, method interval.Method) string {
	c := strconv.FormatFloat(100*conf, 'f', -1, 64) + " %"
	switch method {
	case interval.Wilson:
		return c + " Wilson band (pointwise)"
	case interval.Exact:
		return c + " Clopper–Pearson band (pointwise)"
	}
	return fmt.Sprintf("%s band (pointwise): Clopper–Pearson below %d values, Wilson above", c, interval.ExactBelow)
}

// ExceedanceFigures draws, for every reported mode, the probability that
// its safety factor lies below x on a log scale — the failure tail that a
// histogram of counts hides — with the failure line at 1 and the run's
// failure estimate there. Files exceed-<mode>.png.
func ExceedanceFigures(s *scenario.Scenario, r *montecarlo.Result, method interval.Method) ([]Figure, error) {
	var out []Figure
	for i := range r.Modes {
		f, _, err := ExceedanceFigure(s, r, i, method)
		if err != nil {
			return nil, err
		}
		out = append(out, f)
	}
	return out, nil
}

// ExceedanceFigure draws the exceedance picture of the i-th reported mode
// and returns the spec it drew.
func ExceedanceFigure(s *scenario.Scenario, r *montecarlo.Result, i int, method interval.Method) (Figure, plots.ExceedanceSpec, error) {
	m := &r.Modes[i]
	e := m.Estimate
	spec := plots.ExceedanceSpec{
		Title:     fmt.Sprintf("Lower tail of the safety factor, %s (%s)", modeName(s, m.Mode), titleOf(s)),
		XLabel:    sfLabel(s, m.Mode),
		YLabel:    "probability of a safety factor below x",
		Name:      m.Mode.Title(),
		Key:       m.Mode.Key(),
		Points:    Exceedance(&m.SF.Sketch, r.Confidence, method),
		Band:      bandLabel(r.Confidence, method),
		FailureAt: 1,
		Failure: plots.ExceedancePoint{X: 1, Count: e.Failures, N: e.Samples, P: e.P, Lo: e.Lo, Hi: e.Hi,
			UpperOnly: e.UpperOnly()},
	}
	if e.UpperOnly() {
		spec.FailureLabel = fmt.Sprintf("failure probability ≤ %.3g (none of %d samples failed)", e.Hi, e.Samples)
	} else {
		spec.FailureLabel = fmt.Sprintf("failure probability %.3g [%.3g, %.3g]", e.P, e.Lo, e.Hi)
		if r.Method == "crude" {
			spec.FailureLabel += fmt.Sprintf(" (%d of %d samples)", e.Failures, e.Samples)
		} else {
			spec.FailureLabel += " (" + r.Method + ")"
		}
	}
	if r.Binned < r.Samples {
		spec.Notes = append(spec.Notes, "curve: "+binnedBars(r)[len("bars: "):])
	}
	p, _, err := plots.ExceedancePlot(spec)
	if err != nil {
		return Figure{}, spec, err
	}
	f, err := figure(p, "exceed-"+m.Mode.Key()+".png", fmt.Sprintf(
		"Probability that the safety factor of %s lies below x (log scale), with its pointwise band; the mode fails left of the line at 1, and the point there is the run's failure estimate.",
		lowerFirst(modeName(s, m.Mode))))
	return f, spec, err
}

// SimulationFigures are the pictures of a simulation with distributions:
// the residual preload, then each mode's safety-factor histogram beside
// its lower tail (exceedance picture, intervals of the given method).
func SimulationFigures(s *scenario.Scenario, r *montecarlo.Result, sys units.System, method interval.Method) ([]Figure, error) {
	pf, _, err := PreloadFigure(s, r, sys)
	if err != nil {
		return nil, err
	}
	sf, err := SafetyFactorFigures(s, r)
	if err != nil {
		return nil, err
	}
	ex, err := ExceedanceFigures(s, r, method)
	if err != nil {
		return nil, err
	}
	figs := []Figure{pf}
	for i := range sf {
		figs = append(figs, sf[i], ex[i])
	}
	return figs, nil
}
