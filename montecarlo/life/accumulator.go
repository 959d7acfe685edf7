package life

import (
	"fmt"
	"math"
)

// Grid is a fixed logarithmic grid of cycle numbers
// 10^MinExp, 10^(MinExp + 1/PerDecade), …, 10^MaxExp.
type Grid struct {
	MinExp, MaxExp int // first and last decade exponent, 0 ≤ MinExp < MaxExp ≤ 30
	PerDecade      int // points per decade, 1…1000
}

// DefaultGrid runs from 10² to 10¹² cycles with 100 points per decade
// (1001 points): neighbouring points differ by the factor 10^(1/100) =
// 1.0233 (2.3 %), about 0.08 standard deviations of ln N for a typical
// bolt life scatter (sd(log10 N) ≈ 0.13, reference-data-2 A3).
var DefaultGrid = Grid{MinExp: 2, MaxExp: 12, PerDecade: 100}

// Validate checks the grid's ranges.
func (g Grid) Validate() error {
	if !(g.MinExp >= 0 && g.MinExp < g.MaxExp && g.MaxExp <= 30) {
		return fmt.Errorf("life: grid exponents %d…%d: allowed 0 ≤ MinExp < MaxExp ≤ 30", g.MinExp, g.MaxExp)
	}
	if !(g.PerDecade >= 1 && g.PerDecade <= 1000) {
		return fmt.Errorf("life: grid points per decade %d: allowed 1…1000", g.PerDecade)
	}
	return nil
}

// Points returns the grid's cycle numbers. Whole decades are exact.
func (g Grid) Points() []float64 {
	n := (g.MaxExp-g.MinExp)*g.PerDecade + 1
	p := make([]float64, n)
	for j := range p {
		e, k := g.MinExp+j/g.PerDecade, j%g.PerDecade
		p[j] = math.Pow10(e)
		if k != 0 {
			p[j] *= math.Pow(10, float64(k)/float64(g.PerDecade))
		}
	}
	return p
}

// Resolution returns the ratio of neighbouring grid points, 10^(1/PerDecade).
func (g Grid) Resolution() float64 { return math.Pow(10, 1/float64(g.PerDecade)) }

// Accumulator counts simulated lives (cycles to failure, +Inf for a sample
// that never fails) on a Grid. Counts are integers: accumulators filled from
// any split of the samples and merged in any order hold identical counts.
//
// Cell 0 holds lives ≤ g[0]; cell k (1 ≤ k < len(g)) holds lives in
// (g[k−1], g[k]]; cell len(g) holds finite lives above the grid; lives of
// +Inf are counted apart. The count of lives ≤ the design life is exact
// whatever the design life.
type Accumulator struct {
	grid     Grid
	points   []float64
	counts   []int64
	never    int64 // +Inf lives
	n        int64
	design   float64
	byDesign int64 // lives ≤ design
	logMin   float64
	perDec   float64
}

// NewAccumulator returns an empty accumulator on grid g that also counts
// the lives ≤ designLife (a finite number of cycles > 0).
func NewAccumulator(g Grid, designLife float64) (*Accumulator, error) {
	if err := g.Validate(); err != nil {
		return nil, err
	}
	if !(designLife > 0 && designLife < math.Inf(1)) {
		return nil, fmt.Errorf("life: design life %g cycles: allowed a finite number > 0", designLife)
	}
	pts := g.Points()
	return &Accumulator{
		grid: g, points: pts, counts: make([]int64, len(pts)+1), design: designLife,
		logMin: float64(g.MinExp), perDec: float64(g.PerDecade),
	}, nil
}

// Add counts one simulated life in cycles: a number ≥ 0, or +Inf for a
// sample that never fails. It does not allocate. A NaN or negative life is
// a programmer error and panics.
func (a *Accumulator) Add(life float64) {
	if !(life >= 0) {
		panic(fmt.Sprintf("life: Accumulator.Add(%g): a life must be ≥ 0 or +Inf", life))
	}
	a.n++
	if life <= a.design {
		a.byDesign++
	}
	if math.IsInf(life, 1) {
		a.never++
		return
	}
	a.counts[a.cell(life)]++
}

// cell returns the index of the cell holding a finite life.
func (a *Accumulator) cell(life float64) int {
	last := len(a.points) - 1
	switch {
	case life <= a.points[0]:
		return 0
	case life > a.points[last]:
		return last + 1
	}
	k := int(math.Ceil((math.Log10(life) - a.logMin) * a.perDec))
	k = min(max(k, 1), last)
	// the stored points define the cells: correct the rounding of Log10
	for k > 1 && life <= a.points[k-1] {
		k--
	}
	for life > a.points[k] {
		k++
	}
	return k
}

// Merge adds the counts of b, which must have the same grid and design
// life (a programmer error otherwise: it panics).
func (a *Accumulator) Merge(b *Accumulator) {
	if a.grid != b.grid || a.design != b.design {
		panic("life: Merge of accumulators with different grids or design lives")
	}
	for i, c := range b.counts {
		a.counts[i] += c
	}
	a.never += b.never
	a.n += b.n
	a.byDesign += b.byDesign
}

// Reset empties the accumulator, keeping its grid and design life.
func (a *Accumulator) Reset() {
	clear(a.counts)
	a.never, a.n, a.byDesign = 0, 0, 0
}

// Grid returns the accumulator's grid.
func (a *Accumulator) Grid() Grid { return a.grid }

// Points returns a copy of the grid points.
func (a *Accumulator) Points() []float64 { return append([]float64(nil), a.points...) }

// N returns the number of lives counted.
func (a *Accumulator) N() int64 { return a.n }

// Failures returns the number of finite lives (samples that fail at all).
func (a *Accumulator) Failures() int64 { return a.n - a.never }

// FailuresBy returns the number of lives ≤ the grid point j (exact).
func (a *Accumulator) FailuresBy(j int) int64 {
	var s int64
	for _, c := range a.counts[:j+1] {
		s += c
	}
	return s
}

// DesignLife returns the design life the accumulator counts against.
func (a *Accumulator) DesignLife() float64 { return a.design }

// FailuresByDesign returns the number of lives ≤ the design life (exact).
func (a *Accumulator) FailuresByDesign() int64 { return a.byDesign }

// Equal reports whether a and b hold the same grid, design life and counts.
func (a *Accumulator) Equal(b *Accumulator) bool {
	if a.grid != b.grid || a.design != b.design || a.n != b.n || a.never != b.never || a.byDesign != b.byDesign {
		return false
	}
	for i := range a.counts {
		if a.counts[i] != b.counts[i] {
			return false
		}
	}
	return true
}
