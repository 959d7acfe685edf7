package decide

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"sync"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/rare"
	"boltrisk/montecarlo/rng"
)

// DefaultSubsample is the size of the seeded subsample behind the rank
// correlations: the first samples of the crude run, so memory stays flat
// whatever the sample count.
const DefaultSubsample = 8192

// DriverOptions control a drivers study.
type DriverOptions struct {
	// Settings of the crude run (Samples, Seed, Workers, Confidence,
	// Modes); the omission runs use the same streams.
	Settings  montecarlo.Settings
	Subsample int  // default DefaultSubsample
	NoFORM    bool // skip the design points
	NoOmit    bool // skip the omission runs
	// Method is Crude (the default: estimates and shifts from one crude
	// run) or Importance (estimates, shifts and omission runs by importance
	// sampling at the design points, for small probabilities; the rank
	// correlations still from a crude subsample).
	Method montecarlo.Method
}

// InputDriver is what one uncertain input (per-bolt inputs grouped over
// the bolts) contributes to one mode.
type InputDriver struct {
	Path    string
	PerBolt bool
	// Alpha2 is the FORM importance factor α² of the input at the mode's
	// design point (the sum over its coordinates: its shared part and the
	// design point's bolt), Sign +1 when raising the input lowers the
	// margin (load-like), −1 when it raises it (resistance-like); HasAlpha
	// false without a design point (any mode; not found; not rare).
	Alpha2   float64
	Sign     int
	HasAlpha bool
	// Shift is the mean of the input's normal score Φ⁻¹(F(x)) — (x − μ)/σ
	// for a normal input — over the failed samples (for a bolt mode and a
	// per-bolt input, over the failing bolts), in standard deviations, with
	// its confidence interval (normal approximation) and the count behind it.
	Shift, ShiftLo, ShiftHi float64
	ShiftN                  int64
	// Spearman is the rank correlation of the input (per-bolt: its mean
	// normal score over the bolts) with the mode's safety factor (any mode:
	// the least over the modes) over the subsample; NaN-free (0 when
	// undefined, with SpearmanN 0).
	Spearman  float64
	SpearmanN int
	// Omitted is the probability with the input fixed at its median
	// (omission sensitivity), same random streams; HasOmitted false when
	// not run.
	Omitted    interval.Estimate
	HasOmitted bool
}

// ModeDriver is the drivers of one mode (Any: of any mode).
type ModeDriver struct {
	Mode     model.Mode
	Any      bool
	Estimate interval.Estimate
	// Beta is the Hasofer–Lind index of the mode's design point (the most
	// probable of its components); DesignNote says why there is none.
	Beta        float64
	DesignFound bool
	DesignNote  string
	Inputs      []InputDriver
}

// Drivers is the result of a drivers study.
type Drivers struct {
	Inputs     []string // uncertain inputs, problem order
	PerBolt    []bool
	Modes      []ModeDriver // reported modes in order, then any
	Samples    int64        // valid samples of the crude run
	Invalid    int64
	Subsample  int // samples behind the rank correlations
	Seed       uint64
	Confidence float64
	OmitRuns   int
	Method     string // of the estimates and shifts: crude or importance
	// ShiftNote says how the shifts of per-bolt inputs were formed by
	// importance sampling ("" for crude).
	ShiftNote string
}

// degenerate returns d collapsed onto its median with the same native
// variate (so the other inputs keep their random numbers).
func degenerate(d montecarlo.Dist) montecarlo.Dist {
	med := d.Quantile(0.5)
	switch d.Kind {
	case montecarlo.Normal:
		return montecarlo.Dist{Kind: montecarlo.Normal, A: med}
	case montecarlo.LogNormal:
		return montecarlo.Dist{Kind: montecarlo.LogNormal, A: math.Log(med)}
	}
	return montecarlo.Dist{Kind: montecarlo.Uniform, A: med, B: med}
}

// score is the normal score of x under d.
func score(d *montecarlo.Dist, x float64) float64 {
	switch d.Kind {
	case montecarlo.Normal:
		return (x - d.A) / d.B
	case montecarlo.LogNormal:
		return (math.Log(x) - d.A) / d.B
	}
	u := d.CDF(x)
	u = math.Min(math.Max(u, 1e-300), 1-1e-16)
	return distuv.UnitNormal.Quantile(u)
}

