package report

import (
	"fmt"
	"math"
	"strings"
	"time"

	"gonum.org/v1/plot"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/quantile"
	"boltrisk/montecarlo/scenario"
	"boltrisk/montecarlo/study"
	"boltrisk/plots"
)

// Provenance identifies how a result was made.
type Provenance struct {
	Version string
	Command string
	Seed    uint64
	// Requested and valid samples, and the workers that ran.
	Requested, Samples int64
	Workers            int
	Date               time.Time
	Inputs             []*scenario.Scenario
}

func (p Provenance) rows() [][2]string {
	rows := [][2]string{
		{"tool", "boltrisk " + p.Version},
		{"command", p.Command},
		{"seed", fmt.Sprint(p.Seed)},
		{"samples", fmt.Sprintf("%d requested, %d valid", p.Requested, p.Samples)},
		{"workers", fmt.Sprintf("%d (results do not depend on it)", p.Workers)},
		{"date", p.Date.UTC().Format(time.RFC3339)},
	}
	seen := map[string]bool{}
	for _, s := range p.Inputs {
		name := s.File
		if name == "" {
			name = "built-in example"
		}
		if seen[name+s.SHA256] {
			continue
		}
		seen[name+s.SHA256] = true
		rows = append(rows, [2]string{"input " + name, "SHA-256 " + s.SHA256})
		rows = append(rows, dataRows(s, seen)...) // fitdata.go
	}
	return rows
}

// displayBins is the number of bars of a histogram picture.
const displayBins = 400

// Hist regroups a sketch into equal display bins over its central 99.9 %
// for pictures; the values outside count as below and above.
func Hist(h *quantile.Sketch) plots.Hist {
	n := float64(h.Total())
	if n == 0 {
		return plots.Hist{Lo: 0, Hi: 1, Counts: make([]float64, displayBins)}
	}
	lo, hi := h.Quantile(0.0005).Value, h.Quantile(0.9995).Value
	if !(hi > lo) {
		lo, hi = lo-math.Max(math.Abs(lo)*1e-3, 1e-9), hi+math.Max(math.Abs(hi)*1e-3, 1e-9)
	}
	out := plots.Hist{Lo: lo, Hi: hi, Counts: make([]float64, displayBins)}
	in := 0.0
	for i, b := range h.Bars(lo, hi, displayBins) {
		out.Counts[i] = b.Count
		in += b.Count
	}
	out.Under = math.Min(h.FractionBelow(lo)*n, n-in)
	out.Over = math.Max(n-in-out.Under, 0)
	return out
}

func figure(p *plot.Plot, file, caption string) (Figure, error) {
	b, err := plots.PNG(p)
	if err != nil {
		return Figure{}, fmt.Errorf("drawing %s: %w", file, err)
	}
	return Figure{File: file, Caption: caption, PNG: b}, nil
}

// PreloadFigure draws the residual preload of every bolt with the preload
// window marked and the share of samples outside it.
func PreloadFigure(s *scenario.Scenario, r *montecarlo.Result, sys units.System) (Figure, plots.HistSpec, error) {
	w := r.Nominal.Window
	unit, scale := forceUnit(sys)
	h := &r.Quantities[montecarlo.QPreload].Sketch
	markers := []plots.Marker{
		{X: w.ProofMax, Label: "greatest below proof load " + sys.Format(w.ProofMax, units.Force), Key: model.Proof.Key()},
		{X: w.AssemblyMax, Label: "greatest before yield in assembly " + sys.Format(w.AssemblyMax, units.Force) + " (on assembly preload)", Key: model.AssemblyYield.Key()},
	}
	below := 0.0
	if w.SeparationMin > 0 {
		markers = append([]plots.Marker{{X: w.SeparationMin, Label: "least against separation " + sys.Format(w.SeparationMin, units.Force), Key: model.Separation.Key()}}, markers...)
		below = h.FractionBelow(w.SeparationMin)
	}
	if w.SlipMin > 0 {
		markers = append(markers, plots.Marker{X: w.SlipMin, Label: "least against slip " + sys.Format(w.SlipMin, units.Force), Key: model.Slip.Key()})
		below = h.FractionBelow(w.SlipMin)
	}
	above := 1 - h.FractionBelow(w.ProofMax)
	spec := plots.HistSpec{
		Title:   "Residual preload per bolt (" + titleOf(s) + ")",
		XLabel:  "residual preload after embedding and relaxation (" + unit + ")",
		Hist:    Hist(h),
		Scale:   scale,
		Markers: markers,
		Notes: []string{
			fmt.Sprintf("below the window: %s of bolt samples", pct(below)),
			fmt.Sprintf("above the proof limit: %s of bolt samples", pct(above)),
		},
	}
	if r.Binned < r.Samples {
		spec.Notes = append(spec.Notes, binnedBars(r))
	}
	p, _, err := plots.HistogramPlot(spec)
	if err != nil {
		return Figure{}, spec, err
	}
	f, err := figure(p, "preload.png", "Residual preload of every bolt in every sample, with the preload window: the least preload that avoids separation (and slip) at the largest load, the greatest that stays below the proof load, and the greatest assembly preload before yield in tightening.")
	return f, spec, err
}

