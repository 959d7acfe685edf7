package main

import (
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestRank ranks two examples (and a copy of one under another name): the
// order follows the upper bounds, verdicts follow the target, each row
// links to its joint's report; JSON matches its schema; the index page
// loads in headless Chromium with one row per joint and working links.
func TestRank(t *testing.T) {
	dir := t.TempDir()
	for _, name := range []string{"cover-flange", "bench-m12"} {
		b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", name+".yaml"))
		if err != nil {
			t.Fatal(err)
		}
		os.WriteFile(filepath.Join(dir, name+".yaml"), b, 0o644)
	}
	out := filepath.Join(t.TempDir(), "fleet")
	code, js, errs := runCLI("rank", dir, "--samples", "30000", "--target", "1e-2", "--out", out, "--json", "--quiet")
	if code != 0 {
		t.Fatalf("rank: exit %d: %s", code, errs)
	}
	validate(t, compile(t, "rank"), "rank", []byte(js))
	var doc struct {
		Joints []struct {
			Rank     int    `json:"rank"`
			Verdict  string `json:"verdict"`
			Report   string `json:"report"`
			Governed string `json:"governing_mode"`
			Any      struct {
				CILow  float64 `json:"ci_low"`
				CIHigh float64 `json:"ci_high"`
			} `json:"any"`
		} `json:"joints"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Joints) != 2 {
		t.Fatalf("%d joints", len(doc.Joints))
	}
	for i, j := range doc.Joints {
		if i > 0 && j.Any.CIHigh > doc.Joints[i-1].Any.CIHigh {
			t.Errorf("rank %d has a higher upper bound than rank %d", j.Rank, j.Rank-1)
		}
		want := "undecided"
		if j.Any.CIHigh <= 1e-2 {
			want = "meets"
		} else if j.Any.CILow > 1e-2 {
			want = "exceeds"
		}
		if j.Verdict != want || j.Governed == "" {
			t.Errorf("rank %d: verdict %s (want %s), governing %q", j.Rank, j.Verdict, want, j.Governed)
		}
		if _, err := os.Stat(filepath.Join(out, j.Report)); err != nil {
			t.Errorf("rank %d: report link %s: %v", j.Rank, j.Report, err)
		}
	}
	code, csv, _ := runCLI("rank", dir, "--samples", "30000", "--csv", "-", "--quiet")
	if code != 0 || strings.Count(strings.TrimSpace(csv), "\n") != 2 {
		t.Errorf("csv: exit %d:\n%s", code, csv)
	}
	code, text, _ := runCLI("rank", filepath.Join(dir, "cover-flange.yaml"), "--samples", "30000", "--quiet")
	if code != 0 || !strings.Contains(text, "CAUTION") || !strings.Contains(text, "cover-flange.yaml") {
		t.Errorf("text: exit %d:\n%s", code, text)
	}
	checkIndexInBrowser(t, filepath.Join(out, "index.html"), 2)

	// A joint run elsewhere (one task of a job array): its simulate JSON
	// ranks as the scenario would.
	_, sim, _ := runCLI("simulate", filepath.Join(dir, "bench-m12.yaml"), "--samples", "30000", "--json", "--quiet")
	res := filepath.Join(t.TempDir(), "bench-m12.json")
	os.WriteFile(res, []byte(sim), 0o644)
	code, js2, errs := runCLI("rank", filepath.Join(dir, "cover-flange.yaml"), res, "--samples", "30000", "--target", "1e-2", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("rank with a result file: exit %d: %s", code, errs)
	}
	var doc2 struct {
		Joints []struct {
			Any struct {
				CIHigh float64 `json:"ci_high"`
			} `json:"any"`
			Verdict string `json:"verdict"`
		} `json:"joints"`
	}
	json.Unmarshal([]byte(js2), &doc2)
	if len(doc2.Joints) != 2 {
		t.Fatalf("%d joints", len(doc2.Joints))
	}
	for i := range doc2.Joints {
		if doc2.Joints[i].Any.CIHigh != doc.Joints[i].Any.CIHigh || doc2.Joints[i].Verdict != doc.Joints[i].Verdict {
			t.Errorf("rank %d from a result file differs: %+v vs %+v", i+1, doc2.Joints[i], doc.Joints[i])
		}
	}
}

// TestRankBadInput: refused before anything runs or is written.
func TestRankBadInput(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.yaml")
	os.WriteFile(bad, []byte("bolt: {size: M99}\n"), 0o644)
	out := filepath.Join(dir, "fleet")
	for _, tc := range []struct {
		args []string
		code int
		msg  string
	}{
		{[]string{"rank", filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"), "--target", "2"}, 2, "--target 2"},
		{[]string{"rank", t.TempDir()}, 1, "holds no scenario files"},
		{[]string{"rank", nominalJSON(t)}, 1, `a "nominal" document`},
		{[]string{"rank", filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml"), bad, "--out", out}, 1, "bad.yaml"},
	} {
		if code, _, errs := runCLI(tc.args...); code != tc.code || !strings.Contains(errs, tc.msg) {
			t.Errorf("%v: exit %d, %s", tc.args, code, errs)
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a refused ranking wrote its folder")
	}
}

// checkIndexInBrowser loads the index page in headless Chromium (network
// names unresolvable) and checks its rows and that each link's report
// exists. Skipped, with the reason, without Chromium.
func checkIndexInBrowser(t *testing.T, page string, rows int) {
	t.Helper()
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Log("SKIP browser check: chromium not found (apt-get install chromium)")
		return
	}
	abs, _ := filepath.Abs(page)
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	dom, err := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--host-resolver-rules=MAP * ~NOTFOUND",
		"--user-data-dir="+t.TempDir(), "--virtual-time-budget=3000", "--dump-dom", "file://"+abs).Output()
	if err != nil {
		t.Fatalf("chromium: %v", err)
	}
	s := string(dom)
	if got := strings.Count(s, "<tr class="); got != rows {
		t.Errorf("browser sees %d ranked rows, want %d", got, rows)
	}
	for _, part := range strings.Split(s, `href="`)[1:] {
		link, _, _ := strings.Cut(part, `"`)
		if _, err := os.Stat(filepath.Join(filepath.Dir(page), link)); err != nil {
			t.Errorf("link %s: %v", link, err)
		}
	}
}

func nominalJSON(t *testing.T) string {
	_, out, _ := runCLI("nominal", "--example", "cover-flange", "--json")
	p := filepath.Join(t.TempDir(), "nominal.json")
	os.WriteFile(p, []byte(out), 0o644)
	return p
}
