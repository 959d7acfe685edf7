package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// version is set at link time (-ldflags "-X main.version=…"); otherwise the
// module version and VCS revision from the build information are used.
var version = ""

func toolVersion() string {
	if version != "" {
		return version
	}
	v := "0.2.0-dev"
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return v
	}
	if bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		v = bi.Main.Version
	}
	var rev, at, dirty string
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.time":
			at = s.Value
		case "vcs.modified":
			if s.Value == "true" {
				dirty = "+modified"
			}
		}
	}
	if rev != "" {
		v += fmt.Sprintf(" (revision %.12s%s, %s)", rev, dirty, at)
	}
	return v
}

// Exit codes.
const (
	exitOK      = 0
	exitError   = 1 // bad input or failure
	exitUsage   = 2 // bad flags or arguments
	exitPartial = 3 // interrupted: a partial result was written
)

const exitCodesHelp = `
Exit status:
  0  success
  1  invalid scenario or other error (nothing is written)
  2  invalid flags or arguments
  3  interrupted (Ctrl-C, SIGTERM, SIGHUP): the partial result was written, marked partial`

// usageError marks errors that should print usage.
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func usagef(format string, args ...any) error { return usageError{fmt.Errorf(format, args...)} }

// errPartial is returned after a partial result has been written.
var errPartial = errors.New("interrupted: partial result written")

// stopSignals end a run like Ctrl-C: a scheduler's stop, `timeout`, a
// closed terminal.
var stopSignals = []os.Signal{os.Interrupt, syscall.SIGTERM, syscall.SIGHUP}

func run(args []string, stdout, stderr io.Writer) int {
	return runIn(os.Stdin, args, stdout, stderr)
}

func runIn(stdin io.Reader, args []string, stdout, stderr io.Writer) int {
	ctx, stop := signal.NotifyContext(context.Background(), stopSignals...)
	defer stop()
	root := newRootCmd(stdout, stderr)
	root.SetIn(stdin)
	root.SetArgs(args)
	err := root.ExecuteContext(ctx)
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, errPartial):
		fmt.Fprintln(stderr, "boltrisk:", err)
		return exitPartial
	}
	fmt.Fprintln(stderr, "boltrisk: error:", err)
	var ue usageError
	if errors.As(err, &ue) {
		fmt.Fprintln(stderr, "Run 'boltrisk --help' for usage.")
		return exitUsage
	}
	return exitError
}

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "boltrisk",
		Short: "Failure probabilities of preloaded bolted joints",
		Long: `boltrisk estimates how likely a preloaded bolted joint is to fail — by fatigue,
separation, yield in assembly or service, proof load, thread stripping, surface
pressure, shear, bearing, net section, tear-out, block tearing or slip — from the scatter in torque, friction, strengths and loads, and helps choose
the torque, tolerance and lubrication that make it safe.

` + report.Caution,
		Version:       toolVersion(),
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error { return usageError{err} })
	root.AddCommand(
		newNominalCmd(stdout, nil),
		newSimulateCmd(stdout, stderr, nil),
		newSweepCmd(stdout, stderr, nil),
		newCompareCmd(stdout, stderr, nil),
		newSpecCmd(stdout, stderr, nil),
		newDriversCmd(stdout, stderr, nil),
		newLifeCmd(stdout, stderr, nil),
		newCatalogCmd(stdout),
		newExampleCmd(stdout),
		newSchemaCmd(stdout),
		newFitCmd(stdout, stderr, nil),
		newMergeCmd(stdout, stderr), newClusterScriptCmd(stdout), newRankCmd(stdout, stderr),
	)
	return root
}

