// Package fatigue holds finite-life S–N curves of bolts in tension and the
// Palmgren–Miner damage of block spectra; it is deterministic, has no
// randomness and does no I/O.
//
// # Curves
//
// Each curve is a plain value built by a validating constructor; its Life
// method takes one [Cycle] (amplitude and mean on the tensile stress area
// As, MPa) and returns a [Life] (cycles to failure, +Inf for no damage, and
// the [Rule] that gave it). Constructors and Life do not allocate unless
// they return an error, so a Monte Carlo driver can call them once per
// sample.
//
//   - [Shigley]: Budynas & Nisbett, Shigley's Mechanical Engineering Design,
//     9th ed. (2011). Sf = a·N^b, a = (f·Sut)²/Se, b = −log10(f·Sut/Se)/3,
//     N = (σrev/a)^(1/b) (Eqs. 6-13…6-16; confirmed), between 10³ and 10⁶
//     cycles. f from Fig. 6-18: 0.9 below 70 kpsi (confirmed), the fit
//     f = 1.06 − 2.8·10⁻³·Sut + 6.9·10⁻⁶·Sut² for 70–200 kpsi (secondary
//     source), or given. Mean stress by Goodman (Eq. 6-46; confirmed):
//     σrev = σa/(1 − σm/Sut) (from memory). σrev ≤ Se: infinite life;
//     σrev ≥ f·Sut: below 10³ cycles, clamped to 10³ and flagged
//     [LowCycleClamp]. On the preload load line the strength amplitude at
//     life N is Sa(N) = Sf(N)·(Sut − σi)/(Sut + Sf(N)) (Eq. 8-45 with Se →
//     Sf(N); derived), and nf(N) = Sa(N)/σa equals 1 exactly at the life.
//   - [VDI2230]: VDI 2230 Part 1 (2015) thread fatigue strength, amplitude
//     only: σASV = 0.85·(150/d + 45) (rolled before heat treatment, SV),
//     σASG = (2 − FSm/F0.2min)·σASV (rolled after, SG, 0.3 ≤ FSm/F0.2min < 1),
//     σAZ = σAS·(ND/N)^(1/k), ND = 2·10⁶, k = 3 (SV) or 6 (SG). Not confirmed
//     against the published text, except the diameter limit d < 40 mm
//     (confirmed: Schaumann & Marten). The finite-life line is enforced from
//     10⁴ cycles (not confirmed, low confidence).
//   - [EN1993]: EN 1993-1-9:2005 Table 8.1 detail 14, bolts in tension,
//     category ΔσC = 50 MPa on Δσ = 2σa, size factor ks = (30/d)^0.25 for
//     d > 30 mm; m = 3 to ΔσD = 0.737·ΔσC at 5·10⁶, m = 5 to
//     ΔσL = 0.549·ΔσD at 10⁸ for spectra (secondary source). Constant
//     amplitude below ΔσD and spectrum ranges below ΔσL do no damage. The
//     category is characteristic (≈ mean − 2 sd of log10 N; from memory),
//     not a median: [EN1993.ToMedian] converts it for a stated scatter.
//
// # Damage
//
// [Damage] holds D = Σ n_i/N_i of one pass of a spectrum of [Block] rows,
// computed by each curve's Damage method with that curve's rule for cycles
// below its limits (original Miner rule; Haibach's modified rule is not
// applied). [Damage.Life] gives the life under the repeated spectrum,
// (Σ n_i)/D·D_crit; [CriticalDamage] holds D_crit, 1 by default or
// log-normal (Wirsching 1984: median 1, c.o.v. 0.3; from memory).
//
// # Errors
//
// Bad input returns a *[RangeError] naming the curve, the parameter, the
// value and the allowed range: negative amplitudes, cycles ≤ 0, spectrum
// rows without cycles, diameters, SG ratios and lives outside a curve's
// validity range.
//
// # Tags
//
// Every value carries the tag of the reference notes: (confirmed) seen in
// the published text, (secondary source) seen where another document
// quotes it, (from memory) not confirmed, (computed) derived here. Units
// are N, mm, MPa and cycles.
package fatigue
