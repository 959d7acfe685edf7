package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"math"
	"os"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
	"boltrisk/montecarlo/report"
)

// FitOptions are the options of `boltrisk fit`.
type FitOptions struct {
	Out, ErrOut io.Writer
	File        string
	Column      string
	Unit        string
	Families    []string
	Lower       string
	Upper       string
	Bootstrap   int
	Seed        uint64
	Confidence  float64
	Workers     int
	JSON        bool
	Dir         string
	Quiet       bool
	Now         func() time.Time
}

func newFitCmd(stdout, stderr io.Writer, runF func(*FitOptions) error) *cobra.Command {
	opts := &FitOptions{Out: stdout, ErrOut: stderr, Now: time.Now}
	cmd := &cobra.Command{
		Use:   "fit FILE.csv --column NAME",
		Short: "Fit the scatter of your own test results (nut factor, friction, preload, strength)",
		Long: `Read one column of a CSV file with a header row — torque–tension tests
(ISO 16047), ultrasonic preload audits, strength or fatigue tests of your batch —
and fit normal, lognormal, two-parameter Weibull, uniform and triangular laws
(truncated normal too with --lower/--upper) by maximum likelihood (uniform and
triangular by their usual estimators). The fits are ranked by AIC, with BIC and
Akaike weights beside; each is tested by Anderson–Darling and Kolmogorov–Smirnov
with p-values from a parametric bootstrap (each replicate drawn from the fitted
law and refitted, so that the p-values allow for the estimated parameters;
--bootstrap replicates, --seed), and the same replicates give intervals of the
parameters, the mean and the c.o.v. For normal and lognormal data the posterior
predictive (Student t with n − 1 degrees of freedom, on ln X for lognormal) is
shown beside the plug-in fit: it carries the uncertainty of a small series.

Cells are numbers in --unit, or carry their own unit ("31.2 kN"); blank cells
are skipped and listed; separators comma, semicolon or tab (decimal commas with
semicolons). The output ends with the scenario input to paste, and the data
reference {data: FILE, column: NAME, family: F, predictive: true} that fits the
file when a scenario loads. --out DIR writes a probability plot per family
(data against the fit on probability paper, with the fitted line and band),
report.md and report.html. Fewer than 10 values draw a warning.

` + report.FitCaution + "\n" + exitCodesHelp,
		Example: `  boltrisk fit tests/torque-tension.csv --column K
  boltrisk fit audit.csv --column preload --unit kN --family normal,lognormal --json
  boltrisk fit audit.csv --column preload --unit kN --family truncnormal --lower 20kN
  boltrisk fit lives.csv --column cycles --out fit-review --seed 7`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.File = args[0]
			if runF != nil {
				return runF(opts)
			}
			return runFit(opts)
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.Column, "column", "", "header of the column to fit (required)")
	f.StringVar(&opts.Unit, "unit", "", "unit of bare numbers in the column, e.g. kN, N*m, MPa, % (plain numbers when not given)")
	f.StringSliceVar(&opts.Families, "family", nil, "families to fit, comma-separated: normal, lognormal, weibull, truncnormal, uniform, triangular (default: all that the data admit)")
	f.StringVar(&opts.Lower, "lower", "", "lower bound of a truncated normal fit (a value in --unit, or with its unit)")
	f.StringVar(&opts.Upper, "upper", "", "upper bound of a truncated normal fit")
	f.IntVar(&opts.Bootstrap, "bootstrap", 0, "parametric-bootstrap replicates per family (default 999; none above 10000 values unless given; -1: none)")
	f.Uint64Var(&opts.Seed, "seed", 1, "seed of the bootstrap streams")
	f.Float64Var(&opts.Confidence, "confidence", fit.DefaultConfidence, "two-sided level of the intervals")
	f.IntVar(&opts.Workers, "workers", 0, "bootstrap workers (0: all CPUs; results do not depend on it)")
	f.BoolVar(&opts.JSON, "json", false, "write the result as JSON ('boltrisk schema fit' prints its JSON Schema)")
	f.StringVar(&opts.Dir, "out", "", "write the probability plots (PNG), report.md and report.html into this folder (created, or replaced as a whole at the end)")
	f.BoolVar(&opts.Quiet, "quiet", false, "no progress on stderr")
	return cmd
}

