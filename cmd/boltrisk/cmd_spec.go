package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// DefaultExpand is how often spec (and compare --retune) widen the default
// range, 0.5 … 1.5 × the file's setting, when the window reaches its end.
const DefaultExpand = 3

// SpecOptions are the options of `boltrisk spec`.
type SpecOptions struct {
	common
	Target float64
	Range  string
	Steps  int
	Tools  string
	Run    runFlags
	Output outFlags
}

func newSpecCmd(stdout, stderr io.Writer, runF func(context.Context, *SpecOptions) error) *cobra.Command {
	opts := &SpecOptions{common: common{Out: stdout, ErrOut: stderr}}
	cmd := &cobra.Command{
		Use:   "spec [FILE] --target P",
		Short: "The torque (or preload) and tolerance to print on the drawing for a target",
		Long: `Answer "what do I print on the drawing": the nominal torque — or, for a
preload-controlled method (angle, tensioner, ultrasonic), the nominal preload —
and the widest tolerance band (±3σ of the tightening scatter, the coverage of
the tool presets) for which every failure mode, and all of them together, stay
at or below the target probability P on the upper confidence bound.

It sweeps the nominal setting over --range at the file's scatter and bisects
the window's edges (the same random streams at every run: common random
numbers), takes the geometric middle of the upper-bound window as the nominal,
and bisects the widest tolerance there. It names the governing mode at each
edge, the least precise tool among the candidates (--tools; default every
preset controlling the same quantity) that holds the tolerance, and prints one
line for the drawing. When no setting meets the target it says which modes make
it impossible and by how much, and sweeps the presets (other assembly
conditions, tools, stronger bolt classes) to show which change helps most.

For small targets use --method importance (or subset, or auto) with the
rare-event estimators.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk spec --example cover-flange --target 1e-3
  boltrisk spec joint.yaml --target 1e-4 --range 30..70N*m --tools torque-wrench,power-tool
  boltrisk spec joint.yaml --target 1e-6 --method importance`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(cmd.Context(), opts)
			}
			return runSpec(cmd.Context(), opts)
		},
	}
	fl := cmd.Flags()
	opts.addFlags(cmd, false)
	fl.Float64Var(&opts.Target, "target", 0, "target failure probability in (0, 1) (default: the scenario's study.target_probability)")
	fl.StringVar(&opts.Range, "range", "", "range of the nominal setting searched, LO..HI[UNIT] (default: 0.5 … 1.5 × the file's, widened up to 3 times when the window reaches an end)")
	fl.IntVar(&opts.Steps, "steps", 9, "grid values before bisection, 3 … 101")
	fl.StringVar(&opts.Tools, "tools", "", "comma-separated candidate tools for the callout (default: every preset controlling the same quantity; see 'boltrisk catalog tools')")
	opts.Run.add(cmd, false, "crude")
	opts.Output.add(cmd)
	return cmd
}

func runSpec(ctx context.Context, opts *SpecOptions) error {
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
	if !(target > 0 && target < 1) {
		return usagef("--target %g: a failure probability strictly between 0 and 1 is required, e.g. 1e-4 (or study.target_probability in the file)", target)
	}
	in := s.Inputs()
	path, controls := "tightening.torque", "torque"
	if in.Method == model.DirectPreload {
		path, controls = "tightening.preload", "preload"
	}
	var names []string
	if strings.TrimSpace(opts.Tools) != "" {
		names = strings.Split(opts.Tools, ",")
	}
	tools, err := scenario.ToolsControlling(controls, in.Tensioned, names)
	if err != nil {
		return usagef("--tools %q: %v", opts.Tools, err)
	}
	nom := *scenario.FieldPtr(in, path)
	o := decide.SpecOptions{Target: target, Path: path, Field: scenario.FieldPtrFunc(path), Lo: 0.5 * nom, Hi: 1.5 * nom, Steps: opts.Steps, Settings: set, Expand: DefaultExpand}
	if opts.Range != "" {
		v, err := parseVary(path+"="+opts.Range, s, 2)
		if err != nil {
			return usagef("--range %q: %v", opts.Range, strings.TrimPrefix(err.Error(), "--vary "+fmt.Sprintf("%q", path+"="+opts.Range)+": "))
		}
		if !(v.Lo > 0) {
			return usagef("--range %q: the lower end must be > 0", opts.Range)
		}
		o.Lo, o.Hi, o.Expand = v.Lo, v.Hi, 0
	}
	if opts.Steps < 3 || opts.Steps > 101 {
		return usagef("--steps %d: from 3 to 101", opts.Steps)
	}
	if _, ok := s.Uncertain(path); !ok {
		return fmt.Errorf("%s has no scatter: set tightening.tool (see 'boltrisk catalog tools') or give it a distribution, so that the tolerance band has a shape", path)
	}
	for _, t := range tools {
		o.Tools = append(o.Tools, decide.ToolChoice{Name: t.Name, Tolerance: t.Tolerance})
	}
	for _, c := range s.PresetChanges() {
		alt, err := s.Alternative(c.Label, map[string]string{c.Path: c.Value})
		if err != nil {
			continue // a preset that does not fit this joint (size range, method) is no suggestion
		}
		o.Alternatives = append(o.Alternatives, decide.Alternative{Label: c.Label, Problem: &alt.Problem})
	}
	sp, err := decide.RunSpec(ctx, &s.Problem, o)
	if err != nil {
		if errors.Is(err, montecarlo.ErrInterrupted) {
			return errors.New("interrupted: the callout needs all its runs; nothing was written")
		}
		return err
	}
	dim := scenario.FieldDim(path)
	if sp.RangeLo || sp.RangeHi {
		end, at := "lower", o.Lo
		if sp.RangeHi {
			end, at = "upper", o.Hi
		}
		return usagef("--range %s … %s cannot hold the window: the settings meeting the target reach its %s end (%s); widen --range beyond it",
			sys.Format(o.Lo, dim), sys.Format(o.Hi, dim), end, sys.Format(at, dim))
	}
	doc := report.Spec(s, sp, toolVersion())
	if sys != units.SI && doc.Callout != nil {
		doc.Callout.Line = report.CalloutLine(doc, s.ConditionName, sys)
	}
	if opts.Output.Dir != "" {
		ss := []*scenario.Scenario{s}
		rev := report.SpecReview(s, doc, opts.Output.provenance(ss, set.Seed, set.Samples, set.Samples, sp.Settings.Workers), sys)
		rev.Appendices = append(rev.Appendices, report.ScenarioAppendix(s))
		if err := opts.Output.write(rev, ss, opts.ErrOut, opts.Run.Quiet); err != nil {
			return err
		}
	}
	return opts.finish(doc, func(w io.Writer) { report.WriteSpec(w, s, doc, sys) }, nil, false, inputFiles(s))
}
