package scenario

import (
	"maps"
	"sort"
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
)

// keyKind is the JSON Schema of a section key that is not a registry field.
type keyKind map[string]any

func str(desc string) keyKind { return keyKind{"type": "string", "description": desc} }
func integer(desc string, lo, hi int) keyKind {
	return keyKind{"type": "integer", "minimum": lo, "maximum": hi, "description": desc}
}
func oneOf(desc string, words ...string) keyKind {
	return keyKind{"type": "string", "enum": words, "description": desc}
}
func quantityRef(d units.Dim, desc string) keyKind {
	return keyKind{"$ref": "#/$defs/quantity_" + d.Key(), "description": desc}
}

func presetNames[T any](xs []T, name func(T) string) []string {
	var out []string
	for _, x := range xs {
		out = append(out, name(x))
	}
	return out
}

// wordKeys are the schemas of the section keys outside the registry. A
// test checks that every key the loader accepts has one.
func wordKeys() map[string]keyKind {
	return map[string]keyKind{
		"name":                         str("shown in reports"),
		"description":                  str("optional text shown in reports"),
		"units":                        oneOf("display units of the text report (JSON is always SI)", "si", "us"),
		"bolt.thread":                  str("thread, e.g. M12, M10x1.25, 1/2-13 UNC (see 'boltrisk catalog threads')"),
		"bolt.class":                   str("property class or grade, e.g. 8.8, 10.9, SAE 5, A325, A2-70 (see 'boltrisk catalog classes')"),
		"bolt.count":                   integer("bolts sharing the loads", 1, 1000),
		"bolt.length":                  quantityRef(units.Length, "under-head length"),
		"bolt.thread_length":           quantityRef(units.Length, "threaded length of the bolt"),
		"members.method":               oneOf("member stiffness method", "frustum", "wileman"),
		"tightening.method":            oneOf("how the preload is obtained", "nut-factor", "friction", "preload"),
		"tightening.condition":         oneOf("assembly-condition preset", presetNames(Conditions, func(c Condition) string { return c.Name })...),
		"tightening.tool":              oneOf("tightening-tool preset", presetNames(Tools, func(t Tool) string { return t.Name })...),
		"loads.shear_planes":           integer("shear planes (friction interfaces) per bolt", 1, 20),
		"loads.threads_in_shear_plane": {"type": "boolean", "description": "threads lie in the shear plane"},
		"plate.material":               str("plate grade, e.g. S355, A36 (see 'boltrisk catalog materials')"),
		"plate.resistance":             oneOf("shear-side resistance rule", "yield", "en1993", "aisc360"),
		"plate.bolts_across":           integer("bolts in the critical cross-section", 1, 1000),
		"plate.bolts_in_line":          integer("bolts in each row along the load (shear joints; bolt.count = bolts_in_line × bolts_across)", 1, 1000),
		"bolt.thread.diameter":         quantityRef(units.Length, "nominal diameter of a user-defined thread"),
		"bolt.thread.pitch":            quantityRef(units.Length, "pitch of a user-defined ISO metric thread"),
		"bolt.thread.threads_per_inch": {"type": "number", "exclusiveMinimum": 0, "description": "threads per inch of a user-defined Unified thread"},
		"bolt.washer.material":         str("head washer material (see 'boltrisk catalog materials')"),
		"bolt.nut_washer.material":     str("nut washer material (see 'boltrisk catalog materials')"),
		"bolt.nut.class":               str("ISO 898-2 nut property class, e.g. 8, 10"),
		"members.roughness":            quantityRef(units.Length, "mean roughness Rz of the contact faces (VDI 2230-1 Table 5 embedding estimate)"),
		"fatigue.criterion":            oneOf("fatigue failure line", "goodman", "gerber", "asme-elliptic", "amplitude"),
		"fatigue.endurance_source":     oneOf("where the endurance strength comes from", "table", "vdi2230"),
		"study.samples":                {"type": []string{"integer", "string"}, "description": "sample budget, e.g. 1000000 or 1e6"},
		"study.seed":                   {"type": "integer", "minimum": 0, "description": "seed of every random stream"},
		"study.confidence":             {"$ref": "#/$defs/fraction", "description": "two-sided confidence of the intervals"},
		"study.precision":              {"$ref": "#/$defs/fraction", "description": "stopping rule: target coefficient of variation of every reported probability"},
		"study.target_probability":     {"type": []string{"number", "string"}, "description": "failure probability the design must meet, e.g. 1e-4"},
		"study.target":                 {"not": map[string]any{}, "description": "no longer accepted: use study.precision (a c.o.v.) or study.target_probability"},
	}
}

