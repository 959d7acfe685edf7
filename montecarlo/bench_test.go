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
