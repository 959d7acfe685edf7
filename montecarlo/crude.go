package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/bits"
	"math/rand/v2"
	"runtime"
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
	"boltrisk/montecarlo/rng"
)

// MaxSamples is the largest sample budget accepted.
const MaxSamples = 1e11

// The histograms (percentiles, pictures) take every sample of runs up to
// 2·binTarget samples. Larger runs bin every k-th chunk, k = budget/binTarget
// up to maxBinStride: at least 2²⁰ samples (or one in 64) are binned, far
// more than a rank error of 0.1 % needs, and the run is faster. Failure
// counts always use every sample. Which chunks are binned depends only on
// the budget, so results stay independent of the workers.
const (
	binTarget    = 1 << 20
	maxBinStride = 64
)

// binStride returns the k above for a sample budget.
func binStride(samples int64) int64 { return min(max(samples/binTarget, 1), maxBinStride) }

// Settings control a run. Zero values take the documented defaults.
type Settings struct {
	Samples    int64   // sample budget (required, ≥ 1); the cap when Precision is set
	Seed       uint64  // seed of every random stream
	Workers    int     // goroutines; 0: runtime.GOMAXPROCS(0)
	Confidence float64 // two-sided confidence of the intervals; 0: 0.95
	// Precision, if > 0, stops the run once the coefficient of variation
	// of every reported probability — each mode that has failed, and any
	// mode — is at most Precision; checked every 64 chunks (about 10⁶
	// samples), so where a run stops does not depend on the workers.
	Precision float64
	// Method selects the estimator of Estimate (Run is always crude).
	Method Method
	// Repeats is the number of independent subset-simulation runs per
	// round, whose spread gives its c.o.v. (0: rare.DefaultRuns, 20).
	Repeats int
	// FixedSamples makes importance sampling draw exactly Samples (no
	// precision stop), as the parts of a split run do.
	FixedSamples bool
	// Interval selects the interval of each probability (default Auto:
	// exact below 20 failures, Wilson above, one-sided when none failed).
	Interval interval.Method
	// Progress, if set, is called after each chunk with the samples done and
	// the budget. It runs on a worker goroutine and must be quick and safe
	// for concurrent use.
	Progress func(done, total int64)
	// Modes, if set, restricts the tally to these modes (each must be active
	// at nominal values); nil: every active mode.
	Modes []model.Mode
	// ProbabilitiesOnly skips the histograms (percentiles, pictures) and the
	// pilot run that sizes them: studies that only need probabilities run
	// faster. Result distributions are then empty.
	ProbabilitiesOnly bool
}

// Validate checks the settings.
func (s *Settings) Validate() error {
	if s.Samples < 1 || s.Samples > MaxSamples {
		return fmt.Errorf("samples must lie within 1 … %.0e, got %d", float64(MaxSamples), s.Samples)
	}
	if s.Confidence != 0 && !(s.Confidence > 0 && s.Confidence < 1) {
		return fmt.Errorf("confidence must lie strictly between 0 and 1, got %g", s.Confidence)
	}
	if s.Precision < 0 || s.Precision >= 1 || math.IsNaN(s.Precision) {
		return fmt.Errorf("precision (target coefficient of variation) must lie within (0, 1), got %g", s.Precision)
	}
	if s.Workers < 0 || s.Workers > 1024 {
		return fmt.Errorf("workers must lie within 1 … 1024 (0 for all cores), got %d", s.Workers)
	}
	if s.Repeats != 0 && (s.Repeats < 2 || s.Repeats > 10000) {
		return fmt.Errorf("repeats (independent subset-simulation runs) must lie within 2 … 10000, got %d", s.Repeats)
	}
	return nil
}

// WithDefaults returns the settings with the documented defaults filled in
// (confidence 0.95, all cores).
func (s Settings) WithDefaults() Settings { s.defaults(); return s }

func (s *Settings) defaults() {
	if s.Confidence == 0 {
		s.Confidence = 0.95
	}
	if s.Workers == 0 {
		s.Workers = runtime.GOMAXPROCS(0)
	}
}

// ErrInterrupted wraps the context error of an interrupted run; the result
// returned with it is valid and marked Partial.
var ErrInterrupted = errors.New("montecarlo: run interrupted")

// tally is what a worker counts; all counts are integers, so summing
// tallies in any order gives identical results.
type tally struct {
	samples, invalid, any int64
	binned                int64 // valid samples binned
	fail                  [model.NumModes]int64
	boltFail              [model.NumModes]int64
	boltSamples           int64
	cs                    caseTally // per load case (none without cases)
}

