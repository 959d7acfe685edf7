package life

import (
	"math"
	"testing"
)

// reference-data-2 A3/A5 worked check 1 (computed): σASV ~ LN(median
// 48.875 MPa, c.o.v. 0.10), σa = 60 MPa, k = 3: N50 = 2·10⁶·(48.875/60)³,
// sd(ln N) = 3·sqrt(ln 1.01).
var a3 = LognormalFromMedian(2e6*math.Pow(48.875/60, 3), 3*math.Sqrt(math.Log(1.01)))

func TestLognormalWorkedCheck(t *testing.T) {
	t.Parallel()
	near(t, "N50", math.Exp(a3.Mu), 1.08103e6, 5e-6)
	near(t, "sd(ln N)", a3.Sigma, 0.299254, 2e-6)
	for _, tc := range []struct {
		p, want, rel float64 // rel: half a unit of the last printed digit
	}{{0.5, 1.08103e6, 5e-6}, {0.1, 7.36683e5, 1e-6}, {0.01, 5.38883e5, 1e-6}, {0.001, 4.28762e5, 2e-6}} {
		got, err := a3.BLife(tc.p)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "B life", got, tc.want, tc.rel)
	}
	for _, tc := range []struct {
		n, want, rel float64
	}{{5e5, 0.995011, 1e-6}, {1e6, 0.602704, 1e-6}, {2e6, 0.019896, 3e-5}} {
		got, _ := a3.Reliability(tc.n) // R flat beyond ND = 2·10⁶: the life is +Inf there
		near(t, "R", got, tc.want, tc.rel)
	}
}

func TestWeibullAndSuccessRun(t *testing.T) {
	t.Parallel()
	w := Weibull{Eta: 1e6, Beta: 3} // reference-data-2 A5 worked check 2 (computed)
	b10, _ := w.BLife(0.1)
	b1, _ := w.BLife(0.01)
	mttf, _ := w.MTTF()
	near(t, "B10", b10, 4.72309e5, 1e-6)
	near(t, "B1", b1, 2.15804e5, 2e-6)
	near(t, "MTTF", mttf, 8.92980e5, 1e-6)
	r, _ := w.Reliability(b10)
	near(t, "R(B10)", r, 0.9, 1e-12)
	for _, tc := range []struct {
		r, c  float64
		n     float64
		units int64
	}{ // reference-data-2 A5 worked check 3 (computed)
		{0.9, 0.9, 21.854, 22}, {0.9, 0.95, 28.433, 29}, {0.99, 0.9, 229.105, 230}, {0.99, 0.95, 298.073, 299},
	} {
		n, u, err := SuccessRun(tc.r, tc.c)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "success run", n, tc.n, 2e-5)
		if u != tc.units {
			t.Errorf("R %g C %g: %d units, want %d", tc.r, tc.c, u, tc.units)
		}
	}
	if _, _, err := SuccessRun(1, 0.9); err == nil {
		t.Error("R = 1 accepted")
	}
	if _, err := (Weibull{Eta: 0, Beta: 2}).BLife(0.1); err == nil {
		t.Error("η = 0 accepted")
	}
	if _, err := (Lognormal{Mu: 1, Sigma: 0}).BLife(0.1); err == nil {
		t.Error("σ = 0 accepted")
	}
}
