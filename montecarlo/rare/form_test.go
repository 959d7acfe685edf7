package rare

import (
	"math"
	"strings"
	"testing"
)

func TestDesignPointsAnchors(t *testing.T) {
	t.Parallel()
	lR, zR := lnParams(7, 0.5)
	lS, zS := lnParams(1, 0.5)
	const rho = 0.52523
	// Simply supported beam (UQLab uq_Reliability_test_simply_supported_beam.m via
	// reliability-methods.md §1.2): V = 5pL⁴/(32Ebh³) ≥ 0.015 m fails; lognormal
	// b, h, L, E, p (UQLab units MN, m). β = 2.115215 and α = (−0.1684,
	// −0.5052, 0.1348, −0.5027, 0.6674) [exact; the failure set is log-linear,
	// so FORM is exact]; α² = (0.0284, 0.2552, 0.0182, 0.2527, 0.4455).
	type ln struct{ l, z float64 }
	var beam [5]ln
	for i, ms := range [5][2]float64{{0.15, 0.0075}, {0.3, 0.015}, {5, 0.05}, {3e4, 4500}, {0.01, 0.002}} {
		beam[i].l, beam[i].z = lnParams(ms[0], ms[1])
	}
	x := func(u []float64, i int) float64 { return math.Exp(beam[i].l + beam[i].z*u[i]) }
	beamG := func(u []float64) float64 {
		b, h, l, e, p := x(u, 0), x(u, 1), x(u, 2), x(u, 3), x(u, 4)
		return 0.015 - 5*p*math.Pow(l, 4)/(32*e*b*h*h*h)
	}
	for _, tc := range []struct {
		name  string
		p     *Problem
		beta  []float64 // per component
		alpha []float64 // of component 0, nil: not checked
		tol   float64   // on α components
	}{
		// A1: R − S, β = √2, α = (−1, 1)/√2 [exact] (reliability-methods.md §1.1).
		{"A1", funcProblem(2, func(u []float64) float64 { return 2 + u[0] - u[1] }), []float64{math.Sqrt2}, []float64{-math.Sqrt2 / 2, math.Sqrt2 / 2}, 1e-6},
		// A2 with g = R − S (non-linear in u): β = 6/√2 [exact].
		{"A2 R-S", lognormalRatio(10, 4), []float64{6 / math.Sqrt2}, []float64{-math.Sqrt2 / 2, math.Sqrt2 / 2}, 1e-3},
		// A4: β = 4.679584 [exact] (computed above: 4.679583553376628).
		{"A4", funcProblem(2, func(u []float64) float64 {
			return math.Exp(lR+zR*u[0]) - math.Exp(lS+zS*(rho*u[0]+math.Sqrt(1-rho*rho)*u[1]))
		}), []float64{4.679583553376628}, nil, 0},
		{"A3 beam", funcProblem(5, beamG), []float64{2.115215}, []float64{-0.1684, -0.5052, 0.1348, -0.5027, 0.6674}, 2e-4},
		// Four-branch p = 7/√2: branches 1–2 at β = 3, sides at p/√2 = 3.5 (reliability-methods.md §1.3).
		{"four-branch", fourBranch(3, 0.1, 7/math.Sqrt2), []float64{3, 3, 3.5, 3.5}, []float64{math.Sqrt2 / 2, math.Sqrt2 / 2}, 1e-3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			dps, err := DesignPoints(tc.p, nil)
			if err != nil {
				t.Fatal(err)
			}
			for c, want := range tc.beta {
				d := dps[c]
				if !d.Converged {
					t.Fatalf("component %d: not converged: %s", c, d.Message)
				}
				closeRel(t, "β", d.Beta, want, 2e-4)
				closeRel(t, "FORM", d.FORM, normSF(want), 2e-3)
				// u* = β·α and Σα² = 1 at convergence.
				if e := norm2(d.Alpha) - 1; math.Abs(e) > 1e-12 {
					t.Errorf("component %d: ‖α‖ − 1 = %g", c, e)
				}
				for i := range d.U {
					if math.Abs(d.U[i]-d.Beta*d.Alpha[i]) > 2e-3 {
						t.Errorf("component %d: u*[%d] = %g, β·α = %g", c, i, d.U[i], d.Beta*d.Alpha[i])
					}
				}
				t.Logf("component %d: β %.7f (%d iterations, %d evaluations)", c, d.Beta, d.Iterations, d.Evaluations)
			}
			for i, a := range tc.alpha {
				if math.Abs(dps[0].Alpha[i]-a) > tc.tol {
					t.Errorf("α[%d] = %.5f, want %.5f", i, dps[0].Alpha[i], a)
				}
			}
		})
	}
}

