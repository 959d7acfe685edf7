package rare

import (
	"cmp"
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"boltrisk/montecarlo/rng"
)

// SubsetSettings tunes [Subset]. The zero value gives the defaults.
type SubsetSettings struct {
	Seed    uint64
	Workers int // goroutines (default GOMAXPROCS); results do not depend on it
	// LevelSamples is N, the samples per level of one run (default 2000).
	LevelSamples int
	// P0 is the conditional probability of each intermediate level
	// (default 0.1).
	P0 float64
	// Runs is R, the number of independent runs per round (default 20).
	Runs int
	// Precision, when > 0, adds rounds of Runs runs to an event until its
	// c.o.v. is at most Precision or MaxRuns is reached; 0 runs one round.
	Precision float64
	MaxRuns   int // cap on the runs per event (default 400)
	MaxLevels int // cap on the levels of a run, the first included (default 20)
	// Confidence is the two-sided confidence of the intervals (default 0.95).
	Confidence float64
}

// Defaults of SubsetSettings.
const (
	DefaultLevelSamples = 2000
	DefaultP0           = 0.1
	DefaultRuns         = 20
	DefaultMaxRuns      = 400
	DefaultMaxLevels    = 20
)

// Constants of the adaptive conditional sampling (Papaioannou et al. 2015):
// the initial scale λ, the share of the chains between two adaptations
// and the target acceptance rate; and the chains advanced together (one
// stream, one Eval call per step).
const (
	acsLambda0  = 0.6
	acsAdapt    = 0.1
	acsAccept   = 0.44
	chainGroup  = 16
	level0Group = 64
)

func (s *SubsetSettings) withDefaults() (SubsetSettings, error) {
	var ss SubsetSettings
	if s != nil {
		ss = *s
	}
	if ss.LevelSamples == 0 {
		ss.LevelSamples = DefaultLevelSamples
	}
	if ss.P0 == 0 {
		ss.P0 = DefaultP0
	}
	if ss.Runs == 0 {
		ss.Runs = DefaultRuns
	}
	if ss.MaxRuns == 0 {
		ss.MaxRuns = DefaultMaxRuns
	}
	if ss.MaxLevels == 0 {
		ss.MaxLevels = DefaultMaxLevels
	}
	if ss.Confidence == 0 {
		ss.Confidence = DefaultConfidence
	}
	switch {
	case !(ss.P0 > 0 && ss.P0 <= 0.5):
		return ss, fmt.Errorf("rare: SubsetSettings.P0 is %g; it must be in (0, 0.5]", ss.P0)
	case ss.LevelSamples < 2 || int(math.Round(ss.P0*float64(ss.LevelSamples))) < 1:
		return ss, fmt.Errorf("rare: SubsetSettings.LevelSamples is %d; with P0 %g it must give at least one seed (P0·N ≥ 1) and N ≥ 2", ss.LevelSamples, ss.P0)
	case ss.Runs < 1:
		return ss, fmt.Errorf("rare: SubsetSettings.Runs is %d; it must be ≥ 1", ss.Runs)
	case ss.Precision < 0:
		return ss, fmt.Errorf("rare: SubsetSettings.Precision is %g; it must be ≥ 0", ss.Precision)
	case ss.MaxRuns < ss.Runs:
		return ss, fmt.Errorf("rare: SubsetSettings.MaxRuns is %d; it must be ≥ Runs (%d)", ss.MaxRuns, ss.Runs)
	case ss.MaxLevels < 1:
		return ss, fmt.Errorf("rare: SubsetSettings.MaxLevels is %d; it must be ≥ 1", ss.MaxLevels)
	case !(ss.Confidence > 0 && ss.Confidence < 1):
		return ss, fmt.Errorf("rare: SubsetSettings.Confidence is %g; it must be in (0, 1)", ss.Confidence)
	}
	ss.Workers = workers(ss.Workers)
	return ss, nil
}

