package decide

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sort"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/study"
)

// ToolChoice is a candidate tightening tool: its relative tolerance of the
// controlled quantity at ±3σ (the coverage of the presets).
type ToolChoice struct {
	Name      string
	Tolerance float64
}

// Alternative is a changed joint (another condition, tool or class) tried
// when no setting meets the target.
type Alternative struct {
	Label   string
	Problem *montecarlo.Problem
}

// SpecOptions are the inputs of a callout search.
type SpecOptions struct {
	Target float64
	// Path is the controlled input ("tightening.torque" or
	// "tightening.preload"); Field its binding. It must be uncertain (its
	// scatter is the tool's).
	Path  string
	Field func(*model.Inputs) *float64
	// Lo, Hi: the range of nominal settings searched (internal units).
	Lo, Hi float64
	// Steps of the grid before bisection (default 9).
	Steps    int
	Settings montecarlo.Settings
	// Tools are the candidates for the callout's tool (least precise that
	// fits is named).
	Tools []ToolChoice
	// Alternatives are swept when no setting meets the target;
	// AltSamples is their sample count (default Settings.Samples/8); each
	// is swept on a grid of AltSteps values (no bisection).
	Alternatives []Alternative
	AltSamples   int64
	// Expand is the most times the range is widened when the upper-bound
	// window reaches one of its ends (the lower end halved, the upper end
	// times 1.5); 0: never (the caller reports the range as too narrow).
	Expand int
	// Format writes a setting in messages (nil: %g in internal units).
	Format func(float64) string
}

func (o *SpecOptions) fmtX(v float64) string {
	if o.Format != nil {
		return o.Format(v)
	}
	return fmt.Sprintf("%g", v)
}

// Tolerance bounds of the search, relative at ±3σ.
const (
	MinTolerance = 0.002
	MaxTolerance = 0.5
	// ToleranceHalvings is the number of bisection runs per tolerance edge
	// (in the logarithm of the tolerance between MinTolerance and
	// MaxTolerance: a bracket of about 2 % of the tolerance).
	ToleranceHalvings = 9
	// AltSteps is the most grid values of an alternative's sweep.
	AltSteps = 7
)

// ToleranceEdge is the widest relative tolerance (±, at 3σ) meeting the
// target at the callout's nominal: Meets meets it, Misses (> Meets) does
// not; the true edge lies in [Meets, Misses).
type ToleranceEdge struct {
	Found         bool    // some tolerance ≥ MinTolerance meets the target
	Meets, Misses float64 // relative tolerances
	AtMax         bool    // even MaxTolerance meets it
	// Modes above the target at Misses, most probable first.
	Modes []model.Mode
	Runs  int
}

// ModeExcess is a mode above the target at the best setting.
type ModeExcess struct {
	Mode  model.Mode
	P, Hi float64
	Ratio float64 // Hi / target
}

// Suggestion is a preset change and the least any-mode probability it
// reaches over its (rescaled) range of settings, from a coarse grid.
type Suggestion struct {
	Label    string
	At       float64 // setting with the least upper bound
	P, Hi    float64 // any-mode estimate and upper bound there
	Meets    bool    // Hi ≤ target
	Improves float64 // base's estimate at its best setting / this one's (its upper bound when none failed)
}

// Impossible explains a target no setting meets.
type Impossible struct {
	At, P, Hi   float64      // the best setting (least upper bound) and its any-mode estimate
	Ratio       float64      // Hi / target
	Modes       []ModeExcess // modes above the target there, largest first
	Suggestions []Suggestion // best first
	AltSamples  int64
}

