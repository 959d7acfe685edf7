package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestSpecCommand: the spec document matches its schema, carries the
// callout line and the caution, and the text names the callout.
func TestSpecCommand(t *testing.T) {
	code, out, errs := runCLI("spec", "--example", "cover-flange", "--target", "1e-2", "--samples", "20000", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "spec"), "spec JSON", []byte(out))
	for _, want := range []string{`"kind": "spec"`, `"line": "Torque `, `"callout"`, "CAUTION"} {
		if !strings.Contains(out, want) {
			t.Errorf("spec JSON lacks %s", want)
		}
	}
	code, text, _ := runCLI("spec", "--example", "cover-flange", "--target", "1e-2", "--samples", "20000", "--quiet")
	if code != 0 || !strings.Contains(text, "Callout for the drawing") || !strings.Contains(text, "Torque ") {
		t.Errorf("spec text: exit %d\n%s", code, text)
	}
	// A small target with a rare-event method.
	code, out, errs = runCLI("spec", "--example", "cover-flange", "--target", "1e-6", "--method", "importance", "--samples", "20000", "--steps", "5", "--json", "--quiet")
	if code != 0 || !strings.Contains(out, `"method": "importance"`) {
		t.Fatalf("spec --method importance: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "spec"), "spec JSON (importance)", []byte(out))
	// Impossible target: the modes that make it so and the suggestions.
	code, out, errs = runCLI("spec", "--example", "cover-flange", "--target", "1e-4", "--samples", "20000", "--steps", "5", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("impossible: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "spec"), "spec JSON (impossible)", []byte(out))
	for _, want := range []string{`"impossible"`, `"modes_above_target"`, `"change": "condition `} {
		if !strings.Contains(out, want) {
			t.Errorf("impossible spec JSON lacks %s", want)
		}
	}
}

// TestDecideBadInput: clear errors naming the flag and what is allowed.
func TestDecideBadInput(t *testing.T) {
	dir := t.TempDir()
	ex, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"))
	a := filepath.Join(dir, "a.yaml")
	os.WriteFile(a, ex, 0o644)
	noTool := filepath.Join(dir, "notool.yaml")
	os.WriteFile(noTool, []byte(strings.Replace(string(ex), "  tool: torque-wrench", "", 1)), 0o644)
	for _, test := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"spec", a}, exitUsage, "--target 0: a failure probability strictly between 0 and 1"},
		{[]string{"spec", a, "--target", "1.5"}, exitUsage, "--target 1.5"},
		{[]string{"spec", a, "--target", "-1e-3"}, exitUsage, "strictly between 0 and 1"},
		{[]string{"spec", a, "--target", "1e-3", "--tools", "torque-wrench,powertool"}, exitUsage, `did you mean "power-tool"`},
		{[]string{"spec", a, "--target", "1e-3", "--tools", "ultrasonic"}, exitUsage, "controls preload"},
		{[]string{"spec", a, "--target", "1e-3", "--range", "70..40N*m"}, exitUsage, "--range"},
		{[]string{"spec", a, "--target", "1e-3", "--range", "0..40N*m"}, exitUsage, "lower end must be > 0"},
		{[]string{"spec", a, "--target", "1e-3", "--range", "40..70"}, exitUsage, "needs a unit of torque"},
		{[]string{"spec", a, "--target", "1e-3", "--range", "50..53N*m", "--samples", "20000", "--quiet"}, exitUsage, "cannot hold the window"},
		{[]string{"spec", a, "--target", "1e-3", "--steps", "2"}, exitUsage, "--steps 2"},
		{[]string{"spec", noTool, "--target", "1e-3"}, exitError, "tightening.torque has no scatter"},
	} {
		code, out, errs := runCLI(test.args...)
		if code != test.code || !strings.Contains(errs, test.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q", test.args, code, errs, test.code, test.want)
		}
		if out != "" {
			t.Errorf("%v: wrote to stdout on error", test.args)
		}
	}
	if after, _ := os.ReadFile(a); string(after) != string(ex) {
		t.Error("an input file changed")
	}
}

