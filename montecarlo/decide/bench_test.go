package decide_test

import (
	"context"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/scenario"
)

// Spec on the built-in cover-flange example (issue 13: target 1e-4 under
// 10 s, 1e-6 with a rare-event method under 30 s, on 2 cores), beside one
// crude run of the same samples (the reference unit a spec repeats):
//
//	go test -run '^$' -bench 'Spec|OneRun' -benchtime 1x ./montecarlo/decide/
//
// testdata/bench/spec.sh times the whole command the same way.
func benchSpec(b *testing.B, target float64, m montecarlo.Method) {
	s, err := scenario.Example("cover-flange")
	if err != nil {
		b.Fatal(err)
	}
	o := decide.SpecOptions{Target: target, Path: "tightening.torque", Field: scenario.FieldPtrFunc("tightening.torque"),
		Lo: 26e3, Hi: 78e3, Settings: montecarlo.Settings{Samples: 1_000_000, Seed: 20261202, Method: m}}
	for _, c := range s.PresetChanges() {
		alt, err := s.Alternative(c.Label, map[string]string{c.Path: c.Value})
		if err == nil {
			o.Alternatives = append(o.Alternatives, decide.Alternative{Label: c.Label, Problem: &alt.Problem})
		}
	}
	b.ResetTimer()
	for range b.N {
		if _, err := decide.RunSpec(context.Background(), &s.Problem, o); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSpecCoverFlange1e4(b *testing.B)           { benchSpec(b, 1e-4, montecarlo.Crude) }
func BenchmarkSpecCoverFlange1e6Importance(b *testing.B) { benchSpec(b, 1e-6, montecarlo.Importance) }

func BenchmarkOneRunCoverFlange(b *testing.B) {
	s, err := scenario.Example("cover-flange")
	if err != nil {
		b.Fatal(err)
	}
	for range b.N {
		if _, err := montecarlo.Estimate(context.Background(), &s.Problem, montecarlo.Settings{Samples: 1_000_000, Seed: 20261202, ProbabilitiesOnly: true}); err != nil {
			b.Fatal(err)
		}
	}
}
