package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// RankOptions are the options of `boltrisk rank`.
type RankOptions struct {
	common
	Run    runFlags
	Output outFlags
	Target float64
}

func newRankCmd(stdout, stderr io.Writer) *cobra.Command {
	opts := &RankOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "rank FILES…|DIR",
		Short: "Simulate a fleet of joints and rank them by their any-mode failure probability",
		Long: `Simulate every scenario given (files, or every *.yaml in a folder), each with
its own study settings and seed (or the flags), and rank the joints by the upper
confidence bound of the probability that any mode fails, highest first, with the
mode governing each (the highest upper bound) and the verdict against --target
(or each scenario's study.target_probability): meets (upper bound at or below),
exceeds (lower bound above) or undecided.

--out DIR writes each joint's review into DIR/NAME/ and an index page
DIR/index.html linking to them; --json, --csv as the other commands.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk rank joints/ --target 1e-5
  boltrisk rank a.yaml b.yaml --samples 1e6 --out fleet --json > fleet.json`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			return runRank(cmd.Context(), opts)
		},
	}
	fl := cmd.Flags()
	fl.BoolVar(&opts.JSON, "json", false, "write the ranking as JSON")
	fl.StringVar(&opts.CSV, "csv", "", "also write the ranking as CSV into this file (- for standard output, instead of the report)")
	fl.StringVar(&opts.Units, "units", "", "units of the joints' reports: si or us (default: each scenario's units)")
	fl.Float64Var(&opts.Target, "target", 0, "failure probability each joint must meet, e.g. 1e-5 (default: each scenario's study.target_probability)")
	opts.Run.add(cmd, true, "auto")
	opts.Output.add(cmd)
	return cmd
}

// scenarioFiles expands the arguments: files, or folders of *.yaml/*.yml.
func scenarioFiles(args []string) ([]string, error) {
	var out []string
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil {
			return nil, fmt.Errorf("cannot read scenario: %w", err)
		}
		if !st.IsDir() {
			out = append(out, a)
			continue
		}
		var m []string
		for _, pat := range []string{"*.yaml", "*.yml", "*.json"} {
			g, _ := filepath.Glob(filepath.Join(a, pat))
			m = append(m, g...)
		}
		if len(m) == 0 {
			return nil, fmt.Errorf("folder %s holds no scenario files (*.yaml, *.yml) or simulate results (*.json)", a)
		}
		sort.Strings(m)
		out = append(out, m...)
	}
	return out, nil
}

func runRank(ctx context.Context, opts *RankOptions) error {
	if opts.Target != 0 && !(opts.Target > 0 && opts.Target < 1) {
		return usagef("--target %g: a failure probability strictly between 0 and 1, e.g. 1e-5", opts.Target)
	}
	files, err := scenarioFiles(opts.File)
	if err != nil {
		return err
	}
	// Every input is read before anything runs: a bad one stops the
	// ranking with nothing run or written. A .json input is a simulate
	// document already run (for example by one task of a job array).
	ss := make([]*scenario.Scenario, len(files))
	done := make([]*report.SimDoc, len(files))
	for i, f := range files {
		if strings.EqualFold(filepath.Ext(f), ".json") {
			if done[i], err = readSimDoc(f); err != nil {
				return err
			}
			continue
		}
		if ss[i], err = scenario.Load(f); err != nil {
			return err
		}
	}
	target := opts.Target
	if !opts.Cmd().Flags().Changed("target") {
		for _, s := range ss {
			if s == nil {
				continue
			}
			if t := s.Study.TargetProbability; t > 0 && (target == 0 || t < target) {
				target = t // the strictest
			}
		}
	}
	var entries []report.RankEntry
	slugs := map[string]int{}
	partial := false
	stage := ""
	if opts.Output.Dir != "" {
		if err := refuseInput(opts.Output.Dir, files); err != nil {
			return err
		}
		if stage, err = os.MkdirTemp(filepath.Dir(filepath.Clean(opts.Output.Dir)), ".rank-staged-"); err != nil {
			return fmt.Errorf("cannot write %s: %w", opts.Output.Dir, err)
		}
		defer os.RemoveAll(stage)
		if err := os.Chmod(stage, 0o755); err != nil {
			return err
		}
	}
	for i, s := range ss {
		if s == nil {
			entries = append(entries, report.RankEntry{Doc: *done[i]})
			partial = partial || done[i].Partial
			continue
		}
		set, err := opts.Run.settings(s)
		if err != nil {
			return err
		}
		sys, err := opts.system(s)
		if err != nil {
			return err
		}
		var done func()
		set.Progress, done = opts.Run.progress(opts.ErrOut, set.Samples, fmt.Sprintf("joint %d/%d", i+1, len(ss)))
		res, runErr := montecarlo.Estimate(ctx, &s.Problem, set)
		done()
		if runErr != nil && !errors.Is(runErr, montecarlo.ErrInterrupted) {
			return fmt.Errorf("%s: %w", files[i], runErr)
		}
		doc := report.Simulation(s, res, report.Run{Samples: set.Samples, Interval: set.Interval}, toolVersion())
		e := report.RankEntry{Doc: doc}
		if stage != "" {
			slug := strings.TrimSuffix(filepath.Base(files[i]), filepath.Ext(files[i]))
			if slugs[slug]++; slugs[slug] > 1 {
				slug = fmt.Sprintf("%s-%d", slug, slugs[slug])
			}
			if err := writeJointReview(stage, slug, s, res, doc, set, sys, &opts.Output); err != nil {
				return fmt.Errorf("%s: %w", files[i], err)
			}
			e.Report = slug + "/report.html"
		}
		entries = append(entries, e)
		if res.Partial {
			partial = true
			break // interrupted: rank what was done
		}
	}
	doc := report.Rank(entries, target, toolVersion())
	if stage != "" {
		if err := report.WriteFile(filepath.Join(stage, "index.html"), func(w io.Writer) error { return report.WriteRankHTML(w, doc) }); err != nil {
			return err
		}
		if err := replaceDir(stage, opts.Output.Dir); err != nil {
			return err
		}
		if !opts.Run.Quiet {
			fmt.Fprintf(opts.ErrOut, "boltrisk: wrote %d joint reports and %s\n", len(entries), filepath.Join(opts.Output.Dir, "index.html"))
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteRank(w, doc) }, func(w io.Writer) error { return report.WriteRankCSV(w, doc) }, partial, files)
}

