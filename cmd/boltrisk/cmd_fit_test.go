package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"

	"boltrisk/montecarlo/report"
)

var lzFile = filepath.Join("..", "..", "testdata", "fit", "lieblein-zelen.csv")

// The ball-bearing lives of Lieblein & Zelen (1956; testdata/fit/README.md):
// text and JSON goldens, the JSON validated against its schema, and the
// check values of issue 15 in the document (SciPy 1.10.1, computed; the
// Weibull fit rounds to the published 2.10 and 81.9, Lawless 2003, from
// memory).
func TestFitGolden(t *testing.T) {
	args := []string{"fit", lzFile, "--column", "revolutions_millions", "--family", "normal,lognormal,weibull", "--bootstrap", "199", "--seed", "3"}
	code, out, errs := runCLI(args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"lognormal", "{dist: lognormal, mean: 72.71, cov: 55.92%}", "predictive: true", "16.18", "CAUTION", "Anderson–Darling"} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q", want)
		}
	}
	golden(t, "fit_lieblein-zelen.txt", []byte(out))
	code, out, errs = runCLI(append(args, "--json")...)
	if code != 0 {
		t.Fatalf("--json: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "fit"), "fit JSON", []byte(out))
	golden(t, "fit_lieblein-zelen.json", []byte(out))
	var doc struct {
		Best       string
		Candidates []struct {
			Family     string
			Parameters []struct{ Value float64 }
			KS         struct{ Statistic float64 } `json:"kolmogorov_smirnov"`
		}
		Predictives []struct {
			Family    string
			Quantiles []float64
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// issue 15: Weibull 2.1021, 81.878; lognormal 4.1505, 0.5216; normal
	// 72.224, 36.665; KS of the lognormal 0.0898 — here to the digits of
	// montecarlo/fit's reference test (SciPy 1.10.1, computed).
	want := map[string][3]float64{"weibull": {2.1020588752, 81.878334052, 0}, "lognormal": {4.1504544939, 0.52164933405, 0.0898}, "normal": {72.224347826, 36.664669385, 0}}
	for _, c := range doc.Candidates {
		w := want[c.Family]
		for i := range 2 {
			if rel := c.Parameters[i].Value/w[i] - 1; rel > 1e-8 || rel < -1e-8 {
				t.Errorf("%s parameter %d = %.6g, want %.5g", c.Family, i, c.Parameters[i].Value, w[i])
			}
		}
		if w[2] != 0 && (c.KS.Statistic < 0.08975 || c.KS.Statistic > 0.08985) {
			t.Errorf("KS of the lognormal fit %.5g, want 0.0898", c.KS.Statistic)
		}
	}
	for _, p := range doc.Predictives {
		if p.Family == "lognormal" && (p.Quantiles[0] < 16.175 || p.Quantiles[0] > 16.185) {
			t.Errorf("1 %% predictive quantile %.5g, want 16.18", p.Quantiles[0])
		}
	}
	if doc.Best != "lognormal" {
		t.Errorf("best %s, want lognormal", doc.Best)
	}
}

func TestFitOut(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "review")
	code, _, errs := runCLI("fit", lzFile, "--column", "revolutions_millions", "--family", "lognormal,weibull", "--bootstrap", "-1", "--out", dir, "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, f := range []string{"probability-lognormal.png", "probability-weibull.png", "report.md", "report.html"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	md, _ := os.ReadFile(filepath.Join(dir, "report.md"))
	for _, want := range []string{"CAUTION", "SHA-256", "predictive: true", "probability-weibull.png"} {
		if !strings.Contains(string(md), want) {
			t.Errorf("report.md lacks %q", want)
		}
	}
}

// Bad input: errors name the file, the row and the column; nothing is
// written to stdout; the input file is never an output.
func TestFitBadInput(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(text), 0o644)
		return p
	}
	neg := write("neg.csv", "id,K\n1,0.2\n2,-0.1\n3,0.21\n4,0.19\n")
	mixed := write("mixed.csv", "F\n27 kN\n3 mm\n")
	for _, c := range []struct {
		args []string
		code int
		want []string
	}{
		{[]string{"fit", neg}, exitUsage, []string{"--column NAME is required"}},
		{[]string{"fit", neg, "--column", "k"}, exitOK, nil}, // case-insensitive match
		{[]string{"fit", neg, "--column", "KK"}, exitError, []string{"neg.csv, row 1", `no column "KK"`, "did you mean", `"K"`}},
		{[]string{"fit", neg, "--column", "K", "--family", "lognormal"}, exitError, []string{"neg.csv", `column "K"`, "row 3", "not > 0"}},
		{[]string{"fit", neg, "--column", "K", "--family", "lognormla"}, exitUsage, []string{"--family", "allowed"}},
		{[]string{"fit", mixed, "--column", "F"}, exitError, []string{"mixed.csv", "row 3", "mixed dimensions"}},
		{[]string{"fit", write("one.csv", "K\n0.2\n"), "--column", "K"}, exitError, []string{"one.csv", "row 2", "single value"}},
		{[]string{"fit", write("const.csv", "K\n0.2\n0.2\n0.2\n"), "--column", "K"}, exitError, []string{"const.csv", "constant"}},
		{[]string{"fit", write("empty.csv", ""), "--column", "K"}, exitError, []string{"empty.csv", "empty"}},
		{[]string{"fit", write("bin.csv", "K\n1\n\x00\x00\x01"), "--column", "K"}, exitError, []string{"bin.csv", "binary"}},
		{[]string{"fit", filepath.Join(dir, "nope.csv"), "--column", "K"}, exitError, []string{"cannot read the data file"}},
		{[]string{"fit", neg, "--column", "K", "--out", dir}, exitError, []string{"refusing"}},
	} {
		code, out, errs := runCLI(append(c.args, "--bootstrap", "-1")...)
		if code != c.code {
			t.Errorf("%v: exit %d, want %d: %s", c.args, code, c.code, errs)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: stderr %q lacks %q", c.args, errs, w)
			}
		}
		if c.code != exitOK && out != "" {
			t.Errorf("%v: wrote to stdout on error", c.args)
		}
		if strings.Contains(out, "NaN") {
			t.Errorf("%v: NaN in the output", c.args)
		}
	}
}

