package montecarlo

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"time"

	"boltrisk/model"
	"boltrisk/model/fatigue"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/life"
	"boltrisk/montecarlo/rng"
)

// LifeCurve selects the finite-life S–N curve of a service-life run.
type LifeCurve uint8

const (
	// CurveShigley: Budynas & Nisbett 9th ed. Eqs. 6-13…6-16 with Goodman
	// (fatigue.Shigley); strength scatter from the endurance Se.
	CurveShigley LifeCurve = iota + 1
	// CurveVDI2230: VDI 2230-1 σASZ (fatigue.VDI2230); strength scatter from
	// the endurance read as σASV.
	CurveVDI2230
	// CurveEN1993: EN 1993-1-9 detail category 50 (fatigue.EN1993), turned
	// into a median curve with a log-normal life scatter sd(log10 N).
	CurveEN1993
)

var lifeCurveKeys = [...]string{"", "shigley", "vdi2230", "en1993-1-9"}

// Key returns the curve's scenario key (fatigue.curve), a contract.
func (c LifeCurve) Key() string { return lifeCurveKeys[c] }

// LifeCurveKeys lists the accepted curve keys.
func LifeCurveKeys() []string { return append([]string(nil), lifeCurveKeys[1:]...) }

// ParseLifeCurve reads a curve key.
func ParseLifeCurve(s string) (LifeCurve, bool) {
	for i, k := range lifeCurveKeys[1:] {
		if k == s {
			return LifeCurve(i + 1), true
		}
	}
	return 0, false
}

// LifeBlock is one row of a block spectrum: Count cycles per pass between
// the external axial loads Min and Max per bolt (N), or, with Level, between
// Max·(loads.axial_max) and Min·(loads.axial_min) of the sample.
type LifeBlock struct {
	Max, Min float64
	Level    bool
	Count    float64
}

// DefaultLifeSD is the sd(log10 N) of the EN 1993-1-9 median curve when the
// scenario gives none (from memory: bolts ≈ 0.15–0.25, reference-data-2 A3).
const DefaultLifeSD = 0.2

// LifeSpec is the service-life part of a problem: the curve, the load
// spectrum and the design life.
type LifeSpec struct {
	Curve LifeCurve
	// ShigleyF is the fatigue strength fraction f of Shigley Fig. 6-18,
	// fixed at the nominal tensile strength.
	ShigleyF float64
	// Rolling of the VDI 2230 curve (SV or SG).
	Rolling fatigue.Rolling
	// StrengthRef is the endurance value at which the VDI 2230 curve has
	// its tabulated strength: each sample's curve is scaled by
	// Endurance/StrengthRef (0: σASV, i.e. the endurance input is σASV).
	StrengthRef float64
	// LifeSD is sd(log10 N) of the EN 1993-1-9 curve: the category is read
	// as mean − 2 sd (from memory) and each bolt's life scatters
	// log-normally with this sd about the median curve.
	LifeSD float64
	// Critical is the distribution of the critical Miner sum D_crit of a
	// spectrum (nil: D_crit = 1, Miner 1945). Not applied at constant
	// amplitude.
	Critical *Dist
	// Blocks is the spectrum; nil: constant amplitude between
	// loads.axial_min and loads.axial_max.
	Blocks []LifeBlock
	// DesignLife in cycles; Hours and CycleRate (cycles per hour) when it
	// was given in hours (else 0).
	DesignLife       float64
	Hours, CycleRate float64
}

// Spectrum reports whether the run sums damage over a variable-amplitude
// spectrum (two or more rows).
func (s *LifeSpec) Spectrum() bool { return len(s.Blocks) > 1 }

// lifeCurves holds the curves of one evaluator: the base curves built once,
// and the sample's scaled copy.
type lifeCurves struct {
	kind   LifeCurve
	spec   *LifeSpec
	f      float64
	vdi    fatigue.VDI2230
	vdiRef float64 // σASV of the base curve
	en     fatigue.EN1993
	invAs  float64
	blocks []fatigue.Block
}

