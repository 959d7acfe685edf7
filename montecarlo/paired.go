package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"slices"
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/interval"
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
	// Pairs of variant v against variant 0 per mode, indexed [v][mode];
	// index model.NumModes is "any mode".
	Pairs [][model.NumModes + 1]interval.Pairs
	// Differences of variant v against variant 0 at the run's confidence,
	// indexed as Pairs (entries of modes not compared are zero).
	Differences [][model.NumModes + 1]interval.Difference
	Confidence  float64
	Partial     bool
	Elapsed     time.Duration
}

// Difference returns the paired comparison of variant v with the base for
// mode m (model.NumModes: any mode).
func (p *Paired) Difference(v int, m model.Mode) interval.Difference { return p.Differences[v][m] }

// universe is the layout of the variates all variants draw from: the names
// of the shared inputs, of the per-bolt inputs with a shared part, and of
// the per-bolt inputs, each with its native variate.
type universe struct {
	shared, parts, perBolt []string
	sharedN, perBoltN      []bool // native normal
	nBolts                 int
}

func (u *universe) dim() int {
	return len(u.shared) + len(u.parts) + u.nBolts*len(u.perBolt)
}

// newUniverse takes the base's inputs in their order, then inputs only other
// variants have; a variate is a normal if any variant needs it so.
func newUniverse(ks []*Kernel) *universe {
	u := &universe{}
	add := func(names *[]string, native *[]bool, name string, n bool) {
		if i := slices.Index(*names, name); i >= 0 {
			if native != nil {
				(*native)[i] = (*native)[i] || n
			}
			return
		}
		*names = append(*names, name)
		if native != nil {
			*native = append(*native, n)
		}
	}
	for _, k := range ks {
		for _, it := range k.shared {
			add(&u.shared, &u.sharedN, k.vars[it.v].Name, it.native)
		}
		for _, it := range k.perBolt {
			add(&u.perBolt, &u.perBoltN, k.vars[it.v].Name, it.native)
			if it.part >= 0 {
				add(&u.parts, nil, k.vars[it.v].Name, true)
			}
		}
		u.nBolts = max(u.nBolts, k.nBolts)
	}
	return u
}

// gather maps a variant's coordinates to the universe's: index[i] is the
// universe coordinate of the variant's coordinate i. The variant's items
// take the universe's native variates.
func (u *universe) gather(k *Kernel) []int {
	var idx []int
	for i := range k.shared {
		j := slices.Index(u.shared, k.vars[k.shared[i].v].Name)
		k.shared[i].native = u.sharedN[j]
		idx = append(idx, j)
	}
	for i := range k.perBolt {
		if k.perBolt[i].part >= 0 {
			idx = append(idx, len(u.shared)+slices.Index(u.parts, k.vars[k.perBolt[i].v].Name))
		}
	}
	base := len(u.shared) + len(u.parts)
	for b := range k.nBolts {
		for i := range k.perBolt {
			j := slices.Index(u.perBolt, k.vars[k.perBolt[i].v].Name)
			k.perBolt[i].native = u.perBoltN[j]
			idx = append(idx, base+b*len(u.perBolt)+j)
		}
	}
	return idx
}

// draw fills n rows of universe variates in the order of Kernel.Draw.
func (u *universe) draw(p *rand.PCG, rows []float64, n int) {
	d := u.dim()
	if d == 0 || n == 0 {
		return
	}
	rows = rows[:(n-1)*d+d]
	col := func(off int, native bool) {
		if native {
			rng.Normals(p, rows[off:], d)
			return
		}
		for j := off; j < len(rows); j += d {
			rows[j] = rng.Unit(p)
		}
	}
	for i := range u.shared {
		col(i, u.sharedN[i])
	}
	for i := range u.parts {
		col(len(u.shared)+i, true)
	}
	base := len(u.shared) + len(u.parts)
	for b := range u.nBolts {
		for i := range u.perBolt {
			col(base+b*len(u.perBolt)+i, u.perBoltN[i])
		}
	}
}

