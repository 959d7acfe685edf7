package montecarlo_test

import (
	"context"
	"strings"
	"testing"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// TestLoadCases: one load case equal to the single loads gives the same
// counts as the single form (same seed, same draws); with a second, harder
// case every mode's all-case probability is at least each case's and at
// most their sum (the union bound), and each case's own estimate equals a
// run of that case alone (static modes; the fatigue modes are checked in
// the first case only).
func TestLoadCases(t *testing.T) {
	t.Parallel()
	src, err := scenario.ExampleSource("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	base := strings.Split(string(src), "variants:")[0]
	single := strings.Replace(base, "axial_max: {dist: normal, mean: 16 kN, cov: 10%}", "axial_max: 16 kN", 1)
	oneCase := strings.Replace(single, "  axial_min: 0 kN ", "  cases: [{name: operation}]\n  axial_min: 0 kN ", 1)
	twoCases := strings.Replace(single, "  axial_min: 0 kN ", "  cases: [{name: operation}, {name: proof-test, axial_max: 22 kN}]\n  axial_min: 0 kN ", 1)
	proof := strings.Replace(single, "axial_max: 16 kN", "axial_max: 22 kN", 1)
	run := func(name, doc string) *montecarlo.Result {
		s, err := scenario.Parse(name, []byte(doc))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 100_000, Seed: 5, Workers: 2, ProbabilitiesOnly: true})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	a, b := run("single", single), run("one case", oneCase)
	if len(b.Cases) != 1 || b.Cases[0].Name != "operation" {
		t.Fatalf("cases %+v", b.Cases)
	}
	for i := range a.Modes {
		if a.Modes[i].Estimate.Failures != b.Modes[i].Estimate.Failures || b.Cases[0].Modes[i].Estimate.Failures != a.Modes[i].Estimate.Failures {
			t.Errorf("%s: single %d, one case %d (case %d)", a.Modes[i].Mode.Key(), a.Modes[i].Estimate.Failures, b.Modes[i].Estimate.Failures, b.Cases[0].Modes[i].Estimate.Failures)
		}
	}
	c, p := run("two cases", twoCases), run("proof alone", proof)
	for i, m := range c.Modes {
		op, pt := c.Cases[0].Modes[i].Estimate.Failures, c.Cases[1].Modes[i].Estimate.Failures
		all := m.Estimate.Failures
		if all < max(op, pt) || all > op+pt {
			t.Errorf("%s: all cases %d, cases %d and %d", m.Mode.Key(), all, op, pt)
		}
		if m.Mode == model.Fatigue || m.Mode == model.FatigueLife {
			if pt != 0 || all != op {
				t.Errorf("%s: checked beyond the first case (%d, all %d, first %d)", m.Mode.Key(), pt, all, op)
			}
			continue
		}
		if j := indexOf(p, m); j >= 0 && pt != p.Modes[j].Estimate.Failures {
			t.Errorf("%s: proof-test case %d, the case alone %d", m.Mode.Key(), pt, p.Modes[j].Estimate.Failures)
		}
	}
}

func indexOf(r *montecarlo.Result, m montecarlo.ModeResult) int {
	for j := range r.Modes {
		if r.Modes[j].Mode == m.Mode {
			return j
		}
	}
	return -1
}

// TestLoadCasesDetail: with a harder second case the sampled bolt force is
// the larger of the cases' (here always the proof-test case's) and the
// clamp force the smaller: their percentiles equal a run of that case alone
// (same draws).
func TestLoadCasesDetail(t *testing.T) {
	t.Parallel()
	src, _ := scenario.ExampleSource("cover-flange")
	base := strings.Replace(strings.Split(string(src), "variants:")[0], "axial_max: {dist: normal, mean: 16 kN, cov: 10%}", "axial_max: 16 kN", 1)
	two := strings.Replace(base, "  axial_min: 0 kN ", "  cases: [{name: operation}, {name: proof-test, axial_max: 22 kN}]\n  axial_min: 0 kN ", 1)
	proof := strings.Replace(base, "axial_max: 16 kN", "axial_max: 22 kN", 1)
	run := func(doc string) *montecarlo.Result {
		s, err := scenario.Parse("x.yaml", []byte(doc))
		if err != nil {
			t.Fatal(err)
		}
		r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 40_000, Seed: 9, Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	a, b := run(two), run(proof)
	for _, q := range []montecarlo.Quantity{montecarlo.QBoltForce, montecarlo.QClamp} {
		pa, pb := a.Quantities[q].Percentiles, b.Quantities[q].Percentiles
		for i := range pa {
			if pa[i].Value != pb[i].Value {
				t.Errorf("%s percentile %d: cases %g, proof-test alone %g", q.Key(), i, pa[i].Value, pb[i].Value)
			}
		}
	}
}
