package rare

import (
	"context"
	"math"
	"os"
	"strconv"
	"slices"
	"strings"
	"testing"
)

func TestExploreIS(t *testing.T) {
	if os.Getenv("EXPLORE") == "" {
		t.Skip()
	}
	ns, _ := strconv.Atoi(os.Getenv("SEEDS"))
	fixed, _ := strconv.Atoi(os.Getenv("FIXED"))
	for _, a := range anchors() {
		var sum, ss, rep, cover float64
		var ev float64
		for s := range ns {
			cs, _ := strconv.Atoi(os.Getenv("CHUNK")); ax, _ := strconv.ParseFloat(os.Getenv("AXIS"), 64)
			if os.Getenv("ONLY") != "" && !strings.HasPrefix(a.name, os.Getenv("ONLY")) { break }
			res, _ := Importance(context.Background(), a.p, &ImportanceSettings{Seed: uint64(s + 1000), Samples: int64(fixed), Workers: 1, ChunkSize: cs, AxisSD: ax})
			r := res[len(res)-1]
			sum += r.Probability
			ss += r.Probability * r.Probability
			rep += r.COV
			ev += float64(r.Evaluations)
			if r.Lo <= a.exact && a.exact <= r.Hi {
				cover++
			}
		}
		if sum == 0 { continue }
		n := float64(ns)
		m := sum / n
		sd := math.Sqrt((ss - n*m*m) / (n - 1))
		t.Logf("%-32s mean/exact %.4f  spread %.4f  reported %.4f  ratio %.3f  cover %.3f  evals %.0f", a.name, m/a.exact, sd/m, rep/n, sd/m/(rep/n), cover/n, ev/n)
	}
}

func TestExploreSuS(t *testing.T) {
	if os.Getenv("EXPLORE") == "" {
		t.Skip()
	}
	ns, _ := strconv.Atoi(os.Getenv("SEEDS"))
	nl, _ := strconv.Atoi(os.Getenv("N"))
	runs, _ := strconv.Atoi(os.Getenv("R"))
	for _, a := range anchors() {
		if !a.short {
			continue
		}
		if os.Getenv("ONLY") != "" && !strings.HasPrefix(a.name, os.Getenv("ONLY")) {
			continue
		}
		var sum, ss, rep, cover, form, single, logcov float64
		var ev float64
		for s := range ns {
			res, _ := Subset(context.Background(), a.p, &SubsetSettings{Seed: uint64(s + 1000), LevelSamples: nl, Runs: runs})
			r := res[len(res)-1]
			sum += r.Probability
			ss += r.Probability * r.Probability
			rep += r.COV
			ev += float64(r.Evaluations)
			if r.Lo <= a.exact && a.exact <= r.Hi {
				cover++
			}
			var m, q, f float64
			for _, x := range r.Subset.Runs {
				m += x.Probability
				q += x.Probability * x.Probability
				f += x.FormulaCOV
			}
			k := float64(len(r.Subset.Runs))
			var lm, lq float64
			for _, x := range r.Subset.Runs {
				l := math.Log(x.Probability)
				lm += l
				lq += l * l
			}
			lv := (lq - lm*lm/k) / (k - 1)
			logcov += math.Sqrt(math.Expm1(lv) / k)
			form += f / k
			single += math.Sqrt((q-m*m/k)/(k-1)) / (m / k)
		}
		n := float64(ns)
		m := sum / n
		sd := math.Sqrt((ss - n*m*m) / (n - 1))
		t.Logf("%-30s mean/exact %.4f spread %.4f reported %.4f ratio %.3f cover %.3f evals %.0f | per run: spread %.3f formula %.3f | logcov %.4f ratio %.3f", a.name, m/a.exact, sd/m, rep/n, sd/m/(rep/n), cover/n, ev/n, single/n, form/n, logcov/n, sd/m/(logcov/n))
	}
}

func TestExploreSuSDist(t *testing.T) {
	if os.Getenv("EXPLORE") == "" {
		t.Skip()
	}
	nl, _ := strconv.Atoi(os.Getenv("N"))
	for _, a := range anchors() {
		if !strings.HasPrefix(a.name, os.Getenv("ONLY")) {
			continue
		}
		res, _ := Subset(context.Background(), a.p, &SubsetSettings{Seed: 5, LevelSamples: nl, Runs: 1000, MaxRuns: 1000})
		r := res[len(res)-1]
		var ps []float64
		var m, f float64
		for _, x := range r.Subset.Runs {
			ps = append(ps, x.Probability/a.exact)
			m += x.Probability / a.exact
			f += x.FormulaCOV
		}
		slices.Sort(ps)
		n := float64(len(ps))
		m /= n
		v := 0.0
		for _, x := range ps {
			v += (x - m) * (x - m)
		}
		t.Logf("%s: mean %.3f sd %.3f formula %.3f quantiles 1%% %.3f 10%% %.3f 50%% %.3f 90%% %.3f 99%% %.3f max %.3f acc %v", a.name, m, math.Sqrt(v/(n-1)), f/n,
			ps[int(0.01*n)], ps[int(0.1*n)], ps[int(0.5*n)], ps[int(0.9*n)], ps[int(0.99*n)], ps[len(ps)-1], r.Subset.Runs[0].Acceptance)
	}
}
