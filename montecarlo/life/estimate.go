package life

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// ClopperPearson returns the exact two-sided binomial confidence interval
// (Clopper & Pearson 1934, Biometrika 26:404–413; from memory) for x
// events in n trials at confidence conf:
//
//	lower = Beta(x, n − x + 1) quantile at (1 − conf)/2   (0 for x = 0)
//	upper = Beta(x + 1, n − x) quantile at (1 + conf)/2   (1 for x = n)
//
// with gonum's Beta quantiles. Its coverage is at least conf for every p.
func ClopperPearson(x, n int64, conf float64) (lo, hi float64, err error) {
	if n < 1 || x < 0 || x > n {
		return 0, 0, fmt.Errorf("life: Clopper–Pearson with %d events in %d trials: allowed 0 ≤ events ≤ trials, trials ≥ 1", x, n)
	}
	if err := checkConf(conf); err != nil {
		return 0, 0, err
	}
	alpha := 1 - conf
	lo, hi = 0, 1
	if x > 0 {
		lo = distuv.Beta{Alpha: float64(x), Beta: float64(n - x + 1)}.Quantile(alpha / 2)
	}
	if x < n {
		hi = distuv.Beta{Alpha: float64(x + 1), Beta: float64(n - x)}.Quantile(1 - alpha/2)
	}
	return lo, hi, nil
}

func checkConf(conf float64) error {
	if !(conf > 0 && conf < 1) {
		return fmt.Errorf("life: confidence %g: allowed 0 < confidence < 1", conf)
	}
	return nil
}

func checkP(p float64) error {
	if !(p > 0 && p < 1) {
		return fmt.Errorf("life: probability %g: allowed 0 < p < 1", p)
	}
	return nil
}

// Proportion is an estimated probability with its two-sided exact interval.
type Proportion struct {
	Count, N     int64
	P            float64 // Count/N
	Lower, Upper float64 // Clopper–Pearson interval at Confidence
	Confidence   float64
}

func proportion(x, n int64, conf float64) (Proportion, error) {
	if n == 0 {
		return Proportion{}, fmt.Errorf("life: no lives counted")
	}
	lo, hi, err := ClopperPearson(x, n, conf)
	if err != nil {
		return Proportion{}, err
	}
	return Proportion{Count: x, N: n, P: float64(x) / float64(n), Lower: lo, Upper: hi, Confidence: conf}, nil
}

// DesignFailure returns the probability of failure within the design life,
// P(life ≤ design life), from the exact count.
func (a *Accumulator) DesignFailure(conf float64) (Proportion, error) {
	return proportion(a.byDesign, a.n, conf)
}

// EverFails returns the probability that a sample fails at all (finite life).
func (a *Accumulator) EverFails(conf float64) (Proportion, error) {
	return proportion(a.n-a.never, a.n, conf)
}

// Point is the reliability at one grid point.
type Point struct {
	Cycles       float64 // grid point N
	Failures     int64   // lives ≤ N
	Reliability  float64 // R(N) = P(life > N) = 1 − Failures/n
	Lower, Upper float64 // two-sided Clopper–Pearson interval on R(N)
}

// Reliability returns R(N) at every grid point with its two-sided exact
// interval at confidence conf. Grid points are cell edges, so the counts
// behind R(N) are exact (no binning error at the grid points).
func (a *Accumulator) Reliability(conf float64) ([]Point, error) {
	if a.n == 0 {
		return nil, fmt.Errorf("life: no lives counted")
	}
	if err := checkConf(conf); err != nil {
		return nil, err
	}
	out := make([]Point, len(a.points))
	var cum int64
	for j, g := range a.points {
		cum += a.counts[j]
		lo, hi, _ := ClopperPearson(cum, a.n, conf)
		out[j] = Point{Cycles: g, Failures: cum, Reliability: 1 - float64(cum)/float64(a.n), Lower: 1 - hi, Upper: 1 - lo}
	}
	return out, nil
}

// Status says whether a B_p life was found on the grid.
type Status uint8

const (
	// Reached: the B_p life lies in a grid cell.
	Reached Status = iota
	// BeyondGrid: at least p·n lives fail, but the ⌈p·n⌉-th smallest lies
	// above the last grid point.
	BeyondGrid
	// NotReached: fewer than p·n lives fail at all.
	NotReached
)

// String names the status.
func (s Status) String() string { return [...]string{"reached", "beyond grid", "not reached"}[s] }

