package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/rare"
)

// Method selects the estimator of a run.
type Method uint8

const (
	// Crude is crude Monte Carlo (the zero value).
	Crude Method = iota
	// Importance is importance sampling at the design points (a defensive
	// mixture, see montecarlo/rare).
	Importance
	// Subset is subset simulation with repeated runs.
	Subset
	// Auto picks crude Monte Carlo when a pilot shows the budget reaches the
	// precision, importance sampling when design points are found and its
	// weights are healthy, else subset simulation.
	Auto
)

var methodNames = [...]string{"crude", "importance", "subset", "auto"}

func (m Method) String() string { return methodNames[m] }

// ParseMethod reads a method name.
func ParseMethod(s string) (Method, error) {
	for i, n := range methodNames {
		if n == s {
			return Method(i), nil
		}
	}
	return 0, fmt.Errorf("unknown method %q (allowed: auto, crude, importance, subset)", s)
}

// Resolve returns the method auto would choose for the problem (a crude
// pilot, then importance sampling's health check, as Estimate does), so
// that a study can fix one method for all its runs; other methods return
// themselves.
func Resolve(ctx context.Context, p *Problem, s Settings) (Method, string, error) {
	if s.Method != Auto {
		return s.Method, "", nil
	}
	s.ProbabilitiesOnly = true
	r, err := Estimate(ctx, p, s)
	if err != nil {
		return Crude, "", err
	}
	m, _ := ParseMethod(r.Method)
	return m, r.MethodNote, nil
}

// Defaults of the rare-event runs.
const (
	// DefaultPrecision is the c.o.v. auto and the rare-event methods aim at
	// when no precision is given.
	DefaultPrecision = 0.05
	// PercentileSamples is the size of the crude pass behind the
	// percentiles of a rare-event run.
	PercentileSamples = 1 << 16
	// autoPilot is the size of auto's crude pilot.
	autoPilot = 1 << 18
)

// DesignPoint is a mode's design point for one bolt (Bolt −1 for a joint
// mode) in standard-normal space and in the inputs' units.
type DesignPoint struct {
	Mode model.Mode
	Bolt int
	rare.DesignPoint
	// Inputs are the physical values at the design point, per coordinate:
	// the input path and, for a per-bolt input, its bolt.
	Inputs []DesignInput
}

// DesignInput is one input's value at a design point.
type DesignInput struct {
	Path  string
	Bolt  int // −1 for a shared input or a shared part
	Value float64
	U     float64 // its standard-normal coordinate
	Alpha float64 // its direction cosine α (FORM importance α²)
	Part  bool    // the shared part of a per-bolt input
}

// RareInfo is what a rare-event run adds to its result.
type RareInfo struct {
	DesignPoints []DesignPoint
	// Per event (reported modes in order, then any): the estimator's own
	// result with its diagnostics.
	Events   []rare.Result
	Warnings []string
	// PercentileSamples is the size of the crude pass behind the
	// distributions (0: none).
	PercentileSamples int64
}

// coordinate describes coordinate i of a kernel: its input, bolt and
// whether it is a shared part.
func (k *Kernel) coordinate(i int) (path string, bolt int, part bool) {
	ns := len(k.shared)
	switch {
	case i < ns:
		return k.vars[k.shared[i].v].Name, -1, false
	case i < ns+k.nParts:
		for _, it := range k.perBolt {
			if it.part == i-ns {
				return k.vars[it.v].Name, -1, true
			}
		}
	}
	j := i - ns - k.nParts
	return k.vars[k.perBolt[j%len(k.perBolt)].v].Name, j / len(k.perBolt), false
}

// normalSpace is the kernel seen by the rare-event estimators.
type normalSpace struct {
	k    *Kernel
	ev   *Evaluator
	rows []float64
	out  *Out
	n    int
}

func (e *normalSpace) Eval(u []float64, n int, g []float64) {
	d, nc := e.k.Dim(), e.k.Components()
	if n > e.n {
		e.n = n
		e.rows = make([]float64, n*max(d, 1))
		e.out = e.k.NewOut(n, Margins)
	}
	copy(e.rows, u[:n*d])
	e.k.MapNormals(e.rows, n)
	e.ev.Eval(e.rows, n, e.out, Margins)
	copy(g[:n*nc], e.out.G[:n*nc])
}

