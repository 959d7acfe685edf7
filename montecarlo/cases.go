package montecarlo

import (
	"math"
	"math/bits"

	"boltrisk/model"
	"boltrisk/montecarlo/interval"
)

// CaseSlot is one value a load case sets.
type CaseSlot uint8

const (
	CaseAxialMax    CaseSlot = iota // loads.axial_max of the case, N
	CaseAxialMin                    // loads.axial_min, N
	CaseShear                       // loads.shear, N
	CaseTemperature                 // temperature_change, K
)

// NumCaseSlots is the number of values of a load case.
const NumCaseSlots = 4

// MaxCases bounds the load cases of a problem.
const MaxCases = 16

// Case is a named load case: its nominal values (the means of its
// uncertain ones, which are Vars with Case set). Every mode is checked in
// every case; a mode fails when it fails in any case.
type Case struct {
	Name   string
	Values [NumCaseSlots]float64
}

// apply writes case ci's values into the inputs.
func (e *Evaluator) apply(ci int) {
	v := e.caseVals[ci*NumCaseSlots : (ci+1)*NumCaseSlots]
	e.in.AxialMax, e.in.AxialMin, e.in.ShearLoad, e.in.TemperatureChange = v[0], v[1], v[2], v[3]
}

// bind returns the address an input's sampled value is written to: its
// field of the evaluator's inputs, or its case's slot.
func (e *Evaluator) bind(v Var) *float64 {
	if v.Case > 0 {
		return &e.caseVals[(v.Case-1)*NumCaseSlots+int(v.Slot)]
	}
	if v.Aux > 0 {
		return &e.aux[v.Aux-1]
	}
	return v.Field(&e.in)
}

// casesActive returns the nominal outcome with the union of the modes
// active in any case (for the choice of reported modes).
func casesActive(p *Problem, nom *model.Outcome) *model.Outcome {
	u := *nom
	for _, c := range p.Cases {
		in := p.Base
		in.AxialMax, in.AxialMin, in.ShearLoad, in.TemperatureChange = c.Values[0], c.Values[1], c.Values[2], c.Values[3]
		n := model.EvaluateNominal(&in)
		for m := range model.NumModes {
			u.Active[m] = u.Active[m] || n.Outcome.Active[m]
		}
	}
	return &u
}

// fatigueModes are checked in the first load case only: the service case,
// whose loads the spectrum's levels scale; the static modes in every case.
const fatigueModes = model.ModeSet(1<<model.Fatigue | 1<<model.FatigueLife)

// evalCases is Eval for a problem with load cases: each sample is
// evaluated in every case; a static mode fails when it fails in any case,
// the fatigue modes are those of the first case. With
// Detail the safety factors and clamp forces are the least over the cases,
// the bolt forces the largest; with Margins each component's margin is the
// least over the cases. The residual preload is the least over the cases.
// It allocates nothing. It repeats the shape of Eval's loop rather than
// sharing it: folding the two (one pass of a case loop for files without
// cases) measured +1.7 % instructions per cover-flange sample by callgrind
// on BenchmarkChunkCoverFlange, and a per-case helper +2.4 %.
func (e *Evaluator) evalCases(rows []float64, n int, o *Out, want Want) {
	k := e.k
	d, ns, np, nb, nc := k.Dim(), len(k.shared), len(k.perBolt), k.nBolts, len(k.cases)
	offB := ns + k.nParts
	detail, margins := want&Detail != 0, want&Margins != 0
	nm, ncomp := len(k.modes), k.Components()
	bolts := e.bolts
	for j := range n {
		row := rows[j*d : j*d+d]
		setRow(e.sharedPtr, row[:ns])
		if k.stiffVaries {
			e.stiff = model.ComputeStiffness(&e.in)
		}
		invalid := false
		var all model.ModeSet
		for ci := range nc {
			e.apply(ci)
			var fail model.ModeSet
			for b := range bolts {
				if np > 0 {
					setRow(e.boltPtr, row[offB+b*np:offB+(b+1)*np])
				}
				br := &bolts[b]
				model.EvaluateBolt(&e.in, &e.stiff, k.set, br)
				if e.lc != nil && ci == 0 {
					e.lifeMode(br)
				}
				invalid = invalid || br.Invalid
				f := br.Failures(k.boltSet)
				if ci > 0 {
					f &^= fatigueModes
				}
				fail |= f
				if nb > 1 {
					if ci == 0 {
						o.BoltFail[j*nb+b] = f
					} else {
						o.BoltFail[j*nb+b] |= f
					}
				}
				if ci == 0 || br.Preload < o.Preload[j*nb+b] {
					o.Preload[j*nb+b] = br.Preload
				}
			}
			if k.jointLevel {
				model.JointModes(&e.in, model.ClampSum(&e.in, bolts), &e.out)
				fail |= e.out.Failures(k.jointSet)
			}
			o.CaseFail[j*nc+ci] = fail
			all |= fail
			if detail {
				e.caseDetail(o, j, nm, nb, ci == 0)
			}
			if margins {
				e.caseMargins(o.G[j*ncomp:(j+1)*ncomp], invalid, ci == 0)
			}
		}
		o.Invalid[j], o.Fail[j] = invalid, all
	}
}

