package fit_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
	"boltrisk/montecarlo/scenario"
)

// The snippets load through the scenario reader and give back the fitted
// distribution to the 4 significant digits they carry.
func TestSnippetLoads(t *testing.T) {
	t.Parallel()
	src, err := scenario.ExampleSource("bench-m12")
	if err != nil {
		t.Fatal(err)
	}
	const line = "  axial_max: {dist: normal, mean: 30 kN, cov: 20%}"
	if !strings.Contains(string(src), line) {
		t.Fatal("example r1 changed: its axial_max line is gone")
	}
	kn := fit.Quantity{Dim: units.Force, Unit: "kN", Scale: 1000}
	rnd := rand.New(rand.NewPCG(5, 6))
	x := make([]float64, 40)
	for i := range x {
		x[i] = 30e3 * math.Exp(0.1*rnd.NormFloat64()) // invented preloads, N
	}
	for _, c := range []struct {
		kind   montecarlo.Kind
		bounds *fit.Bounds
		want   string
	}{
		{montecarlo.Normal, nil, "{dist: normal, mean: "},
		{montecarlo.LogNormal, nil, "{dist: lognormal, mean: "},
		{montecarlo.Weibull, nil, "{dist: weibull, shape: "},
		{montecarlo.Uniform, nil, "{dist: uniform, min: "},
		{montecarlo.Triangular, nil, "{dist: triangular, min: "},
		{montecarlo.TruncNormal, &fit.Bounds{Lower: 20e3, Upper: 45e3}, "lower: 20 kN, upper: 45 kN}"},
		{montecarlo.TruncNormal, &fit.Bounds{Lower: 20e3, Upper: math.Inf(1)}, "lower: 20 kN}"},
	} {
		d, _, err := fit.Estimate(c.kind, x, c.bounds)
		if err != nil {
			t.Fatal(err)
		}
		snip := fit.Snippet(d, kn)
		if !strings.Contains(snip, c.want) || !strings.Contains(snip, " kN") {
			t.Errorf("%v: snippet %s lacks %q", c.kind, snip, c.want)
		}
		doc := strings.Replace(string(src), line, "  axial_max: "+snip, 1)
		s, err := scenario.Parse("fitted.yaml", []byte(doc))
		if err != nil {
			t.Errorf("%v: %s does not load: %v", c.kind, snip, err)
			continue
		}
		v, ok := s.Uncertain("loads.axial_max")
		if !ok {
			t.Fatalf("%v: axial_max not uncertain", c.kind)
		}
		got := v.Dist
		if got.Kind != c.kind || math.Abs(got.Mean()/d.Mean()-1) > 1e-3 || math.Abs(got.StdDev()/d.StdDev()-1) > 2e-3 {
			t.Errorf("%v: %s loads as %s, fitted %s", c.kind, snip, got.Describe(kn.Format), d.Describe(kn.Format))
		}
	}
}

func TestSnippetPlainAndPercent(t *testing.T) {
	t.Parallel()
	d := montecarlo.Dist{Kind: montecarlo.LogNormal, A: math.Log(0.187) - 0.5*math.Log1p(0.114*0.114), B: math.Sqrt(math.Log1p(0.114 * 0.114))}
	if got, want := fit.Snippet(d, fit.Quantity{}), "{dist: lognormal, mean: 0.187, cov: 11.4%}"; got != want {
		t.Errorf("got %s, want %s", got, want)
	}
	n, _ := montecarlo.NewNormal(0.05, 0.004)
	if got, want := fit.Snippet(n, fit.Quantity{Dim: units.Fraction, Unit: "%", Scale: 0.01}), "{dist: normal, mean: 5%, sd: 0.4%}"; got != want {
		t.Errorf("got %s, want %s", got, want)
	}
}
