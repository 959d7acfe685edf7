package fit

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sort"
	"sync"
	"sync/atomic"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/rng"
)

// Defaults of [Options].
const (
	// DefaultConfidence is the two-sided level of the intervals: each end is
	// a one-sided 95 % bound, the level reliability demonstrations usually
	// quote (common practice).
	DefaultConfidence = 0.90
	// DefaultBootstrap is the number of bootstrap replicates: with B = 999,
	// (B + 1)·α is a whole number for α = 0.05, 0.025, 0.01, so the p-values
	// and interval ends are order statistics (Davison & Hinkley, Bootstrap
	// Methods and their Application, 1997, §4.2 and §5.2).
	DefaultBootstrap = 999
	// LargeN is the sample size above which no bootstrap is run by default:
	// each replicate then costs about as much as the fit (seconds for the
	// triangular at 10⁶ values), a goodness-of-fit test rejects every
	// family for deviations too small to matter, and the intervals are
	// narrow. Set Options.Bootstrap to run one anyway.
	LargeN = 10000
	// SmallN is the sample size below which a warning is given: with fewer
	// than 10 values the goodness-of-fit tests can rarely tell the families
	// apart (common practice).
	SmallN = 10
)

// DefaultFamilies are fitted when Options.Families is nil (truncnormal too
// when bounds are given).
var DefaultFamilies = []montecarlo.Kind{montecarlo.Normal, montecarlo.LogNormal, montecarlo.Weibull, montecarlo.Uniform, montecarlo.Triangular}

// Options are the settings of [Analyze]. The zero value gives the defaults.
type Options struct {
	// Families to fit; nil fits DefaultFamilies, leaving out with a note
	// those the data exclude (lognormal and Weibull for values ≤ 0). A
	// family named here that cannot be fitted is an error.
	Families []montecarlo.Kind
	// Bounds of the truncated normal (internal units); nil: not fitted.
	Bounds *Bounds
	// Confidence is the two-sided level of the intervals; 0 means
	// DefaultConfidence.
	Confidence float64
	// Bootstrap is the number of parametric-bootstrap replicates per
	// family; 0 means DefaultBootstrap, or none above LargeN values;
	// negative means none: no p-values and no intervals.
	Bootstrap int
	// Seed of the bootstrap streams (0 is a seed like any other).
	Seed uint64
	// Workers run the replicates; 0 means GOMAXPROCS. Results do not
	// depend on it.
	Workers int
	// Progress, if set, is called now and then with the replicates done
	// and the total, from one goroutine at a time.
	Progress func(done, total int)
}

// ParamDim says how to show a parameter.
type ParamDim uint8

const (
	Plain    ParamDim = iota // a number (a shape)
	Value                    // a value of the data's quantity (internal units)
	LogValue                 // the logarithm of a value in internal units (μ of a lognormal)
)

// Param is an estimated parameter with its interval (Lo, Hi; both 0 and
// Interval false when no bootstrap was run).
type Param struct {
	Name     string
	Dim      ParamDim
	Value    float64
	Lo, Hi   float64
	Interval bool
}

// Test is a goodness-of-fit statistic with its p-value (P is 0 and
// HasP false when no bootstrap was run).
type Test struct {
	Stat float64
	P    float64
	HasP bool
}

// Candidate is one fitted family.
type Candidate struct {
	Family montecarlo.Kind
	Dist   montecarlo.Dist // the fitted distribution, ready for sampling
	// Params are the family's parameters: normal μ, σ; lognormal μ, σ of
	// ln X; Weibull shape k, scale λ; truncnormal μ, σ of the parent
	// normal; uniform lower, upper; triangular lower, mode, upper.
	Params []Param
	// Mean and COV are those of the fitted distribution (COV = sd/mean;
	// COVDefined false when the mean is not clearly positive).
	Mean       Param
	COV        Param
	COVDefined bool
	K          int     // number of estimated parameters
	LogLik     float64 // log-likelihood at the maximum
	AIC, BIC   float64 // 2k − 2ℓ and k·ln n − 2ℓ
	DeltaAIC   float64 // AIC less the smallest AIC of the candidates
	DeltaBIC   float64
	Weight     float64 // Akaike weight exp(−ΔAIC/2)/Σ
	RankBIC    int     // 1 for the smallest BIC
	AD, KS     Test    // Anderson–Darling A² and Kolmogorov–Smirnov D
	Replicates int     // bootstrap replicates used (refits that succeeded)
	Failed     int     // bootstrap replicates whose refit failed
	Notes      []string
}

