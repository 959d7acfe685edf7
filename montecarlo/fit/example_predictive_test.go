package fit_test

import (
	"fmt"
	"os"
	"path/filepath"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
)

// The posterior predictive of the ball-bearing lives of Lieblein & Zelen
// (1956) as a distribution to sample: a log-t with n − 1 = 22 degrees of
// freedom, wider in the tail than the plug-in lognormal.
func ExamplePredictive_Dist() {
	f, err := os.Open(filepath.Join("..", "..", "testdata", "fit", "lieblein-zelen.csv"))
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	col, err := fit.ReadColumn(f, fit.Spec{File: "lieblein-zelen.csv", Column: "revolutions_millions"})
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := col.CheckPredictive(montecarlo.LogNormal); err != nil {
		fmt.Println(err)
		return
	}
	p, _ := fit.NewPredictive(montecarlo.LogNormal, col.Values)
	d, _ := p.Dist()
	plug, _, _ := fit.Estimate(montecarlo.LogNormal, col.Values, nil)
	fmt.Printf("%s, %g d.o.f.\n", d.Kind, d.C)
	fmt.Printf("P(life < 20): %.4f predictive, %.4f plug-in\n", d.CDF(20), plug.CDF(20))
	fmt.Printf("1 %% quantile: %.2f predictive, %.2f plug-in\n", d.Quantile(0.01), plug.Quantile(0.01))
	fmt.Println(col.CheckPredictive(montecarlo.Weibull) != nil)
	// Output:
	// log-t, 22 d.o.f.
	// P(life < 20): 0.0228 predictive, 0.0134 plug-in
	// 1 % quantile: 16.18 predictive, 18.86 plug-in
	// true
}
