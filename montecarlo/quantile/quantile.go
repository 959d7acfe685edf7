// Package quantile holds the mergeable sketches behind the percentiles and
// histograms of a run: exact integer counts in bins of a fixed, monotone
// transform of the value, and the values outside the bins counted apart
// with their extremes. Counts and extremes merge in any order to the same
// bits, so percentiles stay independent of the number of workers. A
// percentile comes with a bound on its rank error; where the bound is too
// loose (an atom, a very heavy tail) the runner refines the cell that holds
// it by a second pass over the same samples, in a sketch of that cell alone
// that also keeps every bin's extremes.
package quantile

import (
	"math"
	"slices"
)

// Sketch counts values in bins of equal width in t(x), a transform that is
// linear within one scale of the centre and logarithmic beyond, so that a
// sketch sized from a pilot resolves the body of a distribution finely and
// still spans a heavy tail:
//
//	y = (x − Centre)/Scale,  t = y for |y| ≤ 1,  t = sign(y)·(1 + ln 2·log₂*(|y|)) beyond,
//
// with log₂* the piecewise-linear log₂ read from the float's bits (exact,
// monotone, and cheap: no call to math.Log per value).
type Sketch struct {
	Centre, Scale float64
	TLo, THi      float64 // range of t covered by the bins
	Counts        []int64 // values per bin
	// Min and Max hold each bin's smallest and largest value (±Inf when
	// empty); only refinement sketches keep them (nil otherwise).
	Min, Max    []float64
	Under, Over int64 // values below and above the range (NaN counts as Over)
	// Extremes of the values outside the range, and of all values.
	UnderMin, UnderMax, OverMin, OverMax float64
	Lowest, Highest                      float64
	inv                                  float64 // bins per unit of t
	// A refinement sketch counts only the values of one cell of its parent.
	parent *Sketch
	ofBin  int
}

// Bins is the resolution of the sketches the runner keeps: with the range
// from a pilot, a bin of a smooth distribution holds well under 0.1 % of
// the values (about 0.05 % at the centre of a normal).
const Bins = 4096

// New returns an empty sketch of n bins over t ∈ [tlo, thi) with the given
// centre and scale (> 0).
func New(centre, scale, tlo, thi float64, n int) Sketch {
	if !(scale > 0) || math.IsInf(scale, 0) {
		scale = 1
	}
	if !(thi > tlo) {
		tlo, thi = -1, 1
	}
	return Sketch{Centre: centre, Scale: scale, TLo: tlo, THi: thi, Counts: make([]int64, n),
		UnderMin: math.Inf(1), UnderMax: math.Inf(-1), OverMin: math.Inf(1), OverMax: math.Inf(-1),
		Lowest: math.Inf(1), Highest: math.Inf(-1), inv: float64(n) / (thi - tlo), ofBin: -2}
}

// Empty returns a sketch with the same bins as h and no values.
func (h *Sketch) Empty() Sketch {
	e := New(h.Centre, h.Scale, h.TLo, h.THi, len(h.Counts))
	e.parent, e.ofBin = h.parent, h.ofBin
	if h.Min != nil {
		e.keepExtremes()
	}
	return e
}

func (h *Sketch) keepExtremes() {
	h.Min, h.Max = make([]float64, len(h.Counts)), make([]float64, len(h.Counts))
	for i := range h.Min {
		h.Min[i], h.Max[i] = math.Inf(1), math.Inf(-1)
	}
}

const one = 0x3ff0000000000000 // bits of 1.0

// T returns the transformed coordinate t of x.
func (h *Sketch) T(x float64) float64 { return transform((x - h.Centre) / h.Scale) }

func transform(y float64) float64 {
	if y <= 1 && y >= -1 {
		return y
	}
	a := math.Abs(y)
	l := float64(math.Float64bits(a)-one) * (math.Ln2 / (1 << 52)) // ln 2 · log₂*(a)
	if y < 0 {
		return -1 - l
	}
	return 1 + l
}

// untransform is the inverse of transform.
func untransform(t float64) float64 {
	if t <= 1 && t >= -1 {
		return t
	}
	a := math.Abs(t) - 1
	y := math.Float64frombits(one + uint64(a*((1<<52)/math.Ln2)))
	if t < 0 {
		return -y
	}
	return y
}

