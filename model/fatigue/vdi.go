package fatigue

import (
	"fmt"
	"math"
)

// Rolling selects the VDI 2230-1 thread fatigue strength of a bolt.
type Rolling uint8

const (
	// RolledBeforeHeatTreatment (SV, "schlussvergütet"): standard
	// production; σASV = 0.85·(150/d + 45), finite-life slope 3.
	RolledBeforeHeatTreatment Rolling = iota
	// RolledAfterHeatTreatment (SG, "schlussgewalzt"):
	// σASG = (2 − FSm/F0.2min)·σASV, finite-life slope 6.
	RolledAfterHeatTreatment
)

// String names the rolling as in VDI 2230-1 ("SV" or "SG").
func (r Rolling) String() string { return [...]string{"SV", "SG"}[r] }

const (
	// VDIKneeCycles is ND, the cycle number of the endurance limit.
	VDIKneeCycles = 2e6
	// VDIMinCycles is the lower end of the finite-life line (about 10⁴,
	// low confidence; not confirmed against the published text).
	VDIMinCycles = 1e4
	// VDIMaxDiameter: VDI 2230 is recommended for d < 40 mm (confirmed:
	// Schaumann & Marten, Leibniz Univ. Hannover, §1.1).
	VDIMaxDiameter = 40.0
)

const vdiName = "VDI 2230-1"

// VDI2230 is the thread fatigue strength of VDI 2230 Part 1 (2015), as an
// amplitude σa on As without mean-stress correction (formulas not confirmed
// against the published text):
//
//	σASV  = 0.85·(150/d + 45)                     (SV, d in mm, MPa)
//	σASG  = (2 − FSm/F0.2min)·σASV, 0.3 ≤ FSm/F0.2min < 1   (SG)
//	σAZSV = σASV·(ND/N)^(1/3),  σAZSG = σASG·(ND/N)^(1/6),  ND = 2·10⁶
//
// Valid for d < 40 mm (confirmed) and, for the finite-life line,
// 10⁴ ≤ N < ND (not confirmed). The values are read here as given; whether
// VDI means them as medians or lower fractiles is not confirmed: see
// [MedianFactor] and [VDI2230.Scaled]. Use NewVDI2230.
type VDI2230 struct {
	d, rp02 float64
	rolling Rolling
	sASV    float64 // endurance σASV after Scaled
	scale   float64
}

// NewVDI2230 returns the curve of a bolt of nominal diameter d (mm),
// 0 < d < 40. rp02min (minimum 0.2 % proof stress Rp0.2min, MPa) is needed
// for SG bolts only: with F0.2min = As·Rp0.2min and FSm = σm·As the SG ratio
// FSm/F0.2min is σm/Rp0.2min, so the cycle's mean stress must be on As.
func NewVDI2230(d float64, rolling Rolling, rp02min float64) (VDI2230, error) {
	if !(d > 0 && d < VDIMaxDiameter) {
		return VDI2230{}, &RangeError{Curve: vdiName, Param: "d", Value: d,
			Allowed: "0 < d < 40 mm (VDI 2230 is recommended for d < 40 mm)"}
	}
	if rolling > RolledAfterHeatTreatment {
		return VDI2230{}, &RangeError{Curve: vdiName, Param: "rolling", Value: float64(rolling), Allowed: "SV (0) or SG (1)"}
	}
	if rolling == RolledAfterHeatTreatment && !finitePositive(rp02min) {
		return VDI2230{}, &RangeError{Curve: vdiName, Param: "Rp0.2min", Value: rp02min, Allowed: "a finite Rp0.2min > 0 MPa for SG bolts"}
	}
	return VDI2230{d: d, rp02: rp02min, rolling: rolling, sASV: 0.85 * (150/d + 45), scale: 1}, nil
}

// Scaled returns the curve with its strength multiplied by x > 0 (the knee
// stays at ND): for a sampled strength factor, or to turn a characteristic
// value into a median (see MedianFactor). Allocation-free unless it fails.
func (v VDI2230) Scaled(x float64) (VDI2230, error) {
	if !finitePositive(x) {
		return VDI2230{}, &RangeError{Curve: vdiName, Param: "strength factor", Value: x, Allowed: "a finite factor > 0"}
	}
	v.sASV *= x
	v.scale *= x
	return v, nil
}

// Diameter returns d, mm.
func (v VDI2230) Diameter() float64 { return v.d }

// Rolling returns SV or SG.
func (v VDI2230) Rolling() Rolling { return v.rolling }

// EnduranceSV returns σASV (times any Scaled factor), MPa.
func (v VDI2230) EnduranceSV() float64 { return v.sASV }