// A 10⁶-row file is read and fitted (no bootstrap by default above 10 000
// values, with a note).
func TestFitMillionRows(t *testing.T) {
	if testing.Short() {
		t.Skip("writes and fits 10⁶ rows")
	}
	var b strings.Builder
	b.WriteString("id,preload\n")
	for i := range 1_000_000 {
		// a deterministic spread of values 20 … 30 kN
		b.WriteString("1,")
		b.WriteString(strings.TrimRight(strings.TrimRight(formatKN(20+float64((i*7919)%100000)/10000), "0"), "."))
		b.WriteString(" kN\n")
	}
	p := filepath.Join(t.TempDir(), "big.csv")
	os.WriteFile(p, []byte(b.String()), 0o644)
	code, out, errs := runCLI("fit", p, "--column", "preload", "--family", "normal,lognormal", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, `"n": 1000000`) || !strings.Contains(out, "no bootstrap by default above 10000 values") {
		t.Errorf("10⁶ rows: %s", firstLines([]byte(out), 20))
	}
}

func formatKN(v float64) string { return fmtFloat(v) }

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }

// End to end: a scenario whose nut factor is fitted to test data at load
// time simulates; the JSON document (valid against its schema) and the
// review carry the data file's SHA-256 and the fit; predictive: true
// samples a log-t.
func TestScenarioWithDataSimulates(t *testing.T) {
	scen := filepath.Join("..", "..", "testdata", "fit", "flange-fitted.yaml")
	raw, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "fit", "torque-tension-demo.csv"))
	sum := sha256.Sum256(raw)
	sha := hex.EncodeToString(sum[:])
	dir := filepath.Join(t.TempDir(), "review")
	code, out, errs := runCLI("simulate", scen, "--samples", "20000", "--seed", "3", "--json", "--quiet", "--out", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	validate(t, compile(t, "simulate"), "simulate JSON with a data input", []byte(out))
	for _, want := range []string{sha, `"family": "log-t"`, `"predictive": true`, `"column": "K"`} {
		if !strings.Contains(out, want) {
			t.Errorf("JSON lacks %q", want)
		}
	}
	md, _ := os.ReadFile(filepath.Join(dir, "report.md"))
	for _, want := range []string{"data torque-tension-demo.csv", sha, "Fitted to test data", "posterior predictive"} {
		if !strings.Contains(string(md), want) {
			t.Errorf("report.md lacks %q", want)
		}
	}
	// From standard input the data path is relative to the working folder:
	// here cmd/boltrisk, where the file is not.
	src, _ := os.ReadFile(scen)
	code, _, errs = runInWith(string(src), "nominal", "-")
	if code != exitError || !strings.Contains(errs, "relative to the working folder") {
		t.Errorf("standard input: exit %d: %s", code, errs)
	}
	// The scenario validates against the scenario schema.
	var v any
	if err := yaml.Unmarshal(src, &v); err != nil {
		t.Fatal(err)
	}
	b, _ := json.Marshal(v)
	validate(t, compile(t, "scenario"), "flange-fitted.yaml", b)
}

func runInWith(stdin string, args ...string) (int, string, string) {
	var out, errb strings.Builder
	code := runIn(strings.NewReader(stdin), args, &out, &errb)
	return code, out.String(), errb.String()
}

func TestFitHelp(t *testing.T) {
	code, out, _ := runCLI("fit", "--help")
	if code != 0 || !strings.Contains(out, report.Caution[:40]) || !strings.Contains(out, "parametric bootstrap") || !strings.Contains(out, "predictive") {
		t.Errorf("fit --help: exit %d\n%s", code, out)
	}
}