// Result is the analysis of one sample.
type Result struct {
	N                  int
	Mean, SD, Min, Max float64 // of the sample (SD with divisor n − 1)
	Confidence         float64
	Bootstrap          int    // replicates per family (0: none)
	Seed               uint64 // seed of the bootstrap streams
	// Candidates ranked by AIC, best first.
	Candidates []Candidate
	// Method describes how the p-values and intervals were obtained.
	Method   string
	Warnings []string
	Notes    []string
}

// Best returns the candidate with the smallest AIC.
func (r *Result) Best() *Candidate { return &r.Candidates[0] }

// OpenTailed reports whether a family's upper tail is unbounded (normal,
// lognormal, Weibull), so that it can put probability beyond the data.
func OpenTailed(k montecarlo.Kind) bool {
	return k == montecarlo.Normal || k == montecarlo.LogNormal || k == montecarlo.Weibull
}

// Recommended returns the candidate to put into a scenario: the smallest
// AIC among the open-tailed families, else the best. A bounded family
// (uniform, triangular, truncated normal) often wins AIC on a small series
// — its support hugs the data — but ends at the fitted bounds, so it would
// call every failure beyond them impossible; small probabilities live in
// exactly those tails (common practice in structural reliability).
func (r *Result) Recommended() *Candidate {
	for i := range r.Candidates {
		if OpenTailed(r.Candidates[i].Family) {
			return &r.Candidates[i]
		}
	}
	return r.Best()
}

// Candidate returns the fit of a family, or nil.
func (r *Result) Candidate(k montecarlo.Kind) *Candidate {
	for i := range r.Candidates {
		if r.Candidates[i].Family == k {
			return &r.Candidates[i]
		}
	}
	return nil
}

// Analyze fits the families to x (internal units), ranks them by AIC and
// BIC, tests each by Anderson–Darling and Kolmogorov–Smirnov with p-values
// from a parametric bootstrap (every replicate drawn from the fitted
// distribution and refitted, so that the p-values allow for the estimated
// parameters), and gives bootstrap intervals of the parameters, the mean
// and the c.o.v. Each replicate i draws from its own PCG stream, derived
// from (Seed, family, i): the result is the same for any number of workers.
func Analyze(x []float64, opt Options) (*Result, error) {
	if err := checkValues(x); err != nil {
		return nil, err
	}
	n := len(x)
	if n < 3 {
		return nil, fmt.Errorf("fit: %d values: a fit with goodness-of-fit tests needs at least 3", n)
	}
	conf := opt.Confidence
	if conf == 0 {
		conf = DefaultConfidence
	}
	if !(conf > 0 && conf < 1) {
		return nil, fmt.Errorf("fit: confidence %g must lie between 0 and 1 (e.g. 0.90)", opt.Confidence)
	}
	nb := opt.Bootstrap
	switch {
	case nb == 0 && n > LargeN:
		nb = 0
	case nb == 0:
		nb = DefaultBootstrap
	case nb < 0:
		nb = 0
	}
	s := slices.Clone(x)
	slices.Sort(s)
	res := &Result{N: n, Min: s[0], Max: s[n-1], Confidence: conf, Bootstrap: nb, Seed: opt.Seed}
	m, sd := meanSD(s, false)
	res.Mean, res.SD = m, sd*math.Sqrt(float64(n)/float64(n-1))

	fams := opt.Families
	explicit := fams != nil
	if !explicit {
		fams = slices.Clone(DefaultFamilies)
		if opt.Bounds != nil {
			fams = append(fams, montecarlo.TruncNormal)
		}
	}
	if len(fams) == 0 {
		return nil, fmt.Errorf("fit: no family to fit (allowed: normal, lognormal, weibull, truncnormal, uniform, triangular)")
	}
	for i, k := range fams {
		if slices.Contains(fams[:i], k) {
			return nil, fmt.Errorf("fit: family %s named twice", k)
		}
	}
	total := nb * len(fams)
	var prog *progress
	if opt.Progress != nil {
		prog = &progress{f: opt.Progress, total: total}
	}
	for _, k := range fams {
		if err := admissible(k, s, opt.Bounds); err != nil {
			if explicit {
				return nil, err
			}
			res.Notes = append(res.Notes, fmt.Sprintf("%s not fitted: %v", k, trimPrefix(err)))
			prog.add(nb)
			continue
		}
		c, err := fitCandidate(k, s, opt, conf, nb, prog)
		if err != nil {
			prog.add(nb) // the bootstrap did not run
			if explicit {
				return nil, err
			}
			res.Notes = append(res.Notes, fmt.Sprintf("%s not fitted: %v", k, trimPrefix(err)))
			continue
		}
		res.Candidates = append(res.Candidates, *c)
	}
	if len(res.Candidates) == 0 {
		return nil, fmt.Errorf("fit: no family could be fitted: %v", res.Notes)
	}
	rank(res.Candidates)
	if n < SmallN {
		res.Warnings = append(res.Warnings, fmt.Sprintf("only %d values (fewer than %d): the tests can rarely tell the families apart and the intervals are wide; the posterior predictive of a normal or lognormal fit carries the uncertainty of so small a series", n, SmallN))
	}
	if opt.Bootstrap == 0 && n > LargeN {
		res.Notes = append(res.Notes, fmt.Sprintf("no bootstrap by default above %d values: with so many, every family is rejected for deviations too small to matter; judge the probability plot, or set the number of replicates", LargeN))
	}
	if nb > 0 {
		res.Method = fmt.Sprintf("p-values: parametric bootstrap, %d replicates per family drawn from the fitted distribution and refitted (seed %d), p = (1 + #{T* ≥ T})/(B + 1); intervals (%g %% two-sided): bootstrap pivots — studentized for locations, log-ratio for scales, shapes and c.o.v., the c.o.v. of lognormal and Weibull mapped from the interval of its shape", nb, opt.Seed, 100*conf)
	} else {
		res.Method = "no bootstrap: no p-values and no intervals"
	}
	return res, nil
}

