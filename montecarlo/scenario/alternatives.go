package scenario

import (
	"errors"
	"fmt"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
)

// Change is one preset change of a scenario that a decision study may try
// in place of the file's choice: another assembly condition, another
// tightening tool controlling the same quantity, or a stronger property
// class of the same standard.
type Change struct {
	Kind  string // "condition", "tool" or "class"
	Path  string // the scenario key it sets
	Value string
	Label string // e.g. "condition oiled"
}

// Alternative rebuilds the scenario with keys set (path → scalar value), as
// a variant of the file would be: a preset key replaces the explicit
// values it governs. The result carries the base's name and hash.
func (s *Scenario) Alternative(name string, sets map[string]string) (*Scenario, error) {
	if s.parser == nil {
		return nil, errors.New("scenario: this scenario was not read from a document; it cannot be rebuilt")
	}
	r := s.raw.clone()
	r.vars = nil
	keys := make([]string, 0, len(sets))
	for k := range sets {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, path := range keys {
		if !knownPath(path) {
			return nil, fmt.Errorf("%s: no such input%s", path, suggest(path, allPaths()))
		}
		r.supersede(path)
		r.vals[path] = &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: sets[path]}
	}
	out, err := s.parser.buildOne(r)
	if err != nil {
		if e := (*Error)(nil); errors.As(err, &e) {
			e.Msg = "with " + strconv.Quote(name) + ": " + e.Msg
		}
		return nil, err
	}
	out.Variant, out.Name, out.SHA256, out.Bytes = name, s.Name, s.SHA256, s.Bytes
	out.raw, out.parser = r, s.parser
	return out, nil
}

// PresetChanges lists the preset changes worth trying: every other
// assembly condition (when the method uses one), every other tool that
// controls the same quantity as the file's, and up to two stronger
// property classes of the file's standard (when it names a class).
func (s *Scenario) PresetChanges() []Change {
	var out []Change
	in := s.Inputs()
	_, ownK := s.raw.vals["tightening.nut_factor"]
	_, ownMu := s.raw.vals["tightening.thread_friction"]
	if !in.Tensioned && !(ownK && in.Method == model.NutFactorMethod) && !(ownMu && in.Method != model.NutFactorMethod) {
		for _, c := range Conditions {
			if c.Name != s.ConditionName {
				out = append(out, Change{Kind: "condition", Path: "tightening.condition", Value: c.Name, Label: "condition " + c.Name})
			}
		}
	}
	controls := "torque"
	if in.Method == model.DirectPreload {
		controls = "preload"
	}
	if s.ToolName != "" {
		for _, t := range Tools {
			if t.Name != s.ToolName && t.Controls == controls && t.Tensioner == in.Tensioned {
				out = append(out, Change{Kind: "tool", Path: "tightening.tool", Value: t.Name, Label: "tool " + t.Name})
			}
		}
	}
	if s.ClassName != "" {
		var cur model.PropertyClass
		for _, c := range model.PropertyClasses() {
			if c.Name == s.ClassName {
				cur = c
				break
			}
		}
		seen := map[string]bool{cur.Name: true}
		var stronger []model.PropertyClass
		for _, c := range model.PropertyClasses() {
			if c.Standard == cur.Standard && c.Tensile > cur.Tensile && !seen[c.Name] {
				seen[c.Name] = true
				stronger = append(stronger, c)
			}
		}
		sort.SliceStable(stronger, func(i, j int) bool { return stronger[i].Tensile < stronger[j].Tensile })
		for i, c := range stronger {
			if i == 2 {
				break
			}
			out = append(out, Change{Kind: "class", Path: "bolt.class", Value: c.Name, Label: "class " + c.Name})
		}
	}
	return out
}

// ToolsControlling returns the tool presets controlling quantity ("torque"
// or "preload") the way the joint is tightened (tensioned: by a tensioner,
// no nut turned under load), or those named, checked: an unknown name is an
// error listing the allowed names with the nearest one; a tool controlling
// the other quantity, or tightening the other way, is refused.
func ToolsControlling(controls string, tensioned bool, names []string) ([]Tool, error) {
	if len(names) == 0 {
		var out []Tool
		for _, t := range Tools {
			if t.Controls == controls && t.Tensioner == tensioned {
				out = append(out, t)
			}
		}
		return out, nil
	}
	all := make([]string, len(Tools))
	for i, t := range Tools {
		all[i] = t.Name
	}
	sort.Strings(all)
	var out []Tool
	for _, n := range names {
		n = strings.ToLower(strings.TrimSpace(n))
		t, err := lookupTool(n)
		if err != nil {
			return nil, fmt.Errorf("unknown tool %q%s (allowed: %s)", n, suggest(n, all), strings.Join(all, ", "))
		}
		if t.Controls != controls {
			return nil, fmt.Errorf("tool %q controls %s; this joint is tightened by %s", n, t.Controls, controls)
		}
		if t.Tensioner != tensioned {
			how := map[bool]string{true: "a tensioner (no nut turned under load)", false: "turning the nut"}
			return nil, fmt.Errorf("tool %q tightens by %s; this joint is tightened by %s", n, how[t.Tensioner], how[tensioned])
		}
		out = append(out, t)
	}
	return out, nil
}