// X returns the value at transformed coordinate t.
func (h *Sketch) X(t float64) float64 { return h.Centre + h.Scale*untransform(t) }

// binOf returns the bin of x: −1 below the range, len(Counts) above (and
// for NaN).
func (h *Sketch) binOf(x float64) int {
	f := (transform((x-h.Centre)/h.Scale) - h.TLo) * h.inv
	switch {
	case f < 0:
		return -1
	case f < float64(len(h.Counts)):
		return int(f)
	}
	return len(h.Counts)
}

// Add counts one value. It does not allocate.
func (h *Sketch) Add(x float64) {
	f := (transform((x-h.Centre)/h.Scale) - h.TLo) * h.inv
	switch {
	case f < 0:
		h.Under++
		h.UnderMin, h.UnderMax = math.Min(h.UnderMin, x), math.Max(h.UnderMax, x)
		h.Lowest = math.Min(h.Lowest, x)
	case f < float64(len(h.Counts)):
		i := int(f)
		h.Counts[i]++
		if x < h.Lowest {
			h.Lowest = x
		}
		if x > h.Highest {
			h.Highest = x
		}
		if h.Min != nil {
			h.Min[i], h.Max[i] = math.Min(h.Min[i], x), math.Max(h.Max[i], x)
		}
	default: // above the range, +Inf or NaN
		h.Over++
		if x == x {
			h.OverMin, h.OverMax = math.Min(h.OverMin, x), math.Max(h.OverMax, x)
			h.Highest = math.Max(h.Highest, x)
		}
	}
}

// Merge adds o (same bins) into h. Counts add and extremes take the min and
// max, so merging in any order gives the same bits.
func (h *Sketch) Merge(o *Sketch) {
	for i, c := range o.Counts {
		h.Counts[i] += c
	}
	if h.Min != nil {
		for i := range h.Min {
			h.Min[i], h.Max[i] = math.Min(h.Min[i], o.Min[i]), math.Max(h.Max[i], o.Max[i])
		}
	}
	h.Under += o.Under
	h.Over += o.Over
	h.UnderMin, h.UnderMax = math.Min(h.UnderMin, o.UnderMin), math.Max(h.UnderMax, o.UnderMax)
	h.OverMin, h.OverMax = math.Min(h.OverMin, o.OverMin), math.Max(h.OverMax, o.OverMax)
	h.Lowest, h.Highest = math.Min(h.Lowest, o.Lowest), math.Max(h.Highest, o.Highest)
}

// Total returns the number of values counted.
func (h *Sketch) Total() int64 {
	t := h.Under + h.Over
	for _, c := range h.Counts {
		t += c
	}
	return t
}

// edge returns the lower edge in x of bin i.
func (h *Sketch) edge(i int) float64 {
	return h.X(h.TLo + (h.THi-h.TLo)*float64(i)/float64(len(h.Counts)))
}

// Cell is the part of a sketch that holds one percentile: a bin, or the
// values below or above the bins.
type Cell struct {
	Below int64 // values before the cell
	Count int64 // values in the cell
	// Lo and Hi bound the cell's values: its smallest and largest value
	// where known, else its bin's edges (Hi then exclusive).
	Lo, Hi float64
	Exact  bool // Lo and Hi are the extremes of the values
	Bin    int  // bin index, −1 below the bins, len(Counts) above
	sketch *Sketch
}

// Percentile is one reported percentile.
type Percentile struct {
	Level float64
	Value float64
	// RankError bounds how far the level of Value may lie from Level: Value
	// lies between the empirical quantiles (the inverse of the empirical
	// CDF) at Level − RankError and Level + RankError. Zero when the value
	// is one of the counted values.
	RankError float64
	Cell      Cell
}

// cell returns the cell holding rank r (1 ≤ r ≤ total).
func (h *Sketch) cell(r int64) Cell {
	acc := h.Under
	if r <= acc {
		return Cell{Count: h.Under, Lo: h.UnderMin, Hi: h.UnderMax, Exact: true, Bin: -1, sketch: h}
	}
	for i, c := range h.Counts {
		if c == 0 {
			continue
		}
		if acc+c >= r {
			if h.Min != nil {
				return Cell{Below: acc, Count: c, Lo: h.Min[i], Hi: h.Max[i], Exact: true, Bin: i, sketch: h}
			}
			return Cell{Below: acc, Count: c, Lo: h.edge(i), Hi: h.edge(i + 1), Bin: i, sketch: h}
		}
		acc += c
	}
	return Cell{Below: acc, Count: h.Over, Lo: h.OverMin, Hi: h.OverMax, Exact: true, Bin: len(h.Counts), sketch: h}
}

