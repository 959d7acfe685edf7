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

// ReliabilitySpec describes a reliability-against-cycles picture: R(N)
// with its confidence band on a log-cycles axis.
type ReliabilitySpec struct {
	Title      string
	N          []float64 // cycles, increasing, > 0
	R, Lo, Hi  []float64 // reliability and its band, in [0, 1]
	DesignLife float64   // vertical line (0: none)
	// Marks are points on the curve to name (the B-lives): cycles N with
	// reliability R.
	Marks []LifeMark
	// Unreliability draws F(N) = 1 − R(N) on a log probability axis
	// instead: the early failures that a linear R axis cannot show.
	Unreliability bool
}

// LifeMark is a named point of a reliability curve ("B10"; the legend adds
// its cycles).
type LifeMark struct {
	Label string
	N, R  float64
}

// ReliabilityPlot draws R(N) as a step line with its band on a log10
// cycles axis and the design life as a dashed vertical line.
func ReliabilityPlot(s ReliabilitySpec) (*plot.Plot, error) {
	n := len(s.N)
	if n < 2 || len(s.R) != n || len(s.Lo) != n || len(s.Hi) != n {
		return nil, fmt.Errorf("plots: reliability curve needs at least 2 points with R, Lo, Hi of the same length (got %d)", n)
	}
	ylabel, y := "reliability R(N) = P(life > N)", func(r float64) float64 { return r }
	if s.Unreliability {
		ylabel, y = "probability of failure by N cycles, 1 − R(N)", func(r float64) float64 { return 1 - r }
	}
	p := newPlot(s.Title, "cycles N (log scale)", ylabel)
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = cycleTicks{}
	p.Legend.Top, p.Legend.Left = false, true
	line := make(plotter.XYs, 0, n)
	ring := make(plotter.XYs, 0, 2*n)
	var back plotter.XYs
	// On the log axis a failure probability of 0 has no place: such points
	// are left out (the band's upper edge keeps them).
	floor := 0.0
	if s.Unreliability {
		floor = math.Inf(1)
		for i := range s.N {
			if f := y(s.Lo[i]); f > 0 {
				floor = math.Min(floor, f)
			}
		}
		if math.IsInf(floor, 1) {
			floor = 1e-9
		}
		floor /= 10
	}
	for i := range s.N {
		if !(s.N[i] > 0) {
			return nil, fmt.Errorf("plots: cycles %g: must be > 0", s.N[i])
		}
		lo, hi := y(s.Hi[i]), y(s.Lo[i]) // F of the upper R is the lower F
		if !s.Unreliability {
			lo, hi = s.Lo[i], s.Hi[i]
		}
		if v := y(s.R[i]); !s.Unreliability || v > 0 {
			line = append(line, plotter.XY{X: s.N[i], Y: v})
		}
		ring = append(ring, plotter.XY{X: s.N[i], Y: math.Max(hi, floor)})
		back = append(back, plotter.XY{X: s.N[i], Y: math.Max(lo, floor)})
	}
	for i := len(back) - 1; i >= 0; i-- {
		ring = append(ring, back[i])
	}
	if len(line) < 2 {
		return nil, fmt.Errorf("plots: reliability curve has fewer than 2 points with failures to draw")
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
	if s.Unreliability {
		p.Legend.Add("1 − R(N)", l)
	} else {
		p.Legend.Add("R(N)", l)
	}
	p.Legend.Add("confidence band", band)
	ymin, ymax := 0.0, 1.0
	if s.Unreliability {
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = probTicks{}
		ymin = floor
	}
	for i, m := range s.Marks {
		if !(m.N > 0) || (s.Unreliability && !(y(m.R) > 0)) {
			continue
		}
		sc, err := plotter.NewScatter(plotter.XYs{{X: m.N, Y: y(m.R)}})
		if err != nil {
			return nil, err
		}
		g := [...]draw.GlyphDrawer{draw.CircleGlyph{}, draw.BoxGlyph{}, diamondGlyph{}}[i%3] // filled
		sc.GlyphStyle.Color, sc.GlyphStyle.Shape, sc.GlyphStyle.Radius = Palette[(i+3)%len(Palette)], g, vg.Points(4)
		p.Add(sc)
		p.Legend.Add(m.Label+" = "+cycles(m.N)+" cycles", sc)
	}
	if d := s.DesignLife; d > 0 {
		v, err := plotter.NewLine(plotter.XYs{{X: d, Y: ymin}, {X: d, Y: ymax}})
		if err != nil {
			return nil, err
		}
		v.Color, v.Dashes, v.Width = Palette[1], []vg.Length{vg.Points(5), vg.Points(3)}, vg.Points(1.5)
		p.Add(v)
		p.Legend.Add("design life "+cycles(d)+" cycles", v)
	}
	p.X.Min, p.X.Max = s.N[0], s.N[n-1]
	if d := s.DesignLife; d > 0 {
		p.X.Min, p.X.Max = math.Min(p.X.Min, d/2), math.Max(p.X.Max, d*2)
	}
	if s.Unreliability {
		p.Y.Min, p.Y.Max = floor, 1
	} else {
		p.Y.Min, p.Y.Max = 0, 1.02
	}
	return p, nil
}

// cycleTicks label a log cycles axis at the decades as 1eN (the plot
// font has no superscript 0 or 9, so 10ⁿ cannot be set), with the
// multiples between unlabelled (every k-th decade on a long axis).
type cycleTicks struct{}

func (cycleTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || !(hi > lo) {
		return nil
	}
	e0, e1 := int(math.Floor(math.Log10(lo))), int(math.Ceil(math.Log10(hi)))
	k := max(1, (e1-e0+7)/8)
	var out []plot.Tick
	for e := e0; e <= e1; e++ {
		dec := math.Pow(10, float64(e))
		for m := 1; m < 10; m++ {
			v := float64(m) * dec
			if v < lo*(1-1e-9) || v > hi*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 && e%k == 0 {
				t.Label = cycles(v)
			}
			out = append(out, t)
		}
	}
	return out
}

// cycles writes a cycle count compactly: 2e7, 1.5e5, 900.
func cycles(v float64) string {
	if v < 1e4 {
		return strconv.FormatFloat(v, 'g', 3, 64)
	}
	s := strconv.FormatFloat(v, 'e', 2, 64) // 2.11e+07
	m, e, _ := strings.Cut(s, "e")
	m = strings.TrimSuffix(strings.TrimRight(m, "0"), ".")
	return m + "e" + strings.TrimLeft(strings.TrimPrefix(e, "+"), "0")
}
