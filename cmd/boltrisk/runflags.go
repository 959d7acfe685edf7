package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"
	"golang.org/x/term"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/scenario"
)

// defaultSamples is used when neither the flag nor the scenario sets one.
const defaultSamples = 1_000_000

// runFlags are the Monte Carlo settings shared by the analysis commands.
type runFlags struct {
	Samples    string
	Seed       uint64
	Workers    int
	Confidence float64
	Precision  string
	Interval   string
	Method     string
	Repeats    int
	Quiet      bool
	Modes      string
	changed    func(string) bool
	precision  bool
}

// add registers the flags; precision adds --precision (the stopping rule),
// which the commands with a fixed sample count per run do not take; method
// (when not "") adds --method with that default.
func (f *runFlags) add(cmd *cobra.Command, precision bool, method string) {
	fl := cmd.Flags()
	fl.StringVar(&f.Samples, "samples", "", "number of samples, e.g. 1e6 (default: the scenario's study.samples, else 1e6); the cap when --precision is set")
	fl.Uint64Var(&f.Seed, "seed", 0, "seed of the random streams (default: the scenario's study.seed, else 1); the same seed gives identical results for any --workers")
	fl.IntVar(&f.Workers, "workers", 0, "parallel workers (default: all cores)")
	fl.Float64Var(&f.Confidence, "confidence", 0.95, "two-sided confidence of the intervals, in (0, 1)")
	fl.StringVar(&f.Interval, "interval", "auto", "interval of each probability: auto (exact below 20 failures, Wilson above), exact (Clopper–Pearson) or wilson")
	if precision {
		fl.StringVar(&f.Precision, "precision", "", "stop once the coefficient of variation of every reported probability (each mode that failed, and any mode) is at most this, e.g. 5% or 0.05")
	}
	if method != "" {
		fl.StringVar(&f.Method, "method", method, "estimator: crude (Monte Carlo), importance (sampling at the design points), subset (simulation) or auto (crude when the budget reaches the precision, else importance, else subset)")
		fl.IntVar(&f.Repeats, "repeats", 0, "subset simulation: independent runs per round, whose spread gives the c.o.v. (2 … 10000; default 20, more rounds until --precision is met)")
	}
	fl.BoolVar(&f.Quiet, "quiet", false, "no progress bar or timing line on stderr")
	fl.StringVar(&f.Modes, "modes", "", "comma-separated mode keys to tally (default: every active mode)")
	f.changed = func(name string) bool { return cmd.Flags().Changed(name) }
	f.precision = precision
}

// settings turns the flags (and the scenario's study section) into runner
// settings; errors are usage errors naming the flag.
func (f *runFlags) settings(s *scenario.Scenario) (montecarlo.Settings, error) {
	set := montecarlo.Settings{Seed: 1, Workers: f.Workers, Confidence: f.Confidence}
	if f.changed("seed") {
		set.Seed = f.Seed
	}
	switch {
	case f.changed("samples"):
		v, err := strconv.ParseFloat(strings.TrimSpace(f.Samples), 64)
		if err != nil || v != math.Trunc(v) || v < 1 || v > montecarlo.MaxSamples {
			return set, usagef("--samples %q: a whole number from 1 to %.0e (e.g. 1e6)", f.Samples, montecarlo.MaxSamples)
		}
		set.Samples = int64(v)
	case s.Study.Samples > 0:
		set.Samples = s.Study.Samples
	default:
		set.Samples = defaultSamples
	}
	if !f.changed("seed") && s.Study.SeedSet {
		set.Seed = s.Study.Seed
	}
	if !f.changed("confidence") && s.Study.Confidence > 0 {
		set.Confidence = s.Study.Confidence
	}
	if f.precision {
		switch {
		case f.changed("precision"):
			c, err := units.Parse(f.Precision, units.Fraction)
			if err != nil || !(c > 0 && c < 1) {
				return set, usagef("--precision %q: a coefficient of variation strictly between 0 and 1, e.g. 5%% or 0.05", f.Precision)
			}
			set.Precision = c
		case s.Study.Precision > 0:
			set.Precision = s.Study.Precision
		}
	}
	im, err := interval.ParseMethod(f.Interval)
	if err != nil {
		return set, usagef("--interval %q: allowed auto, exact, wilson", f.Interval)
	}
	set.Interval = im
	if f.Method != "" {
		if set.Method, err = montecarlo.ParseMethod(f.Method); err != nil {
			return set, usagef("--method %q: allowed auto, crude, importance, subset", f.Method)
		}
	}
	if f.Repeats != 0 {
		if f.Repeats < 2 || f.Repeats > 10000 {
			return set, usagef("--repeats %d: from 2 to 10000 independent subset-simulation runs", f.Repeats)
		}
		set.Repeats = f.Repeats
	}
	if !(set.Confidence > 0 && set.Confidence < 1) {
		return set, usagef("--confidence %g: must lie strictly between 0 and 1 (e.g. 0.95)", set.Confidence)
	}
	if set.Workers < 0 || set.Workers > 1024 {
		return set, usagef("--workers %d: from 1 to 1024, or 0 for all cores", set.Workers)
	}
	if f.Modes != "" {
		for _, k := range strings.Split(f.Modes, ",") {
			m, ok := model.ParseMode(strings.TrimSpace(k))
			if !ok {
				return set, usagef("--modes: unknown mode %q (allowed: %s)", k, strings.Join(model.ModeKeys(), ", "))
			}
			set.Modes = append(set.Modes, m)
		}
	}
	return set, nil
}

// progress returns a progress callback drawing a bar on stderr when it is a
// terminal and the run is long, and a function to finish it.
func (f *runFlags) progress(stderr io.Writer, total int64, what string) (func(done, total int64), func()) {
	file, ok := stderr.(*os.File)
	if f.Quiet || !ok || !term.IsTerminal(int(file.Fd())) || total < 2_000_000 {
		return nil, func() {}
	}
	bar := progressbar.NewOptions64(total,
		progressbar.OptionSetWriter(stderr),
		progressbar.OptionSetDescription(what),
		progressbar.OptionThrottle(100*time.Millisecond),
		progressbar.OptionShowCount(),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionClearOnFinish(),
	)
	return func(done, _ int64) { _ = bar.Set64(done) }, func() { _ = bar.Finish() }
}

// timing writes one line on stderr about the run's speed.
func (f *runFlags) timing(stderr io.Writer, n int64, d time.Duration) {
	if f.Quiet {
		return
	}
	fmt.Fprintf(stderr, "boltrisk: %d evaluations in %.2f s (%.2f M samples/s)\n", n, d.Seconds(), float64(n)/d.Seconds()/1e6)
}