func trimPrefix(err error) string {
	s := err.Error()
	if len(s) > 5 && s[:5] == "fit: " {
		return s[5:]
	}
	return s
}

// rank sorts by AIC and fills the differences, weights and BIC ranks.
func rank(cs []Candidate) {
	sort.SliceStable(cs, func(i, j int) bool { return cs[i].AIC < cs[j].AIC })
	minA, minB := cs[0].AIC, math.Inf(1)
	for _, c := range cs {
		minB = math.Min(minB, c.BIC)
	}
	var wsum float64
	for i := range cs {
		cs[i].DeltaAIC = cs[i].AIC - minA
		cs[i].DeltaBIC = cs[i].BIC - minB
		cs[i].Weight = math.Exp(-cs[i].DeltaAIC / 2)
		wsum += cs[i].Weight
	}
	for i := range cs {
		cs[i].Weight /= wsum
		r := 1
		for j := range cs {
			if cs[j].BIC < cs[i].BIC {
				r++
			}
		}
		cs[i].RankBIC = r
	}
}

type progress struct {
	mu    sync.Mutex
	f     func(done, total int)
	done  int
	total int
}

func (p *progress) add(k int) {
	if p == nil || k == 0 {
		return
	}
	p.mu.Lock()
	p.done += k
	p.f(p.done, p.total)
	p.mu.Unlock()
}

// replicate is what one bootstrap replicate keeps.
type replicate struct {
	p        params
	mean, sd float64
	ad, ks   float64
	ok       bool
}

// streamTag sets the bootstrap streams apart from the tool's other streams.
const streamTag = 0x666974 // "fit"