func (t *tally) merge(o *tally) {
	t.samples += o.samples
	t.invalid += o.invalid
	t.binned += o.binned
	t.any += o.any
	t.boltSamples += o.boltSamples
	t.cs.merge(&o.cs)
	for m := range t.fail {
		t.fail[m] += o.fail[m]
		t.boltFail[m] += o.boltFail[m]
	}
}

// add counts n evaluated samples of o; with sketches it bins them too
// (first the sample number off of the chunk, which picks the bolt whose
// forces are binned). The preload sums go to s.
func (t *tally) add(o *Out, n, nb int, sk *sketches, off int, s *sums) {
	if o.CaseFail != nil {
		t.cs.add(o, n, len(o.CaseFail)/len(o.Invalid))
	}
	if nb == 1 && sk == nil {
		t.addOne(o, n, s)
		return
	}
	for j := range n {
		if o.Invalid[j] {
			t.invalid++
			continue
		}
		t.samples++
		if f := o.Fail[j]; f != 0 {
			t.any++
			for ; f != 0; f &= f - 1 {
				t.fail[bits.TrailingZeros16(uint16(f))]++
			}
		}
		for _, f := range o.Preload[j*nb : (j+1)*nb] {
			s.n++
			s.sum += f
			s.ssq += f * f
		}
		if nb > 1 {
			t.boltSamples += int64(nb)
			for _, f := range o.BoltFail[j*nb : (j+1)*nb] {
				for ; f != 0; f &= f - 1 {
					t.boltFail[bits.TrailingZeros16(uint16(f))]++
				}
			}
		}
		if sk != nil {
			t.binned++
			sk.add(o, j, nb, (off+j)%nb)
		}
	}
}

// addOne is add for one bolt evaluation per sample and no sketches.
func (t *tally) addOne(o *Out, n int, s *sums) {
	inv, fail, pre := o.Invalid[:n], o.Fail[:n], o.Preload[:n]
	for j := range n {
		if inv[j] {
			t.invalid++
			continue
		}
		t.samples++
		if f := fail[j]; f != 0 {
			t.any++
			for ; f != 0; f &= f - 1 {
				t.fail[bits.TrailingZeros16(uint16(f))]++
			}
		}
		v := pre[j]
		s.n++
		s.sum += v
		s.ssq += v * v
	}
}

// sketches are the distributions a worker bins: the forces of one bolt per
// sample (in turn, bolt (sample number mod bolts): the bolts are
// exchangeable, so this samples the distribution of any bolt without
// binning every bolt of every sample) and each reported mode's safety
// factor (of the joint).
type sketches struct {
	q  [NumQuantities]quantile.Sketch
	sf []quantile.Sketch // per reported mode
}

func (sk *sketches) add(o *Out, j, nb, bolt int) {
	b := j*nb + bolt
	sk.q[QPreload].Add(o.Preload[b])
	sk.q[QBoltForce].Add(o.BoltForce[b])
	sk.q[QClamp].Add(o.Clamp[b])
	nm := len(sk.sf)
	for i, v := range o.SF[j*nm : (j+1)*nm] {
		if v == v { // NaN: the mode was inactive in this sample
			sk.sf[i].Add(v)
		}
	}
}

func (sk *sketches) empty() *sketches {
	e := &sketches{sf: make([]quantile.Sketch, len(sk.sf))}
	for q := range sk.q {
		e.q[q] = sk.q[q].Empty()
	}
	for i := range sk.sf {
		e.sf[i] = sk.sf[i].Empty()
	}
	return e
}

func (sk *sketches) merge(o *sketches) {
	for q := range sk.q {
		sk.q[q].Merge(&o.q[q])
	}
	for i := range sk.sf {
		sk.sf[i].Merge(&o.sf[i])
	}
}

// all returns every sketch, quantities first then the modes'.
func (sk *sketches) all() []*quantile.Sketch {
	out := make([]*quantile.Sketch, 0, int(NumQuantities)+len(sk.sf))
	for q := range sk.q {
		out = append(out, &sk.q[q])
	}
	for i := range sk.sf {
		out = append(out, &sk.sf[i])
	}
	return out
}

