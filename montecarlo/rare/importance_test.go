package rare

import (
	"context"
	"testing"
)

// Every anchor within 3 reported standard errors of its exact value at the
// default settings (c.o.v. 5 %). A correct estimator fails one such check
// with probability ≈ 0.27 % (normal tails); the seed is fixed, so the test
// is deterministic.
func TestImportanceAnchors(t *testing.T) {
	t.Parallel()
	for _, a := range anchors() {
		t.Run(a.name, func(t *testing.T) {
			t.Parallel()
			res, err := Importance(context.Background(), a.p, &ImportanceSettings{Seed: 1})
			if err != nil {
				t.Fatal(err)
			}
			r := res[len(res)-1]
			t.Logf("P %.6g = %.4f × exact, c.o.v. %.3f, evaluations %d (FORM %d), ESS %.0f, max share %.3g",
				r.Probability, r.Probability/a.exact, r.COV, r.Evaluations, r.Importance.FORMEvaluations, r.Importance.ESS, r.Importance.MaxShare)
			within(t, "P", r.Probability, a.exact, r.COV*r.Probability, 3)
			if len(r.Warnings) > 0 {
				t.Errorf("warnings: %v", r.Warnings)
			}
			if !(r.Lo <= r.Probability && r.Probability <= r.Hi) {
				t.Errorf("interval [%g, %g] excludes the estimate %g", r.Lo, r.Hi, r.Probability)
			}
		})
	}
}
