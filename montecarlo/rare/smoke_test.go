package rare

import (
	"context"
	"math"
	"testing"
)

func TestSmoke(t *testing.T) {
	p := funcProblem(2, func(u []float64) float64 { return 6 - (u[0]+u[1])/math.Sqrt2 })
	res, err := Importance(context.Background(), p, &ImportanceSettings{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range res {
		t.Logf("%s: P %.6g cov %.3g [%.4g, %.4g] evals %d form %d ess %.1f maxshare %.3g", r.Event, r.Probability, r.COV, r.Lo, r.Hi, r.Evaluations, r.Importance.FORMEvaluations, r.Importance.ESS, r.Importance.MaxShare)
		t.Logf("dp %+v", r.DesignPoints[0])
	}
	p2 := funcProblem(10, func(u []float64) float64 { return 5.5 - u[0] }, func(u []float64) float64 { return 5.5 + u[0] })
	res, err = Importance(context.Background(), p2, &ImportanceSettings{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range res {
		t.Logf("%s: P %.6g (exact 3.7979124932e-8) cov %.3g [%.4g, %.4g] evals %d form %d ess %.1f maxshare %.3g", r.Event, r.Probability, r.COV, r.Lo, r.Hi, r.Evaluations, r.Importance.FORMEvaluations, r.Importance.ESS, r.Importance.MaxShare)
	}
}

func TestSmokeSubset(t *testing.T) {
	p2 := funcProblem(10, func(u []float64) float64 { return 5.5 - u[0] }, func(u []float64) float64 { return 5.5 + u[0] })
	res, err := Subset(context.Background(), p2, &SubsetSettings{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range res {
		t.Logf("%s: P %.6g (exact 3.7979124932e-8) cov %.3g [%.4g, %.4g] evals %d warn %v", r.Event, r.Probability, r.COV, r.Lo, r.Hi, r.Evaluations, r.Warnings)
		fc := 0.0
		for _, x := range r.Subset.Runs {
			fc += x.FormulaCOV
		}
		t.Logf("mean formula cov per run %.3g; run0 %+v", fc/float64(len(r.Subset.Runs)), r.Subset.Runs[0])
	}
}
