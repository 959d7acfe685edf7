package rare

import (
	"context"
	"fmt"
)

// ImportancePlan is an importance-sampling run of a fixed number of
// samples prepared for splitting: the design points and the mixture, which
// every part (and the merge) computes identically from the problem and the
// settings. Its chunks can then run anywhere; their sums, added in chunk
// order, give the bits of the run on one machine.
type ImportancePlan struct {
	p   *Problem
	is  ImportanceSettings
	dps []DesignPoint
	q   *Proposal
	evs *evaluators
}

// PlanImportance finds the design points and builds the mixture of an
// importance-sampling run of s.Samples samples (which must be > 0: a run
// that stops on a precision cannot be split).
func PlanImportance(p *Problem, s *ImportanceSettings) (*ImportancePlan, error) {
	is, err := importanceSetup(p, s)
	if err != nil {
		return nil, err
	}
	if is.Samples <= 0 {
		return nil, fmt.Errorf("rare: a split importance-sampling run needs a fixed Samples > 0")
	}
	return buildPlan(p, is)
}

// importanceSetup validates the problem and returns the settings with
// their defaults: the first step of every importance-sampling run.
func importanceSetup(p *Problem, s *ImportanceSettings) (ImportanceSettings, error) {
	if err := p.Validate(); err != nil {
		return ImportanceSettings{}, err
	}
	return s.withDefaults()
}

// buildPlan finds the design points and builds the mixture: the set-up of
// every importance-sampling run, split or not.
func buildPlan(p *Problem, is ImportanceSettings) (*ImportancePlan, error) {
	evs := newEvaluators(p, is.Workers)
	fs := is.FORM
	fs.Workers = is.Workers
	dps := designPoints(p, fs, evs)
	q, err := NewProposal(p, dps, &is)
	if err != nil {
		return nil, err
	}
	return &ImportancePlan{p: p, is: is, dps: dps, q: q, evs: evs}, nil
}

// Chunks returns the number of chunks of the run.
func (pl *ImportancePlan) Chunks() int64 {
	cs := int64(pl.is.ChunkSize)
	return (pl.is.Samples + cs - 1) / cs
}

// Run draws chunks [c0, c1) and returns their sums in chunk order. A
// cancelled ctx returns its error and no sums.
func (pl *ImportancePlan) Run(ctx context.Context, c0, c1 int64) ([]ChunkSums, error) {
	samplers := make([]*Sampler, pl.evs.n())
	for w := range samplers {
		samplers[w], _ = NewSampler(pl.p, pl.q) // validated by PlanImportance
	}
	cs := int64(pl.is.ChunkSize)
	out := make([]ChunkSums, c1-c0)
	forEach(pl.evs.n(), int(c1-c0), func(w, i int) {
		if ctx.Err() != nil {
			return
		}
		c := c0 + int64(i)
		out[i] = samplers[w].Chunk(pl.evs.get(w), pl.is.Seed, c, int(min(cs, pl.is.Samples-c*cs)))
	})
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return out, nil
}

// Results adds the chunk sums of the whole run (chunk order, from chunk 0;
// fewer when partial) and returns the results Importance gives.
func (pl *ImportancePlan) Results(chunks []ChunkSums, partial bool) []Result {
	m := Merge(chunks)
	if len(m.Events) == 0 {
		m = newChunkSums(len(pl.p.targets()), pl.p.Dim)
	}
	return importanceResults(pl.p, pl.q, pl.dps, &m, pl.is, partial)
}
