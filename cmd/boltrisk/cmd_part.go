package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// partSource loads the scenario like loadScenario and keeps the text it
// was parsed from, for the part file.
func partSource(cmd *cobra.Command, args []string, example string) (report.PartSource, error) {
	var src report.PartSource
	var err error
	switch {
	case len(args) == 1 && example != "":
		return src, usagef("give a scenario FILE or --example NAME, not both")
	case len(args) == 1 && args[0] == "-":
		src.Name = "(standard input)"
		if src.Data, err = io.ReadAll(cmd.InOrStdin()); err != nil {
			return src, fmt.Errorf("cannot read the scenario from standard input: %w", err)
		}
	case len(args) == 1:
		src.Name = args[0]
		if src.Data, err = os.ReadFile(args[0]); err != nil {
			return src, fmt.Errorf("cannot read scenario: %w", err)
		}
	case example != "":
		if src.Data, err = scenario.ExampleSource(example); err != nil {
			_, err = scenario.Example(example) // its message lists the examples
			return src, err
		}
		src.Name = "example:" + example
	default:
		return src, usagef("a scenario FILE is required (- reads standard input; or --example NAME; built-in examples: %v)", scenario.Examples())
	}
	if src.Scenario, err = scenario.Parse(src.Name, src.Data); err != nil {
		return src, err
	}
	if example != "" {
		src.Scenario.File = ""
	}
	return src, nil
}

// partRefusals checks that a run can be split: a fixed sample count and a
// method whose state merges exactly. Errors name what to use instead.
func partRefusals(run *runFlags, set montecarlo.Settings, what string) error {
	if run.changed("precision") {
		return usagef("--precision cannot be used with --part: adaptive stopping decides after every round of chunks where to stop, so parts cannot run on their own; give a fixed --samples (crude Monte Carlo), or run the adaptive estimate on one machine")
	}
	if set.Precision > 0 {
		return usagef("the scenario sets study.precision %g (adaptive stopping), which cannot be split into parts: remove study.precision from the scenario and give a fixed --samples, or run on one machine", set.Precision)
	}
	switch set.Method {
	case montecarlo.Subset:
		return usagef("--method subset cannot be split into parts: subset simulation is sequential (each level's samples seed the next); methods that can be split: crude, importance (exactly --samples samples) and auto when it resolves to crude; run subset simulation on one machine")
	case montecarlo.Importance:
		if what == "sweep" {
			return usagef("--method importance cannot be split in a sweep: sweep parts run crude Monte Carlo (--method crude)")
		}
	}
	return nil
}

// writePart writes a part file durably, refusing to write over an input.
func writePart(path string, doc report.PartDoc, inputs []string) error {
	b, err := report.EncodePart(doc)
	if err != nil {
		return err
	}
	if err := refuseInput(path, inputs); err != nil {
		return err
	}
	return report.WriteFile(path, func(w io.Writer) error { _, err := w.Write(b); return err })
}

// runSimulatePart runs one part of a simulation and writes its part file.
func runSimulatePart(ctx context.Context, opts *SimulateOptions) error {
	k, n, err := opts.Part.resolve(osGetenv)
	if err != nil {
		return err
	}
	switch {
	case opts.Output.Dir != "" || opts.LoadCurve != "":
		return usagef("--out and --load-curve apply to the merged result: give them to 'boltrisk merge', not to a part")
	case opts.JSON || opts.CSV != "":
		return usagef("--json and --csv apply to the merged result: give them to 'boltrisk merge'; a part writes only its part file")
	}
	src, err := partSource(opts.Cmd(), opts.File, opts.Example)
	if err != nil {
		return err
	}
	set, err := opts.Run.settings(src.Scenario)
	if err != nil {
		return err
	}
	if err := partRefusals(&opts.Run, set, "simulate"); err != nil {
		return err
	}
	set = set.WithDefaults()
	set.FixedSamples = set.Method == montecarlo.Importance // the split draws exactly --samples
	var done func()
	set.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples/int64(n), fmt.Sprintf("part %d/%d", k, n))
	st, err := montecarlo.RunPart(ctx, &src.Scenario.Problem, set, k, n)
	done()
	if err != nil {
		if errors.Is(err, montecarlo.ErrInterrupted) {
			return fmt.Errorf("%v (the part's tally is lost; run the part again)", err)
		}
		return err
	}
	set.Progress = nil
	doc := report.NewPartDoc("simulate", src, set, opts.Run.Method, []*montecarlo.PartState{st}, nil, toolVersion())
	path := opts.Part.partFile(k, n)
	if err := writePart(path, doc, inputFiles(src.Scenario)); err != nil {
		return err
	}
	if !opts.Run.Quiet {
		fmt.Fprintf(opts.ErrOut, "boltrisk: part %d of %d: chunks %d … %d, %d samples in %.2f s; wrote %s\n", k, n, st.FirstChunk, st.EndChunk-1, st.Samples+st.Invalid, st.Elapsed.Seconds(), path)
	}
	return nil
}
