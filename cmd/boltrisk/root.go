package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"

	"github.com/spf13/cobra"

	"boltrisk/model/units"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// version is set at link time (-ldflags "-X main.version=…"); otherwise the
// module version from the build information is used.
var version = ""

func toolVersion() string {
	if version != "" {
		return version
	}
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		return bi.Main.Version
	}
	return "0.1.0-dev"
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
  3  interrupted (Ctrl-C): the partial result was written, marked partial`

// usageError marks errors that should print usage.
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func usagef(format string, args ...any) error { return usageError{fmt.Errorf(format, args...)} }

// errPartial is returned after a partial result has been written.
var errPartial = errors.New("interrupted: partial result written")

func run(args []string, stdout, stderr io.Writer) int {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	root := newRootCmd(stdout, stderr)
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
separation, yield in assembly or service, proof load, shear, bearing, tear-out or
slip — from the scatter in torque, friction, strengths and loads, and helps choose
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
		newCatalogCmd(stdout),
		newExampleCmd(stdout),
	)
	return root
}

// loadScenario reads FILE or the built-in example named by --example.
func loadScenario(args []string, example string) (*scenario.Scenario, error) {
	switch {
	case len(args) == 1 && example != "":
		return nil, usagef("give a scenario FILE or --example NAME, not both")
	case len(args) == 1:
		return scenario.Load(args[0])
	case example != "":
		return scenario.Example(example)
	}
	return nil, usagef("a scenario FILE is required (or --example NAME; built-in examples: %v)", scenario.Examples())
}

// common holds what every analysis command shares: its writers, the
// scenario source and the output format flags.
type common struct {
	Out, ErrOut io.Writer
	File        []string
	Example     string
	JSON        bool
	Units       string
	UnitsOn     bool
}

func (c *common) addFlags(cmd *cobra.Command) {
	cmd.Flags().StringVar(&c.Example, "example", "", "use a built-in example scenario instead of FILE (see 'boltrisk example')")
	cmd.Flags().BoolVar(&c.JSON, "json", false, "write the result as JSON (SI units, schema in README)")
	cmd.Flags().StringVar(&c.Units, "units", "si", "units of the text report: si or us (default: the scenario's)")
}

// bind records the arguments and which flags were set; call it in RunE.
func (c *common) bind(cmd *cobra.Command, args []string) {
	c.File = args
	c.UnitsOn = cmd.Flags().Changed("units")
}

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

// finish writes the document as JSON (--json) or as text, then reports a
// partial run so that the exit status says so.
func (c *common) finish(doc any, text func(io.Writer), partial bool) error {
	if c.JSON {
		if err := report.WriteJSON(c.Out, doc); err != nil {
			return err
		}
	} else {
		text(c.Out)
	}
	if partial {
		return errPartial
	}
	return nil
}

// scenario loads FILE or --example and resolves the display units.
func (c *common) scenario() (*scenario.Scenario, units.System, error) {
	s, err := loadScenario(c.File, c.Example)
	if err != nil {
		return nil, 0, err
	}
	sys, err := c.system(s)
	return s, sys, err
}
