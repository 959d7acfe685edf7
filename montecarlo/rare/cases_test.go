package rare

import (
	"math"
)

// Reference problems with known failure probabilities. Sources beside each
// value; tags as in the reference notes: [exact] closed form, [quad]
// numerical integration, (computed: formula + inputs).

// anchor is a reference problem.
type anchor struct {
	name  string
	p     *Problem
	exact float64
	short bool // also run subset simulation under -short
}

// Standard-normal quantiles (computed: scipy.stats.norm.isf(1e-6), isf(1e-8),
// isf(1e-9)).
const (
	beta1e6 = 4.753424308822899
	beta1e8 = 5.612001244174789
	beta1e9 = 5.9978070150076865
)

func linear(dim int, beta float64) *Problem {
	s := math.Sqrt(float64(dim))
	return funcProblem(dim, func(u []float64) float64 {
		t := 0.0
		for _, x := range u {
			t += x
		}
		return beta - t/s
	})
}

// lognormalRatio is R − S with ln R ~ N(mR, 1), ln S ~ N(mS, 1): the failure
// set is that of ln R − ln S, normal with β = (mR − mS)/√2, but g itself is
// non-linear in u (reliability-methods.md §1.1/§1.2, A2).
func lognormalRatio(mR, mS float64) *Problem {
	return funcProblem(2, func(u []float64) float64 { return math.Exp(mR+u[0]) - math.Exp(mS+u[1]) })
}

func lnParams(mean, sd float64) (lambda, zeta float64) {
	s2 := math.Log1p(sd * sd / (mean * mean))
	return math.Log(mean) - s2/2, math.Sqrt(s2)
}

// fourBranch is the four-branch series system (Katsuki & Frangopol 1994;
// Waarts 2000; reliability-methods.md §1.3, reference-data-2.md §C.3).
func fourBranch(c, k, p float64) *Problem {
	s := math.Sqrt2
	return funcProblem(2,
		func(u []float64) float64 { d := u[0] - u[1]; return c + k*d*d - (u[0]+u[1])/s },
		func(u []float64) float64 { d := u[0] - u[1]; return c + k*d*d + (u[0]+u[1])/s },
		func(u []float64) float64 { return u[0] - u[1] + p },
		func(u []float64) float64 { return u[1] - u[0] + p })
}

// swapMap returns the Symmetry.Map of count blocks with one component per
// block, component b in block b, plus shared components after them.
func swapMap(count, shared int) [][]int {
	m := make([][]int, count)
	for b := range m {
		m[b] = make([]int, count+shared)
		for c := range m[b] {
			m[b][c] = c
		}
		m[b][0], m[b][b] = b, 0
	}
	return m
}

// equicorrelated: n bolts, g_j = β − (√ρ·V + √(1 − ρ)·W_j), V shared
// (reference-data-2.md §C.3).
func equicorrelated(n int, beta, rho float64) *Problem {
	gs := make([]limit, n)
	supp := make([][]int, n)
	a, b := math.Sqrt(rho), math.Sqrt(1-rho)
	for j := range n {
		gs[j] = func(u []float64) float64 { return beta - (a*u[0] + b*u[1+j]) }
		supp[j] = []int{0, 1 + j}
	}
	p := funcProblem(1+n, gs...)
	p.Support = supp
	p.Symmetry = &Symmetry{Shared: 1, Block: 1, Count: n, Map: swapMap(n, 0)}
	return p
}

// independentLognormal: n identical bolts, bolt j has its own (ln R, ln S)
// pair, g_j = R_j − S_j with per-bolt probability Φ(−beta).
func independentLognormal(n int, beta float64) *Problem {
	gs := make([]limit, n)
	supp := make([][]int, n)
	mR := 4 + math.Sqrt2*beta
	for j := range n {
		gs[j] = func(u []float64) float64 { return math.Exp(mR+u[2*j]) - math.Exp(4+u[2*j+1]) }
		supp[j] = []int{2 * j, 2*j + 1}
	}
	p := funcProblem(2*n, gs...)
	p.Support = supp
	p.Symmetry = &Symmetry{Shared: 0, Block: 2, Count: n, Map: swapMap(n, 0)}
	return p
}

