package plots

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
)

// plainTicks label a linear axis at 5 to 12 round values (steps of 1, 2 or
// 5 times a power of ten), written without padding zeros ("1", "1.5"),
// with unlabelled minor ticks between: enough labels to read a value off
// the axis.
type plainTicks struct{}

// minLabels is the least number of labelled ticks of a linear axis.
const minLabels = 5

func (plainTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return plot.DefaultTicks{}.Ticks(lo, hi)
	}
	e := math.Floor(math.Log10(hi - lo))
	var step, minor float64
	var k int
search:
	for ; ; e-- {
		for _, m := range []float64{5, 2, 1} {
			step = m * math.Pow(10, e)
			if math.Floor(hi/step)-math.Ceil(lo/step)+1 >= minLabels {
				k = int(e)
				minor = step / 2
				if m == 5 {
					minor = step / 5
				}
				break search
			}
		}
	}
	dec := max(0, -k)
	var out []plot.Tick
	for i := math.Ceil(lo / minor); i*minor <= hi*(1+1e-12); i++ {
		v := i * minor
		t := plot.Tick{Value: v}
		if r := v / step; math.Abs(r-math.Round(r)) < 1e-6 {
			v = math.Round(r) * step
			t.Value = v
			t.Label = strconv.FormatFloat(v, 'f', dec, 64)
			if strings.Contains(t.Label, ".") {
				t.Label = strings.TrimSuffix(strings.TrimRight(t.Label, "0"), ".")
			}
			if t.Label == "-0" {
				t.Label = "0"
			}
		}
		out = append(out, t)
	}
	return out
}
