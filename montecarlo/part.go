package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"sync"
	"sync/atomic"
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/rare"
)

// Parts: a crude run split into N parts that run on their own (one task of
// a batch cluster's job array each) and merge to the bits of the run on
// one machine.
//
// The assignment of chunks to parts is fixed and part of the
// reproducibility contract: of the C = ⌈samples/ChunkSize⌉ chunks of a
// budget, part K of N (K counting from 1) runs the contiguous block
//
//	[⌊(K−1)·C/N⌋, ⌊K·C/N⌋)
//
// so every part is reproducible on its own, the blocks tile 0 … C−1 in
// order, and their sizes differ by at most one chunk. Every chunk draws
// from its own stream (rng.Seed(seed, chunk)), so a chunk gives the same
// samples whichever part runs it. A part keeps integer counts (exact in
// any order), the sketches' integer bin counts and extremes (exact in any
// order), and the floating sums of each of its chunks, which the merge
// adds in chunk order as the one-machine run does.

// MaxParts bounds the parts of a run.
const MaxParts = 1 << 20

// PartChunks returns the chunk block [c0, c1) of part k of n (k from 1)
// of a budget of samples.
func PartChunks(samples int64, k, n int) (c0, c1 int64) { return partBlock(chunks(samples), k, n) }

// ChunkSum is the floating sums of one chunk: count, sum and sum of squares
// of the residual preload of its bolt evaluations.
type ChunkSum struct{ N, Sum, SSQ float64 }

// SketchState is a sketch's integer counts and extremes; its bins come
// from the pilot, which every part and the merge recompute from the seed.
type SketchState struct {
	Counts                               []int64
	Under, Over                          int64
	UnderMin, UnderMax, OverMin, OverMax float64
	Lowest, Highest                      float64
}

// PartState is what one part of a crude run found: everything the merge
// needs, and nothing that depends on the workers.
type PartState struct {
	Method      string // "crude"
	MethodNote  string // auto's choice, made before the split
	Part, Parts int    // K of N, K from 1
	// FirstChunk, EndChunk: the part's chunk block [FirstChunk, EndChunk).
	FirstChunk, EndChunk int64
	Samples, Invalid     int64
	Any, Binned          int64
	BoltSamples          int64
	Fail, BoltFail       [model.NumModes]int64
	// CaseFail and CaseAny count failures per load case (none without
	// cases).
	CaseFail  [][model.NumModes]int64
	CaseAny   []int64
	BinStride int64
	// Chunks holds the floating sums of each chunk of the block, in order.
	Chunks []ChunkSum
	// Sketches: the quantities', then each reported mode's (empty without
	// histograms).
	Sketches []SketchState
	// Rare holds the sums of each importance-sampling chunk of the block
	// (Method "importance"; its chunks are rare.ImportanceSettings'
	// ChunkSize samples, not ChunkSize).
	Rare    []rare.ChunkSums
	Elapsed time.Duration
}

// ValidatePart checks a part index k of n.
func ValidatePart(k, n int) error {
	if n < 1 || n > MaxParts {
		return fmt.Errorf("the number of parts must lie within 1 … %d, got %d", MaxParts, n)
	}
	if k < 1 || k > n {
		return fmt.Errorf("the part index counts from 1 to the number of parts %d, got %d", n, k)
	}
	return nil
}

// partSettings checks that s can be split into parts and resolves auto to
// crude Monte Carlo (with auto's note) when its pilot says so.
func partSettings(ctx context.Context, k *Kernel, s *Settings) (string, error) {
	if s.Precision > 0 {
		return "", fmt.Errorf("adaptive stopping (precision %g) cannot be split into parts: where it stops depends on every chunk before; give a fixed sample count and no precision", s.Precision)
	}
	switch s.Method {
	case Crude, Importance:
		return "", nil
	case Auto:
		if k.Dim() == 0 {
			return "crude Monte Carlo: no input has a distribution", nil
		}
		ok, note, _, err := autoCrude(ctx, k, *s)
		if err != nil {
			return "", err
		}
		if !ok {
			return "", fmt.Errorf("auto would choose a rare-event method here (%s); parts support crude Monte Carlo: run with --method crude and a budget that reaches the precision, or run the rare-event estimate on one machine", note)
		}
		return note, nil
	}
	return "", fmt.Errorf("method %s cannot be split into parts: crude Monte Carlo, importance sampling (a fixed sample count) and auto when it resolves to crude merge exactly; subset simulation is sequential (each level seeds the next); run it on one machine", s.Method)
}

