package fit

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mathext"

	"boltrisk/montecarlo"
)

func TestProbabilityPlotData(t *testing.T) {
	t.Parallel()
	x := lz(t)
	for _, c := range []struct {
		kind  montecarlo.Kind
		paper Paper
		p1    float64 // first plotting position
	}{
		// Blom (1958): (1 − 0.375)/(23 + 0.25); Benard: (1 − 0.3)/(23 + 0.4).
		{montecarlo.Normal, NormalPaper, 0.625 / 23.25},
		{montecarlo.LogNormal, LognormalPaper, 0.625 / 23.25},
		{montecarlo.Weibull, WeibullPaper, 0.7 / 23.4},
		{montecarlo.Uniform, NormalPaper, 0.625 / 23.25},
	} {
		d, _, err := Estimate(c.kind, x, nil)
		if err != nil {
			t.Fatal(err)
		}
		pp, err := Probability(x, d, 0.90, Quantity{})
		if err != nil {
			t.Fatal(err)
		}
		if pp.Paper != c.paper || len(pp.Points) != 23 || pp.Shown != 23 || len(pp.Band) != 23 || len(pp.Line) != 101 {
			t.Fatalf("%v: paper %v, %d points, %d band, %d line", c.kind, pp.Paper, len(pp.Points), len(pp.Band), len(pp.Line))
		}
		near(t, c.kind.String()+" first position", pp.Points[0].P, c.p1, 1e-14)
		near(t, c.kind.String()+" smallest value", pp.Points[0].X, 17.88, 1e-14)
		for i, b := range pp.Band {
			if !(b.Lo < b.Hi) || b.P != pp.Points[i].P {
				t.Errorf("%v: band %d = %+v", c.kind, i, b)
			}
		}
		// The line is the fitted CDF: on the paper its inverse is the quantile.
		mid := pp.Line[50]
		near(t, c.kind.String()+" line", mid.X, d.Quantile(mid.P), 1e-12)
	}
	// Weibull paper is straight for the Weibull: ln(−ln(1 − F)) = k·ln x − k·ln λ.
	d, _, _ := Estimate(montecarlo.Weibull, x, nil)
	pp, _ := Probability(x, d, 0.9, Quantity{})
	for _, pt := range []PlotPoint{pp.Line[0], pp.Line[37], pp.Line[100]} {
		near(t, "Weibull paper", WeibullPaper.Y(pt.P), d.A*(math.Log(pt.X)-math.Log(d.B)), 1e-9)
	}
	near(t, "normal paper", NormalPaper.Y(0.975), mathext.NormalQuantile(0.975), 1e-15)
	near(t, "paper inverse", WeibullPaper.P(WeibullPaper.Y(0.3)), 0.3, 1e-14)
}

// A pointwise 90 % band of the order statistics holds each point of a
// sample from the true law with probability 0.90: over 200 points of 20
// samples the share inside lies within 0.90 ± 0.05 (the points of one
// sample are dependent; the sd of the share is below 0.02 here, so a false
// alarm is rare).
func TestProbabilityBandLevel(t *testing.T) {
	t.Parallel()
	d := must(montecarlo.NewNormal(10, 2))
	in, all := 0, 0
	for seed := range 20 {
		x := sample(d, 10, uint64(seed))
		pp, err := Probability(x, d, 0.9, Quantity{})
		if err != nil {
			t.Fatal(err)
		}
		for i, pt := range pp.Points {
			all++
			if pp.Band[i].Lo <= pt.X && pt.X <= pp.Band[i].Hi {
				in++
			}
		}
	}
	if share := float64(in) / float64(all); math.Abs(share-0.9) > 0.05 {
		t.Errorf("share of points inside the true band %.3f, want 0.90", share)
	}
}

func TestProbabilityThinning(t *testing.T) {
	t.Parallel()
	d := must(montecarlo.NewWeibull(3, 50e3))
	x := sample(d, 100000, 9)
	pp, err := Probability(x, d, 0, Quantity{Unit: "kN", Scale: 1000})
	if err != nil {
		t.Fatal(err)
	}
	if pp.Shown != MaxPlotPoints || len(pp.Points) != MaxPlotPoints || pp.N != 100000 {
		t.Fatalf("%d of %d shown", pp.Shown, pp.N)
	}
	for i := 1; i < len(pp.Points); i++ {
		if !(pp.Points[i].P > pp.Points[i-1].P) || pp.Points[i].X < pp.Points[i-1].X {
			t.Fatalf("points %d, %d out of order", i-1, i)
		}
	}
	if pp.Points[0].X > 10 || pp.Points[len(pp.Points)-1].X < 50 {
		t.Errorf("values not in kN: %g … %g", pp.Points[0].X, pp.Points[len(pp.Points)-1].X)
	}
}
