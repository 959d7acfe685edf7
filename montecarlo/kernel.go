package montecarlo

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"boltrisk/model"
	"boltrisk/montecarlo/rng"
)

// Kernel is a problem compiled for evaluation, the one per-sample path of
// every estimator:
//
//	variates of a block ──► inputs (each family's map; the Gaussian copula)
//	  ──► model.EvaluateBolt per bolt, the joint-level modes ──► Out
//
// A sample is a row of Dim coordinates: the shared inputs, the shared parts
// of the per-bolt inputs, then each bolt's own inputs. Crude Monte Carlo
// draws each coordinate in its family's native variate (a standard normal
// for normal and lognormal inputs and for correlated or partly shared ones,
// an open uniform otherwise; see Draw); the rare-event estimators give
// independent standard normals (MapNormals). Both are exact maps of the same
// distribution (for the copula, Nataf's transformation).
//
// A Kernel is read-only once built; each goroutine evaluates through its own
// Evaluator.
type Kernel struct {
	base    model.Inputs
	vars    []Var
	shared  []item // shared inputs, coordinates [0, nShared)
	perBolt []item // each bolt's inputs
	// parts: coordinates of the shared parts of per-bolt inputs, after the
	// shared inputs; perBolt[i].part indexes them (−1: none).
	nParts    int
	sharedCop *Copula
	boltCop   *Copula
	nBolts    int // bolt evaluations per sample
	// stiffVaries: an input of the stiffness calculation is uncertain.
	stiffVaries bool
	// jointLevel: the joint-level (shear-side) modes must be evaluated.
	jointLevel bool
	modes      []model.Mode  // reported modes, report order
	boltModes  []model.Mode  // the reported modes decided bolt by bolt
	boltSet    model.ModeSet // the same as a set
	jointModes []model.Mode  // the reported joint-level modes
	jointSet   model.ModeSet // the same as a set
	set        model.ModeSet
	nominal    model.Nominal
	cases      []Case    // load cases (none: Base's loads)
	life       *LifeSpec // service life (nil: no fatigue_life mode)
}

// item is one uncertain input in its group, laid out for the sampling loop:
// the normal and lognormal parameters inline, the full distribution for the
// other families.
type item struct {
	v      int // index in Problem.Vars
	kind   Kind
	a, b   float64
	dist   Dist
	native bool // drawn from a standard normal (else from a uniform)
	// Partly shared per-bolt input: its value in bolt b comes from
	// z = √ρ·v + √(1 − ρ)·w_b with v the shared coordinate part.
	part          int
	rhoS, rhoOwn  float64 // √ρ, √(1 − ρ)
	correlatedRow bool    // mixed through its group's copula
}

