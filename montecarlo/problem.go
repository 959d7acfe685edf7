package montecarlo

import "boltrisk/model"

// Role says what an uncertain input feeds, so that the runner needs no
// knowledge of the file format: the field registry of the scenario loader
// sets it.
type Role uint8

const (
	PerBolt        Role = 1 << iota // each bolt of the joint draws its own value (assembly scatter)
	FeedsStiffness                  // enters the bolt or member stiffness, which is then recomputed per sample
	Load                            // a service load, scaled by load studies
	ShearSide                       // enters the shear-side (joint-level) modes
)

// Var is one uncertain input: a distribution bound to one float64 field of
// model.Inputs.
type Var struct {
	Name string // dotted scenario path, e.g. "tightening.torque"
	Dist Dist
	Role Role
	// Shared is, for an input each bolt draws, the share of its scatter
	// common to all bolts of the joint (a wrench's bias, a lubricant batch):
	// the correlation between any two bolts' values in the family's
	// standard-normal space, so each bolt keeps its marginal distribution.
	// 0: every bolt draws independently.
	Shared float64
	// Field returns the address of the bound field inside in. The runner calls
	// it once per worker, never per sample.
	Field func(in *model.Inputs) *float64
	// Case (1-based) marks the input as a value of load case Case, slot
	// Slot (see CaseSlot); Field is then unused. 0: an ordinary input.
	Case int
	Slot CaseSlot
	// Aux (1-based) marks a draw of the service life that no model input
	// holds: AuxLifeScatter or AuxCriticalDamage. Field is then unused.
	Aux int
}

// PerBolt reports whether each bolt of the joint draws its own value.
func (v *Var) PerBolt() bool { return v.Role&PerBolt != 0 }

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
	// Cases are the named load cases (none: the single loads of Base).
	Cases []Case
	// Life is the service-life problem (nil: none); with it the mode
	// fatigue_life is evaluated.
	Life *LifeSpec
}

// VarIndex returns the index in Vars of the uncertain input named path.
func (p *Problem) VarIndex(path string) (int, bool) {
	for i := range p.Vars {
		if p.Vars[i].Name == path {
			return i, true
		}
	}
	return -1, false
}
