package fatigue

import (
	"fmt"
	"math"
)

const (
	ksi = 6.894757 // MPa per kpsi

	// ShigleyLowCycles and ShigleyHighCycles bound the S–N line
	// Sf = a·N^b (Shigley Eq. 6-13; confirmed).
	ShigleyLowCycles  = 1e3
	ShigleyHighCycles = 1e6
)

const shigleyName = "Shigley"

// Shigley is the finite-life S–N line of Budynas & Nisbett, Shigley's
// Mechanical Engineering Design, 9th ed. (2011), Eqs. 6-13…6-16 (confirmed),
// combined with the modified Goodman line (Eq. 6-46, confirmed) through the
// equivalent completely reversed stress
//
//	σrev = σa/(1 − σm/Sut)   (Goodman line solved at σm = 0; from memory)
//	N    = (σrev/a)^(1/b)    (Eq. 6-16)
//	a    = (f·Sut)²/Se,  b = −log10(f·Sut/Se)/3   (Eqs. 6-14, 6-15)
//
// The line runs from Sf(10³) = f·Sut to Sf(10⁶) = Se. Use NewShigley.
type Shigley struct {
	sut, se, f float64
	a, b, invB float64
}

// FatigueFraction returns the fatigue strength fraction f of Shigley
// Fig. 6-18 for a tensile strength sut in MPa: 0.9 below 70 kpsi (confirmed,
// Shigley 9th ed. p. 285), otherwise the fit
//
//	f = 1.06 − 2.8·10⁻³·Sut + 6.9·10⁻⁶·Sut²   (Sut in kpsi, 70…200 kpsi)
//
// (secondary source: quoted with Eqs. 6-14/6-15; the edition printing it
// (10th or later) and its range are from memory). Above 200 kpsi
// (1379 MPa) it returns an error: give f.
func FatigueFraction(sut float64) (float64, error) {
	if !finitePositive(sut) {
		return 0, &RangeError{Curve: shigleyName, Param: "Sut", Value: sut, Allowed: "a finite Sut > 0 MPa"}
	}
	s := sut / ksi
	switch {
	case s < 70:
		return 0.9, nil
	case s <= 200:
		return 1.06 - 2.8e-3*s + 6.9e-6*s*s, nil
	}
	return 0, &RangeError{Curve: shigleyName, Param: "Sut", Value: sut,
		Allowed: "Sut ≤ 1379 MPa (200 kpsi, the range of the Fig. 6-18 fit); above it give f"}
}

// NewShigley returns the S–N line for tensile strength sut and fully
// corrected endurance limit se (MPa). f is the fatigue strength fraction at
// 10³ cycles; f = 0 takes it from FatigueFraction. It needs
// 0 < Se < f·Sut and 0 < f ≤ 1. It does not allocate unless it fails, so
// a Monte Carlo driver may build one per sample (e.g. with a sampled Se).
//
// Modelling note: for bolts Se is usually the fully corrected value of
// rolled threads (Shigley Table 8-17, notch included) while f·Sut is an
// unnotched strength at 10³ cycles. Mixing the two is the usual textbook
// simplification, not a property of bolts.
func NewShigley(sut, se, f float64) (Shigley, error) {
	if !finitePositive(sut) {
		return Shigley{}, &RangeError{Curve: shigleyName, Param: "Sut", Value: sut, Allowed: "a finite Sut > 0 MPa"}
	}
	if f == 0 {
		var err error
		if f, err = FatigueFraction(sut); err != nil {
			return Shigley{}, err
		}
	}
	if !(f > 0 && f <= 1) {
		return Shigley{}, &RangeError{Curve: shigleyName, Param: "f", Value: f, Allowed: "0 < f ≤ 1 (0 selects Fig. 6-18)"}
	}
	if !(se > 0 && se < f*sut) {
		return Shigley{}, &RangeError{Curve: shigleyName, Param: "Se", Value: se,
			Allowed: fmt.Sprintf("0 < Se < f·Sut = %.6g MPa", f*sut)}
	}
	fs := f * sut
	b := -math.Log10(fs/se) / 3
	return Shigley{sut: sut, se: se, f: f, a: fs * fs / se, b: b, invB: 1 / b}, nil
}

// Tensile returns Sut, MPa.
func (s Shigley) Tensile() float64 { return s.sut }

// Endurance returns Se, MPa.
func (s Shigley) Endurance() float64 { return s.se }

// Fraction returns f.
func (s Shigley) Fraction() float64 { return s.f }

// Coefficient returns a = (f·Sut)²/Se, MPa (Eq. 6-14).
func (s Shigley) Coefficient() float64 { return s.a }

// Exponent returns b = −log10(f·Sut/Se)/3 (Eq. 6-15).
func (s Shigley) Exponent() float64 { return s.b }

func (s Shigley) String() string {
	return fmt.Sprintf("Shigley S–N line (Sut %.4g MPa, Se %.4g MPa, f %.4g) with Goodman", s.sut, s.se, s.f)
}