// Subset estimates the probability of every event of p (and of AnyEvent)
// by subset simulation (Au & Beck 2001) on the event's limit state
// min_{c ∈ event} g_c, with preconditioned Crank–Nicolson moves whose step
// adapts as in Papaioannou et al. (2015). Each event gets R independent
// runs, each from its own streams; the estimate is their mean and its
// c.o.v. comes from the spread of the runs: the larger of s/(P̄·√R) and the
// lognormal fit √((exp(s_ln²) − 1)/R) (see the package documentation). Events with the same components share their runs.
// A cancelled ctx gives the results of the runs completed so far, marked
// Partial.
func Subset(ctx context.Context, p *Problem, s *SubsetSettings) ([]Result, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	ss, err := s.withDefaults()
	if err != nil {
		return nil, err
	}
	ts := p.targets()
	evs := newEvaluators(p, ss.Workers)
	runs := make([][]subsetOutcome, len(ts))
	partial := false
	for round := 0; ; round++ {
		type job struct{ t, r int }
		var jobs []job
		for t, tg := range ts {
			if tg.same >= 0 || len(runs[t]) >= ss.MaxRuns {
				continue
			}
			if round > 0 && (ss.Precision == 0 || subsetCOV(runs[t]) <= ss.Precision) {
				continue
			}
			n := min(ss.Runs, ss.MaxRuns-len(runs[t]))
			for r := range n {
				jobs = append(jobs, job{t, len(runs[t]) + r})
			}
		}
		if len(jobs) == 0 {
			break
		}
		if ctx.Err() != nil {
			partial = true
			break
		}
		out := make([]subsetOutcome, len(jobs))
		per := max(1, evs.n()/len(jobs)) // workers inside each run
		outer := min(len(jobs), evs.n())
		forEach(outer, len(jobs), func(w, i int) {
			j := jobs[i]
			family := rng.Derive(rng.Derive(ss.Seed, tagSubset), uint64(j.t)<<32|uint64(j.r))
			ws := make([]int, per)
			for k := range ws {
				ws[k] = w*per + k
			}
			if outer < len(jobs) {
				ws = []int{w}
			}
			out[i] = runSubset(ctx, p, ts[j.t].comps, ss, family, evs, ws)
		})
		for i, j := range jobs {
			if out[i].aborted {
				partial = true
				continue
			}
			runs[j.t] = append(runs[j.t], out[i])
		}
		if partial {
			break
		}
	}
	res := make([]Result, len(ts))
	for t, tg := range ts {
		src := t
		if tg.same >= 0 {
			src = tg.same
		}
		res[t] = subsetResult(p, tg, runs[src], ss, partial)
		if tg.same >= 0 {
			res[t].Subset.SharedWith = ts[tg.same].name
		}
	}
	return res, nil
}

// subsetOutcome is one run's result with its failure-conditional mean.
type subsetOutcome struct {
	run     SubsetRun
	shift   []float64 // mean of u over the final level's failed samples
	failed  int       // failed samples of the final level
	aborted bool      // cancelled before its last level: not used
}

// subsetCOV is the c.o.v. of the mean of the runs (+Inf when undefined):
// the larger of the plain s/(P̄·√R), s the sample standard deviation of the
// runs' estimates P_r, and of the lognormal fit √((exp(s_ln²) − 1)/R),
// s_ln the sample standard deviation of ln P_r (when every P_r > 0). The
// runs' estimates are right-skewed (their 99 % quantile is 3–4 times their
// median in the cases tested), and the sample standard deviation of 20
// skewed values is biased low; the lognormal fit is not, for such data.
func subsetCOV(runs []subsetOutcome) float64 {
	r := len(runs)
	if r < 2 {
		return math.Inf(1)
	}
	mean, lmean := 0.0, 0.0
	pos := true
	for _, o := range runs {
		mean += o.run.Probability
		if o.run.Probability > 0 {
			lmean += math.Log(o.run.Probability)
		} else {
			pos = false
		}
	}
	mean /= float64(r)
	lmean /= float64(r)
	if mean == 0 {
		return math.Inf(1)
	}
	ss, ls := 0.0, 0.0
	for _, o := range runs {
		d := o.run.Probability - mean
		ss += d * d
		if pos {
			l := math.Log(o.run.Probability) - lmean
			ls += l * l
		}
	}
	cov := math.Sqrt(ss/float64(r-1)) / (mean * math.Sqrt(float64(r)))
	if pos {
		cov = math.Max(cov, math.Sqrt(math.Expm1(ls/float64(r-1))/float64(r)))
	}
	return cov
}