// BLife is the life by which a fraction P of the population has failed,
// estimated from the simulated lives with distribution-free bounds.
type BLife struct {
	P, Confidence float64
	Status        Status
	// Rank is ⌈p·n⌉: the B_p estimate is the Rank-th smallest life (the
	// inverse of the empirical distribution function), which lies in the
	// grid cell (Lo, Hi] (Lo = 0 for the bottom cell, Hi = +Inf above the grid
	// or when not reached).
	Rank   int64
	Lo, Hi float64
	// LowerRank r is the largest rank with P(Bin(n, p) ≥ r) ≥ Confidence:
	// the r-th smallest life is a one-sided lower bound on B_p at that
	// confidence (LowerCoverage = P(Bin(n, p) ≥ r)). Lower is the lower edge
	// of the cell holding it (0 for the bottom cell; the last grid point if
	// above the grid). LowerRank = 0 when n is too small for any bound
	// (n < ln(1 − C)/ln(1 − p)); then Lower = 0.
	LowerRank     int64
	Lower         float64
	LowerCoverage float64
	// UpperRank s is the smallest rank with P(Bin(n, p) ≤ s − 1) ≥
	// Confidence: the s-th smallest life is a one-sided upper bound on B_p
	// (UpperCoverage = P(Bin(n, p) ≤ s − 1)). Upper is the upper edge of the
	// cell holding it, +Inf above the grid, for an infinite life, or when
	// no s ≤ n exists (UpperRank = 0).
	UpperRank     int64
	Upper         float64
	UpperCoverage float64
}

// BLife returns the B_p life (p = 0.1 for B10, 0.01 for B1) with one-sided
// distribution-free bounds at confidence conf. On the grid each order
// statistic is known to its cell only: the bounds are the cell's
// conservative end, so they are at most one grid step (a factor
// Grid.Resolution()) wider than the exact order statistics, and their
// coverage is at least LowerCoverage / UpperCoverage.
func (a *Accumulator) BLife(p, conf float64) (BLife, error) {
	if err := checkP(p); err != nil {
		return BLife{}, err
	}
	if err := checkConf(conf); err != nil {
		return BLife{}, err
	}
	if a.n == 0 {
		return BLife{}, fmt.Errorf("life: no lives counted")
	}
	// ⌈p·n⌉, ignoring the rounding of p·n (0.07·100 = 7.000000000000001)
	b := BLife{P: p, Confidence: conf, Rank: int64(math.Ceil(p*float64(a.n) - 1e-9))}
	if b.Rank < 1 {
		b.Rank = 1
	}
	b.Lo, b.Hi = a.cellOfRank(b.Rank)
	switch {
	case b.Rank > a.n-a.never:
		b.Status = NotReached
	case math.IsInf(b.Hi, 1):
		b.Status = BeyondGrid
	}
	b.LowerRank, b.LowerCoverage = LowerRank(a.n, p, conf)
	if b.LowerRank > 0 {
		b.Lower, _ = a.cellOfRank(b.LowerRank)
	}
	b.UpperRank, b.UpperCoverage = UpperRank(a.n, p, conf)
	b.Upper = math.Inf(1)
	if b.UpperRank > 0 {
		_, b.Upper = a.cellOfRank(b.UpperRank)
	}
	return b, nil
}

// cellOfRank returns the cell (lo, hi] holding the r-th smallest life
// (1 ≤ r ≤ n): lo = 0 for the bottom cell; hi = +Inf above the grid or for
// an infinite life, with lo the last grid point.
func (a *Accumulator) cellOfRank(r int64) (lo, hi float64) {
	var cum int64
	for k, c := range a.counts {
		cum += c
		if cum >= r {
			switch {
			case k == 0:
				return 0, a.points[0]
			case k == len(a.points):
				return a.points[k-1], math.Inf(1)
			}
			return a.points[k-1], a.points[k]
		}
	}
	return a.points[len(a.points)-1], math.Inf(1)
}

// binomAtLeast returns P(Bin(n, p) ≥ r) = I_p(r, n − r + 1) (regularized
// incomplete beta), 1 for r ≤ 0, 0 for r > n.
func binomAtLeast(n, r int64, p float64) float64 {
	switch {
	case r <= 0:
		return 1
	case r > n:
		return 0
	}
	return mathext.RegIncBeta(float64(r), float64(n-r+1), p)
}

// LowerRank returns the largest r (0 if none) with P(Bin(n, p) ≥ r) ≥ conf,
// and that probability: the r-th smallest of n lives is a distribution-free
// one-sided lower confidence bound on the p-quantile (exact order-statistic
// result for continuous lives; reference-data-2 A5, computed).
func LowerRank(n int64, p, conf float64) (r int64, coverage float64) {
	// P(Bin ≥ r) falls with r: binary search for the last r that keeps it ≥ conf.
	lo, hi := int64(0), n // invariant: P(≥ lo) ≥ conf; answer in [lo, hi]
	for lo < hi {
		mid := lo + (hi-lo+1)/2
		if binomAtLeast(n, mid, p) >= conf {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	if lo == 0 {
		return 0, 0
	}
	return lo, binomAtLeast(n, lo, p)
}

// UpperRank returns the smallest s ≤ n (0 if none) with
// P(Bin(n, p) ≤ s − 1) ≥ conf, and that probability: the s-th smallest of
// n lives is a distribution-free one-sided upper confidence bound on the
// p-quantile.
func UpperRank(n int64, p, conf float64) (s int64, coverage float64) {
	below := func(s int64) float64 { return 1 - binomAtLeast(n, s, p) } // P(Bin ≤ s − 1)
	if below(n) < conf {
		return 0, 0
	}
	lo, hi := int64(1), n // answer in [lo, hi], below(hi) ≥ conf
	for lo < hi {
		mid := lo + (hi-lo)/2
		if below(mid) >= conf {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return lo, below(lo)
}