// NewKernel compiles a problem. modes are the modes to report (each must be
// active at the nominal values); nil means every active mode.
func NewKernel(p *Problem, modes []model.Mode) (*Kernel, error) {
	k := &Kernel{base: p.Base, vars: p.Vars, nBolts: 1, cases: p.Cases, life: p.Life}
	k.nominal = model.EvaluateNominal(&k.base)
	if p.Life != nil {
		if err := k.nominalLife(); err != nil {
			return nil, err
		}
	}
	nom := &k.nominal.Outcome
	if len(p.Cases) > 0 {
		nom = casesActive(p, nom)
	}
	if modes == nil {
		for m := range model.NumModes {
			if nom.Active[m] {
				modes = append(modes, m)
			}
		}
	} else {
		for _, m := range modes {
			if m < 0 || m >= model.NumModes || !nom.Active[m] {
				return nil, fmt.Errorf("mode %v is not active for this joint", m)
			}
		}
		modes = slices.Clone(modes)
		slices.Sort(modes)
		modes = slices.Compact(modes)
	}
	k.modes = modes
	k.set = model.SetOf(modes...)
	for _, m := range modes {
		if m.IsBolt() {
			k.boltModes = append(k.boltModes, m)
			k.boltSet |= 1 << m
		} else {
			k.jointModes = append(k.jointModes, m)
			k.jointSet |= 1 << m
		}
	}
	pos := make([]int, len(p.Vars)) // index within its group
	for i, v := range p.Vars {
		if v.Case > len(p.Cases) || v.Aux > numAux || v.Case < 0 || v.Aux < 0 {
			return nil, fmt.Errorf("montecarlo: input %q is bound to load case %d or draw %d, which the problem does not have", v.Name, v.Case, v.Aux)
		}
		if v.Field == nil && v.Case == 0 && v.Aux == 0 {
			return nil, fmt.Errorf("montecarlo: input %q has no field binding", v.Name)
		}
		if !(v.Shared >= 0 && v.Shared < 1) {
			return nil, fmt.Errorf("%s: the shared part must lie within 0 … 1 (a correlation between bolts), got %g", v.Name, v.Shared)
		}
		if v.Shared > 0 && !v.PerBolt() {
			return nil, fmt.Errorf("%s: only an input that each bolt draws may have a shared part", v.Name)
		}
		d := v.Dist
		it := item{v: i, kind: d.Kind, a: d.A, b: d.B, dist: d, native: d.NeedsNormal(), part: -1}
		if v.PerBolt() {
			pos[i] = len(k.perBolt)
			if v.Shared > 0 {
				it.part, it.native = k.nParts, true
				it.rhoS, it.rhoOwn = math.Sqrt(v.Shared), math.Sqrt(1-v.Shared)
				k.nParts++
			}
			k.perBolt = append(k.perBolt, it)
		} else {
			pos[i] = len(k.shared)
			k.shared = append(k.shared, it)
		}
		if v.Role&FeedsStiffness != 0 {
			k.stiffVaries = true
		}
		if v.Role&(Load|ShearSide) == Load|ShearSide { // an uncertain shear load
			k.jointLevel = true
		}
	}
	var sharedCorr, boltCorr []Correlation
	for _, c := range p.Corr {
		a, b := p.Vars[c.I], p.Vars[c.J]
		if a.PerBolt() != b.PerBolt() {
			return nil, fmt.Errorf("correlation between %s (drawn per bolt) and %s (shared by the joint) is not supported: correlate inputs of the same kind", a.Name, b.Name)
		}
		cc := Correlation{I: pos[c.I], J: pos[c.J], Rho: c.Rho}
		if a.PerBolt() {
			boltCorr = append(boltCorr, cc)
		} else {
			sharedCorr = append(sharedCorr, cc)
		}
	}
	var err error
	if k.sharedCop, err = correlate(k.shared, sharedCorr); err != nil {
		return nil, err
	}
	if k.boltCop, err = correlate(k.perBolt, boltCorr); err != nil {
		return nil, err
	}
	if len(k.perBolt) > 0 {
		k.nBolts = p.Base.Bolts
	}
	k.jointLevel = k.jointLevel || p.Base.ShearLoad > 0
	for _, c := range p.Cases {
		k.jointLevel = k.jointLevel || c.Values[CaseShear] > 0
	}
	return k, nil
}

// correlate builds the copula of a group and marks its items as drawn from
// normals.
func correlate(items []item, corr []Correlation) (*Copula, error) {
	if len(corr) == 0 {
		return nil, nil
	}
	c, err := NewCopula(len(items), corr)
	if err != nil {
		return nil, err
	}
	for i := range items {
		items[i].native, items[i].correlatedRow = true, true
	}
	return c, nil
}

// Dim returns the number of coordinates of a sample.
func (k *Kernel) Dim() int { return len(k.shared) + k.nParts + k.nBolts*len(k.perBolt) }

// Bolts returns the number of bolt evaluations per sample: the joint's bolt
// count when its bolts draw their own scatter, else 1 (identical bolts).
func (k *Kernel) Bolts() int { return k.nBolts }

// Modes returns the reported modes in report order.
func (k *Kernel) Modes() []model.Mode { return k.modes }

// Nominal returns the joint at its nominal inputs.
func (k *Kernel) Nominal() model.Nominal { return k.nominal }

// boltOffset returns the first coordinate of bolt b's inputs.
func (k *Kernel) boltOffset(b int) int { return len(k.shared) + k.nParts + b*len(k.perBolt) }

// Draw fills the first n rows of block (Dim coordinates each) with native
// variates from p: the shared inputs, the shared parts, then each bolt's;
// within a group input by input, each input's n values in sample order.
// This order is part of the reproducibility contract.
func (k *Kernel) Draw(p *rand.PCG, block []float64, n int) {
	d := k.Dim()
	if d == 0 || n == 0 {
		return
	}
	rows := block[:(n-1)*d+d]
	for i := range k.shared {
		drawColumn(p, &k.shared[i], rows[i:], d)
	}
	for j := range k.nParts {
		rng.Normals(p, rows[len(k.shared)+j:], d)
	}
	for b := range k.nBolts {
		off := k.boltOffset(b)
		for i := range k.perBolt {
			drawColumn(p, &k.perBolt[i], rows[off+i:], d)
		}
	}
}

