package montecarlo

import (
	"fmt"
	"math"
	"math/rand/v2"

	"boltrisk/model"
)

// group is a set of inputs drawn together: either the shared inputs of a
// sample or the per-bolt inputs of one bolt.
type group struct {
	dists  []Dist
	ptrs   []*float64
	copula *Copula // nil when the group is uncorrelated
	eps    []float64
}

// draw writes one set of values through the group's pointers.
func (g *group) draw(r *rand.Rand) {
	if g.copula == nil {
		for i := range g.dists {
			d := &g.dists[i]
			switch d.Kind {
			case Normal:
				*g.ptrs[i] = d.A + d.B*r.NormFloat64()
			case LogNormal:
				*g.ptrs[i] = math.Exp(d.A + d.B*r.NormFloat64())
			default:
				*g.ptrs[i] = d.FromUniform(r.Float64())
			}
		}
		return
	}
	for i := range g.eps {
		g.eps[i] = r.NormFloat64()
	}
	g.copula.Mix(g.eps)
	for i := range g.dists {
		*g.ptrs[i] = g.dists[i].FromNormal(g.eps[i])
	}
}

// plan is the part of a problem that does not change between workers.
type plan struct {
	base        model.Inputs
	shared      []int // indices into Problem.Vars
	perBolt     []int
	sharedCorr  []Correlation // re-indexed within the group
	perBoltCorr []Correlation
	stiffVaries bool // an input of the stiffness calculation is uncertain
	nBolts      int  // bolt evaluations per sample
}

// stiffnessInputs are the paths whose uncertainty forces the stiffness to be
// recomputed per sample.
func touchesStiffness(name string) bool {
	switch name {
	case "bolt.modulus", "bolt.shank_in_grip", "bolt.bearing_diameter", "bolt.hole_diameter",
		"members.stiffness", "members.load_introduction":
		return true
	}
	return len(name) > len("members.layers.") && name[:len("members.layers.")] == "members.layers."
}

func newPlan(p *Problem) (*plan, error) {
	pl := &plan{base: p.Base, nBolts: 1}
	pos := make([]int, len(p.Vars)) // index within its group
	for i, v := range p.Vars {
		if v.Field == nil {
			return nil, fmt.Errorf("montecarlo: input %q has no field binding", v.Name)
		}
		if v.PerBolt {
			pos[i] = len(pl.perBolt)
			pl.perBolt = append(pl.perBolt, i)
		} else {
			pos[i] = len(pl.shared)
			pl.shared = append(pl.shared, i)
		}
		if touchesStiffness(v.Name) {
			pl.stiffVaries = true
		}
	}
	for _, c := range p.Corr {
		a, b := p.Vars[c.I], p.Vars[c.J]
		if a.PerBolt != b.PerBolt {
			return nil, fmt.Errorf("correlation between %s (drawn per bolt) and %s (shared by the joint) is not supported: correlate inputs of the same kind", a.Name, b.Name)
		}
		cc := Correlation{I: pos[c.I], J: pos[c.J], Rho: c.Rho}
		if a.PerBolt {
			pl.perBoltCorr = append(pl.perBoltCorr, cc)
		} else {
			pl.sharedCorr = append(pl.sharedCorr, cc)
		}
	}
	if len(pl.perBolt) > 0 {
		pl.nBolts = p.Base.Bolts
	}
	return pl, nil
}

func (pl *plan) newGroup(p *Problem, idx []int, corr []Correlation, in *model.Inputs) (group, error) {
	g := group{}
	for _, i := range idx {
		g.dists = append(g.dists, p.Vars[i].Dist)
		g.ptrs = append(g.ptrs, p.Vars[i].Field(in))
	}
	if len(corr) > 0 {
		c, err := NewCopula(len(idx), corr)
		if err != nil {
			return g, err
		}
		g.copula = c
		g.eps = make([]float64, len(idx), len(idx)+8) // spare room: no shared cache line
	}
	return g, nil
}
