package montecarlo

import (
	"context"
	"sync"
	"sync/atomic"
)

// ChunkSize is the number of samples drawn from one random stream. It is part
// of the reproducibility contract: changing it changes every seeded result.
const ChunkSize = 16384

// roundChunks is the number of chunks between two checks of a stopping
// rule (about 1 M samples); fixed so that where a run stops does not depend
// on the worker count. Runs without a stopping rule use rounds of
// freeRoundChunks, so that workers seldom wait for each other at the end
// of a round.
const (
	roundChunks     = 64
	freeRoundChunks = 1024
)

// chunks returns the number of chunks of a budget of n samples.
func chunks(n int64) int64 { return (n + ChunkSize - 1) / ChunkSize }

// chunkLen returns the number of samples of chunk c of a budget of n.
func chunkLen(c, n int64) int64 { return min(int64(ChunkSize), n-c*ChunkSize) }

// sums are the floating sums of one chunk, merged in chunk order so that the
// result does not depend on the worker count.
type sums struct {
	n, sum, ssq float64 // of the residual preload
}

func (s *sums) add(o sums) { s.n += o.n; s.sum += o.sum; s.ssq += o.ssq }

// schedule runs the chunks of a budget of samples on nw workers in rounds
// of roundChunks (freeRoundChunks without a stopping rule). job evaluates
// chunk c on worker wi and writes k floating sums; the sums are merged in
// chunk order. progress (if set) gets the samples done after each chunk.
// After each complete round, stop (if set) may end the run. It reports
// whether the context ended the run early.
func schedule(ctx context.Context, samples int64, nw, k int, progress func(done, total int64), stop func() bool, job func(wi int, c int64, s []sums)) ([]sums, bool) {
	nChunks := chunks(samples)
	round := int64(roundChunks)
	if stop == nil {
		round = freeRoundChunks
	}
	var done atomic.Int64
	slots := make([]sums, round*int64(k))
	finished := make([]bool, round)
	total := make([]sums, k)
	for r0 := int64(0); r0 < nChunks; r0 += round {
		r1 := min(r0+round, nChunks)
		var next atomic.Int64
		next.Store(r0)
		clear(finished)
		clear(slots)
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
					i := int(c - r0)
					job(wi, c, slots[i*k:(i+1)*k])
					finished[i] = true
					d := done.Add(chunkLen(c, samples))
					if progress != nil {
						progress(d, samples)
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
				total[j].add(slots[int(i)*k+j])
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