func fitCandidate(kind montecarlo.Kind, s []float64, opt Options, conf float64, nb int, prog *progress) (*Candidate, error) {
	n := len(s)
	p, err := estimate(kind, s, opt.Bounds, &scratch{})
	if err != nil {
		return nil, err
	}
	d, err := toDist(kind, p, opt.Bounds)
	if err != nil {
		return nil, err
	}
	k := nParams(kind)
	c := &Candidate{Family: kind, Dist: d, K: k, LogLik: p.ll}
	c.AIC = 2*float64(k) - 2*p.ll
	c.BIC = float64(k)*math.Log(float64(n)) - 2*p.ll
	f, sv := make([]float64, n), make([]float64, n)
	c.AD.Stat, c.KS.Stat = gofStats(kind, &p, s, f, sv)
	switch kind {
	case montecarlo.Uniform, montecarlo.Triangular:
		c.Notes = append(c.Notes, "support depends on the parameters: AIC and BIC are indicative only (the likelihood is not regular)")
	}
	if kind == montecarlo.Triangular {
		c.Notes = append(c.Notes, "intervals of lower and mode, and the p-values, are rough: the likelihood is irregular (the mode sits on an order statistic, the lower or upper end often on an extreme value); in simulations with 30 values the 90 % intervals of lower and mode covered only about 60 %, and the p-values were conservative")
	}
	if kind == montecarlo.Uniform {
		c.Notes = append(c.Notes, "ends: minimum-variance unbiased estimates (range/(n − 1) beyond the extremes)")
	}
	qs := quantities(kind)
	mean, sd := d.Mean(), d.StdDev()
	for _, v := range []float64{mean, sd, c.AD.Stat, c.KS.Stat, c.AIC, c.BIC} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("fit: %s: the fitted distribution has no finite mean, sd or test statistic (mean %g, sd %g)", kind, mean, sd)
		}
	}
	c.Params = make([]Param, len(qs.params))
	for i, q := range qs.params {
		c.Params[i] = Param{Name: q.name, Dim: q.dim, Value: q.val(&p, mean, sd)}
	}
	c.Mean = Param{Name: "mean", Dim: Value, Value: mean}
	c.COV = Param{Name: "c.o.v.", Dim: Plain}
	if mean > 0 {
		c.COV.Value, c.COVDefined = sd/mean, true
	}
	if nb == 0 {
		return c, nil
	}

	reps := bootstrap(kind, d, s, opt, nb, prog)
	var okReps []replicate
	for _, r := range reps {
		if r.ok {
			okReps = append(okReps, r)
		}
	}
	c.Replicates, c.Failed = len(okReps), nb-len(okReps)
	if c.Failed > 0 {
		c.Notes = append(c.Notes, fmt.Sprintf("%d of %d bootstrap refits failed and were left out", c.Failed, nb))
	}
	if len(okReps) < nb/2 || len(okReps) < 19 {
		c.Notes = append(c.Notes, "too few bootstrap refits succeeded: no p-values and no intervals")
		return c, nil
	}
	b := float64(len(okReps))
	var nad, nks int
	for _, r := range okReps {
		if r.ad >= c.AD.Stat {
			nad++
		}
		if r.ks >= c.KS.Stat {
			nks++
		}
	}
	c.AD.P, c.AD.HasP = (1+float64(nad))/(b+1), true
	c.KS.P, c.KS.HasP = (1+float64(nks))/(b+1), true

	alpha := (1 - conf) / 2
	t := make([]float64, 0, len(okReps))
	interval := func(q quantity, v, scale float64) (float64, float64, bool) {
		t = t[:0]
		for i := range okReps {
			r := &okReps[i]
			vs := q.val(&r.p, r.mean, r.sd)
			switch q.piv {
			case pivLoc:
				t = append(t, (vs-v)/q.scaleAt(&r.p, r.mean, r.sd))
			case pivLogLoc:
				if !(vs > 0) || !(v > 0) {
					return 0, 0, false
				}
				t = append(t, (math.Log(vs)-math.Log(v))/q.scaleAt(&r.p, r.mean, r.sd))
			case pivLog:
				if !(vs > 0) || !(v > 0) {
					return 0, 0, false
				}
				t = append(t, math.Log(vs/v))
			}
		}
		for _, x := range t {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return 0, 0, false
			}
		}
		slices.Sort(t)
		lo, hi := quantile(t, alpha), quantile(t, 1-alpha)
		switch q.piv {
		case pivLoc:
			return v - hi*scale, v - lo*scale, true
		case pivLogLoc:
			return math.Exp(math.Log(v) - hi*scale), math.Exp(math.Log(v) - lo*scale), true
		}
		return v * math.Exp(-hi), v * math.Exp(-lo), true
	}
	for i, q := range qs.params {
		pr := &c.Params[i]
		pr.Lo, pr.Hi, pr.Interval = interval(q, pr.Value, q.scaleAt(&p, mean, sd))
	}
	c.Mean.Lo, c.Mean.Hi, c.Mean.Interval = interval(qs.mean, mean, qs.mean.scaleAt(&p, mean, sd))
	if c.COVDefined {
		if qs.covFrom >= 0 {
			sh := c.Params[qs.covFrom]
			if sh.Interval {
				a, b := qs.covMap(sh.Lo), qs.covMap(sh.Hi)
				c.COV.Lo, c.COV.Hi, c.COV.Interval = math.Min(a, b), math.Max(a, b), true
			}
		} else {
			cq := quantity{piv: pivLog, val: func(_ *params, m, s float64) float64 {
				if !(m > 0) {
					return math.NaN()
				}
				return s / m
			}}
			c.COV.Lo, c.COV.Hi, c.COV.Interval = interval(cq, c.COV.Value, 1)
		}
		if !c.COV.Interval {
			c.Notes = append(c.Notes, "no c.o.v. interval: the mean of some bootstrap refits is not positive")
		}
	}
	sanitize(c)
	return c, nil
}

