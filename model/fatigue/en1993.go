package fatigue

import (
	"fmt"
	"math"
)

const (
	// BoltCategory is the detail category ΔσC of EN 1993-1-9:2005
	// Table 8.1 detail 14, bolts and rods with rolled or cut threads in
	// tension, MPa at 2·10⁶ cycles (secondary source).
	BoltCategory = 50.0
	// ENReferenceCycles, ENKneeCycles, ENCutOffCycles: 2·10⁶ (ΔσC),
	// 5·10⁶ (ΔσD), 10⁸ (ΔσL) of EN 1993-1-9 Fig. 7.1 (secondary source).
	ENReferenceCycles = 2e6
	ENKneeCycles      = 5e6
	ENCutOffCycles    = 1e8
	// CharacteristicSDs is the number of standard deviations of log10 N
	// between the mean and the characteristic curve (from memory; the
	// usual reading of "mean minus two standard deviations").
	CharacteristicSDs = 2.0
)

const enName = "EN 1993-1-9"

// EN1993 is the direct-stress S–N curve of EN 1993-1-9:2005 for bolts in
// tension (detail category 50; secondary source), on the nominal stress
// range Δσ = 2·σa on As:
//
//	ΔσR³·NR = ΔσC³·2·10⁶               NR ≤ 5·10⁶ (m = 3)
//	ΔσD = (2/5)^(1/3)·ΔσC = 0.737·ΔσC   constant-amplitude fatigue limit
//	ΔσR⁵·NR = ΔσD⁵·5·10⁶               5·10⁶ < NR ≤ 10⁸ (m = 5, spectra only)
//	ΔσL = (5/100)^(1/5)·ΔσD = 0.549·ΔσD cut-off limit
//	ΔσC,red = ks·ΔσC, ks = (30/d)^0.25 for d > 30 mm
//
// Constant amplitude (Life): ranges below ΔσD do no damage. Spectra
// (SpectrumLife, Damage): m = 5 between ΔσL and ΔσD, ranges below ΔσL do no
// damage. All partial factors are 1 (γFf = γMf = 1).
//
// The category curve is characteristic (a lower bound, about mean − 2 sd of
// log10 N), not a median: for Monte Carlo use ToMedian. The curve is not
// verified for large diameters (Schaumann & Marten; confirmed). Use NewEN1993.
type EN1993 struct {
	d, ks         float64
	dsC, dsD, dsL float64
	scale         float64
	sdLog10N      float64 // > 0 after ToMedian
}

// NewEN1993 returns the detail-14 curve (ΔσC = 50 MPa) for a bolt of
// nominal diameter d > 0 mm, with the size factor applied.
func NewEN1993(d float64) (EN1993, error) {
	if !finitePositive(d) {
		return EN1993{}, &RangeError{Curve: enName, Param: "d", Value: d, Allowed: "a finite d > 0 mm"}
	}
	ks := 1.0
	if d > 30 {
		ks = math.Sqrt(math.Sqrt(30 / d))
	}
	e := EN1993{d: d, ks: ks, scale: 1}
	e.setCategory(ks * BoltCategory)
	return e, nil
}

func (e *EN1993) setCategory(dsC float64) {
	e.dsC = dsC
	e.dsD = math.Cbrt(ENReferenceCycles/ENKneeCycles) * dsC
	e.dsL = math.Pow(ENKneeCycles/ENCutOffCycles, 0.2) * e.dsD
}

// ToMedian returns the median curve for a log-normal life scatter with
// standard deviation sdLog10N of log10 N at fixed stress range (e.g. 0.2;
// bolts ≈ 0.15–0.25, from memory), reading the category as
// characteristic = mean − 2 sd (from memory). The category is raised by
// 10^(2·sd/3), which multiplies lives on the m = 3 branch by 10^(2·sd); the
// knee cycle numbers stay at 5·10⁶ and 10⁸, so lives on the m = 5 branch
// rise by 10^(2·sd·5/3) (an assumption: the standard scales every category
// this way).
func (e EN1993) ToMedian(sdLog10N float64) (EN1993, error) {
	if !(sdLog10N > 0 && sdLog10N <= 1) {
		return EN1993{}, &RangeError{Curve: enName, Param: "sd(log10 N)", Value: sdLog10N, Allowed: "0 < sd(log10 N) ≤ 1"}
	}
	if e.sdLog10N > 0 {
		return EN1993{}, &RangeError{Curve: enName, Param: "sd(log10 N)", Value: sdLog10N, Allowed: "a characteristic curve (this one is a median already)"}
	}
	e.scale *= math.Pow(10, CharacteristicSDs*sdLog10N/3)
	e.sdLog10N = sdLog10N
	e.setCategory(e.scale * e.ks * BoltCategory)
	return e, nil
}

