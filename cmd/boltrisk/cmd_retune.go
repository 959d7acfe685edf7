package main

import (
	"context"
	"errors"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// retuneFlags are compare's --retune options.
type retuneFlags struct {
	On     bool
	Target float64
	Steps  int
}

func (f *retuneFlags) add(cmd *cobra.Command) {
	cmd.Flags().BoolVar(&f.On, "retune", false, "move every variant to its own callout for --target (as 'boltrisk spec' finds it) and compare them there")
	cmd.Flags().Float64Var(&f.Target, "target", 0, "with --retune: target failure probability in (0, 1) (default: the scenario's study.target_probability)")
	cmd.Flags().IntVar(&f.Steps, "retune-steps", 9, "with --retune: grid values of each variant's callout search, 3 … 101")
}

// retune runs each variant's callout search and returns the variants at
// their callouts with the retune document.
func retune(ctx context.Context, cmd *cobra.Command, f *retuneFlags, ss []*scenario.Scenario, names []string, set montecarlo.Settings, sys units.System) ([]*montecarlo.Problem, *report.RetuneDoc, error) {
	target := f.Target
	if !cmd.Flags().Changed("target") && ss[0].Study.TargetProbability > 0 {
		target = ss[0].Study.TargetProbability
	}
	if !f.On {
		if cmd.Flags().Changed("target") {
			return nil, nil, usagef("--target is for --retune")
		}
		return nil, nil, nil
	}
	if !(target > 0 && target < 1) {
		return nil, nil, usagef("--target %g: --retune needs a failure probability strictly between 0 and 1, e.g. 1e-4 (or study.target_probability in the file)", target)
	}
	if f.Steps < 3 || f.Steps > 101 {
		return nil, nil, usagef("--retune-steps %d: from 3 to 101", f.Steps)
	}
	ps := make([]*montecarlo.Problem, len(ss))
	opts := make([]decide.SpecOptions, len(ss))
	noms := make([]float64, len(ss))
	spec := set
	spec.Progress = nil
	for i, s := range ss {
		ps[i] = &s.Problem
		path := pathOf(s)
		if _, ok := s.Uncertain(path); !ok {
			return nil, nil, errors.New("variant " + names[i] + ": " + path + " has no scatter: set tightening.tool or a distribution so that its callout has a tolerance")
		}
		noms[i] = *scenario.FieldPtr(s.Inputs(), path)
		dim := scenario.FieldDim(path)
		// The range spec takes by default, so that each callout is the
		// variant's own spec result.
		opts[i] = decide.SpecOptions{Target: target, Path: path, Field: scenario.FieldPtrFunc(path), Lo: 0.5 * noms[i], Hi: 1.5 * noms[i], Steps: f.Steps, Settings: spec, Expand: DefaultExpand,
			Format: func(v float64) string { return sys.Format(v, dim) }}
	}
	rs, err := decide.Retune(ctx, ps, names, opts)
	if err != nil {
		if errors.Is(err, montecarlo.ErrInterrupted) {
			return nil, nil, errors.New("interrupted: --retune needs every variant's callout; nothing was written")
		}
		return nil, nil, err
	}
	out := make([]*montecarlo.Problem, len(rs))
	for i := range rs {
		out[i] = rs[i].Problem
	}
	return out, report.Retune(target, names, noms, rs), nil
}

// withRetune writes the retune table before the comparison's text.
func withRetune(d *report.RetuneDoc, sys units.System, text func(io.Writer)) func(io.Writer) {
	if d == nil {
		return text
	}
	return func(w io.Writer) {
		report.WriteRetune(w, d, sys)
		text(w)
	}
}

// pathOf is the input a callout sets: the preload for preload-controlled
// methods, else the torque.
func pathOf(s *scenario.Scenario) string {
	if s.Inputs().Method == model.DirectPreload {
		return "tightening.preload"
	}
	return "tightening.torque"
}