// drawColumn draws one input's native variates into dst[0], dst[stride], …
func drawColumn(p *rand.PCG, it *item, dst []float64, stride int) {
	if it.native {
		rng.Normals(p, dst, stride)
		return
	}
	for j := 0; j < len(dst); j += stride {
		dst[j] = rng.Unit(p)
	}
}

// MapNative turns n rows of native variates (Draw) into inputs in place:
// normal and lognormal values from their normals, the other families by the
// inverse CDF of their uniform, correlated groups through their copula.
func (k *Kernel) MapNative(rows []float64, n int) { k.mapRows(rows, n, false) }

// MapNormals turns n rows of independent standard normals into inputs in
// place: the rare-event estimators' map from standard-normal space.
func (k *Kernel) MapNormals(rows []float64, n int) { k.mapRows(rows, n, true) }

func (k *Kernel) mapRows(rows []float64, n int, allNormal bool) {
	d := k.Dim()
	if d == 0 {
		return
	}
	rows = rows[:n*d]
	mapGroup(k.shared, k.sharedCop, rows, 0, d, allNormal, nil)
	for b := range k.nBolts {
		mapGroup(k.perBolt, k.boltCop, rows, k.boltOffset(b), d, allNormal, rows[len(k.shared):])
	}
}

// mapGroup maps the items of one group, whose coordinates start at off in
// every row of stride d. parts holds, per row, the shared parts (for
// per-bolt items with a shared part).
func mapGroup(items []item, cop *Copula, rows []float64, off, d int, allNormal bool, parts []float64) {
	if len(items) == 0 {
		return
	}
	if cop != nil {
		for j := off; j < len(rows); j += d {
			cop.Mix(rows[j : j+len(items)])
		}
	}
	for i := range items {
		it := &items[i]
		col := rows[off+i:]
		if it.part >= 0 {
			for j := 0; j < len(col); j += d {
				col[j] = it.rhoS*parts[j+it.part] + it.rhoOwn*col[j]
			}
		}
		switch {
		case it.kind == Normal:
			a, b := it.a, it.b
			for j := 0; j < len(col); j += d {
				col[j] = a + b*col[j]
			}
		case it.kind == LogNormal:
			a, b := it.a, it.b
			for j := 0; j < len(col); j += d {
				col[j] = rng.Exp(a + b*col[j])
			}
		case it.native || allNormal:
			for j := 0; j < len(col); j += d {
				col[j] = it.dist.FromNormal(col[j])
			}
		default:
			for j := 0; j < len(col); j += d {
				col[j] = it.dist.FromUniform(col[j])
			}
		}
	}
}

// Want selects what an evaluation writes beyond the failures.
type Want uint8

const (
	// Detail: each reported mode's safety factor and each bolt's force and
	// clamp force (the percentiles and pictures).
	Detail Want = 1 << iota
	// Margins: the margin of every component (mode × bolt) for the
	// rare-event estimators.
	Margins
)

// Out receives the outcomes of a block of samples. Slices are sized by
// NewOut; an evaluation of n samples writes their first n entries.
type Out struct {
	Invalid  []bool          // sample outside the model's domain (not counted)
	Fail     []model.ModeSet // reported modes the joint fails
	BoltFail []model.ModeSet // per sample and bolt: bolt modes the bolt fails (several bolts only)
	Preload  []float64       // per sample and bolt: residual preload, N
	// With Detail:
	SF        []float64 // per sample and reported mode: the joint's safety factor (NaN when inactive)
	BoltForce []float64 // per sample and bolt, N
	Clamp     []float64 // per sample and bolt, N
	// With Margins: per sample and component (see Kernel.Components).
	G []float64
	// With load cases: per sample and case, the reported modes the joint
	// fails in that case (Fail is their union).
	CaseFail []model.ModeSet
}

// NewOut returns outputs for blocks of up to n samples.
func (k *Kernel) NewOut(n int, want Want) *Out {
	nb := k.nBolts
	o := &Out{Invalid: make([]bool, n), Fail: make([]model.ModeSet, n), Preload: make([]float64, n*nb)}
	if nb > 1 {
		o.BoltFail = make([]model.ModeSet, n*nb)
	}
	if want&Detail != 0 {
		o.SF = make([]float64, n*len(k.modes))
		o.BoltForce, o.Clamp = make([]float64, n*nb), make([]float64, n*nb)
	}
	if want&Margins != 0 {
		o.G = make([]float64, n*k.Components())
	}
	if len(k.cases) > 0 {
		o.CaseFail = make([]model.ModeSet, n*len(k.cases))
	}
	return o
}