// sampleValue hands f sketch number i's value of sample j, whose forces
// come from the given bolt (see sketches), if it has one.
func sampleValue(o *Out, i, j, nb, nm, bolt int, f func(float64)) {
	b := j*nb + bolt
	switch {
	case i == int(QPreload):
		f(o.Preload[b])
	case i == int(QBoltForce):
		f(o.BoltForce[b])
	case i == int(QClamp):
		f(o.Clamp[b])
	default:
		if v := o.SF[j*nm+i-int(NumQuantities)]; v == v {
			f(v)
		}
	}
}

// blockValues bounds the values drawn ahead per worker (all inputs of one
// block): 8192 float64, 64 KiB, stays in the core's cache.
const blockValues = 8192

// blockLen returns the number of samples drawn per block for a problem
// with cols coordinates per sample: 256 (a divisor of ChunkSize), fewer for
// joints with many bolts. It is part of the reproducibility contract.
func blockLen(cols int) int {
	n := 256
	for n > 1 && n*cols > blockValues {
		n /= 2
	}
	return n
}

// crudeWorker holds one goroutine's evaluator, random stream, block buffers
// and counts.
type crudeWorker struct {
	k     *Kernel
	ev    *Evaluator
	rows  []float64
	out   *Out
	block int
	// The stream state lives inside the worker: a separately allocated
	// 16-byte PCG shares a cache line with another worker's and halves the
	// speed.
	pcg       rand.PCG
	t         tally
	sk        *sketches // nil: no histograms
	binStride int64
	_         [64]byte
}

// newCrudeWorkers returns the settings' workers of a crude run, each with
// empty sketches shaped by the pilot (sk; nil and stride 0 for a run of
// probabilities only), and the bin stride of the budget.
func newCrudeWorkers(k *Kernel, s Settings) (sk *sketches, stride int64, workers []*crudeWorker) {
	if !s.ProbabilitiesOnly {
		sk = pilot(k, s.Seed)
		stride = binStride(s.Samples)
	}
	workers = make([]*crudeWorker, s.Workers)
	for i := range workers {
		var own *sketches
		if sk != nil {
			own = sk.empty()
		}
		workers[i] = newCrudeWorker(k, own, stride)
	}
	return sk, stride, workers
}

func newCrudeWorker(k *Kernel, sk *sketches, stride int64) *crudeWorker {
	w := &crudeWorker{k: k, ev: k.NewEvaluator(), block: blockLen(k.Dim()), sk: sk, binStride: stride}
	d := k.Dim()
	w.rows = make([]float64, max(d, 1)*w.block, max(d, 1)*w.block+8) // spare room: no shared cache line
	w.out = k.NewOut(w.block, Detail)
	return w
}

// runChunk evaluates chunk c (n samples) into the worker's counts and
// returns the chunk's floating sums.
func (w *crudeWorker) runChunk(seed uint64, c, n int64) sums {
	rng.Seed(&w.pcg, seed, uint64(c))
	var sk *sketches
	want := Want(0)
	if w.sk != nil && c%w.binStride == 0 {
		sk, want = w.sk, Detail
	}
	var s sums
	for j0 := int64(0); j0 < n; j0 += int64(w.block) {
		m := int(min(int64(w.block), n-j0))
		w.k.Draw(&w.pcg, w.rows, m)
		w.k.MapNative(w.rows, m)
		w.ev.Eval(w.rows, m, w.out, want)
		w.t.add(w.out, m, w.k.nBolts, sk, int(j0), &s)
	}
	return s
}

// Run samples the problem by crude Monte Carlo and estimates the failure
// probabilities. An interrupted run (ctx cancelled) returns the partial
// result together with an error wrapping ErrInterrupted.
func Run(ctx context.Context, p *Problem, s Settings) (*Result, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	s.defaults()
	k, err := NewKernel(p, s.Modes)
	if err != nil {
		return nil, err
	}
	return runCrude(ctx, k, s)
}