// loadScenario reads FILE ("-" for standard input) or the built-in example
// named by --example.
func loadScenario(cmd *cobra.Command, args []string, example string) (*scenario.Scenario, error) {
	switch {
	case len(args) == 1 && example != "":
		return nil, usagef("give a scenario FILE or --example NAME, not both")
	case len(args) == 1 && args[0] == "-":
		data, err := io.ReadAll(cmd.InOrStdin())
		if err != nil {
			return nil, fmt.Errorf("cannot read the scenario from standard input: %w", err)
		}
		return scenario.Parse("(standard input)", data)
	case len(args) == 1:
		return scenario.Load(args[0])
	case example != "":
		return scenario.Example(example)
	}
	return nil, usagef("a scenario FILE is required (- reads standard input; or --example NAME; built-in examples: %v)", scenario.Examples())
}

// common holds what every analysis command shares: its writers, the
// scenario source and the output format flags.
type common struct {
	Out, ErrOut io.Writer
	File        []string
	Example     string
	JSON        bool
	CSV         string
	Units       string
	UnitsOn     bool
	cmd         *cobra.Command
}

func (c *common) addFlags(cmd *cobra.Command, csv bool) {
	cmd.Flags().StringVar(&c.Example, "example", "", "use a built-in example scenario instead of FILE (see 'boltrisk example')")
	cmd.Flags().BoolVar(&c.JSON, "json", false, "write the result as JSON (SI units; 'boltrisk schema' prints its JSON Schema)")
	if csv {
		cmd.Flags().StringVar(&c.CSV, "csv", "", "also write the result table as CSV into this file (- for standard output, instead of the report)")
	}
	cmd.Flags().StringVar(&c.Units, "units", "", "units of the text report: si or us (default: the scenario's units)")
}

// bind records the arguments and which flags were set; call it in RunE.
func (c *common) bind(cmd *cobra.Command, args []string) {
	c.File = args
	c.UnitsOn = cmd.Flags().Changed("units")
	c.cmd = cmd
}

// Cmd returns the command being run.
func (c *common) Cmd() *cobra.Command { return c.cmd }

// system returns the display units: --units if given, else the scenario's.
func (c *common) system(sc *scenario.Scenario) (units.System, error) {
	if !c.UnitsOn {
		return sc.Units, nil
	}
	sys, err := units.ParseSystem(c.Units)
	if err != nil {
		return 0, usagef("--units: %v", err)
	}
	return sys, nil
}

// finish writes the document as JSON (--json) or as text, and the CSV table
// (--csv), then reports a partial run so that the exit status says so.
func (c *common) finish(doc any, text func(io.Writer), table func(io.Writer) error, partial bool, inputs []string) error {
	if c.CSV != "" {
		if c.CSV == "-" {
			if err := table(c.Out); err != nil {
				return err
			}
			return partialErr(partial)
		}
		if err := refuseInput(c.CSV, inputs); err != nil {
			return err
		}
		if err := report.WriteFile(c.CSV, table); err != nil {
			return err
		}
	}
	if c.JSON {
		if err := report.WriteJSON(c.Out, doc); err != nil {
			return err
		}
	} else {
		text(c.Out)
	}
	return partialErr(partial)
}

func partialErr(partial bool) error {
	if partial {
		return errPartial
	}
	return nil
}

// refuseInput refuses to write over an input file.
func refuseInput(path string, inputs []string) error {
	st, err := os.Stat(path)
	if err != nil {
		return nil
	}
	for _, in := range inputs {
		if ist, err := os.Stat(in); err == nil && os.SameFile(st, ist) {
			return fmt.Errorf("refusing to write %s: it is the input file %s", path, in)
		}
	}
	return nil
}

// scenario loads FILE or --example and resolves the display units.
func (c *common) scenario() (*scenario.Scenario, units.System, error) {
	s, err := loadScenario(c.cmd, c.File, c.Example)
	if err != nil {
		return nil, 0, err
	}
	sys, err := c.system(s)
	return s, sys, err
}

// inputFiles lists the scenario files of a run (never written to).
func inputFiles(ss ...*scenario.Scenario) []string {
	var out []string
	for _, s := range ss {
		if s.File != "" && s.File != "(standard input)" {
			out = append(out, s.File)
		}
	}
	return out
}
