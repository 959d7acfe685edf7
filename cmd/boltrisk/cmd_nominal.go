package main

import (
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo/report"
)

// NominalOptions are the options of `boltrisk nominal`.
type NominalOptions struct {
	Out     io.Writer
	File    []string
	Example string
	JSON    bool
	Units   string
	UnitsOn bool
}

func newNominalCmd(stdout io.Writer, runF func(*NominalOptions) error) *cobra.Command {
	opts := &NominalOptions{Out: stdout}
	cmd := &cobra.Command{
		Use:   "nominal [FILE]",
		Short: "Deterministic check of a joint at its nominal inputs",
		Long: `Evaluate the joint described in FILE at the nominal value (the mean) of every
input: stiffnesses, joint constant, preload and its window, and the demand,
capacity and safety factor of every failure mode.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk nominal testdata/examples/cover-flange.yaml
  boltrisk nominal --example us-flange --units si --json`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.File = args
			opts.UnitsOn = cmd.Flags().Changed("units")
			if runF != nil {
				return runF(opts)
			}
			return runNominal(opts)
		},
	}
	cmd.Flags().StringVar(&opts.Example, "example", "", "use a built-in example scenario instead of FILE")
	cmd.Flags().BoolVar(&opts.JSON, "json", false, "write the result as JSON (SI units, schema in README)")
	cmd.Flags().StringVar(&opts.Units, "units", "si", "units of the text report: si or us (default: the scenario's)")
	return cmd
}

func runNominal(opts *NominalOptions) error {
	s, err := loadScenario(opts.File, opts.Example)
	if err != nil {
		return err
	}
	sys, err := parseUnits(opts.Units, s, opts.UnitsOn)
	if err != nil {
		return err
	}
	doc := report.Nominal(s, toolVersion())
	if opts.JSON {
		return report.WriteJSON(opts.Out, doc)
	}
	report.WriteNominal(opts.Out, s, doc, sys)
	return nil
}
