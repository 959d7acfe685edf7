package rare

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"boltrisk/montecarlo/rng"
)

// Purpose tags of the stream families (rng.Derive); part of the
// reproducibility contract.
const (
	tagImportance = 0x1517_0001
	tagSubset     = 0x1517_0002
)

// block is the number of points per Eval call of the sampler.
const block = 64

// ChunkSums holds the importance-sampling sums of one chunk of samples (or
// of several chunks merged). Every field is an integer count or a float64
// sum, so part files can store it and [Merge] can add parts; adding them in
// chunk order gives the same bits for any split.
type ChunkSums struct {
	Samples     int64
	Evaluations int64 // points passed to the evaluator
	Invalid     int64 // samples outside the model's domain (NaN in every component)
	InvalidW    float64
	// Events holds the sums of Problem.Events, then of AnyEvent.
	Events []EventSums
}

// EventSums holds one event's sums over the samples where it occurred,
// with w = φ(u)/h(u) the importance weight:
//
//	W = Σw, W2 = Σw², WMax = max w, WU_i = Σw·u_i, W2U_i = Σw²·u_i, W2UU_i = Σw²·u_i².
type EventSums struct {
	Failed        int64
	W, W2, WMax   float64
	WU, W2U, W2UU []float64
}

// Add adds o to s (s += o). Adding chunks in chunk order gives results that
// do not depend on how the chunks were split among workers or parts.
func (s *ChunkSums) Add(o *ChunkSums) {
	if s.Events == nil {
		s.Events = make([]EventSums, len(o.Events))
		for t, e := range o.Events {
			d := len(e.WU)
			s.Events[t] = EventSums{WU: make([]float64, d), W2U: make([]float64, d), W2UU: make([]float64, d)}
		}
	}
	if len(s.Events) != len(o.Events) {
		panic("rare: adding chunk sums of different problems")
	}
	s.Samples += o.Samples
	s.Evaluations += o.Evaluations
	s.Invalid += o.Invalid
	s.InvalidW += o.InvalidW
	for t := range s.Events {
		a, b := &s.Events[t], &o.Events[t]
		a.Failed += b.Failed
		a.W += b.W
		a.W2 += b.W2
		a.WMax = math.Max(a.WMax, b.WMax)
		for i := range a.WU {
			a.WU[i] += b.WU[i]
			a.W2U[i] += b.W2U[i]
			a.W2UU[i] += b.W2UU[i]
		}
	}
}

// Merge adds the chunk sums in the order given (chunk order).
func Merge(parts []ChunkSums) ChunkSums {
	var m ChunkSums
	for i := range parts {
		m.Add(&parts[i])
	}
	return m
}

func newChunkSums(events, dim int) ChunkSums {
	s := ChunkSums{Events: make([]EventSums, events)}
	for t := range s.Events {
		s.Events[t] = EventSums{WU: make([]float64, dim), W2U: make([]float64, dim), W2UU: make([]float64, dim)}
	}
	return s
}

// Sampler draws and scores chunks of samples under one proposal. It holds
// scratch space: use one per goroutine.
type Sampler struct {
	d, nc   int
	targets []target
	a0      float64
	cum     []float64 // cumulative normalised component weights
	lb      []float64 // ln((1 − α0)·c_k) − ln s_k
	mu, ax  [][]float64
	sm1     []float64 // s_k − 1
	kap     []float64 // ½(1/s_k² − 1)
	mu2h    []float64 // ½‖μ_k‖²
	amu     []float64 // a_k·μ_k
	idx     [][]int   // coordinates where μ_k or a_k is non-zero
	u, g, e []float64
	fail    []bool
	hit     []bool
	pcg     rand.PCG
}

