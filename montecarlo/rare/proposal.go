package rare

import (
	"fmt"
	"math"
)

// Proposal is a fixed importance-sampling density in standard-normal space,
// a defensive mixture
//
//	h(u) = α0·φ(u) + (1 − α0)·Σ_k c_k·N(u; μ_k, Σ_k),  Σ_k = I + (s_k² − 1)·a_k·a_kᵀ,
//
// with φ the standard-normal density, α0 = Defensive, c_k = Weight (taken
// relative to their sum), μ_k = Mean, a_k = Axis (unit vector) and
// s_k = AxisSD (the standard deviation along a_k; 1 in every other
// direction). It holds plain data only, so that part files of a split run
// can store it and every part samples the same density.
type Proposal struct {
	Dim        int
	Defensive  float64 // α0, the weight of the standard-normal component
	Components []Gaussian
}

// Gaussian is one normal component of a [Proposal].
type Gaussian struct {
	Weight float64   // c_k, relative to the sum over the components
	Mean   []float64 // μ_k
	Axis   []float64 // a_k, a unit vector; nil: Σ_k = I
	AxisSD float64   // s_k, the standard deviation along Axis (> 1/√2; ignored without Axis)
	From   int       // the limit-state component at whose design point it sits (−1: none)
}

// MinAxisSD is the bound below which a normal component would make the
// second moment of the weights infinite without the defensive part:
// ∫φ²/N(μ, Σ) is finite only when every eigenvalue of Σ exceeds ½.
const MinAxisSD = math.Sqrt2 / 2

// Validate reports the first inconsistency of q, naming the field.
func (q *Proposal) Validate() error {
	if q == nil {
		return fmt.Errorf("rare: Proposal is nil")
	}
	if q.Dim < 1 {
		return fmt.Errorf("rare: Proposal.Dim is %d; it must be at least 1", q.Dim)
	}
	if !(q.Defensive >= 0 && q.Defensive <= 1) {
		return fmt.Errorf("rare: Proposal.Defensive is %g; it must be in [0, 1]", q.Defensive)
	}
	sum := 0.0
	for k, c := range q.Components {
		if !(c.Weight >= 0) || math.IsInf(c.Weight, 0) {
			return fmt.Errorf("rare: Proposal.Components[%d].Weight is %g; it must be finite and ≥ 0", k, c.Weight)
		}
		sum += c.Weight
		if len(c.Mean) != q.Dim {
			return fmt.Errorf("rare: Proposal.Components[%d].Mean has %d coordinates; Proposal.Dim is %d", k, len(c.Mean), q.Dim)
		}
		for i, x := range c.Mean {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("rare: Proposal.Components[%d].Mean[%d] is %g; it must be finite", k, i, x)
			}
		}
		if c.Axis == nil {
			continue
		}
		if len(c.Axis) != q.Dim {
			return fmt.Errorf("rare: Proposal.Components[%d].Axis has %d coordinates; Proposal.Dim is %d", k, len(c.Axis), q.Dim)
		}
		if n := norm2(c.Axis); !(math.Abs(n-1) <= 1e-9) {
			return fmt.Errorf("rare: Proposal.Components[%d].Axis has length %g; it must be a unit vector", k, n)
		}
		if !(c.AxisSD > MinAxisSD && c.AxisSD <= 10) {
			return fmt.Errorf("rare: Proposal.Components[%d].AxisSD is %g; it must be in (1/√2, 10] (narrower than 1/√2 gives weights of infinite variance)", k, c.AxisSD)
		}
	}
	if q.Defensive < 1 && !(sum > 0) {
		return fmt.Errorf("rare: Proposal has no component of positive weight and Defensive %g < 1", q.Defensive)
	}
	return nil
}

// NewProposal builds the mixture at the design points: one normal
// component per converged design point, centred on u* with standard
// deviation AxisSD along α (when β ≥ ½; identity otherwise), and the
// defensive standard normal of weight Defensive (settings of s; nil gives
// the defaults). Components whose design point was not found get no normal
// component: only the defensive part covers them.
//
// Weights: the mass of the normal part is split equally among the
// estimated events (each event of the problem and [AnyEvent]); within an
// event it goes to the event's components in proportion to Φ(−β_k).
func NewProposal(p *Problem, dps []DesignPoint, s *ImportanceSettings) (*Proposal, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if len(dps) != p.Components {
		return nil, fmt.Errorf("rare: %d design points for %d components", len(dps), p.Components)
	}
	is, err := s.withDefaults()
	if err != nil {
		return nil, err
	}
	q := &Proposal{Dim: p.Dim, Defensive: is.Defensive}
	weight := make([]float64, p.Components)
	groups := 0
	ts := p.targets()
	for _, t := range ts {
		total := 0.0
		for _, c := range t.comps {
			if dps[c].Converged {
				total += dps[c].FORM
			}
		}
		if total > 0 {
			groups++
		}
	}
	for _, t := range ts {
		total := 0.0
		for _, c := range t.comps {
			if dps[c].Converged {
				total += dps[c].FORM
			}
		}
		if !(total > 0) {
			continue
		}
		for _, c := range t.comps {
			if dps[c].Converged {
				weight[c] += dps[c].FORM / total / float64(groups)
			}
		}
	}
	for c, dp := range dps {
		if !dp.Converged || !(weight[c] > 0) {
			continue
		}
		g := Gaussian{Weight: weight[c], Mean: append([]float64(nil), dp.U...), From: c, AxisSD: 1}
		if dp.Beta >= 0.5 && is.AxisSD != 1 {
			g.Axis = append([]float64(nil), dp.Alpha...)
			n := norm2(g.Axis)
			for i := range g.Axis {
				g.Axis[i] /= n
			}
			g.AxisSD = is.AxisSD
		}
		q.Components = append(q.Components, g)
	}
	if len(q.Components) == 0 {
		q.Defensive = 1 // no design point: plain Monte Carlo
	}
	return q, nil
}