func subsetResult(p *Problem, tg target, runs []subsetOutcome, ss SubsetSettings, partial bool) Result {
	r := Result{Event: tg.name, Components: tg.comps, Method: MethodSubset, Confidence: ss.Confidence, Partial: partial,
		Shift: make([]float64, p.Dim), ShiftSE: make([]float64, p.Dim),
		Subset: &SubsetDiagnostics{LevelSamples: ss.LevelSamples, P0: ss.P0}}
	nr := len(runs)
	if nr == 0 {
		r.Warnings = append(r.Warnings, "no run completed")
		return r
	}
	mean := 0.0
	for _, o := range runs {
		r.Subset.Runs = append(r.Subset.Runs, o.run)
		r.Evaluations += o.run.Evaluations
		mean += o.run.Probability
		if o.run.Message != "" {
			r.Warnings = append(r.Warnings, fmt.Sprintf("run %d: %s", len(r.Subset.Runs)-1, o.run.Message))
		}
	}
	mean /= float64(nr)
	r.Probability = mean
	if mean == 0 {
		r.Warnings = append(r.Warnings, "no run reached the failure domain: the probability is below what these runs resolve")
		return r
	}
	q := 0.0
	if nr >= 2 {
		r.COV = subsetCOV(runs)
		q = tQuantile(ss.Confidence, nr-1)
		r.Interval = fmt.Sprintf("lognormal: P·exp(∓%.4g·√ln(1 + COV²)) (Student-t quantile, %d degrees of freedom, on the log scale); COV from the spread of %d independent runs", q, nr-1, nr)
	} else {
		r.COV = runs[0].run.FormulaCOV
		q = zQuantile(ss.Confidence)
		r.Interval = fmt.Sprintf("lognormal: P·exp(∓%.4g·√ln(1 + COV²)); COV from the single-run formula with the chain correlation γ, a lower bound", q)
		r.Warnings = append(r.Warnings, "one run only: the c.o.v. is the single-run formula's, which under-reports the spread of repeated runs")
	}
	r.Lo, r.Hi = logInterval(mean, r.COV, q)
	// Failure-conditional mean: average of the runs' final-level means,
	// standard error from their spread.
	k := 0
	for _, o := range runs {
		if o.failed > 0 {
			k++
			for i, x := range o.shift {
				r.Shift[i] += x
			}
		}
	}
	if k > 0 {
		for i := range r.Shift {
			r.Shift[i] /= float64(k)
		}
	}
	if k > 1 {
		for _, o := range runs {
			if o.failed > 0 {
				for i, x := range o.shift {
					d := x - r.Shift[i]
					r.ShiftSE[i] += d * d
				}
			}
		}
		for i := range r.ShiftSE {
			r.ShiftSE[i] = math.Sqrt(r.ShiftSE[i] / float64(k-1) / float64(k))
		}
	}
	return r
}

// subsetRunner holds one run's level buffers.
type subsetRunner struct {
	p      *Problem
	comps  []int
	ss     SubsetSettings
	family uint64
	evs    *evaluators
	ws     []int // worker indices (evaluators) of this run
	scr    []*groupScratch
	cur    []float64 // current level: N rows of Dim
	gcur   []float64 // its event margins min_c g_c
	next   []float64
	gnext  []float64
	starts []int // chain starts of the current level (nil at level 0)
	lens   []int
	evals  []int64 // per worker slot: evaluations
	inval  []int64
}

// groupScratch is one worker's scratch for a group of rows or chains.
type groupScratch struct {
	pcg  rand.PCG
	rows []float64
	g    []float64
	u    []float64 // chain states
	gu   []float64
}