// NewSampler prepares a sampler of q for problem p.
func NewSampler(p *Problem, q *Proposal) (*Sampler, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if err := q.Validate(); err != nil {
		return nil, err
	}
	if q.Dim != p.Dim {
		return nil, fmt.Errorf("rare: Proposal.Dim is %d; Problem.Dim is %d", q.Dim, p.Dim)
	}
	s := &Sampler{d: p.Dim, nc: p.Components, targets: p.targets(), a0: q.Defensive}
	sum := 0.0
	for _, c := range q.Components {
		sum += c.Weight
	}
	acc := 0.0
	for _, c := range q.Components {
		if !(c.Weight > 0) {
			continue
		}
		w := c.Weight / sum
		acc += w
		sd := 1.0
		var ax []float64
		if c.Axis != nil && c.AxisSD != 1 {
			sd = c.AxisSD
			ax = c.Axis
		}
		s.cum = append(s.cum, acc)
		s.lb = append(s.lb, math.Log((1-q.Defensive)*w)-math.Log(sd))
		s.mu = append(s.mu, c.Mean)
		s.ax = append(s.ax, ax)
		s.sm1 = append(s.sm1, sd-1)
		s.kap = append(s.kap, 0.5*(1/(sd*sd)-1))
		s.mu2h = append(s.mu2h, 0.5*dot(c.Mean, c.Mean))
		am := 0.0
		if ax != nil {
			am = dot(ax, c.Mean)
		}
		s.amu = append(s.amu, am)
		var nz []int
		for i := range c.Mean {
			if c.Mean[i] != 0 || (ax != nil && ax[i] != 0) {
				nz = append(nz, i)
			}
		}
		s.idx = append(s.idx, nz)
	}
	if n := len(s.cum); n > 0 {
		s.cum[n-1] = 1
	}
	if len(s.cum) == 0 {
		s.a0 = 1
	}
	s.u = make([]float64, block*s.d)
	s.g = make([]float64, block*s.nc)
	s.e = make([]float64, len(s.cum))
	s.fail = make([]bool, s.nc)
	s.hit = make([]bool, len(s.targets))
	return s, nil
}

// Chunk draws chunk number chunk (n samples) of the run with the given
// seed from the chunk's own stream, evaluates them with ev and returns
// their sums. The draws of a sample (one uniform that picks the mixture
// component, then Dim standard normals) do not depend on the proposal's
// parameters, so proposals of the same seed share their random numbers.
func (s *Sampler) Chunk(ev Evaluator, seed uint64, chunk int64, n int) ChunkSums {
	rng.Seed(&s.pcg, rng.Derive(seed, tagImportance), uint64(chunk))
	sums := newChunkSums(len(s.targets), s.d)
	d, nc := s.d, s.nc
	for off := 0; off < n; off += block {
		m := min(block, n-off)
		for r := range m {
			s.draw(s.u[r*d : (r+1)*d])
		}
		ev.Eval(s.u[:m*d], m, s.g[:m*nc])
		for r := range m {
			s.score(&sums, s.u[r*d:(r+1)*d], s.g[r*nc:(r+1)*nc])
		}
	}
	sums.Samples = int64(n)
	sums.Evaluations = int64(n)
	return sums
}

// draw writes one sample of the proposal into u.
func (s *Sampler) draw(u []float64) {
	x := rng.Unit(&s.pcg)
	rng.Normals(&s.pcg, u, 1)
	if x < s.a0 {
		return // the defensive standard normal
	}
	x = (x - s.a0) / (1 - s.a0)
	k := sort.SearchFloat64s(s.cum, x) // first k with cum[k] ≥ x
	if k == len(s.cum) {
		k--
	}
	nz, mu := s.idx[k], s.mu[k]
	if ax := s.ax[k]; ax != nil {
		t := 0.0
		for _, i := range nz {
			t += ax[i] * u[i]
		}
		t *= s.sm1[k]
		for _, i := range nz {
			u[i] += t*ax[i] + mu[i]
		}
		return
	}
	for _, i := range nz {
		u[i] += mu[i]
	}
}

// weight returns φ(u)/h(u) = 1/(α0 + Σ_k exp(e_k)), with
// e_k = ln((1 − α0)c_k/s_k) + u·μ_k − ½‖μ_k‖² − ½(1/s_k² − 1)(a_k·(u − μ_k))².
func (s *Sampler) weight(u []float64) float64 {
	emax := math.Inf(-1)
	for k, nz := range s.idx {
		mu, ax := s.mu[k], s.ax[k]
		um, au := 0.0, 0.0
		for _, i := range nz {
			um += u[i] * mu[i]
		}
		e := s.lb[k] + um - s.mu2h[k]
		if ax != nil {
			for _, i := range nz {
				au += u[i] * ax[i]
			}
			t := au - s.amu[k]
			e -= s.kap[k] * t * t
		}
		s.e[k] = e
		if e > emax {
			emax = e
		}
	}
	if emax < 700 {
		h := s.a0
		for _, e := range s.e {
			h += rng.Exp(e)
		}
		return 1 / h
	}
	h := s.a0 * math.Exp(-emax)
	for _, e := range s.e {
		h += math.Exp(e - emax)
	}
	return math.Exp(-emax) / h
}

