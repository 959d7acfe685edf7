package model

// Nominal is the deterministic check of a joint at its nominal inputs: its
// state and every mode, and the preload window.
type Nominal struct {
	Outcome Outcome
	Window  Window
}

// EvaluateNominal evaluates a joint at its nominal inputs.
func EvaluateNominal(in *Inputs) Nominal {
	var n Nominal
	Evaluate(in, &n.Outcome)
	n.Window = PreloadWindow(in)
	return n
}