func runSubset(ctx context.Context, p *Problem, comps []int, ss SubsetSettings, family uint64, evs *evaluators, ws []int) subsetOutcome {
	n, d := ss.LevelSamples, p.Dim
	r := &subsetRunner{p: p, comps: comps, ss: ss, family: family, evs: evs, ws: ws,
		cur: make([]float64, n*d), gcur: make([]float64, n), next: make([]float64, n*d), gnext: make([]float64, n),
		evals: make([]int64, len(ws)), inval: make([]int64, len(ws))}
	rows := max(level0Group, chainGroup)
	for range ws {
		r.scr = append(r.scr, &groupScratch{rows: make([]float64, rows*d), g: make([]float64, rows*p.Components),
			u: make([]float64, chainGroup*d), gu: make([]float64, chainGroup)})
	}
	return r.run(ctx)
}

// stream returns the stream index of group g of a level.
func stream(level, g int) uint64 { return uint64(level)<<32 | uint64(g) }

// margin returns min over the event's components of row i of g (nc per
// row), +Inf when they are all NaN (outside the domain).
func (r *subsetRunner) margin(g []float64, i int) (float64, bool) {
	nc := r.p.Components
	m, valid := math.Inf(1), false
	for _, c := range r.comps {
		x := g[i*nc+c]
		if !math.IsNaN(x) {
			valid = true
			m = math.Min(m, x)
		}
	}
	return m, valid
}

func (r *subsetRunner) eval(slot int, rows []float64, k int, g []float64) {
	r.evs.get(r.ws[slot]).Eval(rows[:k*r.p.Dim], k, g[:k*r.p.Components])
	r.evals[slot] += int64(k)
	nc := r.p.Components
	for i := range k {
		all := true
		for _, x := range g[i*nc : (i+1)*nc] {
			if !math.IsNaN(x) {
				all = false
				break
			}
		}
		if all {
			r.inval[slot]++
		}
	}
}

func (r *subsetRunner) run(ctx context.Context) subsetOutcome {
	n, d := r.ss.LevelSamples, r.p.Dim
	var out subsetOutcome
	// Level 0: plain Monte Carlo in groups of rows, each its own stream.
	ng := (n + level0Group - 1) / level0Group
	forEach(len(r.ws), ng, func(w, gi int) {
		s := r.scr[w]
		rng.Seed(&s.pcg, r.family, stream(0, gi))
		lo, hi := gi*level0Group, min(n, (gi+1)*level0Group)
		k := hi - lo
		rng.Normals(&s.pcg, s.rows[:k*d], 1)
		r.eval(w, s.rows, k, s.g)
		copy(r.cur[lo*d:hi*d], s.rows[:k*d])
		for i := range k {
			r.gcur[lo+i], _ = r.margin(s.g, i)
		}
	})
	nc := int(math.Round(r.ss.P0 * float64(n)))
	order := make([]int, n)
	prod := 1.0
	lambda := acsLambda0
	var delta2 float64 // Σ_j (1 + γ_j)(1 − p_j)/(p_j N)
	prevB := math.Inf(1)
	for level := 0; ; level++ {
		if ctx.Err() != nil {
			out.aborted = true
			return out
		}
		for i := range order {
			order[i] = i
		}
		slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(r.gcur[a], r.gcur[b]) })
		nf := 0
		for _, x := range r.gcur {
			if x <= 0 {
				nf++
			}
		}
		final := nf >= nc
		var b float64
		if !final {
			b = 0.5 * (r.gcur[order[nc-1]] + r.gcur[order[nc]])
			switch {
			case math.IsInf(b, 1) || math.IsNaN(b):
				out.run.Message = fmt.Sprintf("level %d: fewer than P0·N samples inside the model's domain", level+1)
				final = true
			case b >= prevB:
				out.run.Message = fmt.Sprintf("level %d: the threshold stopped decreasing (%.6g): the margin is flat there", level+1, b)
				final = true
			case level == r.ss.MaxLevels-1:
				out.run.Message = fmt.Sprintf("stopped at MaxLevels = %d with the threshold still at %.6g > 0: the estimate %s", r.ss.MaxLevels, b, "counts the failed samples of the last level only")
				final = true
			}
		}
		if final {
			pf := float64(nf) / float64(n)
			out.run.Probability = prod * pf
			out.run.Levels = level + 1
			if nf > 0 {
				delta2 += (1 + r.gamma(0)) * (1 - pf) / (pf * float64(n))
				out.shift = make([]float64, d)
				for i, x := range r.gcur {
					if x <= 0 {
						for j := range d {
							out.shift[j] += r.cur[i*d+j]
						}
					}
				}
				for j := range out.shift {
					out.shift[j] /= float64(nf)
				}
				out.failed = nf
				out.run.FormulaCOV = math.Sqrt(delta2)
			}
			break
		}
		k := nc
		for k < n && r.gcur[order[k]] <= b {
			k++
		}
		pj := float64(k) / float64(n)
		delta2 += (1 + r.gamma(b)) * (1 - pj) / (pj * float64(n))
		prod *= pj
		prevB = b
		out.run.Thresholds = append(out.run.Thresholds, b)
		acc := r.nextLevel(level+1, order[:k], b, &lambda)
		out.run.Acceptance = append(out.run.Acceptance, acc)
		r.cur, r.next = r.next, r.cur
		r.gcur, r.gnext = r.gnext, r.gcur
	}
	for w := range r.ws {
		out.run.Evaluations += r.evals[w]
		out.run.Invalid += r.inval[w]
	}
	return out
}

