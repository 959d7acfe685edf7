package scenario

import (
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// value reads a registry field: a quantity with its unit, or a distribution.
// It returns the nominal value (the distribution's mean) and the distribution
// (nil for a fixed value).
func (p *parser) value(r rawDoc, f field) (float64, *montecarlo.Dist, float64, error) {
	n := r.vals[f.path]
	if n.Kind == yaml.ScalarNode {
		v, err := units.Parse(n.Value, f.dim)
		if err != nil {
			return 0, nil, 0, p.errf(n.Line, f.path, n.Value, "%v", err)
		}
		return v, nil, 0, nil
	}
	if n.Kind != yaml.MappingNode {
		return 0, nil, 0, p.errf(n.Line, f.path, "", "expected a value with its unit or a distribution {dist: …, mean: …, cov: …}")
	}
	d, shared, err := p.dist(n, f.path, f.dim)
	if err != nil {
		return 0, nil, 0, err
	}
	if shared > 0 && f.role&perBolt == 0 {
		return 0, nil, 0, p.errf(n.Line, f.path+".shared", "", "only an input that each bolt draws (assembly scatter) has a part shared between bolts; %s is one value for the whole joint", f.path)
	}
	return d.Mean(), &d, shared, nil
}

var distKeys = []string{"dist", "mean", "sd", "cov", "nominal", "tolerance", "coverage", "min", "max", "mode", "shape", "scale", "lower", "upper", "shared"}

var familyNames = []string{"normal", "lognormal", "uniform", "triangular", "weibull", "truncnormal"}

// distReader reads the parameters of one distribution mapping.
type distReader struct {
	p    *parser
	n    *yaml.Node
	path string
	dim  units.Dim
	kind montecarlo.Kind
	vals map[string]*yaml.Node
}

// dist reads a distribution mapping and its shared part (the correlation
// between bolts, 0 when not given).
func (p *parser) dist(n *yaml.Node, path string, dim units.Dim) (montecarlo.Dist, float64, error) {
	dr := &distReader{p: p, n: n, path: path, dim: dim, vals: map[string]*yaml.Node{}}
	err := p.pairs(n, path, func(k, v *yaml.Node) error {
		if !slices.Contains(distKeys, k.Value) {
			return p.errf(k.Line, path+"."+k.Value, "", "unknown distribution key%s; allowed: %s", suggest(k.Value, distKeys), strings.Join(distKeys, ", "))
		}
		if v.Kind != yaml.ScalarNode {
			return p.errf(v.Line, path+"."+k.Value, "", "expected a single value")
		}
		dr.vals[k.Value] = v
		return nil
	})
	if err != nil {
		return montecarlo.Dist{}, 0, err
	}
	shared := 0.0
	if v, ok := dr.vals["shared"]; ok {
		x, err := units.Parse(v.Value, units.Fraction)
		if err != nil || !(x >= 0 && x < 1) {
			return montecarlo.Dist{}, 0, p.errf(v.Line, path+".shared", v.Value, "the share of the scatter common to all bolts (their correlation) must lie within 0 … 1, e.g. 60%% (1 would be one value for all bolts: give the input once for the joint instead)")
		}
		shared = x
		delete(dr.vals, "shared")
	}
	kindName := "normal"
	if v, ok := dr.vals["dist"]; ok {
		kindName = strings.ToLower(strings.TrimSpace(v.Value))
	}
	kind, err := montecarlo.ParseKind(kindName)
	if err != nil || !slices.Contains(familyNames, kind.String()) {
		return montecarlo.Dist{}, 0, p.errf(n.Line, path+".dist", kindName, "allowed: %s%s", strings.Join(familyNames, ", "), suggest(kindName, familyNames))
	}
	dr.kind = kind
	var d montecarlo.Dist
	switch kind {
	case montecarlo.Normal, montecarlo.LogNormal, montecarlo.TruncNormal:
		d, err = dr.normalFamily()
	case montecarlo.Uniform, montecarlo.Triangular:
		d, err = dr.bounded()
	default:
		d, err = dr.weibull()
	}
	return d, shared, err
}

func (dr *distReader) has(k string) bool { _, ok := dr.vals[k]; return ok }

// quantity reads parameter k in dimension d.
func (dr *distReader) quantity(k string, d units.Dim) (float64, error) {
	v := dr.vals[k]
	x, err := units.Parse(v.Value, d)
	if err != nil {
		return 0, dr.p.errf(v.Line, dr.path+"."+k, v.Value, "%v", err)
	}
	return x, nil
}

func (dr *distReader) bad(msg string) error {
	return dr.p.errf(dr.n.Line, dr.path, "", "%s distribution: %s", dr.kind, msg)
}

// only rejects parameters the family does not take.
func (dr *distReader) only(allowed ...string) error {
	for k := range dr.vals {
		if k != "dist" && !slices.Contains(allowed, k) {
			return dr.p.errf(dr.vals[k].Line, dr.path+"."+k, "", "not a parameter of the %s distribution (allowed: %s)", dr.kind, strings.Join(allowed, ", "))
		}
	}
	return nil
}

// center reads mean or nominal.
func (dr *distReader) center() (float64, error) {
	switch {
	case dr.has("mean") && dr.has("nominal"):
		return 0, dr.bad("give mean or nominal, not both")
	case dr.has("mean"):
		return dr.quantity("mean", dr.dim)
	case dr.has("nominal"):
		return dr.quantity("nominal", dr.dim)
	}
	return 0, dr.bad("needs mean (or nominal)")
}

// tolerance reads "10%" (relative to the centre c) or an absolute quantity.
func (dr *distReader) tolerance(c float64) (float64, error) {
	v := dr.vals["tolerance"]
	s := strings.TrimSpace(v.Value)
	if strings.HasSuffix(s, "%") {
		f, err := units.Parse(s, units.Fraction)
		if err != nil {
			return 0, dr.p.errf(v.Line, dr.path+".tolerance", s, "%v", err)
		}
		if !(f > 0) {
			return 0, dr.p.errf(v.Line, dr.path+".tolerance", s, "must be > 0")
		}
		return f * abs(c), nil
	}
	t, err := dr.quantity("tolerance", dr.dim)
	if err == nil && !(t > 0) {
		err = dr.p.errf(v.Line, dr.path+".tolerance", s, "must be > 0")
	}
	return t, err
}

// sigmas reads the coverage of a tolerance: the standard deviations it
// spans (default 3).
func (dr *distReader) sigmas() (float64, error) {
	v, ok := dr.vals["coverage"]
	if !ok {
		return 3, nil
	}
	s := strings.TrimSpace(v.Value)
	for _, suf := range []string{"sigma", "σ", "sd"} {
		s = strings.TrimSpace(strings.TrimSuffix(s, suf))
	}
	f, err := units.ParseNumber(s)
	if err != nil || !(f > 0) || f > 10 {
		return 0, dr.p.errf(v.Line, dr.path+".coverage", v.Value, "expected the number of standard deviations the tolerance spans, e.g. 3 or \"3 sigma\" (0 < k ≤ 10)")
	}
	return f, nil
}

// spread reads exactly one of sd, cov or tolerance (with coverage) about
// the centre c and returns the standard deviation.
func (dr *distReader) spread(c float64) (float64, error) {
	n := 0
	for _, k := range []string{"sd", "cov", "tolerance"} {
		if dr.has(k) {
			n++
		}
	}
	if n != 1 {
		return 0, dr.bad("give exactly one of sd, cov or tolerance")
	}
	switch {
	case dr.has("sd"):
		v, err := dr.quantity("sd", dr.dim)
		if err == nil && !(v > 0) {
			err = dr.p.errf(dr.vals["sd"].Line, dr.path+".sd", dr.vals["sd"].Value, "standard deviation must be > 0")
		}
		return v, err
	case dr.has("cov"):
		v, err := dr.quantity("cov", units.Fraction)
		if err == nil && !(v > 0) {
			err = dr.p.errf(dr.vals["cov"].Line, dr.path+".cov", dr.vals["cov"].Value, "c.o.v. must be > 0")
		}
		if err == nil && c == 0 {
			err = dr.bad("a c.o.v. needs a non-zero mean")
		}
		return v * abs(c), err
	}
	t, err := dr.tolerance(c)
	if err != nil {
		return 0, err
	}
	k, err := dr.sigmas()
	return t / k, err
}

func (dr *distReader) centerSpread() (float64, float64, error) {
	c, err := dr.center()
	if err != nil {
		return 0, 0, err
	}
	sd, err := dr.spread(c)
	return c, sd, err
}

// normalFamily reads a normal, lognormal or truncated normal distribution.
func (dr *distReader) normalFamily() (montecarlo.Dist, error) {
	var d montecarlo.Dist
	allowed := []string{"mean", "nominal", "sd", "cov", "tolerance", "coverage"}
	if dr.kind == montecarlo.TruncNormal {
		allowed = append(allowed, "lower", "upper")
	}
	if err := dr.only(allowed...); err != nil {
		return d, err
	}
	c, sd, err := dr.centerSpread()
	if err != nil {
		return d, err
	}
	switch dr.kind {
	case montecarlo.Normal:
		d, err = montecarlo.NewNormal(c, sd)
	case montecarlo.LogNormal:
		if !(c > 0) {
			return d, dr.p.errf(dr.n.Line, dr.path, "", "lognormal distribution: the mean must be > 0, a lognormal quantity is positive")
		}
		d, err = montecarlo.NewLogNormalMoments(c, sd)
	default:
		lo, hi := c-10*sd, c+10*sd
		if dr.has("lower") {
			if lo, err = dr.quantity("lower", dr.dim); err != nil {
				return d, err
			}
		}
		if dr.has("upper") {
			if hi, err = dr.quantity("upper", dr.dim); err != nil {
				return d, err
			}
		}
		d, err = montecarlo.NewTruncNormal(c, sd, lo, hi)
	}
	if err != nil {
		return d, dr.bad(err.Error())
	}
	return d, nil
}

// bounded reads a uniform or triangular distribution: min and max (and
// mode), or nominal and tolerance.
func (dr *distReader) bounded() (montecarlo.Dist, error) {
	var d montecarlo.Dist
	allowed := []string{"min", "max", "nominal", "tolerance"}
	if dr.kind == montecarlo.Triangular {
		allowed = append(allowed, "mode")
	}
	if err := dr.only(allowed...); err != nil {
		return d, err
	}
	var lo, hi, mode float64
	var err error
	if dr.has("nominal") {
		if dr.has("min") || dr.has("max") {
			return d, dr.bad("give min and max, or nominal and tolerance")
		}
		if !dr.has("tolerance") {
			return d, dr.bad("nominal needs a tolerance")
		}
		c, err := dr.quantity("nominal", dr.dim)
		if err != nil {
			return d, err
		}
		t, err := dr.tolerance(c)
		if err != nil {
			return d, err
		}
		lo, hi, mode = c-t, c+t, c
	} else {
		if !dr.has("min") || !dr.has("max") {
			return d, dr.bad("needs min and max (or nominal and tolerance)")
		}
		if lo, err = dr.quantity("min", dr.dim); err != nil {
			return d, err
		}
		if hi, err = dr.quantity("max", dr.dim); err != nil {
			return d, err
		}
		mode = (lo + hi) / 2
	}
	if dr.kind == montecarlo.Uniform {
		d, err = montecarlo.NewUniform(lo, hi)
	} else {
		if dr.has("mode") {
			if mode, err = dr.quantity("mode", dr.dim); err != nil {
				return d, err
			}
		}
		d, err = montecarlo.NewTriangular(lo, mode, hi)
	}
	if err != nil {
		return d, dr.bad(err.Error())
	}
	return d, nil
}

// weibull reads a Weibull distribution by shape and scale, or by mean and
// spread.
func (dr *distReader) weibull() (montecarlo.Dist, error) {
	var d montecarlo.Dist
	if err := dr.only("shape", "scale", "mean", "cov", "sd"); err != nil {
		return d, err
	}
	if dr.has("shape") || dr.has("scale") {
		if !dr.has("shape") || !dr.has("scale") || dr.has("mean") {
			return d, dr.bad("give shape and scale, or mean and cov")
		}
		k, err := dr.quantity("shape", units.None)
		if err != nil {
			return d, err
		}
		lam, err := dr.quantity("scale", dr.dim)
		if err != nil {
			return d, err
		}
		if d, err = montecarlo.NewWeibull(k, lam); err != nil {
			return d, dr.bad(err.Error())
		}
		return d, nil
	}
	c, sd, err := dr.centerSpread()
	if err != nil {
		return d, err
	}
	if !(c > 0) {
		return d, dr.bad("the mean must be > 0")
	}
	if d, err = montecarlo.NewWeibullMoments(c, sd/c); err != nil {
		return d, dr.bad(err.Error())
	}
	return d, nil
}
