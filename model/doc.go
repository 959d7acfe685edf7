// Package model holds the deterministic mechanics of one preloaded bolted
// joint: thread and material catalogues, bolt and member stiffness, the
// torque–preload relation, and the margin and safety factor of every failure
// mode. It has no randomness and does no I/O.
//
// # Units
//
// Every quantity inside the package is in one consistent system: force in N,
// length in mm, stress and modulus in MPa (N/mm²), torque in N·mm. Conversion
// happens at the edges (scenario loading and report writing).
//
// # Evaluation
//
// [Evaluate] takes an [Inputs] value and fills an [Outcome]. It is pure and
// allocation-free so that the Monte Carlo driver can call it once per sample.
// For joints whose bolts each draw their own assembly scatter, the driver calls
// [EvaluateBolt] once per bolt and [EvaluateJoint] once per sample.
//
// # Sources
//
// Formulas and table values carry their source beside them. "Shigley" means
// Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed.
// (McGraw-Hill, 2011). "VDI 2230" means VDI 2230 Part 1. Where a value is a
// rule of thumb it is marked "common practice"; where it was recalled but not
// confirmed it is marked "from memory".
package model
