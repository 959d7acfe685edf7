// Package scenario reads scenario files: YAML documents that describe one
// joint, which of its inputs are uncertain, and the study settings. Every
// dimensional quantity carries its unit; every problem is reported with file,
// line, field, value and what is allowed.
package scenario

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// Study holds the run settings a scenario may carry; command-line flags
// override them. Zero values mean "not set".
type Study struct {
	Samples    int64
	Seed       uint64
	SeedSet    bool
	Confidence float64
	Target     float64
}

// Scenario is a loaded, validated joint with its uncertain inputs.
type Scenario struct {
	Name        string
	Description string
	File        string // path it was read from ("" for built-in examples)
	SHA256      string // of the file's bytes
	Units       units.System

	Problem  montecarlo.Problem // nominal inputs (means of distributions) and uncertain ones
	Study    Study
	Warnings []model.Warning

	ClassName     string // property class used, "" if strengths were given
	ConditionName string // assembly-condition preset, "" if none
	ToolName      string // tightening-tool preset, "" if none
	EnduranceNote string // where the endurance strength came from

	Variants []*Scenario // named variants (compare); each is a complete scenario
	Variant  string      // this scenario's variant name, "" for the base
}

// Inputs returns the nominal model inputs.
func (s *Scenario) Inputs() *model.Inputs { return &s.Problem.Base }

// Uncertain returns the uncertain input bound to path, if any.
func (s *Scenario) Uncertain(path string) (*montecarlo.Var, bool) {
	for i := range s.Problem.Vars {
		if s.Problem.Vars[i].Name == path {
			return &s.Problem.Vars[i], true
		}
	}
	return nil, false
}

// rawDoc is the flattened document: dotted path → node, plus the lists.
type rawDoc struct {
	vals  map[string]*yaml.Node
	keyAt map[string]int // line of each key
	corr  []*yaml.Node
	vars  []*yaml.Node
	nLay  int
}

func (r rawDoc) clone() rawDoc {
	c := r
	c.vals = make(map[string]*yaml.Node, len(r.vals))
	for k, v := range r.vals {
		c.vals[k] = v
	}
	c.keyAt = make(map[string]int, len(r.keyAt))
	for k, v := range r.keyAt {
		c.keyAt[k] = v
	}
	return c
}

var sectionKeys = map[string][]string{
	"":           {"name", "description", "units", "bolt", "members", "tightening", "loads", "plate", "fatigue", "study", "correlations", "variants"},
	"bolt":       {"thread", "class", "count", "length", "thread_length"},
	"members":    {"method", "layers"},
	"layer":      {"thickness", "material", "modulus"},
	"tightening": {"method", "condition", "tool"},
	"loads":      {"shear_planes", "threads_in_shear_plane"},
	"plate":      {"material", "resistance", "bolts_across"},
	"fatigue":    {"criterion", "endurance_source"},
	"study":      {"samples", "seed", "confidence", "target"},
}

func init() {
	for _, f := range fields {
		sec, key, _ := strings.Cut(f.path, ".")
		if sec == "members" && strings.HasPrefix(key, "layers.") {
			continue
		}
		sectionKeys[sec] = append(sectionKeys[sec], key)
	}
}

// Load reads and validates a scenario file.
func Load(path string) (*Scenario, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read scenario: %w", err)
	}
	return Parse(path, data)
}

// Parse validates a scenario held in memory; name is used in messages.
func Parse(name string, data []byte) (*Scenario, error) {
	p := &parser{file: name}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, p.errf(0, "", "", "the file is empty; a scenario needs at least bolt, members and tightening")
	}
	if bytes.IndexByte(data, 0) >= 0 || !utf8.Valid(data) {
		return nil, p.errf(0, "", "", "the file is not text (binary data or invalid UTF-8); a scenario is a YAML document")
	}
	var doc yaml.Node
	if err := yaml.Unmarshal(data, &doc); err != nil {
		return nil, p.errf(0, "", "", "not valid YAML: %s", strings.TrimPrefix(err.Error(), "yaml: "))
	}
	if len(doc.Content) == 0 || doc.Content[0].Kind != yaml.MappingNode {
		line := 0
		if len(doc.Content) > 0 {
			line = doc.Content[0].Line
		}
		return nil, p.errf(line, "", "", "a scenario is a YAML mapping of sections (bolt:, members:, tightening:, …)")
	}
	raw, err := p.flatten(doc.Content[0])
	if err != nil {
		return nil, err
	}
	s, err := p.build(raw)
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256(data)
	s.SHA256 = hex.EncodeToString(sum[:])
	for _, v := range s.Variants {
		v.SHA256 = s.SHA256
	}
	return s, nil
}

