package fit

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// near fails unless got is within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g (rel. tol. %g)", what, got, want, rel)
	}
}

// lz reads the ball-bearing fatigue lives of Lieblein & Zelen (1956) from
// testdata/fit (see its README for provenance).
func lz(t testing.TB) []float64 {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "fit", "lieblein-zelen.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := ReadColumn(f, Spec{File: "lieblein-zelen.csv", Column: "revolutions_millions"})
	if err != nil {
		t.Fatal(err)
	}
	return c.Values
}

// noNaN fails if any number of a result is NaN or infinite.
func noNaN(t *testing.T, r *Result) {
	t.Helper()
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	for _, c := range r.Candidates {
		vals := []float64{c.Dist.A, c.Dist.B, c.Dist.C, c.Dist.D, c.LogLik, c.AIC, c.BIC, c.AD.Stat, c.KS.Stat, c.AD.P, c.KS.P, c.Weight,
			c.Mean.Value, c.Mean.Lo, c.Mean.Hi, c.COV.Value, c.COV.Lo, c.COV.Hi}
		for _, p := range c.Params {
			vals = append(vals, p.Value, p.Lo, p.Hi)
		}
		for i, v := range vals {
			if bad(v) {
				t.Errorf("%s: number %d is %v", c.Family, i, v)
			}
		}
	}
}
