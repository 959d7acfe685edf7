package rare

import (
	"context"
	"fmt"
	"math"
)

// ImportanceSettings tunes [Importance] and [Sample]. The zero value gives
// the defaults.
type ImportanceSettings struct {
	Seed    uint64
	Workers int // goroutines (default GOMAXPROCS); results do not depend on it
	// Precision is the target c.o.v.: sampling stops when every event with
	// a failed sample, and AnyEvent, has a c.o.v. at most Precision and
	// non-degenerate weights (default 0.05).
	Precision float64
	// Samples, when > 0, fixes the number of samples (no precision stop).
	Samples int64
	// MaxSamples caps the samples of a precision-driven run (default 2²⁰).
	MaxSamples int64
	// ChunkSize is the number of samples per chunk, each chunk drawn from
	// its own stream (default 128). Part of the reproducibility contract.
	ChunkSize  int
	Confidence float64 // two-sided confidence of the intervals (default 0.95)
	// Defensive is α0, the weight of the standard normal in the mixture
	// (default 0.1; in (0, 1)).
	Defensive float64
	// AxisSD is the standard deviation of each mixture component along its
	// design point's α (default 0.75; 1 keeps Σ = I; in (1/√2, 10]).
	AxisSD float64
	FORM   FORMSettings
}

// Defaults of ImportanceSettings.
const (
	DefaultPrecision  = 0.05
	DefaultMaxSamples = 1 << 20
	DefaultChunkSize  = 128
	DefaultDefensive  = 0.1
	DefaultAxisSD     = 0.75
	DefaultConfidence = 0.95
)

func (s *ImportanceSettings) withDefaults() (ImportanceSettings, error) {
	var is ImportanceSettings
	if s != nil {
		is = *s
	}
	if is.Precision == 0 {
		is.Precision = DefaultPrecision
	}
	if is.MaxSamples == 0 {
		is.MaxSamples = DefaultMaxSamples
	}
	if is.ChunkSize == 0 {
		is.ChunkSize = DefaultChunkSize
	}
	if is.Confidence == 0 {
		is.Confidence = DefaultConfidence
	}
	if is.Defensive == 0 {
		is.Defensive = DefaultDefensive
	}
	if is.AxisSD == 0 {
		is.AxisSD = DefaultAxisSD
	}
	switch {
	case !(is.Precision > 0):
		return is, fmt.Errorf("rare: ImportanceSettings.Precision is %g; it must be > 0", is.Precision)
	case is.Samples < 0:
		return is, fmt.Errorf("rare: ImportanceSettings.Samples is %d; it must be ≥ 0", is.Samples)
	case is.MaxSamples < 1:
		return is, fmt.Errorf("rare: ImportanceSettings.MaxSamples is %d; it must be ≥ 1", is.MaxSamples)
	case is.ChunkSize < 1:
		return is, fmt.Errorf("rare: ImportanceSettings.ChunkSize is %d; it must be ≥ 1", is.ChunkSize)
	case !(is.Confidence > 0 && is.Confidence < 1):
		return is, fmt.Errorf("rare: ImportanceSettings.Confidence is %g; it must be in (0, 1)", is.Confidence)
	case !(is.Defensive > 0 && is.Defensive < 1):
		return is, fmt.Errorf("rare: ImportanceSettings.Defensive is %g; it must be in (0, 1)", is.Defensive)
	case !(is.AxisSD > MinAxisSD && is.AxisSD <= 10):
		return is, fmt.Errorf("rare: ImportanceSettings.AxisSD is %g; it must be in (1/√2, 10]", is.AxisSD)
	}
	is.Workers = workers(is.Workers)
	return is, nil
}

// Sample draws chunks 0, 1, 2, … of proposal q and returns their sums
// merged in chunk order. With Samples > 0 it draws that many samples;
// otherwise it checks the stopping rule after rounds of chunks: a first
// round of 4 chunks, then rounds of max(1, ⌊chunks so far/16⌋) chunks, so
// where it stops depends on the seed only, never on the workers. It stops
// early, returning the sums so far and the context's error, when ctx is
// cancelled.
func Sample(ctx context.Context, p *Problem, q *Proposal, s *ImportanceSettings) (ChunkSums, error) {
	if err := p.Validate(); err != nil {
		return ChunkSums{}, err
	}
	if err := q.Validate(); err != nil {
		return ChunkSums{}, err
	}
	if q.Dim != p.Dim {
		return ChunkSums{}, fmt.Errorf("rare: Proposal.Dim is %d; Problem.Dim is %d", q.Dim, p.Dim)
	}
	is, err := s.withDefaults()
	if err != nil {
		return ChunkSums{}, err
	}
	return sample(ctx, p, q, is, newEvaluators(p, is.Workers))
}

