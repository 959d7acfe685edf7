package rare

// Method names of Result.Method.
const (
	MethodImportance = "importance"
	MethodSubset     = "subset"
)

// Result is the estimate of one event's probability.
type Result struct {
	Event      string
	Components []int
	Method     string // MethodImportance or MethodSubset

	Probability float64
	// COV is the coefficient of variation of Probability (its standard
	// error over its value): from the weights (importance sampling) or from
	// the spread of independent repeated runs (subset simulation).
	COV        float64
	Confidence float64 // two-sided confidence of [Lo, Hi]
	Lo, Hi     float64
	// UpperOnly: no failure was seen; Hi is an upper bound (see
	// Estimate.UpperOnly), Probability and COV are 0.
	UpperOnly bool
	// Interval names how [Lo, Hi] was formed.
	Interval string
	// Evaluations counts every point passed to the evaluator by the run,
	// design-point searches included. Importance sampling estimates every
	// event from the same samples, so its events share one count; subset
	// simulation counts the runs of this event.
	Evaluations int64
	// Partial: the run was cancelled before its stopping rule was met.
	Partial bool

	// Shift is the failure-conditional mean E[U | event] of each coordinate
	// and ShiftSE its standard error.
	Shift, ShiftSE []float64

	// DesignPoints holds the design points of the event's components
	// (importance sampling only).
	DesignPoints []DesignPoint
	// FORMBounds are the first-order uni-modal bounds max_k Φ(−β_k) ≤ P ≤
	// Σ_k Φ(−β_k) (Cornell 1967) over the event's components: approximations,
	// not estimates; zero unless every design point of the event converged.
	FORMBounds [2]float64

	Importance *ImportanceDiagnostics `json:",omitempty"`
	Subset     *SubsetDiagnostics     `json:",omitempty"`
	Warnings   []string               `json:",omitempty"`
}

// ImportanceDiagnostics describes the weights behind an importance-sampling
// result.
type ImportanceDiagnostics struct {
	Samples         int64
	Failed          int64
	Invalid         int64   // samples outside the model's domain (all events share them)
	ESS             float64 // Kish effective sample size of the failed samples
	MaxShare        float64 // largest weight's share of the estimate
	Degenerate      bool    // ESS < 30 or MaxShare > 0.1
	FORMEvaluations int64   // part of Evaluations spent on design points
	Defensive       float64 // α0 of the proposal
	// Uncovered lists the event's components without a design point: only
	// the defensive part of the mixture covers them.
	Uncovered []int `json:",omitempty"`
}

// SubsetDiagnostics describes the runs behind a subset-simulation result.
type SubsetDiagnostics struct {
	LevelSamples int
	P0           float64
	Runs         []SubsetRun
	// SharedWith names the earlier event with the same components whose
	// runs this result reuses ("" if none).
	SharedWith string `json:",omitempty"`
}

// SubsetRun is one independent run of subset simulation.
type SubsetRun struct {
	Probability float64
	Levels      int       // levels including the first (plain Monte Carlo) one
	Thresholds  []float64 // intermediate thresholds b_1 > b_2 > … (the last level uses 0)
	Acceptance  []float64 // mean acceptance rate of the conditional sampling, per level after the first
	Evaluations int64
	Invalid     int64
	// FormulaCOV is the usual single-run c.o.v. estimate √Σ_j (1 + γ_j)(1 − p_j)/(p_j N)
	// (Au & Beck 2001), reported for comparison only: it neglects the
	// correlation between levels and falls below the spread of repeated runs.
	FormulaCOV float64
	Message    string `json:",omitempty"`
}
