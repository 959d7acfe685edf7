package plots

import "testing"

func TestPercentTicks(t *testing.T) {
	t.Parallel()
	got := map[string]bool{}
	for _, tk := range (percentTicks{NormalPaper}).Ticks(0.005, 0.995) {
		got[tk.Label] = true
	}
	for _, want := range []string{"1 %", "10 %", "50 %", "90 %", "99 %"} {
		if !got[want] {
			t.Errorf("normal paper over 0.5 %% … 99.5 %%: no tick %q (got %v)", want, got)
		}
	}
	if s := (probScale{NormalPaper}).Normalize(0.01, 0.99, 0.5); s < 0.4999 || s > 0.5001 {
		t.Errorf("50 %% sits at %g of a symmetric normal axis, want 0.5", s)
	}
}

func TestProbabilityPlotEmpty(t *testing.T) {
	t.Parallel()
	if _, err := ProbabilityPlot(ProbabilitySpec{}); err == nil {
		t.Error("want an error for a plot without data")
	}
}

// A lognormal paper over a narrow range (nut factors 0.15 … 0.3) still has
// enough labelled values to read off.
func TestNarrowLogAxisLabels(t *testing.T) {
	n := 0
	for _, tk := range (logTicks125{}).Ticks(0.15, 0.3) {
		if tk.Label != "" {
			n++
		}
	}
	if n < 3 {
		t.Errorf("%d labelled ticks on 0.15 … 0.3, want ≥ 3", n)
	}
	for _, tk := range (logTicks125{}).Ticks(1, 1000) {
		if tk.Value == 20 && tk.Label != "20" {
			t.Errorf("wide axis: 20 labelled %q, want the 1-2-5 labels", tk.Label)
		}
	}
}
