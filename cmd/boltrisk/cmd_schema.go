package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo/report/schema"
)

func newSchemaCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "schema [NAME]",
		Short: "Print the JSON Schema of the scenario file or of a JSON document",
		Long: `Print the JSON Schema (draft 2020-12) of the scenario file or of the JSON a
command writes with --json (NAME: ` + strings.Join(schema.Names(), ", ") + `). Without a name, list the schemas. The example
scenario files carry the line that YAML editors read to use the scenario schema:
  # yaml-language-server: $schema=<path or URL of scenario.schema.json>`,
		Args:      cobra.MaximumNArgs(1),
		ValidArgs: schema.Names(),
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				for _, n := range schema.Names() {
					fmt.Fprintln(stdout, n)
				}
				return nil
			}
			b, err := schema.Get(args[0])
			if err != nil {
				return usageError{err}
			}
			_, err = stdout.Write(b)
			return err
		},
	}
}
