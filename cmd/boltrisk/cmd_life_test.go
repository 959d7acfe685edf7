package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"boltrisk/montecarlo/report"
)

// TestLifeCommand runs 'boltrisk life' on the service-life example: JSON
// with the contract keys (b10, b1), valid against the life schema, the
// text with the caution, the review folder with the R(N) picture, and the
// same numbers for any worker count.
func TestLifeCommand(t *testing.T) {
	args := []string{"life", "--example", "service-life", "--samples", "50000", "--seed", "3", "--quiet"}
	code, out, errs := runCLI(append(args, "--json", "--workers", "1", "--b-life", "5%")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "life"), "life document", []byte(out))
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"b10", "b1", "b_lives", "failure_within_design_life", "reliability", "design_life", "curve", "caution"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if n := len(doc["b_lives"].([]any)); n != 3 {
		t.Errorf("%d B-lives, want B10, B1, B5", n)
	}
	if doc["kind"] != "life" {
		t.Errorf("kind %v", doc["kind"])
	}
	_, out2, _ := runCLI(append(args, "--json", "--workers", "2", "--b-life", "5%")...)
	strip := func(s string) string { // the worker count itself differs
		return strings.Replace(s, `"workers": 2`, `"workers": 1`, 1)
	}
	if strip(out2) != out {
		t.Error("results depend on the worker count")
	}
	code, text, _ := runCLI(args...)
	if code != 0 || !strings.Contains(text, report.Caution) || !strings.Contains(text, "P(fatigue failure within the design life)") {
		t.Errorf("text report lacks the caution or the probability:\n%s", text)
	}
	dir := filepath.Join(t.TempDir(), "review")
	if code, _, errs := runCLI(append(args, "--out", dir)...); code != 0 {
		t.Fatalf("--out: exit %d: %s", code, errs)
	}
	for _, f := range []string{"reliability.png", "report.md", "report.html"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Error(err)
		}
	}
	md, _ := os.ReadFile(filepath.Join(dir, "report.md"))
	if !strings.Contains(string(md), "## Service life") {
		t.Error("review lacks the Service life section")
	}
}

// TestLifeNeedsCurve: a scenario without fatigue.curve is refused naming
// the key, and a bad --b-life is a usage error.
func TestLifeNeedsCurve(t *testing.T) {
	code, _, errs := runCLI("life", "--example", "cover-flange", "--quiet")
	if code != exitError || !strings.Contains(errs, "fatigue.curve") {
		t.Errorf("exit %d, %s", code, errs)
	}
	code, _, errs = runCLI("life", "--example", "service-life", "--b-life", "1.5", "--quiet")
	if code != exitUsage || !strings.Contains(errs, "--b-life") {
		t.Errorf("exit %d, %s", code, errs)
	}
}

// TestSimulateWithCasesAndLife: simulate on the service-life example (load
// cases, a spectrum, a curve) writes a document valid against the simulate
// schema, with the per-case probabilities and the fatigue_life mode.
func TestSimulateWithCasesAndLife(t *testing.T) {
	code, out, errs := runCLI("simulate", "--example", "service-life", "--samples", "20000", "--method", "crude", "--quiet", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "simulate"), "simulate document", []byte(out))
	var doc struct {
		Modes []struct{ Key string } `json:"modes"`
		Cases []struct {
			Name  string
			Modes []struct{ Key string } `json:"modes"`
		} `json:"cases"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Cases) != 3 || doc.Cases[1].Name != "pressure-test" || len(doc.Cases[0].Modes) != len(doc.Modes) {
		t.Errorf("cases %+v", doc.Cases)
	}
	found := false
	for _, m := range doc.Modes {
		found = found || m.Key == "fatigue_life"
	}
	if !found {
		t.Error("fatigue_life not reported")
	}
}

// life --csv - writes R(N) on the document's grid instead of the report.
func TestLifeCSV(t *testing.T) {
	code, out, errs := runCLI("life", "--example", "service-life", "--samples", "2e4", "--quiet", "--csv", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) < 50 || strings.Join(recs[0], ",") != "cycles,reliability,ci_low,ci_high" {
		t.Fatalf("%d rows, header %v", len(recs), recs[0])
	}
	prev := 2.0
	for _, r := range recs[1:] {
		v, err := strconv.ParseFloat(r[1], 64)
		if err != nil || v > prev {
			t.Fatalf("R(N) not a non-increasing number: %v", r)
		}
		prev = v
	}
}