// Rank returns the rank (1 … n) of the empirical p-quantile of n values
// (the inverse of the empirical CDF).
func Rank(p float64, n int64) int64 { return min(max(int64(math.Ceil(p*float64(n))), 1), n) }

// Quantile returns the p-quantile (0 < p < 1) of the counted values with a
// bound on its rank error. Inside a cell the value is interpolated by rank
// between the cell's bounds, so it lies between the empirical quantiles at
// the ranks just before and just after the cell. NaN when the sketch is
// empty.
func (h *Sketch) Quantile(p float64) Percentile { return h.quantileOf(p, 0, h.Total()) }

// QuantileWithin returns the p-quantile of a sample of total values of
// which the sketch (a refinement, see Refine) holds those of one cell,
// below others lying before it.
func (h *Sketch) QuantileWithin(p float64, below, total int64) Percentile {
	return h.quantileOf(p, below, total)
}

func (h *Sketch) quantileOf(p float64, below, n int64) Percentile {
	out := Percentile{Level: p, Value: math.NaN(), RankError: 1}
	if n == 0 || h.Total() == 0 {
		return out
	}
	r := min(max(Rank(p, n)-below, 1), h.Total()) // rank within this sketch
	c := h.cell(r)
	out.Cell = c
	out.Cell.Below += below
	if !c.Exact { // the values of an outermost bin lie within the extremes of all values
		out.Cell.Lo, out.Cell.Hi = math.Max(c.Lo, h.Lowest), math.Min(c.Hi, h.Highest)
		c.Lo, c.Hi = out.Cell.Lo, out.Cell.Hi
		c.Exact = c.Lo == c.Hi
	}
	switch {
	case c.Exact && (c.Lo == c.Hi || c.Count == 1):
		out.Value, out.RankError = c.Lo, 0
	case c.Exact:
		frac := float64(r-c.Below-1) / float64(c.Count-1)
		out.Value = c.Lo + frac*(c.Hi-c.Lo)
		out.RankError = float64(c.Count) / float64(n)
	default: // bin edges: the values lie in [Lo, Hi)
		frac := (float64(r-c.Below) - 0.5) / float64(c.Count)
		out.Value = c.Lo + frac*(c.Hi-c.Lo)
		out.RankError = float64(c.Count) / float64(n)
	}
	if math.IsInf(out.Value, 0) || math.IsNaN(out.Value) {
		out.RankError = 1
	}
	return out
}

// Refine returns an empty sketch of n linear bins spanning a cell (which
// must come from Quantile of a sketch that still exists), for a second
// pass over the same samples: Add only the values for which Contains
// holds. It keeps every bin's extremes, so an atom resolves exactly.
func Refine(c Cell, n int) Sketch {
	mid, half := (c.Lo+c.Hi)/2, (c.Hi-c.Lo)/2
	if !(half > 0) || math.IsInf(half, 0) {
		half = math.Max(math.Abs(mid)*1e-12, 1e-300)
	}
	h := New(mid, half, -1, math.Nextafter(1, 2), n)
	h.keepExtremes()
	h.parent, h.ofBin = c.sketch, c.Bin
	return h
}

// Contains reports whether x falls in the cell a refinement sketch counts
// (decided by the parent's own binning, so no value is lost or counted
// twice at an edge); true for a sketch that refines nothing.
func (h *Sketch) Contains(x float64) bool {
	for s := h; s.parent != nil; s = s.parent {
		if s.parent.binOf(x) != s.ofBin {
			return false
		}
	}
	return true
}

