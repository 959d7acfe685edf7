package decide

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo/interval"
)

// State is a verdict against a target.
type State uint8

const (
	// Meets: the upper confidence bound is at or below the target.
	Meets State = iota
	// Fails: the lower confidence bound is above the target.
	Fails
	// CannotTell: the interval straddles the target at this sample size.
	CannotTell
)

var stateNames = [...]string{"meets", "does not meet", "cannot tell"}

func (s State) String() string { return stateNames[s] }

// Verdict is an estimate judged against a target.
type Verdict struct {
	State State
	// SamplesNeeded, for CannotTell, estimates the sample count at which
	// the interval would no longer straddle the target if the estimate
	// stayed where it is: for counts, the normal approximation
	// n = z²·p(1 − p)/(p − p*)² (with no failure, the least n whose exact
	// one-sided bound is at or below p*); for rare-event estimates, whose
	// c.o.v. falls as 1/√n, n·(z·cov/|ln(p/p*)|)².
	SamplesNeeded int64
}

// Judge judges estimate e (from n samples, at two-sided confidence conf)
// against target.
func Judge(e interval.Estimate, n int64, target, conf float64) Verdict {
	switch {
	case e.Hi <= target:
		return Verdict{State: Meets}
	case e.Lo > target:
		return Verdict{State: Fails}
	}
	v := Verdict{State: CannotTell}
	z := distuv.UnitNormal.Quantile(1 - (1-conf)/2)
	switch {
	case e.Kind == interval.KindNormalLog && e.COV > 0 && !math.IsInf(e.COV, 0) && e.P > 0:
		r := math.Abs(math.Log(e.P / target))
		v.SamplesNeeded = ceilN(float64(n) * math.Pow(z*e.COV/r, 2))
	case e.P == 0 || e.Failures == 0:
		// The least n whose one-sided bound with no failure is ≤ target.
		lo, hi := int64(1), int64(1)
		for interval.OneSidedUpper(hi, conf) > target && hi < 1<<50 {
			hi *= 2
		}
		for lo < hi {
			mid := lo + (hi-lo)/2
			if interval.OneSidedUpper(mid, conf) <= target {
				hi = mid
			} else {
				lo = mid + 1
			}
		}
		v.SamplesNeeded = lo
	default:
		p := e.P
		v.SamplesNeeded = ceilN(z * z * p * (1 - p) / ((p - target) * (p - target)))
	}
	if v.SamplesNeeded <= n {
		v.SamplesNeeded = n + 1
	}
	return v
}

func ceilN(x float64) int64 {
	if math.IsInf(x, 0) || math.IsNaN(x) || x > 1e15 {
		return 1e15
	}
	return int64(math.Ceil(x))
}
