package main

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestSignOffPage: the review starts with the sign-off sheet, which prints
// as page 1 on A4 and on US Letter (headless Chromium print-to-pdf,
// pdftotext/pdfinfo of poppler-utils); the scenario is in the appendix
// verbatim with its SHA-256. The print check is skipped, with the reason,
// when Chromium or poppler-utils is missing.
func TestSignOffPage(t *testing.T) {
	for _, ex := range []string{"cover-flange", "splice-plate", "service-life"} {
		dir := filepath.Join(t.TempDir(), "rev")
		code, _, errs := runCLI("simulate", "--example", ex, "--samples", "20000", "--method", "crude", "--drivers", "--sign-off", "1e-3", "--out", dir, "--quiet")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", ex, code, errs)
		}
		md, _ := os.ReadFile(filepath.Join(dir, "report.md"))
		html, _ := os.ReadFile(filepath.Join(dir, "report.html"))
		src, _ := os.ReadFile(filepath.Join("..", "..", "montecarlo", "scenario", "examples", ex+".yaml"))
		if !strings.HasPrefix(string(md), "# Sign-off sheet") {
			t.Errorf("%s: report.md does not start with the sign-off sheet", ex)
		}
		for _, want := range []string{"| prepared |", "| approved |", "verdict", "Governing mode", "Not checked", "SHA-256", "Appendix: scenario file", strings.TrimRight(string(src), "\n")} {
			if !strings.Contains(string(md), want) {
				t.Errorf("%s: report.md lacks %.60q", ex, want)
			}
		}
		printCheck(t, ex, filepath.Join(dir, "report.html"), html)
	}
	if code, _, errs := runCLI("simulate", "--example", "cover-flange", "--sign-off", "1.5", "--out", t.TempDir()); code != exitUsage || !strings.Contains(errs, "--sign-off 1.5") {
		t.Errorf("bad --sign-off: exit %d %s", code, errs)
	}
	if code, _, errs := runCLI("simulate", "--example", "cover-flange", "--sign-off", "1e-3"); code != exitUsage || !strings.Contains(errs, "--out") {
		t.Errorf("--sign-off without --out: exit %d %s", code, errs)
	}
}

func printCheck(t *testing.T, ex, page string, html []byte) {
	t.Helper()
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Log("SKIP print check: chromium not found (apt-get install chromium)")
		return
	}
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Log("SKIP print check: pdftotext not found (apt-get install poppler-utils)")
		return
	}
	for _, size := range []string{"A4", "letter"} {
		dir := filepath.Dir(page)
		h := filepath.Join(dir, "print-"+size+".html")
		os.WriteFile(h, []byte(strings.Replace(string(html), "</head>", "<style>@page { size: "+size+"; }</style></head>", 1)), 0o644)
		pdf := filepath.Join(dir, "print-"+size+".pdf")
		ctx, cancel := context.WithTimeout(context.Background(), 120*time.Second)
		err := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking",
			"--host-resolver-rules=MAP * ~NOTFOUND", "--user-data-dir="+t.TempDir(), "--no-pdf-header-footer", "--print-to-pdf="+pdf, "file://"+h).Run()
		cancel()
		if err != nil {
			t.Fatalf("chromium print: %v", err)
		}
		info, _ := exec.Command("pdfinfo", pdf).Output()
		if !strings.Contains(strings.ToLower(string(info)), strings.ToLower(size)) {
			t.Errorf("%s: the PDF is not %s:\n%s", ex, size, info)
		}
		p1, _ := exec.Command("pdftotext", "-f", "1", "-l", "1", pdf, "-").Output()
		p2, _ := exec.Command("pdftotext", "-f", "2", "-l", "2", pdf, "-").Output()
		one := string(p1)
		if !strings.HasPrefix(strings.TrimSpace(one), "Sign-off sheet") || !strings.Contains(one, "approved") || !strings.Contains(one, "CAUTION") {
			t.Errorf("%s on %s: page 1 is not the whole sign-off sheet:\n%s", ex, size, one)
		}
		if !strings.HasPrefix(strings.TrimSpace(string(p2)), "Bolted-joint reliability review") {
			t.Errorf("%s on %s: page 2 does not start the review:\n%.300s", ex, size, p2)
		}
	}
}
