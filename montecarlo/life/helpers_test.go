package life

import (
	"math"
	"testing"
)

// near fails the test when got is not within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.8g, want %.8g (±%.2g %%)", what, got, want, 100*rel)
	}
}

func mustAcc(t testing.TB, g Grid, design float64) *Accumulator {
	t.Helper()
	a, err := NewAccumulator(g, design)
	if err != nil {
		t.Fatal(err)
	}
	return a
}
