package scenario

import (
	"sort"
	"strings"
	"testing"
)

// TestSchemaCoversEveryKey walks the keys the loader accepts and finds each
// in the generated JSON Schema, so a new key cannot be missing from it.
func TestSchemaCoversEveryKey(t *testing.T) {
	root := Schema()
	var sections []string
	for sec := range sectionKeys {
		sections = append(sections, sec)
	}
	sort.Strings(sections)
	for _, sec := range sections {
		node := root
		if sec == "layer" {
			node = prop(t, prop(t, root, "members"), "layers")["items"].(map[string]any)
		} else if sec != "" {
			for _, part := range strings.Split(sec, ".") {
				node = prop(t, node, part)
			}
		}
		for _, k := range sectionKeys[sec] {
			if prop(t, node, k) == nil {
				t.Errorf("scenario schema lacks %s.%s", sec, k)
			}
		}
	}
}

// prop returns the schema of key k in the object schema node, looking
// through a oneOf of a word and a mapping.
func prop(t *testing.T, node map[string]any, k string) map[string]any {
	t.Helper()
	if alts, ok := node["oneOf"].([]any); ok {
		for _, a := range alts {
			if m := a.(map[string]any); m["properties"] != nil {
				node = m
			}
		}
	}
	ps, _ := node["properties"].(map[string]any)
	v, _ := ps[k].(map[string]any)
	return v
}
