package life

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"boltrisk/model/fatigue"
)

func TestGrid(t *testing.T) {
	t.Parallel()
	p := DefaultGrid.Points()
	if len(p) != 1001 || p[0] != 1e2 || p[1000] != 1e12 || p[400] != 1e6 || p[100] != 1e3 {
		t.Errorf("default grid: %d points, %g … %g, p[400] = %g", len(p), p[0], p[len(p)-1], p[400])
	}
	if !slices.IsSorted(p) {
		t.Error("grid not increasing")
	}
	near(t, "resolution", DefaultGrid.Resolution(), 1.023292992280754, 1e-15) // 10^(1/100) (computed)
	near(t, "p[470]", p[470], math.Pow(10, 6.7), 1e-15)
	coarse := Grid{MinExp: 2, MaxExp: 12, PerDecade: 20}.Points()
	if len(coarse) != 201 || coarse[80] != 1e6 {
		t.Errorf("20 per decade: %d points, p[80] = %g", len(coarse), coarse[80])
	}
	for _, g := range []Grid{{2, 2, 10}, {-1, 5, 10}, {2, 31, 10}, {2, 12, 0}, {2, 12, 1001}} {
		if g.Validate() == nil {
			t.Errorf("grid %+v accepted", g)
		}
	}
	if _, err := NewAccumulator(DefaultGrid, 0); err == nil {
		t.Error("design life 0 accepted")
	}
	if _, err := NewAccumulator(DefaultGrid, math.Inf(1)); err == nil {
		t.Error("design life +Inf accepted")
	}
}

// Lives at, just above and just below grid points land in the right cells,
// and the counts at grid points and at the design life are exact.
func TestAccumulatorCells(t *testing.T) {
	t.Parallel()
	a := mustAcc(t, DefaultGrid, 5e5)
	p := a.Points()
	lives := []float64{0, 50, 1e2, math.Nextafter(1e2, 2e2), 1e6, math.Nextafter(1e6, 0), math.Nextafter(1e6, 2e6),
		p[57], math.Nextafter(p[57], 0), math.Nextafter(p[57], 1e12), 5e5, math.Nextafter(5e5, 1e6), 1e12, 2e12, math.Inf(1), math.Inf(1)}
	for _, l := range lives {
		a.Add(l)
	}
	if a.N() != int64(len(lives)) || a.Failures() != int64(len(lives)-2) {
		t.Errorf("N %d, failures %d", a.N(), a.Failures())
	}
	for j, g := range p {
		var want int64
		for _, l := range lives {
			if l <= g {
				want++
			}
		}
		if got := a.FailuresBy(j); got != want {
			t.Errorf("lives ≤ %g: %d, want %d", g, got, want)
		}
	}
	var want int64
	for _, l := range lives {
		if l <= 5e5 {
			want++
		}
	}
	if a.FailuresByDesign() != want {
		t.Errorf("lives ≤ design life: %d, want %d", a.FailuresByDesign(), want)
	}
	defer func() {
		if recover() == nil {
			t.Error("Add(NaN) did not panic")
		}
	}()
	a.Add(math.NaN())
}

// Accumulators filled from any split of the samples and merged in any
// order are identical (integer counts).
func TestMergeAnyOrder(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(7, 11))
	lives := make([]float64, 20000)
	for i := range lives {
		if r.Float64() < 0.2 {
			lives[i] = math.Inf(1)
		} else {
			lives[i] = math.Exp(13 + 2*r.NormFloat64())
		}
	}
	whole := mustAcc(t, DefaultGrid, 3e5)
	for _, l := range lives {
		whole.Add(l)
	}
	parts := make([]*Accumulator, 7)
	for i := range parts {
		parts[i] = mustAcc(t, DefaultGrid, 3e5)
	}
	for i, l := range lives {
		parts[(i*31)%7].Add(l)
	}
	for _, order := range [][]int{{0, 1, 2, 3, 4, 5, 6}, {6, 5, 4, 3, 2, 1, 0}, {3, 0, 6, 1, 5, 2, 4}} {
		m := mustAcc(t, DefaultGrid, 3e5)
		for _, i := range order {
			m.Merge(parts[i])
		}
		if !m.Equal(whole) {
			t.Errorf("merge order %v differs from the single accumulator", order)
		}
	}
	whole.Reset()
	if whole.N() != 0 || whole.FailuresBy(1000) != 0 {
		t.Error("Reset left counts")
	}
}

func TestNoAllocationsAdd(t *testing.T) {
	a := mustAcc(t, DefaultGrid, 1e6)
	x := 1.0
	if n := testing.AllocsPerRun(10000, func() { x *= 1.37; a.Add(x) }); n != 0 {
		t.Errorf("Add: %g allocations, want 0", n)
	}
}

func BenchmarkAccumulatorAdd(b *testing.B) {
	a := mustAcc(b, DefaultGrid, 1e6)
	r := rand.New(rand.NewPCG(1, 2))
	lives := make([]float64, 1024)
	for i := range lives {
		lives[i] = math.Exp(13 + 2*r.NormFloat64())
	}
	for i := 0; b.Loop(); i++ {
		a.Add(lives[i&1023])
	}
}

// One Monte Carlo sample of the life chain: a sampled strength factor, the
// VDI 2230-1 life at σa = 60 MPa and the count; it allocates nothing.
func BenchmarkSampleLife(b *testing.B) {
	a := mustAcc(b, DefaultGrid, 5e5)
	v, _ := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	src := rand.New(rand.NewPCG(1, 2))
	c := fatigue.Cycle{Amplitude: 60}
	for b.Loop() {
		s, _ := v.Scaled(math.Exp(0.1 * src.NormFloat64()))
		l, _ := s.Life(c)
		a.Add(l.Cycles)
	}
}

func TestNoAllocationsSample(t *testing.T) {
	a := mustAcc(t, DefaultGrid, 5e5)
	v, _ := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	src := rand.New(rand.NewPCG(1, 2))
	c := fatigue.Cycle{Amplitude: 60}
	if n := testing.AllocsPerRun(10000, func() {
		s, _ := v.Scaled(math.Exp(0.1 * src.NormFloat64()))
		l, _ := s.Life(c)
		a.Add(l.Cycles)
	}); n != 0 {
		t.Errorf("sample: %g allocations, want 0", n)
	}
}
