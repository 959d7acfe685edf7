package plots

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Curve is one failure probability against the varied value.
type Curve struct {
	Name      string
	Key       string    // mode key for the style ([ModeStyle]); "" for a series of its own
	X         []float64 // in the data's units
	P, Lo, Hi []float64
	// UpperOnly marks points where no sample failed: only the upper bound
	// Hi is known, drawn as a downward triangle.
	UpperOnly []bool
}

// CurveSpec describes a reliability-curve picture.
type CurveSpec struct {
	Title, XLabel string
	Scale         float64 // x values are divided by Scale for display
	Curves        []Curve
	Target        float64    // horizontal target line (0: none)
	Window        [2]float64 // shaded window of x (data units); equal ends: none
}

// Point is a plotted point of a curve, in display units.
type Point struct {
	X, P, Lo, Hi float64
	UpperOnly    bool
}

// CurvePlot draws failure probabilities on a log scale against the varied
// value, with interval bands, the target line and the window. It returns
// the points drawn per curve so that callers can check them. Points with no
// failure show their upper bound as a downward triangle; a curve without
// any failure is therefore still visible.
func CurvePlot(s CurveSpec) (*plot.Plot, [][]Point, error) {
	if s.Scale == 0 {
		s.Scale = 1
	}
	p := newPlot(s.Title, s.XLabel, "failure probability")
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = probTicks{}
	floor, ceil := math.Inf(1), 0.0
	for _, c := range s.Curves {
		for i := range c.X {
			for _, v := range []float64{c.P[i], c.Lo[i], c.Hi[i]} {
				if v > 0 {
					floor = math.Min(floor, v)
					ceil = math.Max(ceil, v)
				}
			}
		}
	}
	if s.Target > 0 {
		floor, ceil = math.Min(floor, s.Target), math.Max(ceil, s.Target)
	}
	if math.IsInf(floor, 1) {
		floor, ceil = 1e-6, 1
	}
	floor /= 3
	ceil = math.Min(1, ceil*3)
	xmin, xmax := math.Inf(1), math.Inf(-1)
	var drawn [][]Point
	if s.Window[1] > s.Window[0] {
		a, b := s.Window[0]/s.Scale, s.Window[1]/s.Scale
		band, err := plotter.NewPolygon(plotter.XYs{{X: a, Y: floor}, {X: b, Y: floor}, {X: b, Y: ceil}, {X: a, Y: ceil}})
		if err != nil {
			return nil, nil, err
		}
		band.Color = windowFill
		band.LineStyle.Width = 0
		p.Add(band)
		p.Legend.Add("window meeting the target", band)
	}
	// Any mode is drawn first, under the modes it sums, so that a mode
	// that makes up all of it stays visible on top of it.
	layers := make([][]plot.Plotter, len(s.Curves))
	for ci, c := range s.Curves {
		st := styleOf(c.Key, ci)
		col := st.Color
		var pts []Point
		var line, bandTop, bandBot, ups plotter.XYs
		for i := range c.X {
			x := c.X[i] / s.Scale
			xmin, xmax = math.Min(xmin, x), math.Max(xmax, x)
			up := c.UpperOnly != nil && c.UpperOnly[i]
			pts = append(pts, Point{X: x, P: c.P[i], Lo: c.Lo[i], Hi: c.Hi[i], UpperOnly: up})
			if up {
				ups = append(ups, plotter.XY{X: x, Y: math.Max(c.Hi[i], floor)})
				continue
			}
			line = append(line, plotter.XY{X: x, Y: c.P[i]})
			bandTop = append(bandTop, plotter.XY{X: x, Y: c.Hi[i]})
			bandBot = append(bandBot, plotter.XY{X: x, Y: math.Max(c.Lo[i], floor)})
		}
		drawn = append(drawn, pts)
		var thumbs []plot.Thumbnailer
		if len(bandTop) > 1 {
			ring := append(plotter.XYs{}, bandTop...)
			for i := len(bandBot) - 1; i >= 0; i-- {
				ring = append(ring, bandBot[i])
			}
			band, err := plotter.NewPolygon(ring)
			if err != nil {
				return nil, nil, err
			}
			band.Color = withAlpha(col, 45)
			band.LineStyle.Width = 0
			layers[ci] = append(layers[ci], band)
		}
		if len(line) > 0 {
			l, sc, err := plotter.NewLinePoints(line)
			if err != nil {
				return nil, nil, err
			}
			st.Line(l, vg.Points(2))
			st.Scatter(sc, vg.Points(3.5))
			if c.Key == AnyMode {
				l.Width = vg.Points(2.5)
			}
			layers[ci] = append(layers[ci], l, sc)
			thumbs = append(thumbs, l, sc)
		}
		if len(ups) > 0 {
			sc, err := plotter.NewScatter(ups)
			if err != nil {
				return nil, nil, err
			}
			sc.Color, sc.Shape, sc.Radius = col, downTriangle{}, vg.Points(4)
			layers[ci] = append(layers[ci], sc)
			if len(thumbs) == 0 {
				thumbs = append(thumbs, sc)
			}
		}
		name := c.Name
		if len(line) == 0 {
			name += " (no failures: upper bounds)"
		}
		p.Legend.Add(name, thumbs...)
	}
	for _, under := range []bool{true, false} {
		for ci, c := range s.Curves {
			if (c.Key == AnyMode) == under {
				p.Add(layers[ci]...)
			}
		}
	}
	if s.Target > 0 {
		l, err := plotter.NewLine(plotter.XYs{{X: xmin, Y: s.Target}, {X: xmax, Y: s.Target}})
		if err != nil {
			return nil, nil, err
		}
		l.LineStyle = targetLine
		p.Add(l)
		p.Legend.Add("target", l)
	}
	p.Y.Min, p.Y.Max = floor, ceil
	if xmin < xmax {
		p.X.Min, p.X.Max = xmin, xmax
	}
	return p, drawn, nil
}

