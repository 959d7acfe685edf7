package montecarlo_test

import (
	"context"
	"testing"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// BenchmarkR1 runs reference case R1 (shared/bench README) with the four
// modes of the reference implementations tallied and reports samples/s.
// Compare with: go run ../shared/bench/goloop 1e7 (same machine, same run).
func BenchmarkR1(b *testing.B) {
	s, err := scenario.Example("bench-m12")
	if err != nil {
		b.Fatal(err)
	}
	const n = 1 << 22
	set := montecarlo.Settings{Samples: n, Seed: 1, Modes: []model.Mode{model.Fatigue, model.Separation, model.Proof}}
	b.ReportAllocs()
	var total int64
	for b.Loop() {
		r, err := montecarlo.Run(context.Background(), &s.Problem, set)
		if err != nil {
			b.Fatal(err)
		}
		total += r.Samples
	}
	b.ReportMetric(float64(total)/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkChunkCoverFlange times one worker on chunks of the cover-flange
// example (8 bolts, each drawing its own torque, nut factor and endurance;
// the shared load), all five active modes, binning as a 5·10⁶-sample run
// does: the per-sample cost of the multi-bolt kernel. Divide ns/sample by 8
// for the cost per bolt evaluation (shared/bench/goloop8 prints its own).
func BenchmarkChunkCoverFlange(b *testing.B) {
	s, err := scenario.Example("cover-flange")
	if err != nil {
		b.Fatal(err)
	}
	montecarlo.BenchChunks(b, &s.Problem, nil, montecarlo.BinStride(5e6))
}
