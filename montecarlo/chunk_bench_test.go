package montecarlo

import (
	"testing"

	"boltrisk/model"
	"boltrisk/model/jointtest"
)

// r1Problem is reference case R1 (shared/bench README) built directly, for
// benchmarks inside the package (the scenario loader imports this package).
func r1Problem(tb testing.TB) *Problem {
	in := jointtest.R1()
	must := func(d Dist, err error) Dist {
		if err != nil {
			tb.Fatal(err)
		}
		return d
	}
	field := func(f func(*model.Inputs) *float64) func(*model.Inputs) *float64 { return f }
	return &Problem{Base: in, Vars: []Var{
		{Name: "tightening.torque", Dist: must(NewNormal(120e3, 4.8e3)), Role: PerBolt, Field: field(func(in *model.Inputs) *float64 { return &in.Torque })},
		{Name: "tightening.nut_factor", Dist: must(NewLogNormalMoments(0.2, 0.024)), Role: PerBolt, Field: field(func(in *model.Inputs) *float64 { return &in.NutFactor })},
		{Name: "loads.axial_max", Dist: must(NewNormal(30e3, 6e3)), Role: Load, Field: field(func(in *model.Inputs) *float64 { return &in.AxialMax })},
		{Name: "fatigue.endurance", Dist: must(NewLogNormalMoments(162, 16.2)), Role: PerBolt, Field: field(func(in *model.Inputs) *float64 { return &in.Endurance })},
	}}
}

// BenchmarkChunkR1 times one worker on chunks of R1 with the three R1
// modes, binning one chunk in binStride(10⁷) as a 10⁷-sample run does: the
// per-sample cost of the kernel and the crude tally without scheduling.
// Compare variants with -count 10 and benchstat.
func BenchmarkChunkR1(b *testing.B) {
	benchChunks(b, r1Problem(b), []model.Mode{model.Proof, model.Separation, model.Fatigue}, binStride(1e7))
}

// BenchmarkChunkR1All is BenchmarkChunkR1 with all five active modes.
func BenchmarkChunkR1All(b *testing.B) { benchChunks(b, r1Problem(b), nil, binStride(1e7)) }

func benchChunks(b *testing.B, p *Problem, modes []model.Mode, stride int64) {
	k, err := NewKernel(p, modes)
	if err != nil {
		b.Fatal(err)
	}
	w := newCrudeWorker(k, pilot(k, 1), stride)
	b.ReportAllocs()
	c := int64(0)
	for b.Loop() {
		w.runChunk(1, c, ChunkSize)
		c++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(int64(b.N)*ChunkSize), "ns/sample")
}
