package plots

import (
	"os"
	"path/filepath"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
)

// lzPlot fits the ball-bearing lives of Lieblein & Zelen (1956), shipped in
// testdata/fit, and returns the probability-plot data of family k.
func lzPlot(t *testing.T, k montecarlo.Kind) fit.ProbPlot {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "fit", "lieblein-zelen.csv"))
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
	return pp
}

func TestProbabilityPlotPapers(t *testing.T) {
	t.Parallel()
	for _, k := range []montecarlo.Kind{montecarlo.Normal, montecarlo.LogNormal, montecarlo.Weibull, montecarlo.Triangular} {
		pp := lzPlot(t, k)
		p, err := ProbabilityPlot(ProbabilitySpec{Title: "Ball-bearing fatigue lives (Lieblein & Zelen 1956)", XLabel: "life (millions of revolutions)", Data: pp})
		if err != nil {
			t.Fatalf("%v: %v", k, err)
		}
		if p.Y.Min <= 0 || p.Y.Max >= 1 || p.Y.Min >= pp.Points[0].P || p.Y.Max <= pp.Points[len(pp.Points)-1].P {
			t.Errorf("%v: probability axis [%g, %g] does not hold the points", k, p.Y.Min, p.Y.Max)
		}
		checkPNG(t, p)
		if dir := os.Getenv("BOLTRISK_PLOT_DIR"); dir != "" {
			b, _ := PNG(p)
			os.WriteFile(filepath.Join(dir, "prob-"+k.String()+".png"), b, 0o644)
		}
	}
}

func TestPercentTicks(t *testing.T) {
	t.Parallel()
	got := map[string]bool{}
	for _, tk := range (percentTicks{fit.NormalPaper}).Ticks(0.005, 0.995) {
		got[tk.Label] = true
	}
	for _, want := range []string{"1 %", "10 %", "50 %", "90 %", "99 %"} {
		if !got[want] {
			t.Errorf("normal paper over 0.5 %% … 99.5 %%: no tick %q (got %v)", want, got)
		}
	}
	if s := (probScale{fit.NormalPaper}).Normalize(0.01, 0.99, 0.5); s < 0.4999 || s > 0.5001 {
		t.Errorf("50 %% sits at %g of a symmetric normal axis, want 0.5", s)
	}
}

func TestProbabilityPlotEmpty(t *testing.T) {
	t.Parallel()
	if _, err := ProbabilityPlot(ProbabilitySpec{}); err == nil {
		t.Error("want an error for a plot without data")
	}
}
