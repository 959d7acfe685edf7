package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestREADMESweepWindows runs the sweeps whose windows the README quotes
// (section "Torque windows and tolerances") and checks the quoted values.
func TestREADMESweepWindows(t *testing.T) {
	if testing.Short() {
		t.Skip("two 13-step sweeps with edge bisection")
	}
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Join(strings.Fields(string(readme)), " ")
	for _, c := range []struct {
		target string
		out    []string // in the sweep's output
		quoted string   // in the README
	}{
		{"1e-2", []string{"from 46.09 N*m (bounded by separation)", "to   59.73 N*m (bounded by the joint as a whole"},
			"the window for 10⁻² runs from 46.1 N·m (separation) to 59.7 N·m"},
		{"1e-3", []string{"from 51.72 N*m", "to   53.98 N*m", "from 51.95 N*m", "to   53.79 N*m"},
			"the window for 10⁻³ from 51.7 to 54.0 N·m (52.0 to 53.8 N·m on the upper confidence bounds)"},
	} {
		code, out, errs := runCLI("sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--steps", "13", "--target", c.target, "--quiet")
		if code != 0 {
			t.Fatalf("sweep --target %s: exit %d: %s", c.target, code, errs)
		}
		for _, w := range c.out {
			if !strings.Contains(out, w) {
				t.Errorf("sweep --target %s: %q not in the output:\n%s", c.target, w, out)
			}
		}
		if !strings.Contains(text, c.quoted) {
			t.Errorf("README lacks %q", c.quoted)
		}
	}
}
