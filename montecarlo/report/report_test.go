package report

import (
	"bytes"
	"context"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
	"boltrisk/plots"
)

func TestFiguresShowTheTallies(t *testing.T) {
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 30_000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	// Preload histogram: the bars hold exactly the bolt samples inside the
	// histogram's range.
	_, spec, err := PreloadFigure(s, r, units.SI)
	if err != nil {
		t.Fatal(err)
	}
	_, bars, err := plots.HistogramPlot(spec)
	if err != nil {
		t.Fatal(err)
	}
	h := Hist(&r.Quantities[montecarlo.QPreload].Sketch)
	var sum float64
	for _, b := range bars {
		sum += b.Weight
	}
	inRange := h.Total() - h.Under - h.Over
	if math.Abs(sum-inRange) > 1e-6*inRange || math.Abs(h.Total()-float64(r.Samples)) > 1e-6 { // one bolt per sample, in turn
		t.Errorf("preload bars hold %v, histogram %v in range, %d samples", sum, inRange, r.Samples)
	}
	figs, err := SafetyFactorFigures(s, r)
	if err != nil || len(figs) != len(r.Modes) {
		t.Fatalf("%d safety-factor figures for %d modes (%v)", len(figs), len(r.Modes), err)
	}
	for _, f := range figs {
		img, err := png.Decode(bytes.NewReader(f.PNG))
		if err != nil || img.Bounds().Dx() != 768 {
			t.Errorf("%s: %v", f.File, err)
		}
	}
	// Reliability curve: the plotted points are the sweep's table.
	v := study.Vary{Kind: study.Load, Lo: 0.5, Hi: 2, Steps: 4}
	sw, err := study.Run(context.Background(), &s.Problem, v, montecarlo.Settings{Samples: 10_000, Seed: 1}, 1e-3)
	if err != nil {
		t.Fatal(err)
	}
	_, cspec, err := CurveFigure(s, sw, units.SI, "c.png", "t")
	if err != nil {
		t.Fatal(err)
	}
	_, drawn, err := plots.CurvePlot(cspec)
	if err != nil {
		t.Fatal(err)
	}
	doc := Sweep(s, sw, "test")
	for ci, c := range cspec.Curves {
		for i, pt := range drawn[ci] {
			want := doc.Steps[i].Modes[ci]
			if pt.P != want.Probability || pt.Hi != want.CIHigh || pt.X != doc.Steps[i].Value {
				t.Errorf("curve %s point %d = %+v, table %+v", c.Name, i, pt, want)
			}
		}
	}
}

func TestReviewDocuments(t *testing.T) {
	s, _ := scenario.Example("bracket-shear")
	r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 20_000, Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	doc := Simulation(s, r, Run{Samples: r.Samples}, "test")
	pf, _, err := PreloadFigure(s, r, units.SI)
	if err != nil {
		t.Fatal(err)
	}
	prov := Provenance{Version: "test", Command: "boltrisk simulate", Seed: 3, Requested: 20_000, Samples: 20_000, Workers: 2,
		Date: time.Date(2026, 12, 2, 0, 0, 0, 0, time.UTC), Inputs: []*scenario.Scenario{s}}
	rev := SimulationReview(s, doc, []Figure{pf}, prov, units.SI)
	var md, html bytes.Buffer
	if err := rev.WriteMarkdown(&md); err != nil {
		t.Fatal(err)
	}
	if err := rev.WriteHTML(&html); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"CAUTION", "Slip", "SHA-256 " + s.SHA256, "2026-12-02T00:00:00Z", "seed", "![", "preload.png", "normal(", "Percentiles"} {
		if !strings.Contains(md.String(), want) {
			t.Errorf("Markdown lacks %q", want)
		}
	}
	h := html.String()
	for _, want := range []string{"CAUTION", "data:image/png;base64,", "data-images-ok", "@media print"} {
		if !strings.Contains(h, want) {
			t.Errorf("HTML lacks %q", want)
		}
	}
	if strings.Contains(h, "http://") || strings.Contains(h, "https://") || strings.Contains(h, "src=\"preload.png") {
		t.Error("HTML refers to something outside itself")
	}
}

func TestNoScatterWarning(t *testing.T) {
	// A scenario without distributions is a nominal check repeated: the
	// document says so.
	s, err := scenario.Parse("fixed.yaml", []byte(`name: fixed
bolt: {thread: M12, class: "10.9"}
members: {layers: [{thickness: 15 mm, material: steel}, {thickness: 15 mm, material: steel}]}
tightening: {torque: 100 N*m, nut_factor: 0.2}
loads: {axial_max: 10 kN}
`))
	if err != nil {
		t.Fatal(err)
	}
	r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 1000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	doc := Simulation(s, r, Run{Samples: r.Samples}, "test")
	found := false
	for _, w := range doc.Warnings {
		found = found || strings.Contains(w, "no input has a distribution")
	}
	if !found || r.Samples != 1000 {
		t.Errorf("samples %d, warnings %q", r.Samples, doc.Warnings)
	}
}

func TestWriteFileDurable(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := WriteFile(path, func(w io.Writer) error { _, err := w.Write([]byte("ok")); return err }); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(path); string(b) != "ok" {
		t.Errorf("content %q", b)
	}
	// A failing writer leaves the old file alone and no temporary behind.
	err := WriteFile(path, func(w io.Writer) error { w.Write([]byte("half")); return os.ErrClosed })
	if err == nil {
		t.Fatal("want error")
	}
	if b, _ := os.ReadFile(path); string(b) != "ok" {
		t.Errorf("failed write changed the file: %q", b)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("temporary files left: %v", ents)
	}
}

func TestOutputsReplaceOnlyReports(t *testing.T) {
	t.Parallel()
	rev := &Review{Title: "t", Caution: Caution}
	dir := filepath.Join(t.TempDir(), "review")
	if _, err := WriteOutputs(dir, rev, nil); err != nil {
		t.Fatal(err)
	}
	// An earlier report is replaced as a whole; a stale picture goes.
	os.WriteFile(filepath.Join(dir, "stale.png"), []byte("x"), 0o644)
	if _, err := WriteOutputs(dir, rev, nil); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "stale.png")); err == nil {
		t.Error("the old folder's files survived the replacement")
	}
	// A folder holding anything else is refused, and left as it was.
	other := filepath.Join(dir, "notes.txt")
	os.WriteFile(other, []byte("mine"), 0o644)
	if _, err := WriteOutputs(dir, rev, nil); err == nil || !strings.Contains(err.Error(), "notes.txt") {
		t.Errorf("want a refusal naming notes.txt, got %v", err)
	}
	if b, _ := os.ReadFile(other); string(b) != "mine" {
		t.Error("the user's file was touched")
	}
	ents, _ := os.ReadDir(filepath.Dir(dir))
	if len(ents) != 1 {
		t.Errorf("staging folders left beside the output: %v", ents)
	}
}