// Spec is the answer to "what do I print on the drawing".
type Spec struct {
	Target     float64
	Path       string
	Settings   montecarlo.Settings
	MethodNote string
	// Lo, Hi: the range searched last (after any widening).
	Lo, Hi float64
	// Sweep holds the grid and the windows of the nominal setting at the
	// file's scatter (point estimates and upper bounds, edges bisected).
	Sweep *study.Sweep
	// FileTolerance is the file's scatter of the controlled input as a
	// relative tolerance at ±3σ (at its own nominal).
	FileTolerance float64
	// Feasible: some setting meets the target on the upper bound.
	Feasible bool
	// RangeLo/RangeHi: the upper-bound window reaches that end of the
	// searched range, so the range cannot hold it.
	RangeLo, RangeHi bool
	// Nominal is the callout's setting: the geometric middle of the
	// upper-bound window, to three significant figures.
	Nominal float64
	// Point and Upper are the tolerance edges at Nominal from point
	// estimates and from upper confidence bounds.
	Point, Upper ToleranceEdge
	// AtCallout is the run at Nominal with tolerance Upper.Meets: every
	// mode's estimate at the callout.
	AtCallout *montecarlo.Result
	// Tool is the least precise candidate whose tolerance fits Upper.Meets
	// ("" none); ToolTolerance its tolerance.
	Tool          string
	ToolTolerance float64
	// Multiple is Upper.Meets / FileTolerance: the file's scatter may be
	// this many times as wide.
	Multiple   float64
	Impossible *Impossible
	Runs       int
}

// Validate checks the options against the problem.
func (o *SpecOptions) Validate(p *montecarlo.Problem) error {
	if !(o.Target > 0 && o.Target < 1) {
		return fmt.Errorf("target probability must lie strictly between 0 and 1, got %g", o.Target)
	}
	if o.Field == nil {
		return fmt.Errorf("%s: no such input", o.Path)
	}
	v, ok := findVar(p, o.Path)
	if !ok {
		return fmt.Errorf("%s has no scatter: give a tightening tool or a distribution, so that the tolerance has a shape", o.Path)
	}
	if v.Dist.Kind != montecarlo.Normal && v.Dist.Kind != montecarlo.LogNormal && v.Dist.Kind != montecarlo.TruncNormal {
		return fmt.Errorf("%s is %s: the tolerance band needs a normal or lognormal scatter (a tool preset gives one)", o.Path, v.Dist.Kind)
	}
	if !(o.Lo > 0 && o.Lo < o.Hi) || math.IsInf(o.Hi, 0) {
		return fmt.Errorf("range %g..%g: the lower end must be > 0 and below the upper end", o.Lo, o.Hi)
	}
	if o.Steps != 0 && (o.Steps < 3 || o.Steps > 101) {
		return fmt.Errorf("steps must lie within 3 … 101, got %d", o.Steps)
	}
	return nil
}

func findVar(p *montecarlo.Problem, path string) (*montecarlo.Var, bool) {
	i, ok := p.VarIndex(path)
	if !ok {
		return nil, false
	}
	return &p.Vars[i], true
}

// relTol is the relative tolerance at ±3σ of a distribution.
func relTol(d montecarlo.Dist) float64 { return 3 * d.StdDev() / math.Abs(d.Mean()) }

// RunSpec finds the callout: the window of nominal settings meeting the
// target at the file's scatter (a sweep with common random numbers, edges
// bisected, point estimates and upper bounds), a nominal in it, and the
// widest tolerance at that nominal (bisection with common random
// numbers) — or, when nothing meets the target, what makes it impossible
// and which preset change helps most.
func RunSpec(ctx context.Context, p *montecarlo.Problem, o SpecOptions) (*Spec, error) {
	if err := o.Validate(p); err != nil {
		return nil, err
	}
	if o.Steps == 0 {
		o.Steps = 9
	}
	s := o.Settings.WithDefaults()
	s.Precision, s.ProbabilitiesOnly, s.Progress = 0, true, nil
	out := &Spec{Target: o.Target, Path: o.Path}
	v0, _ := findVar(p, o.Path)
	out.FileTolerance = relTol(v0.Dist)
	if s.Method == montecarlo.Auto {
		m, note, err := montecarlo.Resolve(ctx, p, s)
		if err != nil {
			return nil, err
		}
		s.Method, out.MethodNote = m, note
	}
	out.Settings = s
	vary := study.Vary{Kind: study.Input, Path: o.Path, Field: o.Field, Lo: o.Lo, Hi: o.Hi, Steps: o.Steps}
	var sw *study.Sweep
	for try := 0; ; try++ {
		var err error
		if sw, err = study.Run(ctx, p, vary, s, o.Target); err != nil {
			return nil, err
		}
		out.Runs += len(sw.Steps) + sw.Window.Bisections + sw.Conservative.Bisections
		w := sw.Conservative
		if !w.Found || try >= o.Expand || !(w.OpenLo || w.OpenHi) {
			break
		}
		if w.OpenLo {
			vary.Lo /= 2
		}
		if w.OpenHi {
			vary.Hi *= 1.5
		}
	}
	out.Lo, out.Hi = vary.Lo, vary.Hi
	o.Lo, o.Hi = vary.Lo, vary.Hi
	out.Sweep = sw
	w := sw.Conservative
	out.Feasible = w.Found
	if !w.Found {
		imp, err := impossible(ctx, p, o, s, sw)
		out.Impossible = imp
		return out, err
	}
	out.RangeLo, out.RangeHi = w.OpenLo, w.OpenHi
	out.Nominal = clamp(roundSig(math.Sqrt(w.Lo*w.Hi), 3), w.Lo, w.Hi)
	q, err := vary.Apply(p, out.Nominal)
	if err != nil {
		return nil, err
	}
	var best *montecarlo.Result
	out.Point, _, err = toleranceEdge(ctx, q, o, s, out.FileTolerance, false)
	if err != nil {
		return nil, err
	}
	out.Upper, best, err = toleranceEdge(ctx, q, o, s, out.FileTolerance, true)
	if err != nil {
		return nil, err
	}
	out.Runs += out.Point.Runs + out.Upper.Runs
	out.AtCallout = best
	if out.Upper.Found {
		out.Multiple = out.Upper.Meets / out.FileTolerance
		for _, t := range o.Tools {
			if t.Tolerance <= out.Upper.Meets*(1+1e-9) && t.Tolerance > out.ToolTolerance {
				out.Tool, out.ToolTolerance = t.Name, t.Tolerance
			}
		}
	}
	return out, nil
}

