// Package jointtest holds the joints the tests of every package share, so
// that no test builds the same joint by hand again.
package jointtest

import "boltrisk/model"

// R1 returns reference case R1 of the speed benchmark (an invented case;
// shared/bench README): one M12×1.75 bolt of class 10.9 (Sp 830, Sy 940,
// Sut 1040 MPa) through two 15 mm steel plates (Wileman members, E 207 GPa),
// 10 mm of unthreaded shank in the 30 mm grip, bearing face 18 mm, hole
// 13 mm, tightened to 120 N·m with a nut factor of 0.20, under a repeated
// 0 … 30 kN load, Goodman fatigue with Se = 162 MPa (Shigley Table 8-17).
func R1() model.Inputs {
	th, err := model.LookupThread("M12")
	if err != nil {
		panic(err)
	}
	in := model.Inputs{
		Thread: th, Bolts: 1, Proof: 830, Yield: 940, Tensile: 1040, BoltModulus: model.SteelModulus,
		ShankInGrip: 10, BearingDia: 18, HoleDia: 13, NLayers: 2, StiffnessMethod: model.Wileman,
		Method: model.NutFactorMethod, Torque: 120e3, NutFactor: 0.20, TorsionFactor: model.DefaultTorsionFactor,
		AxialMax: 30e3, Criterion: model.Goodman, Endurance: 162,
	}
	steel := model.Layer{Thickness: 15, Modulus: model.SteelModulus, WilemanA: 0.78715, WilemanB: 0.62873} // Shigley Table 8-8
	in.Layers[0], in.Layers[1] = steel, steel
	return in
}

// R1Preload returns R1 with the assembly preload given directly (a
// tension-controlled tightening by a tensioner, no thread torsion): 40 kN.
func R1Preload() model.Inputs {
	in := R1()
	in.Method, in.Torque, in.NutFactor, in.Preload = model.DirectPreload, 0, 0, 40e3
	in.Tensioned = true
	return in
}
