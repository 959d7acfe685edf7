package montecarlo_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"boltrisk/montecarlo"
)

// The Student t and log-t kinds against SciPy 1.10.1 (scipy.stats.t;
// computed) and gonum's distuv.StudentsT.
func TestStudentTKinds(t *testing.T) {
	t.Parallel()
	st := mustDist(montecarlo.NewStudentT(1, 2, 5))
	lt := mustDist(montecarlo.NewLogT(0.5, 0.3, 2))
	for _, c := range []struct {
		what      string
		got, want float64
		rel       float64
	}{
		{"t(5; 1, 2) 1 % quantile", st.Quantile(0.01), -5.729859997814551, 1e-9},
		{"t(5; 1, 2) CDF(−3)", st.CDF(-3), 0.05096973941492914, 1e-9},
		{"t(5; 1, 2) sd", st.StdDev(), 2.581988897471611, 1e-12},
		{"t(5; 1, 2) mean", st.Mean(), 1, 0},
		// x = F⁻¹(Φ(z)) deep in both tails (scipy t(5, 1, 2).ppf(norm.cdf(−6));
		// the upper tail by symmetry about the location 1).
		{"t(5; 1, 2) F⁻¹(Φ(−6))", st.FromNormal(-6), -197.40978969805295, 1e-8},
		{"t(5; 1, 2) F⁻¹(Φ(+6))", st.FromNormal(6), 2 + 197.40978969805295, 1e-8},
		{"log-t(2; 0.5, 0.3) quartile", lt.Quantile(0.25), 1.290527469288365, 1e-9},
		{"log-t 99.9 %", lt.Quantile(0.999), 1336.9383040753667, 1e-8},
		{"log-t CDF(1.2)", lt.CDF(1.2), 0.2003138071079421, 1e-9},
		{"log-t median as its mean", lt.Mean(), math.Exp(0.5), 1e-15},
		// no finite sd: half the central 68.27 % width, from t(2).ppf(Φ(1)) = 1.32128.
		{"log-t spread", lt.StdDev(), (math.Exp(0.5+0.3*1.3212773729262586) - math.Exp(0.5-0.3*1.3212773729262586)) / 2, 1e-9},
		{"log-t from a uniform", lt.FromUniform(0.25), 1.290527469288365, 1e-9},
		{"log-t from a normal", lt.FromNormal(0), math.Exp(0.5), 1e-15},
	} {
		if math.IsNaN(c.got) || math.Abs(c.got-c.want) > c.rel*math.Abs(c.want) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	// The uniform and normal maps agree with gonum's quantile over (0, 1).
	g := distuv.StudentsT{Mu: 1, Sigma: 2, Nu: 5}
	for _, u := range []float64{1e-9, 0.01, 0.3, 0.5, 0.7, 0.99, 1 - 1e-9} {
		if x, w := st.FromUniform(u), g.Quantile(u); math.Abs(x-w) > 1e-6*math.Max(1, math.Abs(w)) {
			t.Errorf("FromUniform(%g) = %g, gonum %g", u, x, w)
		}
	}
	if _, err := montecarlo.NewStudentT(0, 0, 3); err == nil {
		t.Error("scale 0: want an error")
	}
	if _, err := montecarlo.NewLogT(0, 1, math.NaN()); err == nil {
		t.Error("d.o.f. NaN: want an error")
	}
	// Studies move and scale them: the log-t by its median.
	m, err := lt.Multiplied(2)
	if err != nil || math.Abs(m.Mean()-2*lt.Mean()) > 1e-12 {
		t.Errorf("Multiplied: %v %v", m, err)
	}
	sh, err := st.Shifted(7)
	if err != nil || sh.Mean() != 7 || sh.B != 2 {
		t.Errorf("Shifted: %v %v", sh, err)
	}
}

// Sampling: moments and quartiles of the Student t with ν = 22 (the
// predictive of 23 values) from uniforms and from normals.
func TestStudentTSampling(t *testing.T) {
	t.Parallel()
	d := mustDist(montecarlo.NewStudentT(72.2, 38.3, 22))
	r := newSource(5)
	const n = 200_000
	var s, ss float64
	below := 0
	q1 := d.Quantile(0.25)
	for i := range n {
		var x float64
		if i%2 == 0 {
			x = d.FromUniform(r.Float64())
		} else {
			x = d.FromNormal(r.NormFloat64())
		}
		s += x
		ss += x * x
		if x <= q1 {
			below++
		}
	}
	mean := s / n
	sd := math.Sqrt(ss/n - mean*mean)
	// 5 standard errors: a false alarm about once in 10⁶ runs.
	if math.Abs(mean-d.Mean()) > 5*d.StdDev()/math.Sqrt(n) || math.Abs(sd/d.StdDev()-1) > 0.015 {
		t.Errorf("sample mean %.5g sd %.5g, want %.5g %.5g", mean, sd, d.Mean(), d.StdDev())
	}
	if f := float64(below) / n; math.Abs(f-0.25) > 0.005 {
		t.Errorf("F(Q(0.25)) = %.4f", f)
	}
}

// BenchmarkLogTFromNormal is the per-sample map of a predictive input in
// the kernel (x = F⁻¹(Φ(z)) through gonum's StudentsT quantile); it
// allocates nothing.
func BenchmarkLogTFromNormal(b *testing.B) {
	d := mustDist(montecarlo.NewLogT(-1.6, 0.08, 11))
	z, s := -3.0, 0.0
	for b.Loop() {
		s += d.FromNormal(z)
		z += 1e-6
	}
	if s == 0 {
		b.Fatal("no samples")
	}
}

// The table behind the normal map agrees with the exact F⁻¹(Φ(z)) to a
// relative error below 10⁻⁶ from the centre to |z| = 9 for ν ≥ 3 (the
// predictive of 4 values or more; 10⁻⁸ from ν = 11), far below anything a
// simulation resolves.
func TestStudentTTable(t *testing.T) {
	t.Parallel()
	for _, nu := range []float64{3, 5, 11, 22, 200} {
		d := mustDist(montecarlo.NewStudentT(0, 1, nu))
		plain := montecarlo.Dist{Kind: montecarlo.StudentT, A: 0, B: 1, C: nu} // no table: exact
		worst := 0.0
		for z := -9.5; z <= 9.5; z += 0.0037 {
			got, want := d.FromNormal(z), plain.FromNormal(z)
			if e := math.Abs(got-want) / math.Max(1e-3, math.Abs(want)); e > worst {
				worst = e
			}
		}
		if lim := map[bool]float64{true: 1e-6, false: 1e-8}[nu < 11]; worst > lim {
			t.Errorf("ν = %g: largest relative error of the table %.3g", nu, worst)
		}
	}
}

// BenchmarkStudentTTable builds the table of one ν (once per scenario
// load for each new ν).
func BenchmarkStudentTTable(b *testing.B) {
	nu := 1000.5
	for b.Loop() {
		nu++
		if _, err := montecarlo.NewStudentT(0, 1, nu); err != nil {
			b.Fatal(err)
		}
	}
}