func (v VDI2230) String() string {
	s := fmt.Sprintf("VDI 2230-1 thread fatigue strength, %s, d %.4g mm", v.rolling, v.d)
	if v.scale != 1 {
		s += fmt.Sprintf(", strength ×%.4g", v.scale)
	}
	return s
}

// Endurance returns the endurance limit σASV, or for SG bolts
// σASG = (2 − σm/Rp0.2min)·σASV at mean stress σm on As (MPa).
func (v VDI2230) Endurance(mean float64) (float64, error) {
	if v.rolling == RolledBeforeHeatTreatment {
		return v.sASV, nil
	}
	r := mean / v.rp02
	if !(r >= 0.3 && r < 1) {
		return 0, &RangeError{Curve: vdiName, Param: "FSm/F0.2min", Value: r,
			Allowed: "0.3 ≤ FSm/F0.2min < 1 for SG bolts (σm/Rp0.2min; not confirmed against the published text)"}
	}
	return (2 - r) * v.sASV, nil
}

// Life returns the life of a constant-amplitude cycle: σa ≤ σAS gives
// infinite life (Endurance); above it N = ND·(σAS/σa)^k with k = 3 (SV) or
// 6 (SG). The mean stress enters only through the SG ratio. A life below
// 10⁴ cycles returns a *RangeError together with the extrapolated line
// (Rule FiniteLife|Extrapolated), so a Monte Carlo driver may count the
// sample as an early failure.
func (v VDI2230) Life(c Cycle) (Life, error) {
	if err := c.check(vdiName); err != nil {
		return Life{}, err
	}
	lim, err := v.Endurance(c.Mean)
	if err != nil {
		return Life{}, err
	}
	sa := c.Amplitude
	if sa <= lim {
		return Life{Cycles: math.Inf(1), Rule: Endurance, Stress: sa, Limit: lim}, nil
	}
	r := lim / sa
	r3 := r * r * r
	n := VDIKneeCycles * r3
	if v.rolling == RolledAfterHeatTreatment {
		n *= r3
	}
	l := Life{Cycles: n, Rule: FiniteLife, Stress: sa, Limit: lim}
	if n < VDIMinCycles {
		l.Rule |= Extrapolated
		return l, v.belowRange(sa, lim)
	}
	return l, nil
}

// belowRange builds the error for a life below VDIMinCycles (allocates; off
// the hot path).
func (v VDI2230) belowRange(sa, lim float64) error {
	k := 3.0
	if v.rolling == RolledAfterHeatTreatment {
		k = 6
	}
	top := lim * math.Pow(VDIKneeCycles/VDIMinCycles, 1/k)
	return &RangeError{Curve: vdiName, Param: "amplitude", Value: sa,
		Allowed: fmt.Sprintf("σa ≤ σAZ(10⁴) = %.6g MPa (finite-life line from about 10⁴ cycles; not confirmed against the published text)", top)}
}

// SpectrumLife is Life: in a spectrum, cycles with σa ≤ σAS do no damage
// (the original Palmgren–Miner rule; Haibach's modified rule is not applied).
func (v VDI2230) SpectrumLife(c Cycle) (Life, error) { return v.Life(c) }

// StrengthAt returns the finite-life strength σAZ(N) = σAS·(ND/N)^(1/k) for
// 10⁴ ≤ N ≤ ND, and σAS for N > ND (also N = +Inf). mean is σm on As (used
// by SG bolts only).
func (v VDI2230) StrengthAt(n, mean float64) (float64, error) {
	if !(n >= VDIMinCycles) {
		return 0, &RangeError{Curve: vdiName, Param: "cycles", Value: n,
			Allowed: "N ≥ 10⁴ (finite-life line from about 10⁴ cycles; not confirmed against the published text)"}
	}
	lim, err := v.Endurance(mean)
	if err != nil {
		return 0, err
	}
	if n >= VDIKneeCycles {
		return lim, nil
	}
	k := 3.0
	if v.rolling == RolledAfterHeatTreatment {
		k = 6
	}
	return lim * math.Pow(VDIKneeCycles/n, 1/k), nil
}

// Damage returns the Palmgren–Miner damage of one pass of blocks; see
// [Damage]. lives, if not nil, receives each row's life (len ≥ len(blocks)).
func (v VDI2230) Damage(blocks []Block, lives []Life) (Damage, error) {
	var d Damage
	for i := range blocks {
		l, err := v.Life(blocks[i].Cycle)
		if err = d.add(i, &blocks[i], l, err, lives, vdiName); err != nil {
			return Damage{}, err
		}
	}
	return d, nil
}