// newLifeCurves validates the spec against the nominal inputs.
func newLifeCurves(spec *LifeSpec, in *model.Inputs) (*lifeCurves, error) {
	c := &lifeCurves{kind: spec.Curve, spec: spec, invAs: 1 / in.Thread.StressArea}
	if !(in.Thread.StressArea > 0) {
		return nil, fmt.Errorf("service life: the thread has no stress area")
	}
	switch spec.Curve {
	case CurveShigley:
		f := spec.ShigleyF
		if f == 0 {
			var err error
			if f, err = fatigue.FatigueFraction(in.Tensile); err != nil {
				return nil, err
			}
		}
		if _, err := fatigue.NewShigley(in.Tensile, in.Endurance, f); err != nil {
			return nil, err
		}
		c.f = f
	case CurveVDI2230:
		v, err := fatigue.NewVDI2230(in.Thread.D, spec.Rolling, in.Yield)
		if err != nil {
			return nil, err
		}
		c.vdi = v
		c.vdiRef = spec.StrengthRef
		if !(c.vdiRef > 0) {
			c.vdiRef = 0.85 * (150/in.Thread.D + 45) // σASV of VDI 2230-1
		}
	case CurveEN1993:
		e, err := fatigue.NewEN1993(in.Thread.D)
		if err != nil {
			return nil, err
		}
		if e, err = e.ToMedian(spec.LifeSD); err != nil {
			return nil, err
		}
		c.en = e
	default:
		return nil, fmt.Errorf("service life: no curve chosen (fatigue.curve)")
	}
	if !(spec.DesignLife > 0 && spec.DesignLife < math.Inf(1)) {
		return nil, fmt.Errorf("service life: design life %g cycles: allowed a finite number > 0", spec.DesignLife)
	}
	n := max(len(spec.Blocks), 1)
	c.blocks = make([]fatigue.Block, n)
	for i, b := range spec.Blocks {
		if !(b.Count > 0 && b.Count < math.Inf(1)) {
			return nil, &fatigue.RangeError{Curve: "load spectrum", Param: "cycles", Value: b.Count, Allowed: "a finite n > 0 (a spectrum row needs cycles)", Row: i + 1}
		}
	}
	return c, nil
}

// The service life's own draws, bound to Vars with Aux set: a standard
// normal of the EN 1993-1-9 life scatter and the critical damage sum.
const (
	AuxLifeScatter    = 1
	AuxCriticalDamage = 2
	numAux            = 2
)

// auxDefaults are the draws' values when they are not uncertain.
var auxDefaults = [numAux]float64{0, 1}

// lifeMode evaluates the fatigue_life mode of one bolt.
func (e *Evaluator) lifeMode(br *model.BoltResult) {
	if !e.k.set.Has(model.FatigueLife) {
		return
	}
	l, _, err := e.lc.boltLife(&e.in, br.Preload, e.stiff.Phi, e.aux[0], e.aux[1])
	if err != nil || math.IsNaN(l) {
		br.Invalid, l = true, 0
	}
	model.SetFatigueLife(br, e.k.life.DesignLife, l)
}

// nominalLife adds the fatigue_life mode to the kernel's nominal joint.
func (k *Kernel) nominalLife() error {
	n, err := k.life.NominalLife(&k.base)
	var re *fatigue.RangeError
	if err != nil && !(errors.As(err, &re) && re.Param == "nominal life") {
		return err
	}
	o := &k.nominal.Outcome
	var b model.BoltResult
	model.SetFatigueLife(&b, k.life.DesignLife, n)
	o.Active[model.FatigueLife], o.Demand[model.FatigueLife], o.Capacity[model.FatigueLife] = true, b.Demand[model.FatigueLife], b.Capacity[model.FatigueLife]
	return nil
}

