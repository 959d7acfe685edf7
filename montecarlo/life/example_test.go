package life_test

import (
	"fmt"
	"math"
	"math/rand/v2"

	"boltrisk/model/fatigue"
	"boltrisk/montecarlo/life"
)

// Reliability against cycles of an M12 bolt (VDI 2230-1 thread strength,
// rolled before heat treatment) at σa = 60 MPa whose strength is log-normal
// with c.o.v. 0.10 about the VDI value (an invented case; reference-data-2
// A3). Lives of samples whose strength exceeds σa are +Inf. Closed form
// (computed): P(fail by 5·10⁵) = 0.004989, R(10⁶) = 0.602704, R(N ≥ 2·10⁶) =
// 0.019896, B10 = 7.36683·10⁵.
func ExampleAccumulator() {
	curve, _ := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	zeta := math.Sqrt(math.Log1p(0.10 * 0.10))
	acc, _ := life.NewAccumulator(life.DefaultGrid, 5e5) // design life 5·10⁵ cycles
	src := rand.New(rand.NewPCG(1, 2))
	for range 100_000 {
		c, _ := curve.Scaled(math.Exp(zeta * src.NormFloat64()))
		l, _ := c.Life(fatigue.Cycle{Amplitude: 60})
		acc.Add(l.Cycles)
	}
	d, _ := acc.DesignFailure(0.95)
	fmt.Printf("P(fail by 5e5) = %.4f [%.4f, %.4f]\n", d.P, d.Lower, d.Upper)
	curveR, _ := acc.Reliability(0.95)
	for _, p := range curveR {
		if p.Cycles == 1e6 || p.Cycles == 1e7 {
			fmt.Printf("R(%.0e) = %.4f [%.4f, %.4f]\n", p.Cycles, p.Reliability, p.Lower, p.Upper)
		}
	}
	b, _ := acc.BLife(0.1, 0.95)
	fmt.Printf("B10 in (%.4g, %.4g], 95 %% lower bound %.4g (rank %d of %d)\n", b.Lo, b.Hi, b.Lower, b.LowerRank, acc.N())
	// Output:
	// P(fail by 5e5) = 0.0053 [0.0049, 0.0058]
	// R(1e+06) = 0.6009 [0.5979, 0.6040]
	// R(1e+07) = 0.0205 [0.0196, 0.0214]
	// B10 in (7.244e+05, 7.413e+05], 95 % lower bound 7.244e+05 (rank 9844 of 100000)
}

// Closed forms for checks (reference-data-2 A5).
func ExampleWeibull() {
	w := life.Weibull{Eta: 1e6, Beta: 3}
	b10, _ := w.BLife(0.1)
	mttf, _ := w.MTTF()
	fmt.Printf("B10 = %.6g, MTTF = %.6g\n", b10, mttf)
	n, units, _ := life.SuccessRun(0.9, 0.95)
	fmt.Printf("R = 0.9 at 95 %%: %.3f → %d units without failure\n", n, units)
	r, cov := life.LowerRank(1000, 0.1, 0.95)
	fmt.Printf("95 %% lower bound on B10 from 1000 lives: the %dth smallest (coverage %.4f)\n", r, cov)
	// Output:
	// B10 = 472309, MTTF = 892980
	// R = 0.9 at 95 %: 28.433 → 29 units without failure
	// 95 % lower bound on B10 from 1000 lives: the 85th smallest (coverage 0.9515)
}
