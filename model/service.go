package model

// BoltForceAt returns the bolt force under an external axial load p per
// bolt (N) for a residual preload fi and load factor phi: Fi + Φ·P while the
// joint is closed (Shigley Eq. 8-24), P once the members have separated
// (P ≥ Fi/(1 − Φ), Shigley §8-7) — the same rule as EvaluateBolt, for the
// rows of a load spectrum. It does not allocate.
func BoltForceAt(fi, phi, p float64) float64 {
	if fb := fi + phi*p; fb >= p {
		return fb
	}
	return p
}

// SetFatigueLife records the fatigue_life mode of a bolt: demand the design
// life, capacity the bolt's life in cycles (+Inf: no damage), both in
// cycles; the mode fails when the life does not exceed the design life
// ([Failed]). The life itself comes from the S–N curves of model/fatigue
// under the scenario's spectrum (computed by the caller). Lives above
// 10³⁰ cycles are held at 10³⁰ so that capacity/demand stays finite.
func SetFatigueLife(b *BoltResult, designLife, life float64) {
	b.Active[FatigueLife] = true
	b.Demand[FatigueLife] = designLife
	b.Capacity[FatigueLife] = min(life, 1e30)
}
