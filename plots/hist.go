package plots

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// Hist is a histogram of equal bins over [Lo, Hi) with the values below
// and above counted apart. Counts may be fractional: a sampled
// distribution regrouped into display bins splits its own bins' counts.
type Hist struct {
	Lo, Hi      float64
	Counts      []float64
	Under, Over float64
}

// Total returns the number of values counted, inside and outside the range.
func (h Hist) Total() float64 {
	t := h.Under + h.Over
	for _, c := range h.Counts {
		t += c
	}
	return t
}

// Bars merges the bins into at most n display bins, drops the empty ones at
// both ends, and expresses the edges in display units (values divided by
// scale). Weights are counts: they add up to the values inside [Lo, Hi).
func (h Hist) Bars(n int, scale float64) []plotter.HistogramBin {
	g := (len(h.Counts) + n - 1) / n
	if g < 1 {
		g = 1
	}
	w := (h.Hi - h.Lo) / float64(len(h.Counts))
	var bins []plotter.HistogramBin
	for i := 0; i < len(h.Counts); i += g {
		var c float64
		j := min(i+g, len(h.Counts))
		for _, x := range h.Counts[i:j] {
			c += x
		}
		bins = append(bins, plotter.HistogramBin{Min: (h.Lo + w*float64(i)) / scale, Max: (h.Lo + w*float64(j)) / scale, Weight: c})
	}
	a, b := 0, len(bins)
	for a < b && bins[a].Weight == 0 {
		a++
	}
	for b > a && bins[b-1].Weight == 0 {
		b--
	}
	return bins[a:b]
}

// Marker is a vertical line on a histogram, at X in the data's units.
type Marker struct {
	X     float64
	Label string
	// Key is the mode key whose style the line takes ([ModeStyle]); Ref
	// draws the black dashed reference line (the failure line at 1).
	// Without either the marker takes series style i+1.
	Key string
	Ref bool
}

// HistSpec describes a histogram picture.
type HistSpec struct {
	Title, XLabel string
	Key           string // mode key: bars in the mode's colour ("" neutral)
	Hist          Hist
	Scale         float64 // values are divided by Scale for display
	Bins          int     // display bins (default 50)
	Markers       []Marker
	Notes         []string // extra legend lines, e.g. the share outside a window
}

// HistogramPlot draws a histogram of counts with vertical marker lines. It
// returns the bars it drew (display units) so that callers can check them.
// Markers far outside the data (more than half the data's span beyond it)
// are listed in the legend as off the edge instead of squeezing the bars.
func HistogramPlot(s HistSpec) (*plot.Plot, []plotter.HistogramBin, error) {
	if s.Scale == 0 {
		s.Scale = 1
	}
	if s.Bins == 0 {
		s.Bins = 50
	}
	bars := s.Hist.Bars(s.Bins, s.Scale)
	p := newPlot(s.Title, s.XLabel, "samples per bin")
	if len(bars) == 0 {
		p.Legend.Add("no sample fell inside the plotted range")
		return p, bars, nil
	}
	fill, edge := color.NRGBA{R: 190, G: 190, B: 190, A: 255}, Palette[cGrey] // neutral: not a mode's colour
	if s.Key != "" {
		c := ModeStyle(s.Key).Color
		fill, edge = withAlpha(c, 90), c
	}
	h := &plotter.Histogram{Bins: bars, Width: bars[0].Max - bars[0].Min, FillColor: fill}
	h.LineStyle.Width = vg.Points(0.5)
	h.LineStyle.Color = edge
	p.Add(h)
	xmin, xmax := bars[0].Min, bars[len(bars)-1].Max
	ymax := 0.0
	for _, b := range bars {
		ymax = math.Max(ymax, b.Weight)
	}
	span := xmax - xmin
	lo, hi := xmin, xmax
	for i, m := range s.Markers {
		x := m.X / s.Scale
		if x < xmin-span/2 || x > xmax+span/2 || math.IsNaN(x) || math.IsInf(x, 0) {
			side := "right"
			if x < xmin {
				side = "left"
			}
			p.Legend.Add(fmt.Sprintf("%s (off the %s edge)", m.Label, side))
			continue
		}
		lo, hi = math.Min(lo, x), math.Max(hi, x)
		l, err := plotter.NewLine(plotter.XYs{{X: x, Y: 0}, {X: x, Y: ymax * 1.05}})
		if err != nil {
			return nil, nil, err
		}
		switch {
		case m.Ref:
			l.LineStyle = failureLine
			l.Width = vg.Points(2)
		default:
			styleOf(m.Key, i+1).Line(l, vg.Points(2))
		}
		p.Add(l)
		p.Legend.Add(m.Label, l)
	}
	for _, n := range s.Notes {
		p.Legend.Add(n)
	}
	pad := (hi - lo) * 0.03
	p.X.Min, p.X.Max = lo-pad, hi+pad
	p.Y.Min, p.Y.Max = 0, ymax*1.05
	return p, bars, nil
}

// Overlay is one distribution of several drawn on one picture.
type Overlay struct {
	Name string
	Hist Hist
}

// OverlayPlot draws several histograms of the same bins as step lines of the
// share of samples per bin, so that variants can be compared by shape.
func OverlayPlot(title, xlabel string, scale float64, bins int, hs []Overlay) (*plot.Plot, error) {
	p := newPlot(title, xlabel, "share of samples per bin")
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, o := range hs {
		bars := o.Hist.Bars(bins, scale)
		total := o.Hist.Total()
		if len(bars) == 0 || total == 0 {
			p.Legend.Add(o.Name + ": no samples in range")
			continue
		}
		var xy plotter.XYs
		for _, b := range bars {
			xy = append(xy, plotter.XY{X: b.Min, Y: b.Weight / total}, plotter.XY{X: b.Max, Y: b.Weight / total})
		}
		xy = append(plotter.XYs{{X: bars[0].Min, Y: 0}}, append(xy, plotter.XY{X: bars[len(bars)-1].Max, Y: 0})...)
		l, err := plotter.NewLine(xy)
		if err != nil {
			return nil, err
		}
		c, d, _ := Series(i)
		l.Color, l.Dashes, l.Width = c, d, vg.Points(2)
		p.Add(l)
		p.Legend.Add(o.Name, l)
		lo, hi = math.Min(lo, bars[0].Min), math.Max(hi, bars[len(bars)-1].Max)
	}
	if lo < hi {
		p.X.Min, p.X.Max = lo, hi
	}
	p.Y.Min = 0
	p.Y.Max *= 1.05
	return p, nil
}
