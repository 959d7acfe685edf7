package montecarlo_test

import (
	"context"
	"strings"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// BenchmarkLifeVsSimulate times 'life' on the cover-flange example with a
// four-block spectrum on the Shigley curve against one crude 'simulate' of
// the same joint and size (issue 14: life within 2× simulate's cost). Run
// both in one session: go test -bench LifeVsSimulate ./montecarlo/
func BenchmarkLifeVsSimulate(b *testing.B) {
	src, err := scenario.ExampleSource("cover-flange")
	if err != nil {
		b.Fatal(err)
	}
	doc := strings.Split(string(src), "variants:")[0]
	doc = strings.Replace(doc, "  axial_min: 0 kN ", `  spectrum:
    - {level: 1.2, cycles: 10}
    - {level: 1, cycles: 1000}
    - {level: 0.6, cycles: 5000}
    - {max: 6 kN, min: 2 kN, cycles: 20000}
  axial_min: 0 kN `, 1)
	doc = strings.Replace(doc, "  criterion: goodman ", "  curve: shigley\n  design_life: 1e6\n  criterion: goodman ", 1)
	s, err := scenario.Parse("bench.yaml", []byte(doc))
	if err != nil {
		b.Fatal(err)
	}
	plain, err := scenario.Parse("plain.yaml", []byte(strings.Split(string(src), "variants:")[0]))
	if err != nil {
		b.Fatal(err)
	}
	const n = 1 << 18
	set := montecarlo.Settings{Samples: n, Seed: 1, Workers: 1}
	b.Run("simulate-without-life", func(b *testing.B) {
		for b.Loop() {
			if _, err := montecarlo.Run(context.Background(), &plain.Problem, set); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/sample")
	})
	b.Run("simulate", func(b *testing.B) {
		for b.Loop() {
			if _, err := montecarlo.Run(context.Background(), &s.Problem, set); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/sample")
	})
	b.Run("life", func(b *testing.B) {
		for b.Loop() {
			if _, err := montecarlo.RunLife(context.Background(), &s.Problem, s.Life, montecarlo.LifeSettings{Settings: set}); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/sample")
	})
}
