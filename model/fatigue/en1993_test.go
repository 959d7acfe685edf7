package fatigue

import (
	"math"
	"testing"
)

// EN 1993-1-9:2005 values are (secondary source): quoted from Fig. 7.1,
// 7.1(2)–(3) and Table 8.1 detail 14 in other documents. Check values are
// reference-data-2 A4 (computed from those formulas).

func TestEN1993Limits(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		d, ks, dsC float64
	}{
		{12, 1, 50},
		{30, 1, 50},            // ks = 1 up to 30 mm
		{36, 0.95544, 47.7721}, // reference-data-2 A4
		{48, 0.88914, 44.4570}, // reference-data-2 A4
		{64, 0.82744, 41.3719}, // reference-data-2 A4
	} {
		e, err := NewEN1993(tc.d)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "ks", e.SizeFactor(), tc.ks, 1e-5)
		near(t, "ΔσC,red", e.Category(), tc.dsC, 1e-5)
		// ΔσD = 0.737·ΔσC and ΔσL = 0.549·ΔσD scale with the category
		near(t, "ΔσD", e.FatigueLimit(), 36.8403*tc.dsC/50, 1e-5)
		near(t, "ΔσL", e.CutOff(), 20.2357*tc.dsC/50, 1e-5)
	}
}

func TestEN1993ConstantAmplitude(t *testing.T) {
	t.Parallel()
	e, _ := NewEN1993(20)
	for _, tc := range []struct {
		ds, n float64 // range, NR (reference-data-2 A4; +Inf: no damage)
		rule  Rule
	}{
		{100, 2.5e5, FiniteLife},
		{80, 4.88281e5, FiniteLife},
		{60, 1.15741e6, FiniteLife},
		{50, 2e6, FiniteLife},
		{40, 3.90625e6, FiniteLife},
		{36.8404, 5e6, FiniteLife},   // just above ΔσD: NR = 5·10⁶
		{30, math.Inf(1), Endurance}, // below ΔσD: no damage under constant amplitude
		{16.3265, math.Inf(1), Endurance},
	} {
		l, err := e.Life(Cycle{Amplitude: tc.ds / 2, Mean: 400})
		if err != nil {
			t.Fatal(err)
		}
		if l.Rule != tc.rule || l.Stress != tc.ds {
			t.Errorf("Δσ = %g: rule %v stress %g, want %v %g", tc.ds, l.Rule, l.Stress, tc.rule, tc.ds)
		}
		if math.IsInf(tc.n, 1) {
			if l.Damaging() {
				t.Errorf("Δσ = %g: N = %g, want no damage", tc.ds, l.Cycles)
			}
			continue
		}
		near(t, "NR", l.Cycles, tc.n, 1e-5)
	}
}

// reference-data-2 A4 block spectrum (computed): D = 0.2048 + 0.15 +
// 0.143235 + 0 = 0.498035.
func TestEN1993BlockSpectrum(t *testing.T) {
	t.Parallel()
	e, _ := NewEN1993(20)
	blocks := []Block{
		{Cycle: Cycle{Amplitude: 40, Mean: 500}, Count: 1e5},  // Δσ = 80
		{Cycle: Cycle{Amplitude: 25, Mean: 500}, Count: 3e5},  // Δσ = 50
		{Cycle: Cycle{Amplitude: 15, Mean: 500}, Count: 2e6},  // Δσ = 30, m = 5 branch
		{Cycle: Cycle{Amplitude: 7.5, Mean: 500}, Count: 1e8}, // Δσ = 15 < ΔσL
	}
	lives := make([]Life, len(blocks))
	d, err := e.Damage(blocks, lives)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "D", d.Sum, 0.498035, 1e-6)
	near(t, "cycles per pass", d.Cycles, 1.024e8, 1e-15)
	if want := FiniteLife | SecondSlope | CutOff; d.Rules != want {
		t.Errorf("rules %v, want %v", d.Rules, want)
	}
	for i, w := range []struct {
		n    float64
		rule Rule
	}{{4.88281e5, FiniteLife}, {2e6, FiniteLife}, {1.39631e7, SecondSlope}, {math.Inf(1), CutOff}} {
		if lives[i].Rule != w.rule || (w.n < math.Inf(1) && math.Abs(lives[i].Cycles-w.n) > 1e-5*w.n) || (w.n == math.Inf(1) && lives[i].Damaging()) {
			t.Errorf("row %d: %v, want N %g (%v)", i+1, lives[i], w.n, w.rule)
		}
	}
	// life under the repeated spectrum: 1.024·10⁸/0.498035 (computed)
	n, err := d.Life(1)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "N_life", n, 2.05608039e8, 1e-6)
	n2, _ := d.Life(0.5)
	near(t, "N_life at D_crit 0.5", n2, n/2, 1e-15)
}

