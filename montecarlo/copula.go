package montecarlo

import (
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// Copula is a Gaussian copula over n inputs: independent standard normal
// variates ε are mixed as z = L·ε, with L the Cholesky factor of the
// correlation matrix, and each input is drawn from its own z.
type Copula struct {
	n int
	l []float64 // lower-triangular factor, row-major n×n
}

// NewCopula builds the copula of n inputs from pairwise correlations.
// Unnamed pairs are uncorrelated. The matrix must be positive definite.
func NewCopula(n int, corr []Correlation) (*Copula, error) {
	sym := mat.NewSymDense(n, nil)
	for i := range n {
		sym.SetSym(i, i, 1)
	}
	for _, c := range corr {
		if c.I < 0 || c.I >= n || c.J < 0 || c.J >= n || c.I == c.J {
			return nil, fmt.Errorf("correlation between inputs %d and %d: index out of range", c.I, c.J)
		}
		if !(c.Rho > -1 && c.Rho < 1) {
			return nil, fmt.Errorf("correlation %g must lie strictly between −1 and 1", c.Rho)
		}
		if sym.At(c.I, c.J) != 0 {
			return nil, fmt.Errorf("correlation between inputs %d and %d given twice", c.I, c.J)
		}
		sym.SetSym(c.I, c.J, c.Rho)
	}
	var ch mat.Cholesky
	if ok := ch.Factorize(sym); !ok {
		return nil, fmt.Errorf("the correlation matrix is not positive definite: the correlations given contradict one another")
	}
	var tri mat.TriDense
	ch.LTo(&tri)
	l := make([]float64, n*n)
	for i := range n {
		for j := 0; j <= i; j++ {
			l[i*n+j] = tri.At(i, j)
		}
	}
	return &Copula{n: n, l: l}, nil
}

// Mix replaces eps (independent standard normals) by z = L·eps in place.
// It works from the last row up so that no scratch space is needed.
func (c *Copula) Mix(eps []float64) {
	n := c.n
	for i := n - 1; i >= 0; i-- {
		row := c.l[i*n : i*n+i+1]
		s := 0.0
		for j, v := range row {
			s += v * eps[j]
		}
		eps[i] = s
	}
}