// R1 separation with the torque mean raised to 155 N·m (bench/README.md,
// case r1sep7): T ~ N(155 000 N·mm, 4 %), K ~ LN(0.20, 12 %),
// P ~ N(30 000 N, 20 %), g = T/(K·d) − (1 − C)·P.
type r1sepEval struct{ tm, lk, zk, pm, c float64 }

const r1sep7Exact = 1.5878909457649637e-07 // (computed: bench/r1_quad.py pf_sep(155e3), quadrature)

func newR1Sep(torqueMean float64) r1sepEval {
	const d, as, ad, e, lt, ld, l = 12.0, 84.27, 113.1, 207000.0, 20.0, 10.0, 30.0
	kb := ad * as * e / (ad*lt + as*ld)
	km := e * d * 0.78715 * math.Exp(0.62873*d/l) // Wileman et al. fit, as in bench/README.md
	lk, zk := lnParams(0.20, 0.20*0.12)
	return r1sepEval{tm: torqueMean, lk: lk, zk: zk, pm: 30e3, c: kb / (kb + km)}
}

func (r r1sepEval) Eval(u []float64, n int, g []float64) {
	for i := range n {
		x := u[3*i : 3*i+3]
		t := r.tm * (1 + 0.04*x[0])
		k := math.Exp(r.lk + r.zk*x[1])
		p := r.pm * (1 + 0.2*x[2])
		g[i] = t/(k*12) - (1-r.c)*p
	}
}

func r1sep7() *Problem {
	e := newR1Sep(155e3)
	return &Problem{Dim: 3, Components: 1, NewEvaluator: func() Evaluator { return e }}
}

// Cover flange, any of 8 bolts separates (bench/README.md, case cf8sep),
// with the load mean lowered to 11.5 kN so that Pf ≈ 1e-7: P ~ N(11 500 N,
// 10 %) shared, per bolt T ~ N(52 000 N·mm, 2 %), K ~ LN(0.20, 14 %);
// g_i = T_i/(K_i·d) − fZ − (1 − C)·P. Coordinates: P, then (T_i, K_i).
type cf8Eval struct{ lk, zk, c, fz float64 }

const (
	cf8Exact     = 1.012704e-07 // (computed: bench/cf8_sep_quad.py 11500, n = 8, quadrature)
	cf8BoltExact = 1.265887e-08 // (computed: same script, n = 1)
)

func newCF8() cf8Eval {
	const kb, km = 332481.70847924147, 1086972.5430223034 // bench/cf8_sep_quad.py
	lk, zk := lnParams(0.20, 0.20*0.14)
	return cf8Eval{lk: lk, zk: zk, c: kb / (kb + km), fz: 0.008 * kb * km / (kb + km)}
}

func (e cf8Eval) Eval(u []float64, n int, g []float64) {
	for i := range n {
		x := u[17*i : 17*i+17]
		load := (1 - e.c) * 11500 * (1 + 0.1*x[0])
		for b := range 8 {
			t := 52e3 * (1 + 0.02*x[1+2*b])
			k := math.Exp(e.lk + e.zk*x[2+2*b])
			g[8*i+b] = t/(k*10) - e.fz - load
		}
	}
}

func cf8() *Problem {
	e := newCF8()
	supp := make([][]int, 8)
	for b := range supp {
		supp[b] = []int{0, 1 + 2*b, 2 + 2*b}
	}
	return &Problem{Dim: 17, Components: 8, Support: supp,
		Symmetry:     &Symmetry{Shared: 1, Block: 2, Count: 8, Map: swapMap(8, 0)},
		NewEvaluator: func() Evaluator { return e }}
}