// sanitize drops intervals with an end that is not finite (a lognormal
// c.o.v. beyond 10¹⁵⁰, say), with a note: results hold no NaN or Inf.
func sanitize(c *Candidate) {
	ok := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	fix := func(p *Param) {
		if p.Interval && !(ok(p.Lo) && ok(p.Hi)) {
			p.Lo, p.Hi, p.Interval = 0, 0, false
			c.Notes = append(c.Notes, "no interval of the "+p.Name+": an end is not finite")
		}
	}
	for i := range c.Params {
		fix(&c.Params[i])
	}
	fix(&c.Mean)
	fix(&c.COV)
}

// quantile returns the p-quantile of sorted t by the (B + 1)·p rule,
// interpolating between order statistics.
func quantile(t []float64, p float64) float64 {
	m := len(t)
	h := float64(m+1) * p
	k := int(math.Floor(h))
	if k < 1 {
		return t[0]
	}
	if k >= m {
		return t[m-1]
	}
	return t[k-1] + (h-float64(k))*(t[k]-t[k-1])
}

// bootstrap draws nb samples of size len(s) from d, refits each and keeps
// the estimates and the statistics. Replicate i uses stream i.
func bootstrap(kind montecarlo.Kind, d montecarlo.Dist, s []float64, opt Options, nb int, prog *progress) []replicate {
	n := len(s)
	reps := make([]replicate, nb)
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, nb)
	seed := rng.Derive(opt.Seed, streamTag<<8|uint64(kind))
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			x := make([]float64, n)
			f, sv := make([]float64, n), make([]float64, n)
			sc := &scratch{}
			var pcg rand.PCG
			done := 0
			for {
				i := int(next.Add(1) - 1)
				if i >= nb {
					break
				}
				if done++; done == 16 {
					prog.add(done)
					done = 0
				}
				rng.Seed(&pcg, seed, uint64(i))
				for j := range x {
					x[j] = d.FromUniform(rng.Unit(&pcg))
				}
				slices.Sort(x)
				r := &reps[i]
				if x[0] == x[n-1] || admissible(kind, x, opt.Bounds) != nil {
					continue
				}
				p, err := estimate(kind, x, opt.Bounds, sc)
				if err != nil {
					continue
				}
				dd, err := toDist(kind, p, opt.Bounds)
				if err != nil {
					continue
				}
				r.p = p
				r.mean, r.sd = dd.Mean(), dd.StdDev()
				r.ad, r.ks = gofStats(kind, &p, x, f, sv)
				r.ok = !math.IsNaN(r.ad) && !math.IsNaN(r.ks)
			}
			prog.add(done)
		}()
	}
	wg.Wait()
	return reps
}

// pivot says how a quantity's interval is read from the bootstrap.
type pivot uint8

const (
	pivLoc    pivot = iota // (q* − q̂)/s*: locations (exact for location–scale families)
	pivLogLoc              // (ln q* − ln q̂)/s*: log-locations (Weibull scale, positive means)
	pivLog                 // ln(q*/q̂): scales and shapes (exact for their pivots)
)

