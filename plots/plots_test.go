package plots

import (
	"bytes"
	"image/png"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
)

func sampleHist() Hist {
	h := Hist{Lo: 0, Hi: 40, Counts: make([]float64, 400), Under: 3, Over: 5}
	for i := range h.Counts {
		x := float64(i)/10 - 20
		h.Counts[i] = math.Round(1000 * math.Exp(-x*x/8))
	}
	return h
}

func TestBarsKeepCounts(t *testing.T) {
	t.Parallel()
	h := sampleHist()
	var in float64
	for _, c := range h.Counts {
		in += c
	}
	bars := h.Bars(50, 1)
	var got float64
	for i, b := range bars {
		got += b.Weight
		if i > 0 && math.Abs(b.Min-bars[i-1].Max) > 1e-9 {
			t.Fatalf("bars %d and %d do not meet", i-1, i)
		}
	}
	if got != in || h.Total() != in+8 {
		t.Errorf("bars hold %v samples, the histogram %v in range", got, in)
	}
	if len(bars) > 50 || bars[0].Weight == 0 || bars[len(bars)-1].Weight == 0 {
		t.Errorf("%d bars, empty ends not trimmed", len(bars))
	}
	scaled := h.Bars(50, 1000)
	if math.Abs(scaled[0].Min*1000-bars[0].Min) > 1e-9 {
		t.Error("scale not applied to bin edges")
	}
}

func TestHistogramPlotPNG(t *testing.T) {
	t.Parallel()
	p, bars, err := HistogramPlot(HistSpec{Title: "t", XLabel: "x (kN)", Hist: sampleHist(), Scale: 1,
		Markers: []Marker{{X: 10, Label: "low"}, {X: 1e6, Label: "far"}}, Notes: []string{"note"}})
	if err != nil {
		t.Fatal(err)
	}
	if len(bars) == 0 {
		t.Fatal("no bars")
	}
	checkPNG(t, p)
}

func TestHistogramPlotEmpty(t *testing.T) {
	t.Parallel()
	p, bars, err := HistogramPlot(HistSpec{Title: "empty", Hist: Hist{Lo: 0, Hi: 1, Counts: make([]float64, 10), Over: 7}})
	if err != nil || len(bars) != 0 {
		t.Fatalf("empty histogram: %v, %d bars", err, len(bars))
	}
	checkPNG(t, p)
}

func TestCurvePlotPoints(t *testing.T) {
	t.Parallel()
	c := Curve{Name: "separation", X: []float64{1, 2, 3}, P: []float64{1e-2, 1e-4, 0}, Lo: []float64{8e-3, 5e-5, 0}, Hi: []float64{1.2e-2, 2e-4, 3e-6}, UpperOnly: []bool{false, false, true}}
	none := Curve{Name: "slip", X: []float64{1, 2, 3}, P: []float64{0, 0, 0}, Lo: []float64{0, 0, 0}, Hi: []float64{3e-6, 3e-6, 3e-6}, UpperOnly: []bool{true, true, true}}
	p, drawn, err := CurvePlot(CurveSpec{Title: "t", XLabel: "x", Curves: []Curve{c, none}, Target: 1e-3, Window: [2]float64{1.5, 3}})
	if err != nil {
		t.Fatal(err)
	}
	for i, pt := range drawn[0] {
		if pt.X != c.X[i] || pt.P != c.P[i] || pt.Hi != c.Hi[i] || pt.UpperOnly != c.UpperOnly[i] {
			t.Errorf("point %d: drew %+v", i, pt)
		}
	}
	if len(drawn[1]) != 3 {
		t.Error("a curve without failures must still be drawn (upper bounds)")
	}
	checkPNG(t, p)
	g, err := GroupPlot("g", []string{"a", "b"}, []Group{{Name: "m", P: []float64{1e-3, 0}, Lo: []float64{5e-4, 0}, Hi: []float64{2e-3, 1e-5}, UpperOnly: []bool{false, true}}})
	if err != nil {
		t.Fatal(err)
	}
	checkPNG(t, g)
	o, err := OverlayPlot("o", "x", 1, 40, []Overlay{{"a", sampleHist()}, {"b", Hist{Lo: 0, Hi: 1, Counts: make([]float64, 4)}}})
	if err != nil {
		t.Fatal(err)
	}
	checkPNG(t, o)
}

