package montecarlo

import "boltrisk/model"

// Var is one uncertain input: a distribution bound to one float64 field of
// model.Inputs.
type Var struct {
	Name    string // dotted scenario path, e.g. "tightening.torque"
	Dist    Dist
	PerBolt bool // each bolt of the joint draws its own value
	// Field returns the address of the bound field inside in. The runner calls
	// it once per worker, never per sample.
	Field func(in *model.Inputs) *float64
}

// Correlation is a rank-free Gaussian-copula correlation between two inputs,
// given by their indices in Problem.Vars.
type Correlation struct {
	I, J int
	Rho  float64
}

// Problem is a joint with uncertain inputs.
type Problem struct {
	Base model.Inputs // nominal values of every input
	Vars []Var
	Corr []Correlation
}
