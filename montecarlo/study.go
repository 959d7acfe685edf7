package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sort"

	"boltrisk/model"
)

// VaryKind selects what a sweep changes.
type VaryKind uint8

const (
	// VaryInput sets the nominal value of one input. An uncertain input keeps
	// its family and coefficient of variation (Dist.Multiplied); a fixed one
	// takes the value.
	VaryInput VaryKind = iota
	// VaryLoad multiplies every service load (axial max and min, shear), fixed
	// or uncertain, by the step value.
	VaryLoad
	// VarySpread multiplies the spread of one uncertain input about its mean
	// by the step value (Dist.Scaled); 1 is the scenario's own scatter.
	VarySpread
)

// Vary describes a one-parameter study.
type Vary struct {
	Kind  VaryKind
	Path  string                       // input path (VaryInput, VarySpread)
	Field func(*model.Inputs) *float64 // binding of Path (VaryInput)
	Lo    float64                      // first value (internal units)
	Hi    float64                      // last value
	Steps int                          // number of values, ≥ 2
}

// Values returns the equally spaced step values.
func (v *Vary) Values() []float64 {
	out := make([]float64, v.Steps)
	for i := range out {
		out[i] = v.Lo + (v.Hi-v.Lo)*float64(i)/float64(v.Steps-1)
	}
	return out
}

// Validate checks the range.
func (v *Vary) Validate(p *Problem) error {
	if v.Steps < 2 || v.Steps > 1000 {
		return fmt.Errorf("steps must lie within 2 … 1000, got %d", v.Steps)
	}
	if !(v.Lo < v.Hi) || math.IsInf(v.Lo, 0) || math.IsInf(v.Hi, 0) {
		return fmt.Errorf("range %g..%g: the lower end must be below the upper end", v.Lo, v.Hi)
	}
	switch v.Kind {
	case VaryLoad, VarySpread:
		if !(v.Lo > 0) {
			return fmt.Errorf("range %g..%g: a multiplier must be > 0", v.Lo, v.Hi)
		}
	}
	if v.Kind == VarySpread {
		if _, ok := findVar(p, v.Path); !ok {
			return fmt.Errorf("%s is not uncertain: only an input with a distribution has a scatter to vary", v.Path)
		}
	}
	if v.Kind == VaryInput && v.Field == nil {
		return fmt.Errorf("%s: no such input", v.Path)
	}
	return nil
}

func findVar(p *Problem, path string) (int, bool) {
	for i := range p.Vars {
		if p.Vars[i].Name == path {
			return i, true
		}
	}
	return -1, false
}

// Apply returns a copy of p changed to step value x.
func (v *Vary) Apply(p *Problem, x float64) (*Problem, error) {
	q := &Problem{Base: p.Base, Vars: append([]Var(nil), p.Vars...), Corr: p.Corr}
	switch v.Kind {
	case VaryInput:
		if i, ok := findVar(q, v.Path); ok {
			old := q.Vars[i].Dist.Mean()
			var d Dist
			var err error
			if old > 0 && x > 0 {
				d, err = q.Vars[i].Dist.Multiplied(x / old)
			} else {
				d, err = q.Vars[i].Dist.Shifted(x)
			}
			if err != nil {
				return nil, fmt.Errorf("%s = %g: %w", v.Path, x, err)
			}
			q.Vars[i].Dist = d
		}
		*v.Field(&q.Base) = x
	case VaryLoad:
		q.Base.ScaleLoads(x)
		for i := range q.Vars {
			if q.Vars[i].Role&Load == 0 {
				continue
			}
			d, err := q.Vars[i].Dist.Multiplied(x)
			if err != nil {
				return nil, fmt.Errorf("load × %g: %w", x, err)
			}
			q.Vars[i].Dist = d
		}
	case VarySpread:
		i, _ := findVar(q, v.Path)
		d, err := q.Vars[i].Dist.Scaled(x)
		if err != nil {
			return nil, fmt.Errorf("%s scatter × %g: %w", v.Path, x, err)
		}
		q.Vars[i].Dist = d
	}
	return q, nil
}