// Components returns the number of component limit states: each reported
// bolt mode for each bolt evaluation, then each reported joint-level mode.
func (k *Kernel) Components() int { return len(k.boltModes)*k.nBolts + len(k.jointModes) }

// Component returns the mode and bolt (−1 for a joint-level mode) of
// component c.
func (k *Kernel) Component(c int) (model.Mode, int) {
	nb := len(k.boltModes)
	if c < nb*k.nBolts {
		return k.boltModes[c%nb], c / nb
	}
	return k.jointModes[c-nb*k.nBolts], -1
}

// Evaluator evaluates samples for one goroutine: its own copy of the
// inputs, the fields bound to the coordinates, and the bolt results.
type Evaluator struct {
	k         *Kernel
	in        model.Inputs
	sharedPtr []*float64
	boltPtr   []*float64
	allPtr    []*float64 // shared then bolt fields: a row of a one-bolt joint without shared parts
	stiff     model.Stiffness
	bolts     []model.BoltResult
	boltBuf   [4]model.BoltResult // backing store for small joints, inside the evaluator
	out       model.Outcome
	caseVals  []float64 // the load cases' sampled values (len(cases)·NumCaseSlots)
	caseBuf   []float64 // the previous cases' detail or margins of a sample
	lc        *lifeCurves
	aux       [numAux]float64 // the service life's own draws
	_         [64]byte        // keep other goroutines' data off these cache lines
}

// NewEvaluator returns an evaluator of the kernel.
func (k *Kernel) NewEvaluator() *Evaluator {
	e := &Evaluator{k: k, in: k.base}
	if len(k.cases) > 0 {
		e.caseVals = make([]float64, len(k.cases)*NumCaseSlots, len(k.cases)*NumCaseSlots+8)
		for ci, c := range k.cases {
			copy(e.caseVals[ci*NumCaseSlots:], c.Values[:])
		}
		n := max(len(k.modes)+2*k.nBolts, k.Components())
		e.caseBuf = make([]float64, n, n+8)
	}
	if k.life != nil {
		e.lc, _ = newLifeCurves(k.life, &k.base) // checked by NewKernel
		e.aux = auxDefaults
		e.aux[AuxCriticalDamage-1] = k.life.fixedCritical()
	}
	for _, it := range k.shared {
		e.sharedPtr = append(e.sharedPtr, e.bind(k.vars[it.v]))
	}
	for _, it := range k.perBolt {
		e.boltPtr = append(e.boltPtr, e.bind(k.vars[it.v]))
	}
	e.allPtr = append(slices.Clip(e.sharedPtr), e.boltPtr...)
	e.stiff = model.ComputeStiffness(&e.in)
	if k.nBolts <= len(e.boltBuf) {
		e.bolts = e.boltBuf[:k.nBolts]
	} else {
		e.bolts = make([]model.BoltResult, k.nBolts, k.nBolts+2) // spare room: no shared cache line
	}
	return e
}

// setRow writes row[i] through ptrs[i].
func setRow(ptrs []*float64, row []float64) {
	ptrs = ptrs[:len(row)]
	for i, v := range row {
		*ptrs[i] = v
	}
}

// Eval evaluates n rows of inputs (mapped by MapNative or MapNormals) into
// o. It allocates nothing and calls no interface.
func (e *Evaluator) Eval(rows []float64, n int, o *Out, want Want) {
	k := e.k
	if len(k.cases) > 0 {
		e.evalCases(rows, n, o, want)
		return
	}
	if want == 0 && k.nBolts == 1 && k.nParts == 0 && !k.jointLevel && !k.stiffVaries && e.lc == nil {
		e.evalOne(rows, n, o)
		return
	}
	d, ns, np, nb := k.Dim(), len(k.shared), len(k.perBolt), k.nBolts
	offB := ns + k.nParts
	detail, margins := want&Detail != 0, want&Margins != 0
	nm := len(k.modes)
	bolts := e.bolts
	for j := range n {
		row := rows[j*d : j*d+d]
		setRow(e.sharedPtr, row[:ns])
		if k.stiffVaries {
			e.stiff = model.ComputeStiffness(&e.in)
		}
		invalid := false
		var fail model.ModeSet
		for b := range bolts {
			if np > 0 {
				setRow(e.boltPtr, row[offB+b*np:offB+(b+1)*np])
			}
			br := &bolts[b]
			model.EvaluateBolt(&e.in, &e.stiff, k.set, br)
			if e.lc != nil {
				e.lifeMode(br)
			}
			invalid = invalid || br.Invalid
			f := br.Failures(k.boltSet)
			fail |= f
			if nb > 1 {
				o.BoltFail[j*nb+b] = f
			}
			o.Preload[j*nb+b] = br.Preload
		}
		if k.jointLevel {
			model.JointModes(&e.in, model.ClampSum(&e.in, bolts), &e.out)
			fail |= e.out.Failures(k.jointSet)
		}
		o.Invalid[j], o.Fail[j] = invalid, fail
		if detail {
			e.detail(o, j, nm, nb)
		}
		if margins {
			e.margins(o.G[j*k.Components():(j+1)*k.Components()], invalid)
		}
	}
}

