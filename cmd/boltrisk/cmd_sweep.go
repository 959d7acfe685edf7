package main

import (
	"context"
	"errors"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
)

// SweepOptions are the options of `boltrisk sweep`.
type SweepOptions struct {
	common
	Vary       string
	Steps      int
	Target     float64
	MaxScatter string
	Run        runFlags
	Output     outFlags
	Part       partFlags
}

func newSweepCmd(stdout, stderr io.Writer, runF func(context.Context, *SweepOptions) error) *cobra.Command {
	opts := &SweepOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "sweep [FILE] --vary INPUT=LO..HI[UNIT]",
		Short: "Failure probabilities against a varied input; torque window for a target",
		Long: `Run the Monte Carlo analysis at equally spaced values of one input, reusing the
same random streams at every step (common random numbers) so that the curves are
smooth and differences between steps are not sampling noise.

--vary takes one of:
  INPUT=LO..HI[UNIT]     the nominal value of an input, e.g. torque=40..70N*m or
                         loads.axial_max=10..20kN; an uncertain input keeps its
                         family and coefficient of variation
  load=LO..HI            a multiplier on every service load (axial and shear)
  spread:INPUT=LO..HI    a multiplier on the scatter of an uncertain input
                         (1 = the scenario's own), e.g. spread:torque=0.5..3

With --target P it reports the window of the varied value in which every mode,
and the joint as a whole, stays at or below the failure probability P — from
the point estimates and, conservatively, from the upper confidence bounds —
with each end refined by bisection beyond the grid (common random numbers) and
its resolution, which modes bound it on each side, and the value with the
least probability; or says plainly that no value meets the target. Steps
where fewer than half the samples lie in the model's domain are marked and
never bound a window.

With --max-scatter INPUT and --target P it answers the inverse question instead:
the largest scatter of INPUT (at the scenario's nominal values) that still meets P.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk sweep --example cover-flange --vary torque=40..70N*m --steps 13 --target 1e-3
  boltrisk sweep joint.yaml --vary load=0.5..2 --steps 16
  boltrisk sweep joint.yaml --max-scatter tightening.torque --target 1e-4`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runSweep(cmd.Context(), opts)
		},
	}
	fl := cmd.Flags()
	opts.addFlags(cmd, true)
	fl.StringVar(&opts.Vary, "vary", "", "what to vary: INPUT=LO..HI[UNIT], load=LO..HI or spread:INPUT=LO..HI")
	fl.IntVar(&opts.Steps, "steps", 11, "number of equally spaced values, ≥ 2")
	fl.Float64Var(&opts.Target, "target", 0, "target failure probability in (0, 1): report the window that meets it")
	fl.StringVar(&opts.MaxScatter, "max-scatter", "", "find the largest scatter of this uncertain input that meets --target")
	opts.Run.add(cmd, false, "crude")
	opts.Output.add(cmd)
	opts.Part.add(cmd)
	return cmd
}

// parseVary reads a --vary specification against a scenario.
func parseVary(spec string, s *scenario.Scenario, steps int) (study.Vary, error) {
	v := study.Vary{Steps: steps}
	name, rng, ok := strings.Cut(spec, "=")
	if !ok || strings.TrimSpace(rng) == "" {
		return v, usagef("--vary %q: expected INPUT=LO..HI[UNIT], load=LO..HI or spread:INPUT=LO..HI", spec)
	}
	name = strings.TrimSpace(name)
	dim := units.None
	switch {
	case name == "load":
		v.Kind = study.Load
	case strings.HasPrefix(name, "spread:"):
		path, err := scenario.ResolvePath(strings.TrimPrefix(name, "spread:"))
		if err != nil {
			return v, usagef("--vary %q: %v", spec, err)
		}
		v.Kind, v.Path = study.Spread, path
	default:
		path, err := scenario.ResolvePath(name)
		if err != nil {
			return v, usagef("--vary %q: %v (also allowed: load, spread:INPUT)", spec, err)
		}
		v.Kind, v.Path, v.Field = study.Input, path, scenario.FieldPtrFunc(path)
		dim = scenario.FieldDim(path)
	}
	lo, hi, ok := strings.Cut(rng, "..")
	if !ok {
		return v, usagef("--vary %q: the range is LO..HI, e.g. 40..70N*m", spec)
	}
	lo, hi = strings.TrimSpace(lo), strings.TrimSpace(hi)
	if dim != units.None && dim != units.Fraction {
		// A unit written once, after HI, applies to both ends.
		if _, err := units.ParseNumber(lo); err == nil {
			if _, u := splitUnit(hi); u != "" {
				lo += " " + u
			}
		}
	}
	var err error
	if v.Lo, err = units.Parse(lo, dim); err != nil {
		return v, usagef("--vary %q: lower end: %v", spec, err)
	}
	if v.Hi, err = units.Parse(hi, dim); err != nil {
		return v, usagef("--vary %q: upper end: %v", spec, err)
	}
	if err := v.Validate(&s.Problem); err != nil {
		return v, usagef("--vary %q: %v", spec, err)
	}
	return v, nil
}