// boltLife returns the life in cycles of one bolt with residual preload fi
// and load factor phi under the sample's inputs in, with the standard
// normal z1 (EN 1993-1-9 life scatter) and the critical damage sum dcrit
// (used for spectra only). flags gets
// lifeExtrapolated or lifeClamped when the life came from beyond the
// curve's validity range. A sample outside a curve's domain returns an
// error (it allocates only then).
func (c *lifeCurves) boltLife(in *model.Inputs, fi, phi, z1, dcrit float64) (float64, uint8, error) {
	spec := c.spec
	var (
		sh  fatigue.Shigley
		vdi fatigue.VDI2230
		err error
	)
	switch c.kind {
	case CurveShigley:
		if sh, err = fatigue.NewShigley(in.Tensile, in.Endurance, c.f); err != nil {
			return 0, 0, err
		}
	case CurveVDI2230:
		if vdi, err = c.vdi.Scaled(in.Endurance / c.vdiRef); err != nil {
			return 0, 0, err
		}
	}
	blocks := c.blocks
	if len(spec.Blocks) == 0 {
		blocks[0] = fatigue.Block{Cycle: c.cycle(fi, phi, in.AxialMax, in.AxialMin), Count: 1}
	} else {
		for i := range spec.Blocks {
			b := &spec.Blocks[i]
			pmax, pmin := b.Max, b.Min
			if b.Level {
				pmax, pmin = pmax*in.AxialMax, pmin*in.AxialMin
			}
			blocks[i] = fatigue.Block{Cycle: c.cycle(fi, phi, pmax, pmin), Count: b.Count}
		}
	}
	spectrum := len(blocks) > 1
	var d fatigue.Damage
	var flags uint8
	for i := range blocks {
		var l fatigue.Life
		switch c.kind {
		case CurveShigley:
			l, err = sh.Life(blocks[i].Cycle)
		case CurveVDI2230:
			l, err = vdi.Life(blocks[i].Cycle)
		default:
			if spectrum {
				l, err = c.en.SpectrumLife(blocks[i].Cycle)
			} else {
				l, err = c.en.Life(blocks[i].Cycle)
			}
		}
		if err != nil {
			if l.Rule&fatigue.Extrapolated == 0 {
				return 0, 0, err
			}
			flags |= lifeExtrapolated
		}
		if l.Rule&fatigue.LowCycleClamp != 0 {
			flags |= lifeClamped
		}
		d.Cycles += blocks[i].Count
		d.Rules |= l.Rule
		if l.Damaging() {
			d.Sum += blocks[i].Count / l.Cycles
		}
	}
	if d.Sum == 0 {
		return math.Inf(1), flags, nil
	}
	n := d.Cycles / d.Sum
	if spectrum {
		n *= math.Max(dcrit, 0)
	}
	if c.kind == CurveEN1993 {
		n *= math.Pow(10, spec.LifeSD*z1)
	}
	return n, flags, nil
}

// cycle returns the bolt's stress cycle on As between the external loads
// pmin and pmax.
func (c *lifeCurves) cycle(fi, phi, pmax, pmin float64) fatigue.Cycle {
	hi, lo := model.BoltForceAt(fi, phi, pmax), model.BoltForceAt(fi, phi, pmin)
	if lo > hi {
		hi, lo = lo, hi
	}
	return fatigue.MaxMin(hi*c.invAs, lo*c.invAs)
}

const (
	lifeExtrapolated uint8 = 1 << iota
	lifeClamped
)

// fixedCritical returns the critical damage sum when it is not uncertain
// (and the median of a distribution otherwise).
func (s *LifeSpec) fixedCritical() float64 {
	if s.Critical == nil {
		return 1
	}
	return s.Critical.Quantile(0.5)
}

// NominalLife returns the life in cycles of the nominal joint (inputs at
// their means, median curve, D_crit = 1): the check the scenario loader
// makes. The error names the curve's parameter and its allowed range.
func (s *LifeSpec) NominalLife(in *model.Inputs) (float64, error) {
	c, err := newLifeCurves(s, in)
	if err != nil {
		return 0, err
	}
	nom := model.EvaluateNominal(in)
	n, flags, err := c.boltLife(in, nom.Outcome.Bolt.Preload, nom.Outcome.Stiffness.Phi, 0, s.fixedCritical())
	if err != nil {
		return 0, err
	}
	if flags != 0 {
		return n, &fatigue.RangeError{Curve: c.kind.Key(), Param: "nominal life", Value: n, Allowed: c.lowerEnd()}
	}
	return n, nil
}

func (c *lifeCurves) lowerEnd() string {
	switch c.kind {
	case CurveShigley:
		return "N ≥ 10³ cycles (the S–N line of Shigley Eq. 6-13 starts at 10³; the load is in the low-cycle region)"
	case CurveVDI2230:
		return "N ≥ 10⁴ cycles (the VDI 2230 finite-life line from about 10⁴; not confirmed against the published text)"
	}
	return "a life on the curve"
}

// LifeSettings control a service-life run.
type LifeSettings struct {
	Settings
	// BLives are the failure fractions p of the B_p lives to report
	// (default 0.1 and 0.01).
	BLives []float64
	// Grid of the R(N) curve (default life.DefaultGrid).
	Grid life.Grid
	// RareBelow: when fewer lives than this fail within the design life,
	// the probability is estimated again on the fatigue_life mode by
	// importance sampling (subset simulation when it fails), with the same
	// budget and seed and a c.o.v. target of 10 % unless Precision is set
	// (0: never).
	RareBelow int64
}

