package decide_test

import (
	"math"
	"testing"

	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/interval"
)

// TestJudge: verdicts from the interval, and the samples needed to tell.
func TestJudge(t *testing.T) {
	t.Parallel()
	const conf = 0.95
	for _, tc := range []struct {
		name   string
		k, n   int64
		target float64
		want   decide.State
	}{
		{"clearly below", 10, 1_000_000, 1e-3, decide.Meets},
		{"clearly above", 5000, 1_000_000, 1e-3, decide.Fails},
		{"straddles", 1060, 1_000_000, 1e-3, decide.CannotTell},
		{"no failure, too few", 0, 1000, 1e-3, decide.CannotTell},
	} {
		e := interval.Proportion(tc.k, tc.n, conf, interval.Auto)
		v := decide.Judge(e, tc.n, tc.target, conf)
		if v.State != tc.want {
			t.Errorf("%s: %v, want %v", tc.name, v.State, tc.want)
		}
		if v.State == decide.CannotTell {
			if v.SamplesNeeded <= tc.n {
				t.Errorf("%s: %d samples needed, no more than the %d run", tc.name, v.SamplesNeeded, tc.n)
			}
			// At the samples needed, the same proportion is decided.
			k := int64(math.Round(float64(tc.k) / float64(tc.n) * float64(v.SamplesNeeded)))
			if w := decide.Judge(interval.Proportion(k, v.SamplesNeeded, conf, interval.Auto), v.SamplesNeeded, tc.target, conf); w.State == decide.CannotTell && tc.k > 0 {
				// The normal approximation may fall a few samples short of Wilson's interval.
				if w2 := decide.Judge(interval.Proportion(k*11/10, v.SamplesNeeded*11/10, conf, interval.Auto), v.SamplesNeeded*11/10, tc.target, conf); w2.State == decide.CannotTell {
					t.Errorf("%s: still undecided at 1.1 × the %d samples needed", tc.name, v.SamplesNeeded)
				}
			}
			if tc.k == 0 {
				// The least n whose exact one-sided bound with no failure meets the target.
				n := v.SamplesNeeded
				if !(interval.OneSidedUpper(n, conf) <= tc.target && interval.OneSidedUpper(n-1, conf) > tc.target) {
					t.Errorf("%s: %d is not the least n with bound ≤ target", tc.name, n)
				}
			}
		}
	}
	// A rare-event estimate: c.o.v. falls as 1/√n.
	e := interval.Estimate{P: 1.2e-6, COV: 0.3, Kind: interval.KindNormalLog}
	e.Lo, e.Hi = interval.FromCOV(e.P, e.COV, conf)
	v := decide.Judge(e, 10000, 1e-6, conf)
	if v.State != decide.CannotTell || v.SamplesNeeded < 10000*10 {
		t.Errorf("rare-event verdict %v, %d needed", v.State, v.SamplesNeeded)
	}
}
