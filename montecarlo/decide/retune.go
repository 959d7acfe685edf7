package decide

import (
	"context"
	"fmt"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/study"
)

// Retuned is one variant at its own callout.
type Retuned struct {
	Spec *Spec
	// Problem is the variant with its controlled input's nominal moved to
	// the callout's (its scatter relative to the nominal kept: the
	// variant's own tool).
	Problem *montecarlo.Problem
}

// Retune finds each variant's own callout for the same target (RunSpec
// with that variant's options) and returns every variant moved to it, for
// a paired comparison at those settings. A variant that no setting brings
// to the target is an error naming it.
func Retune(ctx context.Context, ps []*montecarlo.Problem, names []string, opts []SpecOptions) ([]Retuned, error) {
	if len(ps) != len(opts) || len(ps) != len(names) {
		return nil, fmt.Errorf("decide: %d problems, %d names, %d option sets", len(ps), len(names), len(opts))
	}
	out := make([]Retuned, len(ps))
	for i, p := range ps {
		o := opts[i]
		o.Alternatives = nil // a variant that cannot meet the target is reported, not repaired
		sp, err := RunSpec(ctx, p, o)
		if err != nil {
			return nil, fmt.Errorf("variant %s: %w", names[i], err)
		}
		if !sp.Feasible {
			return nil, fmt.Errorf("variant %s: no %s in %s … %s meets the target %g on the upper bound (least %.3g at %s); it has no callout to compare at ('boltrisk spec' on it says why and what helps)",
				names[i], o.Path, o.fmtX(o.Lo), o.fmtX(o.Hi), o.Target, sp.Sweep.Conservative.BestP, o.fmtX(sp.Sweep.Conservative.Best))
		}
		if sp.RangeLo || sp.RangeHi {
			return nil, fmt.Errorf("variant %s: the range %s … %s of %s  cannot hold its window", names[i], o.fmtX(o.Lo), o.fmtX(o.Hi), o.Path)
		}
		v := study.Vary{Kind: study.Input, Path: o.Path, Field: o.Field, Lo: o.Lo, Hi: o.Hi, Steps: 2}
		q, err := v.Apply(p, sp.Nominal)
		if err != nil {
			return nil, fmt.Errorf("variant %s: %w", names[i], err)
		}
		out[i] = Retuned{Spec: sp, Problem: q}
	}
	return out, nil
}