func runCrude(ctx context.Context, k *Kernel, s Settings) (*Result, error) {
	start := time.Now()
	res := &Result{Method: "crude", Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, Precision: s.Precision,
		NBolts: k.nBolts, Nominal: k.Nominal()}
	sk, stride, workers := newCrudeWorkers(k, s)
	res.BinStride = stride
	var stop func() bool
	if s.Precision > 0 {
		stop = func() bool {
			var t tally
			for _, w := range workers {
				t.merge(&w.t)
			}
			res.Converged = precisionMet(&t, k.modes, s.Precision)
			return res.Converged
		}
	}
	totals, interrupted := schedule(ctx, s.Samples, len(workers), 1, s.Progress, stop, func(wi int, c int64, out []sums) {
		out[0] = workers[wi].runChunk(s.Seed, c, chunkLen(c, s.Samples))
	})
	var t tally
	for _, w := range workers {
		t.merge(&w.t)
	}
	res.fill(&t, k, &totals[0], s.Interval)
	res.Partial = interrupted
	if sk != nil {
		merged := sk.empty()
		for _, w := range workers {
			merged.merge(w.sk)
		}
		res.setDistributions(merged)
		if !interrupted {
			res.RefinePasses = refine(ctx, res, merged, len(workers), len(k.modes), k.nBolts, crudePass(ctx, k, s, res.BinStride, workers))
		}
	}
	res.Elapsed = time.Since(start)
	if interrupted {
		return res, fmt.Errorf("%w after %d samples: %v", ErrInterrupted, res.Samples+res.Invalid, context.Cause(ctx))
	}
	return res, nil
}

// precisionMet reports whether the c.o.v. of the any-mode probability and
// of every mode that has failed is at most target.
func precisionMet(t *tally, modes []model.Mode, target float64) bool {
	if t.any == 0 {
		return false
	}
	cov := func(k int64) float64 {
		p := float64(k) / float64(t.samples)
		return math.Sqrt((1 - p) / (float64(t.samples) * p))
	}
	if cov(t.any) > target {
		return false
	}
	for _, m := range modes {
		if t.fail[m] > 0 && cov(t.fail[m]) > target {
			return false
		}
	}
	return true
}

func (res *Result) fill(t *tally, k *Kernel, s *sums, method interval.Method) {
	res.Samples, res.Invalid, res.Binned = t.samples, t.invalid, t.binned
	res.Evaluations = t.samples + t.invalid
	res.Any = interval.Proportion(t.any, t.samples, res.Confidence, method)
	for _, m := range k.modes {
		mr := ModeResult{Mode: m, Estimate: interval.Proportion(t.fail[m], t.samples, res.Confidence, method)}
		if nom := &res.Nominal.Outcome; nom.Active[m] {
			mr.NominalSF = nom.SafetyFactor(m)
		}
		if k.nBolts > 1 && m.IsBolt() {
			mr.Bolt = interval.Proportion(t.boltFail[m], t.boltSamples, res.Confidence, method)
		}
		res.Modes = append(res.Modes, mr)
	}
	res.fillCases(&t.cs, k, t.samples, method)
	if s.n > 0 {
		res.PreloadMean = s.sum / s.n
		res.PreloadSD = math.Sqrt(math.Max(s.ssq/s.n-res.PreloadMean*res.PreloadMean, 0))
	}
}

// setDistributions stores the merged sketches and their first-pass
// percentiles in the result.
func (res *Result) setDistributions(sk *sketches) {
	pct := func(h *quantile.Sketch) []quantile.Percentile {
		out := make([]quantile.Percentile, len(Levels))
		for i, l := range Levels {
			out[i] = h.Quantile(l)
		}
		return out
	}
	for q := range sk.q {
		res.Quantities[q] = Distribution{Sketch: sk.q[q], Percentiles: pct(&sk.q[q])}
	}
	for i := range res.Modes {
		res.Modes[i].SF = Distribution{Sketch: sk.sf[i], Percentiles: pct(&sk.sf[i])}
	}
}

// distribution returns the result's distribution of sketch number i
// (quantities first, then the modes').
func (res *Result) distribution(i int) *Distribution {
	if i < int(NumQuantities) {
		return &res.Quantities[i]
	}
	return &res.Modes[i-int(NumQuantities)].SF
}

// pilotSamples is the size of the pilot run that sizes the sketches.
const pilotSamples = 4096

// pilot runs a small pilot on its own stream and sizes each sketch from
// its values (quantile.FromPilot).
func pilot(k *Kernel, seed uint64) *sketches {
	ev := k.NewEvaluator()
	block := blockLen(k.Dim())
	d := max(k.Dim(), 1)
	rows := make([]float64, d*block)
	o := k.NewOut(block, Detail)
	var p rand.PCG
	rng.Seed(&p, seed, math.MaxUint64)
	nm, nb := len(k.modes), k.nBolts
	vals := make([][]float64, int(NumQuantities)+nm)
	for done := 0; done < pilotSamples; done += block {
		k.Draw(&p, rows, block)
		k.MapNative(rows, block)
		ev.Eval(rows, block, o, Detail)
		for j := range block {
			if o.Invalid[j] {
				continue
			}
			for i := range vals {
				for b := range nb {
					sampleValue(o, i, j, nb, nm, b, func(v float64) { vals[i] = append(vals[i], v) })
				}
			}
		}
	}
	sk := &sketches{sf: make([]quantile.Sketch, nm)}
	for i := range vals {
		h := quantile.FromPilot(vals[i], quantile.Bins)
		if i < int(NumQuantities) {
			sk.q[i] = h
		} else {
			sk.sf[i-int(NumQuantities)] = h
		}
	}
	return sk
}

