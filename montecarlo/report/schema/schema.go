// Package schema holds the JSON Schemas of the scenario file and of every
// JSON document the tool writes, generated from the Go types by
// 'go generate ./montecarlo/report' and checked in.
package schema

import (
	"embed"
	"fmt"
	"sort"
	"strings"
)

//go:embed *.schema.json
var files embed.FS

// Names lists the schemas: scenario and the document kinds.
func Names() []string {
	ents, _ := files.ReadDir(".")
	var out []string
	for _, e := range ents {
		out = append(out, strings.TrimSuffix(e.Name(), ".schema.json"))
	}
	sort.Strings(out)
	return out
}

// Get returns the schema of a name.
func Get(name string) ([]byte, error) {
	b, err := files.ReadFile(name + ".schema.json")
	if err != nil {
		return nil, fmt.Errorf("no schema %q (allowed: %s)", name, strings.Join(Names(), ", "))
	}
	return b, nil
}
