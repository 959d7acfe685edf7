package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/rng"
)

// ChunkSize is the number of samples drawn from one random stream. It is part
// of the reproducibility contract: changing it changes every seeded result.
const ChunkSize = 16384

// roundChunks is the number of chunks between two checks of the stopping
// rule (about 1 M samples); fixed so that where a run stops does not depend
// on the worker count. Runs without a stopping rule use rounds of
// freeRoundChunks, so that workers seldom wait for each other at the end
// of a round.
const (
	roundChunks     = 64
	freeRoundChunks = 1024
)

// histBins is the resolution of the histograms behind the percentiles.
const histBins = 400

// The histograms (percentiles, pictures) take every sample of runs up to
// 2·binTarget samples. Larger runs bin every k-th chunk, k = budget/binTarget
// up to maxBinStride: at least 2²¹ samples (or one in eight) are binned, far
// more than the 400-bin resolution needs, and the run is about a fifth
// faster. Failure counts always use every sample. Which chunks are binned
// depends only on the budget, so results stay independent of the workers.
const (
	binTarget    = 1 << 21
	maxBinStride = 8
)

// binStride returns the k above for a sample budget.
func binStride(samples int64) int64 { return min(max(samples/binTarget, 1), maxBinStride) }

// MaxSamples is the largest sample budget accepted.
const MaxSamples = 1e11

// Settings control a run. Zero values take the documented defaults.
type Settings struct {
	Samples    int64   // sample budget (required, ≥ 1)
	Seed       uint64  // seed of every random stream
	Workers    int     // goroutines; 0: runtime.GOMAXPROCS(0)
	Confidence float64 // two-sided confidence of the intervals; 0: 0.95
	// Target, if > 0, stops the run once every mode that has failed (and the
	// any-mode probability) has a relative interval half-width ≤ Target; the
	// check runs every 64 chunks (about 10⁶ samples). Samples stays the cap.
	Target float64
	// Progress, if set, is called after each chunk with the samples done and
	// the budget. It runs on a worker goroutine and must be quick and safe
	// for concurrent use.
	Progress func(done, total int64)
	// Modes, if set, restricts the tally to these modes (each must be active
	// at nominal values); nil: every active mode.
	Modes []model.Mode
	// ProbabilitiesOnly skips the histograms (percentiles, pictures) and the
	// pilot run that sizes them: studies that only need probabilities run
	// faster. Result histograms are then empty.
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
	if s.Target < 0 || s.Target >= 1 || math.IsNaN(s.Target) {
		return fmt.Errorf("target relative half-width must lie within (0, 1), got %g", s.Target)
	}
	if s.Workers < 0 || s.Workers > 1024 {
		return fmt.Errorf("workers must lie within 1 … 1024 (0 for all cores), got %d", s.Workers)
	}
	return nil
}

// Quantity names the tracked outputs with histograms.
type Quantity int

const (
	QPreload   Quantity = iota // residual preload of each bolt, N
	QBoltForce                 // largest bolt force of each bolt, N
	QClamp                     // residual clamp force under Pmax of each bolt, N
	numQuantities
)

var quantityKeys = [numQuantities]string{"preload_N", "bolt_force_N", "clamp_force_N"}

// Key returns the JSON key of the quantity.
func (q Quantity) Key() string { return quantityKeys[q] }

// Ranges are histogram ranges: one per tracked quantity and one per mode's
// safety factor.
type Ranges struct {
	Q  [numQuantities][2]float64
	SF [model.NumModes][2]float64
}

// ModeResult is the estimate for one failure mode.
type ModeResult struct {
	Mode      model.Mode
	Interval  Interval
	NominalSF float64   // deterministic safety factor at nominal inputs
	SF        Histogram // safety factor of the joint, per sample
	// BoltFailures counts bolt evaluations failing the mode (bolt modes of
	// joints whose bolts draw their own scatter); BoltSamples their number.
	BoltFailures, BoltSamples int64
}

