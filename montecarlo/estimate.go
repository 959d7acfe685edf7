package montecarlo

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Interval is a binomial proportion estimate with confidence bounds.
type Interval struct {
	Failures int64
	Samples  int64
	P        float64 // point estimate failures/samples
	Lo, Hi   float64 // bounds at the stated confidence
	// UpperOnly is set when there were no failures: Lo = 0 and Hi is the
	// one-sided exact (Clopper–Pearson) upper bound 1 − α^(1/n), ≈ 3/n at 95 %.
	UpperOnly bool
}

// RelHalfWidth returns (Hi − Lo)/(2·P), +Inf when P = 0.
func (iv Interval) RelHalfWidth() float64 {
	if iv.P == 0 {
		return math.Inf(1)
	}
	return (iv.Hi - iv.Lo) / (2 * iv.P)
}

// Wilson returns the Wilson score interval (Wilson 1927, J. Amer. Statist.
// Assoc. 22:209) for k failures in n trials at two-sided confidence conf:
//
//	centre = (p̂ + z²/2n)/(1 + z²/n),  half = z·√(p̂(1−p̂)/n + z²/4n²)/(1 + z²/n)
//
// With k = 0 it returns the one-sided exact upper bound instead (never a
// bare zero). The Wald interval is not used: it fails below ~20 failures.
func Wilson(k, n int64, conf float64) Interval {
	iv := Interval{Failures: k, Samples: n}
	if n == 0 {
		iv.Hi = 1
		return iv
	}
	nf := float64(n)
	p := float64(k) / nf
	iv.P = p
	if k == 0 {
		iv.UpperOnly = true
		iv.Hi = -math.Expm1(math.Log(1-conf) / nf) // 1 − α^(1/n)
		return iv
	}
	z := distuv.UnitNormal.Quantile(1 - (1-conf)/2)
	z2 := z * z
	den := 1 + z2/nf
	c := (p + z2/(2*nf)) / den
	h := z * math.Sqrt(p*(1-p)/nf+z2/(4*nf*nf)) / den
	iv.Lo, iv.Hi = math.Max(0, c-h), math.Min(1, c+h)
	return iv
}

// Histogram counts values in equal bins over [Lo, Hi), with the values
// below and above counted apart. Counts are integers, so merging histograms
// in any order gives the same result.
type Histogram struct {
	Lo, Hi float64
	Counts []int64
	Under  int64
	Over   int64
	inv    float64 // bins per unit of x
	nf     float64 // number of bins
}

// NewHistogram returns an empty histogram of n bins over [lo, hi).
func NewHistogram(lo, hi float64, n int) Histogram {
	if !(hi > lo) {
		hi = lo + 1
	}
	return Histogram{Lo: lo, Hi: hi, Counts: make([]int64, n), inv: float64(n) / (hi - lo), nf: float64(n)}
}

// Add counts one value. NaN counts as overflow.
func (h *Histogram) Add(x float64) {
	f := (x - h.Lo) * h.inv
	if f < 0 {
		h.Under++
		return
	}
	if !(f < h.nf) {
		h.Over++
		return
	}
	h.Counts[int(f)]++
}

// Merge adds the counts of o (same bins) into h.
func (h *Histogram) Merge(o *Histogram) {
	for i, c := range o.Counts {
		h.Counts[i] += c
	}
	h.Under += o.Under
	h.Over += o.Over
}

// Reset zeroes the counts.
func (h *Histogram) Reset() {
	clear(h.Counts)
	h.Under, h.Over = 0, 0
}

// Total returns the number of values counted.
func (h *Histogram) Total() int64 {
	t := h.Under + h.Over
	for _, c := range h.Counts {
		t += c
	}
	return t
}

// Width returns the bin width.
func (h *Histogram) Width() float64 { return (h.Hi - h.Lo) / float64(len(h.Counts)) }

// Quantile returns the q-quantile by linear interpolation inside its bin.
// A quantile that falls among the values below Lo (above Hi) returns Lo (Hi);
// its resolution is one bin width.
func (h *Histogram) Quantile(q float64) float64 {
	n := h.Total()
	if n == 0 {
		return math.NaN()
	}
	target := q * float64(n)
	acc := float64(h.Under)
	if target <= acc {
		return h.Lo
	}
	w := h.Width()
	for i, c := range h.Counts {
		if c == 0 {
			continue
		}
		if acc+float64(c) >= target {
			return h.Lo + w*(float64(i)+(target-acc)/float64(c))
		}
		acc += float64(c)
	}
	return h.Hi
}

// FractionBelow returns the share of values below x (bin-interpolated).
func (h *Histogram) FractionBelow(x float64) float64 {
	n := h.Total()
	if n == 0 {
		return math.NaN()
	}
	if x <= h.Lo {
		return float64(h.Under) / float64(n)
	}
	acc := float64(h.Under)
	w := h.Width()
	for i, c := range h.Counts {
		lo := h.Lo + w*float64(i)
		if x < lo+w {
			acc += float64(c) * (x - lo) / w
			return acc / float64(n)
		}
		acc += float64(c)
	}
	return acc / float64(n)
}