type parser struct {
	file string
}

func (p *parser) errf(line int, field, value, format string, args ...any) *Error {
	return &Error{File: p.file, Line: line, Field: field, Value: value, Msg: fmt.Sprintf(format, args...)}
}

// pairs iterates a mapping node's key/value pairs, rejecting duplicate keys.
func (p *parser) pairs(n *yaml.Node, where string, fn func(k, v *yaml.Node) error) error {
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if k.Kind != yaml.ScalarNode {
			return p.errf(k.Line, where, "", "keys must be plain words")
		}
		if seen[k.Value] {
			return p.errf(k.Line, join(where, k.Value), "", "key given twice")
		}
		seen[k.Value] = true
		if err := fn(k, v); err != nil {
			return err
		}
	}
	return nil
}

func join(a, b string) string {
	if a == "" {
		return b
	}
	return a + "." + b
}

func (p *parser) checkKey(section string, k *yaml.Node) error {
	allowed := sectionKeys[section]
	if slices.Contains(allowed, k.Value) {
		return nil
	}
	where := section
	if section == "" {
		where = "top level"
	}
	if section == "layer" {
		where = "members.layers[]"
	}
	return p.errf(k.Line, join(section, k.Value), "", "unknown key in %s%s; allowed: %s", where, suggest(k.Value, allowed), strings.Join(allowed, ", "))
}

func (p *parser) flatten(root *yaml.Node) (rawDoc, error) {
	r := rawDoc{vals: map[string]*yaml.Node{}, keyAt: map[string]int{}}
	err := p.pairs(root, "", func(k, v *yaml.Node) error {
		if err := p.checkKey("", k); err != nil {
			return err
		}
		sec := k.Value
		switch sec {
		case "name", "description", "units":
			if v.Kind != yaml.ScalarNode {
				return p.errf(v.Line, sec, "", "expected a single value")
			}
			r.vals[sec], r.keyAt[sec] = v, k.Line
			return nil
		case "correlations", "variants":
			if v.Kind != yaml.SequenceNode {
				return p.errf(v.Line, sec, "", "expected a list (lines starting with '-')")
			}
			if sec == "correlations" {
				r.corr = v.Content
			} else {
				r.vars = v.Content
			}
			return nil
		}
		if v.Kind != yaml.MappingNode {
			return p.errf(v.Line, sec, "", "expected a section of key: value lines")
		}
		return p.pairs(v, sec, func(k2, v2 *yaml.Node) error {
			if err := p.checkKey(sec, k2); err != nil {
				return err
			}
			path := sec + "." + k2.Value
			if path == "members.layers" {
				return p.flattenLayers(&r, v2)
			}
			r.vals[path], r.keyAt[path] = v2, k2.Line
			return nil
		})
	})
	return r, err
}

func (p *parser) flattenLayers(r *rawDoc, v *yaml.Node) error {
	if v.Kind != yaml.SequenceNode || len(v.Content) == 0 {
		return p.errf(v.Line, "members.layers", "", "expected a list of at least one layer, each with thickness and material or modulus")
	}
	if len(v.Content) > model.MaxLayers {
		return p.errf(v.Line, "members.layers", strconv.Itoa(len(v.Content)), "at most %d layers are allowed", model.MaxLayers)
	}
	for i, l := range v.Content {
		if l.Kind != yaml.MappingNode {
			return p.errf(l.Line, fmt.Sprintf("members.layers.%d", i+1), "", "expected thickness: and material: (or modulus:)")
		}
		err := p.pairs(l, fmt.Sprintf("members.layers.%d", i+1), func(k, val *yaml.Node) error {
			if err := p.checkKey("layer", k); err != nil {
				return err
			}
			path := fmt.Sprintf("members.layers.%d.%s", i+1, k.Value)
			r.vals[path], r.keyAt[path] = val, k.Line
			return nil
		})
		if err != nil {
			return err
		}
	}
	r.nLay = len(v.Content)
	return nil
}