// binnedBars notes that a large run's bars rest on one chunk in k.
func binnedBars(r *montecarlo.Result) string {
	return fmt.Sprintf("bars: %d samples, one chunk in %d", r.Binned, r.BinStride)
}

func pct(f float64) string {
	if math.IsNaN(f) || f <= 0 {
		return "0 %"
	}
	return fmt.Sprintf("%.3g %%", 100*f)
}

func forceUnit(sys units.System) (string, float64) {
	_, f := sys.Unit(units.Force)
	if sys == units.US {
		return "kip", f * 1000
	}
	return "kN", f * 1000
}

// SafetyFactorFigures draws one safety-factor histogram per reported mode,
// with the failure line at 1.
func SafetyFactorFigures(s *scenario.Scenario, r *montecarlo.Result) ([]Figure, error) {
	var out []Figure
	for i := range r.Modes {
		m := &r.Modes[i]
		spec := SafetyFactorSpec(s, r, i)
		p, _, err := plots.HistogramPlot(spec)
		if err != nil {
			return nil, err
		}
		f, err := figure(p, "sf-"+m.Mode.Key()+".png", fmt.Sprintf("Safety factor of %s over all samples; the mode fails left of the line at 1.", lowerFirst(modeName(s, m.Mode))))
		if err != nil {
			return nil, err
		}
		out = append(out, f)
	}
	return out, nil
}

// SafetyFactorSpec is the histogram of the i-th reported mode's safety
// factor, in the mode's style.
func SafetyFactorSpec(s *scenario.Scenario, r *montecarlo.Result, i int) plots.HistSpec {
	m := &r.Modes[i]
	spec := plots.HistSpec{
		Title:   fmt.Sprintf("Safety factor, %s (%s)", modeName(s, m.Mode), titleOf(s)),
		XLabel:  sfLabel(s, m.Mode),
		Key:     m.Mode.Key(),
		Hist:    Hist(&m.SF.Sketch),
		Markers: []plots.Marker{{X: 1, Label: "failure at 1", Ref: true}},
		Notes:   []string{fmt.Sprintf("failures: %d of %d samples", m.Estimate.Failures, m.Estimate.Samples)},
	}
	if r.Binned < r.Samples {
		spec.Notes = append(spec.Notes, binnedBars(r))
	}
	return spec
}

// Curves converts a sweep into plot curves, one per mode and one for any mode.
func Curves(sw *study.Sweep) []plots.Curve {
	if len(sw.Steps) == 0 {
		return nil
	}
	var out []plots.Curve
	add := func(name string, get func(*montecarlo.Result) interval.Estimate) {
		c := plots.Curve{Name: name}
		for _, st := range sw.Steps {
			if st.TooFewValid {
				continue
			}
			iv := get(st.Result)
			c.X = append(c.X, st.X)
			c.P, c.Lo, c.Hi = append(c.P, iv.P), append(c.Lo, iv.Lo), append(c.Hi, iv.Hi)
			c.UpperOnly = append(c.UpperOnly, iv.UpperOnly())
		}
		out = append(out, c)
	}
	for i, m := range sw.Steps[0].Result.Modes {
		add(m.Mode.Title(), func(r *montecarlo.Result) interval.Estimate { return r.Modes[i].Estimate })
		out[len(out)-1].Key = m.Mode.Key()
	}
	add("any mode", func(r *montecarlo.Result) interval.Estimate { return r.Any })
	out[len(out)-1].Key = plots.AnyMode
	return out
}

// CurveFigure draws the reliability curve of a sweep.
func CurveFigure(s *scenario.Scenario, sw *study.Sweep, sys units.System, file, title string) (Figure, plots.CurveSpec, error) {
	v := sw.Vary
	if v.Path != "" { // a title naming the varied input names it by its label
		title = strings.ReplaceAll(title, v.Path, fieldLabel(v.Path))
	}
	spec := plots.CurveSpec{Title: title + " (" + titleOf(s) + ")", Curves: Curves(sw), Scale: 1}
	switch v.Kind {
	case study.Input:
		dim := scenario.FieldDim(v.Path)
		u, f := sys.Unit(dim)
		if dim == units.Force {
			u, f = forceUnit(sys)
		}
		spec.Scale = f
		spec.XLabel = axisLabel("nominal "+fieldLabel(v.Path), u)
	case study.Load:
		spec.XLabel = "multiplier on the service loads (1 = scenario)"
	case study.Spread:
		spec.XLabel = "multiplier on the scatter of the " + fieldLabel(v.Path) + " (1 = scenario)"
	}
	caption := "Failure probability of each mode (log scale) with its confidence band; downward triangles are upper bounds where no sample failed."
	if w := sw.Window; w != nil {
		spec.Target = w.Target
		if w.Found {
			spec.Window = [2]float64{w.Lo, w.Hi}
			caption += fmt.Sprintf(" The shaded window meets the target %.3g.", w.Target)
		} else {
			caption += fmt.Sprintf(" No value in the range meets the target %.3g.", w.Target)
		}
	}
	p, _, err := plots.CurvePlot(spec)
	if err != nil {
		return Figure{}, spec, err
	}
	f, err := figure(p, file, caption)
	return f, spec, err
}