// Result is the outcome of a run.
type Result struct {
	Samples int64 // valid samples evaluated
	Invalid int64 // samples outside the model's domain (counted, not used)
	// Binned is the number of valid samples in the histograms: Samples, or
	// those of every BinStride-th chunk in a large run (see binTarget).
	Binned     int64
	BinStride  int64
	Seed       uint64
	Workers    int
	Confidence float64
	Partial    bool // stopped early (interrupted) before the budget or target
	Converged  bool // the target was met
	Elapsed    time.Duration

	Nominal model.Outcome
	Modes   []ModeResult // modes active at nominal values (or those asked for), report order
	Any     Interval     // any reported mode
	Q       [numQuantities]Histogram
	// Mean and standard deviation of the residual preload over all bolts, N.
	PreloadMean, PreloadSD float64
	NBolts                 int // bolt evaluations per sample
}

// Mode returns the result of mode m, if reported.
func (r *Result) Mode(m model.Mode) (*ModeResult, bool) {
	for i := range r.Modes {
		if r.Modes[i].Mode == m {
			return &r.Modes[i], true
		}
	}
	return nil, false
}

// tally is the state a worker accumulates; all counts are integers, so
// summing tallies in any order gives identical results.
type tally struct {
	_                     [64]byte // keep other workers' data off these cache lines
	hist                  bool     // bin the current chunk into the histograms
	samples, invalid, any int64
	binned                int64 // valid samples binned
	fail                  [model.NumModes]int64
	boltFail              [model.NumModes]int64
	boltSamples           int64
	sf                    [model.NumModes]Histogram
	q                     [numQuantities]Histogram
	_                     [64]byte
}

func newTally(r *Ranges) *tally {
	t := &tally{}
	if r == nil {
		r = &Ranges{}
	}
	for m := range t.sf {
		t.sf[m] = NewHistogram(r.SF[m][0], r.SF[m][1], histBins)
	}
	for q := range t.q {
		t.q[q] = NewHistogram(r.Q[q][0], r.Q[q][1], histBins)
	}
	return t
}

func (t *tally) merge(o *tally) {
	t.samples += o.samples
	t.invalid += o.invalid
	t.binned += o.binned
	t.any += o.any
	t.boltSamples += o.boltSamples
	for m := range t.fail {
		t.fail[m] += o.fail[m]
		t.boltFail[m] += o.boltFail[m]
		t.sf[m].Merge(&o.sf[m])
	}
	for q := range t.q {
		t.q[q].Merge(&o.q[q])
	}
}

// moments are floating sums, kept per chunk and merged in chunk order so that
// the result does not depend on the worker count.
type moments struct {
	n, sum, ssq float64 // of the residual preload
}

// worker holds one goroutine's copy of the inputs and its random stream.
type worker struct {
	pl      *plan
	in      model.Inputs
	shared  group
	perBolt group
	// Values drawn ahead for one block of samples, one row of stride values
	// per sample: the shared inputs, then each bolt's inputs.
	rows   []float64
	stride int
	block  int // samples per block
	// simplePtrs are the fields of a row for evalSimple: the shared then the
	// per-bolt inputs' (one bolt evaluation per sample).
	simplePtrs []*float64
	stiff      model.Stiffness
	bolts      []model.BoltResult
	boltBuf    [4]model.BoltResult // backing store for small joints, inside the worker
	out        model.Outcome
	// The stream state lives inside the worker: a separately allocated 16-byte
	// PCG shares a cache line with another worker's and halves the speed.
	pcg   rand.PCG
	_     [64]byte
	modes []model.Mode // reported modes
	set   model.ModeSet
	t     *tally
	// binStride: the chunks binned into the histograms are those with
	// c % binStride == 0; 0 means no histograms.
	binStride int64
}

