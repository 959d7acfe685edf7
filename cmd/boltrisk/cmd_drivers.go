package main

import (
	"context"
	"errors"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// DriversOptions are the options of `boltrisk drivers`.
type DriversOptions struct {
	common
	Subsample int
	Run       runFlags
	Output    outFlags
}

const driversHelp = `For every mode and for any mode, per uncertain input (per-bolt inputs grouped
over the bolts):
  α²        the FORM importance factor at the mode's design point (Hasofer–Lind),
            signed + when raising the input lowers the margin (load-like) and −
            when it raises it (resistance-like); a union such as "any mode" has
            several design points and so no single α
  shift     the mean normal score of the input over the failed samples, in
            standard deviations ((x − μ)/σ for a normal input), with its interval
  Spearman  the rank correlation of the input with the mode's safety factor, from
            a fixed-size seeded subsample of the crude run (memory stays flat)
  fixed     the probability with the input fixed at its median (omission
            sensitivity), re-run with the same random numbers

--method importance takes the estimates, the shifts and the omission runs from
importance sampling at the design points (small probabilities); the rank
correlations still come from a crude subsample.`

func newDriversCmd(stdout, stderr io.Writer, runF func(context.Context, *DriversOptions) error) *cobra.Command {
	opts := &DriversOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "drivers [FILE]",
		Short: "What drives each failure mode: importance factors, failure shifts, rank correlations, omission",
		Long: `Find which uncertain inputs drive each failure mode, from one crude Monte Carlo run
and the FORM design points.

` + driversHelp + `

simulate --drivers adds the same section to simulate's output.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk drivers --example cover-flange
  boltrisk drivers joint.yaml --samples 4e6 --out review/`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runDrivers(cmd.Context(), opts)
		},
	}
	opts.addFlags(cmd, false)
	cmd.Flags().IntVar(&opts.Subsample, "subsample", decide.DefaultSubsample, "samples behind the rank correlations (the first of the run), 16 … 4194304")
	opts.Run.add(cmd, false, "crude")
	opts.Output.add(cmd)
	return cmd
}

// driversOf runs the drivers study of a scenario: by crude Monte Carlo, or
// with method importance by importance sampling (the rank correlations
// from a crude subsample).
func driversOf(ctx context.Context, s *scenario.Scenario, set montecarlo.Settings, subsample int) (*decide.Drivers, error) {
	if subsample < 16 || subsample > 1<<22 {
		return nil, usagef("--subsample %d: from 16 to 4194304", subsample)
	}
	m := set.Method
	if m != montecarlo.Importance && m != montecarlo.Crude {
		return nil, usagef("--method %s: drivers take crude or importance", m)
	}
	set.Method, set.Precision, set.Progress = montecarlo.Crude, 0, nil
	d, err := decide.RunDrivers(ctx, &s.Problem, decide.DriverOptions{Settings: set, Subsample: subsample, Method: m})
	if errors.Is(err, montecarlo.ErrInterrupted) {
		return nil, errors.New("interrupted: the drivers need the whole run; nothing was written")
	}
	return d, err
}

func runDrivers(ctx context.Context, opts *DriversOptions) error {
	s, sys, err := opts.scenario()
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	d, err := driversOf(ctx, s, set, opts.Subsample)
	if err != nil {
		return err
	}
	doc := report.Drivers(s, d, toolVersion())
	if opts.Output.Dir != "" {
		f, err := report.DriversFigure(doc.DriversBody)
		if err != nil {
			return err
		}
		ss := []*scenario.Scenario{s}
		rev := report.DriversReview(s, doc, []report.Figure{f}, opts.Output.provenance(ss, set.Seed, set.Samples, d.Samples, set.Workers), sys)
		rev.Appendices = append(rev.Appendices, report.ScenarioAppendix(s))
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteDrivers(w, s, doc, sys) }, nil, false, inputFiles(s))
}

// addDrivers adds the drivers section and picture to a review.
func addDrivers(rev *report.Review, b report.DriversBody) error {
	f, err := report.DriversFigure(b)
	if err != nil {
		return err
	}
	rev.Sections = append(rev.Sections, report.DriversSections(b)...)
	rev.Figures = append(rev.Figures, f)
	return nil
}
