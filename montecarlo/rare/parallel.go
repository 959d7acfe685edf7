package rare

import (
	"sync"
	"sync/atomic"
)

// forEach runs job(w, i) for every i in [0, n) on at most nw goroutines; w
// is the index of the goroutine (of its evaluator and scratch). Jobs write
// their results into slots indexed by i, so the caller combines them in the
// order of i whatever the number of goroutines.
func forEach(nw, n int, job func(w, i int)) {
	if nw > n {
		nw = n
	}
	if nw <= 1 {
		for i := range n {
			job(0, i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range nw {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				job(w, i)
			}
		}()
	}
	wg.Wait()
}

// evaluators holds one evaluator per worker, made on first use.
type evaluators struct {
	p   *Problem
	evs []Evaluator
}

func newEvaluators(p *Problem, nw int) *evaluators {
	return &evaluators{p: p, evs: make([]Evaluator, nw)}
}

func (e *evaluators) n() int { return len(e.evs) }

// get returns worker w's evaluator; only worker w calls it with w.
func (e *evaluators) get(w int) Evaluator {
	if e.evs[w] == nil {
		e.evs[w] = e.p.NewEvaluator()
	}
	return e.evs[w]
}
