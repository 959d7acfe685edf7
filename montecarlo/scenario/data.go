package scenario

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/fit"
)

// DataSource is an input whose distribution was fitted, at load time, to a
// column of the user's own test results: {data: tests/k.csv, column: K,
// family: lognormal, predictive: true}.
type DataSource struct {
	Input    string // registry path of the input
	File     string // as written in the scenario
	Resolved string // the file read: relative to the scenario's folder, or to the working folder for standard input
	SHA256   string // of the file's bytes
	Column   string // header of the column read
	Unit     string // display unit of the column ("" for plain numbers)
	Scale    float64
	N        int // values fitted
	Rows     int // data rows read (blank cells included)
	Family   montecarlo.Kind
	// FamilyChosen: the scenario named no family; the one with the smallest
	// AIC of normal, lognormal and Weibull was taken.
	FamilyChosen bool
	Predictive   bool
	Fit          montecarlo.Dist // the plug-in maximum-likelihood fit
	// Dist is what is sampled: Fit, or the posterior predictive (a Student t
	// for normal data, a log-t for lognormal data) when Predictive.
	Dist  montecarlo.Dist
	Mean  float64 // of the sample, internal units
	SD    float64 // of the sample (divisor n − 1)
	Notes []string
}

// Method says in words how the input's distribution was obtained.
func (d *DataSource) Method() string {
	how := "maximum-likelihood " + d.Family.String() + " fit (plug-in)"
	if d.Predictive {
		how = "posterior predictive of the " + d.Family.String() + " data under the non-informative prior (Gelman et al., Bayesian Data Analysis, 3rd ed., §3.2): " + d.Dist.Kind.String()
	}
	if d.FamilyChosen {
		how += "; family by the smallest AIC of normal, lognormal and Weibull"
	}
	return how
}

// Quantity returns how the column's values are shown.
func (d *DataSource) Quantity(dim units.Dim) fit.Quantity {
	return fit.Quantity{Dim: dim, Unit: d.Unit, Scale: d.Scale}
}

var dataKeys = []string{"data", "column", "unit", "family", "predictive", "shared", "lower", "upper"}

var dataFamilies = []string{"normal", "lognormal", "weibull", "truncnormal", "uniform", "triangular"}

// isDataRef reports whether an input's node is a data reference.
func isDataRef(n *yaml.Node) bool {
	if n == nil || n.Kind != yaml.MappingNode {
		return false
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == "data" {
			return true
		}
	}
	return false
}

// value reads a registry field: a value, a distribution, or a reference to
// test data fitted here.
func (b *builder) value(f field) (float64, *montecarlo.Dist, float64, error) {
	n := b.r.vals[f.path]
	if !isDataRef(n) {
		return b.p.value(b.r, f)
	}
	ds, shared, err := b.p.dataInput(n, f)
	if err != nil {
		return 0, nil, 0, err
	}
	d := ds.Dist
	b.s.Data = append(b.s.Data, *ds)
	q := ds.Quantity(f.dim)
	pred := ""
	if ds.Predictive {
		pred = ", posterior predictive"
	}
	b.s.Sources[f.path] = fmt.Sprintf("fitted to %s column %q (n = %d, %s%s)", ds.File, ds.Column, ds.N, ds.Family, pred)
	if ds.N < fit.SmallN {
		b.s.Warnings = append(b.s.Warnings, model.Warning{Field: f.path, Message: fmt.Sprintf("fitted to only %d test values (fewer than %d): the scatter is uncertain; predictive: true carries that uncertainty into the result", ds.N, fit.SmallN)})
	}
	if ds.Predictive && d.Kind == montecarlo.LogT {
		b.s.Warnings = append(b.s.Warnings, model.Warning{Field: f.path, Message: fmt.Sprintf("the log-t predictive has no finite mean: its median %s is the nominal value", q.Format(d.Mean()))})
	}
	if shared > 0 && f.role&perBolt == 0 {
		return 0, nil, 0, b.p.errf(n.Line, f.path+".shared", "", "only an input that each bolt draws (assembly scatter) has a part shared between bolts; %s is one value for the whole joint", f.path)
	}
	return d.Mean(), &d, shared, nil
}

