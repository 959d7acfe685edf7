package montecarlo

import (
	"time"

	"boltrisk/model"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
)

// Levels are the percentile levels every result reports.
var Levels = []float64{0.01, 0.05, 0.50, 0.95, 0.99}

// RankTolerance is the rank error the reported percentiles meet: each is
// an exact empirical quantile of the binned samples at a level within
// ±RankTolerance of its nominal level (refined by a second pass where the
// first pass's bins were too coarse).
const RankTolerance = 1e-3

// Quantity names the tracked outputs of every bolt.
type Quantity int

const (
	QPreload   Quantity = iota // residual preload of each bolt, N
	QBoltForce                 // largest bolt force of each bolt, N
	QClamp                     // residual clamp force under Pmax of each bolt, N
	NumQuantities
)

var quantityKeys = [NumQuantities]string{"preload_N", "bolt_force_N", "clamp_force_N"}
var quantityTitles = [NumQuantities]string{"residual preload", "largest bolt force", "least clamp force"}

// Key returns the JSON key of the quantity.
func (q Quantity) Key() string { return quantityKeys[q] }

// Title returns the quantity's name in reports.
func (q Quantity) Title() string { return quantityTitles[q] }

// Distribution is the sampled distribution of one output: its sketch (for
// pictures) and its percentiles at Levels.
type Distribution struct {
	Sketch      quantile.Sketch
	Percentiles []quantile.Percentile
}

// ModeResult is the estimate for one failure mode.
type ModeResult struct {
	Mode      model.Mode
	Estimate  interval.Estimate
	NominalSF float64      // deterministic safety factor at nominal inputs
	SF        Distribution // safety factor of the joint (its worst bolt), per sample
	// Bolt is the share of bolt evaluations failing the mode, for bolt
	// modes of joints whose bolts draw their own scatter (Samples 0
	// otherwise).
	Bolt interval.Estimate
}

// Result is the outcome of a run of an estimator.
type Result struct {
	Method      string // "crude", "importance", "subset"
	Samples     int64  // valid samples evaluated
	Invalid     int64  // samples outside the model's domain (counted, not used)
	Evaluations int64  // evaluations of the joint model (one per sample, all bolts)
	// Binned is the number of valid samples behind the percentiles and
	// pictures: Samples, or those of every BinStride-th chunk in a large run.
	Binned     int64
	BinStride  int64
	Seed       uint64
	Workers    int
	Confidence float64
	Precision  float64 // the stopping rule's target c.o.v. (0: none)
	Partial    bool    // stopped early (interrupted) before the budget or target
	Converged  bool    // the precision target was met
	Elapsed    time.Duration

	Nominal model.Nominal // the joint at its nominal inputs
	Modes   []ModeResult  // modes active at nominal values (or those asked for), report order
	Any     interval.Estimate
	// Cases holds each load case's estimates (crude Monte Carlo only; none
	// without cases).
	Cases      []CaseResult
	Quantities [NumQuantities]Distribution // empty when the run kept no histograms
	// Mean and standard deviation of the residual preload over all bolts, N.
	PreloadMean, PreloadSD float64
	NBolts                 int // bolt evaluations per sample
	// RefinePasses counts the second passes that refined percentiles.
	RefinePasses int
	// MethodNote says why auto chose the method ("" otherwise).
	MethodNote string
	// Rare holds the design points and diagnostics of a rare-event run.
	Rare *RareInfo
}

// Mode returns the result of mode m, if reported.
func (r *Result) Mode(m model.Mode) (*ModeResult, bool) {
	for i := range r.Modes {
		if r.Modes[i].Mode == m {
			return &r.Modes[i], true
		}
	}
	return nil, false
}

// HasDistributions reports whether the run kept the sketches behind the
// percentiles and pictures.
func (r *Result) HasDistributions() bool {
	return r.Binned > 0 && r.Quantities[QPreload].Sketch.Counts != nil
}
