package report

import (
	"boltrisk/montecarlo/fit"
	"boltrisk/plots"
)

// ProbabilityData converts a fit's probability-plot data for plots.
func ProbabilityData(pp fit.ProbPlot) plots.ProbabilityData {
	d := plots.ProbabilityData{Family: pp.Family.String(), Paper: paperOf(pp.Paper), N: pp.N, Shown: pp.Shown,
		Positions: pp.Positions, Confidence: pp.Confidence}
	for _, p := range pp.Points {
		d.Points = append(d.Points, plots.ProbPoint{X: p.X, P: p.P})
	}
	for _, p := range pp.Line {
		d.Line = append(d.Line, plots.ProbPoint{X: p.X, P: p.P})
	}
	for _, b := range pp.Band {
		d.Band = append(d.Band, plots.ProbBand{P: b.P, Lo: b.Lo, Hi: b.Hi})
	}
	return d
}

// paperOf names the fit's probability paper for plots. The two packages
// each hold the paper's transform (plots may not import the estimators,
// and the fit draws nothing); TestPapersAgree keeps the two equal.
func paperOf(p fit.Paper) plots.Paper {
	switch p {
	case fit.LognormalPaper:
		return plots.LognormalPaper
	case fit.WeibullPaper:
		return plots.WeibullPaper
	}
	return plots.NormalPaper
}
