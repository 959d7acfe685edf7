package fit

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo"
)

// Paper is the probability paper of a plot: the transform of the
// probability axis (and of the value axis) under which a family's CDF is a
// straight line.
type Paper uint8

const (
	NormalPaper    Paper = iota // y = Φ⁻¹(p), x linear
	LognormalPaper              // y = Φ⁻¹(p), x logarithmic
	WeibullPaper                // y = ln(−ln(1 − p)), x logarithmic
)

var paperNames = [...]string{"normal", "lognormal", "Weibull"}

func (p Paper) String() string { return paperNames[p] }

// PaperOf returns the paper on which a family plots straight; the families
// without one of their own (uniform, triangular, truncated normal) go on
// normal paper, where their fitted line is curved.
func PaperOf(k montecarlo.Kind) Paper {
	switch k {
	case montecarlo.LogNormal:
		return LognormalPaper
	case montecarlo.Weibull:
		return WeibullPaper
	}
	return NormalPaper
}

// Y maps a probability to the paper's probability axis.
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

// PlotPoint is a point of a probability plot: a value (display unit) at a
// probability.
type PlotPoint struct{ X, P float64 }

// BandPoint is the pointwise band at one plotted point: the values between
// which the i-th smallest of n values from the fitted distribution falls
// with the band's confidence.
type BandPoint struct{ P, Lo, Hi float64 }

// ProbPlot is the data of a probability plot of a sample against a fitted
// distribution. Values are in the display unit of Quantity.
type ProbPlot struct {
	Family     montecarlo.Kind
	Paper      Paper
	Quantity   Quantity
	N          int
	Positions  string      // the plotting positions used
	Points     []PlotPoint // ordered data at their plotting positions
	Line       []PlotPoint // the fitted CDF
	Band       []BandPoint // pointwise band, one per plotted point
	Confidence float64     // of the band
	Shown      int         // points shown (all when n ≤ MaxPlotPoints)
}

// MaxPlotPoints is the number of data points a probability plot shows at
// most: above it the 100 smallest and 100 largest values are kept and the
// rest thinned evenly.
const MaxPlotPoints = 2000

// Plotting positions: Blom's (i − 3/8)/(n + 1/4) on normal and lognormal
// paper (Blom, Statistical Estimates and Transformed Beta-Variables, 1958;
// nearly unbiased for normal order statistics) and Benard's median ranks
// (i − 0.3)/(n + 0.4) on Weibull paper (Benard & Bos-Levenbach, 1953; the
// usual choice of Weibull analysis, e.g. Abernethy, The New Weibull
// Handbook, 5th ed., 2006; from memory).
func position(p Paper, i, n int) float64 {
	if p == WeibullPaper {
		return (float64(i) - 0.3) / (float64(n) + 0.4)
	}
	return (float64(i) - 0.375) / (float64(n) + 0.25)
}

// Probability returns the probability-plot data of sample x (internal
// units) against the fitted distribution d: the ordered data at their
// plotting positions, the fitted CDF, and a pointwise band at confidence
// conf (0: DefaultConfidence) from the order statistics of the fitted law:
// F(X₍ᵢ₎) of n values is Beta(i, n − i + 1) distributed (David &
// Nagaraja, Order Statistics, 3rd ed., 2003, §2.2), so the i-th point lies
// between Q(Beta quantiles) with the band's confidence. The band leaves
// out the uncertainty of the fitted parameters.
func Probability(x []float64, d montecarlo.Dist, conf float64, q Quantity) (ProbPlot, error) {
	if err := checkValues(x); err != nil {
		return ProbPlot{}, err
	}
	if conf == 0 {
		conf = DefaultConfidence
	}
	if !(conf > 0 && conf < 1) {
		return ProbPlot{}, fmt.Errorf("fit: band confidence %g must lie between 0 and 1", conf)
	}
	paper := PaperOf(d.Kind)
	s := slices.Clone(x)
	slices.Sort(s)
	n := len(s)
	if paper.LogX() && s[0] <= 0 {
		return ProbPlot{}, fmt.Errorf("fit: %s paper needs values > 0, got %g", paper, s[0])
	}
	sc := q.scale()
	pp := ProbPlot{Family: d.Kind, Paper: paper, Quantity: q, N: n, Confidence: conf}
	if paper == WeibullPaper {
		pp.Positions = "median ranks (i − 0.3)/(n + 0.4)"
	} else {
		pp.Positions = "Blom (i − 0.375)/(n + 0.25)"
	}
	idx := make([]int, 0, min(n, MaxPlotPoints))
	if n <= MaxPlotPoints {
		for i := range n {
			idx = append(idx, i)
		}
	} else {
		const tail = 100
		step := float64(n-2*tail) / float64(MaxPlotPoints-2*tail)
		for i := range tail {
			idx = append(idx, i)
		}
		for j := range MaxPlotPoints - 2*tail {
			idx = append(idx, tail+int(float64(j)*step))
		}
		for i := n - tail; i < n; i++ {
			idx = append(idx, i)
		}
	}
	pp.Shown = len(idx)
	alpha := (1 - conf) / 2
	for _, i := range idx {
		p := position(paper, i+1, n)
		pp.Points = append(pp.Points, PlotPoint{X: s[i] / sc, P: p})
		b := distuv.Beta{Alpha: float64(i + 1), Beta: float64(n - i)}
		pp.Band = append(pp.Band, BandPoint{P: p, Lo: d.Quantile(b.Quantile(alpha)) / sc, Hi: d.Quantile(b.Quantile(1-alpha)) / sc})
	}
	// The fitted CDF at 101 points evenly spaced on the paper's axis over
	// the plotted positions.
	y0, y1 := paper.Y(pp.Points[0].P), paper.Y(pp.Points[len(pp.Points)-1].P)
	for j := range 101 {
		p := paper.P(y0 + (y1-y0)*float64(j)/100)
		pp.Line = append(pp.Line, PlotPoint{X: d.Quantile(p) / sc, P: p})
	}
	for _, v := range append(append([]BandPoint{}, pp.Band...), BandPoint{Lo: pp.Line[0].X, Hi: pp.Line[100].X}) {
		if math.IsNaN(v.Lo) || math.IsNaN(v.Hi) || math.IsInf(v.Lo, 0) || math.IsInf(v.Hi, 0) {
			return ProbPlot{}, fmt.Errorf("fit: probability plot: the fitted %s gives a non-finite quantile", d.Kind)
		}
	}
	return pp, nil
}
