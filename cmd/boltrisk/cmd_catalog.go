package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo/report"
)

func newCatalogCmd(stdout io.Writer) *cobra.Command {
	var asJSON bool
	var csvOut string
	cmd := &cobra.Command{
		Use:   "catalog [threads|classes|materials|conditions|tools|inputs|modes]",
		Short: "Print the built-in tables: threads, property classes, materials, presets, inputs, modes",
		Long: `Print the built-in catalogues with their sources. Without a topic, list the topics.
Any catalogue value can be overridden in a scenario by giving it explicitly.`,
		Args:      cobra.MaximumNArgs(1),
		ValidArgs: report.CatalogTopics,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				fmt.Fprintln(stdout, "topics:", report.CatalogTopics)
				return nil
			}
			t, err := report.Catalog(args[0])
			if err != nil {
				return usageError{err}
			}
			switch {
			case csvOut == "-":
				return report.WriteRowsCSV(stdout, t.Header, t.Rows)
			case csvOut != "":
				if err := report.WriteFile(csvOut, func(w io.Writer) error { return report.WriteRowsCSV(w, t.Header, t.Rows) }); err != nil {
					return err
				}
			}
			if asJSON {
				return report.WriteJSON(stdout, struct {
					Topic string              `json:"topic"`
					Rows  []map[string]string `json:"rows"`
					Note  string              `json:"note,omitempty"`
				}{t.Topic, t.Objects(), t.Note})
			}
			if csvOut == "" {
				t.WriteText(stdout)
			}
			return nil
		},
	}
	cmd.Flags().BoolVar(&asJSON, "json", false, "write the table as JSON (an array of objects keyed by the column names)")
	cmd.Flags().StringVar(&csvOut, "csv", "", "write the table as CSV into this file (- for standard output)")
	return cmd
}
