package rare

import (
	"fmt"
	"math"
)

// FORMSettings tunes the design-point search. The zero value gives the
// defaults.
type FORMSettings struct {
	// MaxIterations caps the HL-RF steps per component (default 100).
	MaxIterations int
	// GTol: the point is on the limit state when |g(u)| ≤ GTol·|g(0)|
	// (default 1e-4).
	GTol float64
	// UTol: u is along the gradient when ‖u − (α·u)α‖ ≤ UTol, in
	// standard-normal units (default 1e-3).
	UTol float64
	// Step is the finite-difference step in standard-normal units (default
	// 1e-6 for forward, 1e-4 for central differences).
	Step float64
	// Central selects central differences (2 evaluations per support
	// coordinate instead of 1).
	Central bool
	// Workers searches components in parallel (default GOMAXPROCS); the
	// result does not depend on it.
	Workers int
}

func (s FORMSettings) withDefaults() FORMSettings {
	if s.MaxIterations <= 0 {
		s.MaxIterations = 100
	}
	if s.GTol <= 0 {
		s.GTol = 1e-4
	}
	if s.UTol <= 0 {
		s.UTol = 1e-3
	}
	if s.Step <= 0 {
		s.Step = 1e-6
		if s.Central {
			s.Step = 1e-4
		}
	}
	return s
}

// DesignPoint is the Hasofer–Lind design point of one component: the point
// of the limit state g_c = 0 nearest to the origin of standard-normal space.
type DesignPoint struct {
	Component int
	// Beta is the Hasofer–Lind index α·u*: the distance of u* from the
	// origin, negative when the origin itself fails (g_c(0) ≤ 0: the
	// component is not rare).
	Beta float64
	U    []float64 // design point u* (= Beta·Alpha at convergence)
	// Alpha = −∇g/‖∇g‖ at u*: α_i > 0 for a load-like coordinate (raising
	// u_i lowers the margin), α_i < 0 for a resistance-like one; α_i² are
	// the FORM importance factors (Σα_i² = 1).
	Alpha []float64
	// FORM is the first-order approximation Φ(−β) of the component's
	// failure probability: an approximation, not an estimate (no error
	// bar); 0 when the search did not converge (Beta is then the last
	// iterate's and Message says why).
	FORM        float64
	G0          float64 // g_c at the origin (the median point)
	Iterations  int     // HL-RF steps taken
	Evaluations int64   // points evaluated by this search (0 for a mapped one)
	Converged   bool
	Message     string // why it did not converge, or a note (not rare, mapped)
	MappedFrom  int    // the component whose search was mapped here by a block swap; −1 when searched
}

// DesignPoints finds the design point of every component by the improved
// HL-RF algorithm (see the package documentation). Under a Symmetry only
// the components of block 0 and the shared ones are searched; the others
// get the searched point with the blocks swapped, at no evaluation.
func DesignPoints(p *Problem, s *FORMSettings) ([]DesignPoint, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	var fs FORMSettings
	if s != nil {
		fs = *s
	}
	return designPoints(p, fs, newEvaluators(p, workers(fs.Workers))), nil
}

func designPoints(p *Problem, fs FORMSettings, evs *evaluators) []DesignPoint {
	fs = fs.withDefaults()
	plan, _ := symmetryPlan(p) // validated by the caller
	var searched []int
	for c, pl := range plan {
		if pl[0] == c {
			searched = append(searched, c)
		}
	}
	dps := make([]DesignPoint, p.Components)
	forEach(evs.n(), len(searched), func(w, i int) {
		c := searched[i]
		f := formSearch{p: p, s: fs, ev: evs.get(w), c: c, supp: p.support(c)}
		dps[c] = f.run()
	})
	for c, pl := range plan {
		if pl[0] == c {
			continue
		}
		src := dps[pl[0]]
		d := src
		d.Component, d.MappedFrom, d.Evaluations, d.Iterations = c, src.Component, 0, 0
		d.U, d.Alpha = make([]float64, p.Dim), make([]float64, p.Dim)
		p.Symmetry.swapBlocks(d.U, src.U, pl[1])
		p.Symmetry.swapBlocks(d.Alpha, src.Alpha, pl[1])
		note := fmt.Sprintf("mapped from component %d by swapping blocks 0 and %d", src.Component, pl[1])
		if d.Message != "" {
			d.Message = note + "; " + d.Message
		} else {
			d.Message = note
		}
		dps[c] = d
	}
	return dps
}

