package model_test

import (
	"math"

	"boltrisk/model"
)

import "testing"

func TestMetricStressArea(t *testing.T) {
	t.Parallel()
	// As: ISO 898-1 Table 4 (coarse) and Table 5 (fine) values as reproduced in
	// the reference sheet §1.2/§1.3 (confirmed), rounded as published.
	for _, test := range []struct {
		name string
		as   float64
		rel  float64
	}{
		{"M3", 5.03, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M5", 14.2, 0.005},    // ISO 898-1 Table 4 (confirmed)
		{"M6", 20.1, 0.005},    // ISO 898-1 Table 4 (confirmed)
		{"M8", 36.6, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M10", 58.0, 0.002},   // ISO 898-1 Table 4 (confirmed)
		{"M12", 84.3, 0.002},   // ISO 898-1 Table 4 (confirmed)
		{"M16", 157, 0.003},    // ISO 898-1 Table 4 (confirmed)
		{"M20", 245, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M24", 353, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M30", 561, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M36", 817, 0.002},    // ISO 898-1 Table 4 (confirmed)
		{"M8x1", 39.17, 0.001}, // ASME B1.13M-based table (confirmed)
		{"M10x1.25", 61.2, 0.001},
		{"M12x1.25", 92.1, 0.001}, // ISO 898-1 Table 5 (confirmed)
		{"M16x1.5", 167, 0.003},   // ISO 898-1 Table 5 (confirmed)
		{"M20x1.5", 272, 0.003},   // ISO 898-1 Table 5 (confirmed)
		{"M24x2", 384, 0.002},     // ISO 898-1 Table 5 (confirmed)
		{"m12×1.75", 84.3, 0.002}, // coarse pitch written out resolves to M12
		{"M10x1", 64.5, 0.002},    // ISO 898-1 Table 5 (from memory)
		{"M12x1.5", 88.1, 0.002},  // ISO 898-1 Table 5 (from memory)
	} {
		th, err := model.LookupThread(test.name)
		if err != nil {
			t.Fatalf("%s: %v", test.name, err)
		}
		near(t, test.name+" As", th.StressArea, test.as, test.rel)
	}
}

func TestMetricDiameters(t *testing.T) {
	t.Parallel()
	// ISO 724 basic dimensions of M12 (reference sheet §1.1, confirmed):
	// d2 = 10.863, d3 = 9.853 mm.
	th, _ := model.LookupThread("M12")
	near(t, "M12 d2", th.PitchDia, 10.863, 1e-4)
	near(t, "M12 d3", th.MinorDia, 9.853, 1e-4)
	// M24: d2 = 22.051, d3 = 20.319 (ISO 724; reference sheet §1.2, confirmed).
	th, _ = model.LookupThread("M24")
	near(t, "M24 d2", th.PitchDia, 22.051, 1e-4)
	near(t, "M24 d3", th.MinorDia, 20.319, 1e-4)
}

func TestUnifiedAreas(t *testing.T) {
	t.Parallel()
	const in2 = 645.16 // mm² per in²
	// At and Ar: Shigley 9th ed. Table 8-2 (from ANSI B1.1-1974), confirmed.
	for _, test := range []struct {
		name   string
		at, ar float64
	}{
		{"1/4-20 UNC", 0.0318, 0.0269},
		{"3/8-16 UNC", 0.0775, 0.0678},
		{"1/2-13 UNC", 0.1419, 0.1257},
		{"5/8-11 UNC", 0.226, 0.202},
		{"3/4-10 UNC", 0.334, 0.302},
		{"1-8 UNC", 0.606, 0.551},
		{"1-1/2-6 UNC", 1.405, 1.294},
		{"1/4-28 UNF", 0.0364, 0.0326},
		{"1/2-20 UNF", 0.1599, 0.1486},
		{"1 UNF", 0.663, 0.625},
	} {
		th, err := model.LookupThread(test.name)
		if err != nil {
			t.Fatalf("%s: %v", test.name, err)
		}
		near(t, test.name+" At", th.StressArea/in2, test.at, 0.003)
		near(t, test.name+" Ar", th.MinorArea/in2, test.ar, 0.004)
	}
}

func TestLookupThreadErrors(t *testing.T) {
	t.Parallel()
	for _, name := range []string{"M13", "M12x3", "1/2", "1/2-14", "bolt", "", "M"} {
		if _, err := model.LookupThread(name); err == nil {
			t.Errorf("LookupThread(%q): want error", name)
		}
	}
}

func TestCatalogueReach(t *testing.T) {
	t.Parallel()
	const in2 = 645.16
	// Shigley Table 8-2 (numbered sizes from memory): #10-24 At 0.0175 in²,
	// #10-32 0.0200, #4-40 0.00604, #12-24 0.0242.
	for _, test := range []struct {
		name string
		at   float64
	}{
		{"#10-24 UNC", 0.0175}, {"10-32", 0.0200}, {"No. 4-40", 0.00604}, {"#12-24", 0.0242},
	} {
		th, err := model.LookupThread(test.name)
		if err != nil {
			t.Fatalf("%s: %v", test.name, err)
		}
		near(t, test.name+" At", th.StressArea/in2, test.at, 0.006)
	}
	// Large unified (ASME B1.1, from memory): 2-4.5 UNC, 4-4 UNC; At by the
	// ASME B1.1 formula 0.7854·(D − 0.9743/n)² (computed: 2.50 and 11.08 in²).
	th, err := model.LookupThread("2-4.5 UNC")
	if err != nil {
		t.Fatal(err)
	}
	near(t, "2-4.5 At", th.StressArea/in2, 0.7854*math.Pow(2-0.9743/4.5, 2), 1e-9)
	if th, err = model.LookupThread("4-4 UNC"); err != nil || math.Abs(th.D-101.6) > 1e-9 {
		t.Errorf("4-4 UNC: %v %v", th, err)
	}
	// Metric M2–M64 coarse (ISO 261): M64 P = 6; As = π/4·(d − 0.938194·P)²
	// (ISO 898-1 definition, computed: 2676 mm²); M2 P = 0.4: 2.07 mm².
	th, _ = model.LookupThread("M64")
	near(t, "M64 As", th.StressArea, math.Pi/4*math.Pow(64-0.938194*6, 2), 1e-6)
	near(t, "M64 As value", th.StressArea, 2676, 0.001)
	th, _ = model.LookupThread("M2")
	near(t, "M2 As", th.StressArea, 2.07, 0.005)
	// A user-defined thread uses the same basic profile.
	c, err := model.CustomThread(42, 3, false)
	if err != nil {
		t.Fatal(err)
	}
	ref := model.MetricThread(42, 3)
	near(t, "custom As", c.StressArea, ref.StressArea, 1e-12)
	if _, err := model.CustomThread(10, 4, false); err == nil {
		t.Error("pitch 4 mm on d = 10 mm: want an error")
	}
}