// gamma returns the correlation factor γ of the current level's chains for
// the indicator g ≤ b (Au & Beck 2001; in the form of Zuev et al. 2012,
// Eqs. 20 and 22): γ = 2·Σ_{k ≥ 1} (1 − k/Ns)·R(k)/R(0), R(k) the lag-k
// autocovariance of the indicator pooled over the chains. 0 at level 0
// (independent samples).
func (r *subsetRunner) gamma(b float64) float64 {
	if r.starts == nil {
		return 0
	}
	n := float64(r.ss.LevelSamples)
	p := 0.0
	for _, x := range r.gcur {
		if x <= b {
			p++
		}
	}
	p /= n
	r0 := p - p*p
	if r0 <= 0 {
		return 0
	}
	maxLen := slices.Max(r.lens)
	ns := n / float64(len(r.starts))
	gam := 0.0
	for lag := 1; lag < maxLen; lag++ {
		s, pairs := 0.0, 0
		for c, st := range r.starts {
			for l := 0; l+lag < r.lens[c]; l++ {
				if r.gcur[st+l] <= b && r.gcur[st+l+lag] <= b {
					s++
				}
				pairs++
			}
		}
		if pairs == 0 {
			break
		}
		rk := s/float64(pairs) - p*p
		gam += 2 * math.Max(0, 1-float64(lag)/ns) * rk / r0
	}
	return math.Max(gam, 0)
}