// formSearch is one component's design-point search.
type formSearch struct {
	p    *Problem
	s    FORMSettings
	ev   Evaluator
	c    int
	supp []int
	rows []float64 // points to evaluate, row-major
	gs   []float64 // their component values
	n    int64     // points evaluated
}

// eval evaluates the k rows in f.rows and returns component c of row i via f.gs.
func (f *formSearch) eval(k int) {
	d, nc := f.p.Dim, f.p.Components
	if cap(f.gs) < k*nc {
		f.gs = make([]float64, k*nc)
	}
	f.gs = f.gs[:k*nc]
	f.ev.Eval(f.rows[:k*d], k, f.gs)
	f.n += int64(k)
}

func (f *formSearch) at(i int) float64 { return f.gs[i*f.p.Components+f.c] }

// value returns g_c(u).
func (f *formSearch) value(u []float64) float64 {
	f.ensureRows(1)
	copy(f.rows, u)
	f.eval(1)
	return f.at(0)
}

func (f *formSearch) ensureRows(k int) {
	if cap(f.rows) < k*f.p.Dim {
		f.rows = make([]float64, k*f.p.Dim)
	}
	f.rows = f.rows[:k*f.p.Dim]
}

// gradient fills grad (zero outside the support) by finite differences at u,
// where g_c(u) = g0 (NaN: evaluated here too). It returns g0 and false if a
// value is NaN.
func (f *formSearch) gradient(u []float64, g0 float64, grad []float64) (float64, bool) {
	d, h := f.p.Dim, f.s.Step
	per := 1
	if f.s.Central {
		per = 2
	}
	base := 0
	if math.IsNaN(g0) {
		base = 1
	}
	k := base + per*len(f.supp)
	f.ensureRows(k)
	for r := range k {
		copy(f.rows[r*d:(r+1)*d], u)
	}
	for j, i := range f.supp {
		f.rows[(base+per*j)*d+i] += h
		if f.s.Central {
			f.rows[(base+per*j+1)*d+i] -= h
		}
	}
	f.eval(k)
	if base == 1 {
		g0 = f.at(0)
	}
	clear(grad)
	ok := !math.IsNaN(g0)
	for j, i := range f.supp {
		if f.s.Central {
			grad[i] = (f.at(base+2*j) - f.at(base+2*j+1)) / (2 * h)
		} else {
			grad[i] = (f.at(base+j) - g0) / h
		}
		if math.IsNaN(grad[i]) || math.IsInf(grad[i], 0) {
			ok = false
		}
	}
	return g0, ok
}

