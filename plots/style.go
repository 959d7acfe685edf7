package plots

import (
	"hash/fnv"
	"image/color"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
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

const (
	cBlue, cVermillion, cGreen, cPurple, cOrange, cSky, cBlack, cGrey = 0, 1, 2, 3, 4, 5, 6, 7
)

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
	draw.RingGlyph{}, draw.PlusGlyph{}, draw.BoxGlyph{}, diamondGlyph{},
}

const (
	gCircle, gSquare, gCross, gRing, gPlus, gBox, gDiamond = 0, 1, 2, 3, 4, 5, 6
)

// Series returns the colour, dashes and marker of series i, for series
// that are not failure modes (variants of a comparison). Failure modes
// take their style from [ModeStyle].
func Series(i int) (color.RGBA, []vg.Length, draw.GlyphDrawer) {
	return Palette[i%len(Palette)], dashes[i%len(dashes)], shapes[i%len(shapes)]
}

// Style is the look of one series: colour, dash pattern and marker.
type Style struct {
	Color  color.RGBA
	Dashes []vg.Length
	Glyph  draw.GlyphDrawer
}

// AnyMode is the key of the series "any mode" (the joint fails some mode).
const AnyMode = "any"

// modeStyles is the one style table of the failure modes, keyed by the
// mode key (the JSON contract): a mode looks the same in every picture.
// Colours repeat between the tension-side and the shear-side modes, each
// with a different dash and marker; no two keys share all three. Black is
// kept for "any mode".
var modeStyles = map[string][3]int{ // colour, dashes, marker
	"assembly_yield":   {cBlue, 0, gCircle},
	"proof":            {cVermillion, 1, gSquare},
	"service_yield":    {cGreen, 2, gCross},
	"separation":       {cPurple, 3, gRing},
	"thread_stripping": {cSky, 1, gBox},
	"head_pressure":    {cGrey, 5, gPlus},
	"fatigue":          {cOrange, 4, gDiamond},
	"fatigue_life":     {cOrange, 2, gSquare},
	"bolt_shear":       {cBlue, 1, gDiamond},
	"bolt_bearing":     {cVermillion, 2, gCircle},
	"plate_bearing":    {cGreen, 3, gSquare},
	"net_section":      {cPurple, 4, gCross},
	"tear_out":         {cOrange, 5, gRing},
	"block_tearing":    {cSky, 0, gPlus},
	"tension_shear":    {cGrey, 3, gBox},
	"slip":             {cPurple, 0, gBox},
	AnyMode:            {cBlack, 0, gBox},
}

// ModeStyle returns the style of the failure mode with the given key
// (model.Mode.Key(); [AnyMode] for any mode). Every picture that shows a
// mode draws it with this style. A key without a row in the table gets a
// stable style derived from the key (add a row for a new mode).
func ModeStyle(key string) Style {
	s, ok := modeStyles[key]
	if !ok {
		h := fnv.New32a()
		h.Write([]byte(key))
		v := int(h.Sum32() % (7 * 6 * 7))
		s = [3]int{v % 7, v / 7 % 6, v / 42 % 7}
		if s[0] == cBlack {
			s[0] = cGrey
		}
	}
	return Style{Color: Palette[s[0]], Dashes: dashes[s[1]], Glyph: shapes[s[2]]}
}

// HasModeStyle reports whether the key has its own row in the style table.
func HasModeStyle(key string) bool { _, ok := modeStyles[key]; return ok }

// styleOf returns the style of a series with a mode key, or series i's.
func styleOf(key string, i int) Style {
	if key != "" {
		return ModeStyle(key)
	}
	c, d, g := Series(i)
	return Style{Color: c, Dashes: d, Glyph: g}
}

// Line styles a line of the series.
func (s Style) Line(l *plotter.Line, width vg.Length) {
	l.Color, l.Dashes, l.Width = s.Color, s.Dashes, width
}

// Scatter styles the markers of the series.
func (s Style) Scatter(sc *plotter.Scatter, radius vg.Length) {
	sc.Color, sc.Shape, sc.Radius = s.Color, s.Glyph, radius
}

// Reference lines that are not series: the failure line at 1 and a target.
var (
	failureLine = draw.LineStyle{Color: Palette[cBlack], Width: vg.Points(1.5), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}}
	targetLine  = draw.LineStyle{Color: color.RGBA{80, 80, 80, 255}, Width: vg.Points(1.5), Dashes: []vg.Length{vg.Points(9), vg.Points(3), vg.Points(2), vg.Points(3)}}
	windowFill  = color.NRGBA{R: 128, G: 128, B: 128, A: 50}
)

// diamondGlyph is a filled diamond.
type diamondGlyph struct{}

func (diamondGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetColor(sty.Color)
	r := sty.Radius * 1.2
	var p vg.Path
	p.Move(vg.Point{X: pt.X, Y: pt.Y + r})
	p.Line(vg.Point{X: pt.X + r, Y: pt.Y})
	p.Line(vg.Point{X: pt.X, Y: pt.Y - r})
	p.Line(vg.Point{X: pt.X - r, Y: pt.Y})
	p.Close()
	c.Fill(p)
}

func withAlpha(c color.RGBA, a uint8) color.NRGBA {
	return color.NRGBA{R: c.R, G: c.G, B: c.B, A: a}
}

// Size of every picture without its legend: readable at 100 % on a laptop
// screen. A legend is drawn beside or below the axes (see [PNG]).
const (
	Width  = 8 * vg.Inch
	Height = 5 * vg.Inch
)

// newPlot returns a plot with the house style: larger fonts, a grid-free
// white background, titles and axis labels set, readable ticks.
func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = vg.Points(14)
	p.Title.Padding = vg.Points(8)
	p.X.Label.Text = x
	p.Y.Label.Text = y
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = vg.Points(12)
		a.Tick.Label.Font.Size = vg.Points(10)
		a.Tick.Marker = plainTicks{}
	}
	p.Legend.TextStyle.Font.Size = vg.Points(10)
	p.Legend.Top, p.Legend.Left = true, true
	return p
}