// RareDesign is the rare-event estimate of P(failure within the design
// life).
type RareDesign struct {
	Method, Note string
	Estimate     interval.Estimate
	Evaluations  int64
}

// BLifeEstimate is a B_p life with its one-sided distribution-free bounds.
type BLifeEstimate struct {
	P float64
	life.BLife
	// Cycles is the estimate: the geometric middle of the grid cell holding
	// the ⌈p·n⌉-th smallest life (its upper edge for the bottom cell);
	// +Inf unless Status is Reached.
	Cycles float64
}

// LifeResult is the outcome of a service-life run.
type LifeResult struct {
	Spec             LifeSpec
	Seed             uint64
	Workers          int
	Confidence       float64
	Samples          int64 // valid samples (lives counted)
	Invalid          int64 // samples outside a curve's or the model's domain
	Extrapolated     int64 // samples whose life came from beyond the curve's range
	Clamped          int64 // Shigley samples in the low-cycle region (life taken as 10³)
	NBolts           int
	DesignFailure    life.Proportion // P(life ≤ design life)
	EverFails        life.Proportion // P(finite life)
	Reliability      []life.Point    // R(N) on the grid
	BLives           []BLifeEstimate
	Resolution       float64 // ratio of neighbouring grid points
	Partial          bool
	Elapsed          time.Duration
	NominalLife      float64     // nominal inputs, median curve, D_crit = 1
	Rare             *RareDesign // with LifeSettings.RareBelow and few failures
	RareError        string      // why the rare-event estimate failed ("" if it did not)
	Acc              *life.Accumulator
	Evaluations      int64
	GridMin, GridMax float64
}

type lifeWorker struct {
	k     *Kernel
	ev    *Evaluator
	c     *lifeCurves
	rows  []float64
	block int
	pcg   rand.PCG
	acc   *life.Accumulator
	bad   int64
	extra int64
	clamp int64
	err   error
	_     [64]byte
}

func (w *lifeWorker) runChunk(seed uint64, c, n int64) {
	rng.Seed(&w.pcg, seed, uint64(c))
	k, e := w.k, w.ev
	d, ns, np, nb := k.Dim(), len(k.shared), len(k.perBolt), k.nBolts
	offB := ns + k.nParts
	for j0 := int64(0); j0 < n; j0 += int64(w.block) {
		m := int(min(int64(w.block), n-j0))
		k.Draw(&w.pcg, w.rows, m)
		k.MapNative(w.rows, m)
		for j := range m {
			row := w.rows[j*d : j*d+d]
			setRow(e.sharedPtr, row[:ns])
			if len(k.cases) > 0 {
				e.apply(0) // the spectrum's levels scale the first load case
			}
			if k.stiffVaries {
				e.stiff = model.ComputeStiffness(&e.in)
			}
			lifeJ := math.Inf(1)
			invalid := false
			var flags uint8
			for b := range nb {
				if np > 0 {
					setRow(e.boltPtr, row[offB+b*np:offB+(b+1)*np])
				}
				br := &e.bolts[b]
				model.EvaluateBolt(&e.in, &e.stiff, 0, br)
				if br.Invalid {
					invalid = true
					break
				}
				l, f, err := w.c.boltLife(&e.in, br.Preload, e.stiff.Phi, e.aux[0], e.aux[1])
				if err != nil || math.IsNaN(l) {
					if w.err == nil {
						w.err = err
					}
					invalid = true
					break
				}
				flags |= f
				lifeJ = math.Min(lifeJ, l)
			}
			if invalid {
				w.bad++
				continue
			}
			if flags&lifeExtrapolated != 0 {
				w.extra++
			}
			if flags&lifeClamped != 0 {
				w.clamp++
			}
			w.acc.Add(lifeJ)
		}
	}
}