// newWorker returns a worker binning every binStride-th chunk into
// histograms over r; r nil means no histograms. A pilot worker (pilot set)
// keeps no tally.
func newWorker(p *Problem, pl *plan, modes []model.Mode, r *Ranges, binStride int64, pilot bool) (*worker, error) {
	w := &worker{pl: pl, in: pl.base, modes: modes, set: model.SetOf(modes...)}
	if r != nil {
		w.binStride = binStride
	}
	if modes == nil {
		w.set = model.AllModes
	}
	var err error
	if w.shared, err = pl.newGroup(p, pl.shared, pl.sharedCorr, &w.in); err != nil {
		return nil, err
	}
	if w.perBolt, err = pl.newGroup(p, pl.perBolt, pl.perBoltCorr, &w.in); err != nil {
		return nil, err
	}
	w.stiff = model.ComputeStiffness(&w.in)
	if pl.nBolts <= len(w.boltBuf) {
		w.bolts = w.boltBuf[:pl.nBolts]
	} else {
		w.bolts = make([]model.BoltResult, pl.nBolts, pl.nBolts+2) // spare room: no shared line
	}
	w.stride = len(pl.shared)
	if len(pl.perBolt) > 0 {
		w.stride += pl.nBolts * len(pl.perBolt)
	}
	w.block = blockLen(w.stride)
	w.rows = make([]float64, w.stride*w.block, w.stride*w.block+8) // spare room: no shared line
	w.simplePtrs = append(slices.Clip(w.shared.ptrs), w.perBolt.ptrs...)
	if !pilot {
		w.t = newTally(r)
	}
	return w, nil
}

// drawBlock draws the inputs of the next n ≤ w.block samples: the shared
// inputs, then each bolt's; within a group input by input, each input's n
// values in sample order. This order is part of the reproducibility contract.
func (w *worker) drawBlock(n int) {
	w.shared.fill(&w.pcg, w.rows, w.stride, n)
	if nb := len(w.perBolt.items); nb > 0 {
		for b := range w.bolts {
			w.perBolt.fill(&w.pcg, w.rows[len(w.shared.items)+b*nb:], w.stride, n)
		}
	}
}

// sample evaluates sample j of the drawn block into the bolt results (and
// w.out). It allocates nothing and calls no interface.
func (w *worker) sample(j int) {
	ns, nb := len(w.shared.items), len(w.perBolt.items)
	row := w.rows[j*w.stride : (j+1)*w.stride]
	w.shared.set(row[:ns])
	if w.pl.stiffVaries {
		w.stiff = model.ComputeStiffness(&w.in)
	}
	for b := range w.bolts {
		if nb > 0 {
			w.perBolt.set(row[ns+b*nb : ns+(b+1)*nb])
		}
		model.EvaluateBolt(&w.in, &w.stiff, w.set, &w.bolts[b])
	}
	if w.pl.needJoint {
		model.EvaluateJoint(&w.in, &w.stiff, w.bolts, &w.out)
	}
}

// view returns where the joint's modes are read after sample: the joint
// outcome, or the single bolt's result when the joint adds nothing to it.
func (w *worker) view() modeView {
	if w.pl.needJoint {
		return modeView{&w.out.Active, &w.out.Demand, &w.out.Capacity, &w.out.Invalid}
	}
	b := &w.bolts[0]
	return modeView{&b.Active, &b.Demand, &b.Capacity, &b.Invalid}
}

// modeView points at the activity, demand, capacity and validity of every
// mode of one evaluated sample.
type modeView struct {
	active   *[model.NumModes]bool
	demand   *[model.NumModes]float64
	capacity *[model.NumModes]float64
	invalid  *bool
}

// runChunk evaluates n samples of chunk c into the worker's tally and
// returns the chunk's floating sums.
func (w *worker) runChunk(seed uint64, c int64, n int64) moments {
	rng.Seed(&w.pcg, seed, uint64(c))
	w.t.hist = w.binStride > 0 && c%w.binStride == 0
	var mom moments
	v := w.view()
	simple := w.pl.nBolts == 1 && !w.pl.needJoint && !w.pl.stiffVaries
	for j0 := int64(0); j0 < n; j0 += int64(w.block) {
		m := int(min(int64(w.block), n-j0))
		w.drawBlock(m)
		if simple {
			w.evalSimple(m, v, &mom)
			continue
		}
		for j := range m {
			w.sample(j)
			w.t.add(w.modes, v, w.bolts, &mom)
		}
	}
	return mom
}

