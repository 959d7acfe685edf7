package fatigue

import (
	"math"
	"testing"
)

// Miner's rule D = Σ n_i/N_i (confirmed) on the Shigley and VDI curves:
// each row's damage is its count over its own life, rows at or below the
// endurance add nothing.
func TestDamageSumsRows(t *testing.T) {
	t.Parallel()
	sh, _ := NewShigley(a2Sut, a2Se, 0)
	sv, _ := NewVDI2230(12, RolledBeforeHeatTreatment, 0)
	blocks := []Block{
		{Cycle: LoadLine(a2SigmaI, a2Amplitude(50e3)), Count: 2e4}, // N = 2.50496·10⁵ on Shigley (A2)
		{Cycle: LoadLine(a2SigmaI, a2Amplitude(60e3)), Count: 1e4},
		{Cycle: LoadLine(a2SigmaI, a2Amplitude(20e3)), Count: 1e7}, // below Se on Shigley: no damage (A2)
	}
	for _, c := range []Curve{sh, sv} {
		var want float64
		var rules Rule
		for _, b := range blocks {
			l, err := c.Life(b.Cycle)
			if err != nil {
				t.Fatal(err)
			}
			rules |= l.Rule
			if l.Damaging() {
				want += b.Count / l.Cycles
			}
		}
		d, err := c.Damage(blocks, nil)
		if err != nil {
			t.Fatal(err)
		}
		near(t, c.String(), d.Sum, want, 1e-15)
		if d.Rules != rules || d.Rules&Endurance == 0 {
			t.Errorf("%s: rules %v, want %v", c, d.Rules, rules)
		}
	}
	d, _ := sh.Damage(blocks[:1], nil)
	near(t, "one row, Shigley A2", d.Sum, 2e4/250496, 5e-6)
}

func TestCriticalDamage(t *testing.T) {
	t.Parallel()
	if err := MinerCriticalDamage.Validate(); err != nil || MinerCriticalDamage.FromNormal(2.5) != 1 {
		t.Errorf("Miner D_crit: %v %g", err, MinerCriticalDamage.FromNormal(2.5))
	}
	w := WirschingCriticalDamage                      // median 1, c.o.v. 0.3 (Wirsching 1984; from memory)
	near(t, "ζ", w.LogSD(), 0.293560379208524, 1e-12) // sqrt(ln 1.09) (computed)
	near(t, "D_crit at z = 1", w.FromNormal(1), 1.3411941572071524, 1e-12)
	q, err := w.Quantile(0.5)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "median", q, 1, 1e-12)
	q, _ = w.Quantile(0.05)
	near(t, "5 % quantile", q, 0.6170138213289258, 1e-9) // exp(ζ·Φ⁻¹(0.05)) (computed)
	err = CriticalDamage{Median: 1, CoV: -0.1}.Validate()
	wantRangeError(t, "negative c.o.v.", err, "critical damage c.o.v.", "-0.1")
	err = CriticalDamage{}.Validate()
	wantRangeError(t, "zero median", err, "critical damage median", "median > 0")
	_, err = w.Quantile(1)
	wantRangeError(t, "p = 1", err, "probability", "0 < p < 1")
}

func TestRuleString(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		r    Rule
		want string
	}{
		{0, "none"},
		{FiniteLife, "finite-life"},
		{FiniteLife | SecondSlope | CutOff, "finite-life+second-slope+cut-off"},
		{LowCycleClamp, "low-cycle-clamp"},
		{FiniteLife | Extrapolated, "finite-life+extrapolated"},
	} {
		if got := tc.r.String(); got != tc.want {
			t.Errorf("%d: %q, want %q", tc.r, got, tc.want)
		}
	}
}

func TestCycleHelpers(t *testing.T) {
	t.Parallel()
	c := MaxMin(700, 620)
	if c.Amplitude != 40 || c.Mean != 660 || c.Range() != 80 || c.Max() != 700 || c.Min() != 620 {
		t.Errorf("MaxMin: %+v", c)
	}
	if l := LoadLine(622.5, 74.14); l.Mean != 622.5+74.14 {
		t.Errorf("LoadLine: %+v", l)
	}
	if (Life{Cycles: math.Inf(1)}).Damaging() {
		t.Error("infinite life is damaging")
	}
}
