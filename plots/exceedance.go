package plots

import (
	"fmt"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// ExceedancePoint is the probability that a value lies below X, estimated
// from Count of N values, with its interval. UpperOnly marks a point where
// no value lay below X: Lo is 0 and Hi the one-sided upper bound.
type ExceedancePoint struct {
	X         float64
	Count, N  int64
	P, Lo, Hi float64
	UpperOnly bool
}

// ExceedanceSpec describes the picture of the probability that a safety
// factor lies below x: the lower tail, where a mode fails, on a log scale.
type ExceedanceSpec struct {
	Title, XLabel string
	YLabel        string // default "probability of a value below x"
	Name          string // the series (the mode's title)
	Key           string // mode key for the style ([ModeStyle])
	Points        []ExceedancePoint
	Band          string  // legend of the band, e.g. "95 % Wilson band (pointwise)"
	FailureAt     float64 // x of the failure line (1 for a safety factor)
	// Failure is the run's failure estimate, drawn at FailureAt when its N
	// is above 0; FailureLabel is its legend.
	Failure      ExceedancePoint
	FailureLabel string
	Notes        []string
}

// ExceedancePlot draws P(value < x) against x on a log probability axis,
// with its pointwise band, the failure line and the run's failure estimate.
// Points where no value lay below x show their upper bound as downward
// triangles. It returns the points drawn (those inside the x range).
func ExceedancePlot(s ExceedanceSpec) (*plot.Plot, []ExceedancePoint, error) {
	if s.YLabel == "" {
		s.YLabel = "probability of a value below x"
	}
	p := newPlot(s.Title, s.XLabel, s.YLabel)
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = probTicks{}
	st := styleOf(s.Key, 0)
	if s.FailureAt == 0 {
		s.FailureAt = 1
	}
	if len(s.Points) == 0 {
		p.Legend.Add("no values")
		p.X.Min, p.X.Max = 0, 2*s.FailureAt
		p.Y.Min, p.Y.Max = 1e-6, 1
		return p, nil, nil
	}
	// The x range: from the lowest point (and the failure line) to where
	// the probability reaches 0.999; the upper body says nothing of failure.
	xmin, xmax := math.Min(s.Points[0].X, s.FailureAt), s.Points[len(s.Points)-1].X
	for _, pt := range s.Points {
		if pt.P >= 0.999 {
			xmax = pt.X
			break
		}
	}
	if !(xmax > xmin) {
		xmax = xmin + 1
	}
	pad := (xmax - xmin) * 0.03
	xmin, xmax = xmin-pad, xmax+pad
	floor := 1.0
	var drawn []ExceedancePoint
	for _, pt := range s.Points {
		if pt.X < xmin || pt.X > xmax {
			continue
		}
		drawn = append(drawn, pt)
		for _, v := range []float64{pt.P, pt.Lo, pt.Hi} {
			if v > 0 {
				floor = math.Min(floor, v)
			}
		}
	}
	if s.Failure.N > 0 {
		for _, v := range []float64{s.Failure.P, s.Failure.Lo, s.Failure.Hi} {
			if v > 0 {
				floor = math.Min(floor, v)
			}
		}
	}
	floor = math.Pow(10, math.Floor(math.Log10(floor/2)))
	var line, top, bot, ups plotter.XYs
	for _, pt := range drawn {
		if pt.UpperOnly {
			ups = append(ups, plotter.XY{X: pt.X, Y: math.Max(pt.Hi, floor)})
			continue
		}
		line = append(line, plotter.XY{X: pt.X, Y: pt.P})
		top = append(top, plotter.XY{X: pt.X, Y: pt.Hi})
		bot = append(bot, plotter.XY{X: pt.X, Y: math.Max(pt.Lo, floor)})
	}
	if len(top) > 1 {
		ring := append(plotter.XYs{}, top...)
		for i := len(bot) - 1; i >= 0; i-- {
			ring = append(ring, bot[i])
		}
		band, err := plotter.NewPolygon(ring)
		if err != nil {
			return nil, nil, err
		}
		band.Color = withAlpha(st.Color, 60)
		band.LineStyle.Width = 0
		p.Add(band)
		p.Legend.Add(s.Band, band)
	}
	if len(line) > 0 {
		l, err := plotter.NewLine(line)
		if err != nil {
			return nil, nil, err
		}
		st.Line(l, vg.Points(2))
		// The mode's marker at a few points, evenly spaced in x, so that
		// the curve carries the mode's colour, dash and marker as elsewhere.
		var marks plotter.XYs
		for i, next := 0, line[0].X; i < len(line); i++ {
			if line[i].X >= next {
				marks = append(marks, line[i])
				next = line[i].X + (xmax-xmin)/8
			}
		}
		sc, err := plotter.NewScatter(marks)
		if err != nil {
			return nil, nil, err
		}
		st.Scatter(sc, vg.Points(3.5))
		p.Add(l, sc)
		p.Legend.Add(s.Name+": share of values below x", l, sc)
	}
	if len(ups) > 0 {
		sc, err := plotter.NewScatter(ups)
		if err != nil {
			return nil, nil, err
		}
		sc.Color, sc.Shape, sc.Radius = st.Color, downTriangle{}, vg.Points(4.5)
		p.Add(sc)
		p.Legend.Add("upper bound where no value lay below x", sc)
	}
	fl, err := plotter.NewLine(plotter.XYs{{X: s.FailureAt, Y: floor}, {X: s.FailureAt, Y: 1}})
	if err != nil {
		return nil, nil, err
	}
	fl.LineStyle = failureLine
	p.Add(fl)
	p.Legend.Add(fmt.Sprintf("failure line at %g", s.FailureAt), fl)
	if f := s.Failure; f.N > 0 {
		pt := plotter.XYs{{X: s.FailureAt, Y: math.Max(f.Hi, floor)}}
		gs := draw.GlyphStyle{Color: Palette[cBlack], Shape: downTriangle{}, Radius: vg.Points(5)}
		if !f.UpperOnly {
			pt[0].Y = f.P
			gs.Shape = draw.CircleGlyph{}
			eb, err := plotter.NewYErrorBars(struct {
				plotter.XYs
				plotter.YErrors
			}{pt, plotter.YErrors{{Low: f.P - math.Max(f.Lo, floor), High: f.Hi - f.P}}})
			if err != nil {
				return nil, nil, err
			}
			eb.Color, eb.Width = Palette[cBlack], vg.Points(1.5)
			p.Add(eb)
		}
		sc, err := plotter.NewScatter(pt)
		if err != nil {
			return nil, nil, err
		}
		sc.GlyphStyle = gs
		p.Add(sc)
		p.Legend.Add(s.FailureLabel, sc)
	}
	for _, n := range s.Notes {
		p.Legend.Add(n)
	}
	p.X.Min, p.X.Max = xmin, xmax
	p.X.Tick.Marker = withTick{plainTicks{}, s.FailureAt}
	p.Y.Min, p.Y.Max = floor, 1
	return p, drawn, nil
}

// withTick adds a labelled tick at At (the failure line) to a ticker's.
type withTick struct {
	plot.Ticker
	At float64
}

func (w withTick) Ticks(lo, hi float64) []plot.Tick {
	ts := w.Ticker.Ticks(lo, hi)
	if w.At < lo || w.At > hi {
		return ts
	}
	for _, t := range ts {
		if t.Label != "" && math.Abs(t.Value-w.At) < 1e-9*math.Max(1, math.Abs(w.At)) {
			return ts
		}
	}
	return append(ts, plot.Tick{Value: w.At, Label: strconv.FormatFloat(w.At, 'g', -1, 64)})
}
