package plots

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// BarGroup is one group of bars (a failure mode): one signed value per
// series (an input).
type BarGroup struct {
	Name   string
	Values []float64
}

// BarGroupPlot draws one group of bars per BarGroup, a bar per series side
// by side, on a linear axis through zero (signed values: below zero for
// resistance-like inputs).
func BarGroupPlot(title, ylabel string, series []string, groups []BarGroup) (*plot.Plot, error) {
	p := newPlot(title, "", ylabel)
	ns := len(series)
	if ns == 0 || len(groups) == 0 {
		return nil, fmt.Errorf("plots: a bar-group plot needs series and groups")
	}
	// About 70 % of the data width (≈ 400 pt of the 576 pt picture beside
	// the legend) shared by the bars: gaps stay between the groups.
	w := vg.Points(min(48, 280/float64(ns*len(groups))))
	lo, hi := 0.0, 0.0
	for si, name := range series {
		vals := make(plotter.Values, len(groups))
		for gi, g := range groups {
			if si < len(g.Values) {
				vals[gi] = g.Values[si]
				lo, hi = math.Min(lo, vals[gi]), math.Max(hi, vals[gi])
			}
		}
		b, err := plotter.NewBarChart(vals, w)
		if err != nil {
			return nil, err
		}
		col, _, _ := Series(si)
		b.Color = col
		b.LineStyle.Width = 0
		b.Offset = vg.Length(float64(si)-float64(ns-1)/2) * w
		p.Add(b)
		p.Legend.Add(name, b)
	}
	p.Add(plotter.NewGrid())
	names := make([]string, len(groups))
	for i, g := range groups {
		names[i] = g.Name
	}
	p.NominalX(names...)
	p.Legend.Top = true
	pad := 0.06 * math.Max(hi-lo, 1e-9) // headroom: no bar ends on the frame
	p.Y.Min, p.Y.Max = lo-pad, hi+pad
	return p, nil
}