func clamp(x, lo, hi float64) float64 { return math.Min(math.Max(x, lo), hi) }

// roundSig rounds x to n significant figures.
func roundSig(x float64, n int) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	e := math.Pow(10, float64(n)-1-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*e) / e
}

// meets reports whether a run meets the target on the chosen basis; a run
// with too few valid samples never does.
func meets(r *montecarlo.Result, target float64, upper bool) bool {
	drawn := r.Samples + r.Invalid
	if r.Samples == 0 || float64(r.Samples) < study.MinValidShare*float64(drawn) {
		return false
	}
	if upper {
		return r.Any.Hi <= target
	}
	return r.Any.P <= target
}

// toleranceEdge bisects, in the logarithm of the relative tolerance, for
// the widest tolerance of the controlled input at q's nominal that meets
// the target; every run uses the same seed (common random numbers). It
// returns the run at the edge found.
func toleranceEdge(ctx context.Context, q *montecarlo.Problem, o SpecOptions, s montecarlo.Settings, t0 float64, upper bool) (ToleranceEdge, *montecarlo.Result, error) {
	var e ToleranceEdge
	run := func(t float64) (*montecarlo.Result, error) {
		v := study.Vary{Kind: study.Spread, Path: o.Path, Lo: t / t0, Hi: t/t0 + 1, Steps: 2}
		qq, err := v.Apply(q, t/t0)
		if err != nil {
			return nil, err
		}
		e.Runs++
		r, err := montecarlo.Estimate(ctx, qq, s)
		if err != nil {
			return nil, err
		}
		return r, nil
	}
	lo, hi := MinTolerance, MaxTolerance
	rLo, err := run(lo)
	if err != nil {
		return e, nil, err
	}
	if !meets(rLo, o.Target, upper) {
		e.Misses, e.Modes = lo, aboveTarget(rLo, o.Target, upper)
		return e, rLo, nil
	}
	e.Found = true
	rHi, err := run(hi)
	if err != nil {
		return e, nil, err
	}
	if meets(rHi, o.Target, upper) {
		e.AtMax, e.Meets, e.Misses = true, hi, hi
		return e, rHi, nil
	}
	e.Modes = aboveTarget(rHi, o.Target, upper)
	best := rLo
	a, b := math.Log(lo), math.Log(hi)
	for range ToleranceHalvings {
		mid := (a + b) / 2
		r, err := run(math.Exp(mid))
		if err != nil {
			return e, nil, err
		}
		if meets(r, o.Target, upper) {
			a, best = mid, r
		} else {
			b = mid
			e.Modes = aboveTarget(r, o.Target, upper)
		}
	}
	e.Meets, e.Misses = math.Exp(a), math.Exp(b)
	return e, best, nil
}