// RareProblem returns the kernel as a limit-state problem in standard-normal
// space: one component per reported bolt mode and bolt, and per joint mode;
// one event per reported mode (the union over its bolts); the bolts'
// coordinate blocks exchangeable.
func (k *Kernel) RareProblem() *rare.Problem {
	nc := k.Components()
	p := &rare.Problem{Dim: k.Dim(), Components: nc, Support: make([][]int, nc),
		NewEvaluator: func() rare.Evaluator { return &normalSpace{k: k, ev: k.NewEvaluator()} }}
	head := len(k.shared) + k.nParts
	np := len(k.perBolt)
	for _, m := range k.modes {
		ev := rare.Event{Name: m.Key()}
		for c := range nc {
			if cm, _ := k.Component(c); cm == m {
				ev.Components = append(ev.Components, c)
			}
		}
		p.Events = append(p.Events, ev)
	}
	for c := range nc {
		if _, b := k.Component(c); b >= 0 && np > 0 {
			var sup []int
			for i := range head {
				sup = append(sup, i)
			}
			for i := range np {
				sup = append(sup, k.boltOffset(b)+i)
			}
			p.Support[c] = sup
		}
	}
	if k.nBolts > 1 && np > 0 {
		nbm := len(k.boltModes)
		sym := &rare.Symmetry{Shared: head, Block: np, Count: k.nBolts, Map: make([][]int, k.nBolts)}
		for b := range k.nBolts {
			sym.Map[b] = make([]int, nc)
			for c := range nc {
				sym.Map[b][c] = c
				if _, cb := k.Component(c); cb == 0 {
					sym.Map[b][c] = b*nbm + c%nbm
				} else if cb == b {
					sym.Map[b][c] = c % nbm
				}
			}
		}
		p.Symmetry = sym
	}
	return p
}

// designPoint maps a design point to the inputs' units.
func (k *Kernel) designPoint(dp rare.DesignPoint) DesignPoint {
	m, b := k.Component(dp.Component)
	out := DesignPoint{Mode: m, Bolt: b, DesignPoint: dp}
	d := k.Dim()
	if len(dp.U) != d {
		return out
	}
	row := append([]float64(nil), dp.U...)
	k.MapNormals(row, 1)
	for i := range d {
		path, bolt, part := k.coordinate(i)
		if bolt >= 0 && b >= 0 && bolt != b {
			continue // other bolts' coordinates do not enter this component
		}
		di := DesignInput{Path: path, Bolt: bolt, Value: row[i], U: dp.U[i], Part: part}
		if len(dp.Alpha) == d {
			di.Alpha = dp.Alpha[i]
		}
		if part {
			di.Value = math.NaN() // a part is not an input value
		}
		out.Inputs = append(out.Inputs, di)
	}
	return out
}

// Estimate runs the problem with the method in s.Method: crude Monte Carlo
// (Run), importance sampling or subset simulation in standard-normal space,
// or auto's choice; Result.MethodNote says what auto chose and why.
func Estimate(ctx context.Context, p *Problem, s Settings) (*Result, error) {
	res, note, err := estimate(ctx, p, s)
	if res != nil {
		res.MethodNote = note
	}
	return res, err
}

func estimate(ctx context.Context, p *Problem, s Settings) (res *Result, note string, err error) {
	if err := s.Validate(); err != nil {
		return nil, "", err
	}
	m := s.Method
	s.defaults()
	k, err := NewKernel(p, s.Modes)
	if err != nil {
		return nil, "", err
	}
	if m != Crude && k.Dim() == 0 {
		if m != Auto {
			return nil, "", fmt.Errorf("method %s needs uncertain inputs: no input has a distribution (every sample is the nominal joint); use crude", m)
		}
		m = Crude
		note = "crude Monte Carlo: no input has a distribution"
	}
	switch m {
	case Crude:
		res, err = runCrude(ctx, k, s)
		return res, note, err
	case Importance, Subset:
		res, err = runRare(ctx, k, s, m)
		return res, note, err
	}
	return runAuto(ctx, k, s)
}

