// Package fit fits distribution families to measured data — torque–tension
// tests (ISO 16047), ultrasonic preload audits, fatigue lives — tests the
// fits, carries the uncertainty of a small series into intervals and a
// posterior predictive, and writes the result as a scenario input.
//
// # Reading data
//
// [ReadColumn] reads one column of a CSV file (header row; comma, semicolon
// or tab, sniffed; decimal commas with a semicolon or tab separator). A
// bare number takes [Spec].Unit; a cell may carry its own unit ("31.2 kN"),
// parsed by model/units for the column's dimension. Blank cells are skipped
// and listed; every other problem is a [*DataError] naming file, row and
// column. Values come back in internal units (N, mm, MPa, N·mm). Empty lines
// are skipped by the CSV rules and do not count as blank cells.
//
// # Estimates
//
// [Estimate] fits one family: normal, lognormal, two-parameter Weibull and
// truncated normal (known bounds) by maximum likelihood — the Weibull shape
// from its profile equation by Newton steps inside a bracket, the truncated
// normal by a Nelder–Mead simplex polished by Newton steps on the analytic
// gradient; uniform by the minimum-variance unbiased ends (Johnson, Kotz &
// Balakrishnan 1995, ch. 26); triangular by maximum likelihood with the
// mode at an order statistic (van Dorp & Kotz 2002). The normal and
// lognormal estimates are those of gonum's distuv.Normal.Fit.
//
// # Ranking and goodness of fit
//
// [Analyze] fits several families, ranks them by AIC = 2k − 2ℓ (BIC =
// k·ln n − 2ℓ and Akaike weights beside), and tests each by the
// Anderson–Darling A² and Kolmogorov–Smirnov D (Stephens, JASA 69, 1974).
// P-values come from a parametric bootstrap: each replicate is drawn from
// the fitted distribution and refitted, so the p-values allow for the
// estimated parameters; p = (1 + #{T* ≥ T})/(B + 1) (Davison & Hinkley,
// Bootstrap Methods and their Application, 1997, §4.2). Replicate i of a
// family draws from its own PCG stream derived from (seed, family, i) by
// montecarlo/rng: the same seed gives the same bits for any worker count.
// Default B = 999; none above 10 000 values (see [LargeN]).
//
// # Intervals
//
// The same replicates give intervals (default 90 % two-sided) of the
// parameters, the mean and the c.o.v. by bootstrap pivots: studentized
// (q* − q̂)/s* for locations, (ln q* − ln q̂)/s* for positive locations
// (Weibull scale, lognormal and Weibull means), ln(q*/q̂) for scales and
// shapes, and for lognormal and Weibull the c.o.v. mapped from the interval
// of the shape it depends on. For location–scale families (normal;
// lognormal and Weibull on the log scale) the parameter pivots are exact,
// so those intervals are exact up to Monte Carlo error (Lawless,
// Statistical Models and Methods for Lifetime Data, 2nd ed., 2003; from
// memory). The triangular intervals are rough (see its notes). Below
// [SmallN] = 10 values a warning is given (common practice).
//
// # Posterior predictive
//
// [NewPredictive] gives, for normal data under the non-informative prior
// p(μ, σ²) ∝ 1/σ², the Student t with n − 1 degrees of freedom, location x̄
// and scale s·√(1 + 1/n) (Gelman et al., Bayesian Data Analysis, 3rd ed.,
// 2013, §3.2), and the same on ln X for lognormal data.
//
// # Output
//
// [Snippet] writes a fit as a scenario input ({dist: lognormal, mean:
// 31.2 kN, cov: 11.4%}); [Probability] gives the data of a probability plot
// (Blom positions on normal and lognormal paper, median ranks on Weibull
// paper, the fitted line, the pointwise band of the order statistics),
// drawn by plots.ProbabilityPlot.
package fit