// impossible explains why no setting meets the target and sweeps the
// alternatives, each over the range rescaled to the same assembly preload.
func impossible(ctx context.Context, p *montecarlo.Problem, o SpecOptions, s montecarlo.Settings, sw *study.Sweep) (*Impossible, error) {
	bi := -1
	for i, st := range sw.Steps {
		if !st.TooFewValid && (bi < 0 || st.Result.Any.Hi < sw.Steps[bi].Result.Any.Hi) {
			bi = i
		}
	}
	imp := &Impossible{}
	if bi < 0 {
		return imp, errors.New("no setting in the range has enough valid samples (the model's domain): widen or move the range")
	}
	r := sw.Steps[bi].Result
	imp.At, imp.P, imp.Hi, imp.Ratio = sw.Steps[bi].X, r.Any.P, r.Any.Hi, r.Any.Hi/o.Target
	for _, m := range r.Modes {
		if m.Estimate.Hi > o.Target {
			imp.Modes = append(imp.Modes, ModeExcess{Mode: m.Mode, P: m.Estimate.P, Hi: m.Estimate.Hi, Ratio: m.Estimate.Hi / o.Target})
		}
	}
	sort.SliceStable(imp.Modes, func(i, j int) bool { return imp.Modes[i].Hi > imp.Modes[j].Hi })
	if len(o.Alternatives) == 0 {
		return imp, nil
	}
	as := s
	as.Samples = o.AltSamples
	if as.Samples == 0 {
		as.Samples = max(s.Samples/8, 1)
	}
	imp.AltSamples = as.Samples
	base := settingPerPreload(p, o)
	for _, alt := range o.Alternatives {
		scale := 1.0
		if b, a := base, settingPerPreload(alt.Problem, o); b > 0 && a > 0 {
			scale = a / b
		}
		v := study.Vary{Kind: study.Input, Path: o.Path, Field: o.Field, Lo: o.Lo * scale, Hi: o.Hi * scale, Steps: min(o.Steps, AltSteps)}
		if _, ok := findVar(alt.Problem, o.Path); !ok {
			continue
		}
		asw, err := study.Run(ctx, alt.Problem, v, as, 0)
		if err != nil {
			if errors.Is(err, montecarlo.ErrInterrupted) {
				return imp, err
			}
			continue // an alternative outside the model's domain is not a suggestion
		}
		sg := Suggestion{Label: alt.Label, Hi: math.Inf(1)}
		for _, st := range asw.Steps {
			if !st.TooFewValid && st.Result.Any.Hi < sg.Hi {
				sg.At, sg.P, sg.Hi = st.X, st.Result.Any.P, st.Result.Any.Hi
			}
		}
		if math.IsInf(sg.Hi, 1) {
			continue
		}
		sg.Meets = sg.Hi <= o.Target
		// Point estimates compared (the grids have fewer samples than the
		// base, so their bounds are wider); with no failure, the bound.
		if sg.P > 0 {
			sg.Improves = imp.P / sg.P
		} else if sg.Hi > 0 {
			sg.Improves = imp.P / sg.Hi
		}
		imp.Suggestions = append(imp.Suggestions, sg)
	}
	sort.SliceStable(imp.Suggestions, func(i, j int) bool { return imp.Suggestions[i].Hi < imp.Suggestions[j].Hi })
	return imp, nil
}

// settingPerPreload is the controlled setting per newton of nominal
// assembly preload (1 for a preload callout), so that an alternative is
// searched over the same preloads.
func settingPerPreload(p *montecarlo.Problem, o SpecOptions) float64 {
	return SettingPerPreload(p, o.Field)
}

// SettingPerPreload is the nominal setting of the controlled input (field)
// per newton of nominal assembly preload: a range of settings scaled by the
// ratio of two joints' values covers the same preloads in both.
func SettingPerPreload(p *montecarlo.Problem, field func(*model.Inputs) *float64) float64 {
	in := p.Base
	nom := model.EvaluateNominal(&in)
	x := *field(&in)
	if fm := nom.Outcome.Bolt.AssemblyPreload; fm > 0 && x > 0 {
		return x / fm
	}
	return 0
}

// aboveTarget lists the modes above the target (upper bounds or point
// estimates), worst first, or the worst mode when none is (study.Above).
func aboveTarget(r *montecarlo.Result, target float64, upper bool) []model.Mode {
	ms, _ := study.Above(r, target, upper)
	return ms
}
