package report

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzDecodePart feeds arbitrary bytes to the part-file reader (a merge
// reads files that crossed a cluster's shared storage): it must return an
// error or a document whose states and scenario rebuild, never panic.
// Seeds: the hostile part corpus of testdata/bad/parts.
func FuzzDecodePart(f *testing.F) {
	seeds, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "parts", "*.json"))
	for _, p := range seeds {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(`{"kind":"part"}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := DecodePart("fuzz.json", data)
		if err != nil {
			if d != nil {
				t.Fatal("document returned together with an error")
			}
			return
		}
		if _, err := d.States(); err != nil {
			return
		}
		_, _ = d.ScenarioOf()
	})
}
