package study

import "boltrisk/montecarlo"

// Assemble builds the sweep of v from the results of its steps (in step
// order) run elsewhere, for example merged from the parts of a job array:
// s are the settings of the steps (crude, probabilities only), note auto's
// choice. It is the sweep Run would return without a target.
func Assemble(v Vary, s montecarlo.Settings, results []*montecarlo.Result, note string) *Sweep {
	sw := &Sweep{Vary: v, Settings: s, MethodNote: note}
	xs := v.Values()
	for i, r := range results {
		sw.Steps = append(sw.Steps, newStep(xs[i], r))
		sw.Partial = sw.Partial || r.Partial
	}
	return sw
}