// FractionBelow returns the share of values below x, interpolated linearly
// in t inside the bin that holds x.
func (h *Sketch) FractionBelow(x float64) float64 {
	n := h.Total()
	if n == 0 {
		return math.NaN()
	}
	if !(x > h.X(h.TLo)) {
		if x > h.UnderMax {
			return float64(h.Under) / float64(n)
		}
		return 0
	}
	f := (h.T(x) - h.TLo) * h.inv
	acc := float64(h.Under)
	for i, c := range h.Counts {
		if float64(i+1) > f {
			acc += float64(c) * (f - float64(i))
			return acc / float64(n)
		}
		acc += float64(c)
	}
	return acc / float64(n)
}

// Bar is one bar of a picture of the sketch: the values in [Lo, Hi).
type Bar struct {
	Lo, Hi float64
	Count  float64
}

// Bars regroups the sketch into n bars of equal width in x over [lo, hi)
// for pictures, splitting each bin's count in proportion to its overlap
// (in t) with each bar; values outside [lo, hi) are left out.
func (h *Sketch) Bars(lo, hi float64, n int) []Bar {
	bars := make([]Bar, n)
	bw := (hi - lo) / float64(n)
	for i := range bars {
		bars[i].Lo, bars[i].Hi = lo+bw*float64(i), lo+bw*float64(i+1)
	}
	w := (h.THi - h.TLo) / float64(len(h.Counts))
	for i, c := range h.Counts {
		if c == 0 {
			continue
		}
		t0, t1 := h.TLo+w*float64(i), h.TLo+w*float64(i+1)
		x0, x1 := math.Max(h.X(t0), lo), math.Min(h.X(t1), hi)
		if x1 <= x0 {
			continue
		}
		for b := max(int((x0-lo)/bw), 0); b < n && bars[b].Lo < x1; b++ {
			o0, o1 := math.Max(t0, h.T(bars[b].Lo)), math.Min(t1, h.T(bars[b].Hi))
			if o1 > o0 {
				bars[b].Count += float64(c) * (o1 - o0) / (t1 - t0)
			}
		}
	}
	return bars
}

// Range returns bounds of the values counted: the extremes outside the
// bins, else the edges of the outermost non-empty bins (±Inf when empty).
func (h *Sketch) Range() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	if h.Under > 0 {
		lo = h.UnderMin
	} else {
		for i, c := range h.Counts {
			if c > 0 {
				lo = h.edge(i)
				break
			}
		}
	}
	if h.Over > 0 && !math.IsInf(h.OverMax, -1) {
		hi = h.OverMax
	} else {
		for i := len(h.Counts) - 1; i >= 0; i-- {
			if h.Counts[i] > 0 {
				hi = h.edge(i + 1)
				break
			}
		}
	}
	if math.IsInf(lo, 1) && h.Over > 0 {
		lo = h.OverMin
	}
	if math.IsInf(hi, -1) && h.Under > 0 {
		hi = h.UnderMax
	}
	return lo, hi
}

// The pilot quantiles that set a sketch's range: well outside the reported
// levels (1 % … 99 %), so that a reported percentile falls among the bins
// unless the pilot misjudged the tails badly.
const pilotLo, pilotHi = 0.002, 0.998

// FromPilot returns an empty sketch of n bins sized from pilot values: the
// centre is their median, the scale their interquartile range/1.349 (the sd
// of a normal), the range of t that of the pilot's 0.2 % and 99.8 %
// quantiles widened by a quarter on each side. Non-finite values are left
// out; with no spread the scale is taken from the centre.
func FromPilot(values []float64, n int) Sketch {
	v := make([]float64, 0, len(values))
	for _, x := range values {
		if !math.IsNaN(x) && !math.IsInf(x, 0) {
			v = append(v, x)
		}
	}
	if len(v) == 0 {
		return New(0, 1, -4, 4, n)
	}
	slices.Sort(v)
	q := func(p float64) float64 { return v[min(int(p*float64(len(v))), len(v)-1)] }
	c := q(0.5)
	s := (q(0.75) - q(0.25)) / 1.349
	if !(s > 0) {
		s = (q(pilotHi) - q(pilotLo)) / 6
	}
	if !(s > 0) {
		s = math.Max(math.Abs(c)*1e-3, 1e-12)
	}
	h := Sketch{Centre: c, Scale: s}
	tlo, thi := h.T(q(pilotLo)), h.T(q(pilotHi))
	span := math.Max(thi-tlo, 2)
	return New(c, s, tlo-span/4, thi+span/4, n)
}