func (s *Sampler) score(sums *ChunkSums, u, g []float64) {
	valid, failed := false, false
	for c, x := range g {
		valid = valid || !math.IsNaN(x)
		s.fail[c] = x <= 0
		failed = failed || s.fail[c]
	}
	if !valid {
		sums.Invalid++
		sums.InvalidW += s.weight(u)
		return
	}
	if !failed {
		return
	}
	for t, tg := range s.targets {
		hit := false
		for _, c := range tg.comps {
			if s.fail[c] {
				hit = true
				break
			}
		}
		s.hit[t] = hit
	}
	w := s.weight(u)
	w2 := w * w
	for t, hit := range s.hit {
		if !hit {
			continue
		}
		es := &sums.Events[t]
		es.Failed++
		es.W += w
		es.W2 += w2
		es.WMax = math.Max(es.WMax, w)
		for i, x := range u {
			es.WU[i] += w * x
			es.W2U[i] += w2 * x
			es.W2UU[i] += w2 * x * x
		}
	}
}

// Estimate is one event's importance-sampling estimate from merged sums.
type Estimate struct {
	Event       string
	Probability float64 // P̂ = Σw·1_F / N
	COV         float64 // √(Var P̂)/P̂, Var P̂ = (Σ(w·1_F)² − N·P̂²)/(N(N − 1)); 0 when P̂ = 0
	Confidence  float64
	Lo, Hi      float64 // lognormal interval P̂·exp(∓z·√ln(1 + COV²)); with no failed sample, [0, Hi] is the bound of UpperOnly
	// UpperOnly: no sample failed; Hi bounds the probability at the
	// one-sided confidence, from w ≤ 1/α0: P ≤ (1/α0)·(1 − (1 − conf)^(1/N)).
	UpperOnly bool
	Samples   int64
	Failed    int64   // samples in the event
	ESS       float64 // Kish effective sample size of the failed samples, (Σw)²/Σw²
	MaxShare  float64 // largest weight's share of the estimate, max w/Σw
	// Degenerate flags weights the c.o.v. cannot be trusted with: ESS < 30
	// or MaxShare > 0.1 (common practice: a CLT needs some 30 effective
	// samples, and no single sample should carry a tenth of the estimate).
	Degenerate bool
	// Shift is the failure-conditional mean E[U | F] (self-normalised
	// Σw·u/Σw over the failed samples), ShiftSE its delta-method standard
	// error √(Σw²(u − Shift)²)/Σw.
	Shift, ShiftSE []float64
}

// Degeneracy thresholds of Estimate.Degenerate.
const (
	minESS      = 30
	maxMaxShare = 0.1
)

// Finish turns merged sums into one estimate per event (Problem.Events,
// then AnyEvent) at two-sided confidence conf (0 → 0.95).
func Finish(p *Problem, q *Proposal, m *ChunkSums, conf float64) []Estimate {
	if conf == 0 {
		conf = 0.95
	}
	ts := p.targets()
	if len(m.Events) != len(ts) {
		panic("rare: chunk sums do not belong to this problem")
	}
	z := zQuantile(conf)
	n := float64(m.Samples)
	out := make([]Estimate, len(ts))
	for t, tg := range ts {
		es := &m.Events[t]
		e := Estimate{Event: tg.name, Confidence: conf, Samples: m.Samples, Failed: es.Failed,
			Shift: make([]float64, p.Dim), ShiftSE: make([]float64, p.Dim)}
		if es.Failed == 0 || !(es.W > 0) || m.Samples < 2 {
			e.UpperOnly = true
			if q.Defensive > 0 && m.Samples > 0 {
				e.Hi = math.Min(1, -math.Expm1(math.Log(1-conf)/n)/q.Defensive)
			} else {
				e.Hi = 1
			}
			out[t] = e
			continue
		}
		e.Probability = es.W / n
		v := (es.W2 - n*e.Probability*e.Probability) / (n * (n - 1))
		e.COV = math.Sqrt(math.Max(v, 0)) / e.Probability
		e.Lo, e.Hi = logInterval(e.Probability, e.COV, z)
		e.ESS = es.W * es.W / es.W2
		e.MaxShare = es.WMax / es.W
		e.Degenerate = e.ESS < minESS || e.MaxShare > maxMaxShare
		for i := range e.Shift {
			mu := es.WU[i] / es.W
			e.Shift[i] = mu
			ss := es.W2UU[i] - 2*mu*es.W2U[i] + mu*mu*es.W2
			e.ShiftSE[i] = math.Sqrt(math.Max(ss, 0)) / es.W
		}
		out[t] = e
	}
	return out
}
