package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
)

// SimulateOptions are the options of `boltrisk simulate`.
type SimulateOptions struct {
	common
	Run       runFlags
	Output    outFlags
	LoadCurve string
	LoadSteps int
	Drivers   bool
	SignOff   float64
	Part      partFlags
}

func newSimulateCmd(stdout, stderr io.Writer, runF func(context.Context, *SimulateOptions) error) *cobra.Command {
	opts := &SimulateOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "simulate [FILE|-]",
		Short: "Monte Carlo: probability of each failure mode with confidence bounds",
		Long: `Sample the uncertain inputs of the joint in FILE (- reads standard input) —
torque, nut factor or friction, strengths, loads, … — evaluate the joint for
every sample, and report the probability of each failure mode and of any mode,
with its coefficient of variation and confidence interval, and percentiles of
preload, bolt force, clamp force and safety factors.

--method chooses the estimator: crude Monte Carlo; importance sampling in
standard-normal space at the design points of every mode and bolt (a mixture
with a defensive part, unbiased for any mode and any bolt); subset simulation
(repeated runs give its c.o.v.); or auto (the default): crude when a pilot shows
the budget reaches the precision (1/precision² failures), else importance
sampling when every design point is found and the weights are healthy, else
subset simulation. --precision stops every method once each probability's
c.o.v. is at most the target (default 5 % for the rare-event methods).

Results are reproducible: the same --seed gives identical numbers for any
--workers, for every method. Ctrl-C (or SIGTERM, SIGHUP) stops cleanly and reports what was done,
marked partial.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk simulate --example cover-flange
  boltrisk simulate joint.yaml --samples 1e7 --seed 42 --json
  boltrisk simulate joint.yaml --precision 5% --samples 1e9
  boltrisk simulate --example cover-flange --out review --load-curve 0.5..2
  boltrisk simulate - < joint.yaml --csv modes.csv`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runSimulate(cmd.Context(), opts)
		},
	}
	opts.addFlags(cmd, true)
	opts.Run.add(cmd, true, "auto")
	opts.Output.add(cmd)
	cmd.Flags().StringVar(&opts.LoadCurve, "load-curve", "", "with --out: also draw the probability of each mode against a multiplier LO..HI on the service loads, e.g. 0.5..2")
	cmd.Flags().IntVar(&opts.LoadSteps, "load-steps", 9, "values of the load multiplier for --load-curve")
	cmd.Flags().Float64Var(&opts.SignOff, "sign-off", 0, "with --out: target failure probability of the sign-off page's verdicts, in (0, 1) (default: the scenario's study.target_probability)")
	cmd.Flags().BoolVar(&opts.Drivers, "drivers", false, "also find what drives each mode (see 'boltrisk drivers'; a crude run of the same samples)")
	opts.Part.add(cmd)
	return cmd
}

func runSimulate(ctx context.Context, opts *SimulateOptions) error {
	if opts.Part.Spec != "" {
		return runSimulatePart(ctx, opts)
	}
	s, sys, err := opts.scenario()
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	if err := checkSignOff(opts); err != nil {
		return err
	}
	if err := opts.Part.fixed(&opts.Run, &set); err != nil {
		return err
	}
	if opts.LoadCurve != "" && opts.Output.Dir == "" {
		return usagef("--load-curve draws a picture: give --out DIR too")
	}
	var curve study.Vary
	if opts.LoadCurve != "" {
		if curve, err = parseVary("load="+opts.LoadCurve, s, opts.LoadSteps); err != nil {
			return usagef("--load-curve %q: %v", opts.LoadCurve, errors.Unwrap(err))
		}
	}
	var done func()
	set.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples, "sampling")
	res, runErr := montecarlo.Estimate(ctx, &s.Problem, set)
	done()
	if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
		return runErr
	}
	opts.Run.timing(opts.ErrOut, res.Evaluations, res.Elapsed)
	doc := report.Simulation(s, res, report.Run{Samples: set.Samples, Interval: set.Interval}, toolVersion())
	if opts.Drivers && !res.Partial {
		dset := set // the drivers follow the method the run used
		dset.Method = montecarlo.Crude
		if res.Method == montecarlo.Importance.String() {
			dset.Method = montecarlo.Importance
		}
		d, err := driversOf(ctx, s, dset, decide.DefaultSubsample)
		if err != nil {
			return err
		}
		b := report.DriversBodyOf(d)
		doc.Drivers = &b
	}
	if opts.Output.Dir != "" {
		if err := writeSimulationReview(ctx, opts, s, res, &doc, set, curve); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) {
		report.WriteSimulation(w, s, doc, sys)
		if doc.Drivers != nil {
			io.WriteString(w, "\n")
			report.WriteDriversBody(w, *doc.Drivers)
		}
	},
		func(w io.Writer) error { return report.WriteSimulationCSV(w, doc) }, res.Partial, inputFiles(s))
}

// writeSimulationReview writes the review folder. An interruption during
// the load curve keeps the finished main result: the review is written
// without the curve, and says so.
func writeSimulationReview(ctx context.Context, opts *SimulateOptions, s *scenario.Scenario, res *montecarlo.Result, doc *report.SimDoc, set montecarlo.Settings, curve study.Vary) error {
	sys, _ := opts.system(s)
	var figs []report.Figure
	if res.HasDistributions() {
		var err error
		if figs, err = report.SimulationFigures(s, res, sys, set.Interval); err != nil {
			return err
		}
	}
	if opts.LoadCurve != "" && !res.Partial {
		lset := set
		lset.Precision, lset.Progress = 0, nil
		sw, err := study.Run(ctx, &s.Problem, curve, lset, 0)
		switch {
		case errors.Is(err, montecarlo.ErrInterrupted):
			doc.Warnings = append(doc.Warnings, fmt.Sprintf("the load curve was interrupted after %d of %d steps and is left out; the main result above is complete", len(sw.Steps), curve.Steps))
			res.Partial = true // the exit status says the output is incomplete
			doc.Partial = false
		case err != nil:
			return err
		default:
			f, _, err := report.CurveFigure(s, sw, sys, "load-curve.png", "Failure probability against load level")
			if err != nil {
				return err
			}
			figs = append(figs, f)
		}
	}
	ss := []*scenario.Scenario{s}
	rev := report.SimulationReview(s, *doc, figs, opts.Output.provenance(ss, res.Seed, set.Samples, res.Samples, res.Workers), sys)
	if doc.Drivers != nil {
		if err := addDrivers(rev, *doc.Drivers); err != nil {
			return err
		}
	}
	addSignOff(rev, opts, s, res, *doc)
	return opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet)
}
