package main

import (
	"bytes"
	"context"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

func TestOutFolder(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "new", "review") // created if missing
	code, _, errs := runCLI("simulate", "--example", "cover-flange", "--samples", "20000", "--out", dir, "--load-curve", "0.5..2", "--load-steps", "4")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	ents, _ := os.ReadDir(dir)
	var pngs int
	for _, e := range ents {
		if strings.HasPrefix(e.Name(), ".") {
			t.Errorf("temporary file left: %s", e.Name())
		}
		if filepath.Ext(e.Name()) != ".png" {
			continue
		}
		pngs++
		b, _ := os.ReadFile(filepath.Join(dir, e.Name()))
		img, err := png.Decode(bytes.NewReader(b))
		if err != nil {
			t.Errorf("%s: %v", e.Name(), err)
			continue
		}
		if r := img.Bounds(); r.Dx() != 768 || r.Dy() < 480 { // a legend below the axes adds height
			t.Errorf("%s is %dx%d", e.Name(), r.Dx(), r.Dy())
		}
	}
	// preload, five safety-factor histograms and their exceedance pictures, the load curve
	if pngs != 12 {
		t.Errorf("%d PNG files, want 12", pngs)
	}
	md, _ := os.ReadFile(filepath.Join(dir, "report.md"))
	for _, want := range []string{"CAUTION", "load-curve.png", "exceed-fatigue.png", "sf-fatigue.png", "SHA-256", "Provenance"} {
		if !strings.Contains(string(md), want) {
			t.Errorf("report.md lacks %q", want)
		}
	}
	checkInBrowser(t, filepath.Join(dir, "report.html"))

	for _, args := range [][]string{
		{"sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--steps", "4", "--samples", "10000", "--target", "1e-2", "--out", dir + "-sweep"},
		{"compare", "--example", "cover-flange", "--samples", "10000", "--out", dir + "-compare"},
	} {
		if code, _, errs := runCLI(args...); code != 0 {
			t.Fatalf("%v: exit %d: %s", args[0], code, errs)
		}
	}
	for _, f := range []string{"-sweep/reliability.png", "-sweep/report.html", "-compare/compare-preload.png", "-compare/compare-modes.png", "-compare/report.md"} {
		if _, err := os.Stat(dir + f); err != nil {
			t.Error(err)
		}
	}
}

func TestOutNeverOverwritesInput(t *testing.T) {
	dir := t.TempDir()
	ex, _ := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "bench-m12.yaml"))
	in := filepath.Join(dir, "report.md") // an input named like an output
	os.WriteFile(in, ex, 0o644)
	code, _, errs := runCLI("simulate", in, "--samples", "5000", "--out", dir, "--quiet")
	if code != exitError || !strings.Contains(errs, "refusing to write") {
		t.Errorf("exit %d, %q: want a refusal", code, errs)
	}
	if b, _ := os.ReadFile(in); !bytes.Equal(b, ex) {
		t.Error("the input file was overwritten")
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("files written despite the refusal: %v", ents)
	}
	if code, _, errs := runCLI("simulate", "--example", "bench-m12", "--samples", "1000", "--load-curve", "0.5..2"); code != exitUsage || !strings.Contains(errs, "--out") {
		t.Errorf("--load-curve without --out: exit %d %q", code, errs)
	}
}

// checkInBrowser loads the report in headless Chromium with every network
// name unresolvable, and checks that every image decoded (the page's own
// check sets data-images-ok) and takes a screenshot. Skipped, with the
// reason, when Chromium is not installed (.ci/run installs it).
func checkInBrowser(t *testing.T, page string) {
	t.Helper()
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Log("SKIP browser check: chromium not found (apt-get install chromium)")
		return
	}
	abs, _ := filepath.Abs(page)
	common := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic",
		"--host-resolver-rules=MAP * ~NOTFOUND", "--user-data-dir=" + t.TempDir(), "--virtual-time-budget=5000"}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	dom, err := exec.CommandContext(ctx, bin, append(common, "--dump-dom", "file://"+abs)...).Output()
	if err != nil {
		t.Fatalf("chromium: %v", err)
	}
	if !strings.Contains(string(dom), `data-images-ok="yes"`) {
		t.Errorf("not every image decoded in the browser; body: %.300s", string(dom[bytes.Index(dom, []byte("<body")):]))
	}
	shot := filepath.Join(filepath.Dir(page), "screenshot.png")
	if err := exec.CommandContext(ctx, bin, append(common, "--screenshot="+shot, "--window-size=1200,2400", "file://"+abs)...).Run(); err != nil {
		t.Errorf("screenshot: %v", err)
	}
	if b, err := os.ReadFile(shot); err != nil || len(b) < 10_000 {
		t.Errorf("screenshot missing or empty (%d bytes)", len(b))
	}
}