// runAuto picks the method: crude when a crude pilot shows the budget
// reaches the precision (expected failures ≥ 1/precision²), else importance
// sampling when every component's design point is found and the weights
// stay healthy, else subset simulation.
func runAuto(ctx context.Context, k *Kernel, s Settings) (*Result, string, error) {
	crude, why, pilot, err := autoCrude(ctx, k, s)
	if err != nil {
		return pilot, "", err
	}
	if crude {
		res, err := runCrude(ctx, k, s)
		return res, why, err
	}
	res, err := runRare(ctx, k, s, Importance)
	if err != nil {
		return res, "", err
	}
	var problems []string
	for _, ev := range res.Rare.Events {
		if d := ev.Importance; d != nil {
			if d.Degenerate {
				problems = append(problems, ev.Event+": degenerate weights")
			}
			if len(d.Uncovered) > 0 {
				problems = append(problems, fmt.Sprintf("%s: %d component(s) without a design point", ev.Event, len(d.Uncovered)))
			}
		}
	}
	if len(problems) == 0 {
		return res, "importance sampling at the design points: " + why + "; every design point was found and the weights are healthy", nil
	}
	sub, err := runRare(ctx, k, s, Subset)
	return sub, fmt.Sprintf("subset simulation: %s; importance sampling was not trusted (%s)", why, strings.Join(problems, "; ")), err
}

// autoCrude runs auto's crude pilot and reports whether the budget reaches
// the precision (crude Monte Carlo, with its note) or why not; an
// interrupted pilot is returned with the error.
func autoCrude(ctx context.Context, k *Kernel, s Settings) (bool, string, *Result, error) {
	prec := rarePrecision(s)
	need := 1 / (prec * prec)
	ps := s
	ps.Samples, ps.Precision, ps.ProbabilitiesOnly, ps.Progress = min(s.Samples, autoPilot), 0, true, nil
	pilot, err := runCrude(ctx, k, ps)
	if err != nil {
		return false, "", pilot, err
	}
	expect := pilot.Any.P * float64(s.Samples)
	if expect >= need || pilot.Samples >= s.Samples {
		note := fmt.Sprintf("crude Monte Carlo: a pilot of %d samples found %d failures, so the budget of %d samples expects %.0f, at least the %.0f that a c.o.v. of %.3g needs",
			pilot.Samples, pilot.Any.Failures, s.Samples, expect, need, prec)
		if pilot.Samples >= s.Samples {
			note = fmt.Sprintf("crude Monte Carlo: the budget of %d samples is no larger than auto's pilot", s.Samples)
		}
		return true, note, pilot, nil
	}
	return false, fmt.Sprintf("a pilot of %d crude samples found %d failures, so the budget of %d samples would give about %.0f, fewer than the %.0f that a c.o.v. of %.3g needs", pilot.Samples, pilot.Any.Failures, s.Samples, expect, need, prec), pilot, nil
}

// runRare estimates every reported mode and any mode by importance sampling
// or subset simulation in standard-normal space, with the percentiles from
// a crude pass of PercentileSamples.
func runRare(ctx context.Context, k *Kernel, s Settings, m Method) (*Result, error) {
	start := time.Now()
	prec := rarePrecision(s)
	p := k.RareProblem()
	var rs []rare.Result
	var err error
	switch m {
	case Importance:
		rs, err = rare.Importance(ctx, p, importanceSettings(s))
	default:
		rs, err = rare.Subset(ctx, p, &rare.SubsetSettings{Seed: s.Seed, Workers: s.Workers, Precision: prec, Confidence: s.Confidence,
			Runs: s.Repeats, MaxRuns: max(s.Repeats, rare.DefaultMaxRuns)})
	}
	if err != nil && len(rs) == 0 {
		if errors.Is(err, context.Canceled) || ctx.Err() != nil {
			return &Result{Method: m.String(), Partial: true, Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, Nominal: k.Nominal()},
				fmt.Errorf("%w: %v", ErrInterrupted, context.Cause(ctx))
		}
		return nil, err
	}
	return rareResult(ctx, k, s, m, rs, start)
}