// checkPNG renders a plot, decodes it and checks its size: 8 in wide at
// the renderer's 96 dpi, at least 5 in high (a legend below adds height).
func checkPNG(t *testing.T, p *plot.Plot) {
	t.Helper()
	b, err := PNG(p)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if r := img.Bounds(); r.Dx() != 768 || r.Dy() < 480 {
		t.Errorf("PNG is %dx%d, want 768 wide and at least 480 high", r.Dx(), r.Dy())
	}
}

func TestPlainTicksReadable(t *testing.T) {
	t.Parallel()
	// Enough labels to read a value off the axis: 5 to 12 round values,
	// each label its tick's value without padding zeros.
	for _, c := range []struct{ lo, hi float64 }{{0, 250000}, {22, 88}, {0, 1}, {0.001, 0.0042}, {0.5, 3.3}, {-10, 70}, {12.2, 46.4}, {0.97, 1.03}} {
		var labels int
		for _, tk := range (plainTicks{}).Ticks(c.lo, c.hi) {
			if tk.Label == "" {
				continue
			}
			labels++
			if strings.HasSuffix(tk.Label, ".") || strings.Contains(tk.Label, ".") && strings.HasSuffix(tk.Label, "0") {
				t.Errorf("[%g, %g]: label %q keeps padding", c.lo, c.hi, tk.Label)
			}
			v, err := strconv.ParseFloat(tk.Label, 64)
			if err != nil || math.Abs(v-tk.Value) > 1e-9*math.Max(1, math.Abs(v)) || tk.Value < c.lo || tk.Value > c.hi {
				t.Errorf("[%g, %g]: label %q at %g", c.lo, c.hi, tk.Label, tk.Value)
			}
		}
		if labels < minLabels || labels > 12 {
			t.Errorf("[%g, %g]: %d labelled ticks, want 5 to 12", c.lo, c.hi, labels)
		}
	}
}

func TestReliabilityPlotPNG(t *testing.T) {
	t.Parallel()
	s := ReliabilitySpec{Title: "R", N: []float64{1e5, 1e6, 1e7}, R: []float64{1, 0.6, 0.02}, Lo: []float64{0.99, 0.58, 0.01}, Hi: []float64{1, 0.62, 0.03}, DesignLife: 2e6}
	p, err := ReliabilityPlot(s)
	if err != nil {
		t.Fatal(err)
	}
	checkPNG(t, p)
	if _, err := ReliabilityPlot(ReliabilitySpec{N: []float64{1}}); err == nil {
		t.Error("one point accepted")
	}
}

func TestCycleLabels(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{{2.113e7, "2.11e7"}, {1e9, "1e9"}, {9e6, "9e6"}, {1.5e5, "1.5e5"}, {900, "900"}} {
		if got := cycles(c.v); got != c.want {
			t.Errorf("cycles(%g) = %q, want %q", c.v, got, c.want)
		}
	}
}

// The unreliability view draws 1 − R(N) on a log axis with the B-lives.
func TestUnreliabilityPlot(t *testing.T) {
	s := ReliabilitySpec{Title: "t", N: []float64{1e5, 1e6, 1e7}, R: []float64{1, 0.99, 0.5}, Lo: []float64{0.999, 0.98, 0.45}, Hi: []float64{1, 0.995, 0.55},
		DesignLife: 2e6, Marks: []LifeMark{{Label: "B1", N: 1e6, R: 0.99}}, Unreliability: true}
	p, err := ReliabilityPlot(s)
	if err != nil {
		t.Fatal(err)
	}
	if !(p.Y.Min > 0) || p.Y.Max != 1 {
		t.Errorf("log axis %g … %g, want (0, 1]", p.Y.Min, p.Y.Max)
	}
	if _, err := PNG(p); err != nil {
		t.Fatal(err)
	}
}