func TestDesignPointsMessages(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name      string
		g         limit
		converged bool
		beta      float64
		msg       string
	}{
		// The origin fails: β = −1 (u* = (1, 0), α = (−1, 0)), reported as not rare.
		{"not rare", func(u []float64) float64 { return -1 + u[0] }, true, -1, "not rare"},
		// g ≥ 1 everywhere: no limit state to find (any message).
		{"no root", func(u []float64) float64 { return 1 + math.Exp(-u[0]) }, false, 0, ""},
		// Forward differences see a slope h at the origin: a step of 1/h the merit function rejects.
		{"no root, parabola", func(u []float64) float64 { return 1 + u[0]*u[0] }, false, 0, "line search failed"},
		{"flat", func(u []float64) float64 { return 1 + u[0]*u[0]*u[0]*u[0] }, false, 0, "zero gradient"},
		{"undefined", func(u []float64) float64 { return math.NaN() }, false, 0, "undefined (NaN) at the origin"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			dps, err := DesignPoints(funcProblem(2, tc.g), nil)
			if err != nil {
				t.Fatal(err)
			}
			d := dps[0]
			if d.Converged != tc.converged || !strings.Contains(d.Message, tc.msg) || (!d.Converged && d.Message == "") {
				t.Errorf("converged %v, message %q; want %v and %q", d.Converged, d.Message, tc.converged, tc.msg)
			}
			if tc.converged && math.Abs(d.Beta-tc.beta) > 1e-6 {
				t.Errorf("β = %g, want %g", d.Beta, tc.beta)
			}
			if !tc.converged && d.FORM != 0 {
				t.Errorf("FORM %g reported for a search that did not converge", d.FORM)
			}
			if math.IsNaN(d.Beta) || math.IsNaN(d.G0) {
				t.Errorf("NaN in the result: β %g, g(0) %g", d.Beta, d.G0)
			}
		})
	}
}

// Every point passed to Eval counts: g(0) with its gradient, one trial
// point, the gradient there (linear g converges after one step).
func TestDesignPointsEvaluations(t *testing.T) {
	t.Parallel()
	lin := func(u []float64) float64 { return 4 - (u[0]+u[1])/math.Sqrt2 }
	for _, tc := range []struct {
		name    string
		support bool
		central bool
		want    int64
	}{
		{"all coordinates, forward", false, false, (1 + 5) + 1 + 5},
		{"support, forward", true, false, (1 + 2) + 1 + 2},
		{"support, central", true, true, (1 + 4) + 1 + 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			var n int64
			p := funcProblem(5, lin)
			inner := p.NewEvaluator()
			p.NewEvaluator = func() Evaluator { return countEval{inner, &n} }
			if tc.support {
				p.Support = [][]int{{0, 1}}
			}
			dps, err := DesignPoints(p, &FORMSettings{Central: tc.central})
			if err != nil {
				t.Fatal(err)
			}
			if d := dps[0]; d.Evaluations != tc.want || n != tc.want || d.Iterations != 1 {
				t.Errorf("%d evaluations reported, %d counted, %d iterations; want %d, 1", d.Evaluations, n, d.Iterations, tc.want)
			}
			closeRel(t, "β", dps[0].Beta, 4, 1e-7)
		})
	}
}

// countEval counts the points passed to an evaluator (single goroutine).
type countEval struct {
	Evaluator
	n *int64
}

