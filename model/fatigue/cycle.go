package fatigue

import (
	"fmt"
	"math"
	"strings"
)

// Cycle is one stress cycle on the bolt's tensile stress area As, MPa.
type Cycle struct {
	Amplitude float64 // σa = (σmax − σmin)/2, ≥ 0
	Mean      float64 // σm = (σmax + σmin)/2
}

// MaxMin returns the cycle between the stresses max and min (MPa). A max
// below min gives a negative amplitude, which every curve rejects.
func MaxMin(max, min float64) Cycle { return Cycle{Amplitude: (max - min) / 2, Mean: (max + min) / 2} }

// LoadLine returns the cycle of a preloaded bolt under a repeated external
// load 0 → P: σm = σi + σa (Shigley Eqs. 8-39, 8-41; confirmed), with
// sigmaI the preload stress Fi/At and sigmaA the amplitude C·P/(2·At).
func LoadLine(sigmaI, sigmaA float64) Cycle { return Cycle{Amplitude: sigmaA, Mean: sigmaI + sigmaA} }

// Range returns the stress range Δσ = 2·σa, MPa.
func (c Cycle) Range() float64 { return 2 * c.Amplitude }

// Max returns σmax = σm + σa, MPa.
func (c Cycle) Max() float64 { return c.Mean + c.Amplitude }

// Min returns σmin = σm − σa, MPa.
func (c Cycle) Min() float64 { return c.Mean - c.Amplitude }

// check rejects negative or non-finite amplitudes and non-finite means.
func (c Cycle) check(curve string) error {
	if !(c.Amplitude >= 0) || math.IsInf(c.Amplitude, 1) {
		return &RangeError{Curve: curve, Param: "amplitude", Value: c.Amplitude, Allowed: "a finite σa ≥ 0 MPa (give max ≥ min)"}
	}
	if math.IsNaN(c.Mean) || math.IsInf(c.Mean, 0) {
		return &RangeError{Curve: curve, Param: "mean stress", Value: c.Mean, Allowed: "a finite σm in MPa"}
	}
	return nil
}

// Block is one row of a block spectrum: Count cycles of one Cycle per pass
// of the spectrum.
type Block struct {
	Cycle
	Count float64 // n_i, cycles of this row per pass (> 0)
}

// Rule names the part of a curve that gave a life. Results of a spectrum
// combine the rules of their rows with |.
type Rule uint16

const (
	// FiniteLife: on the curve's finite-life line (Shigley Sf = a·N^b; VDI
	// slope 3 or 6; EN 1993-1-9 slope m = 3).
	FiniteLife Rule = 1 << iota
	// SecondSlope: EN 1993-1-9 spectrum branch m = 5 between 5·10⁶ and 10⁸
	// cycles (ΔσL ≤ Δσ < ΔσD).
	SecondSlope
	// Endurance: at or below the curve's endurance (constant-amplitude
	// fatigue) limit: no damage, infinite life.
	Endurance
	// CutOff: an EN 1993-1-9 spectrum range below the cut-off limit ΔσL:
	// no damage.
	CutOff
	// LowCycleClamp: Shigley only: σrev ≥ Sf(10³) = f·Sut (or σm ≥ Sut),
	// the cycle lies in the low-cycle region the S–N line does not cover;
	// the life is reported as 10³ cycles (an upper bound on the true life).
	LowCycleClamp
	// Extrapolated: returned only together with a *RangeError: the life is
	// the finite-life line extended beyond its validity range.
	Extrapolated
)

var ruleNames = [...]string{"finite-life", "second-slope", "endurance", "cut-off", "low-cycle-clamp", "extrapolated"}

// String lists the rules joined by "+", e.g. "finite-life+second-slope".
func (r Rule) String() string {
	if r == 0 {
		return "none"
	}
	var parts []string
	for i, n := range ruleNames {
		if r&(1<<i) != 0 {
			parts = append(parts, n)
		}
	}
	return strings.Join(parts, "+")
}

// Life is the result of one cycle on a curve.
type Life struct {
	Cycles float64 // cycles to failure N; +Inf when the cycle does no damage
	Rule   Rule    // which part of the curve gave Cycles
	// Stress is the stress measure the curve compared with its limit:
	// σrev (Shigley), σa (VDI 2230), Δσ (EN 1993-1-9), MPa.
	Stress float64
	// Limit is the no-damage threshold in the same measure: Se, σASV or
	// σASG, ΔσD (constant amplitude) or ΔσL (spectrum), MPa.
	Limit float64
}

// Damaging reports whether the cycle has a finite life.
func (l Life) Damaging() bool { return l.Cycles < math.Inf(1) }

// RangeError reports a parameter or cycle outside a curve's validity range.
type RangeError struct {
	Curve   string  // curve name, e.g. "VDI 2230-1"
	Param   string  // the parameter, e.g. "d" or "amplitude"
	Value   float64 // the rejected value
	Allowed string  // the allowed range, with units
	Row     int     // 1-based spectrum row, 0 outside a spectrum
}

func (e *RangeError) Error() string {
	row := ""
	if e.Row > 0 {
		row = fmt.Sprintf("spectrum row %d: ", e.Row)
	}
	return fmt.Sprintf("fatigue: %s: %s%s = %.6g, allowed %s", e.Curve, row, e.Param, e.Value, e.Allowed)
}

// Curve is what the three S–N curves have in common. The Monte Carlo hot
// loop calls the concrete types' methods, not this interface.
type Curve interface {
	// Life returns the life of a constant-amplitude cycle.
	Life(c Cycle) (Life, error)
	// SpectrumLife returns the life of the cycle as one row of a
	// variable-amplitude spectrum (differs from Life only for EN 1993-1-9).
	SpectrumLife(c Cycle) (Life, error)
	// Damage returns the Palmgren–Miner damage of one pass of a spectrum.
	Damage(blocks []Block, lives []Life) (Damage, error)
	// String names the curve and its parameters.
	String() string
}

var (
	_ Curve = Shigley{}
	_ Curve = VDI2230{}
	_ Curve = EN1993{}
)

func finitePositive(x float64) bool { return x > 0 && x < math.Inf(1) }
