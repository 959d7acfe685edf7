package report

import (
	"bytes"
	"context"
	"fmt"
	"image/png"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
	"boltrisk/plots"
)

// Every mode of the model has its own row in the one style table.
func TestModeStylesCoverEveryMode(t *testing.T) {
	t.Parallel()
	for m := range model.NumModes {
		if !plots.HasModeStyle(m.Key()) {
			t.Errorf("mode %s has no row in plots' style table (plots/style.go)", m.Key())
		}
	}
	if !plots.HasModeStyle(plots.AnyMode) {
		t.Error("any mode has no style")
	}
}

// Every figure builder names each mode's series by the mode's key, so that
// a mode has one colour, dash and marker in every picture; the names are
// the mode titles.
func TestFigureBuildersShareModeStyles(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	set := montecarlo.Settings{Samples: 20_000, Seed: 5}
	r, err := montecarlo.Run(context.Background(), &s.Problem, set)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := study.Run(context.Background(), &s.Problem, study.Vary{Kind: study.Load, Lo: 0.8, Hi: 1.5, Steps: 3}, set, 0)
	if err != nil {
		t.Fatal(err)
	}
	pr, err := montecarlo.RunPaired(context.Background(), []*montecarlo.Problem{&s.Problem, &s.Problem}, set)
	if err != nil {
		t.Fatal(err)
	}
	type series struct{ builder, name, key string }
	var all []series
	for i := range r.Modes {
		all = append(all, series{"safety-factor histogram", r.Modes[i].Mode.Title(), SafetyFactorSpec(s, r, i).Key})
		_, spec, err := ExceedanceFigure(s, r, i, interval.Auto)
		if err != nil {
			t.Fatal(err)
		}
		all = append(all, series{"exceedance", spec.Name, spec.Key})
	}
	for _, c := range Curves(sw) {
		all = append(all, series{"curve", c.Name, c.Key})
	}
	for _, g := range Groups(pr) {
		all = append(all, series{"comparison", g.Name, g.Key})
	}
	_, pspec, err := PreloadFigure(s, r, units.SI)
	if err != nil {
		t.Fatal(err)
	}
	titles := map[string]string{plots.AnyMode: "any mode"}
	for m := range model.NumModes {
		titles[m.Key()] = m.Title()
	}
	for _, mk := range pspec.Markers {
		if _, ok := titles[mk.Key]; !ok {
			t.Errorf("preload marker %q has no mode key (%q)", mk.Label, mk.Key)
		}
	}
	byKey := map[string]string{}
	for _, sr := range all {
		title, ok := titles[sr.key]
		if !ok || title != sr.name {
			t.Errorf("%s series %q has key %q (mode title %q)", sr.builder, sr.name, sr.key, title)
			continue
		}
		st := fmt.Sprint(plots.ModeStyle(sr.key))
		if prev, ok := byKey[sr.key]; ok && prev != st {
			t.Errorf("%s draws %s in another style", sr.builder, sr.key)
		}
		byKey[sr.key] = st
	}
	if len(byKey) != len(r.Modes)+1 {
		t.Errorf("%d keyed series for %d modes and any", len(byKey), len(r.Modes))
	}
}