// RunPart runs part k of n of a crude run of p (chunks PartChunks) and
// returns its state. An interrupted part returns an error wrapping
// ErrInterrupted and no state: a part is complete or not written.
func RunPart(ctx context.Context, p *Problem, s Settings, part, n int) (*PartState, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if err := ValidatePart(part, n); err != nil {
		return nil, err
	}
	s.defaults()
	k, err := NewKernel(p, s.Modes)
	if err != nil {
		return nil, err
	}
	note, err := partSettings(ctx, k, &s)
	if err != nil {
		return nil, err
	}
	start := time.Now()
	if s.Method == Importance {
		return runImportancePart(ctx, k, s, part, n, start)
	}
	c0, c1 := PartChunks(s.Samples, part, n)
	st := &PartState{Method: "crude", MethodNote: note, Part: part, Parts: n, FirstChunk: c0, EndChunk: c1,
		Chunks: make([]ChunkSum, c1-c0)}
	sk, stride, workers := newCrudeWorkers(k, s)
	st.BinStride = stride
	var next, done atomic.Int64
	next.Store(c0)
	var wg sync.WaitGroup
	for wi := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for ctx.Err() == nil {
				c := next.Add(1) - 1
				if c >= c1 {
					return
				}
				cs := workers[wi].runChunk(s.Seed, c, chunkLen(c, s.Samples))
				st.Chunks[c-c0] = ChunkSum{cs.n, cs.sum, cs.ssq}
				d := done.Add(chunkLen(c, s.Samples))
				if s.Progress != nil {
					s.Progress(d, (c1-c0)*ChunkSize)
				}
			}
		}()
	}
	wg.Wait()
	if ctx.Err() != nil {
		return nil, fmt.Errorf("%w: part %d of %d not finished (%v); nothing written", ErrInterrupted, part, n, context.Cause(ctx))
	}
	var t tally
	for _, w := range workers {
		t.merge(&w.t)
	}
	st.Samples, st.Invalid, st.Any, st.Binned, st.BoltSamples = t.samples, t.invalid, t.any, t.binned, t.boltSamples
	st.Fail, st.BoltFail = t.fail, t.boltFail
	st.CaseFail, st.CaseAny = t.cs.fail, t.cs.any
	if sk != nil {
		merged := sk.empty()
		for _, w := range workers {
			merged.merge(w.sk)
		}
		for _, h := range merged.all() {
			st.Sketches = append(st.Sketches, SketchState{Counts: h.Counts, Under: h.Under, Over: h.Over,
				UnderMin: h.UnderMin, UnderMax: h.UnderMax, OverMin: h.OverMin, OverMax: h.OverMax, Lowest: h.Lowest, Highest: h.Highest})
		}
	}
	st.Elapsed = time.Since(start)
	return st, nil
}