func TestEN1993EquivalentRange(t *testing.T) {
	t.Parallel()
	// reference-data-2 A4: (80 MPa, 10⁵) + (60 MPa, 4·10⁵): ΔσE,2 = 40.976 MPa, D = 0.5504 (computed)
	e, _ := NewEN1993(16)
	d, err := e.Damage([]Block{{Cycle: Cycle{Amplitude: 40}, Count: 1e5}, {Cycle: Cycle{Amplitude: 30}, Count: 4e5}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "D", d.Sum, 0.5504, 1e-12)
	near(t, "ΔσE,2", e.EquivalentRange(d), 40.97599, 1e-6)
}

func TestEN1993SpectrumRules(t *testing.T) {
	t.Parallel()
	e, _ := NewEN1993(24)
	// a constant-amplitude spectrum above ΔσD equals the single-level result
	c := Cycle{Amplitude: 30, Mean: 450} // Δσ = 60
	single, _ := e.Life(c)
	d, err := e.Damage([]Block{{Cycle: c, Count: 4e5}, {Cycle: c, Count: 6e5}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "CA spectrum damage", d.Sum, 1e6/single.Cycles, 1e-14)
	life, _ := d.Life(1)
	near(t, "CA spectrum life", life, single.Cycles, 1e-14)
	// a spectrum entirely below the cut-off does no damage
	below := []Block{{Cycle: Cycle{Amplitude: 10}, Count: 1e9}, {Cycle: Cycle{Amplitude: 8.1}, Count: 1e10}} // Δσ 20 and 16.2 < ΔσL 20.2357
	d, err = e.Damage(below, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d.Sum != 0 || d.Rules != CutOff {
		t.Errorf("below cut-off: %+v", d)
	}
	if life, _ := d.Life(1); !math.IsInf(life, 1) {
		t.Errorf("below cut-off: life %g, want +Inf", life)
	}
	// reference-data-2 A4: preloaded M20, C = 0.2, 20 kN range: Δσ = 16.33 MPa < ΔσL → no damage
	m20, _ := NewEN1993(20)
	ds := 0.2 * 20e3 / 245
	near(t, "M20 Δσ", ds, 16.3265, 1e-5)
	l, _ := m20.SpectrumLife(Cycle{Amplitude: ds / 2})
	if l.Damaging() || l.Rule != CutOff {
		t.Errorf("M20: %v", l)
	}
}

func TestEN1993Median(t *testing.T) {
	t.Parallel()
	e, _ := NewEN1993(20)
	m, err := e.ToMedian(0.2) // sd(log10 N) = 0.2: an assumption for the test
	if err != nil {
		t.Fatal(err)
	}
	if !m.IsMedian() || e.IsMedian() {
		t.Error("IsMedian")
	}
	near(t, "median category", m.Category(), 67.96781954392628, 1e-12) // 50·10^(0.4/3) (computed)
	c := Cycle{Amplitude: 40}                                          // Δσ = 80 on m = 3
	lc, _ := e.Life(c)
	lm, _ := m.Life(c)
	near(t, "m = 3 life factor", lm.Cycles/lc.Cycles, math.Pow(10, 0.4), 1e-12) // 10^(2·sd)
	c = Cycle{Amplitude: 15}                                                    // Δσ = 30 on m = 5 for both curves
	lc, _ = e.SpectrumLife(c)
	lm, _ = m.SpectrumLife(c)
	near(t, "m = 5 life factor", lm.Cycles/lc.Cycles, math.Pow(10, 0.4*5/3), 1e-12)
	_, err = m.ToMedian(0.2)
	wantRangeError(t, "twice", err, "sd(log10 N)", "median already")
	_, err = e.ToMedian(0)
	wantRangeError(t, "zero sd", err, "sd(log10 N)", "0 < sd")
}

func TestDamageErrors(t *testing.T) {
	t.Parallel()
	e, _ := NewEN1993(20)
	sv, _ := NewVDI2230(12, RolledBeforeHeatTreatment, 0)
	sh, _ := NewShigley(1040, 162, 0)
	for _, c := range []Curve{e, sv, sh} {
		_, err := c.Damage([]Block{{Cycle: Cycle{Amplitude: 40}, Count: 1e5}, {Cycle: Cycle{Amplitude: 30}}}, nil)
		wantRangeError(t, c.String()+" row without cycles", err, "cycles", "row 2", "needs cycles")
		_, err = c.Damage([]Block{{Cycle: Cycle{Amplitude: 40}, Count: -5}}, nil)
		wantRangeError(t, c.String()+" negative cycles", err, "cycles", "row 1", "-5")
		_, err = c.Damage([]Block{{Cycle: Cycle{Amplitude: 40}, Count: 5}, {Cycle: MaxMin(100, 200), Count: 5}}, nil)
		wantRangeError(t, c.String()+" negative amplitude", err, "amplitude", "row 2", "-50")
	}
	// VDI: a row beyond the finite-life range names the row
	_, err := sv.Damage([]Block{{Cycle: Cycle{Amplitude: 60}, Count: 1}, {Cycle: Cycle{Amplitude: 400}, Count: 1}}, nil)
	wantRangeError(t, "VDI row below 10⁴", err, "amplitude", "row 2", "not confirmed")
	_, err = NewEN1993(-3)
	wantRangeError(t, "negative d", err, "d", "-3")
	_, err = Damage{Sum: 0.5, Cycles: 10}.Life(0)
	wantRangeError(t, "zero critical damage", err, "critical damage", "D_crit > 0")
}