// evalSimple evaluates and tallies the m drawn samples of a block when a
// sample is one bolt evaluation of fixed stiffness read directly (most
// joints: one bolt, or identical bolts with no per-bolt scatter). It does
// what sample and add do, in one loop with the slices hoisted: about a tenth
// faster than calling sample (BenchmarkChunkR1). TestBoltViewMatchesJoint
// checks it against the general path.
func (w *worker) evalSimple(m int, v modeView, mom *moments) {
	k := w.stride
	rows, ptrs, b := w.rows[:m*k], w.simplePtrs[:k], &w.bolts[0]
	for j := range m {
		setRow(ptrs, rows[j*k:j*k+k])
		model.EvaluateBolt(&w.in, &w.stiff, w.set, b)
		w.t.add(w.modes, v, w.bolts, mom)
	}
}

// add tallies one evaluated sample and returns the set of modes it failed.
func (t *tally) add(modes []model.Mode, o modeView, bolts []model.BoltResult, mom *moments) model.ModeSet {
	if *o.invalid {
		t.invalid++
		return 0
	}
	t.samples++
	var failed model.ModeSet
	active, capacity, demand := o.active, o.capacity, o.demand
	for _, m := range modes {
		if active[m] && capacity[m] <= demand[m] {
			t.fail[m]++
			failed |= 1 << m
		}
	}
	if failed != 0 {
		t.any++
	}
	if t.hist {
		t.bin(modes, o, bolts)
	}
	for b := range bolts {
		f := bolts[b].Preload
		mom.n++
		mom.sum += f
		mom.ssq += f * f
	}
	if len(bolts) > 1 {
		t.boltFailures(modes, active, bolts)
	}
	return failed
}

// bin adds one valid sample to the histograms.
func (t *tally) bin(modes []model.Mode, o modeView, bolts []model.BoltResult) {
	t.binned++
	for _, m := range modes {
		if o.active[m] {
			t.sf[m].Add(o.capacity[m] / o.demand[m])
		}
	}
	for b := range bolts {
		br := &bolts[b]
		t.q[QPreload].Add(br.Preload)
		t.q[QBoltForce].Add(br.BoltForce)
		t.q[QClamp].Add(br.Clamp)
	}
}

// boltFailures counts the bolt evaluations failing each bolt mode.
func (t *tally) boltFailures(modes []model.Mode, active *[model.NumModes]bool, bolts []model.BoltResult) {
	t.boltSamples += int64(len(bolts))
	for _, m := range modes {
		if m > model.Fatigue || !active[m] {
			continue
		}
		for b := range bolts {
			if bolts[b].Capacity[m] <= bolts[b].Demand[m] {
				t.boltFail[m]++
			}
		}
	}
}

// schedule runs the chunks of a run on nw workers in rounds of roundChunks
// (freeRoundChunks without a stopping rule).
// job evaluates chunk c (n samples) on worker wi and writes k floating sums;
// sums are merged in chunk order, so they do not depend on the worker count.
// After each complete round, stop (if set) may end the run. It reports
// whether the context ended the run early.
func schedule(ctx context.Context, s Settings, nw, k int, stop func() bool, job func(wi int, c, n int64, mom []moments)) ([]moments, bool) {
	nChunks := (s.Samples + ChunkSize - 1) / ChunkSize
	round := int64(roundChunks)
	if stop == nil {
		round = freeRoundChunks
	}
	var done atomic.Int64
	slots := make([]moments, round*int64(k))
	finished := make([]bool, round)
	total := make([]moments, k)
	for r0 := int64(0); r0 < nChunks; r0 += round {
		r1 := min(r0+round, nChunks)
		var next atomic.Int64
		next.Store(r0)
		clear(finished)
		var wg sync.WaitGroup
		for wi := range nw {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for ctx.Err() == nil {
					c := next.Add(1) - 1
					if c >= r1 {
						return
					}
					n := min(int64(ChunkSize), s.Samples-c*ChunkSize)
					i := int(c - r0)
					job(wi, c, n, slots[i*k:(i+1)*k])
					finished[i] = true
					d := done.Add(n)
					if s.Progress != nil {
						s.Progress(d, s.Samples)
					}
				}
			}()
		}
		wg.Wait()
		interrupted := ctx.Err() != nil
		for i := range r1 - r0 {
			if !finished[i] {
				interrupted = true
				continue
			}
			for j := range k {
				m := slots[int(i)*k+j]
				total[j].n += m.n
				total[j].sum += m.sum
				total[j].ssq += m.ssq
			}
		}
		if interrupted {
			return total, true
		}
		if stop != nil && stop() {
			break
		}
	}
	return total, false
}

