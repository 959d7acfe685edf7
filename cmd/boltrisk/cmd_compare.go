package main

import (
	"context"
	"errors"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// CompareOptions are the options of `boltrisk compare`.
type CompareOptions struct {
	common
	Run    runFlags
	Output outFlags
	Retune retuneFlags
}

func newCompareCmd(stdout, stderr io.Writer, runF func(context.Context, *CompareOptions) error) *cobra.Command {
	opts := &CompareOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "compare FILE [FILE…]",
		Short: "Compare assembly variants (dry vs oiled, wrench vs angle control) with paired samples",
		Long: `Run variants of one joint in lock step with common random numbers: every sample
draws the shared inputs once and each variant maps the same draws through its own
distributions. Give one FILE with a variants: section (the base and each variant),
or several FILEs (the first is the base).

For each mode it reports each variant's probability, the paired difference from
the base with Newcombe's hybrid score interval for paired proportions (narrower
than two independent runs would give), the ratio, and a verdict at the chosen
confidence — better, worse, or no significant difference — from McNemar's exact
test on the discordant pairs. Each variant keeps its own percentiles.

Variants must be the same joint under the same duty: same bolt count and the
same service loads; anything else (condition, tool, torque, class…) may differ.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk compare --example cover-flange
  boltrisk compare dry.yaml oiled.yaml paste.yaml --samples 2e6`,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runCompare(cmd.Context(), opts)
		},
	}
	opts.addFlags(cmd, true)
	opts.Run.add(cmd, false, "")
	opts.Output.add(cmd)
	opts.Retune.add(cmd)
	return cmd
}

// loadVariants loads the scenarios to compare and their labels.
func loadVariants(cmd *cobra.Command, files []string, example string) ([]*scenario.Scenario, []string, error) {
	var ss []*scenario.Scenario
	var names []string
	switch {
	case example != "" && len(files) > 0:
		return nil, nil, usagef("give scenario FILEs or --example NAME, not both")
	case example != "" || len(files) == 1:
		s, err := loadScenario(cmd, files, example)
		if err != nil {
			return nil, nil, err
		}
		if len(s.Variants) == 0 {
			return nil, nil, usagef("%s has no variants: section; give several FILEs or add variants", label(s))
		}
		ss = append(ss, s)
		names = append(names, "base")
		for _, v := range s.Variants {
			ss = append(ss, v)
			names = append(names, v.Variant)
		}
	case len(files) >= 2:
		for _, f := range files {
			s, err := scenario.Load(f)
			if err != nil {
				return nil, nil, err // names the file
			}
			ss = append(ss, s)
			names = append(names, strings.TrimSuffix(filepath.Base(f), filepath.Ext(f)))
		}
	default:
		return nil, nil, usagef("compare needs a FILE with variants, several FILEs, or --example NAME")
	}
	for i := 1; i < len(ss); i++ {
		if err := scenario.SameJoint(ss[0], ss[i]); err != nil {
			return nil, nil, err
		}
	}
	return ss, names, nil
}

func label(s *scenario.Scenario) string {
	if s.File != "" {
		return s.File
	}
	return "the example"
}

func runCompare(ctx context.Context, opts *CompareOptions) error {
	ss, names, err := loadVariants(opts.Cmd(), opts.File, opts.Example)
	if err != nil {
		return err
	}
	sys, err := opts.system(ss[0])
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(ss[0])
	if err != nil {
		return err
	}
	ps := make([]*montecarlo.Problem, len(ss))
	for i, s := range ss {
		ps[i] = &s.Problem
	}
	rps, rdoc, err := retune(ctx, opts.Cmd(), &opts.Retune, ss, names, set, sys)
	if err != nil {
		return err
	}
	if rps != nil {
		ps = rps
	}
	var done func()
	set.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples, "comparing")
	pr, runErr := montecarlo.RunPaired(ctx, ps, set)
	done()
	if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
		return runErr
	}
	doc := report.Compare(ss, names, pr, report.Run{Samples: set.Samples, Interval: set.Interval}, toolVersion())
	report.WithRetune(&doc, rdoc)
	if opts.Output.Dir != "" && !pr.Partial {
		figs, err := report.CompareFigures(names, pr, sys)
		if err != nil {
			return err
		}
		rev := report.CompareReview(ss, doc, figs, opts.Output.provenance(ss, set.Seed, set.Samples, pr.Samples, pr.Variants[0].Workers), sys)
		if rdoc != nil {
			rev.Sections = append([]report.Section{report.RetuneSection(rdoc, sys)}, rev.Sections...)
		}
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, withRetune(rdoc, sys, func(w io.Writer) { report.WriteCompare(w, doc, sys) }),
		func(w io.Writer) error { return report.WriteCompareCSV(w, doc) }, pr.Partial, inputFiles(ss...))
}
