package scenario

import (
	"embed"
	"fmt"
	"path"
	"sort"
	"strings"
)

// The built-in examples, also reachable as testdata/examples/ from the
// repository root.
//
//go:embed examples/*.yaml
var examples embed.FS

// Examples lists the names of the built-in example scenarios.
func Examples() []string {
	ents, _ := examples.ReadDir("examples")
	var out []string
	for _, e := range ents {
		out = append(out, strings.TrimSuffix(e.Name(), ".yaml"))
	}
	sort.Strings(out)
	return out
}

// Example loads a built-in example scenario by name.
func Example(name string) (*Scenario, error) {
	data, err := examples.ReadFile(path.Join("examples", name+".yaml"))
	if err != nil {
		return nil, fmt.Errorf("no built-in example %q (available: %s)", name, strings.Join(Examples(), ", "))
	}
	s, err := Parse("example:"+name, data)
	if err != nil {
		return nil, err
	}
	s.File = ""
	return s, nil
}

// ExampleSource returns the YAML text of a built-in example.
func ExampleSource(name string) ([]byte, error) {
	return examples.ReadFile(path.Join("examples", name+".yaml"))
}