// Schema returns the JSON Schema (draft 2020-12) of the scenario file, built
// from the field registry and the section keys the loader accepts, so the
// two cannot drift apart.
func Schema() map[string]any {
	words := wordKeys()
	maps.Copy(words, lifeWordKeys())
	props := func(section string) map[string]any {
		out := map[string]any{}
		for _, k := range sectionKeys[section] {
			path := k
			if section != "" {
				path = section + "." + k
			}
			if f, ok := lookupField(path); ok {
				out[k] = map[string]any{"$ref": "#/$defs/value_" + f.dim.Key(), "description": f.help}
				continue
			}
			if w, ok := words[path]; ok {
				out[k] = map[string]any(w)
			}
		}
		return out
	}
	object := func(p map[string]any) map[string]any {
		return map[string]any{"type": "object", "properties": p, "additionalProperties": false}
	}
	top := props("")
	for _, sec := range []string{"bolt", "members", "tightening", "loads", "plate", "fatigue", "service", "study"} {
		top[sec] = object(props(sec))
	}
	// Nested mappings: bolt.washer, bolt.nut, members.tapped, … and the
	// user-defined thread, which may also be a catalogue name.
	for path := range nestedKeys {
		sec, key, _ := strings.Cut(path, ".")
		nested := object(props(path))
		if w, ok := words[path]; ok {
			nested = map[string]any{"oneOf": []any{map[string]any(w), nested}, "description": w["description"]}
		}
		top[sec].(map[string]any)["properties"].(map[string]any)[key] = nested
	}
	tight := top["tightening"].(map[string]any)["properties"].(map[string]any)
	tight["embedding"] = map[string]any{"oneOf": []any{tight["embedding"], map[string]any{"const": "vdi2230"}},
		"description": "embedding loss: a length (or distribution), or vdi2230 for the VDI 2230-1 Table 5 estimate"}
	layer := object(props("layer"))
	for _, k := range sectionKeys["layer"] {
		if f, ok := lookupField("members.layers.1." + k); ok {
			layer["properties"].(map[string]any)[k] = map[string]any{"$ref": "#/$defs/value_" + f.dim.Key(), "description": f.help}
		}
	}
	layer["properties"].(map[string]any)["material"] = map[string]any(str("member material (see 'boltrisk catalog materials')"))
	top["members"].(map[string]any)["properties"].(map[string]any)["layers"] = map[string]any{
		"type": "array", "minItems": 1, "maxItems": model.MaxLayers, "items": layer, "description": "clamped layers from head to nut"}
	top["correlations"] = map[string]any{"type": "array", "items": object(map[string]any{
		"between": map[string]any{"type": "array", "items": map[string]any{"type": "string"}, "minItems": 2, "maxItems": 2},
		"rho":     map[string]any{"type": "number", "exclusiveMinimum": -1, "exclusiveMaximum": 1},
	})}
	top["variants"] = map[string]any{"type": "array", "items": object(map[string]any{
		"name": map[string]any{"type": "string"},
		"set":  map[string]any{"type": "object", "description": "dotted input paths and their values or distributions"},
	})}
	defs := map[string]any{
		"fraction":   map[string]any{"type": []string{"number", "string"}, "description": "a number or a percentage such as 5%"},
		"data_input": dataSchema(),
	}
	var dims []units.Dim
	seen := map[units.Dim]bool{}
	for _, f := range fields {
		if !seen[f.dim] {
			seen[f.dim] = true
			dims = append(dims, f.dim)
		}
	}
	dims = append(dims, units.Length) // bolt.length, bolt.thread_length
	sort.Slice(dims, func(i, j int) bool { return dims[i] < dims[j] })
	for _, d := range dims {
		name := d.Key()
		q := map[string]any{"type": "string", "description": "a " + d.String() + " with its unit"}
		if us := units.Units(d); len(us) > 0 {
			q["pattern"] = `^\s*[-+0-9.eE]+\s*(` + strings.Join(quoteAll(us), "|") + `)\s*$`
		} else {
			q = map[string]any{"type": []string{"number", "string"}, "description": "a plain number"}
		}
		defs["quantity_"+name] = q
		dist := map[string]any{"type": "object", "additionalProperties": false, "description": "a distribution: dist and its parameters",
			"properties": map[string]any{}}
		dp := dist["properties"].(map[string]any)
		dp["dist"] = map[string]any{"type": "string", "enum": familyNames}
		dp["shared"] = map[string]any{"$ref": "#/$defs/fraction", "description": "share of a per-bolt input's scatter common to all bolts"}
		for _, k := range distKeys {
			if k == "dist" {
				continue
			}
			dp[k] = map[string]any{"type": []string{"number", "string"}}
		}
		defs["value_"+name] = map[string]any{"oneOf": []any{map[string]any{"$ref": "#/$defs/quantity_" + name}, dist, map[string]any{"$ref": "#/$defs/data_input"}}}
	}
	return map[string]any{
		"$schema":              "https://json-schema.org/draft/2020-12/schema",
		"$id":                  "boltrisk/scenario.schema.json",
		"title":                "boltrisk scenario file",
		"description":          "One bolted joint, its uncertain inputs and study settings. Every dimensional quantity carries its unit as text.",
		"type":                 "object",
		"properties":           top,
		"required":             []string{"bolt", "members", "tightening"},
		"additionalProperties": false,
		"$defs":                defs,
	}
}

// quoteAll escapes unit names for a regular expression.
func quoteAll(us []string) []string {
	out := make([]string, len(us))
	r := strings.NewReplacer("*", `\*`, ".", `\.`, "/", `/`, "·", "·")
	for i, u := range us {
		out[i] = r.Replace(u)
	}
	return out
}
