package scenario

import (
	"errors"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
)

// buildVariants reads `variants:`, each a name and a `set:` mapping of
// dotted paths to values that replace the base scenario's.
func (p *parser) buildVariants(base *Scenario, r rawDoc) error {
	seen := map[string]bool{}
	for _, n := range r.vars {
		if n.Kind != yaml.MappingNode {
			return p.errf(n.Line, "variants", "", "each entry is {name: …, set: {path: value, …}}")
		}
		var name string
		var set *yaml.Node
		err := p.pairs(n, "variants", func(k, v *yaml.Node) error {
			switch k.Value {
			case "name":
				name = strings.TrimSpace(v.Value)
			case "set":
				if v.Kind != yaml.MappingNode {
					return p.errf(v.Line, "variants.set", "", "expected path: value lines, e.g. tightening.condition: oiled")
				}
				set = v
			default:
				return p.errf(k.Line, "variants."+k.Value, "", "unknown key%s; allowed: name, set", suggest(k.Value, []string{"name", "set"}))
			}
			return nil
		})
		if err != nil {
			return err
		}
		if name == "" || set == nil {
			return p.errf(n.Line, "variants", "", "each variant needs a name and a set: section")
		}
		if seen[name] {
			return p.errf(n.Line, "variants.name", name, "variant name used twice")
		}
		seen[name] = true
		vr := r.clone()
		vr.vars = nil
		// A variant that changes the tightening method starts its tightening
		// afresh: the base's torque, friction, preload and presets belong to
		// the base's method.
		for i := 0; i+1 < len(set.Content); i += 2 {
			if set.Content[i].Value == "tightening.method" {
				for _, k := range []string{"torque", "nut_factor", "thread_friction", "head_friction", "preload", "condition", "tool"} {
					delete(vr.vals, "tightening."+k)
				}
			}
		}
		err = p.pairs(set, "variants.set", func(k, v *yaml.Node) error {
			path := k.Value
			sec, key, ok := strings.Cut(path, ".")
			if !ok || sec == "members" && strings.HasPrefix(key, "layers") {
				if ok && strings.HasPrefix(key, "layers.") {
					vr.vals[path], vr.keyAt[path] = v, k.Line
					return nil
				}
				return p.errf(k.Line, "variants.set."+path, "", "expected a dotted path such as tightening.condition")
			}
			if !knownPath(path) {
				return p.errf(k.Line, "variants.set."+path, "", "no such input%s", suggest(path, allPaths()))
			}
			vr.supersede(path)
			vr.vals[path], vr.keyAt[path] = v, k.Line
			return nil
		})
		if err != nil {
			return err
		}
		vs, err := p.buildOne(vr)
		if err != nil {
			if e := (*Error)(nil); errors.As(err, &e) {
				e.Msg = "in variant " + strconv.Quote(name) + ": " + e.Msg
			}
			return err
		}
		vs.Variant = name
		vs.Name = base.Name
		base.Variants = append(base.Variants, vs)
	}
	return nil
}
func allPaths() []string {
	var out []string
	for sec, keys := range sectionKeys {
		if sec == "" || sec == "layer" {
			continue
		}
		if _, nested := nestedKeys[sec]; nested {
			for _, k := range keys {
				out = append(out, sec+"."+k)
			}
			continue
		}
		for _, k := range keys {
			out = append(out, sec+"."+k)
		}
	}
	return out
}
