package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
)

// runSweepPart runs one part of every step of a sweep (the grid; common
// random numbers: each step's part draws the same chunks) and writes its
// part file.
func runSweepPart(ctx context.Context, opts *SweepOptions) error {
	k, n, err := opts.Part.resolve(osGetenv)
	if err != nil {
		return err
	}
	switch {
	case opts.Output.Dir != "":
		return usagef("--out applies to the merged result: give it to 'boltrisk merge', not to a part")
	case opts.JSON || opts.CSV != "":
		return usagef("--json and --csv apply to the merged result: give them to 'boltrisk merge'; a part writes only its part file")
	case opts.MaxScatter != "":
		return usagef("--max-scatter cannot be split into parts: its search is sequential (each run decides the next); run it on one machine")
	case opts.Vary == "":
		return usagef("--vary is required (e.g. --vary torque=40..70N*m)")
	}
	src, err := partSource(opts.Cmd(), opts.File, opts.Example)
	if err != nil {
		return err
	}
	s := src.Scenario
	if opts.Cmd().Flags().Changed("target") || s.Study.TargetProbability > 0 {
		return usagef("--target (or the scenario's study.target_probability) refines the window's edges by bisection, which is sequential and cannot be split: sweep parts run the grid only; drop --target (remove study.target_probability), or run the window search on one machine")
	}
	set, err := opts.Run.settings(s)
	if err != nil {
		return err
	}
	if err := partRefusals(&opts.Run, set, "sweep"); err != nil {
		return err
	}
	v, err := parseVary(opts.Vary, s, opts.Steps)
	if err != nil {
		return err
	}
	set = set.WithDefaults()
	set.ProbabilitiesOnly = true
	xs := v.Values()
	note := ""
	if set.Method == montecarlo.Auto {
		q, err := v.Apply(&s.Problem, xs[len(xs)/2])
		if err != nil {
			return err
		}
		if note, err = montecarlo.ResolvePart(ctx, q, set); err != nil {
			return err
		}
		set.Method = montecarlo.Crude
	}
	var states []*montecarlo.PartState
	for i, x := range xs {
		q, err := v.Apply(&s.Problem, x)
		if err != nil {
			return err
		}
		st, err := montecarlo.RunPart(ctx, q, set, k, n)
		if err != nil {
			if errors.Is(err, montecarlo.ErrInterrupted) {
				return fmt.Errorf("%v (the part's tally is lost; run the part again)", err)
			}
			return fmt.Errorf("step %d (%g): %w", i+1, x, err)
		}
		states = append(states, st)
	}
	pv := &report.PartVary{Spec: opts.Vary, Steps: opts.Steps, MethodNote: note}
	doc := report.NewPartDoc("sweep", src, set, opts.Run.Method, states, pv, toolVersion())
	path := opts.Part.partFile(k, n)
	if err := writePart(path, doc, inputFiles(s)); err != nil {
		return err
	}
	if !opts.Run.Quiet {
		fmt.Fprintf(opts.ErrOut, "boltrisk: sweep part %d of %d: %d steps, chunks %d … %d each; wrote %s\n", k, n, len(states), states[0].FirstChunk, states[0].EndChunk-1, path)
	}
	return nil
}

// mergeSweep merges the parts of a sweep step by step and writes what
// the sweep on one machine writes.
func mergeSweep(ctx context.Context, opts *MergeOptions, ps *report.PartSet, s *scenario.Scenario, set montecarlo.Settings, states [][]*montecarlo.PartState, merge func(*montecarlo.Problem, []*montecarlo.PartState, string) (*montecarlo.Result, error), missing string) error {
	ref := ps.Docs[0]
	if ref.Vary == nil {
		return fmt.Errorf("%s: a sweep part without its swept input", ps.Files[0])
	}
	v, err := parseVary(ref.Vary.Spec, s, ref.Vary.Steps)
	if err != nil {
		return fmt.Errorf("%s: %w", ps.Files[0], err)
	}
	sys, err := opts.system(s)
	if err != nil {
		return err
	}
	set.ProbabilitiesOnly = true
	if set.Method == montecarlo.Auto {
		set.Method = montecarlo.Crude // resolved before the split
	}
	xs := v.Values()
	if len(states) != len(xs) {
		return fmt.Errorf("%s holds %d steps; --vary %s with %d steps has %d", ps.Files[0], len(states), ref.Vary.Spec, ref.Vary.Steps, len(xs))
	}
	var results []*montecarlo.Result
	for i, x := range xs {
		q, err := v.Apply(&s.Problem, x)
		if err != nil {
			return err
		}
		r, err := merge(q, states[i], ps.Files[0])
		if r == nil {
			return err
		}
		r.Partial = r.Partial || len(ps.Missing) > 0
		results = append(results, r)
	}
	sw := study.Assemble(v, set, results, ref.Vary.MethodNote)
	doc := report.Sweep(s, sw, toolVersion())
	if missing != "" {
		doc.Warnings = append(doc.Warnings, missing)
	}
	ss := []*scenario.Scenario{s}
	if opts.Output.Dir != "" && !sw.Partial {
		f, _, err := report.CurveFigure(s, sw, sys, "reliability.png", "Failure probability against "+v.Path)
		if err != nil {
			return err
		}
		rev := report.SweepReview(s, doc, []report.Figure{f}, opts.Output.provenance(ss, set.Seed, set.Samples, set.Samples, set.Workers), sys)
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteSweep(w, s, doc, sys) },
		func(w io.Writer) error { return report.WriteSweepCSV(w, doc) }, false, ps.Files)
}
