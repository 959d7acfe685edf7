package montecarlo

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"boltrisk/model"
)

func BenchmarkMicroInline(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	s := 0.0
	for b.Loop() {
		T := 120e3 + 120e3*0.04*r.NormFloat64()
		K := math.Exp(-1.6 + 0.12*r.NormFloat64())
		Se := math.Exp(5 + 0.1*r.NormFloat64())
		P := 30e3 + 30e3*0.20*r.NormFloat64()
		s += T/K + Se + P
	}
	_ = s
}

func BenchmarkMicroDraw(b *testing.B) {
	var x [4]float64
	d1, _ := NewNormal(120e3, 4.8e3)
	d2, _ := NewLogNormalMoments(0.2, 0.024)
	d3, _ := NewLogNormalMoments(162, 16.2)
	d4, _ := NewNormal(30e3, 6e3)
	g := group{dists: []Dist{d1, d2, d3, d4}, ptrs: []*float64{&x[0], &x[1], &x[2], &x[3]}}
	r := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		g.draw(r)
	}
}

func microWorker(b *testing.B) *worker {
	d1, _ := NewNormal(120e3, 4.8e3)
	d2, _ := NewLogNormalMoments(0.2, 0.024)
	d3, _ := NewLogNormalMoments(162, 16.2)
	d4, _ := NewNormal(30e3, 6e3)
	in := r1Inputs()
	p := &Problem{Base: in, Vars: []Var{
		{Name: "t", Dist: d1, PerBolt: true, Field: func(in *model.Inputs) *float64 { return &in.Torque }},
		{Name: "k", Dist: d2, PerBolt: true, Field: func(in *model.Inputs) *float64 { return &in.NutFactor }},
		{Name: "se", Dist: d3, PerBolt: true, Field: func(in *model.Inputs) *float64 { return &in.Endurance }},
		{Name: "p", Dist: d4, Field: func(in *model.Inputs) *float64 { return &in.AxialMax }},
	}}
	pl, _ := newPlan(p)
	var nom model.Outcome
	model.Evaluate(&in, &nom)
	rg, _ := pilotRanges(p, pl, 1)
	w, err := newWorker(p, pl, []model.Mode{model.Proof, model.Separation, model.Fatigue}, rg)
	if err != nil {
		b.Fatal(err)
	}
	return w
}

func BenchmarkMicroSample(b *testing.B) {
	w := microWorker(b)
	for b.Loop() {
		w.sample()
	}
}

func BenchmarkMicroChunk(b *testing.B) {
	w := microWorker(b)
	for b.Loop() {
		w.runChunk(1, 0, 1000)
	}
	b.ReportMetric(float64(b.N)*1000/b.Elapsed().Seconds(), "samples/s")
}

func r1Inputs() model.Inputs {
	th, _ := model.LookupThread("M12")
	in := model.Inputs{
		Thread: th, Bolts: 1, Proof: 830, Yield: 940, Tensile: 1040, BoltModulus: 207000,
		ShankInGrip: 10, BearingDia: 18, HoleDia: 13, NLayers: 2, StiffnessMethod: model.Wileman,
		Method: model.NutFactorMethod, Torque: 120e3, NutFactor: 0.20, TorsionFactor: 0.5,
		AxialMax: 30e3, Criterion: model.Goodman, Endurance: 162,
	}
	steel := model.Layer{Thickness: 15, Modulus: 207000, WilemanA: 0.78715, WilemanB: 0.62873}
	in.Layers[0], in.Layers[1] = steel, steel
	return in
}

func BenchmarkMicroRunWorkers(b *testing.B) {
	d1, _ := NewNormal(120e3, 4.8e3)
	in := r1Inputs()
	p := &Problem{Base: in, Vars: []Var{{Name: "t", Dist: d1, PerBolt: true, Field: func(in *model.Inputs) *float64 { return &in.Torque }}}}
	for _, w := range []int{1, 2} {
		b.Run(string(rune('0'+w)), func(b *testing.B) {
			for b.Loop() {
				Run(context.Background(), p, Settings{Samples: 1 << 21, Seed: 1, Workers: w})
			}
			b.ReportMetric(float64(b.N)*(1<<21)/b.Elapsed().Seconds(), "samples/s")
		})
	}
}