// dataInput reads a data reference, reads the column and fits it. Fits are
// kept by file, column and settings, so that variants share them.
func (p *parser) dataInput(n *yaml.Node, f field) (*DataSource, float64, error) {
	vals := map[string]*yaml.Node{}
	err := p.pairs(n, f.path, func(k, v *yaml.Node) error {
		if !slices.Contains(dataKeys, k.Value) {
			return p.errf(k.Line, f.path+"."+k.Value, "", "unknown key of a data input%s; allowed: %s", suggest(k.Value, dataKeys), strings.Join(dataKeys, ", "))
		}
		if v.Kind != yaml.ScalarNode {
			return p.errf(v.Line, f.path+"."+k.Value, "", "expected a single value")
		}
		vals[k.Value] = v
		return nil
	})
	if err != nil {
		return nil, 0, err
	}
	file := strings.TrimSpace(vals["data"].Value)
	if file == "" {
		return nil, 0, p.errf(vals["data"].Line, f.path+".data", "", "expected the path of a CSV file with a header row (relative to the scenario file)")
	}
	col, ok := vals["column"]
	if !ok || strings.TrimSpace(col.Value) == "" {
		return nil, 0, p.errf(n.Line, f.path+".column", "", "a data input needs column: the header of the column to fit")
	}
	column := strings.TrimSpace(col.Value)
	unit := ""
	if v, ok := vals["unit"]; ok {
		unit = strings.TrimSpace(v.Value)
		if _, err := units.Parse("1 "+unit, f.dim); err != nil || f.dim == units.None {
			allowed := "a unit of " + f.dim.String()
			if f.dim == units.None {
				allowed = "none: " + f.path + " is a plain number"
			}
			return nil, 0, p.errf(v.Line, f.path+".unit", unit, "not a unit for %s (allowed: %s)", f.path, allowed)
		}
	}
	kind, chosen := montecarlo.Kind(0), true
	if v, ok := vals["family"]; ok {
		name := strings.ToLower(strings.TrimSpace(v.Value))
		k, err := montecarlo.ParseKind(name)
		if err != nil || !slices.Contains(dataFamilies, k.String()) {
			return nil, 0, p.errf(v.Line, f.path+".family", name, "allowed: %s%s", strings.Join(dataFamilies, ", "), suggest(name, dataFamilies))
		}
		kind, chosen = k, false
	}
	predictive := false
	if v, ok := vals["predictive"]; ok {
		switch strings.ToLower(strings.TrimSpace(v.Value)) {
		case "true", "yes":
			predictive = true
		case "false", "no":
		default:
			return nil, 0, p.errf(v.Line, f.path+".predictive", v.Value, "expected true or false")
		}
	}
	var bounds *fit.Bounds
	if _, lo := vals["lower"]; lo || vals["upper"] != nil {
		if kind != montecarlo.TruncNormal {
			k := "lower"
			if !lo {
				k = "upper"
			}
			return nil, 0, p.errf(vals[k].Line, f.path+"."+k, vals[k].Value, "bounds are taken by family: truncnormal only")
		}
		bounds = &fit.Bounds{Lower: math.Inf(-1), Upper: math.Inf(1)}
		for k, dst := range map[string]*float64{"lower": &bounds.Lower, "upper": &bounds.Upper} {
			if v, ok := vals[k]; ok {
				x, err := units.Parse(v.Value, f.dim)
				if err != nil {
					return nil, 0, p.errf(v.Line, f.path+"."+k, v.Value, "%v", err)
				}
				*dst = x
			}
		}
	} else if kind == montecarlo.TruncNormal {
		return nil, 0, p.errf(n.Line, f.path+".family", "truncnormal", "a truncnormal fit needs its bounds: lower and/or upper")
	}
	shared := 0.0
	if v, ok := vals["shared"]; ok {
		x, err := units.Parse(v.Value, units.Fraction)
		if err != nil || !(x >= 0 && x < 1) {
			return nil, 0, p.errf(v.Line, f.path+".shared", v.Value, "the share of the scatter common to all bolts (their correlation) must lie within 0 … 1, e.g. 60%%")
		}
		shared = x
	}

	resolved := file
	if !filepath.IsAbs(file) {
		resolved = filepath.Join(p.dir, file)
	}
	key := fmt.Sprintf("%s\x00%s\x00%s\x00%s\x00%d\x00%v\x00%t\x00%v", f.path, resolved, column, unit, kind, chosen, predictive, bounds)
	if ds, ok := p.fits[key]; ok {
		return ds, shared, nil
	}
	line := vals["data"].Line
	fail := func(format string, a ...any) error {
		return p.errf(line, f.path+".data", file, format, a...)
	}
	raw, err := os.ReadFile(resolved)
	if err != nil {
		where := "relative to the scenario file's folder"
		if p.dir == "" {
			where = "relative to the working folder (the scenario came from standard input)"
		}
		if filepath.IsAbs(file) {
			where = "absolute"
		}
		return nil, 0, fail("cannot read the data file %s (%s): %v", resolved, where, unwrapPathError(err))
	}
	sum := sha256.Sum256(raw)
	c, err := fit.ReadColumn(bytes.NewReader(raw), fit.Spec{File: file, Column: column, Unit: unit})
	if err != nil {
		return nil, 0, fail("%s", strings.TrimPrefix(err.Error(), "fit: "))
	}
	if err := dimOK(c, f); err != nil {
		return nil, 0, fail("%s", strings.TrimPrefix(err.Error(), "fit: "))
	}
	ds := &DataSource{Input: f.path, File: file, Resolved: resolved, SHA256: hex.EncodeToString(sum[:]), Column: c.Name,
		Unit: c.Unit, Scale: c.Scale, N: len(c.Values), Rows: c.Rows, Family: kind, FamilyChosen: chosen, Predictive: predictive, Notes: c.Notes}
	if chosen {
		if ds.Family, err = bestFamily(c, predictive); err != nil {
			return nil, 0, fail("%s", strings.TrimPrefix(err.Error(), "fit: "))
		}
	}
	if err := c.CheckFamily(ds.Family); err != nil {
		return nil, 0, fail("%s", strings.TrimPrefix(err.Error(), "fit: "))
	}
	if ds.Fit, _, err = fit.Estimate(ds.Family, c.Values, bounds); err != nil {
		return nil, 0, fail("%s, column %q: %s", file, c.Name, strings.TrimPrefix(err.Error(), "fit: "))
	}
	ds.Dist = ds.Fit
	if predictive {
		if err := c.CheckPredictive(ds.Family); err != nil {
			return nil, 0, fail("%s", strings.TrimPrefix(err.Error(), "fit: "))
		}
		pr, err := fit.NewPredictive(ds.Family, c.Values)
		if err == nil {
			ds.Dist, err = pr.Dist()
		}
		if err != nil {
			return nil, 0, fail("%s, column %q: %s", file, c.Name, strings.TrimPrefix(err.Error(), "fit: "))
		}
	}
	var s, ss float64
	for _, v := range c.Values {
		s += v
	}
	ds.Mean = s / float64(ds.N)
	for _, v := range c.Values {
		ss += (v - ds.Mean) * (v - ds.Mean)
	}
	ds.SD = math.Sqrt(ss / float64(ds.N-1))
	if p.fits == nil {
		p.fits = map[string]*DataSource{}
	}
	p.fits[key] = ds
	return ds, shared, nil
}