// maxRefinePasses bounds the second passes of a run; each divides the
// width of a loose cell by quantile.Bins.
const maxRefinePasses = 3

// refiner is one percentile being refined: sketch i, level l, the cell
// that holds it and the fine sketch of that cell's values.
type refiner struct {
	i, l int
	cell quantile.Cell
	fine quantile.Sketch
	own  []quantile.Sketch // per worker
}

// refine tightens every percentile whose rank error exceeds RankTolerance
// by a second pass over the binned samples (the same streams give the same
// samples), counting the values of each loose cell in fine bins. pass runs
// one such pass on nw workers, handing each evaluated block to visit; it
// reports whether it was interrupted. refine returns the passes run.
func refine(ctx context.Context, res *Result, sk *sketches, nw, nm, nb int, pass func(visit func(wi int, o *Out, m, off int)) bool) int {
	all := sk.all()
	passes := 0
	for passes < maxRefinePasses && ctx.Err() == nil {
		var rs []*refiner
		for i := range all {
			d := res.distribution(i)
			for l, p := range d.Percentiles {
				if p.RankError > RankTolerance && p.Cell.Count > 1 && !math.IsInf(p.Cell.Hi-p.Cell.Lo, 0) {
					r := &refiner{i: i, l: l, cell: p.Cell, fine: quantile.Refine(p.Cell, quantile.Bins)}
					for range nw {
						r.own = append(r.own, r.fine.Empty())
					}
					rs = append(rs, r)
				}
			}
		}
		if len(rs) == 0 {
			return passes
		}
		passes++
		interrupted := pass(func(wi int, o *Out, m, off int) {
			for j := range m {
				if o.Invalid[j] {
					continue
				}
				for _, r := range rs {
					fine := &r.own[wi]
					sampleValue(o, r.i, j, nb, nm, (off+j)%nb, func(v float64) {
						if fine.Contains(v) {
							fine.Add(v)
						}
					})
				}
			}
		})
		if interrupted {
			return passes
		}
		for _, r := range rs {
			for wi := range r.own {
				r.fine.Merge(&r.own[wi])
			}
			res.distribution(r.i).Percentiles[r.l] = r.fine.QuantileWithin(Levels[r.l], r.cell.Below, all[r.i].Total())
		}
	}
	return passes
}

// binnedPass runs job on every binned chunk of a budget (those a run with
// this stride binned), on nw workers; it reports whether ctx ended it.
func binnedPass(ctx context.Context, samples, stride int64, nw int, job func(wi int, c, n int64)) bool {
	nChunks := chunks(samples)
	binned := (nChunks + stride - 1) / stride
	_, interrupted := schedule(ctx, binned*ChunkSize, nw, 1, nil, nil, func(wi int, bc int64, _ []sums) {
		if c := bc * stride; c < nChunks {
			job(wi, c, chunkLen(c, samples))
		}
	})
	return interrupted
}

// crudePass is the second pass of a crude run: the binned chunks evaluated
// again by the workers.
func crudePass(ctx context.Context, k *Kernel, s Settings, stride int64, workers []*crudeWorker) func(visit func(wi int, o *Out, m, off int)) bool {
	return func(visit func(wi int, o *Out, m, off int)) bool {
		return binnedPass(ctx, s.Samples, stride, len(workers), func(wi int, c, n int64) {
			w := workers[wi]
			rng.Seed(&w.pcg, s.Seed, uint64(c))
			for j0 := int64(0); j0 < n; j0 += int64(w.block) {
				m := int(min(int64(w.block), n-j0))
				k.Draw(&w.pcg, w.rows, m)
				k.MapNative(w.rows, m)
				w.ev.Eval(w.rows, m, w.out, Detail)
				visit(wi, w.out, m, int(j0))
			}
		})
	}
}
