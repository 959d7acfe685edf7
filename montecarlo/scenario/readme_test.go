package scenario

import (
	"os"
	"strings"
	"testing"
)

// TestREADMEAnnotatedExample checks that the README's complete annotated
// example is the built-in cover-flange example, byte for byte, so the
// documented file is the one users print and run.
func TestREADMEAnnotatedExample(t *testing.T) {
	t.Parallel()
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(readme)
	i := strings.Index(text, "Complete annotated example")
	if i < 0 {
		t.Fatal("README has no complete annotated example")
	}
	text = text[i:]
	start := strings.Index(text, "```yaml\n")
	if start < 0 {
		t.Fatal("the annotated example has no yaml block")
	}
	text = text[start+len("```yaml\n"):]
	block := text[:strings.Index(text, "```\n")]
	file, err := examples.ReadFile("examples/cover-flange.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if block != string(file) {
		a, b := strings.Split(block, "\n"), strings.Split(string(file), "\n")
		for j := 0; j < min(len(a), len(b)); j++ {
			if a[j] != b[j] {
				t.Fatalf("README example and examples/cover-flange.yaml differ at line %d:\nREADME: %s\nfile:   %s", j+1, a[j], b[j])
			}
		}
		t.Fatalf("README example has %d lines, examples/cover-flange.yaml %d", len(a), len(b))
	}
}
