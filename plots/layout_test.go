package plots

import (
	"fmt"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
)

// longName is a scenario name of 120 characters.
const longName = "Feed-water inspection flange of the second boiler house, twelve bolts 1/2-13 UNC grade 5, gasket class 300, hot services"

func TestLongTitleWraps(t *testing.T) {
	t.Parallel()
	if len([]rune(longName)) != 120 {
		t.Fatalf("test name has %d characters, want 120", len([]rune(longName)))
	}
	for _, title := range []string{
		"Safety factor, Fatigue, Goodman criterion (" + longName + ")",
		"Failure probability against torque (" + longName + " — a variant with a long name as well, to need a shortened last line of all)",
		strings.Repeat("x", 300),                              // one word wider than the picture
		"first line\n" + strings.Repeat("many words ", 20000), // a hostile name: kept to three lines
	} {
		p, _, err := HistogramPlot(HistSpec{Title: title, XLabel: "x", Hist: sampleHist()})
		if err != nil {
			t.Fatal(err)
		}
		a := arrange(p)
		lines := strings.Split(p.Title.Text, "\n")
		if len(lines) > maxTitleLines || len(lines) < 2 {
			t.Errorf("%d title lines for %d characters", len(lines), len(title))
		}
		for _, l := range lines {
			if w := p.Title.TextStyle.Width(l); w > Width-2*margin {
				t.Errorf("title line %q is %v wide, the picture %v", l, w, Width-2*margin)
			}
		}
		if joined := strings.Join(lines, " "); !strings.HasSuffix(joined, "…") && strings.Join(strings.Fields(joined), " ") != strings.Join(strings.Fields(title), " ") && !strings.HasPrefix(title, "xxx") || strings.HasPrefix(title, "first") && lines[0] != "first line" {
			t.Errorf("wrapping changed the words: %q", joined)
		}
		// The axes start below the title.
		if top := a.height - margin - p.Title.TextStyle.Height(p.Title.Text); a.axes.Max.Y > top {
			t.Errorf("axes reach %v, the title starts at %v", a.axes.Max.Y, top)
		}
		checkPNG(t, p)
	}
	if got := wrapText("short title", newPlot("", "", "").Title.TextStyle, Width, 3); len(got) != 1 || got[0] != "short title" {
		t.Errorf("a short title was wrapped: %q", got)
	}
}

func TestLegendOutsideData(t *testing.T) {
	t.Parallel()
	c := Curve{Name: "Separation", Key: "separation", X: []float64{1, 2, 3}, P: []float64{1e-2, 1e-4, 0}, Lo: []float64{8e-3, 5e-5, 0}, Hi: []float64{1.2e-2, 2e-4, 3e-6}, UpperOnly: []bool{false, false, true}}
	narrow, _, err := CurvePlot(CurveSpec{Title: "t", XLabel: "x", Curves: []Curve{c}, Target: 1e-3})
	if err != nil {
		t.Fatal(err)
	}
	var marks []Marker
	for i := range 6 {
		marks = append(marks, Marker{X: float64(5 + i), Label: fmt.Sprintf("a long marker label that does not fit beside the axes, number %d", i)})
	}
	wide, _, err := HistogramPlot(HistSpec{Title: "t", XLabel: "x", Hist: sampleHist(), Markers: marks, Notes: []string{"note"}})
	if err != nil {
		t.Fatal(err)
	}
	huge, _, err := HistogramPlot(HistSpec{Title: "t", XLabel: "x", Hist: sampleHist(), Markers: []Marker{{X: 10, Label: strings.Repeat("a label far too long for one line ", 4)}}})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		a     arrangement
		right bool
	}{{"narrow legend", arrange(narrow), true}, {"wide legend", arrange(wide), false}, {"legend wider than the picture", arrange(huge), false}} {
		a := tc.a
		if !a.legendOn {
			t.Fatalf("%s: no legend", tc.name)
		}
		if (a.right > 0) != tc.right {
			t.Errorf("%s: beside the axes = %v, want %v", tc.name, a.right > 0, tc.right)
		}
		if overlaps(a.legend, a.data) {
			t.Errorf("%s: legend %v covers the data area %v", tc.name, a.legend, a.data)
		}
		if a.legend.Min.X < 0 || a.legend.Max.X > Width || a.legend.Min.Y < 0 || a.legend.Max.Y > a.height {
			t.Errorf("%s: legend %v outside the picture %v × %v", tc.name, a.legend, Width, a.height)
		}
		if tc.right && a.height != Height || !tc.right && a.height <= Height {
			t.Errorf("%s: picture height %v", tc.name, a.height)
		}
	}
	checkPNG(t, narrow)
	checkPNG(t, wide)
	checkPNG(t, huge)
}