// CompareFigures draws the preload overlay of the variants and their
// per-mode probabilities side by side.
func CompareFigures(names []string, pr *montecarlo.Paired, sys units.System) ([]Figure, error) {
	unit, scale := forceUnit(sys)
	// Common display bins over every variant's central range.
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, r := range pr.Variants {
		h := Hist(&r.Quantities[montecarlo.QPreload].Sketch)
		lo, hi = math.Min(lo, h.Lo), math.Max(hi, h.Hi)
	}
	var ov []plots.Overlay
	for i, r := range pr.Variants {
		sk := &r.Quantities[montecarlo.QPreload].Sketch
		h := plots.Hist{Lo: lo, Hi: hi, Counts: make([]float64, displayBins)}
		for j, b := range sk.Bars(lo, hi, displayBins) {
			h.Counts[j] = b.Count
		}
		ov = append(ov, plots.Overlay{Name: names[i], Hist: h})
	}
	p, err := plots.OverlayPlot("Residual preload per bolt, by variant", "residual preload ("+unit+")", scale, 60, ov)
	if err != nil {
		return nil, err
	}
	f1, err := figure(p, "compare-preload.png", "Distribution of the residual preload of every bolt for each variant (the same draws of every shared input).")
	if err != nil {
		return nil, err
	}
	p, err = plots.GroupPlot("Failure probability by mode and variant", names, Groups(pr))
	if err != nil {
		return nil, err
	}
	f2, err := figure(p, "compare-modes.png", "Failure probability of each mode for each variant with its confidence interval (log scale).")
	if err != nil {
		return nil, err
	}
	return []Figure{f1, f2}, nil
}

// criterionTitles typeset the fatigue criteria for pictures.
var criterionTitles = map[model.Criterion]string{
	model.Goodman:      "Goodman",
	model.Gerber:       "Gerber",
	model.ASMEElliptic: "ASME-elliptic",
	model.Amplitude:    "amplitude without mean-stress correction",
}

// modeName is the mode's title, with the criterion for fatigue.
func modeName(s *scenario.Scenario, m model.Mode) string {
	if m == model.Fatigue {
		c, ok := criterionTitles[s.Inputs().Criterion]
		if !ok {
			c = s.Inputs().Criterion.String()
		}
		return m.Title() + ", " + c + " criterion"
	}
	return m.Title()
}

// sfLabel labels a safety-factor axis with the mode's title.
func sfLabel(s *scenario.Scenario, m model.Mode) string {
	return "safety factor of " + lowerFirst(modeName(s, m)) + " (capacity / demand)"
}

// lowerFirst lower-cases the first letter of a title for use inside a
// sentence ("Yield in assembly" → "yield in assembly"); acronyms stay.
func lowerFirst(t string) string {
	if len(t) > 1 && t[1] >= 'A' && t[1] <= 'Z' {
		return t
	}
	return strings.ToLower(t[:1]) + t[1:]
}

// fieldLabel is the registry's label of an input path ("tightening.torque"
// → "torque"), or the path itself.
func fieldLabel(path string) string {
	for _, f := range scenario.Fields() {
		if f.Path == path && f.Label != "" {
			return f.Label
		}
	}
	return path
}

// typesetUnit writes a unit as it is printed ("N*m" → "N·m", "mm^2" →
// "mm²").
func typesetUnit(u string) string {
	return strings.NewReplacer("*", "·", "^2", "²", "^3", "³").Replace(u)
}

// axisLabel is "name (unit)" with the unit typeset, or the name alone.
func axisLabel(name, unit string) string {
	if unit == "" {
		return name
	}
	return name + " (" + typesetUnit(unit) + ")"
}

// Groups converts a comparison into plot groups, one per mode (in the
// mode's colour) and one for any mode, each with every variant's estimate.
func Groups(pr *montecarlo.Paired) []plots.Group {
	var groups []plots.Group
	add := func(name string, get func(*montecarlo.Result) interval.Estimate) {
		g := plots.Group{Name: name}
		for _, r := range pr.Variants {
			iv := get(r)
			g.P, g.Lo, g.Hi, g.UpperOnly = append(g.P, iv.P), append(g.Lo, iv.Lo), append(g.Hi, iv.Hi), append(g.UpperOnly, iv.UpperOnly())
		}
		groups = append(groups, g)
	}
	for i, m := range pr.Modes {
		add(m.Title(), func(r *montecarlo.Result) interval.Estimate { return r.Modes[i].Estimate })
		groups[len(groups)-1].Key = m.Key()
	}
	add("any mode", func(r *montecarlo.Result) interval.Estimate { return r.Any })
	groups[len(groups)-1].Key = plots.AnyMode
	return groups
}
