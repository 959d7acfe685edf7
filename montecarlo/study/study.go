// Package study holds the studies built on the estimators: sweeps of one
// input with common random numbers, the window of a varied value that meets
// a target probability (its edges refined by bisection), and the largest
// scatter of an input that still meets a target.
package study

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sort"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
)

// VaryKind selects what a sweep changes.
type VaryKind uint8

const (
	// Input sets the nominal value of one input. An uncertain input keeps
	// its family and coefficient of variation (Dist.Multiplied); a fixed one
	// takes the value.
	Input VaryKind = iota
	// Load multiplies every service load (axial max and min, shear), fixed
	// or uncertain, by the step value.
	Load
	// Spread multiplies the spread of one uncertain input about its mean
	// by the step value (Dist.Scaled); 1 is the scenario's own scatter.
	Spread
)

// Vary describes a one-parameter study.
type Vary struct {
	Kind  VaryKind
	Path  string                       // input path (Input, Spread)
	Field func(*model.Inputs) *float64 // binding of Path (Input)
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
func (v *Vary) Validate(p *montecarlo.Problem) error {
	if v.Steps < 2 || v.Steps > 1000 {
		return fmt.Errorf("steps must lie within 2 … 1000, got %d", v.Steps)
	}
	if !(v.Lo < v.Hi) || math.IsInf(v.Lo, 0) || math.IsInf(v.Hi, 0) {
		return fmt.Errorf("range %g..%g: the lower end must be below the upper end", v.Lo, v.Hi)
	}
	switch v.Kind {
	case Load, Spread:
		if !(v.Lo > 0) {
			return fmt.Errorf("range %g..%g: a multiplier must be > 0", v.Lo, v.Hi)
		}
	}
	if v.Kind == Spread {
		if _, ok := p.VarIndex(v.Path); !ok {
			return fmt.Errorf("%s is not uncertain: only an input with a distribution has a scatter to vary", v.Path)
		}
	}
	if v.Kind == Input && v.Field == nil {
		return fmt.Errorf("%s: no such input", v.Path)
	}
	return nil
}

// Apply returns a copy of p changed to step value x.
func (v *Vary) Apply(p *montecarlo.Problem, x float64) (*montecarlo.Problem, error) {
	q := &montecarlo.Problem{Base: p.Base, Vars: append([]montecarlo.Var(nil), p.Vars...), Corr: p.Corr,
		Cases: append([]montecarlo.Case(nil), p.Cases...), Life: p.Life}
	switch v.Kind {
	case Input:
		if i, ok := q.VarIndex(v.Path); ok {
			old := q.Vars[i].Dist.Mean()
			var d montecarlo.Dist
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
	case Load:
		q.Base.ScaleLoads(x)
		for i := range q.Cases { // the load cases' values as the loads (temperatures unchanged)
			for _, sl := range []montecarlo.CaseSlot{montecarlo.CaseAxialMax, montecarlo.CaseAxialMin, montecarlo.CaseShear} {
				q.Cases[i].Values[sl] *= x
			}
		}
		for i := range q.Vars {
			if q.Vars[i].Role&montecarlo.Load == 0 {
				continue
			}
			d, err := q.Vars[i].Dist.Multiplied(x)
			if err != nil {
				return nil, fmt.Errorf("load × %g: %w", x, err)
			}
			q.Vars[i].Dist = d
		}
	case Spread:
		i, _ := q.VarIndex(v.Path)
		d, err := q.Vars[i].Dist.Scaled(x)
		if err != nil {
			return nil, fmt.Errorf("%s scatter × %g: %w", v.Path, x, err)
		}
		q.Vars[i].Dist = d
	}
	return q, nil
}

// MinValidShare is the least share of a step's samples that must lie in
// the model's domain for the step to count: below it the probabilities
// describe a different population than the one asked about, and the step
// never bounds a window.
const MinValidShare = 0.5

// Step is the result at one step value.
type Step struct {
	X      float64
	Result *montecarlo.Result
	// TooFewValid is set when less than MinValidShare of the samples were
	// valid (or none was): the step is reported but bounds no window.
	TooFewValid bool
}

func newStep(x float64, r *montecarlo.Result) Step {
	drawn := r.Samples + r.Invalid
	return Step{X: x, Result: r, TooFewValid: r.Samples == 0 || float64(r.Samples) < MinValidShare*float64(drawn)}
}

// Sweep is the result of a one-parameter study.
type Sweep struct {
	Vary     Vary
	Settings montecarlo.Settings
	Steps    []Step
	Partial  bool
	// MethodNote says which method auto chose for every step, and why.
	MethodNote string
	// Windows, when a target was asked for (see FindWindow): from the point
	// estimates and from the upper confidence bounds.
	Window, Conservative *Window
}

// Run evaluates the problem at every step value with the same seed: every
// step reuses the same random streams (common random numbers), so the
// curves are smooth and differences between steps are not sampling noise.
// s.Precision must be 0 (each step runs s.Samples); histograms are not kept.
// With target > 0 it finds the window meeting it (FindWindow) and refines
// its edges by bisection (RefineWindow). An interrupted sweep returns the
// steps done, marked Partial, with an error wrapping
// montecarlo.ErrInterrupted.
func Run(ctx context.Context, p *montecarlo.Problem, v Vary, s montecarlo.Settings, target float64) (*Sweep, error) {
	if err := v.Validate(p); err != nil {
		return nil, err
	}
	if s.Precision != 0 {
		return nil, errors.New("a sweep runs a fixed number of samples per step; the precision target does not apply")
	}
	if target != 0 && !(target > 0 && target < 1) {
		return nil, fmt.Errorf("target probability must lie strictly between 0 and 1, got %g", target)
	}
	s = s.WithDefaults()
	s.ProbabilitiesOnly = true // curves need probabilities only
	sw := &Sweep{Vary: v, Settings: s}
	xs := v.Values()
	if s.Method == montecarlo.Auto {
		// One method for every step, so the steps share their random
		// numbers: auto's choice at the middle step.
		q, err := v.Apply(p, xs[len(xs)/2])
		if err != nil {
			return nil, err
		}
		if s.Method, sw.MethodNote, err = montecarlo.Resolve(ctx, q, s); err != nil {
			return nil, err
		}
		sw.Settings.Method = s.Method
	}
	progress := s.Progress
	for i, x := range xs {
		st := s
		if progress != nil {
			off := int64(i) * s.Samples
			st.Progress = func(done, _ int64) { progress(off+done, int64(len(xs))*s.Samples) }
		}
		r, err := at(ctx, p, v, x, st)
		if err != nil && !errors.Is(err, montecarlo.ErrInterrupted) {
			return nil, fmt.Errorf("step %d (%g): %w", i+1, x, err)
		}
		if r.Partial {
			sw.Partial = true
			return sw, err
		}
		sw.Steps = append(sw.Steps, newStep(x, r))
	}
	if target > 0 {
		for _, cons := range []bool{false, true} {
			w := FindWindow(sw, target, cons)
			if err := RefineWindow(ctx, p, sw, &w); err != nil {
				sw.Partial = true
				return sw, err
			}
			if cons {
				sw.Conservative = &w
			} else {
				sw.Window = &w
			}
		}
		clipConservative(sw.Window, sw.Conservative)
	}
	return sw, nil
}

// at runs the problem changed to step value x.
func at(ctx context.Context, p *montecarlo.Problem, v Vary, x float64, s montecarlo.Settings) (*montecarlo.Result, error) {
	q, err := v.Apply(p, x)
	if err != nil {
		return nil, err
	}
	return montecarlo.Estimate(ctx, q, s)
}

// Window is the range of the varied value in which the joint meets a target
// failure probability: the any-mode probability (which bounds every mode) is
// at or below the target.
type Window struct {
	Target float64
	Found  bool    // some valid step meets the target
	Lo, Hi float64 // window ends: the outermost values known to meet the target
	// OpenLo/OpenHi: the window reaches the end of the swept range (or a
	// step with too few valid samples), so the true end lies beyond it.
	OpenLo, OpenHi bool
	// LoInvalid/HiInvalid: that end stops at a step with too few valid samples.
	LoInvalid, HiInvalid bool
	// Modes above the target just outside each end, most probable first.
	// When no single mode exceeds the target there and only their
	// combination does, LoCombined/HiCombined is set and the list holds the
	// most probable mode alone.
	LoModes, HiModes       []model.Mode
	LoCombined, HiCombined bool
	Best, BestP            float64 // step with the least any-mode probability
	Conservative           bool    // built from the upper confidence bounds
	// Bracket of each closed end after refinement: the end lies within
	// (LoOut, Lo] and [Hi, HiOut); Resolution is the widest bracket.
	LoOut, HiOut float64
	Resolution   float64
	Bisections   int // runs spent refining the edges
}

// prob is the probability the window is built on.
func prob(iv interval.Estimate, conservative bool) float64 {
	if conservative {
		return iv.Hi
	}
	return iv.P
}

// FindWindow returns the window of a sweep's grid for a target
// probability, using point estimates, or the upper confidence bounds when
// conservative is set. Steps with too few valid samples are never inside
// a window and never bound one.
func FindWindow(sw *Sweep, target float64, conservative bool) Window {
	w := Window{Target: target, Conservative: conservative}
	p := func(i int) float64 { return prob(sw.Steps[i].Result.Any, conservative) }
	best := -1
	for i, st := range sw.Steps {
		if !st.TooFewValid && (best < 0 || p(i) < p(best)) {
			best = i
		}
	}
	if best < 0 {
		return w
	}
	w.Best, w.BestP = sw.Steps[best].X, p(best)
	if w.BestP > target {
		return w
	}
	w.Found = true
	lo, hi := best, best
	ok := func(i int) bool { return !sw.Steps[i].TooFewValid && p(i) <= target }
	for lo > 0 && ok(lo-1) {
		lo--
	}
	for hi < len(sw.Steps)-1 && ok(hi+1) {
		hi++
	}
	w.Lo, w.Hi = sw.Steps[lo].X, sw.Steps[hi].X
	w.LoInvalid = lo > 0 && sw.Steps[lo-1].TooFewValid
	w.HiInvalid = hi < len(sw.Steps)-1 && sw.Steps[hi+1].TooFewValid
	w.OpenLo, w.OpenHi = lo == 0 || w.LoInvalid, hi == len(sw.Steps)-1 || w.HiInvalid
	w.LoOut, w.HiOut = w.Lo, w.Hi
	if !w.OpenLo {
		w.LoOut = sw.Steps[lo-1].X
		w.LoModes, w.LoCombined = Above(sw.Steps[lo-1].Result, target, conservative)
	}
	if !w.OpenHi {
		w.HiOut = sw.Steps[hi+1].X
		w.HiModes, w.HiCombined = Above(sw.Steps[hi+1].Result, target, conservative)
	}
	w.Resolution = math.Max(math.Abs(w.Lo-w.LoOut), math.Abs(w.HiOut-w.Hi))
	return w
}

// Above lists the modes above the target in r, most probable first (by
// their upper bounds when conservative); when none is, the most probable
// mode and true: only the modes together exceed the target.
func Above(r *montecarlo.Result, target float64, conservative bool) ([]model.Mode, bool) {
	ms := make([]montecarlo.ModeResult, len(r.Modes))
	copy(ms, r.Modes)
	sort.SliceStable(ms, func(i, j int) bool { return prob(ms[i].Estimate, conservative) > prob(ms[j].Estimate, conservative) })
	var out []model.Mode
	for _, m := range ms {
		if prob(m.Estimate, conservative) > target {
			out = append(out, m.Mode)
		}
	}
	if len(out) == 0 && len(ms) > 0 {
		return []model.Mode{ms[0].Mode}, true
	}
	return out, false
}

// RefineRelative is the bracket width, relative to the swept range, at
// which RefineWindow stops bisecting an edge.
const RefineRelative = 1.0 / 512

// RefineWindow bisects each closed end of a window between the last value
// known to meet the target and the first known to miss it, running the
// problem at the midpoint with the sweep's seed (common random numbers),
// until the bracket is narrower than RefineRelative of the swept range:
// the reported end then no longer depends on the step count. It updates
// the ends, their bounding modes and the resolution.
func RefineWindow(ctx context.Context, p *montecarlo.Problem, sw *Sweep, w *Window) error {
	if !w.Found {
		return nil
	}
	tol := (sw.Vary.Hi - sw.Vary.Lo) * RefineRelative
	bisect := func(in, out *float64, modes *[]model.Mode, combined *bool) error {
		for math.Abs(*out-*in) > tol {
			mid := (*in + *out) / 2
			r, err := at(ctx, p, sw.Vary, mid, sw.Settings)
			if err != nil {
				return err
			}
			w.Bisections++
			st := newStep(mid, r)
			if !st.TooFewValid && prob(r.Any, w.Conservative) <= w.Target {
				*in = mid
			} else {
				*out = mid
				if !st.TooFewValid {
					*modes, *combined = Above(r, w.Target, w.Conservative)
				}
			}
		}
		return nil
	}
	if !w.OpenLo {
		if err := bisect(&w.Lo, &w.LoOut, &w.LoModes, &w.LoCombined); err != nil {
			return err
		}
	}
	if !w.OpenHi {
		if err := bisect(&w.Hi, &w.HiOut, &w.HiModes, &w.HiCombined); err != nil {
			return err
		}
	}
	w.Resolution = math.Max(math.Abs(w.Lo-w.LoOut), math.Abs(w.HiOut-w.Hi))
	return nil
}

// clipConservative keeps the upper-bound window inside the point window:
// where the upper bound meets the target the estimate does too, so the
// conservative window is the part of the point window where the bound also
// holds (the two bisections evaluate different values, and on noisy curves
// could otherwise cross).
func clipConservative(pt, cons *Window) {
	if pt == nil || cons == nil || !cons.Found {
		return
	}
	if !pt.Found {
		cons.Found = false
		return
	}
	if cons.Lo < pt.Lo {
		cons.Lo, cons.LoOut, cons.OpenLo = pt.Lo, pt.LoOut, pt.OpenLo
	}
	if cons.Hi > pt.Hi {
		cons.Hi, cons.HiOut, cons.OpenHi = pt.Hi, pt.HiOut, pt.OpenHi
	}
	if cons.Lo > cons.Hi {
		cons.Found = false
	}
}

// SpreadLimit is the answer to "how much scatter may this input have?".
type SpreadLimit struct {
	Path   string
	Target float64
	Factor float64         // largest multiplier of the scenario's spread meeting the target
	Dist   montecarlo.Dist // the distribution at that factor
	// Below: even the smallest factor tried (MinSpread) misses the target.
	// Above: even the largest (MaxSpread) meets it.
	Below, Above bool
	P            float64 // any-mode probability at Factor
	Runs         int
}

// Bounds of the spread search.
const (
	MinSpread = 1.0 / 64
	MaxSpread = 16.0
)

// SpreadRuns is the number of runs a spread search makes.
const SpreadRuns = 14

// FindSpreadLimit bisects (in log of the factor, 12 halvings, common random
// numbers) for the largest multiplier of path's spread at which the any-mode
// probability stays at or below target.
func FindSpreadLimit(ctx context.Context, p *montecarlo.Problem, path string, target float64, s montecarlo.Settings) (*SpreadLimit, error) {
	v := Vary{Kind: Spread, Path: path, Lo: MinSpread, Hi: MaxSpread, Steps: 2}
	if err := v.Validate(p); err != nil {
		return nil, err
	}
	s.ProbabilitiesOnly = true
	out := &SpreadLimit{Path: path, Target: target}
	progress := s.Progress
	eval := func(f float64) (float64, montecarlo.Dist, error) {
		q, err := v.Apply(p, f)
		if err != nil {
			return 0, montecarlo.Dist{}, err
		}
		st := s
		if progress != nil {
			off := int64(out.Runs) * s.Samples
			st.Progress = func(done, _ int64) { progress(off+done, SpreadRuns*s.Samples) }
		}
		r, err := montecarlo.Estimate(ctx, q, st)
		out.Runs++
		if err != nil {
			return 0, montecarlo.Dist{}, err
		}
		i, _ := q.VarIndex(path)
		return r.Any.P, q.Vars[i].Dist, nil
	}
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
	for range SpreadRuns - 2 {
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