// scalar returns the text of a scalar at path, or "" and false if absent.
func (p *parser) scalar(r rawDoc, path string) (string, int, bool, error) {
	n, ok := r.vals[path]
	if !ok {
		return "", 0, false, nil
	}
	if n.Kind != yaml.ScalarNode {
		return "", n.Line, true, p.errf(n.Line, path, "", "expected a single value, not a list or section")
	}
	return strings.TrimSpace(n.Value), n.Line, true, nil
}

// word reads an enumerated word.
func (p *parser) word(r rawDoc, path, def string, allowed []string) (string, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return def, err
	}
	s = strings.ToLower(s)
	if allowed != nil && !slices.Contains(allowed, s) {
		return "", p.errf(line, path, s, "allowed: %s%s", strings.Join(allowed, ", "), suggest(s, allowed))
	}
	return s, nil
}

// integer reads a whole number within [lo, hi].
func (p *parser) integer(r rawDoc, path string, def, lo, hi int64) (int64, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return def, err
	}
	v, err := units.ParseNumber(s)
	if err != nil || v != float64(int64(v)) {
		return 0, p.errf(line, path, s, "expected a whole number from %d to %d", lo, hi)
	}
	if int64(v) < lo || int64(v) > hi {
		return 0, p.errf(line, path, s, "must be from %d to %d", lo, hi)
	}
	return int64(v), nil
}

func (p *parser) boolean(r rawDoc, path string) (bool, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return false, err
	}
	switch strings.ToLower(s) {
	case "true", "yes":
		return true, nil
	case "false", "no":
		return false, nil
	}
	return false, p.errf(line, path, s, "expected true or false")
}

// value reads a registry field: a quantity with its unit, or a distribution.
// It returns the nominal value (the distribution's mean) and the distribution
// (nil for a fixed value).
func (p *parser) value(r rawDoc, f field) (float64, *montecarlo.Dist, int, error) {
	n := r.vals[f.path]
	if n.Kind == yaml.ScalarNode {
		v, err := units.Parse(n.Value, f.dim)
		if err != nil {
			return 0, nil, n.Line, p.errf(n.Line, f.path, n.Value, "%v", err)
		}
		return v, nil, n.Line, nil
	}
	if n.Kind != yaml.MappingNode {
		return 0, nil, n.Line, p.errf(n.Line, f.path, "", "expected a value with its unit or a distribution {dist: …, mean: …, cov: …}")
	}
	d, err := p.dist(n, f.path, f.dim)
	if err != nil {
		return 0, nil, n.Line, err
	}
	return d.Mean(), &d, n.Line, nil
}

var distKeys = []string{"dist", "mean", "sd", "cov", "nominal", "tolerance", "coverage", "min", "max", "mode", "shape", "scale", "lower", "upper"}

