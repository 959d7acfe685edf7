package montecarlo

import (
	"testing"

	"boltrisk/model"
)

// r1Problem is reference case R1 (shared/bench README) built directly, for
// benchmarks inside the package (the scenario loader imports this package).
func r1Problem(tb testing.TB) *Problem {
	th, _ := model.LookupThread("M12")
	in := model.Inputs{Thread: th, Bolts: 1, Proof: 830, Yield: 940, Tensile: 1040, BoltModulus: 207000,
		ShankInGrip: 10, BearingDia: 18, HoleDia: 13, NLayers: 2, StiffnessMethod: model.Wileman,
		Method: model.NutFactorMethod, Torque: 120e3, NutFactor: 0.2, TorsionFactor: 0.5, AxialMax: 30e3, Endurance: 162}
	in.Layers[0] = model.Layer{Thickness: 15, Modulus: 207000, WilemanA: 0.78715, WilemanB: 0.62873}
	in.Layers[1] = in.Layers[0]
	must := func(d Dist, err error) Dist {
		if err != nil {
			tb.Fatal(err)
		}
		return d
	}
	field := func(f func(*model.Inputs) *float64) func(*model.Inputs) *float64 { return f }
	return &Problem{Base: in, Vars: []Var{
		{Name: "tightening.torque", Dist: must(NewNormal(120e3, 4.8e3)), PerBolt: true, Field: field(func(in *model.Inputs) *float64 { return &in.Torque })},
		{Name: "tightening.nut_factor", Dist: must(NewLogNormalMoments(0.2, 0.024)), PerBolt: true, Field: field(func(in *model.Inputs) *float64 { return &in.NutFactor })},
		{Name: "loads.axial_max", Dist: must(NewNormal(30e3, 6e3)), Field: field(func(in *model.Inputs) *float64 { return &in.AxialMax })},
		{Name: "fatigue.endurance", Dist: must(NewLogNormalMoments(162, 16.2)), PerBolt: true, Field: field(func(in *model.Inputs) *float64 { return &in.Endurance })},
	}}
}

// BenchmarkChunkR1 times one worker on one chunk of R1 with the three R1
// modes, binning one chunk in four as a 10⁷-sample run does: the per-sample
// cost of the runner without scheduling. Compare variants with -count 10 and benchstat.
func BenchmarkChunkR1(b *testing.B) {
	p := r1Problem(b)
	pl, err := newPlan(p)
	if err != nil {
		b.Fatal(err)
	}
	r, err := pilotRanges(p, pl, 1)
	if err != nil {
		b.Fatal(err)
	}
	w, err := newWorker(p, pl, []model.Mode{model.Proof, model.Separation, model.Fatigue}, r, binStride(1e7), false)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	c := int64(0)
	for b.Loop() {
		w.runChunk(1, c, ChunkSize)
		c++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(int64(b.N)*ChunkSize), "ns/sample")
}
