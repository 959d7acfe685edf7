// Package life holds reliability against cycles from simulated lives: an
// exact, mergeable count of lives on a log-cycle grid, the R(N) curve and
// the probability of failure within a design life with exact binomial
// intervals, B_p lives with distribution-free bounds, and closed-form
// log-normal and Weibull helpers for checks.
//
// # Accumulating lives
//
// A Monte Carlo driver computes one life per sample (cycles to failure, +Inf
// when the sample never fails, e.g. below the endurance limit) and calls
// [Accumulator.Add], which does not allocate. Lives are counted in the cells
// of a fixed [Grid] (default 10²…10¹² cycles, 100 points per decade, a
// step of 10^(1/100) = 1.0233); the count of lives ≤ the design life is kept
// exactly. Counts are integers, so accumulators of any split of the samples
// merged in any order ([Accumulator.Merge]) are identical.
//
// # Estimates
//
//   - R(N) = P(life > N) at every grid point ([Accumulator.Reliability])
//     with two-sided Clopper–Pearson intervals (Clopper & Pearson 1934,
//     Biometrika 26:404–413; from memory), computed from gonum's Beta
//     quantiles. Grid points are cell edges, so these counts are exact.
//   - P(life ≤ design life) and P(ever fails) with the same intervals.
//   - B_p lives ([Accumulator.BLife]): the ⌈p·n⌉-th smallest life, and
//     one-sided distribution-free bounds from order statistics: the r-th
//     smallest life, r the largest integer with P(Bin(n, p) ≥ r) ≥ C, is a
//     lower bound at confidence C (reference-data-2 A5; exact for continuous
//     lives; n = 1000, p = 0.1, C = 0.95 gives r = 85, coverage 0.9515). On
//     the grid an order statistic is known to its cell: the bound reported
//     is the cell's conservative end (lower edge for a lower bound, upper
//     edge for an upper bound), at most one grid step from the exact order
//     statistic. A B_p life is "not reached" when fewer than p·n lives fail.
//
// # Closed forms
//
// [Lognormal]: B_p = exp(μ + z_p·σ) (standard). [Weibull]:
// B_p = η·(−ln(1 − p))^(1/β), MTTF = η·Γ(1 + 1/β) (secondary source: Meeker &
// Escobar 1998). [SuccessRun]: n = ln(1 − C)/ln R (from memory; exact
// binomial algebra).
package life
