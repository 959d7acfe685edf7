package model_test

import "boltrisk/model"

import "testing"

func TestPropertyClasses(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		class            string
		d                float64
		sp, sy, sut, tol float64
	}{
		// ISO 898-1 mechanical properties (reference sheet §2.1, confirmed).
		{"4.6", 12, 225, 240, 400, 1e-9},
		{"5.8", 12, 380, 420, 520, 1e-9},
		{"8.8", 12, 580, 640, 800, 1e-9},
		{"8.8", 16, 580, 640, 800, 1e-9}, // M16 in the d ≤ 16 row (ISO 898-1 convention, pinned)
		{"8.8", 20, 600, 660, 830, 1e-9}, // Shigley Table 8-11: M16–M36 600/660/830
		{"9.8", 10, 650, 720, 900, 1e-9},
		{"10.9", 12, 830, 940, 1040, 1e-9},
		{"12.9", 12, 970, 1100, 1220, 1e-9},
		// SAE J429, Shigley Table 8-9 (confirmed), ksi → MPa.
		{"SAE 5", 12.7, 85 * ksi, 92 * ksi, 120 * ksi, 1e-9},
		{"grade 5", 31.75, 74 * ksi, 81 * ksi, 105 * ksi, 1e-9},
		{"SAE 8", 25.4, 120 * ksi, 130 * ksi, 150 * ksi, 1e-9},
		// ASTM F3125, Shigley Table 8-10 (confirmed).
		{"A490", 19.05, 120 * ksi, 130 * ksi, 150 * ksi, 1e-9},
		// ISO 3506-1 A2-70: Rp0.2 450, Rm 700 (secondary source); Sp = Rp0.2 common practice.
		{"A2-70", 12, 450, 450, 700, 1e-9},
	} {
		c, err := model.LookupClass(test.class, test.d)
		if err != nil {
			t.Fatalf("%s: %v", test.class, err)
		}
		near(t, test.class+" Sp", c.Proof, test.sp, test.tol)
		near(t, test.class+" Sy", c.Yield, test.sy, test.tol)
		near(t, test.class+" Sut", c.Tensile, test.sut, test.tol)
	}
	if _, err := model.LookupClass("9.8", 20); err == nil {
		t.Error("9.8 is made only up to M16 (ISO 898-1): want error for d = 20")
	}
	if _, err := model.LookupClass("11.9", 12); err == nil {
		t.Error("unknown class: want error")
	}
}

func TestProofLoads(t *testing.T) {
	t.Parallel()
	// Proof load = As·Sp: ISO 898-1 Table 6 values to 3 significant figures
	// (reference sheet §2.1, derived; M12 10.9 70.0 kN, M20 8.8 147 kN).
	for _, test := range []struct {
		thread, class string
		kN            float64
	}{
		{"M12", "10.9", 70.0},
		{"M20", "8.8", 147.0},
		{"M8", "8.8", 21.2},
		{"M24", "12.9", 342.4},
	} {
		th, _ := model.LookupThread(test.thread)
		c, _ := model.LookupClass(test.class, th.D)
		near(t, test.thread+" "+test.class+" proof load", th.StressArea*c.Proof/1000, test.kN, 0.003)
	}
}

func TestRCSCPretension(t *testing.T) {
	t.Parallel()
	// RCSC Table 8.1 / AISC Table J3.1 minimum pretension = 0.70·Fu·At,
	// rounded to kip (confirmed): 3/4 in A325 → 28 kip, 1 in A490 → 64 kip.
	for _, test := range []struct {
		thread, class string
		kip           float64
	}{
		{"3/4-10 UNC", "A325", 28},
		{"1-8 UNC", "A490", 64},
		{"1/2-13 UNC", "A325", 12},
	} {
		th, _ := model.LookupThread(test.thread)
		c, _ := model.LookupClass(test.class, th.D)
		got := 0.7 * c.Tensile * th.StressArea / kip
		if got < test.kip-0.5 || got >= test.kip+0.5 {
			t.Errorf("%s %s: 0.7·Fu·At = %.2f kip, want %g kip after rounding", test.thread, test.class, got, test.kip)
		}
	}
}

func TestEndurance(t *testing.T) {
	t.Parallel()
	// Shigley Table 8-17 (confirmed).
	c, _ := model.LookupClass("10.9", 12)
	near(t, "10.9 Se", c.Endurance, 162, 1e-12)
	c, _ = model.LookupClass("SAE 5", 12.7)
	near(t, "SAE 5 Se", c.Endurance, 18.6*ksi, 1e-12)
	// VDI 2230-1 σASV = 0.85·(150/d + 45) (formula from memory; values derived,
	// reference sheet §3.2): M12 48.9, M16 46.2, M24 43.6 MPa.
	near(t, "σASV M12", model.VDIEndurance(12), 48.9, 0.002)
	near(t, "σASV M16", model.VDIEndurance(16), 46.2, 0.002)
	near(t, "σASV M24", model.VDIEndurance(24), 43.6, 0.002)
}

func TestMaterials(t *testing.T) {
	t.Parallel()
	// Shigley Table A-5 (confirmed): steel 207 GPa, aluminium 71.7 GPa.
	m, _ := model.LookupMaterial("Steel")
	near(t, "steel E", m.Modulus, 207000, 1e-12)
	m, _ = model.LookupMaterial("aluminum")
	near(t, "aluminium E", m.Modulus, 71700, 1e-12)
	if _, err := model.LookupMaterial("unobtainium"); err == nil {
		t.Error("want error for unknown material")
	}
}
