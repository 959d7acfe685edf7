package scenario

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
)

// rawDoc is the flattened document: dotted path → node, plus the lists.
type rawDoc struct {
	vals  map[string]*yaml.Node
	keyAt map[string]int // line of each key
	corr  []*yaml.Node
	vars  []*yaml.Node
	nLay  int
}

// supersede removes what setting path replaces: a condition preset
// replaces the explicit nut factor and friction values it governs, and an
// explicit value replaces the preset (variants and alternatives alike).
func (r *rawDoc) supersede(path string) {
	switch path {
	case "tightening.condition":
		delete(r.vals, "tightening.nut_factor")
		delete(r.vals, "tightening.thread_friction")
		delete(r.vals, "tightening.head_friction")
	case "tightening.nut_factor", "tightening.thread_friction", "tightening.head_friction":
		delete(r.vals, "tightening.condition")
	}
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

// nestedKeys are the keys of a section that hold a mapping of their own
// (flattened to section.key.sub): their words, with the registry fields
// that live in them added below.
var nestedKeys = map[string][]string{
	"bolt.thread":     {"diameter", "pitch", "threads_per_inch"},
	"bolt.washer":     {"material"},
	"bolt.nut_washer": {"material"},
	"bolt.nut":        {"class"},
	"members.tapped":  {},
}

// sectionKeys lists the keys each section accepts: its words and the
// registry fields that live in it; a nested mapping's path (e.g.
// "bolt.washer") lists its own keys.
var sectionKeys = func() map[string][]string {
	keys := map[string][]string{
		"":           {"name", "description", "units", "bolt", "members", "tightening", "loads", "plate", "fatigue", "service", "study", "correlations", "variants"},
		"bolt":       {"thread", "class", "count", "length", "thread_length", "washer", "nut_washer", "nut"},
		"members":    {"method", "layers", "tapped", "roughness"},
		"layer":      {"thickness", "material", "modulus"},
		"tightening": {"method", "condition", "tool"},
		"loads":      {"shear_planes", "threads_in_shear_plane"},
		"plate":      {"material", "resistance", "bolts_across", "bolts_in_line"},
		"fatigue":    {"criterion", "endurance_source"},
		"service":    {},
		"study":      {"samples", "seed", "confidence", "precision", "target_probability", "target"},
	}
	keys["fatigue"] = append(keys["fatigue"], lifeFatigueKeys...)
	keys["loads"] = append(keys["loads"], lifeLoadKeys...)
	for k, v := range nestedKeys {
		keys[k] = append([]string(nil), v...)
	}
	for _, f := range fields {
		sec, key, _ := strings.Cut(f.path, ".")
		if sec == "members" && strings.HasPrefix(key, "layers.") {
			if i := strings.LastIndexByte(key, '.'); strings.Count(key, ".") == 2 && f.path == "members.layers.1"+key[i:] {
				keys["layer"] = append(keys["layer"], key[i+1:])
			}
			continue
		}
		if nest, sub, ok := strings.Cut(key, "."); ok {
			keys[sec+"."+nest] = append(keys[sec+"."+nest], sub)
			continue
		}
		keys[sec] = append(keys[sec], key)
	}
	return keys
}()

// knownPath reports whether a dotted path names a key a scenario may set
// (used by variants).
func knownPath(path string) bool {
	if _, ok := lookupField(path); ok {
		return true
	}
	i := strings.LastIndexByte(path, '.')
	if i < 0 {
		return false
	}
	sec, key := path[:i], path[i+1:]
	if _, nested := nestedKeys[sec]; !nested && strings.Contains(sec, ".") {
		return false
	}
	return slices.Contains(sectionKeys[sec], key)
}

type parser struct {
	file string
	dir  string                 // folder of data files given by relative paths
	fits map[string]*DataSource // data inputs fitted so far (variants share them)
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
	if len(allowed) == 0 {
		return p.errf(k.Line, join(section, k.Value), "", "unknown key in %s; it takes no keys", where)
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
			if _, nested := nestedKeys[path]; nested && v2.Kind == yaml.MappingNode {
				r.vals[path], r.keyAt[path] = v2, k2.Line // the mapping itself, for "is it given"
				return p.pairs(v2, path, func(k3, v3 *yaml.Node) error {
					if err := p.checkKey(path, k3); err != nil {
						return err
					}
					sub := path + "." + k3.Value
					r.vals[sub], r.keyAt[sub] = v3, k3.Line
					return nil
				})
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

func (p *parser) optQuantity(r rawDoc, path string, dim units.Dim) (float64, bool, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return 0, ok, err
	}
	v, err := units.Parse(s, dim)
	if err != nil {
		return 0, true, p.errf(line, path, s, "%v", err)
	}
	return v, true, nil
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// optNumber reads a plain number, if present.
func (p *parser) optNumber(r rawDoc, path string) (float64, bool, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return 0, ok, err
	}
	v, err := units.ParseNumber(s)
	if err != nil {
		return 0, true, p.errf(line, path, s, "%v", err)
	}
	return v, true, nil
}