// dimOK checks that the column's quantity is the input's: a force input
// needs forces (a unit in the cells or unit:), a plain number plain numbers.
func dimOK(c *fit.Column, f field) error {
	switch {
	case c.Dim == f.dim:
		return nil
	case f.dim == units.Fraction && c.Dim == units.None:
		return nil // bare fractions, 0.05 for 5 %
	case c.Dim == units.None:
		return &fit.DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("bare numbers, but %s is a %s: write the unit in the cells (\"31.2 kN\") or give unit: in the scenario", f.path, f.dim)}
	case f.dim == units.None:
		return &fit.DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("the values carry %s units (%s), but %s is a plain number", c.Dim, c.Unit, f.path)}
	}
	return &fit.DataError{File: c.File, Column: c.Name, Msg: fmt.Sprintf("the values are %s values (%s), but %s is a %s", c.Dim, c.Unit, f.path, f.dim)}
}

// bestFamily fits normal, lognormal and Weibull (those the data admit;
// normal and lognormal only for a predictive) and returns the one with the
// smallest AIC.
func bestFamily(c *fit.Column, predictive bool) (montecarlo.Kind, error) {
	fams := []montecarlo.Kind{montecarlo.Normal}
	if c.CheckFamily(montecarlo.LogNormal) == nil {
		fams = append(fams, montecarlo.LogNormal)
		if !predictive {
			fams = append(fams, montecarlo.Weibull)
		}
	}
	if len(c.Values) < 3 {
		return montecarlo.Normal, fmt.Errorf("%s, column %q: %d values are too few to choose a family: give family:", c.File, c.Name, len(c.Values))
	}
	r, err := fit.Analyze(c.Values, fit.Options{Families: fams, Bootstrap: -1})
	if err != nil {
		return montecarlo.Normal, err
	}
	return r.Best().Family, nil
}

func unwrapPathError(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err
	}
	return err
}

// dataSchema is the JSON Schema of a data input (one for every dimension:
// the unit is checked by the loader).
func dataSchema() map[string]any {
	p := map[string]any{
		"data":       map[string]any{"type": "string", "description": "CSV file with a header row, relative to the scenario file (to the working folder for standard input)"},
		"column":     map[string]any{"type": "string", "description": "header of the column to fit"},
		"unit":       map[string]any{"type": "string", "description": "unit of bare numbers in the column, e.g. kN"},
		"family":     map[string]any{"type": "string", "enum": dataFamilies, "description": "family to fit (default: the smallest AIC of normal, lognormal and Weibull)"},
		"predictive": map[string]any{"type": "boolean", "description": "sample the posterior predictive (Student t, log-t for lognormal) instead of the plug-in fit; normal and lognormal only"},
		"shared":     map[string]any{"$ref": "#/$defs/fraction", "description": "share of a per-bolt input's scatter common to all bolts"},
		"lower":      map[string]any{"type": []string{"number", "string"}, "description": "lower bound of a truncnormal fit"},
		"upper":      map[string]any{"type": []string{"number", "string"}, "description": "upper bound of a truncnormal fit"},
	}
	return map[string]any{"type": "object", "additionalProperties": false, "required": []string{"data", "column"},
		"description": "test data fitted at load time", "properties": p}
}
