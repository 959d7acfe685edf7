package main

import (
	"io"

	"github.com/spf13/cobra"

	"boltrisk/model"
	"boltrisk/montecarlo/report"
)

// NominalOptions are the options of `boltrisk nominal`.
type NominalOptions struct {
	common
}

func newNominalCmd(stdout io.Writer, runF func(*NominalOptions) error) *cobra.Command {
	opts := &NominalOptions{common: common{Out: stdout}}
	cmd := &cobra.Command{
		Use:   "nominal [FILE|-]",
		Short: "Deterministic check of a joint at its nominal inputs",
		Long: `Evaluate the joint described in FILE at the nominal value (the mean) of every
input: stiffnesses, joint constant, preload and its window, and the demand,
capacity and safety factor of every failure mode.

` + report.Caution + "\n" + exitCodesHelp,
		Example: `  boltrisk nominal testdata/examples/cover-flange.yaml
  boltrisk nominal --example us-flange --units si --json`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.bind(cmd, args)
			if runF != nil {
				return runF(opts)
			}
			return runNominal(opts)
		},
	}
	opts.addFlags(cmd, false)
	return cmd
}

func runNominal(opts *NominalOptions) error {
	s, sys, err := opts.scenario()
	if err != nil {
		return err
	}
	doc := report.Nominal(s, model.EvaluateNominal(s.Inputs()), toolVersion())
	return opts.finish(doc, func(w io.Writer) { report.WriteNominal(w, s, doc, sys) }, nil, false, nil)
}
