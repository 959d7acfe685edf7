package rare

import (
	"context"
	"testing"
)

// Benchmarks to a 5 % c.o.v. on the stand-ins of bench/README.md's r1sep7
// (3 coordinates, near-linear, 1.59e-7; the reference library needed 2 300
// evaluations for FORM + IS at 5 %) and cf8sep (17 coordinates, 8 bolts
// sharing a load, 1.01e-7). Each iteration is a full run with its own seed;
// the metrics are means over the iterations: evaluations (FORM included),
// the reported c.o.v., and evaluations·c.o.v.² (the evaluations a c.o.v. of
// 1 would take: divide by δ² for the cost of c.o.v. δ).

func benchImportance(b *testing.B, p *Problem) {
	var evals, cov float64
	n := 0
	for b.Loop() {
		res, err := Importance(context.Background(), p, &ImportanceSettings{Seed: uint64(n), Workers: 1})
		if err != nil {
			b.Fatal(err)
		}
		r := res[len(res)-1]
		evals += float64(r.Evaluations)
		cov += r.COV
		n++
	}
	reportRare(b, evals, cov, n)
}

func benchSubset(b *testing.B, p *Problem) {
	var evals, cov float64
	n := 0
	for b.Loop() {
		res, err := Subset(context.Background(), p, &SubsetSettings{Seed: uint64(n), Workers: 1, Precision: 0.05})
		if err != nil {
			b.Fatal(err)
		}
		r := res[len(res)-1]
		evals += float64(r.Evaluations)
		cov += r.COV
		n++
	}
	reportRare(b, evals, cov, n)
}

func reportRare(b *testing.B, evals, cov float64, n int) {
	evals /= float64(n)
	cov /= float64(n)
	b.ReportMetric(evals, "evals/op")
	b.ReportMetric(cov, "cov")
	b.ReportMetric(evals*cov*cov, "evals·cov²")
}

func BenchmarkImportanceR1Sep7(b *testing.B) { benchImportance(b, r1sep7()) }
func BenchmarkImportanceCF8Sep(b *testing.B) { benchImportance(b, cf8()) }
func BenchmarkSubsetR1Sep7(b *testing.B)     { benchSubset(b, r1sep7()) }
func BenchmarkSubsetCF8Sep(b *testing.B)     { benchSubset(b, cf8()) }

// BenchmarkSamplerChunk measures the sampler's own cost per sample on the
// cf8 stand-in (8 mixture components in 17 coordinates), with the model's
// cost shown apart by BenchmarkCF8Eval.
func BenchmarkSamplerChunk(b *testing.B) {
	p := cf8()
	dps, _ := DesignPoints(p, nil)
	q, _ := NewProposal(p, dps, nil)
	s, _ := NewSampler(p, q)
	ev := p.NewEvaluator()
	c := int64(0)
	for b.Loop() {
		s.Chunk(ev, 1, c, DefaultChunkSize)
		c++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(c*DefaultChunkSize), "ns/sample")
}

func BenchmarkCF8Eval(b *testing.B) {
	ev := newCF8()
	u := make([]float64, 17*block)
	g := make([]float64, 8*block)
	n := 0
	for b.Loop() {
		ev.Eval(u, block, g)
		n++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(n*block), "ns/point")
}
