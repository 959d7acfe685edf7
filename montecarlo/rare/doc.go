// Package rare holds rare-event estimators in standard-normal space that
// stay right for series systems ("any mode", "any bolt"): design points,
// importance sampling from a defensive mixture at every component's design
// point, and subset simulation.
//
// # Problem
//
// A [Problem] has Dim independent standard-normal coordinates u and
// Components limit states g_c(u); component c fails when g_c(u) ≤ 0. An
// [Event] is a union of components (one failure mode over all bolts, say);
// the union of all components, [AnyEvent], is always estimated too, and
// comes last in every result list. The model is reached only through an
// [Evaluator], which evaluates every component at a block of points; every
// point passed to it is counted and reported. A point outside the model's
// domain carries NaN in every component: it is counted as invalid and never
// as failed. A [Symmetry] declares exchangeable blocks of coordinates (a
// joint of identical bolts).
//
// # Design points (FORM)
//
// [DesignPoints] finds, per component, the point u* of g_c = 0 nearest to
// the origin (Hasofer & Lind 1974, J. Eng. Mech. Div. ASCE 100(EM1):111–121)
// by the improved HL-RF algorithm (Zhang & Der Kiureghian 1995, "An improved
// HL-RF algorithm for structural reliability analysis", from memory): the
// HL-RF direction (Rackwitz & Fiessler 1978)
//
//	d_k = [(∇g·u_k − g(u_k))/‖∇g‖²]·∇g − u_k
//
// with an Armijo step on the merit function m(u) = ½‖u‖² + c·|g(u)|,
// c = 2·max(‖u_k‖/‖∇g‖, ½‖u_k + d_k‖²/|g(u_k)|), sufficient-decrease constant
// 0.1, halving the step. The gradient is by forward (or central)
// differences over the component's Support only. Converged when
// |g(u)| ≤ GTol·|g(0)| (1e-4) and ‖u − (α·u)α‖ ≤ UTol (1e-3). It reports
// β = α·u*, u*, α = −∇g/‖∇g‖ (α_i > 0: load-like coordinate, raising u_i
// lowers the margin; α_i < 0: resistance-like; α_i² are the importance
// factors), iterations, evaluations, and a message when it did not converge
// (then no FORM value is given). A component whose median point fails
// (g(0) ≤ 0) is not rare and gets β ≤ 0. Φ(−β) is reported as FORM: an
// approximation, never an estimate. Under a Symmetry only the components of
// block 0 and the shared ones are searched; the others get the design
// point with the blocks swapped, at no evaluation.
//
// # Importance sampling
//
// [Importance] samples the defensive mixture (Hesterberg 1995, Technometrics
// 37(2):185–194; Owen & Zhou 2000, JASA 95(449):135–143, both from memory)
//
//	h(u) = α0·φ(u) + (1 − α0)·Σ_k c_k·N(u; u*_k, I + (s² − 1)·α_k α_kᵀ)
//
// with one normal component per converged design point (Au, Papadimitriou &
// Beck 1999, several design points), and weights every sample by φ(u)/h(u)
// with the full mixture density (the balance heuristic, Veach & Guibas
// 1995), so the estimate
//
//	P̂ = (1/N)·Σ_i 1_F(u_i)·φ(u_i)/h(u_i),  Var P̂ ≈ (Σ(w·1_F)² − N·P̂²)/(N(N − 1))
//
// is unbiased for every event and for "any", all from the same samples.
// Defaults and why:
//   - α0 = 0.1: the weights are bounded by 1/α0, so the variance is finite
//     whatever the geometry, and a region no design point covers is still
//     reached (slowly); the price is about 13 % more samples on a single
//     linear limit state at β = 5.1 (relative variance per sample 4.66 with
//     α0 = 0.1 against 4.36 with 0.05, s = 0.75; computed by quadrature of
//     ∫φ²/h along α);
//   - s = 0.75 along α (identity across): narrower than the unit normal
//     along the design direction, where the optimal density is concentrated
//     (relative variance per sample at β = 5.1: 6.52 for s = 1, 5.03 for
//     s = 0.8, 4.66 for s = 0.75; computed as above), and wider than
//     1/√2, below which ∫φ²/N(μ, Σ) diverges (the second moment is finite
//     only when every eigenvalue of Σ exceeds ½; [MinAxisSD]). Components
//     with β < ½ keep Σ = I;
//   - c_k: the normal part's mass is split equally among the estimated
//     events (each listed event and "any"), and within an event in
//     proportion to Φ(−β_k) of its components. Proportional weights give a
//     union of disjoint regions the same relative variance per sample as a
//     single region; splitting among events keeps a rare listed event from
//     being starved by a frequent one, since sampling stops only when every
//     event meets the precision.
//
// Components without a converged design point get no normal component;
// only the defensive part covers them, and the results say so.
//
// The stage is split for part files on a cluster: a [Proposal] (plain
// data), [Sampler.Chunk] (chunk c of n samples from its own stream →
// [ChunkSums], plain sums), [Merge] (chunk order) and [Finish] (→
// [Estimate]). A sample's draws (one uniform picking the mixture component,
// then Dim standard normals) come from the chunk's stream whatever the
// proposal's parameters, so nearby proposals, or one proposal over a sweep
// of problems, share their random numbers.
//
// Stopping ([Sample]): at a sample cap, or when every event with a failed
// sample, and "any", has c.o.v. ≤ Precision (default 5 %) and
// non-degenerate weights (Kish ESS ≥ 30 and no weight above a tenth of the
// estimate), checked after rounds of chunks fixed by the seed (4 chunks,
// then max(1, chunks so far/16)). Per event it reports the Kish effective
// sample size (Σw)²/Σw², the largest weight's share, and the
// failure-conditional mean E[U | F] = Σw·u/Σw over the failed samples with
// its delta-method standard error.
//
// # Subset simulation
//
// [Subset] needs no design point (Au & Beck 2001, Prob. Eng. Mech.
// 16(4):263–277): on the event's limit state min_{c ∈ event} g_c, level 0 is
// plain Monte Carlo with N samples; each next threshold b_j is the
// P0-quantile of the current margins (midway between the P0·N-th and the
// next value), the samples below it seed P0·N Markov chains that fill the
// next level; at the last level the failed share is counted:
//
//	P̂ = Π_j p_j · N_F/N,  p_j ≈ P0.
//
// The chains move by preconditioned Crank–Nicolson steps
// v = ρ·u + √(1 − ρ²)·ξ, which keep φ invariant (a candidate is accepted when
// its margin is below the threshold), with √(1 − ρ²) = min(1, λ) adapted
// after every tenth of the chains towards an acceptance rate of 0.44 by the
// rule of Papaioannou, Betz, Zwirglmaier & Straub (2015, Prob. Eng. Mech.
// 41:89–103). Defaults: P0 = 0.1, N = 2000, R = 20 independent runs.
//
// The c.o.v. is the spread of the R runs (each from its own streams), not
// the single-run formula δ² = Σ_j (1 + γ_j)(1 − p_j)/(p_j N): that formula
// (reported per run as FormulaCOV) neglects the correlation between levels
// and under-reports the spread of repeated runs (measured, 100 × 20 runs:
// by 1.05–1.8× on the linear and polynomial reference cases, 2.4–5.3× on
// lognormal R − S margins; bench/README.md: 1.2–2× for a general-purpose
// library). The estimate is
// the mean of the runs; its c.o.v. the larger of s/(P̄√R) and the lognormal
// fit √((exp(s_ln²) − 1)/R) of the runs' logarithms, as the runs' estimates
// are right-skewed. R = 20: the c.o.v. figure then has a relative
// standard error of about 1/√(2·19) ≈ 16 % for near-normal runs, and the
// interval uses Student's t with 19 degrees of freedom; N = 2000 keeps the
// O(1/N) bias of subset simulation to about 1–4 % at 1e-7 (7 % at N = 1000,
// measured on RP107). Parallel work stays inside a level: chains run in
// groups, each group its own stream; independent runs run side by side.
//
// # Intervals
//
// Both methods give a lognormal interval at the estimate,
// P̂·exp(∓q·√ln(1 + COV²)), q the normal (importance sampling) or Student-t
// (subset simulation, R − 1 degrees of freedom) quantile: positive, and
// wider above than below, like the sampling distributions of these
// estimators. With no failed sample importance sampling gives the one-sided
// bound (1/α0)·(1 − (1 − conf)^(1/N)), valid because every weight is at most
// 1/α0.
//
// # Reproducibility
//
// Every draw comes from a stream named by the unit of work (chunk; run,
// level and chain group), never by the worker; floating sums are kept per
// chunk and added in chunk order. The same seed gives the same bits for any
// number of workers, and importance sampling's memory does not grow with
// the number of samples.
package rare
