package montecarlo

import (
	"fmt"
	"math/rand/v2"

	"boltrisk/model"
	"boltrisk/montecarlo/rng"
)

// group is a set of inputs drawn together: either the shared inputs of a
// sample or the per-bolt inputs of one bolt.
type group struct {
	items  []drawItem
	ptrs   []*float64 // the items' fields, in item order
	copula *Copula    // nil when the group is uncorrelated
	eps    []float64  // scratch of fromNormals for a correlated group
}

// drawItem is one input of a group, laid out for the sampling loop: the
// normal and lognormal parameters inline, the full distribution behind a
// pointer for the other families. Its field is in group.ptrs.
type drawItem struct {
	kind Kind
	a, b float64
	dist *Dist
}

// blockValues bounds the values drawn ahead per worker (all inputs of one
// block): 8192 float64, 64 KiB, stays in the core's cache.
const blockValues = 8192

// blockLen returns the number of samples drawn per block for a problem
// with cols drawn values per sample: 256 (a divisor of ChunkSize), fewer for
// joints with many bolts. It is part of the reproducibility contract.
func blockLen(cols int) int {
	n := 256
	for n > 1 && n*cols > blockValues {
		n /= 2
	}
	return n
}

// fill draws the group's values for the next m samples of a block into
// rows: item i of sample j goes to rows[j·stride + i]. Each item's values are
// drawn in one loop (item by item, sample order within), so nothing is
// dispatched per value; a correlated group is then mixed sample by sample
// through its copula.
func (g *group) fill(p *rand.PCG, rows []float64, stride, m int) {
	n := len(g.items)
	if n == 0 || m == 0 {
		return
	}
	rows = rows[:(m-1)*stride+n]
	if g.copula == nil {
		for i := range g.items {
			g.items[i].fill(p, rows[i:], stride)
		}
		return
	}
	for i := range n {
		rng.Normals(p, rows[i:], stride)
	}
	for j := 0; j < len(rows); j += stride {
		row := rows[j : j+n]
		g.copula.Mix(row)
		for i := range row {
			row[i] = g.items[i].dist.FromNormal(row[i])
		}
	}
}

// fill draws the item's values into dst[0], dst[stride], dst[2·stride], …
func (it *drawItem) fill(p *rand.PCG, dst []float64, stride int) {
	a, b := it.a, it.b
	switch it.kind {
	case Normal:
		rng.Normals(p, dst, stride)
		for j := 0; j < len(dst); j += stride {
			dst[j] = a + b*dst[j]
		}
	case LogNormal:
		rng.Normals(p, dst, stride)
		for j := 0; j < len(dst); j += stride {
			dst[j] = rng.Exp(a + b*dst[j])
		}
	default:
		for j := 0; j < len(dst); j += stride {
			dst[j] = it.dist.FromUniform(rng.Unit(p))
		}
	}
}

// set writes one drawn row (one value per item) through the group's
// pointers.
func (g *group) set(row []float64) { setRow(g.ptrs, row) }

// setRow writes row[i] through ptrs[i].
func setRow(ptrs []*float64, row []float64) {
	ptrs = ptrs[:len(row)]
	for i, v := range row {
		*ptrs[i] = v
	}
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
		*g.ptrs[i] = g.items[i].dist.FromNormal(z[i])
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

func newPlan(p *Problem) (*plan, error) {
	pl := &plan{base: p.Base, nBolts: 1}
	pos := make([]int, len(p.Vars)) // index within its group
	for i, v := range p.Vars {
		if v.Field == nil {
			return nil, fmt.Errorf("montecarlo: input %q has no field binding", v.Name)
		}
		if v.PerBolt() {
			pos[i] = len(pl.perBolt)
			pl.perBolt = append(pl.perBolt, i)
		} else {
			pos[i] = len(pl.shared)
			pl.shared = append(pl.shared, i)
		}
		if v.Role&FeedsStiffness != 0 {
			pl.stiffVaries = true
		}
	}
	for _, c := range p.Corr {
		a, b := p.Vars[c.I], p.Vars[c.J]
		if a.PerBolt() != b.PerBolt() {
			return nil, fmt.Errorf("correlation between %s (drawn per bolt) and %s (shared by the joint) is not supported: correlate inputs of the same kind", a.Name, b.Name)
		}
		cc := Correlation{I: pos[c.I], J: pos[c.J], Rho: c.Rho}
		if a.PerBolt() {
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
		if v.Role&(Load|ShearSide) == Load|ShearSide { // an uncertain shear load
			pl.needJoint = true
		}
	}
	return pl, nil
}

func (pl *plan) newGroup(p *Problem, idx []int, corr []Correlation, in *model.Inputs) (group, error) {
	g := group{}
	for _, i := range idx {
		d := p.Vars[i].Dist
		g.items = append(g.items, drawItem{kind: d.Kind, a: d.A, b: d.B, dist: &d})
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
