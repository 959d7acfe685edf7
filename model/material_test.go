package model_test

import (
	"strings"

	"boltrisk/model"
)

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

func TestPlateStrengthsByThickness(t *testing.T) {
	t.Parallel()
	// EN 1993-1-1 Table 3.1 (secondary source): S235 235/360 (t ≤ 40 mm),
	// 215/360 (40 < t ≤ 80); S275 275/430, 255/410; S355 355/510 (2005 text;
	// a corrected reprint gives 490), 335/470.
	for _, test := range []struct {
		grade  string
		t      float64
		fy, fu float64
	}{
		{"S235", 12, 235, 360}, {"S235", 50, 215, 360},
		{"S275", 40, 275, 430}, {"S275", 41, 255, 410},
		{"S355", 20, 355, 510}, {"S355", 80, 335, 470},
	} {
		m, _ := model.LookupMaterial(test.grade)
		fy, fu, err := m.PlateStrengthAt(test.t)
		if err != nil || fy != test.fy || fu != test.fu {
			t.Errorf("%s t = %g: got %g/%g (%v), want %g/%g", test.grade, test.t, fy, fu, err, test.fy, test.fu)
		}
	}
	m, _ := model.LookupMaterial("S355")
	if _, _, err := m.PlateStrengthAt(100); err == nil || !strings.Contains(err.Error(), "t ≤ 80 mm") {
		t.Errorf("S355 at 100 mm: want an error naming the table's range, got %v", err)
	}
}

func TestSurfacePressureLimits(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 (2003) Table A9 as reproduced (secondary source): pG of
	// S235JR 490, S355J0 760, GJL-250 900, AW-6082 (AlMgSi1 F31) 260,
	// GD-AlSi9Cu3 290 MPa.
	for name, pg := range map[string]float64{"S235": 490, "S355": 760, "GJL-250": 900, "AW-6082-T6": 260, "GD-AlSi9Cu3": 290} {
		m, err := model.LookupMaterial(name)
		if err != nil || m.PressureLimit != pg {
			t.Errorf("%s pG: got %g (%v), want %g", name, m.PressureLimit, err, pg)
		}
	}
}

func TestLargeBoltGrades(t *testing.T) {
	t.Parallel()
	// ASTM A193 B7 (from memory): 125/105 ksi to 2-1/2 in, 115/95 ksi to 4 in;
	// no proof load, Sp = 0.85·Sy (Shigley Eq. 8-32 note, confirmed).
	// ASTM A354 BD (from memory): 150/130/120 ksi to 2-1/2 in, 140/115/105 to 4 in.
	for _, test := range []struct {
		class       string
		d           float64
		sp, sy, sut float64
	}{
		{"B7", 64, 0.85 * 95 * ksi, 95 * ksi, 115 * ksi}, // M64 = 2.52 in
		{"ASTM A193 B7", 48, 0.85 * 105 * ksi, 105 * ksi, 125 * ksi},
		{"BD", 2 * 25.4, 120 * ksi, 130 * ksi, 150 * ksi},
		{"A354 BD", 3 * 25.4, 105 * ksi, 115 * ksi, 140 * ksi},
		// ISO 3506-1:2020 -100 and -50 (secondary source): Rm 1000/500, Rp0.2 800/210.
		{"A4-100", 20, 800, 800, 1000},
		{"A2-50", 20, 210, 210, 500},
	} {
		c, err := model.LookupClass(test.class, test.d)
		if err != nil {
			t.Fatalf("%s: %v", test.class, err)
		}
		near(t, test.class+" Sp", c.Proof, test.sp, 1e-12)
		near(t, test.class+" Sy", c.Yield, test.sy, 1e-12)
		near(t, test.class+" Sut", c.Tensile, test.sut, 1e-12)
	}
	// ISO 898-1 stops at d = 39 mm: a clear error with the way out.
	_, err := model.LookupClass("10.9", 48)
	if err == nil || !strings.Contains(err.Error(), "d ≤ 39 mm") || !strings.Contains(err.Error(), "A193 B7") {
		t.Errorf("10.9 at M48: got %v", err)
	}
	// SAE J429 covers 1/4 – 1-1/2 in.
	if _, err := model.LookupClass("SAE 5", 0.19*25.4); err == nil || !strings.Contains(err.Error(), "SAE J429") {
		t.Errorf("SAE 5 on #10: got %v", err)
	}
}

func TestEnduranceSizeRange(t *testing.T) {
	t.Parallel()
	// Shigley Table 8-17 (confirmed): 10.9 M5–M36, 162 MPa.
	c, _ := model.LookupClass("10.9", 36)
	if se, err := c.EnduranceAt(36); err != nil || se != 162 {
		t.Errorf("10.9 M36: %g, %v", se, err)
	}
	c, _ = model.LookupClass("10.9", 39)
	if _, err := c.EnduranceAt(39); err == nil || !strings.Contains(err.Error(), "Table 8-17") {
		t.Errorf("10.9 M39: want an error naming Table 8-17's range, got %v", err)
	}
	c, _ = model.LookupClass("10.9", 4)
	if _, err := c.EnduranceAt(4); err == nil {
		t.Error("10.9 M4: below the table's M5, want an error")
	}
}