// Life returns the life of a constant-amplitude cycle:
//   - σrev ≤ Se: infinite life (Endurance);
//   - Se < σrev < f·Sut: N = (σrev/a)^(1/b), between 10³ and 10⁶ (FiniteLife);
//   - σrev ≥ f·Sut, or σm ≥ Sut (no Goodman strength left): the cycle is in
//     the low-cycle region below 10³ cycles, which the line does not cover;
//     Cycles = 10³ with LowCycleClamp set. 10³ overstates such a life, so
//     R(N) below 10³ cycles is not estimated by this curve.
//
// A compressive mean (σm < 0) gets no Goodman benefit: σrev = σa (the
// usual horizontal limit on the compressive side; from memory).
func (s Shigley) Life(c Cycle) (Life, error) {
	if err := c.check(shigleyName); err != nil {
		return Life{}, err
	}
	var srev float64
	switch {
	case c.Amplitude == 0: // no cycle, no fatigue damage
	case c.Mean <= 0:
		srev = c.Amplitude
	case c.Mean >= s.sut:
		srev = math.Inf(1)
	default:
		srev = c.Amplitude / (1 - c.Mean/s.sut)
	}
	switch {
	case srev <= s.se:
		return Life{Cycles: math.Inf(1), Rule: Endurance, Stress: srev, Limit: s.se}, nil
	case srev >= s.f*s.sut:
		return Life{Cycles: ShigleyLowCycles, Rule: LowCycleClamp, Stress: srev, Limit: s.se}, nil
	}
	return Life{Cycles: math.Pow(srev/s.a, s.invB), Rule: FiniteLife, Stress: srev, Limit: s.se}, nil
}

// SpectrumLife is Life: in a spectrum, cycles with σrev ≤ Se do no damage
// (the original Palmgren–Miner rule; Haibach's modified rule is not applied).
func (s Shigley) SpectrumLife(c Cycle) (Life, error) { return s.Life(c) }

// Damage returns the Palmgren–Miner damage of one pass of blocks; see
// [Damage]. lives, if not nil, receives each row's life (len ≥ len(blocks)).
// A row flagged LowCycleClamp counts with N = 10³, which understates its
// damage: check Damage.Rules.
func (s Shigley) Damage(blocks []Block, lives []Life) (Damage, error) {
	var d Damage
	for i := range blocks {
		l, err := s.Life(blocks[i].Cycle)
		if err = d.add(i, &blocks[i], l, err, lives, shigleyName); err != nil {
			return Damage{}, err
		}
	}
	return d, nil
}

// StrengthAt returns the fully reversed fatigue strength Sf(N) = a·N^b
// (Eq. 6-13) for 10³ ≤ N ≤ 10⁶, and Se for N > 10⁶ (also N = +Inf).
func (s Shigley) StrengthAt(n float64) (float64, error) {
	if !(n >= ShigleyLowCycles) {
		return 0, &RangeError{Curve: shigleyName, Param: "cycles", Value: n,
			Allowed: "N ≥ 10³ (the S–N line of Eq. 6-13 starts at 10³ cycles)"}
	}
	if n >= ShigleyHighCycles {
		return s.se, nil
	}
	return s.a * math.Pow(n, s.b), nil
}

// LoadLineAmplitude returns the strength amplitude at life N on the load
// line of a preloaded bolt with preload stress sigmaI = Fi/At (MPa):
//
//	Sa(N) = Sf(N)·(Sut − σi)/(Sut + Sf(N))
//
// Shigley Eq. 8-45 with Se replaced by Sf(N) (derived; computed). It needs
// 0 ≤ σi < Sut and N ≥ 10³.
func (s Shigley) LoadLineAmplitude(n, sigmaI float64) (float64, error) {
	if !(sigmaI >= 0 && sigmaI < s.sut) {
		return 0, &RangeError{Curve: shigleyName, Param: "preload stress σi", Value: sigmaI,
			Allowed: fmt.Sprintf("0 ≤ σi < Sut = %.6g MPa", s.sut)}
	}
	sf, err := s.StrengthAt(n)
	if err != nil {
		return 0, err
	}
	return sf * (s.sut - sigmaI) / (s.sut + sf), nil
}

// LoadLineFactor returns the fatigue factor of safety nf(N) = Sa(N)/σa on
// the load line (+Inf for σa = 0). nf(N) = 1 exactly where Life of
// LoadLine(σi, σa) gives N.
func (s Shigley) LoadLineFactor(n, sigmaI, sigmaA float64) (float64, error) {
	if !(sigmaA >= 0) || math.IsInf(sigmaA, 1) {
		return 0, &RangeError{Curve: shigleyName, Param: "amplitude", Value: sigmaA, Allowed: "a finite σa ≥ 0 MPa"}
	}
	sa, err := s.LoadLineAmplitude(n, sigmaI)
	if err != nil {
		return 0, err
	}
	if sigmaA == 0 {
		return math.Inf(1), nil
	}
	return sa / sigmaA, nil
}