// Scaled returns the curve with every strength (ΔσC, ΔσD, ΔσL) multiplied by
// x > 0, knee cycle numbers unchanged: for a sampled strength factor.
func (e EN1993) Scaled(x float64) (EN1993, error) {
	if !finitePositive(x) {
		return EN1993{}, &RangeError{Curve: enName, Param: "strength factor", Value: x, Allowed: "a finite factor > 0"}
	}
	e.scale *= x
	e.setCategory(e.scale * e.ks * BoltCategory)
	return e, nil
}

// Category returns ΔσC after size factor and any scaling, MPa.
func (e EN1993) Category() float64 { return e.dsC }

// SizeFactor returns ks.
func (e EN1993) SizeFactor() float64 { return e.ks }

// FatigueLimit returns the constant-amplitude fatigue limit ΔσD, MPa.
func (e EN1993) FatigueLimit() float64 { return e.dsD }

// CutOff returns the cut-off limit ΔσL, MPa.
func (e EN1993) CutOff() float64 { return e.dsL }

// IsMedian reports whether the curve came from ToMedian.
func (e EN1993) IsMedian() bool { return e.sdLog10N > 0 }

func (e EN1993) String() string {
	kind := "characteristic"
	if e.sdLog10N > 0 {
		kind = fmt.Sprintf("median for sd(log10 N) = %.3g", e.sdLog10N)
	}
	return fmt.Sprintf("EN 1993-1-9 detail category 50 bolts in tension, d %.4g mm, ΔσC %.4g MPa (%s)", e.d, e.dsC, kind)
}

// Life returns the life of a constant-amplitude cycle: Δσ < ΔσD does no
// damage (Endurance, Limit ΔσD); otherwise NR = 2·10⁶·(ΔσC/Δσ)³.
func (e EN1993) Life(c Cycle) (Life, error) {
	if err := c.check(enName); err != nil {
		return Life{}, err
	}
	ds := 2 * c.Amplitude
	if ds < e.dsD {
		return Life{Cycles: math.Inf(1), Rule: Endurance, Stress: ds, Limit: e.dsD}, nil
	}
	r := e.dsC / ds
	return Life{Cycles: ENReferenceCycles * r * r * r, Rule: FiniteLife, Stress: ds, Limit: e.dsD}, nil
}

// SpectrumLife returns the life of the cycle as one row of a spectrum:
// Δσ ≥ ΔσD on m = 3 (FiniteLife), ΔσL ≤ Δσ < ΔσD on m = 5 (SecondSlope),
// Δσ < ΔσL no damage (CutOff). Limit is ΔσL.
func (e EN1993) SpectrumLife(c Cycle) (Life, error) {
	if err := c.check(enName); err != nil {
		return Life{}, err
	}
	ds := 2 * c.Amplitude
	switch {
	case ds < e.dsL:
		return Life{Cycles: math.Inf(1), Rule: CutOff, Stress: ds, Limit: e.dsL}, nil
	case ds < e.dsD:
		r := e.dsD / ds
		r2 := r * r
		return Life{Cycles: ENKneeCycles * r2 * r2 * r, Rule: SecondSlope, Stress: ds, Limit: e.dsL}, nil
	}
	r := e.dsC / ds
	return Life{Cycles: ENReferenceCycles * r * r * r, Rule: FiniteLife, Stress: ds, Limit: e.dsL}, nil
}

// Damage returns the Palmgren–Miner damage of one pass of blocks with the
// spectrum rules of SpectrumLife; see [Damage]. lives, if not nil, receives
// each row's life (len ≥ len(blocks)). A single-row "spectrum" between ΔσL
// and ΔσD is damaged here but not by Life: use Life for constant amplitude.
func (e EN1993) Damage(blocks []Block, lives []Life) (Damage, error) {
	var d Damage
	for i := range blocks {
		l, err := e.SpectrumLife(blocks[i].Cycle)
		if err = d.add(i, &blocks[i], l, err, lives, enName); err != nil {
			return Damage{}, err
		}
	}
	return d, nil
}

// EquivalentRange returns the damage-equivalent constant range at
// 2·10⁶ cycles, ΔσE,2 = ΔσC·D^(1/3) (2·10⁶ cycles of ΔσE,2 on the m = 3
// branch do the damage D of one pass). With γFf = γMf = 1 the check
// ΔσE,2 ≤ ΔσC (EN 1993-1-9 Eq. 8.2, from memory) is then D ≤ 1.
func (e EN1993) EquivalentRange(d Damage) float64 { return e.dsC * math.Cbrt(d.Sum) }