// dist reads a distribution mapping.
func (p *parser) dist(n *yaml.Node, path string, dim units.Dim) (montecarlo.Dist, error) {
	vals := map[string]*yaml.Node{}
	err := p.pairs(n, path, func(k, v *yaml.Node) error {
		if !slices.Contains(distKeys, k.Value) {
			return p.errf(k.Line, path+"."+k.Value, "", "unknown distribution key%s; allowed: %s", suggest(k.Value, distKeys), strings.Join(distKeys, ", "))
		}
		if v.Kind != yaml.ScalarNode {
			return p.errf(v.Line, path+"."+k.Value, "", "expected a single value")
		}
		vals[k.Value] = v
		return nil
	})
	if err != nil {
		return montecarlo.Dist{}, err
	}
	kindName := "normal"
	if v, ok := vals["dist"]; ok {
		kindName = strings.ToLower(strings.TrimSpace(v.Value))
	}
	kind, err := montecarlo.ParseKind(kindName)
	if err != nil || kind == montecarlo.Fixed {
		return montecarlo.Dist{}, p.errf(n.Line, path+".dist", kindName, "allowed: normal, lognormal, uniform, triangular, weibull, truncnormal%s",
			suggest(kindName, []string{"normal", "lognormal", "uniform", "triangular", "weibull", "truncnormal"}))
	}
	has := func(k string) bool { _, ok := vals[k]; return ok }
	q := func(k string, d units.Dim) (float64, error) {
		v := vals[k]
		x, err := units.Parse(v.Value, d)
		if err != nil {
			return 0, p.errf(v.Line, path+"."+k, v.Value, "%v", err)
		}
		return x, nil
	}
	bad := func(msg string) error { return p.errf(n.Line, path, "", "%s distribution: %s", kind, msg) }
	// center and spread
	center := func() (float64, string, error) {
		switch {
		case has("mean") && has("nominal"):
			return 0, "", bad("give mean or nominal, not both")
		case has("mean"):
			v, err := q("mean", dim)
			return v, "mean", err
		case has("nominal"):
			v, err := q("nominal", dim)
			return v, "nominal", err
		}
		return 0, "", bad("needs mean (or nominal)")
	}
	// tolerance: "10%" relative to the centre, or an absolute quantity
	tolerance := func(c float64) (float64, error) {
		v := vals["tolerance"]
		s := strings.TrimSpace(v.Value)
		if strings.HasSuffix(s, "%") {
			f, err := units.Parse(s, units.Fraction)
			if err != nil {
				return 0, p.errf(v.Line, path+".tolerance", s, "%v", err)
			}
			if !(f > 0) {
				return 0, p.errf(v.Line, path+".tolerance", s, "must be > 0")
			}
			return f * abs(c), nil
		}
		t, err := q("tolerance", dim)
		if err == nil && !(t > 0) {
			err = p.errf(v.Line, path+".tolerance", s, "must be > 0")
		}
		return t, err
	}
	sigmas := func() (float64, error) {
		v, ok := vals["coverage"]
		if !ok {
			return 3, nil
		}
		s := strings.TrimSpace(v.Value)
		for _, suf := range []string{"sigma", "σ", "sd"} {
			s = strings.TrimSpace(strings.TrimSuffix(s, suf))
		}
		f, err := units.ParseNumber(s)
		if err != nil || !(f > 0) || f > 10 {
			return 0, p.errf(v.Line, path+".coverage", v.Value, "expected the number of standard deviations the tolerance spans, e.g. 3 or \"3 sigma\" (0 < k ≤ 10)")
		}
		return f, nil
	}
	spread := func(c float64) (float64, error) {
		n := 0
		for _, k := range []string{"sd", "cov", "tolerance"} {
			if has(k) {
				n++
			}
		}
		if n != 1 {
			return 0, bad("give exactly one of sd, cov or tolerance")
		}
		switch {
		case has("sd"):
			v, err := q("sd", dim)
			if err == nil && !(v > 0) {
				err = p.errf(vals["sd"].Line, path+".sd", vals["sd"].Value, "standard deviation must be > 0")
			}
			return v, err
		case has("cov"):
			v, err := q("cov", units.Fraction)
			if err == nil && !(v > 0) {
				err = p.errf(vals["cov"].Line, path+".cov", vals["cov"].Value, "c.o.v. must be > 0")
			}
			if err == nil && c == 0 {
				err = bad("a c.o.v. needs a non-zero mean")
			}
			return v * abs(c), err
		}
		t, err := tolerance(c)
		if err != nil {
			return 0, err
		}
		k, err := sigmas()
		return t / k, err
	}
	centerSpread := func() (float64, float64, error) {
		c, _, err := center()
		if err != nil {
			return 0, 0, err
		}
		sd, err := spread(c)
		return c, sd, err
	}
	only := func(allowed ...string) error {
		for k := range vals {
			if k != "dist" && !slices.Contains(allowed, k) {
				return p.errf(vals[k].Line, path+"."+k, "", "not a parameter of the %s distribution (allowed: %s)", kind, strings.Join(allowed, ", "))
			}
		}
		return nil
	}
	var d montecarlo.Dist
	switch kind {
	case montecarlo.Normal, montecarlo.LogNormal, montecarlo.TruncNormal:
		allowed := []string{"mean", "nominal", "sd", "cov", "tolerance", "coverage"}
		if kind == montecarlo.TruncNormal {
			allowed = append(allowed, "lower", "upper")
		}
		if err := only(allowed...); err != nil {
			return d, err
		}
		c, sd, err := centerSpread()
		if err != nil {
			return d, err
		}
		switch kind {
		case montecarlo.Normal:
			d, err = montecarlo.NewNormal(c, sd)
		case montecarlo.LogNormal:
			if !(c > 0) {
				return d, p.errf(n.Line, path, "", "lognormal distribution: the mean must be > 0, a lognormal quantity is positive")
			}
			d, err = montecarlo.NewLogNormalMoments(c, sd)
		default:
			lo, hi := c-10*sd, c+10*sd
			if has("lower") {
				if lo, err = q("lower", dim); err != nil {
					return d, err
				}
			}
			if has("upper") {
				if hi, err = q("upper", dim); err != nil {
					return d, err
				}
			}
			d, err = montecarlo.NewTruncNormal(c, sd, lo, hi)
		}
		if err != nil {
			return d, bad(err.Error())
		}
	case montecarlo.Uniform, montecarlo.Triangular:
		allowed := []string{"min", "max", "nominal", "tolerance"}
		if kind == montecarlo.Triangular {
			allowed = append(allowed, "mode")
		}
		if err := only(allowed...); err != nil {
			return d, err
		}
		var lo, hi, mode float64
		var err error
		if has("nominal") {
			if has("min") || has("max") {
				return d, bad("give min and max, or nominal and tolerance")
			}
			if !has("tolerance") {
				return d, bad("nominal needs a tolerance")
			}
			c, err := q("nominal", dim)
			if err != nil {
				return d, err
			}
			t, err := tolerance(c)
			if err != nil {
				return d, err
			}
			lo, hi, mode = c-t, c+t, c
		} else {
			if !has("min") || !has("max") {
				return d, bad("needs min and max (or nominal and tolerance)")
			}
			if lo, err = q("min", dim); err != nil {
				return d, err
			}
			if hi, err = q("max", dim); err != nil {
				return d, err
			}
			mode = (lo + hi) / 2
		}
		if kind == montecarlo.Uniform {
			d, err = montecarlo.NewUniform(lo, hi)
		} else {
			if has("mode") {
				if mode, err = q("mode", dim); err != nil {
					return d, err
				}
			}
			d, err = montecarlo.NewTriangular(lo, mode, hi)
		}
		if err != nil {
			return d, bad(err.Error())
		}
	case montecarlo.Weibull:
		if err := only("shape", "scale", "mean", "cov", "sd"); err != nil {
			return d, err
		}
		var err error
		if has("shape") || has("scale") {
			if !has("shape") || !has("scale") || has("mean") {
				return d, bad("give shape and scale, or mean and cov")
			}
			k, err := q("shape", units.None)
			if err != nil {
				return d, err
			}
			lam, err := q("scale", dim)
			if err != nil {
				return d, err
			}
			d, err = montecarlo.NewWeibull(k, lam)
			if err != nil {
				return d, bad(err.Error())
			}
			return d, nil
		}
		c, sd, err := centerSpread()
		if err != nil {
			return d, err
		}
		if !(c > 0) {
			return d, bad("the mean must be > 0")
		}
		d, err = montecarlo.NewWeibullMoments(c, sd/c)
		if err != nil {
			return d, bad(err.Error())
		}
	}
	return d, nil
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
