package rare

import (
	"math"
	"strings"
	"testing"
)

// limit is one component limit state g_c(u).
type limit func(u []float64) float64

// funcEval evaluates a list of limit states point by point (test models).
type funcEval struct {
	dim int
	gs  []limit
}

func (f funcEval) Eval(u []float64, n int, g []float64) {
	nc := len(f.gs)
	for r := range n {
		row := u[r*f.dim : (r+1)*f.dim]
		for c, fn := range f.gs {
			g[r*nc+c] = fn(row)
		}
	}
}

// funcProblem is a problem of the given limit states, every component a
// part of AnyEvent only.
func funcProblem(dim int, gs ...limit) *Problem {
	return &Problem{Dim: dim, Components: len(gs), NewEvaluator: func() Evaluator { return funcEval{dim, gs} }}
}

// within checks |got − want| ≤ k·sd.
func within(t *testing.T, what string, got, want, sd, k float64) {
	t.Helper()
	if !(math.Abs(got-want) <= k*sd) {
		t.Errorf("%s: got %.6g, want %.6g ± %g·%.3g (off by %.2f sd)", what, got, want, k, sd, (got-want)/sd)
	}
}

// close checks |got/want − 1| ≤ rel.
func closeRel(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if !(math.Abs(got/want-1) <= rel) {
		t.Errorf("%s: got %.10g, want %.10g (relative error %.3g > %g)", what, got, want, got/want-1, rel)
	}
}

func contains(s, sub string) bool { return strings.Contains(s, sub) }