// variantState is one variant's evaluation inside a paired worker.
type variantState struct {
	k    *Kernel
	idx  []int
	ev   *Evaluator
	rows []float64
	out  *Out
	t    tally
	sk   *sketches
}

type pairedWorker struct {
	u         *universe
	vs        []*variantState
	urows     []float64
	block     int
	pcg       rand.PCG
	pairs     [][model.NumModes + 1]interval.Pairs
	n         int64
	modes     []model.Mode
	binStride int64
	_         [64]byte
}

// RunPaired runs the problems in lock step with common random numbers.
// They must have the same number of bolts. Only modes active at nominal
// values in every variant are compared; s.Precision must be 0. Each variant
// keeps its own distributions (its own sketch ranges).
func RunPaired(ctx context.Context, ps []*Problem, s Settings) (*Paired, error) {
	if len(ps) < 2 {
		return nil, errors.New("a comparison needs at least two variants")
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if s.Precision != 0 {
		return nil, errors.New("a comparison runs a fixed number of samples; the precision target does not apply")
	}
	s.defaults()
	start := time.Now()
	nb := ps[0].Base.Bolts
	common := model.AllModes
	for i, p := range ps {
		if p.Base.Bolts != nb {
			return nil, fmt.Errorf("variant %d has %d bolts, variant 1 has %d: variants must be the same joint", i+1, p.Base.Bolts, nb)
		}
		var nom model.Outcome
		model.Evaluate(&p.Base, &nom)
		var act model.ModeSet
		for m := range model.NumModes {
			if nom.Active[m] {
				act |= 1 << m
			}
		}
		common &= act
	}
	var modes []model.Mode
	for _, m := range common.Modes() {
		if s.Modes == nil || slices.Contains(s.Modes, m) {
			modes = append(modes, m)
		}
	}
	ks := make([]*Kernel, len(ps))
	for i, p := range ps {
		k, err := NewKernel(p, modes)
		if err != nil {
			return nil, err
		}
		if k.nBolts != nb && len(ps) > 1 {
			k.nBolts = nb // every variant evaluates every bolt, so that bolt b pairs with bolt b
		}
		ks[i] = k
	}
	u := newUniverse(ks)
	idx := make([][]int, len(ks))
	for i, k := range ks {
		idx[i] = u.gather(k)
	}
	// Each variant's own sketch ranges, from its own pilot.
	pilots := make([]*sketches, len(ks))
	stride := int64(0)
	if !s.ProbabilitiesOnly {
		stride = binStride(s.Samples)
		for i, k := range ks {
			pilots[i] = pilot(k, s.Seed)
		}
	}
	workers := make([]*pairedWorker, s.Workers)
	for w := range workers {
		pw := &pairedWorker{u: u, modes: modes, block: blockLen(u.dim()), binStride: stride,
			pairs: make([][model.NumModes + 1]interval.Pairs, len(ps))}
		pw.urows = make([]float64, max(u.dim(), 1)*pw.block, max(u.dim(), 1)*pw.block+8)
		for i, k := range ks {
			st := &variantState{k: k, idx: idx[i], ev: k.NewEvaluator(), out: k.NewOut(pw.block, Detail)}
			st.rows = make([]float64, max(k.Dim(), 1)*pw.block, max(k.Dim(), 1)*pw.block+8)
			if pilots[i] != nil {
				st.sk = pilots[i].empty()
			}
			pw.vs = append(pw.vs, st)
		}
		workers[w] = pw
	}
	totals, interrupted := schedule(ctx, s.Samples, len(workers), len(ps), s.Progress, nil, func(wi int, c int64, out []sums) {
		workers[wi].runChunk(s.Seed, c, chunkLen(c, s.Samples), out, nil)
	})
	out := &Paired{Modes: modes, Pairs: make([][model.NumModes + 1]interval.Pairs, len(ps))}
	for _, w := range workers {
		out.Samples += w.n
		for v := range ps {
			for m := range out.Pairs[v] {
				p, q := &out.Pairs[v][m], w.pairs[v][m]
				p.N += q.N
				p.Both += q.Both
				p.OnlyBase += q.OnlyBase
				p.OnlyVariant += q.OnlyVariant
			}
		}
	}
	for i, k := range ks {
		var t tally
		for _, w := range workers {
			t.merge(&w.vs[i].t)
		}
		r := &Result{Method: "crude", Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, NBolts: nb, Nominal: k.Nominal(), BinStride: stride}
		r.fill(&t, k, &totals[i], s.Interval)
		if pilots[i] != nil {
			merged := pilots[i].empty()
			for _, w := range workers {
				merged.merge(w.vs[i].sk)
			}
			r.setDistributions(merged)
			if !interrupted {
				v := i
				r.RefinePasses = refine(ctx, r, merged, len(workers), len(modes), nb, func(visit func(wi int, o *Out, m, off int)) bool {
					return binnedPass(ctx, s.Samples, stride, len(workers), func(wi int, c, n int64) {
						workers[wi].runChunk(s.Seed, c, n, nil, func(vi int, o *Out, m, off int) {
							if vi == v {
								visit(wi, o, m, off)
							}
						})
					})
				})
			}
		}
		r.Partial = interrupted
		out.Variants = append(out.Variants, r)
	}
	out.Confidence = s.Confidence
	out.Differences = make([][model.NumModes + 1]interval.Difference, len(ps))
	for v := 1; v < len(ps); v++ {
		for _, m := range modes {
			out.Differences[v][m] = interval.PairedDifference(out.Pairs[v][m], s.Confidence)
		}
		out.Differences[v][model.NumModes] = interval.PairedDifference(out.Pairs[v][model.NumModes], s.Confidence)
	}
	out.Partial = interrupted
	out.Elapsed = time.Since(start)
	for _, r := range out.Variants {
		r.Elapsed = out.Elapsed
	}
	if interrupted {
		return out, fmt.Errorf("%w after %d samples: %v", ErrInterrupted, out.Samples, context.Cause(ctx))
	}
	return out, nil
}

// runChunk evaluates chunk c in every variant. With visit set it is a
// second pass: the evaluated blocks go to visit and nothing is counted.
func (w *pairedWorker) runChunk(seed uint64, c, n int64, s []sums, visit func(v int, o *Out, m, off int)) {
	rng.Seed(&w.pcg, seed, uint64(c))
	hist := w.binStride > 0 && c%w.binStride == 0
	want := Want(0)
	if hist || visit != nil {
		want = Detail
	}
	du := w.u.dim()
	for j0 := int64(0); j0 < n; j0 += int64(w.block) {
		m := int(min(int64(w.block), n-j0))
		w.u.draw(&w.pcg, w.urows, m)
		for i, st := range w.vs {
			d := st.k.Dim()
			for j := range m {
				src, dst := w.urows[j*du:(j+1)*du], st.rows[j*d:(j+1)*d]
				for c, u := range st.idx {
					dst[c] = src[u]
				}
			}
			st.k.MapNative(st.rows, m)
			st.ev.Eval(st.rows, m, st.out, want)
			if visit != nil {
				visit(i, st.out, m, int(j0))
				continue
			}
			var sk *sketches
			if hist {
				sk = st.sk
			}
			st.t.add(st.out, m, st.k.nBolts, sk, int(j0), &s[i])
		}
		if visit == nil {
			w.countPairs(m)
		}
	}
}

// countPairs counts the paired outcomes of the block's m samples.
func (w *pairedWorker) countPairs(m int) {
	for j := range m {
		valid := true
		for _, st := range w.vs {
			valid = valid && !st.out.Invalid[j]
		}
		if !valid {
			continue
		}
		w.n++
		f0 := w.vs[0].out.Fail[j]
		for v := 1; v < len(w.vs); v++ {
			fv := w.vs[v].out.Fail[j]
			pr := &w.pairs[v]
			for _, md := range w.modes {
				pair(&pr[md], f0.Has(md), fv.Has(md))
			}
			pair(&pr[model.NumModes], f0 != 0, fv != 0)
		}
	}
}

func pair(p *interval.Pairs, base, variant bool) {
	p.N++
	switch {
	case base && variant:
		p.Both++
	case base:
		p.OnlyBase++
	case variant:
		p.OnlyVariant++
	}
}
