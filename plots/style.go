package plots

import (
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Palette is the colour-universal-design palette of Okabe & Ito (2008),
// chosen so that readers with any common colour-vision deficiency can tell
// the series apart; every series also has its own dash pattern and marker.
var Palette = []color.RGBA{
	{0, 114, 178, 255},   // blue
	{213, 94, 0, 255},    // vermillion
	{0, 158, 115, 255},   // bluish green
	{204, 121, 167, 255}, // reddish purple
	{230, 159, 0, 255},   // orange
	{86, 180, 233, 255},  // sky blue
	{0, 0, 0, 255},       // black
	{128, 128, 128, 255}, // grey
}

var dashes = [][]vg.Length{
	nil,
	{vg.Points(6), vg.Points(3)},
	{vg.Points(2), vg.Points(2)},
	{vg.Points(8), vg.Points(3), vg.Points(2), vg.Points(3)},
	{vg.Points(4), vg.Points(4)},
	{vg.Points(10), vg.Points(4)},
}

// Markers avoid triangles: a downward triangle means an upper bound.
var shapes = []draw.GlyphDrawer{
	draw.CircleGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{},
	draw.RingGlyph{}, draw.PlusGlyph{}, draw.BoxGlyph{},
}

// Series returns the colour, dashes and marker of series i.
func Series(i int) (color.RGBA, []vg.Length, draw.GlyphDrawer) {
	return Palette[i%len(Palette)], dashes[i%len(dashes)], shapes[i%len(shapes)]
}

func withAlpha(c color.RGBA, a uint8) color.NRGBA {
	return color.NRGBA{R: c.R, G: c.G, B: c.B, A: a}
}

// Size of every picture: readable at 100 % on a laptop screen.
const (
	Width  = 8 * vg.Inch
	Height = 5 * vg.Inch
)

// newPlot returns a plot with the house style: larger fonts, a grid-free
// white background, titles and axis labels set.
func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = vg.Points(14)
	p.X.Label.Text = x
	p.Y.Label.Text = y
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = vg.Points(12)
		a.Tick.Label.Font.Size = vg.Points(10)
		a.Tick.Marker = plainTicks{}
	}
	p.Legend.TextStyle.Font.Size = vg.Points(10)
	p.Legend.Top = true
	return p
}

// logHeadroom returns the top of a log axis spanning [floor, top] with room
// above top for a legend of n entries along the upper edge.
func logHeadroom(floor, top float64, n int) float64 {
	f := math.Min(float64(n)*vg.Points(13).Points()/(Height.Points()-vg.Points(70).Points()), 0.8)
	d := math.Log10(top / floor)
	return top * math.Pow(10, f*d/(1-f)+0.1)
}

// plainTicks are gonum/plot's default ticks with the trailing zeros of
// their labels dropped ("250000.00" → "250000", "2.50" → "2.5"): the
// default ticker pads every label of some ranges to two decimals.
type plainTicks struct{}

func (plainTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	for i, t := range ts {
		if strings.Contains(t.Label, ".") && !strings.ContainsAny(t.Label, "eE") {
			ts[i].Label = strings.TrimSuffix(strings.TrimRight(t.Label, "0"), ".")
		}
	}
	return ts
}