// MergeParts merges the parts of one crude run of p with settings s (the
// settings every part ran with) into the result that run would give on
// one machine, bit for bit. The parts must be distinct parts of the same
// split, sorted or not; with every part present the merge re-runs the
// binned chunks locally where a percentile needs refining, as the
// one-machine run does. With missing parts (allowed by the caller) the
// result covers the chunks of the parts given, is marked Partial and keeps
// first-pass percentiles.
func MergeParts(ctx context.Context, p *Problem, s Settings, parts []*PartState) (*Result, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if len(parts) == 0 {
		return nil, fmt.Errorf("no parts to merge")
	}
	s.defaults()
	k, err := NewKernel(p, s.Modes)
	if err != nil {
		return nil, err
	}
	n := parts[0].Parts
	byPart := make([]*PartState, n+1)
	for _, pt := range parts {
		if pt.Parts != n || pt.Part < 1 || pt.Part > n {
			return nil, fmt.Errorf("part %d of %d does not belong to a split into %d parts", pt.Part, pt.Parts, n)
		}
		if byPart[pt.Part] != nil {
			return nil, fmt.Errorf("part %d of %d given twice", pt.Part, n)
		}
		if pt.Method != parts[0].Method {
			return nil, fmt.Errorf("part %d of %d ran %s, part %d %s", pt.Part, n, pt.Method, parts[0].Part, parts[0].Method)
		}
		if pt.Method == "importance" {
			if byPart[pt.Part] != nil {
				return nil, fmt.Errorf("part %d of %d given twice", pt.Part, n)
			}
			byPart[pt.Part] = pt
			continue
		}
		c0, c1 := PartChunks(s.Samples, pt.Part, n)
		if pt.FirstChunk != c0 || pt.EndChunk != c1 || int64(len(pt.Chunks)) != c1-c0 {
			return nil, fmt.Errorf("part %d of %d holds chunks %d … %d (%d sums); the split assigns %d … %d", pt.Part, n, pt.FirstChunk, pt.EndChunk-1, len(pt.Chunks), c0, c1-1)
		}
		want := 0
		if !s.ProbabilitiesOnly {
			want = int(NumQuantities) + len(k.modes)
		}
		if len(pt.Sketches) != want {
			return nil, fmt.Errorf("part %d of %d holds %d sketches; this run keeps %d", pt.Part, n, len(pt.Sketches), want)
		}
		byPart[pt.Part] = pt
	}
	if parts[0].Method == "importance" {
		return mergeImportance(ctx, k, s, parts, n)
	}
	first := parts[0]
	res := &Result{Method: "crude", Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, Precision: s.Precision,
		NBolts: k.nBolts, Nominal: k.Nominal(), MethodNote: first.MethodNote}
	var t tally
	var total sums
	complete := true
	for K := 1; K <= n; K++ {
		pt := byPart[K]
		if pt == nil {
			complete = false
			continue
		}
		if pt.MethodNote != first.MethodNote {
			return nil, fmt.Errorf("parts %d and %d resolved the method differently", first.Part, pt.Part)
		}
		if len(pt.CaseFail) != len(pt.CaseAny) || (pt.CaseFail != nil && len(pt.CaseFail) != len(first.CaseFail)) {
			return nil, fmt.Errorf("part %d of %d counts %d load cases, part %d %d", pt.Part, n, len(pt.CaseFail), first.Part, len(first.CaseFail))
		}
		t.merge(&tally{samples: pt.Samples, invalid: pt.Invalid, any: pt.Any, binned: pt.Binned, boltSamples: pt.BoltSamples,
			fail: pt.Fail, boltFail: pt.BoltFail, cs: caseTally{fail: pt.CaseFail, any: pt.CaseAny}})
		for _, c := range pt.Chunks {
			total.add(sums{c.N, c.Sum, c.SSQ})
		}
		res.Elapsed += pt.Elapsed
	}
	res.fill(&t, k, &total, s.Interval)
	res.Partial = !complete
	if !s.ProbabilitiesOnly {
		sk := pilot(k, s.Seed)
		res.BinStride = binStride(s.Samples)
		merged := sk.empty()
		all := merged.all()
		for K := 1; K <= n; K++ {
			pt := byPart[K]
			if pt == nil {
				continue
			}
			for i, ss := range pt.Sketches {
				if len(ss.Counts) != len(all[i].Counts) {
					return nil, fmt.Errorf("part %d of %d: sketch %d has %d bins; the run's pilot gives %d", K, n, i, len(ss.Counts), len(all[i].Counts))
				}
				o := all[i].Empty()
				copy(o.Counts, ss.Counts)
				o.Under, o.Over = ss.Under, ss.Over
				o.UnderMin, o.UnderMax, o.OverMin, o.OverMax = ss.UnderMin, ss.UnderMax, ss.OverMin, ss.OverMax
				o.Lowest, o.Highest = ss.Lowest, ss.Highest
				all[i].Merge(&o)
			}
		}
		res.setDistributions(merged)
		if complete {
			workers := make([]*crudeWorker, s.Workers)
			for i := range workers {
				workers[i] = newCrudeWorker(k, nil, res.BinStride)
			}
			res.RefinePasses = refine(ctx, res, merged, len(workers), len(k.modes), k.nBolts, crudePass(ctx, k, s, res.BinStride, workers))
		}
	}
	if ctx.Err() != nil {
		return res, fmt.Errorf("%w: %v", ErrInterrupted, context.Cause(ctx))
	}
	return res, nil
}