// writeJointReview writes one joint's review into stage/slug.
func writeJointReview(stage, slug string, s *scenario.Scenario, res *montecarlo.Result, doc report.SimDoc, set montecarlo.Settings, sys units.System, o *outFlags) error {
	var figs []report.Figure
	if res.HasDistributions() {
		var err error
		if figs, err = report.SimulationFigures(s, res, sys, set.Interval); err != nil {
			return err
		}
	}
	ss := []*scenario.Scenario{s}
	rev := report.SimulationReview(s, doc, figs, o.provenance(ss, res.Seed, set.Samples, res.Samples, res.Workers), sys)
	_, err := report.WriteOutputs(filepath.Join(stage, slug), rev, inputFiles(s))
	return err
}

// replaceDir moves the staged folder into place: dir must be absent or an
// earlier ranking (it holds index.html and only folders of reports).
func replaceDir(stage, dir string) error {
	if st, err := os.Stat(dir); err == nil {
		if !st.IsDir() {
			return fmt.Errorf("--out %s is a file, not a folder", dir)
		}
		if _, err := os.Stat(filepath.Join(dir, "index.html")); err != nil {
			ents, _ := os.ReadDir(dir)
			if len(ents) > 0 {
				return fmt.Errorf("refusing to replace %s: it is not an earlier ranking (no index.html) and not empty", dir)
			}
		}
		old := stage + ".old"
		if err := os.Rename(dir, old); err != nil {
			return fmt.Errorf("cannot replace %s: %w", dir, err)
		}
		defer os.RemoveAll(old)
	}
	if err := os.Rename(stage, dir); err != nil {
		return fmt.Errorf("cannot write %s: %w", dir, err)
	}
	return nil
}

// readSimDoc reads a document written by 'simulate --json'.
func readSimDoc(file string) (*report.SimDoc, error) {
	b, err := os.ReadFile(file)
	if err != nil {
		return nil, fmt.Errorf("cannot read result: %w", err)
	}
	var d report.SimDoc
	if err := json.Unmarshal(b, &d); err != nil {
		return nil, fmt.Errorf("%s: not a simulate result (%v); rank takes scenario files (*.yaml) or the JSON of 'simulate --json'", file, err)
	}
	switch {
	case d.Kind != "simulate":
		return nil, fmt.Errorf("%s: a %q document; rank takes scenario files or the JSON of 'simulate --json'", file, d.Kind)
	case d.SchemaVersion != report.SchemaVersion:
		return nil, fmt.Errorf("%s: schema version %d; this boltrisk reads version %d (re-run the joint)", file, d.SchemaVersion, report.SchemaVersion)
	}
	hasAny := false
	for _, m := range d.Modes {
		hasAny = hasAny || m.Key == "any"
	}
	if !hasAny {
		return nil, fmt.Errorf("%s: the result has no any-mode probability", file)
	}
	return &d, nil
}