// ErrInterrupted wraps the context error of an interrupted run; the result
// returned with it is valid and marked Partial.
var ErrInterrupted = errors.New("montecarlo: run interrupted")

// Run samples the problem and estimates the failure probabilities. An
// interrupted run (ctx cancelled) returns the partial result together with an
// error wrapping ErrInterrupted.
func Run(ctx context.Context, p *Problem, s Settings) (*Result, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if s.Confidence == 0 {
		s.Confidence = 0.95
	}
	if s.Workers == 0 {
		s.Workers = runtime.GOMAXPROCS(0)
	}
	pl, err := newPlan(p)
	if err != nil {
		return nil, err
	}
	start := time.Now()
	res := &Result{Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, NBolts: pl.nBolts}
	model.Evaluate(&pl.base, &res.Nominal)
	modes := reportedModes(&res.Nominal)
	if s.Modes != nil {
		for _, m := range s.Modes {
			if m < 0 || m >= model.NumModes || !res.Nominal.Active[m] {
				return nil, fmt.Errorf("mode %v is not active for this joint", m)
			}
		}
		modes = append([]model.Mode(nil), s.Modes...)
		slices.Sort(modes)
		modes = slices.Compact(modes)
	}
	var ranges *Ranges
	if !s.ProbabilitiesOnly {
		ranges, err = pilotRanges(p, pl, s.Seed)
		if err != nil {
			return nil, err
		}
	}
	if ranges != nil {
		res.BinStride = binStride(s.Samples)
	}
	workers := make([]*worker, s.Workers)
	for i := range workers {
		if workers[i], err = newWorker(p, pl, modes, ranges, res.BinStride, false); err != nil {
			return nil, err
		}
	}
	var stop func() bool
	if s.Target > 0 {
		stop = func() bool {
			res.Converged = targetMet(sumTallies(workers), modes, s.Confidence, s.Target)
			return res.Converged
		}
	}
	totals, interrupted := schedule(ctx, s, len(workers), 1, stop, func(wi int, c, n int64, mom []moments) {
		mom[0] = workers[wi].runChunk(s.Seed, c, n)
	})
	total := totals[0]
	t := sumTallies(workers)
	res.fill(t, modes, &total)
	res.Partial = interrupted
	res.Elapsed = time.Since(start)
	if interrupted {
		return res, fmt.Errorf("%w after %d samples: %v", ErrInterrupted, res.Samples+res.Invalid, context.Cause(ctx))
	}
	return res, nil
}

func sumTallies(ws []*worker) *tally {
	t := newTally(&Ranges{})
	for m := range t.sf {
		t.sf[m] = cloneEmpty(&ws[0].t.sf[m])
	}
	for q := range t.q {
		t.q[q] = cloneEmpty(&ws[0].t.q[q])
	}
	for _, w := range ws {
		t.merge(w.t)
	}
	return t
}

func cloneEmpty(h *Histogram) Histogram { return NewHistogram(h.Lo, h.Hi, len(h.Counts)) }

