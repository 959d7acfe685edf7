package life

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestClopperPearson(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		x, n   int64
		conf   float64
		lo, hi float64 // computed: scipy 1.10 stats.beta.ppf with the Clopper–Pearson parameters
	}{
		{5, 20, 0.95, 0.08657146910143462, 0.49104587170795744},
		{397, 1000, 0.95, 0.3665163044933979, 0.4280919695508241},
		{0, 50, 0.9, 0, 0.05815507911697226}, // = 1 − 0.05^(1/50) (computed)
		{50, 50, 0.9, 0.9418449208830277, 1},
		{1, 100000, 0.999, 5.0012504043167305e-09, 9.998227635705541e-05},
	} {
		lo, hi, err := ClopperPearson(tc.x, tc.n, tc.conf)
		if err != nil {
			t.Fatal(err)
		}
		if tc.lo == 0 {
			if lo != 0 {
				t.Errorf("x = 0: lower %g", lo)
			}
		} else {
			near(t, "lower", lo, tc.lo, 1e-9)
		}
		near(t, "upper", hi, tc.hi, 1e-9)
	}
	for _, bad := range [][3]float64{{-1, 10, 0.9}, {11, 10, 0.9}, {1, 0, 0.9}, {1, 10, 1}, {1, 10, 0}} {
		if _, _, err := ClopperPearson(int64(bad[0]), int64(bad[1]), bad[2]); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
}

func TestOrderStatisticRanks(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		n       int64
		p, conf float64
		lower   int64
		lowCov  float64
		upper   int64
		upCov   float64
	}{
		// reference-data-2 A5: n = 1000, 95 % lower bound on B10 = 85th smallest, coverage 0.9515 (computed);
		// upper rank and B1 ranks computed with scipy.stats.binom
		{1000, 0.1, 0.95, 85, 0.9514974931008542, 117, 0.9566561087619765},
		{1000, 0.01, 0.9, 6, 0.9338604883927486, 15, 0.9175876804839115},
		// success run (reference-data-2 A5): 29 lives are the fewest giving a 95 % lower bound on B10
		{29, 0.1, 0.95, 1, 0.9528987130275375, 7, 0.9783832842036875},
		{28, 0.1, 0.95, 0, 0, 7, 0.982093310100574},
		// no upper bound when P(Bin(n, p) ≤ n − 1) = 1 − p^n < C
		{2, 0.9, 0.95, 1, 0.99, 0, 0},
	} {
		r, c := LowerRank(tc.n, tc.p, tc.conf)
		if r != tc.lower {
			t.Errorf("n %d p %g: lower rank %d, want %d", tc.n, tc.p, r, tc.lower)
		} else if r > 0 {
			near(t, "lower coverage", c, tc.lowCov, 1e-9)
		}
		s, c := UpperRank(tc.n, tc.p, tc.conf)
		if s != tc.upper {
			t.Errorf("n %d p %g: upper rank %d, want %d", tc.n, tc.p, s, tc.upper)
		} else if s > 0 {
			near(t, "upper coverage", c, tc.upCov, 1e-9)
		}
	}
}

// BLife on the grid: the reported cells hold the exact order statistics,
// and the bounds are the cells' conservative ends.
func TestBLifeCells(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(3, 5))
	lives := make([]float64, 1000)
	for i := range lives {
		lives[i] = math.Exp(13.5 + 0.4*r.NormFloat64())
	}
	a := mustAcc(t, DefaultGrid, 5e5)
	for _, l := range lives {
		a.Add(l)
	}
	slices.Sort(lives)
	b, err := a.BLife(0.1, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	res := DefaultGrid.Resolution()
	if b.Status != Reached || b.Rank != 100 || b.LowerRank != 85 || b.UpperRank != 117 {
		t.Fatalf("%+v", b)
	}
	if x := lives[b.Rank-1]; !(b.Lo < x && x <= b.Hi) || math.Abs(b.Hi/b.Lo-res) > 1e-12 {
		t.Errorf("B10 cell (%g, %g] does not hold the 100th smallest life %g", b.Lo, b.Hi, x)
	}
	if x := lives[b.LowerRank-1]; !(b.Lower < x && x <= b.Lower*res*(1+1e-12)) {
		t.Errorf("lower bound %g is not the lower edge of the cell of the 85th smallest life %g", b.Lower, x)
	}
	if x := lives[b.UpperRank-1]; !(b.Upper >= x && x > b.Upper/res*(1-1e-12)) {
		t.Errorf("upper bound %g is not the upper edge of the cell of the 117th smallest life %g", b.Upper, x)
	}
}

func TestBLifeStatus(t *testing.T) {
	t.Parallel()
	a := mustAcc(t, DefaultGrid, 1e6)
	for i := range 1000 {
		switch {
		case i < 50:
			a.Add(3e5)
		case i < 80:
			a.Add(5e12) // above the grid
		default:
			a.Add(math.Inf(1))
		}
	}
	for _, tc := range []struct {
		p    float64
		want Status
	}{{0.01, Reached}, {0.07, BeyondGrid}, {0.1, NotReached}} {
		b, err := a.BLife(tc.p, 0.9)
		if err != nil {
			t.Fatal(err)
		}
		if b.Status != tc.want {
			t.Errorf("B%g: %v, want %v", 100*tc.p, b.Status, tc.want)
		}
		if tc.want != Reached && !math.IsInf(b.Hi, 1) {
			t.Errorf("B%g: Hi = %g, want +Inf", 100*tc.p, b.Hi)
		}
	}
	ever, _ := a.EverFails(0.95)
	if ever.Count != 80 || ever.P != 0.08 {
		t.Errorf("ever fails %+v", ever)
	}
	des, _ := a.DesignFailure(0.95)
	if des.Count != 50 {
		t.Errorf("design failures %+v", des)
	}
	// ⌈p·n⌉ with p·n rounded up in floating point: 0.07·100 → rank 7
	if b, _ := a.BLife(0.07, 0.9); b.Rank != 70 {
		t.Errorf("B7 of 1000: rank %d, want 70", b.Rank)
	}
	h := mustAcc(t, DefaultGrid, 1e6)
	for range 100 {
		h.Add(1e5)
	}
	if b, _ := h.BLife(0.07, 0.9); b.Rank != 7 {
		t.Errorf("B7 of 100: rank %d, want 7", b.Rank)
	}
	// too few lives for a lower bound: 20 lives, B10 at 95 % (needs 29)
	s := mustAcc(t, DefaultGrid, 1e6)
	for range 20 {
		s.Add(1e5)
	}
	b, _ := s.BLife(0.1, 0.95)
	if b.LowerRank != 0 || b.Lower != 0 {
		t.Errorf("20 lives: lower rank %d, bound %g, want 0, 0", b.LowerRank, b.Lower)
	}
	if _, err := s.BLife(0, 0.9); err == nil {
		t.Error("p = 0 accepted")
	}
	if _, err := s.BLife(0.1, 1.5); err == nil {
		t.Error("confidence 1.5 accepted")
	}
	if _, err := mustAcc(t, DefaultGrid, 1e6).Reliability(0.9); err == nil {
		t.Error("empty accumulator gave a curve")
	}
}
