package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/golden")

// golden compares got with testdata/golden/name, or rewrites it with -update.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("..", "..", "testdata", "golden", name)
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run 'go test ./cmd/boltrisk -update' to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file; review with 'go test ./cmd/boltrisk -update && git diff'\n--- got ---\n%s", name, firstLines(got, 40))
	}
}

func firstLines(b []byte, n int) string {
	lines := strings.SplitN(string(b), "\n", n+1)
	if len(lines) > n {
		lines = lines[:n]
	}
	return strings.Join(lines, "\n")
}

// runCLI runs the command line and returns exit code, stdout and stderr.
func runCLI(args ...string) (int, string, string) {
	var out, errb bytes.Buffer
	code := run(args, &out, &errb)
	return code, out.String(), errb.String()
}

func TestNominalGolden(t *testing.T) {
	for _, name := range scenario.Examples() {
		code, out, errs := runCLI("nominal", filepath.Join("..", "..", "testdata", "examples", name+".yaml"), "--json")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", name, code, errs)
		}
		var doc map[string]any
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		// JSON contract of issue 2: schema_version, modes keyed by mode keys with
		// safety_factor and margin, joint_constant, preload_N, stiffness keys with units.
		for _, k := range []string{"schema_version", "modes", "joint_constant", "preload_N", "bolt_stiffness_N_per_mm", "member_stiffness_N_per_mm", "caution"} {
			if _, ok := doc[k]; !ok {
				t.Errorf("%s: JSON lacks %q", name, k)
			}
		}
		for _, m := range doc["modes"].([]any) {
			mm := m.(map[string]any)
			for _, f := range []string{"key", "safety_factor", "margin"} {
				if _, ok := mm[f]; !ok {
					t.Errorf("%s: mode %v lacks %s", name, mm["key"], f)
				}
			}
		}
		golden(t, "nominal_"+name+".json", []byte(out))
	}
}

func TestNominalText(t *testing.T) {
	code, out, _ := runCLI("nominal", "--example", "us-flange")
	if code != 0 {
		t.Fatal(out)
	}
	for _, want := range []string{"1/2-13 UNC", "lbf*ft", "ksi", "kip", "CAUTION", "Fatigue", "joint constant C"} {
		if !strings.Contains(out, want) {
			t.Errorf("text report lacks %q", want)
		}
	}
	golden(t, "nominal_us-flange.txt", []byte(out))
	code, out, _ = runCLI("nominal", "--example", "us-flange", "--units", "si")
	if code != 0 || !strings.Contains(out, "N*m") || strings.Contains(out, "lbf*ft") {
		t.Errorf("--units si: want SI units only\n%s", out)
	}
}

func TestBadInvocations(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.yaml")
	os.WriteFile(bad, []byte("bolt:\n  thread: M13\n"), 0o644)
	for _, test := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"nominal"}, exitUsage, "scenario FILE is required"},
		{[]string{"nominal", "--units", "imperial", "--example", "bench-m12"}, exitUsage, "unknown unit system"},
		{[]string{"nominal", bad}, exitError, "bad.yaml:2: bolt.thread = \"M13\""},
		{[]string{"nominal", filepath.Join(dir, "missing.yaml")}, exitError, "cannot read scenario"},
		{[]string{"nominal", "--example", "nope"}, exitError, "no built-in example"},
		{[]string{"nominal", "--bogus"}, exitUsage, "unknown flag"},
		{[]string{"catalog", "bolts"}, exitUsage, "unknown catalogue"},
	} {
		code, out, errs := runCLI(test.args...)
		if code != test.code || !strings.Contains(errs, test.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q", test.args, code, errs, test.code, test.want)
		}
		if out != "" {
			t.Errorf("%v: wrote to stdout on error: %q", test.args, out)
		}
	}
}

func TestHelpOfEveryCommand(t *testing.T) {
	root := newRootCmd(&bytes.Buffer{}, &bytes.Buffer{})
	analysis := map[string]bool{"nominal": true, "simulate": true, "sweep": true, "compare": true}
	for _, c := range root.Commands() {
		var out bytes.Buffer
		code := run([]string{c.Name(), "--help"}, &out, &out)
		if code != 0 {
			t.Errorf("%s --help: exit %d", c.Name(), code)
		}
		if analysis[c.Name()] && !strings.Contains(out.String(), report.Caution[:40]) {
			t.Errorf("%s --help lacks the caution", c.Name())
		}
	}
}

func TestCatalog(t *testing.T) {
	for _, topic := range report.CatalogTopics {
		code, out, _ := runCLI("catalog", topic)
		if code != 0 || len(out) < 100 {
			t.Errorf("catalog %s: exit %d, %d bytes", topic, code, len(out))
		}
	}
	_, out, _ := runCLI("catalog", "threads")
	if !strings.Contains(out, "M12") || !strings.Contains(out, "84.27") {
		t.Error("threads catalogue lacks M12 with As 84.27 mm²")
	}
}

func TestNominalFlags(t *testing.T) {
	var got *NominalOptions
	cmd := newNominalCmd(&bytes.Buffer{}, func(o *NominalOptions) error { got = o; return nil })
	cmd.SetArgs([]string{"x.yaml", "--json", "--units", "us"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if !got.JSON || got.Units != "us" || !got.UnitsOn || len(got.File) != 1 {
		t.Errorf("options %+v", got)
	}
}

func TestLooseJointStillReports(t *testing.T) {
	// Embedding larger than the bolt's stretch leaves no preload: proof has
	// no demand, its safety factor is infinite, and JSON has no infinity.
	dir := t.TempDir()
	f := filepath.Join(dir, "loose.yaml")
	os.WriteFile(f, []byte("bolt: {thread: M12, class: \"8.8\"}\nmembers:\n  layers: [{thickness: 20 mm, material: steel}]\ntightening: {torque: 50 N*m, nut_factor: 0.2, embedding: 2 mm}\n"), 0o644)
	for _, args := range [][]string{{"nominal", f, "--json"}, {"simulate", f, "--json", "--samples", "2000", "--quiet"}} {
		code, out, errs := runCLI(args...)
		if code != 0 || strings.Contains(out, "Inf") || strings.Contains(out, "NaN") {
			t.Errorf("%s: exit %d %s", args[0], code, errs)
		}
		if !strings.Contains(out, "the joint is loose") {
			t.Errorf("%s: no warning about the lost preload", args[0])
		}
	}
}
