package fatigue_test

import (
	"fmt"

	"boltrisk/model/fatigue"
)

// Life of an M12 class 10.9 bolt (Se = 162 MPa, Shigley Table 8-17) preloaded
// to 75 % of proof under a repeated 0 → 50 kN load with joint constant 0.25
// (an invented case; reference-data-2 A2).
func ExampleShigley_Life() {
	s, err := fatigue.NewShigley(1040, 162, 0) // f from the Fig. 6-18 fit
	if err != nil {
		fmt.Println(err)
		return
	}
	sigmaI := 0.75 * 830.0             // Fi/At, MPa
	sigmaA := 0.25 * 50e3 / (2 * 84.3) // C·P/(2·At), MPa
	l, _ := s.Life(fatigue.LoadLine(sigmaI, sigmaA))
	nf, _ := s.LoadLineFactor(1e5, sigmaI, sigmaA)
	fmt.Printf("f = %.5f, σrev = %.2f MPa, N = %.4g cycles (%v)\n", s.Fraction(), l.Stress, l.Cycles, l.Rule)
	fmt.Printf("nf(1e5) = %.4f\n", nf)
	// Output:
	// f = 0.79464, σrev = 224.56 MPa, N = 2.505e+05 cycles (finite-life)
	// nf(1e5) = 1.1907
}

// VDI 2230-1 thread fatigue strength of an M12 bolt rolled before heat
// treatment at σa = 60 MPa (reference-data-2 A1; formulas not confirmed
// against the published text).
func ExampleVDI2230_Life() {
	v, _ := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	l, _ := v.Life(fatigue.Cycle{Amplitude: 60})
	fmt.Printf("σASV = %.3f MPa, N = %.4g cycles\n", v.EnduranceSV(), l.Cycles)
	_, err := v.Life(fatigue.Cycle{Amplitude: 320})
	fmt.Println(err)
	// Output:
	// σASV = 48.875 MPa, N = 1.081e+06 cycles
	// fatigue: VDI 2230-1: amplitude = 320, allowed σa ≤ σAZ(10⁴) = 285.823 MPa (finite-life line from about 10⁴ cycles; not confirmed against the published text)
}

// Palmgren–Miner damage of a four-block spectrum on the EN 1993-1-9 bolt
// curve (reference-data-2 A4).
func ExampleEN1993_Damage() {
	e, _ := fatigue.NewEN1993(20)
	spectrum := []fatigue.Block{
		{Cycle: fatigue.MaxMin(540, 460), Count: 1e5}, // Δσ = 80 MPa
		{Cycle: fatigue.MaxMin(525, 475), Count: 3e5}, // Δσ = 50 MPa
		{Cycle: fatigue.MaxMin(515, 485), Count: 2e6}, // Δσ = 30 MPa
		{Cycle: fatigue.MaxMin(507.5, 492.5), Count: 1e8},
	}
	lives := make([]fatigue.Life, len(spectrum))
	d, _ := e.Damage(spectrum, lives)
	for i, l := range lives {
		fmt.Printf("Δσ = %4.1f MPa  N = %-9.6g %v\n", spectrum[i].Range(), l.Cycles, l.Rule)
	}
	life, _ := d.Life(1)
	fmt.Printf("D = %.6f per pass, life %.4g cycles\n", d.Sum, life)
	// Output:
	// Δσ = 80.0 MPa  N = 488281    finite-life
	// Δσ = 50.0 MPa  N = 2e+06     finite-life
	// Δσ = 30.0 MPa  N = 1.39631e+07 second-slope
	// Δσ = 15.0 MPa  N = +Inf      cut-off
	// D = 0.498035 per pass, life 2.056e+08 cycles
}
