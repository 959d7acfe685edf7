package model_test

import (
	"fmt"

	"boltrisk/model"
)

// Evaluate one M12 class 10.9 bolt tightened to 120 N·m with a nut factor of
// 0.20 under a repeated 30 kN load.
func ExampleEvaluate() {
	th, _ := model.LookupThread("M12")
	cl, _ := model.LookupClass("10.9", th.D)
	in := model.Inputs{
		Thread: th, Bolts: 1, Proof: cl.Proof, Yield: cl.Yield, Tensile: cl.Tensile,
		BoltModulus: 207000, ShankInGrip: 10, BearingDia: 18, HoleDia: 13,
		NLayers: 2, StiffnessMethod: model.Wileman,
		Method: model.NutFactorMethod, Torque: 120e3, NutFactor: 0.20, TorsionFactor: 0.5,
		AxialMax: 30e3, Criterion: model.Goodman, Endurance: cl.Endurance,
	}
	steel := model.Layer{Thickness: 15, Modulus: 207000, WilemanA: 0.78715, WilemanB: 0.62873}
	in.Layers[0], in.Layers[1] = steel, steel
	var o model.Outcome
	model.Evaluate(&in, &o)
	fmt.Printf("C = %.4f, preload = %.1f kN\n", o.Stiffness.C, o.Bolt.Preload/1000)
	for _, m := range []model.Mode{model.Proof, model.Separation, model.Fatigue} {
		fmt.Printf("%-10s safety factor %.3f\n", m.Key(), o.SafetyFactor(m))
	}
	// Output:
	// C = 0.2017, preload = 50.0 kN
	// proof      safety factor 1.248
	// separation safety factor 2.088
	// fatigue    safety factor 1.676
}
