package plots

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// ReliabilitySpec describes a reliability-against-cycles picture: R(N)
// with its confidence band on a log-cycles axis.
type ReliabilitySpec struct {
	Title      string
	N          []float64 // cycles, increasing, > 0
	R, Lo, Hi  []float64 // reliability and its band, in [0, 1]
	DesignLife float64   // vertical line (0: none)
}

// ReliabilityPlot draws R(N) as a step line with its band on a log10
// cycles axis and the design life as a dashed vertical line.
func ReliabilityPlot(s ReliabilitySpec) (*plot.Plot, error) {
	n := len(s.N)
	if n < 2 || len(s.R) != n || len(s.Lo) != n || len(s.Hi) != n {
		return nil, fmt.Errorf("plots: reliability curve needs at least 2 points with R, Lo, Hi of the same length (got %d)", n)
	}
	p := newPlot(s.Title, "cycles N (log scale)", "reliability R(N) = P(life > N)")
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	p.Legend.Top, p.Legend.Left = false, true
	line := make(plotter.XYs, n)
	ring := make(plotter.XYs, 0, 2*n)
	for i := range s.N {
		if !(s.N[i] > 0) {
			return nil, fmt.Errorf("plots: cycles %g: must be > 0", s.N[i])
		}
		line[i] = plotter.XY{X: s.N[i], Y: s.R[i]}
		ring = append(ring, plotter.XY{X: s.N[i], Y: s.Hi[i]})
	}
	for i := n - 1; i >= 0; i-- {
		ring = append(ring, plotter.XY{X: s.N[i], Y: s.Lo[i]})
	}
	col, _, _ := Series(0)
	band, err := plotter.NewPolygon(ring)
	if err != nil {
		return nil, err
	}
	band.Color = withAlpha(col, 60)
	band.LineStyle.Width = 0
	l, err := plotter.NewLine(line)
	if err != nil {
		return nil, err
	}
	l.Color, l.Width = col, vg.Points(2)
	p.Add(band, l)
	p.Legend.Add("R(N)", l)
	p.Legend.Add("confidence band", band)
	if d := s.DesignLife; d > 0 {
		v, err := plotter.NewLine(plotter.XYs{{X: d, Y: 0}, {X: d, Y: 1}})
		if err != nil {
			return nil, err
		}
		v.Color, v.Dashes, v.Width = Palette[1], []vg.Length{vg.Points(5), vg.Points(3)}, vg.Points(1.5)
		p.Add(v)
		p.Legend.Add(fmt.Sprintf("design life %.3g", d), v)
	}
	p.X.Min, p.X.Max = s.N[0], s.N[n-1]
	if d := s.DesignLife; d > 0 {
		p.X.Min, p.X.Max = math.Min(p.X.Min, d/2), math.Max(p.X.Max, d*2)
	}
	p.Y.Min, p.Y.Max = 0, 1.02
	return p, nil
}