// caseDetail merges the detail of one case into sample j.
func (e *Evaluator) caseDetail(o *Out, j, nm, nb int, first bool) {
	if first {
		e.detail(o, j, nm, nb)
		return
	}
	prev := e.caseBuf
	sf, f0, c0 := prev[:nm], prev[nm:nm+nb], prev[nm+nb:nm+2*nb]
	copy(sf, o.SF[j*nm:(j+1)*nm])
	bf := o.BoltForce[j*nb : (j+1)*nb]
	cl := o.Clamp[j*nb : (j+1)*nb]
	copy(f0, bf)
	copy(c0, cl)
	e.detail(o, j, nm, nb)
	for i, m := range e.k.modes {
		if v := o.SF[j*nm+i]; math.IsNaN(v) || sf[i] < v || fatigueModes.Has(m) {
			o.SF[j*nm+i] = sf[i]
		}
	}
	for b := range nb {
		bf[b] = math.Max(bf[b], f0[b])
		cl[b] = math.Min(cl[b], c0[b])
	}
}

// caseMargins merges the margins of one case: the least over the cases
// (the fatigue components keep the first case's).
func (e *Evaluator) caseMargins(g []float64, invalid, first bool) {
	if first {
		e.margins(g, invalid)
		return
	}
	prev := e.caseBuf[:len(g)]
	copy(prev, g)
	e.margins(g, invalid)
	for i := range g {
		if prev[i] < g[i] || math.IsNaN(prev[i]) {
			g[i] = prev[i]
		}
	}
	nbm := len(e.k.boltModes)
	for b := range e.bolts {
		for i, m := range e.k.boltModes {
			if fatigueModes.Has(m) {
				g[b*nbm+i] = prev[b*nbm+i]
			}
		}
	}
}

// caseTally counts failures per case.
type caseTally struct {
	fail [][model.NumModes]int64
	any  []int64
}

func (c *caseTally) add(o *Out, n, nc int) {
	if nc == 0 {
		return
	}
	if c.fail == nil {
		c.fail, c.any = make([][model.NumModes]int64, nc), make([]int64, nc)
	}
	for j := range n {
		if o.Invalid[j] {
			continue
		}
		for ci, f := range o.CaseFail[j*nc : (j+1)*nc] {
			if f != 0 {
				c.any[ci]++
			}
			for ; f != 0; f &= f - 1 {
				c.fail[ci][bits.TrailingZeros16(uint16(f))]++
			}
		}
	}
}

func (c *caseTally) merge(o *caseTally) {
	if o.fail == nil {
		return
	}
	if c.fail == nil {
		c.fail, c.any = make([][model.NumModes]int64, len(o.fail)), make([]int64, len(o.any))
	}
	for i := range o.fail {
		c.any[i] += o.any[i]
		for m := range o.fail[i] {
			c.fail[i][m] += o.fail[i][m]
		}
	}
}

// CaseResult is the estimate of each reported mode in one load case.
type CaseResult struct {
	Name  string
	Modes []ModeResult // Estimate only, in the order of Result.Modes
	Any   interval.Estimate
}

func (res *Result) fillCases(c *caseTally, k *Kernel, n int64, method interval.Method) {
	if len(k.cases) == 0 || c.fail == nil {
		return
	}
	for ci, cs := range k.cases {
		cr := CaseResult{Name: cs.Name, Any: interval.Proportion(c.any[ci], n, res.Confidence, method)}
		for _, m := range k.modes {
			cr.Modes = append(cr.Modes, ModeResult{Mode: m, Estimate: interval.Proportion(c.fail[ci][m], n, res.Confidence, method)})
		}
		res.Cases = append(res.Cases, cr)
	}
}
