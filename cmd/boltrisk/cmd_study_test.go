package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestSimulateGolden(t *testing.T) {
	code, out, errs := runCLI("simulate", "--example", "bracket-shear", "--samples", "20000", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// JSON contract of issue 3.
	for _, k := range []string{"schema_version", "samples", "seed", "partial", "modes"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("simulate JSON lacks %q", k)
		}
	}
	// JSON contract of issue 12: method and evaluations; every mode object,
	// any included, with cov.
	for _, k := range []string{"method", "evaluations"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("simulate JSON lacks %q", k)
		}
	}
	modes := doc["modes"].([]any)
	if last := modes[len(modes)-1].(map[string]any); last["key"] != "any" {
		t.Error("modes does not end with any")
	}
	for _, m := range modes {
		for _, f := range []string{"key", "probability", "cov", "ci_low", "ci_high", "failures", "interval"} {
			if _, ok := m.(map[string]any)[f]; !ok {
				t.Errorf("mode %v lacks %s", m.(map[string]any)["key"], f)
			}
		}
	}
	if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
		t.Error("NaN or Inf in JSON output")
	}
	golden(t, "simulate_bracket-shear.json", []byte(out))
	code, text, _ := runCLI("simulate", "--example", "bracket-shear", "--samples", "20000", "--quiet")
	if code != 0 || !strings.Contains(text, "CAUTION") || !strings.Contains(text, "Slip") {
		t.Errorf("text report: exit %d\n%s", code, text)
	}
}

func TestSweepAndCompareGolden(t *testing.T) {
	code, out, errs := runCLI("sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--steps", "4", "--samples", "20000", "--target", "1e-2", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("sweep: exit %d: %s", code, errs)
	}
	golden(t, "sweep_cover-flange.json", []byte(out))
	code, out, errs = runCLI("compare", "--example", "cover-flange", "--samples", "20000", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("compare: exit %d: %s", code, errs)
	}
	golden(t, "compare_cover-flange.json", []byte(out))
	code, text, _ := runCLI("compare", "--example", "cover-flange", "--samples", "20000", "--quiet")
	if code != 0 || !strings.Contains(text, "verdict") || !strings.Contains(text, "better") {
		t.Errorf("compare text:\n%s", text)
	}
	code, text, _ = runCLI("sweep", "--example", "cover-flange", "--max-scatter", "torque", "--target", "1e-2", "--samples", "20000", "--quiet")
	if code != 0 || !strings.Contains(text, "largest scatter of tightening.torque") {
		t.Errorf("max-scatter: exit %d\n%s", code, text)
	}
}

func TestStudyBadInvocations(t *testing.T) {
	dir := t.TempDir()
	ex, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"))
	a := filepath.Join(dir, "a.yaml")
	os.WriteFile(a, ex, 0o644)
	heavier := filepath.Join(dir, "heavier.yaml")
	os.WriteFile(heavier, []byte(strings.Replace(string(ex), "mean: 16 kN", "mean: 20 kN", 1)), 0o644)
	fewer := filepath.Join(dir, "fewer.yaml")
	os.WriteFile(fewer, []byte(strings.Replace(string(ex), "count: 8", "count: 6", 1)), 0o644)
	broken := filepath.Join(dir, "broken.yaml")
	os.WriteFile(broken, []byte("bolt:\n  thread: M10\n  clas: 8.8\n"), 0o644)
	for _, test := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"sweep", a, "--vary", "torqe=40..70N*m"}, exitUsage, `did you mean "tightening.torque"`},
		{[]string{"sweep", a, "--vary", "torque=70..40N*m"}, exitUsage, "lower end must be below the upper end"},
		{[]string{"sweep", a, "--vary", "torque=40..70N*m", "--steps", "1"}, exitUsage, "steps must lie within 2"},
		{[]string{"sweep", a, "--vary", "torque=40..70"}, exitUsage, "needs a unit of torque"},
		{[]string{"sweep", a, "--vary", "torque=40..70N*m", "--target", "1.5"}, exitUsage, "strictly between 0 and 1"},
		{[]string{"sweep", a, "--vary", "spread:loads.axial_min=0.5..2"}, exitUsage, "is not uncertain"},
		{[]string{"sweep", a}, exitUsage, "--vary is required"},
		{[]string{"sweep", a, "--max-scatter", "torque"}, exitUsage, "needs --target"},
		{[]string{"compare", a, heavier}, exitError, "loads.axial_max differs"},
		{[]string{"compare", a, fewer}, exitError, "bolt.count differs (8 vs 6)"},
		{[]string{"compare", a, broken}, exitError, "broken.yaml:3: bolt.clas"},
		{[]string{"compare"}, exitUsage, "compare needs"},
		{[]string{"simulate", a, "--samples", "0"}, exitUsage, "--samples"},
		{[]string{"simulate", a, "--samples", "1e12"}, exitUsage, "--samples"},
		{[]string{"simulate", a, "--confidence", "1"}, exitUsage, "--confidence"},
		{[]string{"simulate", a, "--precision", "-0.1"}, exitUsage, "--precision"},
		{[]string{"simulate", a, "--target", "0.1"}, exitUsage, "unknown flag: --target"},
		{[]string{"simulate", a, "--interval", "jeffreys"}, exitUsage, "--interval"},
		{[]string{"simulate", a, "--method", "montecarlo"}, exitUsage, "allowed auto, crude, importance, subset"},
		{[]string{"simulate", a, "--method", "subset", "--repeats", "1"}, exitUsage, "--repeats 1: from 2 to 10000"},
		{[]string{"simulate", a, "--modes", "fatique"}, exitUsage, "unknown mode"},
	} {
		code, out, errs := runCLI(test.args...)
		if code != test.code || !strings.Contains(errs, test.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q", test.args[:2], code, errs, test.code, test.want)
		}
		if out != "" {
			t.Errorf("%v: wrote to stdout on error", test.args)
		}
	}
	// The input file is never touched.
	after, _ := os.ReadFile(a)
	if string(after) != string(ex) {
		t.Error("an input file changed")
	}
}
