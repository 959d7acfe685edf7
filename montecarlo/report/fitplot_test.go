package report

import (
	"os"
	"path/filepath"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
	"boltrisk/plots"
)

// lzPlot fits the ball-bearing lives of Lieblein & Zelen (1956), shipped in
// testdata/fit, and returns the probability-plot data of family k.
func lzPlot(t *testing.T, k montecarlo.Kind) plots.ProbabilityData {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "fit", "lieblein-zelen.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	col, err := fit.ReadColumn(f, fit.Spec{File: "lieblein-zelen.csv", Column: "revolutions_millions"})
	if err != nil {
		t.Fatal(err)
	}
	d, _, err := fit.Estimate(k, col.Values, nil)
	if err != nil {
		t.Fatal(err)
	}
	pp, err := fit.Probability(col.Values, d, 0, col.Quantity)
	if err != nil {
		t.Fatal(err)
	}
	return ProbabilityData(pp)
}

func TestProbabilityPlotPapers(t *testing.T) {
	t.Parallel()
	for _, k := range []montecarlo.Kind{montecarlo.Normal, montecarlo.LogNormal, montecarlo.Weibull, montecarlo.Triangular} {
		pp := lzPlot(t, k)
		p, err := plots.ProbabilityPlot(plots.ProbabilitySpec{Title: "Ball-bearing fatigue lives (Lieblein & Zelen 1956)", XLabel: "life (millions of revolutions)", Data: pp})
		if err != nil {
			t.Fatalf("%v: %v", k, err)
		}
		if p.Y.Min <= 0 || p.Y.Max >= 1 || p.Y.Min >= pp.Points[0].P || p.Y.Max <= pp.Points[len(pp.Points)-1].P {
			t.Errorf("%v: probability axis [%g, %g] does not hold the points", k, p.Y.Min, p.Y.Max)
		}
		if _, err := plots.PNG(p); err != nil {
			t.Error(err)
		}
	}
}

// The fit places points with its paper's transform and plots draws the
// axis with its own: the two must be the same map, paper by paper.
func TestPapersAgree(t *testing.T) {
	for _, fp := range []fit.Paper{fit.NormalPaper, fit.LognormalPaper, fit.WeibullPaper} {
		pp := paperOf(fp)
		if fp.LogX() != pp.LogX() {
			t.Errorf("%v: log x %v in fit, %v in plots", fp, fp.LogX(), pp.LogX())
		}
		for _, p := range []float64{1e-4, 0.01, 0.3, 0.5, 0.9, 0.999} {
			if a, b := fp.Y(p), pp.Y(p); a != b {
				t.Errorf("paper %v at p = %g: fit y %g, plots y %g", fp, p, a, b)
			}
			if a, b := fp.P(fp.Y(p)), pp.P(pp.Y(p)); a != b {
				t.Errorf("paper %v at p = %g: inverse %g vs %g", fp, p, a, b)
			}
		}
	}
}