// MissingParts lists the part indices (from 1) of n not among parts.
func MissingParts(parts []*PartState, n int) []int {
	have := make([]bool, n+1)
	for _, p := range parts {
		if p.Part >= 1 && p.Part <= n {
			have[p.Part] = true
		}
	}
	var out []int
	for K := 1; K <= n; K++ {
		if !have[K] {
			out = append(out, K)
		}
	}
	return out
}

// ResolvePart returns the method note of a run of p split into parts:
// auto's choice when its pilot resolves to crude Monte Carlo (as Estimate
// would), "" for crude; an error naming what to use for settings that
// cannot be split.
func ResolvePart(ctx context.Context, p *Problem, s Settings) (string, error) {
	if err := s.Validate(); err != nil {
		return "", err
	}
	s.defaults()
	k, err := NewKernel(p, s.Modes)
	if err != nil {
		return "", err
	}
	return partSettings(ctx, k, &s)
}

// partBlock returns the block [c0, c1) of part k of n among c chunks.
func partBlock(c int64, k, n int) (int64, int64) {
	return (int64(k) - 1) * c / int64(n), int64(k) * c / int64(n)
}

// rarePlan prepares the importance-sampling run of a split: exactly
// s.Samples samples (see Settings.FixedSamples).
func rarePlan(k *Kernel, s Settings) (*rare.ImportancePlan, error) {
	s.FixedSamples = true
	if k.Dim() == 0 {
		return nil, fmt.Errorf("method importance needs uncertain inputs: no input has a distribution (every sample is the nominal joint); use crude")
	}
	return rare.PlanImportance(k.RareProblem(), importanceSettings(s))
}

// runImportancePart runs part k of n of an importance-sampling run of
// exactly s.Samples samples: the design points and mixture (the same in
// every part), then the part's block of the sampler's chunks.
func runImportancePart(ctx context.Context, k *Kernel, s Settings, part, n int, start time.Time) (*PartState, error) {
	pl, err := rarePlan(k, s)
	if err != nil {
		return nil, err
	}
	c0, c1 := partBlock(pl.Chunks(), part, n)
	sums, err := pl.Run(ctx, c0, c1)
	if err != nil {
		return nil, fmt.Errorf("%w: part %d of %d not finished (%v); nothing written", ErrInterrupted, part, n, context.Cause(ctx))
	}
	st := &PartState{Method: "importance", Part: part, Parts: n, FirstChunk: c0, EndChunk: c1, Rare: sums}
	for i := range sums {
		st.Samples += sums[i].Samples - sums[i].Invalid
		st.Invalid += sums[i].Invalid
	}
	st.Elapsed = time.Since(start)
	return st, nil
}

// mergeImportance merges the parts of an importance-sampling run: the
// chunk sums in chunk order, then the results and the crude pass behind
// the percentiles, as on one machine.
func mergeImportance(ctx context.Context, k *Kernel, s Settings, parts []*PartState, n int) (*Result, error) {
	start := time.Now()
	pl, err := rarePlan(k, s)
	if err != nil {
		return nil, err
	}
	byPart := make([]*PartState, n+1)
	for _, pt := range parts {
		c0, c1 := partBlock(pl.Chunks(), pt.Part, n)
		if pt.FirstChunk != c0 || pt.EndChunk != c1 || int64(len(pt.Rare)) != c1-c0 {
			return nil, fmt.Errorf("part %d of %d holds importance chunks %d … %d (%d sums); the split assigns %d … %d", pt.Part, n, pt.FirstChunk, pt.EndChunk-1, len(pt.Rare), c0, c1-1)
		}
		byPart[pt.Part] = pt
	}
	var chunks []rare.ChunkSums
	complete := true
	for K := 1; K <= n; K++ {
		if byPart[K] == nil {
			complete = false
			continue
		}
		chunks = append(chunks, byPart[K].Rare...)
	}
	rs := pl.Results(chunks, !complete)
	s.FixedSamples = true
	res, err := rareResult(ctx, k, s, Importance, rs, start)
	if err != nil && !errors.Is(err, ErrInterrupted) {
		return res, err
	}
	if res != nil {
		res.Partial = !complete || res.Partial
	}
	return res, err
}
