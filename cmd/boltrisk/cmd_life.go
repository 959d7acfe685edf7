package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// LifeOptions are the options of `boltrisk life`.
type LifeOptions struct {
	common
	Run    runFlags
	Output outFlags
	BLife  []string
}

func newLifeCmd(stdout, stderr io.Writer, runF func(context.Context, *LifeOptions) error) *cobra.Command {
	opts := &LifeOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "life [FILE|-]",
		Short: "Service life: P(fatigue failure within the design life), R(N), B10/B1 lives",
		Long: `Sample the uncertain inputs of the joint in FILE (- reads standard input) and
compute each sample's fatigue life on the finite-life curve of fatigue.curve
(shigley, vdi2230 or en1993-1-9) under the repeated load spectrum
(loads.spectrum, damage summed by the Palmgren–Miner rule; without a spectrum,
constant amplitude between loads.axial_min and loads.axial_max). The joint
fails at its first bolt's failure. Reported: the probability of fatigue failure
within fatigue.design_life with its exact (Clopper–Pearson) interval; the
reliability R(N), the probability of surviving N cycles, with its band; the
B10 and B1 lives (and every --b-life P) with one-sided distribution-free
bounds. --out DIR also writes the R(N) picture on a log-cycles axis and the
review report.

The estimator is crude Monte Carlo: a failure probability p needs about
3/p samples before a failure is seen. When fewer than 100 samples fail within
the design life, the probability is estimated again on the fatigue_life mode by
importance sampling at the design points (subset simulation if that fails), to
a c.o.v. of 10 % within the same budget, and both are reported.
Results are reproducible: the same --seed gives identical numbers for any
--workers.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk life --example service-life
  boltrisk life joint.yaml --samples 1e6 --b-life 0.05 --json
  boltrisk life joint.yaml --out review`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runLife(cmd.Context(), opts)
		},
	}
	opts.addFlags(cmd, true)
	opts.Run.add(cmd, false, "")
	opts.Output.add(cmd)
	cmd.Flags().StringSliceVar(&opts.BLife, "b-life", nil, "also report the B_p life for these failure fractions, e.g. 0.05 or 5% (B10 and B1 are always reported)")
	return cmd
}

func runLife(ctx context.Context, opts *LifeOptions) error {
	s, sys, err := opts.scenario()
	if err != nil {
		return err
	}
	if s.Life == nil {
		return fmt.Errorf("%s: fatigue.curve: required by 'boltrisk life' (allowed: %s) together with fatigue.design_life", scenarioName(s), strings.Join(montecarlo.LifeCurveKeys(), ", "))
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	if set.Modes != nil {
		return usagef("--modes does not apply to 'boltrisk life' (it computes the fatigue life only)")
	}
	ls := montecarlo.LifeSettings{Settings: set, BLives: []float64{0.1, 0.01}, RareBelow: 100}
	for _, t := range opts.BLife {
		p, err := units.Parse(t, units.Fraction)
		if err != nil {
			if p, err = strconv.ParseFloat(strings.TrimSpace(t), 64); err != nil {
				return usagef("--b-life %q: a failure fraction strictly between 0 and 1, e.g. 0.05 or 5%%", t)
			}
		}
		if !(p > 0 && p < 1) {
			return usagef("--b-life %q: a failure fraction strictly between 0 and 1, e.g. 0.05 or 5%%", t)
		}
		if p != 0.1 && p != 0.01 {
			ls.BLives = append(ls.BLives, p)
		}
	}
	var done func()
	ls.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples, "sampling lives")
	res, runErr := montecarlo.RunLife(ctx, &s.Problem, s.Life, ls)
	done()
	if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
		return runErr
	}
	opts.Run.timing(opts.ErrOut, res.Evaluations, res.Elapsed)
	doc := report.Life(s, res, set.Samples, toolVersion())
	if opts.Output.Dir != "" {
		figs, err := report.LifeFigures(s, res)
		if err != nil {
			return err
		}
		ss := []*scenario.Scenario{s}
		rev := report.LifeReview(s, doc, figs, opts.Output.provenance(ss, res.Seed, set.Samples, res.Samples, res.Workers), sys)
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteLife(w, s, doc, sys) },
		func(w io.Writer) error { return report.WriteLifeCSV(w, doc) }, res.Partial, inputFiles(s))
}

func scenarioName(s *scenario.Scenario) string {
	if s.File != "" {
		return s.File
	}
	return "the scenario"
}