// RunLife samples the problem's joint and its service life: each sample's
// life is the first bolt failure under the repeated spectrum (Palmgren–Miner
// with the chosen curve), counted on a log-cycle grid. It returns the
// probability of failure within the design life, R(N) with exact
// (Clopper–Pearson) bands and the B_p lives with distribution-free bounds.
// Results do not depend on the worker count.
func RunLife(ctx context.Context, p *Problem, spec *LifeSpec, s LifeSettings) (*LifeResult, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	s.defaults()
	if s.Grid == (life.Grid{}) {
		s.Grid = life.DefaultGrid
	}
	if len(s.BLives) == 0 {
		s.BLives = []float64{0.1, 0.01}
	}
	for _, q := range s.BLives {
		if !(q > 0 && q < 1) {
			return nil, fmt.Errorf("B-life fraction %g: allowed 0 < p < 1 (e.g. 0.1 for B10)", q)
		}
	}
	start := time.Now()
	q := *p
	q.Life = spec
	k, err := NewKernel(&q, []model.Mode{})
	if err != nil {
		return nil, err
	}
	nominal, nerr := spec.NominalLife(&p.Base)
	var re *fatigue.RangeError
	if nerr != nil && !(errors.As(nerr, &re) && re.Param == "nominal life") {
		return nil, nerr
	}
	res := &LifeResult{Spec: *spec, Seed: s.Seed, Workers: s.Workers, Confidence: s.Confidence, NBolts: k.nBolts, NominalLife: nominal}
	workers := make([]*lifeWorker, s.Workers)
	for i := range workers {
		c, err := newLifeCurves(spec, &p.Base)
		if err != nil {
			return nil, err
		}
		acc, err := life.NewAccumulator(s.Grid, spec.DesignLife)
		if err != nil {
			return nil, err
		}
		w := &lifeWorker{k: k, ev: k.NewEvaluator(), c: c, block: blockLen(k.Dim()), acc: acc}
		d := max(k.Dim(), 1)
		w.rows = make([]float64, d*w.block, d*w.block+8)
		workers[i] = w
	}
	_, interrupted := schedule(ctx, s.Samples, len(workers), 0, s.Progress, nil, func(wi int, c int64, _ []sums) {
		workers[wi].runChunk(s.Seed, c, chunkLen(c, s.Samples))
	})
	acc, _ := life.NewAccumulator(s.Grid, spec.DesignLife)
	var firstErr error
	for _, w := range workers {
		acc.Merge(w.acc)
		res.Invalid += w.bad
		res.Extrapolated += w.extra
		res.Clamped += w.clamp
		if firstErr == nil {
			firstErr = w.err
		}
	}
	res.Acc, res.Samples, res.Partial = acc, acc.N(), interrupted
	res.Evaluations = (res.Samples + res.Invalid) * int64(k.nBolts)
	res.Resolution = s.Grid.Resolution()
	pts := acc.Points()
	res.GridMin, res.GridMax = pts[0], pts[len(pts)-1]
	if res.Samples == 0 {
		if firstErr != nil {
			return nil, fmt.Errorf("service life: no sample gave a life: %w", firstErr)
		}
		return nil, fmt.Errorf("service life: no sample gave a life")
	}
	if res.DesignFailure, err = acc.DesignFailure(s.Confidence); err != nil {
		return nil, err
	}
	if res.EverFails, err = acc.EverFails(s.Confidence); err != nil {
		return nil, err
	}
	if res.Reliability, err = acc.Reliability(s.Confidence); err != nil {
		return nil, err
	}
	for _, q := range s.BLives {
		b, err := acc.BLife(q, s.Confidence)
		if err != nil {
			return nil, err
		}
		e := BLifeEstimate{P: q, BLife: b, Cycles: math.Inf(1)}
		if b.Status == life.Reached {
			e.Cycles = b.Hi
			if b.Lo > 0 {
				e.Cycles = math.Sqrt(b.Lo * b.Hi)
			}
		}
		res.BLives = append(res.BLives, e)
	}
	if !interrupted && res.DesignFailure.Count < s.RareBelow {
		rs := s.Settings
		rs.Method, rs.Modes, rs.ProbabilitiesOnly, rs.Progress = Importance, []model.Mode{model.FatigueLife}, true, nil
		if rs.Precision == 0 {
			rs.Precision = 0.1
		}
		r, err := Estimate(ctx, &q, rs)
		if err != nil && !errors.Is(err, ErrInterrupted) {
			rs.Method = Subset // no design point or unhealthy weights
			r, err = Estimate(ctx, &q, rs)
		}
		switch {
		case errors.Is(err, ErrInterrupted):
			interrupted = true
		case err != nil:
			res.RareError = err.Error()
		default:
			if m, ok := r.Mode(model.FatigueLife); ok {
				res.Rare = &RareDesign{Method: r.Method, Note: r.MethodNote, Estimate: m.Estimate, Evaluations: r.Evaluations}
				res.Evaluations += r.Evaluations
			}
		}
	}
	res.Elapsed = time.Since(start)
	res.Partial = interrupted
	if interrupted {
		return res, fmt.Errorf("%w after %d samples: %v", ErrInterrupted, res.Samples+res.Invalid, context.Cause(ctx))
	}
	return res, nil
}
