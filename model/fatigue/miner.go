package fatigue

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
)

const minerName = "Palmgren–Miner"

// Damage is the Palmgren–Miner damage of one pass of a block spectrum:
//
//	D = Σ n_i/N_i
//
// (Palmgren 1924, VDI-Z 68:339–341; Miner 1945, J. Appl. Mech. 12:A159–A164;
// rule confirmed, citations from memory), with each curve's own rule for
// cycles below its limits (those rows add n_i to Cycles and nothing to Sum).
type Damage struct {
	Sum    float64 // D per pass
	Cycles float64 // Σ n_i per pass
	Rules  Rule    // union of the rows' rules
}

// add checks one row and adds it. It tags a curve's *RangeError with the row.
func (d *Damage) add(i int, b *Block, l Life, err error, lives []Life, curve string) error {
	switch {
	case b.Count == 0:
		return &RangeError{Curve: curve, Param: "cycles", Value: b.Count, Allowed: "n > 0 (a spectrum row needs cycles)", Row: i + 1}
	case !finitePositive(b.Count):
		return &RangeError{Curve: curve, Param: "cycles", Value: b.Count, Allowed: "a finite n > 0", Row: i + 1}
	}
	if err != nil {
		if re, ok := err.(*RangeError); ok {
			re.Row = i + 1
		}
		return err
	}
	if lives != nil {
		lives[i] = l
	}
	d.Cycles += b.Count
	d.Rules |= l.Rule
	if l.Damaging() {
		d.Sum += b.Count / l.Cycles
	}
	return nil
}

// Passes returns how many passes of the spectrum reach the critical damage
// sum critical: critical/D, +Inf when D = 0.
func (d Damage) Passes(critical float64) (float64, error) {
	if !finitePositive(critical) {
		return 0, &RangeError{Curve: minerName, Param: "critical damage", Value: critical, Allowed: "a finite D_crit > 0"}
	}
	if d.Sum == 0 {
		return math.Inf(1), nil
	}
	return critical / d.Sum, nil
}

// Life returns the life in cycles under the repeated spectrum:
//
//	N_life = (Σ n_i per pass)/(D per pass)·D_crit
//
// +Inf when the spectrum does no damage.
func (d Damage) Life(critical float64) (float64, error) {
	p, err := d.Passes(critical)
	if err != nil || math.IsInf(p, 1) {
		return p, err
	}
	return d.Cycles * p, nil
}

// CriticalDamage is the damage sum at failure: deterministic (CoV = 0) or
// log-normal with the given median and coefficient of variation.
type CriticalDamage struct {
	Median float64 // median of D_crit (> 0)
	CoV    float64 // c.o.v. of a log-normal D_crit; 0 for a fixed value
}

var (
	// MinerCriticalDamage is Miner's D_crit = 1 (the default).
	MinerCriticalDamage = CriticalDamage{Median: 1}
	// WirschingCriticalDamage is a log-normal D_crit with median 1 and
	// c.o.v. 0.3 (Wirsching 1984, J. Struct. Eng. ASCE 110(10):2340–2356;
	// from memory).
	WirschingCriticalDamage = CriticalDamage{Median: 1, CoV: 0.3}
)

// Validate checks Median > 0 and 0 ≤ CoV ≤ 2.
func (c CriticalDamage) Validate() error {
	if !finitePositive(c.Median) {
		return &RangeError{Curve: minerName, Param: "critical damage median", Value: c.Median, Allowed: "a finite median > 0"}
	}
	if !(c.CoV >= 0 && c.CoV <= 2) {
		return &RangeError{Curve: minerName, Param: "critical damage c.o.v.", Value: c.CoV, Allowed: "0 ≤ c.o.v. ≤ 2"}
	}
	return nil
}

// LogSD returns ζ = sqrt(ln(1 + CoV²)), the standard deviation of ln D_crit.
func (c CriticalDamage) LogSD() float64 { return math.Sqrt(math.Log1p(c.CoV * c.CoV)) }

// FromNormal returns D_crit = Median·exp(ζ·z) for a standard normal z (a
// Monte Carlo draw); the Median for CoV = 0. Call Validate first.
func (c CriticalDamage) FromNormal(z float64) float64 {
	if c.CoV == 0 {
		return c.Median
	}
	return c.Median * math.Exp(c.LogSD()*z)
}

// Quantile returns the p-quantile of D_crit, 0 < p < 1.
func (c CriticalDamage) Quantile(p float64) (float64, error) {
	if err := c.Validate(); err != nil {
		return 0, err
	}
	if !(p > 0 && p < 1) {
		return 0, &RangeError{Curve: minerName, Param: "probability", Value: p, Allowed: "0 < p < 1"}
	}
	return c.FromNormal(mathext.NormalQuantile(p)), nil
}

// MedianFactor returns the factor exp(Φ⁻¹(survival)·ζ) that turns a
// strength read as the survival-probability fractile of a log-normal
// strength with log-sd ζ into the median (computed; e.g. survival 0.99,
// ζ = 0.10 gives 1.2619). Whether σASV or σASG are such fractiles is not
// confirmed: the survival probability is the caller's assumption.
func MedianFactor(survival, logSD float64) (float64, error) {
	if !(survival > 0 && survival < 1) {
		return 0, &RangeError{Curve: "strength scatter", Param: "survival probability", Value: survival, Allowed: "0 < survival < 1"}
	}
	if !(logSD >= 0 && logSD <= 2) {
		return 0, &RangeError{Curve: "strength scatter", Param: "log-sd ζ", Value: logSD, Allowed: "0 ≤ ζ ≤ 2"}
	}
	return math.Exp(mathext.NormalQuantile(survival) * logSD), nil
}

// String describes the critical damage.
func (c CriticalDamage) String() string {
	if c.CoV == 0 {
		return fmt.Sprintf("D_crit = %.4g", c.Median)
	}
	return fmt.Sprintf("D_crit log-normal, median %.4g, c.o.v. %.3g", c.Median, c.CoV)
}
