package montecarlo

import (
	"testing"

	"boltrisk/model"
)

func TestBoltViewMatchesJoint(t *testing.T) {
	// A one-bolt joint without shear is tallied from the bolt result; forcing
	// the joint evaluation must give the same counts and histograms.
	in := model.Inputs{}
	th, _ := model.LookupThread("M12")
	in = model.Inputs{Thread: th, Bolts: 1, Proof: 830, Yield: 940, Tensile: 1040, BoltModulus: 207000,
		ShankInGrip: 10, BearingDia: 18, HoleDia: 13, NLayers: 2, StiffnessMethod: model.Frustum,
		Method: model.NutFactorMethod, Torque: 120e3, NutFactor: 0.2, TorsionFactor: 0.5, AxialMax: 30e3, Endurance: 162}
	in.Layers[0] = model.Layer{Thickness: 15, Modulus: 207000}
	in.Layers[1] = in.Layers[0]
	k, _ := NewLogNormalMoments(0.2, 0.03)
	p, _ := NewNormal(30e3, 6e3)
	prob := &Problem{Base: in, Vars: []Var{
		{Name: "tightening.nut_factor", Dist: k, Role: PerBolt, Field: func(in *model.Inputs) *float64 { return &in.NutFactor }},
		{Name: "loads.axial_max", Dist: p, Role: Load, Field: func(in *model.Inputs) *float64 { return &in.AxialMax }},
	}}
	var tallies [2]*tally
	for i, need := range []bool{false, true} {
		pl, err := newPlan(prob)
		if err != nil {
			t.Fatal(err)
		}
		if pl.needJoint {
			t.Fatal("one bolt, no shear: the joint should not be needed")
		}
		pl.needJoint = need
		var nom model.Outcome
		model.Evaluate(&in, &nom)
		r, _ := pilotRanges(prob, pl, 1)
		w, err := newWorker(prob, pl, reportedModes(&nom), r, 1, false)
		if err != nil {
			t.Fatal(err)
		}
		w.runChunk(1, 0, 20000)
		tallies[i] = w.t
	}
	a, b := tallies[0], tallies[1]
	if a.samples != b.samples || a.any != b.any || a.fail != b.fail || a.invalid != b.invalid {
		t.Errorf("bolt view %+v vs joint %+v", a.fail, b.fail)
	}
	for m := range a.sf {
		if a.sf[m].Total() != b.sf[m].Total() || a.sf[m].Under != b.sf[m].Under {
			t.Errorf("mode %d: histograms differ", m)
		}
	}
}
