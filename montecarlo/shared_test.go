package montecarlo_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/problemtest"
)

// TestSharedScatterSlip checks the part of a per-bolt input's scatter that
// the bolts share (issue 11 item 15) against a closed form: with n bolts
// whose preloads are normal N(μ, σ²) with correlation ρ between any two,
// and no axial load, the summed clamp force is normal with variance
// n·σ²·(1 + (n − 1)·ρ) (the variance of a sum of equicorrelated normals),
// so slip, V ≥ μs·m·ΣFi (EN 1993-1-8 §3.9 with the actual clamp force), has
//
//	P = Φ((V/(μs·m) − n·μ)/√(n·σ²·(1 + (n − 1)·ρ)))
func TestSharedScatterSlip(t *testing.T) {
	t.Parallel()
	in := problemtest.Joint()
	const n, mu, sd = 8, 40e3, 4e3
	in.Bolts, in.AxialMax = n, 0
	in.ShearLoad, in.ShearPlanes, in.SlipFactor = 0.3*n*mu*0.92, 1, 0.3 // 8 % below the mean slip capacity
	in.PlateThickness, in.PlateYield, in.PlateTensile, in.EdgeDistance = 15, 355, 510, 30
	for _, rho := range []float64{0, 0.6} {
		p := &montecarlo.Problem{Base: in, Vars: []montecarlo.Var{
			{Name: "tightening.preload", Dist: problemtest.Must(montecarlo.NewNormal(mu, sd)), Role: montecarlo.PerBolt, Field: problemtest.Preload, Shared: rho},
		}}
		exact := distuv.UnitNormal.CDF((in.ShearLoad/(in.SlipFactor*in.ShearPlanes) - n*mu) / math.Sqrt(n*sd*sd*(1+(n-1)*rho)))
		r := run(t, p, 300_000, 17, model.Slip)
		m, _ := r.Mode(model.Slip)
		checkContains(t, "slip with shared scatter", m.Estimate, exact)
		t.Logf("ρ = %g: slip %.4g (exact %.4g)", rho, m.Estimate.P, exact)
	}
}