type quantity struct {
	name  string
	dim   ParamDim
	piv   pivot
	val   func(p *params, mean, sd float64) float64
	scale func(p *params, mean, sd float64) float64
}

// scaleAt is the studentizing scale, 1 for log-ratio pivots.
func (q *quantity) scaleAt(p *params, mean, sd float64) float64 {
	if q.scale == nil {
		return 1
	}
	return q.scale(p, mean, sd)
}

type quantitySet struct {
	params  []quantity
	mean    quantity
	covFrom int // index of the shape parameter the c.o.v. is a function of; −1: none
	covMap  func(float64) float64
}

var (
	pA    = func(p *params, _, _ float64) float64 { return p.a }
	pB    = func(p *params, _, _ float64) float64 { return p.b }
	pC    = func(p *params, _, _ float64) float64 { return p.c }
	pMean = func(_ *params, m, _ float64) float64 { return m }
	pSD   = func(_ *params, _, s float64) float64 { return s }
	pInvA = func(p *params, _, _ float64) float64 { return 1 / p.a }
	pW    = func(p *params, _, _ float64) float64 { return p.b - p.a }
)

// quantities lists the parameters of a family and how their intervals are
// taken. For location–scale families (normal; lognormal and Weibull on the
// log scale, the latter as a smallest-extreme-value law with scale 1/k) the
// studentized location and the log-ratio of the scale are exact pivots, so
// their intervals are exact up to the bootstrap's Monte Carlo error
// (Lawless 2003, §5.1 and §6.3, from memory); the others are approximate.
func quantities(kind montecarlo.Kind) quantitySet {
	switch kind {
	case montecarlo.Normal:
		return quantitySet{params: []quantity{
			{name: "mean μ", dim: Value, piv: pivLoc, val: pA, scale: pB},
			{name: "sd σ", dim: Value, piv: pivLog, val: pB},
		}, mean: quantity{piv: pivLoc, val: pMean, scale: pB}, covFrom: -1}
	case montecarlo.LogNormal:
		return quantitySet{params: []quantity{
			{name: "μ of ln X", dim: LogValue, piv: pivLoc, val: pA, scale: pB},
			{name: "σ of ln X", dim: Plain, piv: pivLog, val: pB},
		}, mean: quantity{piv: pivLogLoc, val: pMean, scale: pB}, covFrom: 1,
			covMap: func(s float64) float64 { return math.Sqrt(math.Expm1(s * s)) }}
	case montecarlo.Weibull:
		return quantitySet{params: []quantity{
			{name: "shape k", dim: Plain, piv: pivLog, val: pA},
			{name: "scale λ", dim: Value, piv: pivLogLoc, val: pB, scale: pInvA},
		}, mean: quantity{piv: pivLogLoc, val: pMean, scale: pInvA}, covFrom: 0,
			covMap: func(k float64) float64 {
				g1 := math.Gamma(1 + 1/k)
				return math.Sqrt(math.Max(math.Gamma(1+2/k)/(g1*g1)-1, 0))
			}}
	case montecarlo.TruncNormal:
		return quantitySet{params: []quantity{
			{name: "μ of the parent normal", dim: Value, piv: pivLoc, val: pA, scale: pB},
			{name: "σ of the parent normal", dim: Value, piv: pivLog, val: pB},
		}, mean: quantity{piv: pivLoc, val: pMean, scale: pSD}, covFrom: -1}
	case montecarlo.Uniform:
		return quantitySet{params: []quantity{
			{name: "lower", dim: Value, piv: pivLoc, val: pA, scale: pW},
			{name: "upper", dim: Value, piv: pivLoc, val: pB, scale: pW},
		}, mean: quantity{piv: pivLoc, val: pMean, scale: pW}, covFrom: -1}
	case montecarlo.Triangular:
		return quantitySet{params: []quantity{
			{name: "lower", dim: Value, piv: pivLoc, val: pA, scale: pW},
			{name: "mode", dim: Value, piv: pivLoc, val: pC, scale: pW},
			{name: "upper", dim: Value, piv: pivLoc, val: pB, scale: pW},
		}, mean: quantity{piv: pivLoc, val: pMean, scale: pW}, covFrom: -1}
	}
	panic("fit: quantities of an unsupported family")
}