func sample(ctx context.Context, p *Problem, q *Proposal, is ImportanceSettings, evs *evaluators) (ChunkSums, error) {
	samplers := make([]*Sampler, evs.n())
	for w := range samplers {
		samplers[w], _ = NewSampler(p, q) // validated by the caller
	}
	total := is.MaxSamples
	if is.Samples > 0 {
		total = is.Samples
	}
	cs := int64(is.ChunkSize)
	nChunks := (total + cs - 1) / cs
	size := func(c int64) int { return int(min(cs, total-c*cs)) }
	var merged ChunkSums
	for done := int64(0); done < nChunks; {
		if err := ctx.Err(); err != nil {
			return merged, err
		}
		r := int64(4)
		if done > 0 {
			r = max(1, done/16)
		}
		r = min(r, nChunks-done)
		parts := make([]ChunkSums, r)
		forEach(evs.n(), int(r), func(w, i int) {
			c := done + int64(i)
			parts[i] = samplers[w].Chunk(evs.get(w), is.Seed, c, size(c))
		})
		for i := range parts {
			merged.Add(&parts[i])
		}
		done += r
		if is.Samples == 0 && precisionMet(Finish(p, q, &merged, is.Confidence), is.Precision) {
			break
		}
	}
	return merged, nil
}

// precisionMet reports whether AnyEvent (last) has failed samples and every
// event with failed samples has a c.o.v. at most prec and usable weights.
func precisionMet(es []Estimate, prec float64) bool {
	if es[len(es)-1].Failed == 0 {
		return false
	}
	for _, e := range es {
		if e.Failed > 0 && (e.COV > prec || e.Degenerate) {
			return false
		}
	}
	return true
}

// Importance estimates the probability of every event of p (and of
// AnyEvent) by importance sampling from a defensive mixture at the design
// points of the components: design points (DesignPoints), the mixture
// (NewProposal), chunks (Sample) and the estimates (Finish). Every event is
// estimated from the same samples, so the results share one evaluation
// count. A cancelled ctx gives the results so far, marked Partial.
func Importance(ctx context.Context, p *Problem, s *ImportanceSettings) ([]Result, error) {
	is, err := importanceSetup(p, s)
	if err != nil {
		return nil, err
	}
	pl, err := buildPlan(p, is)
	if err != nil {
		return nil, err
	}
	sums, cerr := sample(ctx, p, pl.q, is, pl.evs)
	if len(sums.Events) == 0 {
		return nil, cerr
	}
	return importanceResults(p, pl.q, pl.dps, &sums, is, cerr != nil), nil
}

// importanceResults turns the merged sums of an importance-sampling run
// into its results; partial marks an interrupted run.
func importanceResults(p *Problem, q *Proposal, dps []DesignPoint, sums *ChunkSums, is ImportanceSettings, partial bool) []Result {
	formEvals := int64(0)
	for _, d := range dps {
		formEvals += d.Evaluations
	}
	ests := Finish(p, q, sums, is.Confidence)
	z := zQuantile(is.Confidence)
	ts := p.targets()
	out := make([]Result, len(ts))
	for t, tg := range ts {
		e := ests[t]
		r := Result{
			Event: tg.name, Components: tg.comps, Method: MethodImportance,
			Probability: e.Probability, COV: e.COV, Confidence: e.Confidence, Lo: e.Lo, Hi: e.Hi, UpperOnly: e.UpperOnly,
			Interval:    fmt.Sprintf("lognormal: P·exp(∓%.4g·√ln(1 + COV²)) (normal quantile on the log scale)", z),
			Evaluations: formEvals + sums.Evaluations, Partial: partial,
			Shift: e.Shift, ShiftSE: e.ShiftSE,
			Importance: &ImportanceDiagnostics{
				Samples: e.Samples, Failed: e.Failed, Invalid: sums.Invalid, ESS: e.ESS, MaxShare: e.MaxShare,
				Degenerate: e.Degenerate, FORMEvaluations: formEvals, Defensive: q.Defensive,
			},
		}
		if e.UpperOnly {
			r.Interval = fmt.Sprintf("no failed sample: one-sided bound (1/α0)·(1 − (1 − %g)^(1/N)) from weights ≤ 1/α0", is.Confidence)
			r.Warnings = append(r.Warnings, fmt.Sprintf("no failed sample in %d: Hi is an upper bound only", e.Samples))
		}
		allConv := true
		lo, hi := 0.0, 0.0
		for _, c := range tg.comps {
			d := dps[c]
			r.DesignPoints = append(r.DesignPoints, d)
			if !d.Converged {
				allConv = false
				r.Importance.Uncovered = append(r.Importance.Uncovered, c)
				continue
			}
			lo, hi = math.Max(lo, d.FORM), hi+d.FORM
		}
		if allConv {
			r.FORMBounds = [2]float64{lo, math.Min(1, hi)}
		}
		if n := len(r.Importance.Uncovered); n > 0 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%d component(s) without a design point %v: only the defensive part (α0 = %g) covers them, so their failure regions may be missed or badly sampled", n, r.Importance.Uncovered, q.Defensive))
		}
		if e.Degenerate {
			r.Warnings = append(r.Warnings, fmt.Sprintf("degenerate weights (ESS %.3g, largest weight %.2g of the estimate): the c.o.v. is not reliable", e.ESS, e.MaxShare))
		}
		if !e.UpperOnly && e.COV > is.Precision && is.Samples == 0 && !partial {
			r.Warnings = append(r.Warnings, fmt.Sprintf("target c.o.v. %g not reached within %d samples", is.Precision, sums.Samples))
		}
		if sums.Invalid > 0 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%d samples outside the model's domain (counted as not failed; weighted share %.3g)", sums.Invalid, sums.InvalidW/float64(sums.Samples)))
		}
		out[t] = r
	}
	return out
}