// TestDriversCommand: the drivers document matches its schema; simulate
// --drivers carries the same body; the review gets the picture.
func TestDriversCommand(t *testing.T) {
	code, out, errs := runCLI("drivers", "--example", "cover-flange", "--samples", "50000", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "drivers"), "drivers JSON", []byte(out))
	for _, want := range []string{`"kind": "drivers"`, `"alpha2"`, `"failure_shift_sd"`, `"spearman"`, `"fixed_at_median"`} {
		if !strings.Contains(out, want) {
			t.Errorf("drivers JSON lacks %s", want)
		}
	}
	code, out, errs = runCLI("simulate", "--example", "cover-flange", "--samples", "50000", "--method", "crude", "--drivers", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("simulate --drivers: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "simulate"), "simulate --drivers JSON", []byte(out))
	if !strings.Contains(out, `"drivers"`) {
		t.Error("simulate --drivers JSON lacks drivers")
	}
	dir := filepath.Join(t.TempDir(), "rev")
	code, _, errs = runCLI("drivers", "--example", "cover-flange", "--samples", "50000", "--out", dir, "--quiet")
	if code != 0 {
		t.Fatalf("drivers --out: exit %d: %s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "drivers.png")); err != nil {
		t.Error("no drivers.png in the review")
	}
	code, out, errs = runCLI("drivers", "--example", "cover-flange", "--method", "importance", "--json", "--quiet")
	if code != 0 || !strings.Contains(out, `"method": "importance"`) {
		t.Fatalf("drivers --method importance: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "drivers"), "drivers JSON (importance)", []byte(out))
	code, _, errs = runCLI("drivers", "--example", "cover-flange", "--method", "subset")
	if code != exitUsage || !strings.Contains(errs, "crude or importance") {
		t.Errorf("drivers --method subset: exit %d, %s", code, errs)
	}
	code, _, errs = runCLI("drivers", "--example", "cover-flange", "--subsample", "3")
	if code != exitUsage || !strings.Contains(errs, "--subsample 3") {
		t.Errorf("bad --subsample: exit %d, %s", code, errs)
	}
}

// TestCompareRetune: each variant is compared at its own callout, and that
// callout equals what 'boltrisk spec' gives for the variant alone.
func TestCompareRetune(t *testing.T) {
	samples, steps := "20000", "9"
	if testing.Short() { // the race detector's run
		samples, steps = "5000", "5"
	}
	code, out, errs := runCLI("compare", "--example", "cover-flange", "--retune", "--target", "1e-2", "--samples", samples, "--retune-steps", steps, "--json", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "compare"), "compare --retune JSON", []byte(out))
	var doc struct {
		Retune struct {
			Variants []struct {
				Name    string
				Nominal float64
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Retune.Variants) != 3 {
		t.Fatalf("retune variants: %+v", doc.Retune.Variants)
	}
	dir := t.TempDir()
	ex, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"))
	for _, v := range doc.Retune.Variants {
		src := string(ex)
		if v.Name != "base" {
			src = strings.Replace(src, "condition: dry", "condition: "+v.Name, 1)
		}
		f := filepath.Join(dir, v.Name+".yaml")
		os.WriteFile(f, []byte(src), 0o644)
		code, out, errs := runCLI("spec", f, "--target", "1e-2", "--samples", samples, "--steps", steps, "--json", "--quiet")
		if code != 0 {
			t.Fatalf("spec %s: exit %d: %s", v.Name, code, errs)
		}
		var sp struct{ Callout struct{ Nominal float64 } }
		if err := json.Unmarshal([]byte(out), &sp); err != nil {
			t.Fatal(err)
		}
		if sp.Callout.Nominal != v.Nominal || v.Nominal == 0 {
			t.Errorf("%s: compared at %g N·mm, its own spec says %g", v.Name, v.Nominal, sp.Callout.Nominal)
		}
	}
	code, _, errs = runCLI("compare", "--example", "cover-flange", "--retune", "--target", "2")
	if code != exitUsage || !strings.Contains(errs, "--target 2") {
		t.Errorf("bad --target: exit %d, %s", code, errs)
	}
	code, _, errs = runCLI("compare", "--example", "cover-flange", "--target", "1e-3")
	if code != exitUsage || !strings.Contains(errs, "--target is for --retune") {
		t.Errorf("--target without --retune: exit %d, %s", code, errs)
	}
}

// TestREADMEDecisions: the numbers the README's Decisions section quotes
// from the built-in example come from these commands.
func TestREADMEDecisions(t *testing.T) {
	if testing.Short() {
		t.Skip("runs two full spec commands (go test ./... runs it)")
	}
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	sec := string(readme)
	i := strings.Index(sec, "## Decisions")
	if i < 0 {
		t.Fatal("README has no Decisions section")
	}
	sec = sec[i:]
	if j := strings.Index(sec[3:], "\n## "); j >= 0 {
		sec = sec[:j+3]
	}
	const line = "Torque 52.6 N·m ± 10 N·m (±3σ; tool torque-wrench or more precise, dry threads) — probability of any failure at most 0.003 at 95 % confidence (upper bound)"
	if !strings.Contains(sec, "    "+line) {
		t.Fatal("the README's Decisions section lacks the callout line")
	}
	code, out, errs := runCLI("spec", "--example", "cover-flange", "--target", "3e-3", "--samples", "2e5", "--quiet")
	if code != 0 || !strings.Contains(out, line) || !strings.Contains(out, "55 runs") {
		t.Errorf("spec: exit %d %s; the README's line is not in:\n%s", code, errs, out)
	}
	code, out, _ = runCLI("spec", "--example", "cover-flange", "--target", "1e-4", "--samples", "2e5", "--quiet")
	for _, want := range []string{"12.1 × the target", "separation 8.80e-04 (8.8 × the target)", "proof 3.12e-04 (3.12 × the target)", "fatigue 2.55e-04 (2.55 × the target)", "the preset change that helps most: condition oiled"} {
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("spec at 1e-4: %q not in the output", want)
		}
	}
	for _, want := range []string{"12.1 × the", "separation 8.8 ×, proof 3.12 ×, fatigue 2.55 ×", "oiled threads help most", "β 3.7603, α² nut factor 0.7651, load 0.2188, torque 0.0161", "exact torque edge 112.22 N·m"} {
		if !strings.Contains(strings.Join(strings.Fields(sec), " "), want) {
			t.Errorf("README Decisions lacks %q", want)
		}
	}
}

// TestSpecPreloadCallout: a preload-controlled method gets a preload
// callout and only the tools that turn the nut; --out writes the review
// with the callout and the scenario appendix.
func TestSpecPreloadCallout(t *testing.T) {
	ex, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"))
	src := string(ex)
	for _, r := range [][2]string{{"  method: nut-factor ", "  method: preload #"}, {"  torque: 52 N*m", "  preload: 26 kN"}, {"  tool: torque-wrench ", "  tool: angle-controlled #"}} {
		if !strings.Contains(src, r[0]) {
			t.Fatalf("example lacks %q", r[0])
		}
		src = strings.Replace(src, r[0], r[1], 1)
	}
	dir := t.TempDir()
	f := filepath.Join(dir, "angle.yaml")
	os.WriteFile(f, []byte(src), 0o644)
	out := filepath.Join(dir, "rev")
	code, js, errs := runCLI("spec", f, "--target", "1e-2", "--samples", "20000", "--json", "--quiet", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{`"quantity": "preload"`, `"line": "Preload `, `"tool": "angle-controlled"`} {
		if !strings.Contains(js, want) {
			t.Errorf("preload spec JSON lacks %s", want)
		}
	}
	md, _ := os.ReadFile(filepath.Join(out, "report.md"))
	for _, want := range []string{"Callout for the drawing", "Preload ", "Appendix: scenario file", "tool: angle-controlled #"} {
		if !strings.Contains(string(md), want) {
			t.Errorf("spec review lacks %q", want)
		}
	}
	if code, _, errs := runCLI("spec", f, "--target", "1e-2", "--tools", "tension-controlled"); code != exitUsage || !strings.Contains(errs, "tensioner") {
		t.Errorf("a tensioner for a turned nut: exit %d %s", code, errs)
	}
}