// acc holds the sums of one chunk: per event (modes, then any) and input,
// the count, sum and sum of squares of the normal scores of failures, and
// the failures per event.
type acc struct {
	n, s, ss []float64
	fail     []int64
	valid    int64
	invalid  int64
}

func newAcc(ne, ng int) acc {
	return acc{n: make([]float64, ne*ng), s: make([]float64, ne*ng), ss: make([]float64, ne*ng), fail: make([]int64, ne)}
}

func (a *acc) add(o *acc) {
	for i := range a.n {
		a.n[i] += o.n[i]
		a.s[i] += o.s[i]
		a.ss[i] += o.ss[i]
	}
	for i := range a.fail {
		a.fail[i] += o.fail[i]
	}
	a.valid += o.valid
	a.invalid += o.invalid
}

func (a *acc) put(i int, z float64) { a.n[i]++; a.s[i] += z; a.ss[i] += z * z }

// RunDrivers finds what drives each mode: FORM importance factors,
// failure-conditional shifts and rank correlations from one crude run,
// and omission sensitivities from re-runs with common random numbers.
func RunDrivers(ctx context.Context, p *montecarlo.Problem, o DriverOptions) (*Drivers, error) {
	s := o.Settings
	if err := s.Validate(); err != nil {
		return nil, err
	}
	s = s.WithDefaults()
	s.Precision, s.Progress, s.Method = 0, nil, montecarlo.Crude
	if o.Method != montecarlo.Crude && o.Method != montecarlo.Importance {
		return nil, fmt.Errorf("drivers: method %s is not supported (crude or importance)", o.Method)
	}
	if o.Method == montecarlo.Importance && len(p.Corr) > 0 {
		return nil, errors.New("drivers by importance sampling: correlated inputs are not supported (their shifts live in the copula's coordinates); use crude")
	}
	if o.Subsample == 0 {
		o.Subsample = DefaultSubsample
	}
	if o.Subsample < 16 || o.Subsample > 1<<22 {
		return nil, fmt.Errorf("subsample must lie within 16 … %d, got %d", 1<<22, o.Subsample)
	}
	if len(p.Vars) == 0 {
		return nil, errors.New("no input has a distribution: nothing drives the risk (every sample is the nominal joint)")
	}
	k, err := montecarlo.NewKernel(p, s.Modes)
	if err != nil {
		return nil, err
	}
	modes := k.Modes()
	ng, ne := len(p.Vars), len(modes)+1
	out := &Drivers{Seed: s.Seed, Confidence: s.Confidence, Method: o.Method.String()}
	crudeSamples := s.Samples
	if o.Method == montecarlo.Importance {
		crudeSamples = min(s.Samples, int64(o.Subsample)) // the rank subsample only
	}
	group := map[string]int{}
	for i, v := range p.Vars {
		out.Inputs = append(out.Inputs, v.Name)
		out.PerBolt = append(out.PerBolt, v.PerBolt())
		group[v.Name] = i
	}
	d := k.Dim()
	coordGroup, coordBolt := make([]int, d), make([]int, d)
	for i := range d {
		path, bolt, part := k.Coordinate(i)
		coordGroup[i], coordBolt[i] = group[path], bolt
		if part {
			coordGroup[i] = -1 // a shared part is not an input value
		}
	}
	nb := k.Bolts()
	boltModes := model.ModeSet(0)
	for _, m := range modes {
		if m.IsBolt() {
			boltModes |= 1 << m
		}
	}
	// The crude pass: chunks of the crude run's streams, blocks of its length.
	nChunks := int((crudeSamples + montecarlo.ChunkSize - 1) / montecarlo.ChunkSize)
	accs := make([]acc, nChunks)
	sub := min(int64(o.Subsample), crudeSamples)
	subX := make([]float64, int(sub)*ng)
	subSF := make([]float64, int(sub)*ne)
	subOK := make([]bool, sub)
	nw := s.Workers
	if nw <= 0 {
		nw = runtime.GOMAXPROCS(0)
	}
	var next int64
	var mu sync.Mutex
	var wg sync.WaitGroup
	for range nw {
		wg.Add(1)
		go func() {
			defer wg.Done()
			block := k.BlockLen()
			rows := make([]float64, max(d, 1)*block)
			ob := k.NewOut(block, montecarlo.Detail)
			ev := k.NewEvaluator()
			var pcg rand.PCG
			zs := make([]float64, ng*max(nb, 1)) // per input and bolt: normal scores of a sample
			mean := make([]float64, ng)
			for {
				mu.Lock()
				c := next
				next++
				mu.Unlock()
				if c >= int64(nChunks) || ctx.Err() != nil {
					return
				}
				a := newAcc(ne, ng)
				rng.Seed(&pcg, s.Seed, uint64(c))
				n := min(int64(montecarlo.ChunkSize), crudeSamples-c*montecarlo.ChunkSize)
				for j0 := int64(0); j0 < n; j0 += int64(block) {
					m := int(min(int64(block), n-j0))
					k.Draw(&pcg, rows, m)
					k.MapNative(rows, m)
					ev.Eval(rows, m, ob, montecarlo.Detail)
					for j := range m {
						if ob.Invalid[j] {
							a.invalid++
							continue
						}
						a.valid++
						idx := c*montecarlo.ChunkSize + j0 + int64(j)
						f := ob.Fail[j]
						keep := idx < sub
						if f == 0 && !keep {
							continue
						}
						// Normal scores of this sample, per input and bolt.
						clear(mean)
						row := rows[j*d : j*d+d]
						for i, x := range row {
							g := coordGroup[i]
							if g < 0 {
								continue
							}
							b := max(coordBolt[i], 0)
							z := score(&p.Vars[g].Dist, x)
							zs[g*max(nb, 1)+b] = z
							mean[g] += z
						}
						for g := range ng {
							if p.Vars[g].PerBolt() {
								mean[g] /= float64(nb)
							}
						}
						if keep {
							copy(subX[idx*int64(ng):], mean)
							least := math.Inf(1)
							for e := range len(modes) {
								v := ob.SF[j*len(modes)+e]
								subSF[idx*int64(ne)+int64(e)] = v
								if !math.IsNaN(v) {
									least = math.Min(least, v)
								}
							}
							subSF[idx*int64(ne)+int64(ne-1)] = least
							subOK[idx] = true
						}
						if f == 0 {
							continue
						}
						a.fail[ne-1]++
						for e, md := range modes {
							if f&(1<<md) != 0 {
								a.fail[e]++
							}
						}
						for g := range ng {
							v := &p.Vars[g]
							for e := range ne {
								if e < len(modes) && f&(1<<modes[e]) == 0 {
									continue
								}
								var bits model.ModeSet
								if e < len(modes) {
									bits = 1 << modes[e]
								} else {
									bits = boltModes
								}
								if !v.PerBolt() || nb == 1 || e < len(modes) && !modes[e].IsBolt() {
									a.put(e*ng+g, mean[g])
									continue
								}
								// Per-bolt input, bolt-level failure: the failing bolts' values.
								any := false
								for b := range nb {
									if ob.BoltFail[j*nb+b]&bits != 0 {
										a.put(e*ng+g, zs[g*nb+b])
										any = true
									}
								}
								if !any {
									a.put(e*ng+g, mean[g])
								}
							}
						}
					}
				}
				accs[c] = a
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("%w: %v", montecarlo.ErrInterrupted, context.Cause(ctx))
	}
	tot := newAcc(ne, ng)
	for c := range accs {
		tot.add(&accs[c])
	}
	out.Samples, out.Invalid = tot.valid, tot.invalid
	zc := distuv.UnitNormal.Quantile(1 - (1-s.Confidence)/2)
	for e := range ne {
		md := ModeDriver{Any: e == len(modes)}
		if !md.Any {
			md.Mode = modes[e]
		}
		md.Estimate = interval.Proportion(tot.fail[e], tot.valid, s.Confidence, s.Interval)
		for g := range ng {
			in := InputDriver{Path: out.Inputs[g], PerBolt: out.PerBolt[g]}
			if n := tot.n[e*ng+g]; n > 0 {
				mean := tot.s[e*ng+g] / n
				in.Shift, in.ShiftLo, in.ShiftHi, in.ShiftN = mean, mean, mean, int64(n)
				if n > 1 {
					sd := math.Sqrt(math.Max(tot.ss[e*ng+g]/n-mean*mean, 0) * n / (n - 1))
					h := zc * sd / math.Sqrt(n)
					in.ShiftLo, in.ShiftHi = mean-h, mean+h
				}
			}
			md.Inputs = append(md.Inputs, in)
		}
		out.Modes = append(out.Modes, md)
	}
	// Rank correlations over the subsample.
	xs, ys := make([]float64, 0, sub), make([]float64, 0, sub)
	for e := range ne {
		for g := range ng {
			xs, ys = xs[:0], ys[:0]
			for i := range sub {
				if v := subSF[i*int64(ne)+int64(e)]; subOK[i] && !math.IsNaN(v) && !math.IsInf(v, 0) {
					xs, ys = append(xs, subX[i*int64(ng)+int64(g)]), append(ys, v)
				}
			}
			if r := Spearman(xs, ys); !math.IsNaN(r) {
				out.Modes[e].Inputs[g].Spearman, out.Modes[e].Inputs[g].SpearmanN = r, len(xs)
			}
		}
	}
	out.Subsample = int(sub)
	if o.Method == montecarlo.Importance {
		if err := importanceShifts(ctx, p, k, s, out, coordGroup, zc); err != nil {
			return nil, err
		}
	}
	if !o.NoFORM {
		formAlphas(k, out, coordGroup, modes)
	}
	if !o.NoOmit {
		for g := range ng {
			qq := *p // every field: load cases, the life problem
			qq.Vars = append([]montecarlo.Var(nil), p.Vars...)
			q := &qq
			q.Vars[g].Dist = degenerate(q.Vars[g].Dist)
			rs := s
			rs.ProbabilitiesOnly, rs.Method = true, o.Method
			r, err := montecarlo.Estimate(ctx, q, rs)
			out.OmitRuns++
			if err != nil {
				return nil, fmt.Errorf("%s fixed at its median: %w", out.Inputs[g], err)
			}
			for e := range ne {
				est := r.Any
				if e < len(modes) {
					if mr, ok := r.Mode(modes[e]); ok {
						est = mr.Estimate
					} else {
						continue
					}
				}
				out.Modes[e].Inputs[g].Omitted, out.Modes[e].Inputs[g].HasOmitted = est, true
			}
		}
	}
	return out, nil
}

// importanceShifts replaces the estimates and the failure-conditional
// shifts by those of an importance-sampling run (its self-normalised
// E[U | event] per coordinate, with the standard errors): a shared input's
// coordinate directly; a per-bolt input's failing bolt approximated by the
// sum over the bolts' coordinates (only the failing bolt's is shifted when
// one bolt fails at a time), with its shared part weighted √ρ and the own
// parts √(1 − ρ).
func importanceShifts(ctx context.Context, p *montecarlo.Problem, k *montecarlo.Kernel, s montecarlo.Settings, out *Drivers, coordGroup []int, zc float64) error {
	is := s
	is.Method, is.ProbabilitiesOnly = montecarlo.Importance, true
	r, err := montecarlo.Estimate(ctx, p, is)
	if err != nil {
		return err
	}
	if r.Rare == nil || len(r.Rare.Events) != len(out.Modes) {
		return errors.New("drivers: the importance-sampling run returned no per-event shifts")
	}
	ng := len(out.Inputs)
	for e := range out.Modes {
		md := &out.Modes[e]
		if e < len(r.Modes) {
			md.Estimate = r.Modes[e].Estimate
		} else {
			md.Estimate = r.Any
		}
		ev := r.Rare.Events[e]
		sum, v := make([]float64, ng), make([]float64, ng)
		for i := range coordGroup {
			if i >= len(ev.Shift) {
				break
			}
			path, bolt, part := k.Coordinate(i)
			g := coordGroup[i]
			if part {
				for gi, n := range out.Inputs {
					if n == path {
						g = gi
					}
				}
			}
			w := 1.0
			if rho := p.Vars[g].Shared; rho > 0 {
				if part {
					w = math.Sqrt(rho)
				} else if bolt >= 0 {
					w = math.Sqrt(1 - rho)
				}
			}
			sum[g] += w * ev.Shift[i]
			v[g] += w * w * ev.ShiftSE[i] * ev.ShiftSE[i]
		}
		var failed int64
		if d := ev.Importance; d != nil {
			failed = d.Failed
		}
		for g := range ng {
			in := &md.Inputs[g]
			h := zc * math.Sqrt(v[g])
			in.Shift, in.ShiftLo, in.ShiftHi, in.ShiftN = sum[g], sum[g]-h, sum[g]+h, failed
		}
	}
	out.Samples, out.Invalid = r.Samples, r.Invalid
	if k.Bolts() > 1 {
		out.ShiftNote = "a per-bolt input's shift is the sum over the bolts' coordinates, the failing bolt's when one bolt fails at a time"
	} else {
		out.ShiftNote = "self-normalised weights"
	}
	return nil
}

// formAlphas sets each mode's α² from its most probable component's
// design point.
func formAlphas(k *montecarlo.Kernel, out *Drivers, coordGroup []int, modes []model.Mode) {
	rp := k.RareProblem()
	dps, err := rare.DesignPoints(rp, &rare.FORMSettings{Workers: 0})
	for e, m := range modes {
		md := &out.Modes[e]
		if err != nil {
			md.DesignNote = err.Error()
			continue
		}
		best := -1
		for i, dp := range dps {
			if cm, _ := k.Component(dp.Component); cm != m || !dp.Converged || len(dp.Alpha) != len(coordGroup) {
				continue
			}
			if best < 0 || dp.Beta < dps[best].Beta {
				best = i
			}
		}
		if best < 0 {
			md.DesignNote = "no converged design point"
			for _, dp := range dps {
				if cm, _ := k.Component(dp.Component); cm == m && dp.Message != "" {
					md.DesignNote = dp.Message
					break
				}
			}
			continue
		}
		dp := dps[best]
		if dp.Beta < 0 {
			md.DesignNote = "not rare: the median point fails"
			continue
		}
		md.Beta, md.DesignFound = dp.Beta, true
		_, bolt := k.Component(dp.Component)
		sum := make([]float64, len(out.Inputs))
		sq := make([]float64, len(out.Inputs))
		for i, a := range dp.Alpha {
			g := coordGroup[i]
			if g < 0 {
				// A shared part belongs to its input; find it by path.
				path, _, _ := k.Coordinate(i)
				for gi, n := range out.Inputs {
					if n == path {
						g = gi
					}
				}
			}
			if _, b, _ := k.Coordinate(i); b >= 0 && bolt >= 0 && b != bolt {
				continue
			}
			sum[g] += a
			sq[g] += a * a
		}
		for g := range out.Inputs {
			in := &md.Inputs[g]
			in.Alpha2, in.HasAlpha = sq[g], true
			in.Sign = 0
			if sum[g] > 0 {
				in.Sign = 1
			} else if sum[g] < 0 {
				in.Sign = -1
			}
		}
	}
}

// Spearman is the rank correlation of x and y (ties take their mean rank):
// Pearson's correlation (gonum stat.Correlation) of the ranks. NaN when
// fewer than 3 pairs or a constant series.
func Spearman(x, y []float64) float64 {
	if len(x) != len(y) || len(x) < 3 {
		return math.NaN()
	}
	r := stat.Correlation(ranks(x), ranks(y), nil)
	if math.IsNaN(r) {
		return math.NaN()
	}
	return r
}

// ranks returns the ranks (1-based) of v, ties at their mean rank.
func ranks(v []float64) []float64 {
	idx := make([]int, len(v))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return v[idx[a]] < v[idx[b]] })
	out := make([]float64, len(v))
	for i := 0; i < len(idx); {
		j := i
		for j+1 < len(idx) && v[idx[j+1]] == v[idx[i]] {
			j++
		}
		r := float64(i+j)/2 + 1
		for t := i; t <= j; t++ {
			out[idx[t]] = r
		}
		i = j + 1
	}
	return out
}
