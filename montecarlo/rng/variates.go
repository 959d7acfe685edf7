package rng

import (
	"math"
	"math/rand/v2"
)

// Variates read straight from a chunk's PCG stream, and the exponential of
// the lognormal draws.
//
// The draws are most of the runner's time, so this file is the one place
// where the runner does not use the standard library's methods:
//   - math/rand/v2's Rand.NormFloat64 reaches its Source through an interface
//     for every value and is not inlined: about 12 ns per value on the
//     reference machine, against about 6 ns for the same ziggurat reading
//     the concrete PCG;
//   - math.Exp (assembly on amd64, one long dependency chain) took about
//     15 ns per value in a column loop, against about 6 ns for the
//     table-driven exp below.
// BenchmarkVariates measures both; variates_test.go checks the normals
// against the normal distribution and exp against math.Exp.

// The ziggurat of Marsaglia & Tsang, "The Ziggurat Method for Generating
// Random Variables", J. Statist. Software 5(8), 2000: 128 layers of area
// zigV under exp(−x²/2), the base layer carrying the tail beyond zigR. The two
// constants are those of the paper's RNOR; variates_test.go re-derives them
// from the layer equations. The layer index and the abscissa come from
// disjoint bits of one 64-bit draw (the defect of taking both from the same
// 32 bits is Doornik's, "An Improved Ziggurat Method to Generate Normal
// Random Samples", 2005).
const (
	zigLayers = 128
	zigR      = 3.442619855899
	zigV      = 9.91256303526217e-3
	zigScale  = 1 << 53 // abscissa bits: int64(u) >> 10 lies in [−2⁵³, 2⁵³)
)

var zigK, zigW, zigF = zigTables()

// zigTables returns, per layer i, the acceptance bound k[i] of the integer
// abscissa, the scale w[i] from integer to x, and f[i] = exp(−x_i²/2) at the
// layer's right edge x_i (Marsaglia & Tsang's kn, wn, fn).
func zigTables() (k [zigLayers]int64, w, f [zigLayers]float64) {
	const m = zigScale
	dn, tn := zigR, zigR
	q := zigV / math.Exp(-0.5*dn*dn)
	k[0] = int64(dn / q * m)
	k[1] = 0
	w[0] = q / m
	w[zigLayers-1] = dn / m
	f[0] = 1
	f[zigLayers-1] = math.Exp(-0.5 * dn * dn)
	for i := zigLayers - 2; i >= 1; i-- {
		dn = math.Sqrt(-2 * math.Log(zigV/dn+math.Exp(-0.5*dn*dn)))
		k[i+1] = int64(dn / tn * m)
		tn = dn
		f[i] = math.Exp(-0.5 * dn * dn)
		w[i] = dn / m
	}
	return k, w, f
}

// Normals fills dst[0], dst[stride], dst[2·stride], … with standard normal
// variates from p.
func Normals(p *rand.PCG, dst []float64, stride int) {
	for j := 0; j < len(dst); j += stride {
		u := p.Uint64()
		s := int64(u) >> 10
		if i := u & (zigLayers - 1); abs64(s) < zigK[i] {
			dst[j] = float64(s) * zigW[i] // inside the layer's rectangle: about 97 % of draws
		} else {
			dst[j] = normalEdge(p, u)
		}
	}
}

// normalEdge finishes a draw u that fell outside its layer's rectangle: the
// wedge test, or the tail beyond zigR by Marsaglia's method (1964).
func normalEdge(p *rand.PCG, u uint64) float64 {
	for {
		i := u & (zigLayers - 1)
		s := int64(u) >> 10
		x := float64(s) * zigW[i]
		if abs64(s) < zigK[i] {
			return x
		}
		if i == 0 {
			for {
				x = -math.Log(Unit(p)) / zigR
				if y := -math.Log(Unit(p)); y+y >= x*x {
					break
				}
			}
			if s > 0 {
				return zigR + x
			}
			return -zigR - x
		}
		if zigF[i]+Unit(p)*(zigF[i-1]-zigF[i]) < Exp(-0.5*x*x) {
			return x
		}
		u = p.Uint64()
	}
}

// Unit returns a uniform variate in the open interval (0, 1), never 0 or 1,
// so that inverse CDFs stay finite.
func Unit(p *rand.PCG) float64 {
	// 52 bits, so that the largest value 1 − 2⁻⁵³ is exact (53 bits plus the
	// half would round up to 1).
	return (float64(p.Uint64()>>12) + 0.5) * 0x1p-52
}

func abs64(s int64) int64 {
	m := s >> 63
	return (s ^ m) - m
}

// Exp returns eˣ to within 2⁻⁵¹ relative error of math.Exp for |x| < 700 and
// defers to math.Exp elsewhere (overflow, underflow, NaN, ±Inf). It is the
// table-driven method of Tang ("Table-driven implementation of the
// exponential function in IEEE floating-point arithmetic", ACM TOMS 15(2),
// 1989): x = (k + j/128)·ln 2 + r with |r| ≤ ln 2/256, eˣ = 2^k · 2^(j/128) ·
// e^r, the 128 powers 2^(j/128) from a table and e^r from its Taylor series
// to r⁵ (truncation below 10⁻¹⁸).
func Exp(x float64) float64 {
	if !(math.Abs(x) < 700) {
		return math.Exp(x)
	}
	const (
		n      = expTable
		invLn2 = n / math.Ln2
		// ln 2/n split as in fdlibm's e_exp.c (Ln2Hi has 32 significant bits,
		// so k·Ln2Hi is exact for |k| < 2²¹).
		ln2Hi = 6.93147180369123816490e-01 / n
		ln2Lo = 1.90821492927058770002e-10 / n
		round = 0x1.8p52 // adding it rounds to an integer held in the low bits
	)
	kd := x*invLn2 + round
	ki := math.Float64bits(kd)
	kd -= round
	r := x - kd*ln2Hi - kd*ln2Lo
	// 2^(k/n) = 2^(k div n) · 2^((k mod n)/n): the table entry with the
	// quotient added to its exponent field (k's low bits are cancelled by
	// the table's −j<<45).
	s := math.Float64frombits(expTab[ki%n] + ki<<(52-7))
	r2 := r * r
	p := r + r2*(1.0/2+r*(1.0/6)) + r2*r2*(1.0/24+r*(1.0/120))
	return s + s*p
}

// expTable is the number of entries of expTab (2⁷: the shift 52−7 above).
const expTable = 128

// expTab[j] holds the bits of 2^(j/128) less j<<45.
var expTab = func() (t [expTable]uint64) {
	for j := range t {
		t[j] = math.Float64bits(math.Exp2(float64(j)/expTable)) - uint64(j)<<(52-7)
	}
	return t
}()