// variantShapes mark the variants of a comparison.
var variantShapes = []draw.GlyphDrawer{
	draw.CircleGlyph{}, draw.BoxGlyph{}, diamondGlyph{}, draw.RingGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{}, draw.PlusGlyph{},
}

// downTriangle marks an upper bound.
type downTriangle struct{}

func (downTriangle) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(1.2)})
	r := sty.Radius
	var path vg.Path
	path.Move(vg.Point{X: pt.X - r, Y: pt.Y + r*0.6})
	path.Line(vg.Point{X: pt.X + r, Y: pt.Y + r*0.6})
	path.Line(vg.Point{X: pt.X, Y: pt.Y - r})
	path.Close()
	c.Stroke(path)
}

// Group is one mode of a side-by-side comparison: one probability per variant.
type Group struct {
	Name      string
	Key       string // mode key: the group's colour ([ModeStyle])
	P, Lo, Hi []float64
	UpperOnly []bool
}

// GroupPlot draws, for each group (mode), the probability of each variant
// side by side with its interval, on a log scale. A group has its mode's
// colour; a variant has its own marker, shown in the legend in grey.
func GroupPlot(title string, variants []string, groups []Group) (*plot.Plot, error) {
	p := newPlot(title, "", "failure probability")
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = probTicks{}
	floor, ceil := math.Inf(1), 0.0
	for _, g := range groups {
		for i := range g.P {
			for _, v := range []float64{g.P[i], g.Lo[i], g.Hi[i]} {
				if v > 0 {
					floor, ceil = math.Min(floor, v), math.Max(ceil, v)
				}
			}
		}
	}
	if math.IsInf(floor, 1) {
		floor, ceil = 1e-6, 1
	}
	floor /= 3
	ceil = math.Min(1, ceil*3)
	nv := len(variants)
	for vi, name := range variants {
		glyph := variantShapes[vi%len(variantShapes)]
		legendGlyph := &plotter.Scatter{GlyphStyle: draw.GlyphStyle{Color: Palette[cGrey], Shape: glyph, Radius: vg.Points(4)}}
		var thumbs []plot.Thumbnailer
		for gi, g := range groups {
			col := styleOf(g.Key, gi).Color
			x := float64(gi) + (float64(vi)-float64(nv-1)/2)*0.8/float64(nv)
			if g.UpperOnly[vi] {
				sc, err := plotter.NewScatter(plotter.XYs{{X: x, Y: math.Max(g.Hi[vi], floor)}})
				if err != nil {
					return nil, err
				}
				sc.Color, sc.Shape, sc.Radius = col, downTriangle{}, vg.Points(4.5)
				p.Add(sc)
				continue
			}
			pts := plotter.XYs{{X: x, Y: g.P[vi]}}
			errs := plotter.YErrors{{Low: g.P[vi] - math.Max(g.Lo[vi], floor), High: g.Hi[vi] - g.P[vi]}}
			sc, err := plotter.NewScatter(pts)
			if err != nil {
				return nil, err
			}
			sc.Color, sc.Shape, sc.Radius = col, glyph, vg.Points(4)
			eb, err := plotter.NewYErrorBars(struct {
				plotter.XYs
				plotter.YErrors
			}{pts, errs})
			if err != nil {
				return nil, err
			}
			eb.Color, eb.Width = col, vg.Points(1.5)
			p.Add(eb, sc)
		}
		thumbs = append(thumbs, legendGlyph)
		p.Legend.Add(name, thumbs...)
	}
	p.Legend.Add("upper bound, no sample failed", &plotter.Scatter{GlyphStyle: draw.GlyphStyle{Color: Palette[cGrey], Shape: downTriangle{}, Radius: vg.Points(4)}})
	p.Legend.Add("in each mode the variants stand left to right as listed")
	// Mode names wrap at spaces to the width of their group (the legend,
	// with its long last line, goes below the axes); when a word is wider
	// than that, the names are slanted instead.
	ticks := make([]plot.Tick, len(groups))
	gw := (Width - 2*margin - vg.Points(70)) / vg.Length(max(len(groups), 1))
	slant := false
	for _, g := range groups {
		for _, w := range strings.Fields(g.Name) {
			if p.X.Tick.Label.Width(w) > gw*0.92 {
				slant = true
			}
		}
	}
	for i, g := range groups {
		name := g.Name
		if !slant {
			name = strings.Join(wrapText(name, p.X.Tick.Label, gw*0.92, 3), "\n")
		}
		ticks[i] = plot.Tick{Value: float64(i), Label: name}
	}
	if slant {
		p.X.Tick.Label.Rotation = math.Pi / 6
		p.X.Tick.Label.XAlign, p.X.Tick.Label.YAlign = draw.XRight, draw.YTop
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	p.X.Min, p.X.Max = -0.6, float64(len(groups))-0.4
	p.Y.Min, p.Y.Max = floor, ceil
	return p, nil
}

// probTicks labels a log probability axis by decades ("1e-4", …, "0.01",
// "1"), every k-th decade when the axis spans more than ten, at 1, 2 and 5
// of each decade when it spans at most three; unlabelled ticks at 2 … 9
// times each decade while it spans at most eight; nothing above 1.
type probTicks struct{}

func (probTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || !(hi > lo) {
		return nil
	}
	hi = math.Min(hi, 1)
	e0, e1 := int(math.Floor(math.Log10(lo)+1e-9)), int(math.Ceil(math.Log10(hi)-1e-9))
	k := max(1, (e1-e0+9)/10)
	var out []plot.Tick
	for e := e0; e <= e1; e++ {
		dec := math.Pow(10, float64(e))
		if dec >= lo*(1-1e-9) && dec <= hi*(1+1e-9) {
			t := plot.Tick{Value: dec}
			if e%k == 0 {
				t.Label = probLabel(1, e)
			}
			out = append(out, t)
		}
		if e1-e0 > 8 {
			continue
		}
		for m := 2; m < 10; m++ {
			if v := float64(m) * dec; v >= lo && v <= hi {
				t := plot.Tick{Value: v}
				if e1-e0 <= 3 && (m == 2 || m == 5) { // a short axis: 1, 2, 5 of each decade
					t.Label = probLabel(m, e)
				}
				out = append(out, t)
			}
		}
	}
	return out
}

// probLabel writes m·10^e: "0.02", "1", "5e-5".
func probLabel(m, e int) string {
	if e >= -3 {
		return strconv.FormatFloat(float64(m)*math.Pow(10, float64(e)), 'f', -1, 64)
	}
	return fmt.Sprintf("%de%d", m, e)
}
