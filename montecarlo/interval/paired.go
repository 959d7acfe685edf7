package interval

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Pairs are the outcomes of n paired samples of a base and a variant: Both
// failed together, OnlyBase and OnlyVariant are the discordant pairs.
type Pairs struct {
	N, Both, OnlyBase, OnlyVariant int64
}

// Difference compares a variant's failure probability with the base's from
// paired samples.
type Difference struct {
	D      float64 // p_variant − p_base
	Lo, Hi float64 // Newcombe's hybrid score interval of D at the confidence
	// UnpairedLo/Hi is the interval the same two estimates would have from
	// two independent runs (Newcombe's unpaired method 10, the square-and-add
	// of the two Wilson intervals); the paired one is narrower when the
	// outcomes correlate.
	UnpairedLo, UnpairedHi float64
	Ratio                  float64 // p_variant/p_base; NaN when p_base = 0
	PValue                 float64 // exact McNemar test of equal probabilities
	Discordant             int64
}

// PairedDifference estimates the difference of two paired proportions.
//
// The interval is Newcombe's hybrid score interval for paired data
// (Newcombe 1998, Statist. Med. 17:2635–2650, method 10): with the Wilson
// intervals [l1, u1] of the variant's and [l2, u2] of the base's proportion
// and the correlation φ of the paired outcomes,
//
//	L = D − √((p1 − l1)² − 2φ(p1 − l1)(u2 − p2) + (u2 − p2)²)
//	U = D + √((u1 − p1)² − 2φ(u1 − p1)(p2 − l2) + (p2 − l2)²)
//
// where φ = (AD − BC − N/2)⁺/√(EFGH) when AD > BC, else (AD − BC)/√(EFGH),
// over the 2×2 table of the pairs and its margins (0 when a margin is
// empty). The test is McNemar's exact conditional test, twice the smaller
// binomial tail of the discordant pairs at p = ½ (McNemar 1947,
// Psychometrika 12:153–157).
func PairedDifference(pr Pairs, conf float64) Difference {
	n := float64(pr.N)
	a := float64(pr.Both)        // both failed
	b := float64(pr.OnlyVariant) // variant failed, base did not
	c := float64(pr.OnlyBase)    // base failed, variant did not
	dd := n - a - b - c          // neither failed
	p1, p2 := (a+b)/n, (a+c)/n   // variant, base
	d := Difference{D: p1 - p2, Discordant: pr.OnlyBase + pr.OnlyVariant, Ratio: math.NaN()}
	if p2 > 0 {
		d.Ratio = p1 / p2
	}
	l1, u1 := WilsonInterval(pr.Both+pr.OnlyVariant, pr.N, conf)
	l2, u2 := WilsonInterval(pr.Both+pr.OnlyBase, pr.N, conf)
	phi := 0.0
	if den := (a + b) * (c + dd) * (a + c) * (b + dd); den > 0 {
		num := a*dd - b*c
		if num > 0 {
			num = math.Max(num-n/2, 0)
		}
		phi = num / math.Sqrt(den)
	}
	d.Lo = d.D - math.Sqrt(math.Max(0, sq(p1-l1)-2*phi*(p1-l1)*(u2-p2)+sq(u2-p2)))
	d.Hi = d.D + math.Sqrt(math.Max(0, sq(u1-p1)-2*phi*(u1-p1)*(p2-l2)+sq(p2-l2)))
	d.UnpairedLo, d.UnpairedHi = UnpairedDifference(pr.Both+pr.OnlyVariant, pr.N, pr.Both+pr.OnlyBase, pr.N, conf)
	if k := pr.OnlyBase + pr.OnlyVariant; k == 0 {
		d.PValue = 1
	} else {
		bin := distuv.Binomial{N: float64(k), P: 0.5}
		d.PValue = math.Min(1, 2*bin.CDF(float64(min(pr.OnlyBase, pr.OnlyVariant))))
	}
	return d
}

// UnpairedDifference returns the interval of p1 − p2 from k1 of n1 and k2
// of n2 independent samples: Newcombe's hybrid score ("square-and-add")
// interval of the two Wilson intervals (Newcombe 1998, Statist. Med.
// 17:873–890, method 10).
func UnpairedDifference(k1, n1, k2, n2 int64, conf float64) (lo, hi float64) {
	p1, p2 := float64(k1)/float64(n1), float64(k2)/float64(n2)
	l1, u1 := WilsonInterval(k1, n1, conf)
	l2, u2 := WilsonInterval(k2, n2, conf)
	d := p1 - p2
	return d - math.Sqrt(sq(p1-l1)+sq(u2-p2)), d + math.Sqrt(sq(u1-p1)+sq(p2-l2))
}

func sq(x float64) float64 { return x * x }

// Verdicts of a paired comparison.
const (
	Better       = "better"
	Worse        = "worse"
	NoDifference = "no significant difference"
	NoDiscordant = "no difference observed"
)

// Verdict says whether the variant fails less often (better) or more often
// (worse) than the base at the significance 1 − conf of McNemar's test.
func (d Difference) Verdict(conf float64) string {
	switch {
	case d.Discordant == 0:
		return NoDiscordant
	case d.PValue < 1-conf && d.D < 0:
		return Better
	case d.PValue < 1-conf && d.D > 0:
		return Worse
	}
	return NoDifference
}
