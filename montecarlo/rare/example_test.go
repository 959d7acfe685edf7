package rare_test

import (
	"context"
	"fmt"

	"boltrisk/montecarlo/rare"
)

// margins is the model of the examples: two bolts share a load coordinate
// u0; bolt b separates when 5 − (0.6·u0 + 0.8·u_{1+b}) ≤ 0, so each bolt
// fails with Φ(−5) = 2.87e-7 and either with 5.73e-7 (the two margins are
// correlated by 0.36).
type margins struct{}

func (margins) Eval(u []float64, n int, g []float64) {
	for i := range n {
		x := u[3*i : 3*i+3]
		g[2*i] = 5 - (0.6*x[0] + 0.8*x[1])
		g[2*i+1] = 5 - (0.6*x[0] + 0.8*x[2])
	}
}

func jointProblem() *rare.Problem {
	return &rare.Problem{
		Dim: 3, Components: 2,
		Events:  []rare.Event{{Name: "bolt 0", Components: []int{0}}},
		Support: [][]int{{0, 1}, {0, 2}},
		// Swapping the two bolts' coordinates swaps their components.
		Symmetry:     &rare.Symmetry{Shared: 1, Block: 1, Count: 2, Map: [][]int{{0, 1}, {1, 0}}},
		NewEvaluator: func() rare.Evaluator { return margins{} },
	}
}

func ExampleImportance() {
	res, err := rare.Importance(context.Background(), jointProblem(), &rare.ImportanceSettings{Seed: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range res {
		fmt.Printf("%-6s P = %.2e, c.o.v. %.2f, 95 %% interval [%.2e, %.2e], %d evaluations\n",
			r.Event, r.Probability, r.COV, r.Lo, r.Hi, r.Evaluations)
	}
	d := res[1].DesignPoints[1]
	fmt.Printf("bolt 1: β = %.3f, α = (%.2f, %.2f, %.2f), %s\n", d.Beta, d.Alpha[0], d.Alpha[1], d.Alpha[2], d.Message)
	// Output:
	// bolt 0 P = 3.00e-07, c.o.v. 0.05, 95 % interval [2.73e-07, 3.31e-07], 2566 evaluations
	// any    P = 5.98e-07, c.o.v. 0.05, 95 % interval [5.43e-07, 6.60e-07], 2566 evaluations
	// bolt 1: β = 5.000, α = (0.60, 0.00, 0.80), mapped from component 0 by swapping blocks 0 and 1
}

func ExampleSubset() {
	res, err := rare.Subset(context.Background(), jointProblem(), &rare.SubsetSettings{Seed: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range res {
		fmt.Printf("%-6s P = %.2e, c.o.v. %.2f over %d runs of %d levels, %d evaluations\n",
			r.Event, r.Probability, r.COV, len(r.Subset.Runs), r.Subset.Runs[0].Levels, r.Evaluations)
	}
	// Output:
	// bolt 0 P = 2.94e-07, c.o.v. 0.08 over 20 runs of 7 levels, 255964 evaluations
	// any    P = 5.88e-07, c.o.v. 0.07 over 20 runs of 7 levels, 254170 evaluations
}
