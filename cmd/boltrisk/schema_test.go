package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"
	"go.yaml.in/yaml/v3"

	"boltrisk/montecarlo/report/schema"
	"boltrisk/montecarlo/scenario"
)

// compile returns the compiled schema of a name.
func compile(t *testing.T, name string) *jsonschema.Schema {
	t.Helper()
	b, err := schema.Get(name)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	url := "boltrisk/" + name + ".schema.json"
	if err := c.AddResource(url, doc); err != nil {
		t.Fatal(err)
	}
	s, err := c.Compile(url)
	if err != nil {
		t.Fatalf("schema %s: %v", name, err)
	}
	return s
}

func validate(t *testing.T, s *jsonschema.Schema, what string, jsonDoc []byte) {
	t.Helper()
	inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(jsonDoc))
	if err != nil {
		t.Fatalf("%s: %v", what, err)
	}
	if err := s.Validate(inst); err != nil {
		t.Errorf("%s does not match its schema: %v", what, err)
	}
}

// TestGoldensMatchSchemas validates every golden JSON document against the
// schema of its kind (santhosh-tekuri/jsonschema, draft 2020-12).
func TestGoldensMatchSchemas(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "golden", "*.json"))
	if len(files) == 0 {
		t.Fatal("no golden JSON files")
	}
	compiled := map[string]*jsonschema.Schema{}
	for _, f := range files {
		b, _ := os.ReadFile(f)
		var env struct{ Kind string }
		if err := json.Unmarshal(b, &env); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		kind := env.Kind
		if kind == "spread-limit" {
			kind = "sweep"
		}
		if compiled[kind] == nil {
			compiled[kind] = compile(t, kind)
		}
		validate(t, compiled[kind], filepath.Base(f), b)
	}
}

// TestExamplesMatchScenarioSchema validates every built-in example against
// the scenario schema, and checks that each carries the editor hint line.
func TestExamplesMatchScenarioSchema(t *testing.T) {
	s := compile(t, "scenario")
	for _, name := range scenario.Examples() {
		src, _ := scenario.ExampleSource(name)
		if !strings.Contains(string(src), "# yaml-language-server: $schema=") {
			t.Errorf("%s lacks the yaml-language-server schema line", name)
		}
		var v any
		if err := yaml.Unmarshal(src, &v); err != nil {
			t.Fatal(err)
		}
		b, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		validate(t, s, "example "+name, b)
	}
	// A misspelt key fails the schema as it fails the loader.
	b, _ := json.Marshal(map[string]any{"bolt": map[string]any{"thread": "M12", "clas": "8.8"}, "members": map[string]any{}, "tightening": map[string]any{}})
	inst, _ := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if s.Validate(inst) == nil {
		t.Error("a misspelt key passed the scenario schema")
	}
}
