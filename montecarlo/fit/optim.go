package fit

import "math"

// nelderMead2 minimises f over the plane from x0 with initial steps h, by the
// Nelder–Mead simplex with the standard coefficients (reflection 1,
// expansion 2, contraction ½, shrink ½; Lagarias, Reeds, Wright & Wright,
// "Convergence properties of the Nelder–Mead simplex method in low
// dimensions", SIAM J. Optim. 9(1), 1998). It stops when the simplex's
// function values agree to tol (absolute) and its size to xtol, or after
// maxEval evaluations. f may return +Inf outside its domain.
//
// (gonum/optimize would do, but it pulls stat/distmv and with it a module
// the project's go.sum does not hold.)
func nelderMead2(f func(x, y float64) float64, x0, y0, hx, hy, tol, xtol float64, maxEval int) (x, y, fx float64) {
	type pt struct{ x, y, f float64 }
	p := [3]pt{{x0, y0, 0}, {x0 + hx, y0, 0}, {x0, y0 + hy, 0}}
	for i := range p {
		p[i].f = f(p[i].x, p[i].y)
	}
	evals := 3
	sortp := func() {
		if p[1].f < p[0].f {
			p[0], p[1] = p[1], p[0]
		}
		if p[2].f < p[1].f {
			p[1], p[2] = p[2], p[1]
			if p[1].f < p[0].f {
				p[0], p[1] = p[1], p[0]
			}
		}
	}
	for evals < maxEval {
		sortp()
		size := math.Max(math.Hypot(p[1].x-p[0].x, p[1].y-p[0].y), math.Hypot(p[2].x-p[0].x, p[2].y-p[0].y))
		if math.Abs(p[2].f-p[0].f) <= tol && size <= xtol {
			break
		}
		cx, cy := (p[0].x+p[1].x)/2, (p[0].y+p[1].y)/2
		at := func(t float64) pt {
			q := pt{cx + t*(p[2].x-cx), cy + t*(p[2].y-cy), 0}
			q.f = f(q.x, q.y)
			evals++
			return q
		}
		r := at(-1)
		switch {
		case r.f < p[0].f:
			if e := at(-2); e.f < r.f {
				p[2] = e
			} else {
				p[2] = r
			}
		case r.f < p[1].f:
			p[2] = r
		default:
			var c pt
			if r.f < p[2].f {
				c = at(-0.5)
			} else {
				c = at(0.5)
			}
			if c.f < math.Min(r.f, p[2].f) {
				p[2] = c
				continue
			}
			for i := 1; i < 3; i++ {
				p[i].x, p[i].y = p[0].x+(p[i].x-p[0].x)/2, p[0].y+(p[i].y-p[0].y)/2
				p[i].f = f(p[i].x, p[i].y)
				evals++
			}
		}
	}
	sortp()
	return p[0].x, p[0].y, p[0].f
}