func runFit(o *FitOptions) error {
	if strings.TrimSpace(o.Column) == "" {
		return usagef("--column NAME is required: the header of the column to fit")
	}
	var fams []montecarlo.Kind
	for _, name := range o.Families {
		name = strings.ToLower(strings.TrimSpace(name))
		k, err := montecarlo.ParseKind(name)
		if err != nil || !isFitFamily(k) {
			return usagef("--family %q: allowed: normal, lognormal, weibull, truncnormal, uniform, triangular", name)
		}
		fams = append(fams, k)
	}
	if !(o.Confidence > 0 && o.Confidence < 1) {
		return usagef("--confidence %g: must lie between 0 and 1, e.g. 0.90", o.Confidence)
	}
	raw, err := os.ReadFile(o.File)
	if err != nil {
		return fmt.Errorf("cannot read the data file: %w", err)
	}
	sum := sha256.Sum256(raw)
	progress := o.rowProgress(int64(len(raw)))
	col, err := fit.ReadColumn(bytes.NewReader(raw), fit.Spec{File: o.File, Column: o.Column, Unit: o.Unit, Progress: progress})
	if err != nil {
		return err
	}
	var bounds *fit.Bounds
	if o.Lower != "" || o.Upper != "" {
		bounds = &fit.Bounds{Lower: math.Inf(-1), Upper: math.Inf(1)}
		for _, b := range []struct {
			flag, text string
			dst        *float64
		}{{"--lower", o.Lower, &bounds.Lower}, {"--upper", o.Upper, &bounds.Upper}} {
			if b.text == "" {
				continue
			}
			v, err := parseBound(b.text, col)
			if err != nil {
				return usagef("%s %q: %v", b.flag, b.text, err)
			}
			*b.dst = v
		}
	}
	for _, k := range fams {
		if err := col.CheckFamily(k); err != nil {
			return err
		}
	}
	opt := fit.Options{Families: fams, Bounds: bounds, Bootstrap: o.Bootstrap, Seed: o.Seed, Confidence: o.Confidence, Workers: o.Workers}
	if o.Bootstrap < 0 {
		opt.Bootstrap = -1
	}
	var done func()
	opt.Progress, done = o.bootProgress()
	res, err := fit.Analyze(col.Values, opt)
	done()
	if err != nil {
		return fmt.Errorf("%s, column %q: %s", o.File, col.Name, strings.TrimPrefix(err.Error(), "fit: "))
	}
	a := report.FitAnalysis{Column: col, SHA256: hex.EncodeToString(sum[:]), Result: res}
	for _, k := range []montecarlo.Kind{montecarlo.Normal, montecarlo.LogNormal} {
		if res.Candidate(k) == nil || col.CheckPredictive(k) != nil {
			continue
		}
		p, err := fit.NewPredictive(k, col.Values)
		if err != nil {
			return err
		}
		a.Predictives = append(a.Predictives, p)
	}
	doc := report.Fit(a, toolVersion())
	if o.Dir != "" {
		for _, c := range res.Candidates {
			pp, err := fit.Probability(col.Values, c.Dist, o.Confidence, col.Quantity)
			if err != nil {
				return err
			}
			a.Plots = append(a.Plots, pp)
		}
		figs, err := report.FitFigures(a)
		if err != nil {
			return err
		}
		prov := [][2]string{{"tool", "boltrisk " + toolVersion()}, {"command", "boltrisk " + strings.Join(os.Args[1:], " ")},
			{"seed", fmt.Sprint(o.Seed)}, {"date", o.Now().UTC().Format(time.RFC3339)}}
		files, err := report.WriteOutputs(o.Dir, report.FitReview(doc, figs, prov), []string{o.File})
		if err != nil {
			return err
		}
		if !o.Quiet {
			fmt.Fprintf(o.ErrOut, "boltrisk: wrote %d files to %s (open report.html)\n", len(files), o.Dir)
		}
	}
	if o.JSON {
		return report.WriteJSON(o.Out, doc)
	}
	report.WriteFit(o.Out, doc)
	return nil
}

func isFitFamily(k montecarlo.Kind) bool {
	switch k {
	case montecarlo.Normal, montecarlo.LogNormal, montecarlo.Weibull, montecarlo.TruncNormal, montecarlo.Uniform, montecarlo.Triangular:
		return true
	}
	return false
}

// parseBound reads a truncation bound: a bare number in the column's unit,
// or a value with its unit of the column's dimension.
func parseBound(s string, col *fit.Column) (float64, error) {
	if v, err := units.ParseNumber(s); err == nil {
		scale := col.Scale
		if scale == 0 {
			scale = 1
		}
		return v * scale, nil
	}
	if col.Dim == units.None {
		return 0, fmt.Errorf("expected a plain number (the column holds plain numbers)")
	}
	return units.Parse(s, col.Dim)
}

// rowProgress reports reading progress of large files on a terminal.
func (o *FitOptions) rowProgress(size int64) func(int, int64) {
	rf := runFlags{Quiet: o.Quiet}
	f, done := rf.progress(o.ErrOut, size, "reading")
	if f == nil {
		return nil
	}
	return func(rows int, n int64) {
		f(n, size)
		if n >= size {
			done()
		}
	}
}

// bootProgress reports bootstrap progress on a terminal.
func (o *FitOptions) bootProgress() (func(done, total int), func()) {
	rf := runFlags{Quiet: o.Quiet}
	var f func(int64, int64)
	var end func()
	started := false
	return func(done, total int) {
			if !started {
				started = true
				f, end = rf.progress(o.ErrOut, 2_000_000, "bootstrap")
			}
			if f != nil && total > 0 {
				f(int64(done)*2_000_000/int64(total), 2_000_000)
			}
		}, func() {
			if end != nil {
				end()
			}
		}
}