func anchors() []anchor {
	lR, zR := lnParams(7, 0.5)
	lS, zS := lnParams(1, 0.5)
	const rho = 0.52523
	return []anchor{
		// A1: R − S, R ~ N(4, 1), S ~ N(2, 1): Φ(−√2) [exact] (reliability-methods.md §1.1; otbenchmark test_RminusS.py).
		{"A1 R-S", funcProblem(2, func(u []float64) float64 { return (4 + u[0]) - (2 + u[1]) }), 7.8649603525e-2, true},
		// A2: lognormal R, S, ln R ~ N(10, 1), ln S ~ N(4, 1): Φ(−6/√2) [exact] (UQLab uq_Reliability_test_lognormal.m, via reliability-methods.md §1.2).
		{"A2 lognormal R-S", lognormalRatio(10, 4), 1.1045248e-5, true},
		// A4: correlated lognormal R − S (Gaussian copula ρ = 0.52523 on ln R, ln S) [exact] (reliability-methods.md §1.2;
		// (computed: β = (λR − λS)/√(ζR² + ζS² − 2ρζRζS) = 4.679584)).
		{"A4 correlated lognormal", funcProblem(2, func(u []float64) float64 {
			return math.Exp(lR+zR*u[0]) - math.Exp(lS+zS*(rho*u[0]+math.Sqrt(1-rho*rho)*u[1]))
		}), 1.4372909834854314e-6, true},
		// A5, A6: four-branch series system, p = 7/√2 and 6/√2 [quad] (reliability-methods.md §1.3; reference-data-2.md §C.3).
		{"A5 four-branch p=7/sqrt2", fourBranch(3, 0.1, 7/math.Sqrt2), 2.2227950662e-3, true},
		{"A6 four-branch p=6/sqrt2", fourBranch(3, 0.1, 6/math.Sqrt2), 4.4573314906e-3, true},
		// A10: RP107, 5√10 − Σx_i, 10 standard normals: Φ(−5) [exact] (reliability-methods.md §1.1).
		{"A10 RP107", funcProblem(10, func(u []float64) float64 {
			t := 0.0
			for _, x := range u {
				t += x
			}
			return 5*math.Sqrt(10) - t
		}), 2.866515718791933e-7, true},
		// A14: β − Σu_i/√n, β = 6: Φ(−6) in any dimension [exact] (reliability-methods.md §1.1, §1.5).
		{"A14 linear n=2", linear(2, 6), 9.865876450376946e-10, false},
		{"A14 linear n=50", linear(50, 6), 9.865876450376946e-10, false},
		// §1.5 scaling of A2: ln R ~ N(4 + √2·β, 1) gives Φ(−β) = 1e-6 and 1e-9 exactly (computed: β = Φ⁻¹(1 − p)).
		{"A2 scaled 1e-6", lognormalRatio(4+math.Sqrt2*beta1e6, 4), 1e-6, true},
		{"A2 scaled 1e-9", lognormalRatio(4+math.Sqrt2*beta1e9, 4), 1e-9, false},
		// reference-data-2.md §C.3 (computed): two opposite modes β = 5.5 in 10 dimensions, 2Φ(−5.5).
		{"C3 opposite modes", funcProblem(10,
			func(u []float64) float64 { return 5.5 - u[0] },
			func(u []float64) float64 { return 5.5 + u[0] }), 3.797912493177536e-8, true},
		// §C.3 (computed): four-branch variant c = 5.5, p = 8 (four design points).
		{"C3 four-branch c=5.5 p=8", fourBranch(5.5, 0.1, 8), 3.63130446e-8, true},
		// §C.3 (computed): n = 8 equicorrelated margins, ∫φ(v)[1 − Φ((β − √ρv)/√(1 − ρ))ⁿ]dv.
		{"C3 equicorrelated b=6 rho=0", equicorrelated(8, 6, 0), 7.89270113e-9, false},
		{"C3 equicorrelated b=6 rho=0.5", equicorrelated(8, 6, 0.5), 7.88205236e-9, false},
		{"C3 equicorrelated b=6 rho=0.9", equicorrelated(8, 6, 0.9), 5.54441743e-9, false},
		{"C3 equicorrelated b=5 rho=0.5", equicorrelated(8, 5, 0.5), 2.27156947e-6, true},
		// n = 8 identical independent lognormal-ratio bolts, p = 1e-8 each: 1 − (1 − p)⁸ (computed).
		{"independent 8 bolts p=1e-8", independentLognormal(8, beta1e8), 7.999999720000006e-08, false},
		// bench/README.md r1sep7 and cf8sep at 11.5 kN (computed: quadrature scripts named above).
		{"r1sep7", r1sep7(), r1sep7Exact, true},
		{"cf8sep 11.5 kN", cf8(), cf8Exact, false},
	}
}
