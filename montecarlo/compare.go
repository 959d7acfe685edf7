package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sort"
	"time"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo/rng"
)

// Paired is the result of running several variants of one joint in lock
// step: every sample draws one set of variates, and each variant maps them
// through its own distributions (common random numbers), so that differences
// between variants are estimated from paired outcomes.
type Paired struct {
	Variants []*Result // one per problem, in order
	Modes    []model.Mode
	Samples  int64 // samples valid in every variant (the pairs)
	// Discordant pair counts of variant v against variant 0, indexed
	// [v][mode]; index model.NumModes is "any mode".
	OnlyBase, OnlyVariant [][model.NumModes + 1]int64
	Partial               bool
	Elapsed               time.Duration
}

// vgroup is one variant's group of inputs (shared or per bolt) fed from the
// sample's universe of variates: u[i] is the variate of item i.
type vgroup struct {
	group
	u []int
	z []float64 // the item's variates gathered from the universe
}

func (g *vgroup) apply(universe []float64) {
	for i, k := range g.u {
		g.z[i] = universe[k]
	}
	g.fromNormals(g.z)
}

// vstate is one variant's evaluation state inside a paired worker.
type vstate struct {
	pl      *plan
	in      model.Inputs
	shared  vgroup
	perBolt vgroup
	stiff   model.Stiffness
	bolts   []model.BoltResult
	out     model.Outcome
	set     model.ModeSet
	t       *tally
}

type pairedWorker struct {
	vs []*vstate
	// The universe's variates for one block, row by row as in worker:
	// zShared[j·nShared+i] and zBolt[bolt][j·nPerBolt+i] is variate i of
	// sample j.
	zShared           []float64
	zBolt             [][]float64
	nShared, nPerBolt int // universe sizes
	block             int
	pcg               rand.PCG
	onlyBase          [][model.NumModes + 1]int64
	onlyVariant       [][model.NumModes + 1]int64
	pairs             int64
	modes             []model.Mode
	binStride         int64 // as in worker
	_                 [64]byte
}

// drawBlock draws the variates of the next n samples in the order of
// worker.drawBlock, so that a variant whose inputs are the whole universe
// (normal or lognormal) sees the draws of a separate run with the same seed.
func (w *pairedWorker) drawBlock(n int) {
	rows := w.zShared[:n*w.nShared]
	for i := range w.nShared {
		rng.Normals(&w.pcg, rows[i:], w.nShared)
	}
	for _, zb := range w.zBolt {
		rows := zb[:n*w.nPerBolt]
		for i := range w.nPerBolt {
			rng.Normals(&w.pcg, rows[i:], w.nPerBolt)
		}
	}
}

// universe is the sorted union of the variants' uncertain input names.
type universe struct {
	shared, perBolt []string
}

func newUniverse(ps []*Problem) universe {
	sh, pb := map[string]bool{}, map[string]bool{}
	for _, p := range ps {
		for _, v := range p.Vars {
			if v.PerBolt() {
				pb[v.Name] = true
			} else {
				sh[v.Name] = true
			}
		}
	}
	keys := func(m map[string]bool) []string {
		out := make([]string, 0, len(m))
		for k := range m {
			out = append(out, k)
		}
		sort.Strings(out)
		return out
	}
	return universe{keys(sh), keys(pb)}
}

func indexOf(names []string, n string) int {
	i := sort.SearchStrings(names, n)
	if i < len(names) && names[i] == n {
		return i
	}
	return -1
}

func newVState(p *Problem, pl *plan, u universe, modes []model.Mode, r *Ranges) (*vstate, error) {
	st := &vstate{pl: pl, in: pl.base, set: model.SetOf(modes...), t: newTally(r)}
	build := func(idx []int, corr []Correlation, names []string) (vgroup, error) {
		g, err := pl.newGroup(p, idx, corr, &st.in)
		vg := vgroup{group: g, z: make([]float64, len(idx), len(idx)+8)}
		for _, i := range idx {
			vg.u = append(vg.u, indexOf(names, p.Vars[i].Name))
		}
		return vg, err
	}
	var err error
	if st.shared, err = build(pl.shared, pl.sharedCorr, u.shared); err != nil {
		return nil, err
	}
	if st.perBolt, err = build(pl.perBolt, pl.perBoltCorr, u.perBolt); err != nil {
		return nil, err
	}
	st.stiff = model.ComputeStiffness(&st.in)
	st.bolts = make([]model.BoltResult, pl.nBolts, pl.nBolts+2)
	return st, nil
}