// nextLevel grows chains from the seeds (indices into the current level,
// with margins ≤ b) by preconditioned Crank–Nicolson moves into r.next and
// returns the mean acceptance rate. Chains are processed in waves of
// round(acsAdapt·k) chains; the step σ = min(1, λ) adapts after each wave
// by the rule of Papaioannou et al. (2015) for their adaptive conditional
// sampling, ln λ ← ln λ + (â − 0.44)/√i (â the wave's acceptance rate, i
// the wave number). Unlike their aCS, σ is the same in every coordinate,
// not scaled by the seeds' per-coordinate standard deviation: with seeds
// in two opposite failure regions that standard deviation mixes the
// regions, the chains stall and repeated runs spread 2.9 times more than
// they report (measured: two opposite modes, N = 1000, 100 × 20 runs;
// 1.06 with the isotropic step). A wave's chains run in groups of
// chainGroup, each group from its own stream, in parallel.
func (r *subsetRunner) nextLevel(level int, seeds []int, b float64, lambda *float64) float64 {
	n := r.ss.LevelSamples
	k := len(seeds)
	// Shuffle the seeds (they come sorted by margin) with the level's own
	// control stream, the last group index.
	var ctrl rand.PCG
	rng.Seed(&ctrl, r.family, stream(level, math.MaxUint32))
	sh := slices.Clone(seeds)
	rand.New(&ctrl).Shuffle(k, func(i, j int) { sh[i], sh[j] = sh[j], sh[i] })
	starts, lens := make([]int, k), make([]int, k)
	pos := 0
	for c := range k {
		lens[c] = n / k
		if c < n%k {
			lens[c]++
		}
		starts[c] = pos
		pos += lens[c]
	}
	na := max(1, int(math.Round(acsAdapt*float64(k))))
	group := 0
	var accAll, movesAll int64
	for wave, c0 := 1, 0; c0 < k; wave, c0 = wave+1, c0+na {
		c1 := min(k, c0+na)
		sigma := math.Min(1, *lambda)
		rho := math.Sqrt(1 - sigma*sigma)
		ngr := (c1 - c0 + chainGroup - 1) / chainGroup
		acc := make([]int64, ngr)
		moves := make([]int64, ngr)
		g0 := group
		forEach(len(r.ws), ngr, func(w, gi int) {
			lo := c0 + gi*chainGroup
			hi := min(c1, lo+chainGroup)
			acc[gi], moves[gi] = r.chains(w, stream(level, g0+gi), sh[lo:hi], starts[lo:hi], lens[lo:hi], b, sigma, rho)
		})
		group += ngr
		var a, m int64
		for gi := range acc {
			a += acc[gi]
			m += moves[gi]
		}
		accAll += a
		movesAll += m
		if m > 0 {
			*lambda = math.Exp(math.Log(*lambda) + (float64(a)/float64(m)-acsAccept)/math.Sqrt(float64(wave)))
		}
	}
	r.starts, r.lens = starts, lens
	if movesAll == 0 {
		return 0
	}
	return float64(accAll) / float64(movesAll)
}

// chains advances a group of chains in lock step: candidate
// v = ρ·u + σ·ξ, σ = √(1 − ρ²), ξ standard normal (the proposal keeps φ
// invariant, so a candidate is accepted when its margin is ≤ b). It writes every state into
// r.next/r.gnext and returns the accepted moves and the moves.
func (r *subsetRunner) chains(w int, st uint64, seeds, starts, lens []int, b, sigma, rho float64) (acc, moves int64) {
	d := r.p.Dim
	s := r.scr[w]
	rng.Seed(&s.pcg, r.family, st)
	m := len(seeds)
	for c, sd := range seeds {
		copy(s.u[c*d:(c+1)*d], r.cur[sd*d:(sd+1)*d])
		s.gu[c] = r.gcur[sd]
		copy(r.next[starts[c]*d:(starts[c]+1)*d], s.u[c*d:(c+1)*d])
		r.gnext[starts[c]] = s.gu[c]
	}
	maxLen := slices.Max(lens)
	act := make([]int, 0, m)
	for step := 1; step < maxLen; step++ {
		act = act[:0]
		for c := range m {
			if lens[c] > step {
				act = append(act, c)
			}
		}
		for i, c := range act {
			v := s.rows[i*d : (i+1)*d]
			rng.Normals(&s.pcg, v, 1)
			u := s.u[c*d : (c+1)*d]
			for j := range v {
				v[j] = rho*u[j] + sigma*v[j]
			}
		}
		r.eval(w, s.rows, len(act), s.g)
		for i, c := range act {
			moves++
			if gv, ok := r.margin(s.g, i); ok && gv <= b {
				acc++
				copy(s.u[c*d:(c+1)*d], s.rows[i*d:(i+1)*d])
				s.gu[c] = gv
			}
			at := starts[c] + step
			copy(r.next[at*d:(at+1)*d], s.u[c*d:(c+1)*d])
			r.gnext[at] = s.gu[c]
		}
	}
	return acc, moves
}
