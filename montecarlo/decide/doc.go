// Package decide turns estimates into the decisions a user makes: the
// torque (or preload) and tolerance to print on a drawing (Spec), what
// drives each mode's risk (Drivers), and each variant at its own callout
// (Retune). It builds on the studies (montecarlo/study: sweeps with
// common random numbers, windows with bisected edges) and the rare-event
// estimators; it knows nothing of the file format.
package decide
