package plots

import (
	"fmt"
	"math"
	"strconv"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// Paper is a probability paper: the scale on which a family's CDF is a
// straight line.
type Paper uint8

const (
	NormalPaper    Paper = iota // Φ⁻¹(p) against x
	LognormalPaper              // Φ⁻¹(p) against log x
	WeibullPaper                // ln(−ln(1 − p)) against log x
)

func (p Paper) String() string { return [...]string{"normal", "lognormal", "Weibull"}[p] }

// Y maps a probability onto the paper's axis.
func (p Paper) Y(prob float64) float64 {
	if p == WeibullPaper {
		return math.Log(-math.Log1p(-prob))
	}
	return mathext.NormalQuantile(prob)
}

// P is the inverse of Y.
func (p Paper) P(y float64) float64 {
	if p == WeibullPaper {
		return -math.Expm1(-math.Exp(y))
	}
	return 0.5 * math.Erfc(-y/math.Sqrt2)
}

// LogX reports whether the value axis is logarithmic.
func (p Paper) LogX() bool { return p != NormalPaper }

// ProbPoint is a value at a probability; ProbBand the band at a point.
type (
	ProbPoint struct{ X, P float64 }
	ProbBand  struct{ P, Lo, Hi float64 }
)

// ProbabilityData is the data of a probability plot, values in the display
// unit.
type ProbabilityData struct {
	Family     string // name of the fitted family
	Paper      Paper
	N, Shown   int    // the sample size and the points shown
	Positions  string // the plotting positions used
	Points     []ProbPoint
	Line       []ProbPoint // the fitted CDF
	Band       []ProbBand  // pointwise band, one per point
	Confidence float64     // of the band
}

// ProbabilitySpec describes a probability plot of a sample against a
// fitted distribution.
type ProbabilitySpec struct {
	Title  string
	XLabel string // value axis, with its unit: "preload (kN)"
	Data   ProbabilityData
	Fitted string // legend of the fitted line; "" gives "<family> fit"
}

// ProbabilityPlot draws the ordered data at their plotting positions on the
// fitted family's probability paper (normal, lognormal or Weibull), the
// fitted CDF, and the pointwise band of the order statistics. The
// probability axis is labelled in per cent (1 %, 10 %, 50 %, 90 %, 99 % …);
// the legend sits in the upper left, which the rising points leave empty.
func ProbabilityPlot(s ProbabilitySpec) (*plot.Plot, error) {
	d := s.Data
	if len(d.Points) == 0 || len(d.Band) != len(d.Points) || len(d.Line) < 2 {
		return nil, fmt.Errorf("plots: probability plot without data")
	}
	paper := d.Paper
	yScale := "normal quantile scale" // Φ⁻¹(p), the y axis of normal and lognormal paper
	if paper == WeibullPaper {
		yScale = "Weibull scale, ln(−ln(1 − p))"
	}
	p := newPlot(s.Title, s.XLabel, "cumulative probability ("+yScale+")")
	p.Legend.Top, p.Legend.Left = true, true
	p.Legend.XOffs, p.Legend.YOffs = vg.Points(6), -vg.Points(6)
	p.Legend.Padding = vg.Points(2)

	// Ranges: the probability axis spans the plotted positions with a
	// margin; the upper margin leaves room for the legend in the empty
	// upper-left corner.
	y0, y1 := paper.Y(d.Points[0].P), paper.Y(d.Points[len(d.Points)-1].P)
	span := y1 - y0
	p.Y.Scale = probScale{paper}
	p.Y.Tick.Marker = percentTicks{paper}
	p.Y.Min, p.Y.Max = paper.P(y0-0.08*span), paper.P(y1+0.30*span)

	xmin, xmax := math.Inf(1), math.Inf(-1)
	for i, pt := range d.Points {
		xmin = math.Min(xmin, math.Min(pt.X, d.Band[i].Lo))
		xmax = math.Max(xmax, math.Max(pt.X, d.Band[i].Hi))
	}
	for _, pt := range d.Line {
		xmin, xmax = math.Min(xmin, pt.X), math.Max(xmax, pt.X)
	}
	if paper.LogX() {
		if !(xmin > 0) {
			return nil, fmt.Errorf("plots: %s paper needs values > 0", paper)
		}
		r := math.Log10(xmax / xmin)
		xmin, xmax = xmin/math.Pow(10, 0.05*r+0.02), xmax*math.Pow(10, 0.05*r+0.02)
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = logTicks125{}
	} else {
		r := xmax - xmin
		xmin, xmax = xmin-0.05*r, xmax+0.05*r
	}
	p.X.Min, p.X.Max = xmin, xmax

	ring := make(plotter.XYs, 0, 2*len(d.Band))
	for _, b := range d.Band {
		ring = append(ring, plotter.XY{X: b.Lo, Y: b.P})
	}
	for i := len(d.Band) - 1; i >= 0; i-- {
		ring = append(ring, plotter.XY{X: d.Band[i].Hi, Y: d.Band[i].P})
	}
	band, err := plotter.NewPolygon(ring)
	if err != nil {
		return nil, err
	}
	band.Color = withAlpha(Palette[0], 45)
	band.LineStyle.Width = 0

	line := make(plotter.XYs, len(d.Line))
	for i, pt := range d.Line {
		line[i] = plotter.XY{X: pt.X, Y: pt.P}
	}
	l, err := plotter.NewLine(line)
	if err != nil {
		return nil, err
	}
	l.Color, l.Width = Palette[0], vg.Points(2)

	pts := make(plotter.XYs, len(d.Points))
	for i, pt := range d.Points {
		pts[i] = plotter.XY{X: pt.X, Y: pt.P}
	}
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, err
	}
	sc.Color, sc.Shape, sc.Radius = Palette[1], shapes[0], vg.Points(3)
	if len(pts) > 300 {
		sc.Radius = vg.Points(1.5)
	}
	p.Add(band, l, sc)

	name := s.Fitted
	if name == "" {
		name = d.Family + " fit"
	}
	data := fmt.Sprintf("data, n = %d", d.N)
	if d.Shown < d.N {
		data += fmt.Sprintf(" (%d shown)", d.Shown)
	}
	p.Legend.Add(data+", "+d.Positions, sc)
	p.Legend.Add(name, l)
	p.Legend.Add(fmt.Sprintf("%s %% band of the order statistics", strconv.FormatFloat(100*d.Confidence, 'f', -1, 64)), band)
	return p, nil
}