func (c countEval) Eval(u []float64, n int, g []float64) {
	*c.n += int64(n)
	c.Evaluator.Eval(u, n, g)
}

// Under a Symmetry only block 0's component and the shared one are
// searched; the others get the design point with the blocks swapped.
func TestDesignPointsSymmetry(t *testing.T) {
	t.Parallel()
	p := equicorrelated(8, 5, 0.5)
	// A joint-level component: the mean of the W_j, invariant under swaps,
	// β = 4.5 (‖gradient‖ = 1).
	gs := make([]limit, 0, 9)
	ev := p.NewEvaluator().(funcEval)
	gs = append(gs, ev.gs...)
	gs = append(gs, func(u []float64) float64 {
		s := 0.0
		for _, x := range u[1:] {
			s += x
		}
		return 4.5 - s/math.Sqrt(8)
	})
	q := funcProblem(9, gs...)
	q.Support = append(p.Support, nil)
	q.Symmetry = &Symmetry{Shared: 1, Block: 1, Count: 8, Map: swapMap(8, 1)}
	dps, err := DesignPoints(q, nil)
	if err != nil {
		t.Fatal(err)
	}
	if dps[0].MappedFrom != -1 || dps[8].MappedFrom != -1 {
		t.Errorf("block 0's and the shared component must be searched: MappedFrom %d, %d", dps[0].MappedFrom, dps[8].MappedFrom)
	}
	closeRel(t, "β of the shared component", dps[8].Beta, 4.5, 1e-6)
	for c := 1; c < 8; c++ {
		d := dps[c]
		if d.MappedFrom != 0 || d.Evaluations != 0 || d.Beta != dps[0].Beta || !d.Converged {
			t.Errorf("component %d: mapped from %d, %d evaluations, β %g", c, d.MappedFrom, d.Evaluations, d.Beta)
		}
		// u* of component c: V as for component 0, W_c where component 0 has W_0.
		if d.U[0] != dps[0].U[0] || d.U[1+c] != dps[0].U[1] || d.U[1] != dps[0].U[1+c] {
			t.Errorf("component %d: u* = %v, not component 0's %v with blocks 0 and %d swapped", c, d.U, dps[0].U, c)
		}
	}
	// β of one margin: β = 5 [exact: g_j is linear with unit gradient].
	closeRel(t, "β", dps[0].Beta, 5, 1e-6)
}

func TestProblemValidate(t *testing.T) {
	t.Parallel()
	ok := func() *Problem { return equicorrelated(3, 5, 0.5) }
	for _, tc := range []struct {
		name string
		edit func(p *Problem)
		want string
	}{
		{"dim", func(p *Problem) { p.Dim = 0 }, "Problem.Dim is 0"},
		{"components", func(p *Problem) { p.Components = 0 }, "Problem.Components is 0"},
		{"evaluator", func(p *Problem) { p.NewEvaluator = nil }, "NewEvaluator is nil"},
		{"reserved name", func(p *Problem) { p.Events = []Event{{Name: "any", Components: []int{0}}} }, `"any", which is reserved`},
		{"component range", func(p *Problem) { p.Events = []Event{{Name: "x", Components: []int{3}}} }, "lists component 3; components are 0…2"},
		{"duplicate", func(p *Problem) { p.Events = []Event{{Name: "x", Components: []int{1, 1}}} }, "component 1 twice"},
		{"support length", func(p *Problem) { p.Support = p.Support[:1] }, "Problem.Support has 1 entries"},
		{"support range", func(p *Problem) { p.Support[0] = []int{7} }, "Support[0] lists coordinate 7"},
		{"symmetry dims", func(p *Problem) { p.Symmetry.Block = 2 }, "covers 7 coordinates"},
		{"symmetry swap", func(p *Problem) { p.Symmetry.Map[1] = []int{1, 2, 0} }, "is not a swap"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			p := ok()
			tc.edit(p)
			err := p.Validate()
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want one containing %q", err, tc.want)
			}
		})
	}
	if err := ok().Validate(); err != nil {
		t.Errorf("valid problem: %v", err)
	}
}