// SweepStep is the result at one step value.
type SweepStep struct {
	X      float64
	Result *Result
}

// Sweep is the result of a one-parameter study.
type Sweep struct {
	Vary    Vary
	Steps   []SweepStep
	Partial bool
}

// RunSweep evaluates the problem at every step value with the same seed:
// every step reuses the same random streams (common random numbers), so the
// curves are smooth and differences between steps are not sampling noise.
// s.Target must be 0 (each step runs s.Samples); histograms are not kept
// (Settings.ProbabilitiesOnly). An interrupted sweep
// returns the steps done, marked Partial, with an error wrapping
// ErrInterrupted.
func RunSweep(ctx context.Context, p *Problem, v Vary, s Settings) (*Sweep, error) {
	if err := v.Validate(p); err != nil {
		return nil, err
	}
	if s.Target != 0 {
		return nil, errors.New("a sweep runs a fixed number of samples per step; the precision target does not apply")
	}
	sw := &Sweep{Vary: v}
	s.ProbabilitiesOnly = true // curves need probabilities only
	xs := v.Values()
	progress := s.Progress
	for i, x := range xs {
		q, err := v.Apply(p, x)
		if err != nil {
			return nil, err
		}
		st := s
		if progress != nil {
			off := int64(i) * s.Samples
			st.Progress = func(done, _ int64) { progress(off+done, int64(len(xs))*s.Samples) }
		}
		r, err := Run(ctx, q, st)
		if err != nil && !errors.Is(err, ErrInterrupted) {
			return nil, fmt.Errorf("step %d (%g): %w", i+1, x, err)
		}
		if r.Partial {
			sw.Partial = true
			return sw, err
		}
		sw.Steps = append(sw.Steps, SweepStep{X: x, Result: r})
	}
	return sw, nil
}

// Window is the range of the varied value in which the joint meets a target
// failure probability: the any-mode probability (which bounds every mode) is
// at or below the target.
type Window struct {
	Target float64
	Found  bool    // some step meets the target
	Lo, Hi float64 // window ends, interpolated in log-probability between steps
	// OpenLo/OpenHi: the window reaches the end of the swept range, so the
	// true end lies beyond it.
	OpenLo, OpenHi bool
	// Modes above the target at the first step outside each end, most
	// probable first. When no single mode exceeds the target there and only
	// their combination does, LoCombined/HiCombined is set and the list holds
	// the most probable mode alone.
	LoModes, HiModes       []model.Mode
	LoCombined, HiCombined bool
	Best, BestP            float64 // step with the least any-mode probability
	Conservative           bool    // built from the upper confidence bounds
}

// FindWindow returns the window of a sweep for a target probability, using
// point estimates, or the upper confidence bounds when conservative is set.
func FindWindow(sw *Sweep, target float64, conservative bool) Window {
	w := Window{Target: target, Conservative: conservative}
	if len(sw.Steps) == 0 {
		return w
	}
	p := func(iv Interval) float64 {
		if conservative {
			return iv.Hi
		}
		return iv.P
	}
	best := 0
	for i, st := range sw.Steps {
		if p(st.Result.Any) < p(sw.Steps[best].Result.Any) {
			best = i
		}
	}
	w.Best, w.BestP = sw.Steps[best].X, p(sw.Steps[best].Result.Any)
	if w.BestP > target {
		return w
	}
	w.Found = true
	lo, hi := best, best
	for lo > 0 && p(sw.Steps[lo-1].Result.Any) <= target {
		lo--
	}
	for hi < len(sw.Steps)-1 && p(sw.Steps[hi+1].Result.Any) <= target {
		hi++
	}
	w.Lo, w.Hi = sw.Steps[lo].X, sw.Steps[hi].X
	w.OpenLo, w.OpenHi = lo == 0, hi == len(sw.Steps)-1
	if !w.OpenLo {
		out, in := sw.Steps[lo-1], sw.Steps[lo]
		w.Lo = crossing(out.X, p(out.Result.Any), in.X, p(in.Result.Any), target)
		w.LoModes, w.LoCombined = above(out.Result, target, p)
	}
	if !w.OpenHi {
		in, out := sw.Steps[hi], sw.Steps[hi+1]
		w.Hi = crossing(out.X, p(out.Result.Any), in.X, p(in.Result.Any), target)
		w.HiModes, w.HiCombined = above(out.Result, target, p)
	}
	return w
}

