// Command schemagen writes the JSON Schemas of the documents and of the
// scenario file (report.GenerateSchemas) into ./schema. Run by
// 'go generate' in montecarlo/report.
package main

import (
	"fmt"
	"os"
	"path/filepath"

	"boltrisk/montecarlo/report"
)

func main() {
	schemas, err := report.GenerateSchemas("./")
	if err != nil {
		fmt.Fprintln(os.Stderr, "schemagen:", err)
		os.Exit(1)
	}
	for name, b := range schemas {
		if err := os.WriteFile(filepath.Join("schema", name+".schema.json"), b, 0o644); err != nil {
			fmt.Fprintln(os.Stderr, "schemagen:", err)
			os.Exit(1)
		}
	}
}