// run is the improved HL-RF iteration (Zhang & Der Kiureghian 1995):
//
//	d_k = [(∇g·u_k − g(u_k))/‖∇g‖²]·∇g − u_k           (HL-RF direction)
//	m(u) = ½‖u‖² + c_k·|g(u)|,  c_k = 2·max(‖u_k‖/‖∇g‖, ½‖u_k + d_k‖²/|g(u_k)|)
//	u_{k+1} = u_k + λ_k d_k,  λ_k = the first of 1, ½, ¼, … with
//	          m(u_k + λd_k) ≤ m(u_k) + 0.1·λ·∇m(u_k)·d_k   (Armijo)
//
// c_k > ‖u_k‖/‖∇g‖ makes d_k a descent direction of m (∇m·d_k =
// u_k·d_k − c_k·|g(u_k)| < 0, Zhang & Der Kiureghian's condition); the second
// term of c_k (ours) makes the full step onto a linear limit state
// acceptable. Converged when |g(u)| ≤ GTol·|g(0)| and ‖u − (α·u)α‖ ≤ UTol.
func (f *formSearch) run() DesignPoint {
	d := f.p.Dim
	dp := DesignPoint{Component: f.c, MappedFrom: -1}
	u := make([]float64, d)
	grad := make([]float64, d)
	dir := make([]float64, d)
	v := make([]float64, d)
	alpha := make([]float64, d)
	finish := func(msg string) DesignPoint {
		dp.U, dp.Alpha, dp.Evaluations = u, alpha, f.n
		dp.Beta = dot(alpha, u)
		if dp.Converged {
			dp.FORM = normSF(dp.Beta)
		}
		if msg != "" {
			dp.Message = msg
		} else if dp.Converged && dp.G0 <= 0 {
			dp.Message = "g(0) ≤ 0: the median point fails, the component is not rare (β ≤ 0)"
		}
		return dp
	}
	g, ok := f.gradient(u, math.NaN(), grad)
	dp.G0 = g
	if math.IsNaN(g) {
		dp.G0 = 0
		return finish("g is undefined (NaN) at the origin")
	}
	if !ok {
		return finish("g is undefined (NaN) at a finite-difference point next to the origin")
	}
	scale := math.Abs(g)
	for it := 0; ; it++ {
		gn := norm2(grad)
		if gn == 0 {
			return finish(fmt.Sprintf("zero gradient at iteration %d (|g| = %.3g): g does not depend on its support coordinates there", it, math.Abs(g)))
		}
		for i := range alpha {
			alpha[i] = 0 // not −0 where the gradient vanishes
			if grad[i] != 0 {
				alpha[i] = -grad[i] / gn
			}
		}
		au := dot(alpha, u)
		perp := 0.0
		for i := range u {
			x := u[i] - au*alpha[i]
			perp += x * x
		}
		perp = math.Sqrt(perp)
		if math.Abs(g) <= f.s.GTol*scale && perp <= f.s.UTol {
			dp.Converged = true
			return finish("")
		}
		if it == f.s.MaxIterations {
			return finish(fmt.Sprintf("no convergence after %d iterations: |g|/|g(0)| = %.3g (tolerance %.3g), ‖u − (α·u)α‖ = %.3g (tolerance %.3g); β is not reliable",
				it, math.Abs(g)/scale, f.s.GTol, perp, f.s.UTol))
		}
		dp.Iterations = it + 1
		a := (dot(grad, u) - g) / (gn * gn)
		for i := range dir {
			dir[i] = a*grad[i] - u[i]
			v[i] = u[i] + dir[i]
		}
		un := norm2(u)
		c := 2 * un / gn
		if g != 0 {
			c = 2 * math.Max(un/gn, 0.5*dot(v, v)/math.Abs(g))
		}
		if c == 0 {
			c = 1 / gn
		}
		m0 := 0.5*un*un + c*math.Abs(g)
		slope := dot(u, dir) - c*math.Abs(g) // ∇m·d (∇g·d = −g)
		lambda := 1.0
		accepted := false
		var gv float64
		for range 30 {
			for i := range v {
				v[i] = u[i] + lambda*dir[i]
			}
			gv = f.value(v)
			if !math.IsNaN(gv) && 0.5*dot(v, v)+c*math.Abs(gv) <= m0+0.1*lambda*slope {
				accepted = true
				break
			}
			lambda /= 2
		}
		if !accepted {
			return finish(fmt.Sprintf("line search failed at iteration %d (no sufficient decrease of the merit function down to step 2⁻³⁰, or g undefined)", it+1))
		}
		copy(u, v)
		g = gv
		if _, ok := f.gradient(u, g, grad); !ok {
			return finish(fmt.Sprintf("g is undefined (NaN) at a finite-difference point at iteration %d", it+1))
		}
	}
}