// probScale maps probabilities onto the paper's axis: Φ⁻¹(p) or
// ln(−ln(1 − p)).
type probScale struct{ paper Paper }

func (s probScale) Normalize(lo, hi, x float64) float64 {
	a, b := s.paper.Y(lo), s.paper.Y(hi)
	return (s.paper.Y(x) - a) / (b - a)
}

// percentTicks labels a probability axis in per cent at the usual values
// of probability paper.
type percentTicks struct{ paper Paper }

func (t percentTicks) Ticks(lo, hi float64) []plot.Tick {
	major := []float64{1e-6, 1e-5, 1e-4, 1e-3, 0.01, 0.05, 0.1, 0.2, 0.3, 0.5, 0.7, 0.8, 0.9, 0.95, 0.99, 0.999, 0.9999, 0.99999}
	if t.paper == WeibullPaper {
		major = []float64{1e-6, 1e-5, 1e-4, 1e-3, 0.01, 0.02, 0.05, 0.1, 0.2, 0.3, 0.5, 0.632, 0.8, 0.9, 0.95, 0.99, 0.999}
	}
	var out []plot.Tick
	for _, v := range major {
		if v < lo || v > hi {
			continue
		}
		out = append(out, plot.Tick{Value: v, Label: percent(v)})
	}
	if len(out) < 2 { // a narrow range: the default ticks, in per cent
		for _, tk := range (plot.DefaultTicks{}).Ticks(lo, hi) {
			if tk.Label != "" {
				tk.Label = percent(tk.Value)
			}
			out = append(out, tk)
		}
	}
	return out
}

func percent(v float64) string {
	return strconv.FormatFloat(100*v, 'g', 4, 64) + " %"
}

// logTicks125 labels a logarithmic value axis at 1, 2 and 5 of each decade
// (every integer multiple when the axis spans less than a decade), with
// unlabelled minor ticks between; an axis too narrow for three such labels
// (0.15 … 0.3, say) takes the round values of a linear axis instead.
type logTicks125 struct{}

func (logTicks125) Ticks(lo, hi float64) []plot.Tick {
	out := logTicks(lo, hi)
	labelled := 0
	for _, t := range out {
		if t.Label != "" {
			labelled++
		}
	}
	if labelled < 3 {
		return plainTicks{}.Ticks(lo, hi)
	}
	return out
}

func logTicks(lo, hi float64) []plot.Tick {
	var out []plot.Tick
	labels := []float64{1, 2, 5}
	if hi/lo < 10 {
		labels = []float64{1, 2, 3, 4, 5, 6, 7, 8, 9}
	}
	if hi/lo > 1e4 {
		labels = []float64{1}
	}
	for e := math.Floor(math.Log10(lo)); e <= math.Ceil(math.Log10(hi)); e++ {
		dec := math.Pow(10, e)
		for m := 1.0; m < 10; m++ {
			v := m * dec
			if v < lo || v > hi {
				continue
			}
			tk := plot.Tick{Value: v}
			for _, l := range labels {
				if m == l {
					tk.Label = strconv.FormatFloat(v, 'g', 6, 64)
				}
			}
			out = append(out, tk)
		}
	}
	return out
}