// RunPaired runs the problems in lock step with common random numbers.
// They must have the same number of bolts. Only modes active at nominal
// values in every variant are compared. s.Target must be 0.
func RunPaired(ctx context.Context, ps []*Problem, s Settings) (*Paired, error) {
	if len(ps) < 2 {
		return nil, errors.New("a comparison needs at least two variants")
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if s.Target != 0 {
		return nil, errors.New("a comparison runs a fixed number of samples; the precision target does not apply")
	}
	if s.Confidence == 0 {
		s.Confidence = 0.95
	}
	if s.Workers == 0 {
		s.Workers = runtime.GOMAXPROCS(0)
	}
	start := time.Now()
	nb := ps[0].Base.Bolts
	plans := make([]*plan, len(ps))
	noms := make([]model.Outcome, len(ps))
	var common model.ModeSet = model.AllModes
	for i, p := range ps {
		if p.Base.Bolts != nb {
			return nil, fmt.Errorf("variant %d has %d bolts, variant 1 has %d: variants must be the same joint", i+1, p.Base.Bolts, nb)
		}
		pl, err := newPlan(p)
		if err != nil {
			return nil, err
		}
		pl.nBolts = nb // every variant evaluates every bolt, so that bolt b pairs with bolt b
		plans[i] = pl
		model.Evaluate(&p.Base, &noms[i])
		var act model.ModeSet
		for m := model.Mode(0); m < model.NumModes; m++ {
			if noms[i].Active[m] {
				act |= 1 << m
			}
		}
		common &= act
	}
	var modes []model.Mode
	for m := model.Mode(0); m < model.NumModes; m++ {
		if common.Has(m) && (s.Modes == nil || slices.Contains(s.Modes, m)) {
			modes = append(modes, m)
		}
	}
	// Common histogram ranges: the union of the variants' pilot ranges, so
	// that the preload distributions can be overlaid bin for bin.
	var ranges Ranges
	for i, p := range ps {
		r, err := pilotRanges(p, plans[i], s.Seed)
		if err != nil {
			return nil, err
		}
		if i == 0 {
			ranges = *r
			continue
		}
		for q := range ranges.Q {
			ranges.Q[q] = [2]float64{math.Min(ranges.Q[q][0], r.Q[q][0]), math.Max(ranges.Q[q][1], r.Q[q][1])}
		}
		for m := range ranges.SF {
			ranges.SF[m] = [2]float64{math.Min(ranges.SF[m][0], r.SF[m][0]), math.Max(ranges.SF[m][1], r.SF[m][1])}
		}
	}
	u := newUniverse(ps)
	workers := make([]*pairedWorker, s.Workers)
	for w := range workers {
		pw := &pairedWorker{modes: modes, nShared: len(u.shared), nPerBolt: len(u.perBolt), binStride: binStride(s.Samples),
			onlyBase: make([][model.NumModes + 1]int64, len(ps)), onlyVariant: make([][model.NumModes + 1]int64, len(ps))}
		drawnBolts := 0 // bolts drawing their own variates
		if pw.nPerBolt > 0 {
			drawnBolts = nb
		}
		pw.block = blockLen(pw.nShared + drawnBolts*pw.nPerBolt)
		pw.zShared = make([]float64, pw.nShared*pw.block, pw.nShared*pw.block+8) // spare room: no shared line
		pw.zBolt = make([][]float64, drawnBolts)
		for b := range pw.zBolt {
			pw.zBolt[b] = make([]float64, pw.nPerBolt*pw.block, pw.nPerBolt*pw.block+8)
		}
		for i, p := range ps {
			st, err := newVState(p, plans[i], u, modes, &ranges)
			if err != nil {
				return nil, err
			}
			pw.vs = append(pw.vs, st)
		}
		workers[w] = pw
	}
	totals, interrupted := schedule(ctx, s, len(workers), len(ps), nil, func(wi int, c, n int64, mom []moments) {
		workers[wi].runChunk(s.Seed, c, n, mom)
	})
	out := &Paired{Modes: modes, OnlyBase: make([][model.NumModes + 1]int64, len(ps)), OnlyVariant: make([][model.NumModes + 1]int64, len(ps))}
	for i := range ps {
		t := newTally(&ranges)
		for _, w := range workers {
			t.merge(w.vs[i].t)
		}
		r := &Result{Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, NBolts: nb, Nominal: noms[i], BinStride: workers[0].binStride}
		r.fill(t, modes, &totals[i])
		out.Variants = append(out.Variants, r)
		for _, w := range workers {
			for k := range out.OnlyBase[i] {
				out.OnlyBase[i][k] += w.onlyBase[i][k]
				out.OnlyVariant[i][k] += w.onlyVariant[i][k]
			}
		}
	}
	for _, w := range workers {
		out.Samples += w.pairs
	}
	out.Elapsed = time.Since(start)
	for _, r := range out.Variants {
		r.Elapsed = out.Elapsed
	}
	if interrupted {
		out.Partial = true
		for _, r := range out.Variants {
			r.Partial = true
		}
		return out, fmt.Errorf("%w after %d samples: %v", ErrInterrupted, out.Samples, context.Cause(ctx))
	}
	return out, nil
}

func (w *pairedWorker) runChunk(seed uint64, c, n int64, mom []moments) {
	rng.Seed(&w.pcg, seed, uint64(c))
	for _, st := range w.vs {
		st.t.hist = c%w.binStride == 0
	}
	fails := make([]model.ModeSet, len(w.vs))
	valid := make([]bool, len(w.vs))
	for j0 := int64(0); j0 < n; j0 += int64(w.block) {
		m := int(min(int64(w.block), n-j0))
		w.drawBlock(m)
		for j := range m {
			w.sample(j, fails, valid, mom)
		}
	}
}

// sample evaluates sample j of the drawn block in every variant and counts
// the discordant pairs.
func (w *pairedWorker) sample(j int, fails []model.ModeSet, valid []bool, mom []moments) {
	zs := w.zShared[j*w.nShared : (j+1)*w.nShared]
	for i, st := range w.vs {
		st.shared.apply(zs)
		if st.pl.stiffVaries {
			st.stiff = model.ComputeStiffness(&st.in)
		}
		for b := range st.bolts {
			if w.zBolt != nil {
				st.perBolt.apply(w.zBolt[b][j*w.nPerBolt : (j+1)*w.nPerBolt])
			}
			model.EvaluateBolt(&st.in, &st.stiff, st.set, &st.bolts[b])
		}
		model.EvaluateJoint(&st.in, &st.stiff, st.bolts, &st.out)
		fails[i] = st.t.add(w.modes, modeView{&st.out.Active, &st.out.Demand, &st.out.Capacity, &st.out.Invalid}, st.bolts, &mom[i])
		valid[i] = !st.out.Invalid
	}
	for _, v := range valid {
		if !v {
			return
		}
	}
	w.pairs++
	f0 := fails[0]
	for i := 1; i < len(w.vs); i++ {
		fi := fails[i]
		b, v := f0&^fi, fi&^f0
		for _, m := range w.modes {
			if b.Has(m) {
				w.onlyBase[i][m]++
			}
			if v.Has(m) {
				w.onlyVariant[i][m]++
			}
		}
		if f0 != 0 && fi == 0 {
			w.onlyBase[i][model.NumModes]++
		}
		if fi != 0 && f0 == 0 {
			w.onlyVariant[i][model.NumModes]++
		}
	}
}

// Difference compares a variant's failure probability with the base's from
// paired samples.
type Difference struct {
	D      float64 // p_variant − p_base
	Lo, Hi float64 // paired (Wald) interval of D at the confidence
	// UnpairedLo/Hi is the interval the same estimates would have from two
	// independent runs; the paired one is narrower when outcomes correlate.
	UnpairedLo, UnpairedHi float64
	Ratio                  float64 // p_variant/p_base; NaN when p_base = 0
	PValue                 float64 // exact McNemar test of equal probabilities
	Discordant             int64
}

// PairedDifference estimates the difference from n pairs in which the base
// failed alone nb times and the variant failed alone nv times; pb and pv are
// the two marginal proportions.
//
// The interval is the Wald interval for paired proportions,
// D ± z·√(((nb + nv)/n − D²)/n) (Agresti, Categorical Data Analysis, 2nd ed.,
// §10.1); the test is McNemar's exact conditional test, twice the smaller
// binomial tail of nv among nb + nv discordant pairs at p = ½ (McNemar 1947,
// Psychometrika 12:153).
func PairedDifference(n, nb, nv int64, pb, pv, conf float64) Difference {
	nf := float64(n)
	d := Difference{D: pv - pb, Discordant: nb + nv, Ratio: math.NaN()}
	if pb > 0 {
		d.Ratio = pv / pb
	}
	z := distuv.UnitNormal.Quantile(1 - (1-conf)/2)
	v := ((float64(nb)+float64(nv))/nf - d.D*d.D) / nf
	h := z * math.Sqrt(math.Max(v, 0))
	d.Lo, d.Hi = d.D-h, d.D+h
	hu := z * math.Sqrt(pb*(1-pb)/nf+pv*(1-pv)/nf)
	d.UnpairedLo, d.UnpairedHi = d.D-hu, d.D+hu
	if k := nb + nv; k == 0 {
		d.PValue = 1
	} else {
		bin := distuv.Binomial{N: float64(k), P: 0.5}
		d.PValue = math.Min(1, 2*bin.CDF(float64(min(nb, nv))))
	}
	return d
}