// crossing interpolates where the probability passes target between a step
// outside (xo, po > target) and one inside (xi, pi ≤ target): linearly in
// log p when both are positive, else linearly in p.
func crossing(xo, po, xi, pi, target float64) float64 {
	if pi > 0 && po > 0 {
		return xo + (xi-xo)*(math.Log(po)-math.Log(target))/(math.Log(po)-math.Log(pi))
	}
	return xo + (xi-xo)*(po-target)/(po-pi)
}

func above(r *Result, target float64, p func(Interval) float64) ([]model.Mode, bool) {
	ms := make([]model.Mode, 0, len(r.Modes))
	for _, m := range r.Modes {
		ms = append(ms, m.Mode)
	}
	sort.SliceStable(ms, func(i, j int) bool {
		a, _ := r.Mode(ms[i])
		b, _ := r.Mode(ms[j])
		return p(a.Interval) > p(b.Interval)
	})
	var out []model.Mode
	for _, m := range ms {
		if mr, _ := r.Mode(m); p(mr.Interval) > target {
			out = append(out, m)
		}
	}
	if len(out) == 0 && len(ms) > 0 {
		return ms[:1], true
	}
	return out, false
}

// SpreadLimit is the answer to "how much scatter may this input have?".
type SpreadLimit struct {
	Path   string
	Target float64
	Factor float64 // largest multiplier of the scenario's spread meeting the target
	Dist   Dist    // the distribution at that factor
	// Below: even the smallest factor tried (MinSpread) misses the target.
	// Above: even the largest (MaxSpread) meets it.
	Below, Above bool
	P            float64 // any-mode probability at Factor
}

// Bounds of the spread search.
const (
	MinSpread = 1.0 / 64
	MaxSpread = 16.0
)

// FindSpreadLimit bisects (in log of the factor, 12 halvings, common random
// numbers) for the largest multiplier of path's spread at which the any-mode
// probability stays at or below target.
func FindSpreadLimit(ctx context.Context, p *Problem, path string, target float64, s Settings) (*SpreadLimit, error) {
	v := Vary{Kind: VarySpread, Path: path, Lo: MinSpread, Hi: MaxSpread, Steps: 2}
	if err := v.Validate(p); err != nil {
		return nil, err
	}
	s.ProbabilitiesOnly = true
	eval := func(f float64) (float64, Dist, error) {
		q, err := v.Apply(p, f)
		if err != nil {
			return 0, Dist{}, err
		}
		r, err := Run(ctx, q, s)
		if err != nil {
			return 0, Dist{}, err
		}
		i, _ := findVar(q, path)
		return r.Any.P, q.Vars[i].Dist, nil
	}
	out := &SpreadLimit{Path: path, Target: target}
	pLo, dLo, err := eval(MinSpread)
	if err != nil {
		return nil, err
	}
	if pLo > target {
		out.Below, out.Factor, out.Dist, out.P = true, MinSpread, dLo, pLo
		return out, nil
	}
	pHi, dHi, err := eval(MaxSpread)
	if err != nil {
		return nil, err
	}
	if pHi <= target {
		out.Above, out.Factor, out.Dist, out.P = true, MaxSpread, dHi, pHi
		return out, nil
	}
	lo, hi := math.Log(MinSpread), math.Log(MaxSpread)
	out.Factor, out.Dist, out.P = MinSpread, dLo, pLo
	for range 12 {
		mid := (lo + hi) / 2
		pm, dm, err := eval(math.Exp(mid))
		if err != nil {
			return nil, err
		}
		if pm <= target {
			lo = mid
			out.Factor, out.Dist, out.P = math.Exp(mid), dm, pm
		} else {
			hi = mid
		}
	}
	return out, nil
}
