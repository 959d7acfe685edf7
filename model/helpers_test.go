package model

import (
	"math"
	"testing"
)

// near fails the test when got is not within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.6g, want %.6g (±%.2g %%)", what, got, want, 100*rel)
	}
}

// r1 returns reference case R1 of the speed benchmark (invented for
// benchmarking; shared/bench README): M12 10.9, grip 30 mm steel, 10 mm
// shank, Wileman members, T = 120 N·m, K = 0.20, repeated 0…30 kN.
func r1() Inputs {
	th, _ := LookupThread("M12")
	in := Inputs{
		Thread: th, Bolts: 1, Proof: 830, Yield: 940, Tensile: 1040, BoltModulus: 207000,
		ShankInGrip: 10, BearingDia: 18, HoleDia: 13, NLayers: 2, StiffnessMethod: Wileman,
		Method: NutFactorMethod, Torque: 120e3, NutFactor: 0.20, TorsionFactor: 0.5,
		AxialMax: 30e3, Criterion: Goodman, Endurance: 162,
	}
	steel := Layer{Thickness: 15, Modulus: 207000, WilemanA: 0.78715, WilemanB: 0.62873}
	in.Layers[0], in.Layers[1] = steel, steel
	return in
}