func splitUnit(s string) (num, unit string) {
	i := strings.IndexFunc(s, func(r rune) bool {
		return !(r >= '0' && r <= '9' || r == '.' || r == '-' || r == '+' || r == 'e' || r == 'E')
	})
	if i < 0 {
		return s, ""
	}
	return s[:i], strings.TrimSpace(s[i:])
}

func runSweep(ctx context.Context, opts *SweepOptions) error {
	if opts.Part.Spec != "" {
		return runSweepPart(ctx, opts)
	}
	s, sys, err := opts.scenario()
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	target := opts.Target
	if !opts.Cmd().Flags().Changed("target") && s.Study.TargetProbability > 0 {
		target = s.Study.TargetProbability
	}
	if target != 0 && !(target > 0 && target < 1) {
		return usagef("--target %g: a failure probability strictly between 0 and 1, e.g. 1e-4", target)
	}
	ss := []*scenario.Scenario{s}
	if opts.MaxScatter != "" {
		if opts.Vary != "" {
			return usagef("give --vary or --max-scatter, not both")
		}
		if target == 0 {
			return usagef("--max-scatter needs --target (a failure probability, e.g. 1e-4)")
		}
		path, err := scenario.ResolvePath(opts.MaxScatter)
		if err != nil {
			return usagef("--max-scatter %q: %v", opts.MaxScatter, err)
		}
		var done func()
		set.Progress, done = opts.Run.progress(opts.ErrOut, study.SpreadRuns*set.Samples, "searching")
		sl, err := study.FindSpreadLimit(ctx, &s.Problem, path, target, set)
		done()
		if err != nil {
			if errors.Is(err, montecarlo.ErrInterrupted) {
				return errors.New("interrupted: the search for the largest scatter needs all its runs; nothing was written")
			}
			return usagef("--max-scatter %q: %v", opts.MaxScatter, err)
		}
		doc := report.SpreadLimit(s, sl, set.Samples, set.Seed, set.Confidence, toolVersion())
		if opts.Output.Dir != "" {
			rev := report.SweepReview(s, doc, nil, opts.Output.provenance(ss, set.Seed, set.Samples, set.Samples, set.Workers), sys)
			if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
				return err
			}
		}
		return opts.finish(doc, func(w io.Writer) { report.WriteSweep(w, s, doc, sys) },
			func(w io.Writer) error { return report.WriteSweepCSV(w, doc) }, false, inputFiles(s))
	}
	if opts.Vary == "" {
		return usagef("--vary is required (e.g. --vary torque=40..70N*m), or use --max-scatter")
	}
	v, err := parseVary(opts.Vary, s, opts.Steps)
	if err != nil {
		return err
	}
	var done func()
	set.Progress, done = opts.Run.progress(opts.ErrOut, int64(opts.Steps)*set.Samples, "sweeping")
	sw, runErr := study.Run(ctx, &s.Problem, v, set, target)
	done()
	if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
		return runErr
	}
	doc := report.Sweep(s, sw, toolVersion())
	if opts.Output.Dir != "" && !sw.Partial {
		f, _, err := report.CurveFigure(s, sw, sys, "reliability.png", "Failure probability against "+v.Path)
		if err != nil {
			return err
		}
		rev := report.SweepReview(s, doc, []report.Figure{f}, opts.Output.provenance(ss, set.Seed, set.Samples, set.Samples, sw.Settings.Workers), sys)
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteSweep(w, s, doc, sys) },
		func(w io.Writer) error { return report.WriteSweepCSV(w, doc) }, sw.Partial, inputFiles(s))
}
