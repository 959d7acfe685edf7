package report

import (
	"bytes"
	"context"
	"image/png"
	"strings"
	"testing"
	"time"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
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
	h := r.Q[montecarlo.QPreload]
	var sum float64
	for _, b := range bars {
		sum += b.Weight
	}
	if int64(sum) != h.Total()-h.Under-h.Over || h.Total() != r.Samples*int64(r.NBolts) {
		t.Errorf("preload bars hold %v, histogram %d in range, %d bolt samples", sum, h.Total()-h.Under-h.Over, r.Samples*int64(r.NBolts))
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
	v := montecarlo.Vary{Kind: montecarlo.VaryLoad, Lo: 0.5, Hi: 2, Steps: 4}
	sw, err := montecarlo.RunSweep(context.Background(), &s.Problem, v, montecarlo.Settings{Samples: 10_000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	_, cspec, err := CurveFigure(s, sw, 1e-3, units.SI, "c.png", "t")
	if err != nil {
		t.Fatal(err)
	}
	_, drawn, err := plots.CurvePlot(cspec)
	if err != nil {
		t.Fatal(err)
	}
	doc := Sweep(s, sw, montecarlo.Settings{Samples: 10_000, Seed: 1}, 1e-3, "test")
	for ci, c := range cspec.Curves {
		key := c.Name
		if key == "any mode" {
			key = "any"
		}
		for i, pt := range drawn[ci] {
			want := doc.Steps[i].Modes[key]
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
	doc := Simulation(s, r, 0, "test")
	pf, _, err := PreloadFigure(s, r, units.SI)
	if err != nil {
		t.Fatal(err)
	}
	prov := Provenance{Version: "test", Command: "boltrisk simulate", Seed: 3, Samples: 20_000, Workers: 2,
		Date: time.Date(2026, 12, 2, 0, 0, 0, 0, time.UTC), Inputs: []*scenario.Scenario{s}}
	rev := SimulationReview(s, doc, []Figure{pf}, prov, units.SI)
	var md, html bytes.Buffer
	if err := rev.WriteMarkdown(&md); err != nil {
		t.Fatal(err)
	}
	if err := rev.WriteHTML(&html); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"CAUTION", "slip", "SHA-256 " + s.SHA256, "2026-12-02T00:00:00Z", "seed", "![", "preload.png", "normal(", "Percentiles"} {
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
	doc := Simulation(s, r, 0, "test")
	found := false
	for _, w := range doc.Warnings {
		found = found || strings.Contains(w, "no input has a distribution")
	}
	if !found || r.Samples != 1000 {
		t.Errorf("samples %d, warnings %q", r.Samples, doc.Warnings)
	}
}