func overlaps(a, b vg.Rectangle) bool {
	return a.Min.X < b.Max.X && b.Min.X < a.Max.X && a.Min.Y < b.Max.Y && b.Min.Y < a.Max.Y
}

func TestModeStyles(t *testing.T) {
	t.Parallel()
	seen := map[string]string{}
	for key := range modeStyles {
		s := ModeStyle(key)
		id := fmt.Sprint(s.Color, s.Dashes, fmt.Sprintf("%T", s.Glyph))
		if other, ok := seen[id]; ok {
			t.Errorf("modes %s and %s share colour, dash and marker", key, other)
		}
		seen[id] = key
		if key != AnyMode && s.Color == Palette[cBlack] {
			t.Errorf("mode %s is black, the colour of any mode", key)
		}
		if _, tri := s.Glyph.(downTriangle); tri {
			t.Errorf("mode %s uses the upper-bound triangle", key)
		}
	}
	// A key without a row still gets the same style every time.
	a, b := ModeStyle("future_mode"), ModeStyle("future_mode")
	if fmt.Sprint(a) != fmt.Sprint(b) || a.Color == Palette[cBlack] {
		t.Errorf("fallback style not stable or black: %v, %v", a, b)
	}
}

func TestExceedancePlot(t *testing.T) {
	t.Parallel()
	pts := []ExceedancePoint{
		{X: 0.8, Count: 0, N: 1000, Hi: 3e-3, UpperOnly: true},
		{X: 0.9, Count: 1, N: 1000, P: 1e-3, Lo: 2.5e-5, Hi: 5.6e-3},
		{X: 1.2, Count: 10, N: 1000, P: 1e-2, Lo: 4.8e-3, Hi: 1.8e-2},
		{X: 2, Count: 500, N: 1000, P: 0.5, Lo: 0.47, Hi: 0.53},
		{X: 3, Count: 1000, N: 1000, P: 1, Lo: 0.996, Hi: 1},
	}
	p, drawn, err := ExceedancePlot(ExceedanceSpec{Title: "t", XLabel: "safety factor", Name: "Fatigue", Key: "fatigue",
		Points: pts, Band: "95 % band", FailureAt: 1, FailureLabel: "failure 2 of 1000",
		Failure: ExceedancePoint{X: 1, Count: 2, N: 1000, P: 2e-3, Lo: 2.4e-4, Hi: 7.2e-3}})
	if err != nil {
		t.Fatal(err)
	}
	if len(drawn) != len(pts) {
		t.Errorf("drew %d of %d points", len(drawn), len(pts))
	}
	if p.Y.Min > 2.5e-5 || p.Y.Max != 1 || p.X.Min > 0.8 || p.X.Max < 3 {
		t.Errorf("axes [%g, %g] × [%g, %g] do not hold the points", p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
	}
	checkPNG(t, p)
	empty, _, err := ExceedancePlot(ExceedanceSpec{Title: "empty"})
	if err != nil {
		t.Fatal(err)
	}
	checkPNG(t, empty)
}

func TestProbTicks(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		lo, hi   float64
		min, max int
	}{{1e-6, 0.04, 5, 6}, {1e-8, 1, 9, 9}, {1e-25, 1, 5, 10}, {3e-3, 0.5, 5, 7}, {2e-5, 1e-3, 5, 7}} {
		var labels []string
		for _, tk := range (probTicks{}).Ticks(c.lo, c.hi) {
			if tk.Value > 1 || tk.Value < c.lo*(1-1e-9) || tk.Value > c.hi*(1+1e-9) {
				t.Errorf("[%g, %g]: tick at %g outside", c.lo, c.hi, tk.Value)
			}
			if tk.Label != "" {
				labels = append(labels, tk.Label)
			}
		}
		if len(labels) < c.min || len(labels) > c.max {
			t.Errorf("[%g, %g]: labels %v, want %d to %d", c.lo, c.hi, labels, c.min, c.max)
		}
	}
}