func targetMet(t *tally, modes []model.Mode, conf, target float64) bool {
	if t.any == 0 {
		return false
	}
	if Wilson(t.any, t.samples, conf).RelHalfWidth() > target {
		return false
	}
	for _, m := range modes {
		if t.fail[m] > 0 && Wilson(t.fail[m], t.samples, conf).RelHalfWidth() > target {
			return false
		}
	}
	return true
}

func (res *Result) fill(t *tally, modes []model.Mode, mom *moments) {
	res.Samples, res.Invalid, res.Binned = t.samples, t.invalid, t.binned
	res.Any = Wilson(t.any, t.samples, res.Confidence)
	for _, m := range modes {
		mr := ModeResult{Mode: m, Interval: Wilson(t.fail[m], t.samples, res.Confidence), SF: t.sf[m]}
		if res.Nominal.Active[m] {
			mr.NominalSF = res.Nominal.SafetyFactor(m)
		}
		if res.NBolts > 1 && m <= model.Fatigue {
			mr.BoltFailures, mr.BoltSamples = t.boltFail[m], t.boltSamples
		}
		res.Modes = append(res.Modes, mr)
	}
	res.Q = t.q
	if mom.n > 0 {
		res.PreloadMean = mom.sum / mom.n
		res.PreloadSD = math.Sqrt(math.Max(mom.ssq/mom.n-res.PreloadMean*res.PreloadMean, 0))
	}
}

// reportedModes are the modes active at nominal values.
func reportedModes(nom *model.Outcome) []model.Mode {
	var out []model.Mode
	for m := model.Mode(0); m < model.NumModes; m++ {
		if nom.Active[m] {
			out = append(out, m)
		}
	}
	return out
}

// pilotSamples is the size of the pilot run that fixes histogram ranges.
const pilotSamples = 4096

// pilotRanges runs a small pilot on its own stream and sets each histogram
// to the pilot's range widened by 10 % on each side.
func pilotRanges(p *Problem, pl *plan, seed uint64) (*Ranges, error) {
	w, err := newWorker(p, pl, nil, nil, 0, true)
	if err != nil {
		return nil, err
	}
	rng.Seed(&w.pcg, seed, math.MaxUint64)
	var lo, hi Ranges
	for q := range lo.Q {
		lo.Q[q] = [2]float64{math.Inf(1), math.Inf(-1)}
	}
	for m := range lo.SF {
		lo.SF[m] = [2]float64{math.Inf(1), math.Inf(-1)}
	}
	upd := func(r *[2]float64, v float64) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return
		}
		r[0] = math.Min(r[0], v)
		r[1] = math.Max(r[1], v)
	}
	v := w.view()
	for j := range pilotSamples {
		if j%w.block == 0 {
			w.drawBlock(w.block)
		}
		w.sample(j % w.block)
		if *v.invalid {
			continue
		}
		for m := range model.NumModes {
			if v.active[m] {
				upd(&lo.SF[m], v.capacity[m]/v.demand[m])
			}
		}
		for b := range w.bolts {
			br := &w.bolts[b]
			upd(&lo.Q[QPreload], br.Preload)
			upd(&lo.Q[QBoltForce], br.BoltForce)
			upd(&lo.Q[QClamp], br.Clamp)
		}
	}
	widen := func(r [2]float64, floor0 bool) [2]float64 {
		if r[0] > r[1] { // no finite value seen
			return [2]float64{0, 1}
		}
		span := r[1] - r[0]
		if span == 0 {
			span = math.Max(math.Abs(r[0])*0.01, 1e-9)
		}
		a, b := r[0]-0.1*span, r[1]+0.1*span
		if floor0 && a < 0 && r[0] >= 0 {
			a = 0
		}
		return [2]float64{a, b}
	}
	for q := range hi.Q {
		hi.Q[q] = widen(lo.Q[q], q != int(QClamp))
	}
	for m := range hi.SF {
		hi.SF[m] = widen(lo.SF[m], true)
	}
	return &hi, nil
}
