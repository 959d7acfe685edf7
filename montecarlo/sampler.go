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
	items  []drawItem
	copula *Copula // nil when the group is uncorrelated
	eps    []float64
}

// drawItem is one input of a group, laid out for the sampling loop: the
// normal and lognormal parameters inline, the full distribution behind a
// pointer for the other families.
type drawItem struct {
	kind Kind
	a, b float64
	ptr  *float64
	dist *Dist
}

// draw writes one set of values through the group's pointers.
func (g *group) draw(r *rand.Rand) {
	if g.copula == nil {
		for i := range g.items {
			it := &g.items[i]
			switch it.kind {
			case Normal:
				*it.ptr = it.a + it.b*r.NormFloat64()
			case LogNormal:
				*it.ptr = math.Exp(it.a + it.b*r.NormFloat64())
			default:
				*it.ptr = it.dist.FromUniform(r.Float64())
			}
		}
		return
	}
	for i := range g.eps {
		g.eps[i] = r.NormFloat64()
	}
	g.fromNormals(g.eps)
}

// fromNormals writes the values given by independent standard normal
// variates z, one per item (mixed through the group's copula, if any),
// through the group's pointers.
func (g *group) fromNormals(z []float64) {
	if g.copula != nil {
		copy(g.eps, z)
		g.copula.Mix(g.eps)
		z = g.eps
	}
	for i := range g.items {
		*g.items[i].ptr = g.items[i].dist.FromNormal(z[i])
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
	// needJoint: the joint's modes differ from the one bolt's (several bolts
	// evaluated, or a shear load); otherwise EvaluateJoint is skipped and the
	// bolt result is read directly (model.EvaluateJoint documents that).
	needJoint bool
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
	pl.needJoint = pl.nBolts > 1 || p.Base.ShearLoad > 0
	for _, v := range p.Vars {
		if v.Name == "loads.shear" {
			pl.needJoint = true
		}
	}
	return pl, nil
}

func (pl *plan) newGroup(p *Problem, idx []int, corr []Correlation, in *model.Inputs) (group, error) {
	g := group{}
	for _, i := range idx {
		d := p.Vars[i].Dist
		g.items = append(g.items, drawItem{kind: d.Kind, a: d.A, b: d.B, ptr: p.Vars[i].Field(in), dist: &d})
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