// evalOne is Eval for the commonest shape — one bolt evaluation of fixed
// stiffness, no joint-level modes, failures only — in one loop with the
// slices hoisted: about a tenth faster (BenchmarkChunkR1). TestFastPath
// keeps it equal to the general path.
func (e *Evaluator) evalOne(rows []float64, n int, o *Out) {
	k := e.k
	d := k.Dim()
	ptrs, br, set := e.allPtr[:d], &e.bolts[0], k.boltSet
	inv, fail, pre := o.Invalid[:n], o.Fail[:n], o.Preload[:n]
	for j := range n {
		setRow(ptrs, rows[j*d:j*d+d])
		model.EvaluateBolt(&e.in, &e.stiff, k.set, br)
		inv[j], fail[j], pre[j] = br.Invalid, br.Failures(set), br.Preload
	}
}

// detail writes sample j's safety factors, bolt forces and clamp forces.
// The joint's safety factor in a bolt mode is its worst bolt's; the worst
// is found by cross-multiplication (c_b·d_w < c_w·d_b, demands positive) so
// that a sample costs one division per mode, not one per bolt.
func (e *Evaluator) detail(o *Out, j, nm, nb int) {
	k := e.k
	sf := o.SF[j*nm : (j+1)*nm]
	for i, m := range k.modes {
		sf[i] = math.NaN()
		if !m.IsBolt() {
			if e.out.Active[m] {
				sf[i] = e.out.Capacity[m] / e.out.Demand[m]
			}
			continue
		}
		if uint(m) >= uint(model.NumModes) {
			continue // never: lets the compiler drop the bounds checks below
		}
		// The worst bolt's capacity and demand stay in registers.
		wc, wd, found := 0.0, 0.0, false
		for b := range e.bolts {
			br := &e.bolts[b]
			if !br.Active[m] {
				continue
			}
			if c, d := br.Capacity[m], br.Demand[m]; !found || c*wd < wc*d {
				wc, wd, found = c, d, true
			}
		}
		if found {
			sf[i] = wc / wd
		}
	}
	for b := range e.bolts {
		o.BoltForce[j*nb+b] = e.bolts[b].BoltForce
		o.Clamp[j*nb+b] = e.bolts[b].Clamp
	}
}

// margins writes the margin of every component: ln(capacity/demand), which
// is ≤ 0 exactly when the mode fails (model.Failed) and nearly linear in
// standard-normal space for the usual log-normal-like inputs; inactive
// components get a large positive margin, an invalid sample NaN.
func (e *Evaluator) margins(g []float64, invalid bool) {
	k := e.k
	if invalid {
		for i := range g {
			g[i] = math.NaN()
		}
		return
	}
	nbm := len(k.boltModes)
	for b := range e.bolts {
		br := &e.bolts[b]
		for i, m := range k.boltModes {
			g[b*nbm+i] = logMargin(br.Active[m], br.Capacity[m], br.Demand[m])
		}
	}
	for i, m := range k.jointModes {
		g[nbm*len(e.bolts)+i] = logMargin(e.out.Active[m], e.out.Capacity[m], e.out.Demand[m])
	}
}

// inactiveMargin stands for a component that cannot fail in a sample.
const inactiveMargin = 1e3

// logMargin is ln(c/d) with the predicate's sign: ≤ 0 exactly when
// model.Failed(c, d).
func logMargin(active bool, c, d float64) float64 {
	switch {
	case !active:
		return inactiveMargin
	case model.Failed(c, d):
		if c > 0 && d > 0 {
			return math.Log(c / d)
		}
		return -inactiveMargin
	case c > 0 && d > 0:
		return math.Max(math.Log(c/d), math.SmallestNonzeroFloat64)
	}
	return inactiveMargin // no demand: cannot fail
}
