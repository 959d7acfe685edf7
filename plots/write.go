package plots

import (
	"bytes"
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// margin is the white border around every picture.
const margin = 8 * vg.Millimeter / 2

// maxTitleLines bounds a wrapped title; a longer title is shortened with
// an ellipsis on its last line.
const maxTitleLines = 3

// PNG renders a plot into PNG bytes. The picture is [Width] wide; the axes
// take [Height]. The title is wrapped to the width (never clipped), and the
// legend is drawn outside the data area: in a column right of the axes when
// it is narrow, else below them, the picture growing to hold it.
func PNG(p *plot.Plot) ([]byte, error) {
	a := arrange(p)
	c := vgimg.New(Width, a.height)
	dc := draw.New(c)
	dc.SetColor(color.White)
	dc.Fill(dc.Rectangle.Path())

	title, leg, ylab := p.Title.Text, p.Legend, p.Y.Label.Text
	defer func() { p.Title.Text, p.Legend, p.Y.Label.Text = title, leg, ylab }()
	if title != "" { // centred on the picture; the plot draws none
		sty := p.Title.TextStyle
		sty.XAlign, sty.YAlign = draw.XCenter, draw.YTop
		dc.FillText(sty, vg.Point{X: Width / 2, Y: a.height - margin}, title)
	}
	p.Title.Text, p.Y.Label.Text = "", ""
	p.Legend = plot.NewLegend()
	p.Draw(draw.Canvas{Canvas: dc.Canvas, Rectangle: a.inner})
	if ylab != "" {
		// The label of the value axis, centred on the data area: gonum/plot
		// sizes it at the arithmetic mid-range, which on a log axis sits
		// near the top and leaves a gap above the data.
		sty := p.Y.Label.TextStyle
		sty.Rotation += math.Pi / 2
		x := a.axes.Min.X + sty.Height(ylab) - sty.FontExtents().Descent
		dc.FillText(sty, vg.Point{X: x, Y: (a.data.Min.Y + a.data.Max.Y) / 2}, ylab)
	}
	if a.legendOn {
		leg.Top, leg.Left, leg.XOffs, leg.YOffs = true, true, 0, 0
		leg.Draw(draw.Canvas{Canvas: dc.Canvas, Rectangle: a.legend})
	}
	var buf bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// arrangement is where PNG puts the parts of a picture.
type arrangement struct {
	placement
	axes   vg.Rectangle // the axes with the value-axis label
	inner  vg.Rectangle // the axes without it (what the plot draws)
	data   vg.Rectangle // the data area
	legend vg.Rectangle // the legend's box (legendOn)
}

// arrange wraps the title (changing its text) and computes every part's
// place; the legend's box never overlaps the data area.
func arrange(p *plot.Plot) arrangement {
	a := arrangement{placement: layout(p)}
	top := a.height - margin
	if p.Title.Text != "" {
		top -= p.Title.TextStyle.Height(p.Title.Text) + p.Title.Padding
	}
	a.axes = vg.Rectangle{Min: vg.Point{X: margin, Y: margin + a.below}, Max: vg.Point{X: Width - margin - a.right, Y: top}}
	a.inner = a.axes
	if lab := p.Y.Label.Text; lab != "" {
		a.inner.Min.X += p.Y.Label.TextStyle.Height(lab) + p.Y.Label.Padding
	}
	title, ylab := p.Title.Text, p.Y.Label.Text
	p.Title.Text, p.Y.Label.Text = "", ""
	a.data = p.DataCanvas(draw.Canvas{Rectangle: a.inner}).Rectangle
	p.Title.Text, p.Y.Label.Text = title, ylab
	if a.legendOn {
		if a.right > 0 {
			a.legend = vg.Rectangle{Min: vg.Point{X: Width - margin - a.legW, Y: a.data.Max.Y - a.legH}, Max: vg.Point{X: Width - margin, Y: a.data.Max.Y}}
		} else {
			x := math.Max(margin.Points(), math.Min(a.data.Min.X.Points(), (Width-margin-a.legW).Points()))
			a.legend = vg.Rectangle{Min: vg.Point{X: vg.Length(x), Y: margin}, Max: vg.Point{X: vg.Length(x) + a.legW, Y: margin + a.legH}}
		}
	}
	return a
}

// legendGap separates the legend from the axes.
const legendGap = 10 * vg.Millimeter / 2

// placement is where PNG puts the parts of a picture.
type placement struct {
	height      vg.Length // of the picture
	legendOn    bool      // the legend has entries
	legW, legH  vg.Length // size of the legend
	right       vg.Length // width taken right of the axes by the legend (0: below)
	below       vg.Length // height taken below the axes by the legend
	titleLines  []string
	titleBudget vg.Length // the width a title line may take
}

// layout wraps the title and places the legend. It changes the title text
// only.
func layout(p *plot.Plot) placement {
	var l placement
	l.titleBudget = Width - 2*margin
	l.titleLines = wrapText(p.Title.Text, p.Title.TextStyle, l.titleBudget, maxTitleLines)
	p.Title.Text = strings.Join(l.titleLines, "\n")
	if p.Legend.Padding == 0 {
		p.Legend.Padding = vg.Points(2.5)
	}
	r := p.Legend.Rectangle(draw.Canvas{})
	l.legW, l.legH = r.Size().X, r.Size().Y
	l.height = Height
	if l.legH <= 0 {
		return l
	}
	l.legendOn = true
	titleH := p.Title.TextStyle.Height(p.Title.Text) + p.Title.Padding
	if l.legW <= 0.28*Width && l.legH <= Height-titleH-2*margin-vg.Points(40) {
		l.right = l.legW + legendGap
		return l
	}
	// Below the axes. A legend wider than the picture gets a smaller font
	// (down to 7 pt) rather than a clipped line.
	if avail := Width - 2*margin; l.legW > avail {
		f := &p.Legend.TextStyle.Font.Size
		*f = vg.Length(math.Max(7, float64(*f)*float64(avail-p.Legend.ThumbnailWidth)/float64(l.legW-p.Legend.ThumbnailWidth)))
		r = p.Legend.Rectangle(draw.Canvas{})
		l.legW, l.legH = r.Size().X, r.Size().Y
	}
	l.below = l.legH + legendGap
	l.height = Height + l.below
	return l
}

// wrapText breaks s at spaces into lines no wider than w in style sty, at
// most n lines; the last line is shortened with "…" when the text does not
// fit. A word wider than w alone is cut.
func wrapText(s string, sty text.Style, w vg.Length, n int) []string {
	if s == "" {
		return nil
	}
	if sty.Handler == nil {
		sty.Handler = plot.DefaultTextHandler
	}
	var lines []string
	const nl = "\x00" // a line break kept as a word of its own
	words := strings.Fields(strings.ReplaceAll(s, "\n", " "+nl+" "))
	line := ""
	for k, word := range words {
		if len(lines) == n-1 { // the last line: the rest, shortened if need be
			rest := strings.Join(words[k:], " ")
			if line != "" {
				rest = line + " " + rest
			}
			rest = strings.Join(strings.Fields(strings.ReplaceAll(rest, nl, " ")), " ")
			return append(lines, shorten(rest, sty, w))
		}
		if word == nl {
			lines, line = append(lines, line), ""
			continue
		}
		try := word
		if line != "" {
			try = line + " " + word
		}
		if sty.Width(try) <= w {
			line = try
			continue
		}
		if line != "" {
			lines = append(lines, line)
		}
		line = word
		for sty.Width(line) > w && len(lines) < n-1 { // a word alone too wide: cut it
			cut := fitPrefix(line, sty, w)
			lines = append(lines, cut)
			line = line[len(cut):]
		}
	}
	if line != "" {
		lines = append(lines, shorten(line, sty, w))
	}
	return lines
}

// shorten returns s, or its longest prefix that fits w with "…" after it.
func shorten(s string, sty text.Style, w vg.Length) string {
	if len(s) > 1000 { // no line holds that many characters
		s = s[:1000]
	}
	if sty.Width(s) <= w {
		return s
	}
	return strings.TrimSpace(fitPrefix(s, sty, w-sty.Width("…"))) + "…"
}

// fitPrefix returns the longest prefix of s (whole runes, at least one)
// no wider than w.
func fitPrefix(s string, sty text.Style, w vg.Length) string {
	best := ""
	for i, r := range s {
		end := i + len(string(r))
		if best != "" && sty.Width(s[:end]) > w {
			break
		}
		best = s[:end]
	}
	return best
}
