package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo/scenario"
)

func newExampleCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "example [NAME]",
		Short: "List the built-in example scenarios or print one as a starting point",
		Args:  cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				for _, n := range scenario.Examples() {
					fmt.Fprintln(stdout, n)
				}
				return nil
			}
			b, err := scenario.ExampleSource(args[0])
			if err != nil {
				return usagef("no built-in example %q (available: %v)", args[0], scenario.Examples())
			}
			_, err = stdout.Write(b)
			return err
		},
	}
}