// rarePrecision is the c.o.v. a rare-event run aims at: the settings'
// precision, else DefaultPrecision.
func rarePrecision(s Settings) float64 {
	if s.Precision == 0 {
		return DefaultPrecision
	}
	return s.Precision
}

// importanceSettings are the settings of an importance-sampling run: up
// to s.Samples samples until the precision is met, or exactly s.Samples
// with FixedSamples (as the parts of a split run draw).
func importanceSettings(s Settings) *rare.ImportanceSettings {
	is := &rare.ImportanceSettings{Seed: s.Seed, Workers: s.Workers, Precision: rarePrecision(s), MaxSamples: s.Samples, Confidence: s.Confidence}
	if s.FixedSamples {
		is.Samples = s.Samples
	}
	return is
}

// rareResult builds the result of a rare-event run from its per-event
// results, with the percentiles from a crude pass.
func rareResult(ctx context.Context, k *Kernel, s Settings, m Method, rs []rare.Result, start time.Time) (*Result, error) {
	prec := rarePrecision(s)
	res := &Result{Method: m.String(), Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, Precision: s.Precision,
		NBolts: k.nBolts, Nominal: k.Nominal(), Rare: &RareInfo{Events: rs}}
	res.Converged = true
	for i, r := range rs {
		e := rareEstimate(r)
		if !r.UpperOnly && !(r.COV <= prec) {
			res.Converged = false
		}
		res.Partial = res.Partial || r.Partial
		res.Rare.Warnings = append(res.Rare.Warnings, r.Warnings...)
		if i < len(k.modes) {
			mr := ModeResult{Mode: k.modes[i], Estimate: e}
			if nom := &res.Nominal.Outcome; nom.Active[mr.Mode] {
				mr.NominalSF = nom.SafetyFactor(mr.Mode)
			}
			res.Modes = append(res.Modes, mr)
		} else {
			res.Any = e
		}
		if m == Importance {
			res.Evaluations = r.Evaluations // shared by every event
			for _, dp := range r.DesignPoints {
				if !hasDesignPoint(res.Rare.DesignPoints, dp.Component) {
					res.Rare.DesignPoints = append(res.Rare.DesignPoints, k.designPoint(dp))
				}
			}
		} else {
			res.Evaluations += r.Evaluations
		}
		if d := r.Importance; d != nil {
			res.Samples, res.Invalid = d.Samples-d.Invalid, d.Invalid
		}
	}
	if res.Partial {
		res.Elapsed = time.Since(start)
		return res, fmt.Errorf("%w: %v", ErrInterrupted, context.Cause(ctx))
	}
	if !s.ProbabilitiesOnly {
		ps := s
		ps.Samples, ps.Precision, ps.Progress = min(s.Samples, PercentileSamples), 0, nil
		crude, err := runCrude(ctx, k, ps)
		if err != nil {
			res.Partial = true
			res.Elapsed = time.Since(start)
			return res, err
		}
		res.Quantities, res.Binned, res.BinStride = crude.Quantities, crude.Binned, crude.BinStride
		res.PreloadMean, res.PreloadSD = crude.PreloadMean, crude.PreloadSD
		for i := range res.Modes {
			res.Modes[i].SF = crude.Modes[i].SF
		}
		res.Rare.PercentileSamples = crude.Samples
	}
	res.Elapsed = time.Since(start)
	return res, nil
}

func hasDesignPoint(dps []DesignPoint, c int) bool {
	for _, d := range dps {
		if d.Component == c {
			return true
		}
	}
	return false
}

// rareEstimate turns a rare-event result into an estimate.
func rareEstimate(r rare.Result) interval.Estimate {
	e := interval.Estimate{P: r.Probability, COV: r.COV, Lo: r.Lo, Hi: r.Hi, Kind: interval.KindNormalLog}
	if d := r.Importance; d != nil {
		e.Failures, e.Samples = d.Failed, d.Samples-d.Invalid
	}
	if r.UpperOnly {
		e.Kind, e.Lo, e.COV = interval.KindOneSided, 0, math.Inf(1)
	}
	return e
}
