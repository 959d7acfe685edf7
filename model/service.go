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
