package main

import (
	"context"
	"errors"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
)

// SimulateOptions are the options of `boltrisk simulate`.
type SimulateOptions struct {
	Out, ErrOut io.Writer
	File        []string
	Example     string
	JSON        bool
	Units       string
	UnitsOn     bool
	Run         runFlags
}

func init() {
	extraCommands = append(extraCommands, func(stdout, stderr io.Writer) *cobra.Command {
		return newSimulateCmd(stdout, stderr, nil)
	})
}

func newSimulateCmd(stdout, stderr io.Writer, runF func(context.Context, *SimulateOptions) error) *cobra.Command {
	opts := &SimulateOptions{Out: stdout, ErrOut: stderr}
	cmd := &cobra.Command{
		Use:   "simulate [FILE]",
		Short: "Monte Carlo: probability of each failure mode with confidence bounds",
		Long: `Sample the uncertain inputs of the joint in FILE (torque, nut factor or friction,
strengths, loads, …), evaluate the joint for every sample, and report the
probability of each failure mode and of any mode, with confidence intervals,
percentiles of preload, bolt force, clamp force and safety factors.

Results are reproducible: the same --seed gives identical numbers for any
--workers. Ctrl-C stops cleanly and reports what was done, marked partial.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk simulate --example cover-flange
  boltrisk simulate joint.yaml --samples 1e7 --seed 42 --json
  boltrisk simulate joint.yaml --target 0.05 --samples 1e8`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.File = args
			opts.UnitsOn = cmd.Flags().Changed("units")
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runSimulate(cmd.Context(), opts)
		},
	}
	cmd.Flags().StringVar(&opts.Example, "example", "", "use a built-in example scenario instead of FILE (see 'boltrisk example')")
	cmd.Flags().BoolVar(&opts.JSON, "json", false, "write the result as JSON (SI units, schema in README)")
	cmd.Flags().StringVar(&opts.Units, "units", "si", "units of the text report: si or us (default: the scenario's)")
	opts.Run.add(cmd, true)
	return cmd
}

func runSimulate(ctx context.Context, opts *SimulateOptions) error {
	s, err := loadScenario(opts.File, opts.Example)
	if err != nil {
		return err
	}
	sys, err := parseUnits(opts.Units, s, opts.UnitsOn)
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	var done func()
	set.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples, "sampling")
	res, runErr := montecarlo.Run(ctx, &s.Problem, set)
	done()
	if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
		return runErr
	}
	opts.Run.timing(opts.ErrOut, res.Samples+res.Invalid, res.Elapsed)
	doc := report.Simulation(s, res, set.Target, toolVersion())
	if opts.JSON {
		err = report.WriteJSON(opts.Out, doc)
	} else {
		report.WriteSimulation(opts.Out, s, doc, sys)
	}
	if err != nil {
		return err
	}
	if res.Partial {
		return errPartial
	}
	return nil
}
