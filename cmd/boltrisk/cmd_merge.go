package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"time"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/study"
)

// MergeOptions are the options of `boltrisk merge`.
type MergeOptions struct {
	common
	Output       outFlags
	AllowMissing bool
	Workers      int
	Quiet        bool
}

func newMergeCmd(stdout, stderr io.Writer) *cobra.Command {
	opts := &MergeOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "merge PARTS…|DIR",
		Short: "Merge the part files of a run split over a job array into its result",
		Long: `Merge the part files written by 'simulate --part K/N' (or 'sweep --part K/N')
into the result one run on one machine would have given, bit for bit: the
integer counts and histogram counts add exactly, and the floating sums kept per
chunk are added in chunk order. Give the part files, or a folder holding them
(every part-*.json in it).

The parts must belong together: the same scenario (its SHA-256), seed, settings,
tool version (also this one's) and number of parts, each part once and none
missing. With --allow-missing a merge of some of the parts gives a valid result
of their samples, marked partial (exit status 3), naming the missing parts.

The output is what the command that was split writes: the text report, --json,
--csv, --out DIR. Where a percentile needs refining, the merge re-runs the
binned chunks locally (rare: an atom or a very heavy tail), as a run on one
machine does.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk merge part-*-of-64.json --json > result.json
  boltrisk merge parts/ --out review
  boltrisk merge parts/ --allow-missing`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			return runMerge(cmd.Context(), opts)
		},
	}
	fl := cmd.Flags()
	fl.BoolVar(&opts.JSON, "json", false, "write the merged result as JSON (as the split command would)")
	fl.StringVar(&opts.CSV, "csv", "", "also write the result table as CSV into this file (- for standard output, instead of the report)")
	fl.StringVar(&opts.Units, "units", "", "units of the text report: si or us (default: the scenario's units)")
	fl.BoolVar(&opts.AllowMissing, "allow-missing", false, "merge the parts given even when some are missing: a partial result, marked so")
	fl.IntVar(&opts.Workers, "workers", 0, "workers for a refinement pass (default: all cores); the result does not depend on it")
	fl.BoolVar(&opts.Quiet, "quiet", false, "no summary line on stderr")
	opts.Output.add(cmd)
	return cmd
}

// partFiles expands the arguments: files, or folders of part-*.json.
func partFiles(args []string) ([]string, error) {
	var out []string
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil {
			return nil, fmt.Errorf("cannot read part file %s: %w", a, errors.Unwrap(err))
		}
		if !st.IsDir() {
			out = append(out, a)
			continue
		}
		m, _ := filepath.Glob(filepath.Join(a, "part-*.json"))
		if len(m) == 0 {
			return nil, fmt.Errorf("folder %s holds no part files (part-*.json)", a)
		}
		sort.Strings(m)
		out = append(out, m...)
	}
	return out, nil
}

// readParts reads and checks the part files.
func readParts(args []string, allowMissing bool) (*report.PartSet, error) {
	files, err := partFiles(args)
	if err != nil {
		return nil, err
	}
	docs := make([]*report.PartDoc, len(files))
	for i, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			return nil, fmt.Errorf("cannot read part file: %w", err)
		}
		if docs[i], err = report.DecodePart(f, b); err != nil {
			return nil, err
		}
	}
	return report.CheckParts(files, docs, toolVersion(), allowMissing)
}

func runMerge(ctx context.Context, opts *MergeOptions) error {
	start := time.Now()
	if opts.Workers < 0 || opts.Workers > 1024 {
		return usagef("--workers %d: from 1 to 1024, or 0 for all cores", opts.Workers)
	}
	ps, err := readParts(opts.File, opts.AllowMissing)
	if err != nil {
		return err
	}
	ref := ps.Docs[0]
	s, err := ref.ScenarioOf()
	if err != nil {
		return fmt.Errorf("%s: the scenario in the part file: %w", ps.Files[0], err)
	}
	sys, err := opts.system(s)
	if err != nil {
		return err
	}
	set, err := ref.RunSettings(opts.Workers)
	if err != nil {
		return fmt.Errorf("%s: settings: %w", ps.Files[0], err)
	}
	set = set.WithDefaults()
	if ref.Workers > 0 {
		set.Workers = ref.Workers // provenance: the workers of each part
		if opts.Workers > 0 {
			set.Workers = opts.Workers
		}
	}
	steps := len(ref.Steps)
	states := make([][]*montecarlo.PartState, steps)
	for i, d := range ps.Docs {
		st, err := d.States()
		if err != nil {
			return fmt.Errorf("%s: %w", ps.Files[i], err)
		}
		if len(st) != steps {
			return fmt.Errorf("%s holds %d steps, %s %d", ps.Files[i], len(st), ps.Files[0], steps)
		}
		for j := range st {
			states[j] = append(states[j], st[j])
		}
	}
	merge := func(p *montecarlo.Problem, sts []*montecarlo.PartState, file string) (*montecarlo.Result, error) {
		res, err := montecarlo.MergeParts(ctx, p, set, sts)
		if err != nil && !errors.Is(err, montecarlo.ErrInterrupted) {
			return nil, fmt.Errorf("merging %s …: %w", file, err)
		}
		return res, err
	}
	missing := ""
	if len(ps.Missing) > 0 {
		missing = fmt.Sprintf("partial merge: %d of %d parts missing (%s); the result covers only the samples of the parts given", len(ps.Missing), ref.Parts, report.RangeList(ps.Missing))
	}
	if !opts.Quiet {
		defer func() {
			fmt.Fprintf(opts.ErrOut, "boltrisk: merged %d of %d parts in %.2f s\n", len(ps.Docs), ref.Parts, time.Since(start).Seconds())
		}()
	}
	partialExit := func(p bool) error {
		if len(ps.Missing) > 0 {
			return partialMerge{len(ps.Missing), ref.Parts}
		}
		return partialErr(p)
	}
	switch ref.Command {
	case "simulate":
		res, err := merge(&s.Problem, states[0], ps.Files[0])
		if res == nil {
			return err
		}
		res.Partial = err != nil || len(ps.Missing) > 0
		doc := report.Simulation(s, res, report.Run{Samples: set.Samples, Interval: set.Interval}, toolVersion())
		if missing != "" {
			doc.Warnings = append(doc.Warnings, missing)
		}
		so := &SimulateOptions{common: opts.common, Output: opts.Output}
		so.Run.Quiet = opts.Quiet
		if opts.Output.Dir != "" {
			if err := writeSimulationReview(ctx, so, s, res, &doc, set, study.Vary{}); err != nil {
				return err
			}
		}
		if err := opts.finish(doc, func(w io.Writer) { report.WriteSimulation(w, s, doc, sys) },
			func(w io.Writer) error { return report.WriteSimulationCSV(w, doc) }, false, ps.Files); err != nil {
			return err
		}
		return partialExit(err != nil)
	case "sweep":
		if err := mergeSweep(ctx, opts, ps, s, set, states, merge, missing); err != nil {
			return err
		}
		return partialExit(false)
	}
	return fmt.Errorf("%s: unknown command %q", ps.Files[0], ref.Command)
}

// partialMerge is the exit status of a merge with missing parts: the
// partial result was written (exit 3).
type partialMerge struct{ missing, parts int }

func (e partialMerge) Error() string {
	return fmt.Sprintf("partial merge: %d of %d parts missing; the partial result was written, marked partial", e.missing, e.parts)
}
func (e partialMerge) Unwrap() error { return errPartial }