// The exceedance points are exact counts of the values below x over the
// sketch's total: monotone, each inside its band, the band the interval
// the run would report for the same counts.
func TestExceedanceCounts(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(7, 11))
	vals := make([]float64, 50_000)
	for i := range vals {
		vals[i] = math.Exp(0.6 + 0.25*rng.NormFloat64())
	}
	sk := quantile.FromPilot(vals[:4096], quantile.Bins)
	for _, v := range vals {
		sk.Add(v)
	}
	for _, v := range []float64{0.05, 0.1, 0.2} { // far below the pilot's range: counted under the bins
		sk.Add(v)
		vals = append(vals, v)
	}
	for _, m := range []interval.Method{interval.Auto, interval.Wilson, interval.Exact} {
		pts := Exceedance(&sk, 0.95, m)
		if len(pts) < 50 || len(pts) > 2000 {
			t.Fatalf("%v: %d points", m, len(pts))
		}
		if pts[0].Count != 0 || pts[0].X != 0.05 || !pts[0].UpperOnly {
			t.Errorf("%v: first point %+v, want the lowest value with count 0", m, pts[0])
		}
		for i, pt := range pts {
			var below int64
			for _, v := range vals {
				if v < pt.X {
					below++
				}
			}
			if pt.Count != below || pt.N != int64(len(vals)) || pt.P != float64(pt.Count)/float64(pt.N) {
				t.Errorf("%v: point %d at %g: %d of %d (P %g), counted %d of %d", m, i, pt.X, pt.Count, pt.N, pt.P, below, len(vals))
			}
			want := interval.Proportion(pt.Count, pt.N, 0.95, m)
			if pt.Lo != want.Lo || pt.Hi != want.Hi || pt.UpperOnly != (pt.Count == 0) {
				t.Errorf("%v: point %d band [%g, %g], interval [%g, %g]", m, i, pt.Lo, pt.Hi, want.Lo, want.Hi)
			}
			if !(pt.Lo <= pt.P && pt.P <= pt.Hi) {
				t.Errorf("%v: point %d: P %g outside its band [%g, %g]", m, i, pt.P, pt.Lo, pt.Hi)
			}
			if i > 0 && (pt.X <= pts[i-1].X || pt.Count < pts[i-1].Count) {
				t.Errorf("%v: points %d, %d not monotone: %+v, %+v", m, i-1, i, pts[i-1], pt)
			}
		}
		if last := pts[len(pts)-1]; float64(last.Count) < 0.9995*float64(last.N) {
			t.Errorf("%v: the curve stops at %g", m, last.P)
		}
	}
	var empty quantile.Sketch
	if pts := Exceedance(&empty, 0.95, interval.Auto); pts != nil {
		t.Errorf("empty sketch: %d points", len(pts))
	}
}

// The exceedance figure of a run: the failure point is the run's estimate,
// the picture decodes, and a long scenario name does not break it.
func TestExceedanceFigure(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	s.Name = strings.Repeat("A long scenario name ", 6)[:120]
	r, err := montecarlo.Run(context.Background(), &s.Problem, montecarlo.Settings{Samples: 30_000, Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	figs, err := ExceedanceFigures(s, r, interval.Auto)
	if err != nil || len(figs) != len(r.Modes) {
		t.Fatalf("%d exceedance figures for %d modes (%v)", len(figs), len(r.Modes), err)
	}
	for i, f := range figs {
		m := r.Modes[i]
		if f.File != "exceed-"+m.Mode.Key()+".png" {
			t.Errorf("file %s for mode %s", f.File, m.Mode.Key())
		}
		if _, err := png.Decode(bytes.NewReader(f.PNG)); err != nil {
			t.Errorf("%s: %v", f.File, err)
		}
		_, spec, err := ExceedanceFigure(s, r, i, interval.Auto)
		if err != nil {
			t.Fatal(err)
		}
		e := m.Estimate
		if fp := spec.Failure; fp.Count != e.Failures || fp.N != e.Samples || fp.P != float64(e.Failures)/float64(e.Samples) || fp.Hi != e.Hi {
			t.Errorf("%s: failure point %+v, estimate %+v", m.Mode.Key(), fp, e)
		}
		for _, pt := range spec.Points {
			if pt.N != m.SF.Sketch.Total() {
				t.Errorf("%s: a point of %d values, the sketch holds %d", m.Mode.Key(), pt.N, m.SF.Sketch.Total())
				break
			}
		}
	}
}

func TestAxisLabelsTypeset(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ name, unit, want string }{
		{"nominal torque", "N*m", "nominal torque (N·m)"},
		{"nominal torque", "lbf*ft", "nominal torque (lbf·ft)"},
		{"area", "mm^2", "area (mm²)"},
		{"nominal nut factor", "", "nominal nut factor"},
	} {
		if got := axisLabel(c.name, c.unit); got != c.want {
			t.Errorf("axisLabel(%q, %q) = %q, want %q", c.name, c.unit, got, c.want)
		}
	}
	if got := fieldLabel("tightening.torque"); got != "torque" {
		t.Errorf("label of tightening.torque: %q", got)
	}
	if got := lowerFirst("Yield in assembly"); got != "yield in assembly" {
		t.Errorf("lowerFirst: %q", got)
	}
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	if got := modeName(s, model.Fatigue); !strings.Contains(got, "Goodman") {
		t.Errorf("fatigue is %q, want the criterion typeset (Goodman)", got)
	}
}
