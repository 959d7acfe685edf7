package scenario

import (
	"fmt"
	"math"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
)

// members reads the clamped layers, the tapped hole, the stiffness method
// and the load-introduction factor.
func (b *builder) members() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	if r.nLay == 0 {
		return p.errf(0, "members.layers", "", "required: a list of clamped layers, each with thickness and material or modulus")
	}
	in.NLayers = r.nLay
	b.layerMats = make([]model.Material, r.nLay)
	for i := 1; i <= r.nLay; i++ {
		pre := fmt.Sprintf("members.layers.%d.", i)
		l := &in.Layers[i-1]
		if !given[pre+"thickness"] {
			return p.errf(0, pre+"thickness", "", "required")
		}
		if err := b.positive(pre+"thickness", l.Thickness); err != nil {
			return err
		}
		mname, mline, hasMat, err := p.scalar(r, pre+"material")
		if err != nil {
			return err
		}
		if hasMat {
			m, err := model.LookupMaterial(mname)
			if err != nil {
				return p.errf(mline, pre+"material", mname, "%v", err)
			}
			b.layerMats[i-1] = m
			if !given[pre+"modulus"] {
				l.Modulus = m.Modulus
				s.Sources[pre+"modulus"] = m.Name + ", " + m.Source
			}
			if !given[pre+"expansion"] {
				l.Expansion = m.Expansion
				s.Sources[pre+"expansion"] = m.Name + ", " + m.Source
			}
			if !given[pre+"pressure_limit"] && m.PressureLimit > 0 {
				l.PressureLimit = m.PressureLimit
				s.Sources[pre+"pressure_limit"] = m.Name + ", " + m.Source
			}
			l.WilemanA, l.WilemanB = m.WilemanA, m.WilemanB
		} else if !given[pre+"modulus"] {
			return p.errf(0, pre+"material", "", "give material (see 'boltrisk catalog materials') or modulus")
		}
		if err := b.positive(pre+"modulus", l.Modulus); err != nil {
			return err
		}
		if given[pre+"pressure_limit"] {
			if err := b.positive(pre+"pressure_limit", l.PressureLimit); err != nil {
				return err
			}
		}
	}
	if err := b.tapped(); err != nil {
		return err
	}
	method, err := p.word(r, "members.method", "frustum", []string{"frustum", "wileman"})
	if err != nil {
		return err
	}
	if method == "wileman" {
		in.StiffnessMethod = model.Wileman
		for i := 1; i < r.nLay; i++ {
			if in.Layers[i].Modulus != in.Layers[0].Modulus || b.layerMats[i].Name != b.layerMats[0].Name {
				return p.errf(b.lineOf("members.method"), "members.method", "wileman", "the Wileman et al. fit holds for members of one material; layers 1 and %d differ (use frustum)", i+1)
			}
		}
		if in.Layers[0].WilemanA == 0 {
			s.Warnings = append(s.Warnings, model.Warning{Field: "members.method", Message: "no Wileman fit for this material; the general-expression constants A = 0.78952, B = 0.62914 are used"})
		}
	}
	if given["members.stiffness"] {
		if err := b.positive("members.stiffness", in.MemberStiffness); err != nil {
			return err
		}
	}
	if given["members.load_introduction"] && !(in.LoadIntroduction > 0 && in.LoadIntroduction <= 1) {
		return p.errf(b.lineOf("members.load_introduction"), "members.load_introduction", units.Sig(in.LoadIntroduction, 4), "must lie in (0, 1]")
	}
	rz, hasRz, err := p.optQuantity(r, "members.roughness", units.Length)
	if err != nil {
		return err
	}
	if hasRz {
		if !(rz > 0 && rz < 0.160) {
			return p.errf(b.lineOf("members.roughness"), "members.roughness", units.Sig(rz*1000, 4)+" µm", "the mean roughness Rz must lie within 0 … 160 µm, the range of VDI 2230-1 Table 5")
		}
		b.s.Roughness = rz
	}
	return nil
}

// tapped reads members.tapped: the last layer is the tapped part of a cap
// screw joint.
func (b *builder) tapped() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	if _, ok := r.vals["members.tapped"]; !ok {
		for _, k := range []string{"members.tapped.engagement", "members.tapped.shear_strength"} {
			if given[k] {
				return p.errf(b.lineOf(k), k, "", "belongs to members.tapped: {engagement: …}")
			}
		}
		return nil
	}
	in.Tapped = true
	n := in.NLayers
	if n < 2 {
		return p.errf(b.lineOf("members.tapped"), "members.tapped", "", "the last layer is the tapped part; give at least one clamped layer above it (members.layers has %d)", n)
	}
	last := fmt.Sprintf("members.layers.%d.thickness", n)
	if !given["members.tapped.engagement"] {
		return p.errf(b.lineOf("members.tapped"), "members.tapped.engagement", "", "required: the length of thread engagement in the tapped part (layer %d)", n)
	}
	if err := b.positive("members.tapped.engagement", in.Engagement); err != nil {
		return err
	}
	t2 := in.Layers[n-1].Thickness
	if in.Engagement > t2 {
		return p.errf(b.lineOf("members.tapped.engagement"), "members.tapped.engagement", b.fmt(in.Engagement, units.Length),
			"is longer than the tapped layer %d (%s = %s); allowed: 0 … %s", n, last, b.fmt(t2, units.Length), b.fmt(t2, units.Length))
	}
	if !given["members.tapped.shear_strength"] {
		m := b.layerMats[n-1]
		if m.Tensile == 0 {
			return p.errf(b.lineOf("members.tapped"), "members.tapped.shear_strength", "",
				"required: layer %d's material %q has no tabulated tensile strength; give the shear strength of the tapped material, or a material with one (e.g. AW-6082-T6, GD-AlSi9Cu3, GJL-250, C45)", n, m.Name)
		}
		in.TappedShear = 0.6 * m.Tensile
		s.Sources["members.tapped.shear_strength"] = fmt.Sprintf("default: 0.6·Rm of %s (Rm %s; ratio common practice)", m.Name, b.fmt(m.Tensile, units.Stress))
	}
	if err := b.positive("members.tapped.shear_strength", in.TappedShear); err != nil {
		return err
	}
	if _, ok := r.vals["bolt.nut_washer"]; ok {
		return p.errf(b.lineOf("bolt.nut_washer"), "bolt.nut_washer", "", "a cap screw in a tapped hole has no nut; remove bolt.nut_washer or members.tapped")
	}
	if _, ok := r.vals["bolt.nut"]; ok {
		return p.errf(b.lineOf("bolt.nut"), "bolt.nut", "", "a cap screw in a tapped hole has no nut; its threads are checked against the tapped material")
	}
	return nil
}

// geometry reads the bolt's geometry in the grip: bearing face, hole,
// washers, and the unthreaded length from the bolt and thread lengths.
func (b *builder) geometry() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	th := in.Thread
	d := th.D
	if !given["bolt.bearing_diameter"] {
		in.BearingDia = model.DefaultBearingDiameter(th)
		s.Sources["bolt.bearing_diameter"] = "default: washer face 1.5·d, Shigley §8-5"
	}
	if !given["bolt.hole_diameter"] {
		in.HoleDia = model.DefaultHoleDiameter(th)
		s.Sources["bolt.hole_diameter"] = "default: normal clearance (from memory)"
	}
	if !(in.HoleDia > d) {
		return p.errf(b.lineOf("bolt.hole_diameter"), "bolt.hole_diameter", b.fmt(in.HoleDia, units.Length), "must exceed the bolt diameter %s", b.fmt(d, units.Length))
	}
	if !(in.BearingDia > in.HoleDia) {
		return p.errf(b.lineOf("bolt.bearing_diameter"), "bolt.bearing_diameter", b.fmt(in.BearingDia, units.Length), "must exceed the hole diameter %s", b.fmt(in.HoleDia, units.Length))
	}
	if err := b.washer("bolt.washer", &in.Washer); err != nil {
		return err
	}
	if err := b.washer("bolt.nut_washer", &in.NutWasher); err != nil {
		return err
	}
	if in.StiffnessMethod == model.Wileman {
		for _, w := range []*model.Washer{&in.Washer, &in.NutWasher} {
			if w.Present() && w.Modulus != in.Layers[0].Modulus {
				return p.errf(b.lineOf("members.method"), "members.method", "wileman", "the Wileman et al. fit holds for members of one material; a washer's modulus differs from the layers' (use frustum)")
			}
		}
	}
	grip := in.Grip() // clamp length: layers and washers (under the head for a tapped hole)
	stiffGrip := grip
	if in.Tapped {
		stiffGrip += math.Min(in.Layers[in.NLayers-1].Thickness, d) / 2 // Shigley Table 8-7
	}
	length, hasLen, err := p.optQuantity(r, "bolt.length", units.Length)
	if err != nil {
		return err
	}
	lt, hasLT, err := p.optQuantity(r, "bolt.thread_length", units.Length)
	if err != nil {
		return err
	}
	switch {
	case given["bolt.shank_in_grip"]:
		if hasLen || hasLT {
			return p.errf(b.lineOf("bolt.shank_in_grip"), "bolt.shank_in_grip", "", "give either shank_in_grip or length/thread_length, not both")
		}
		if in.ShankInGrip < 0 || in.ShankInGrip > stiffGrip {
			return p.errf(b.lineOf("bolt.shank_in_grip"), "bolt.shank_in_grip", b.fmt(in.ShankInGrip, units.Length), "must lie within 0 … grip %s", b.fmt(stiffGrip, units.Length))
		}
	case hasLen:
		if !(length > grip) {
			return p.errf(b.lineOf("bolt.length"), "bolt.length", b.fmt(length, units.Length), "is not longer than the grip %s (sum of members.layers and washers): the bolt cannot clamp the members", b.fmt(grip, units.Length))
		}
		if in.Tapped && length-grip < in.Engagement {
			return p.errf(b.lineOf("bolt.length"), "bolt.length", b.fmt(length, units.Length), "reaches only %s into the tapped part; members.tapped.engagement %s needs a length of at least %s",
				b.fmt(length-grip, units.Length), b.fmt(in.Engagement, units.Length), b.fmt(grip+in.Engagement, units.Length))
		}
		if !hasLT {
			lt = model.DefaultThreadLength(th, length)
			if lt > length {
				lt = length // fully threaded
			}
		}
		if !(lt > 0) {
			return p.errf(b.lineOf("bolt.thread_length"), "bolt.thread_length", b.fmt(lt, units.Length), "must be > 0")
		}
		if lt > length {
			return p.errf(b.lineOf("bolt.thread_length"), "bolt.thread_length", b.fmt(lt, units.Length), "is longer than the bolt (bolt.length %s); allowed: 0 … %s", b.fmt(length, units.Length), b.fmt(length, units.Length))
		}
		in.ShankInGrip = math.Min(math.Max(length-lt, 0), stiffGrip)
		s.Sources["bolt.shank_in_grip"] = "from bolt.length and the thread length"
	case hasLT:
		return p.errf(b.lineOf("bolt.thread_length"), "bolt.thread_length", "", "needs bolt.length")
	}
	return nil
}

// washer reads bolt.washer or bolt.nut_washer.
func (b *builder) washer(key string, w *model.Washer) error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	if _, ok := r.vals[key]; !ok {
		for _, f := range fields {
			if len(f.path) > len(key) && f.path[:len(key)+1] == key+"." && given[f.path] {
				return p.errf(b.lineOf(f.path), f.path, "", "belongs to %s: {thickness: …, outer_diameter: …}", key)
			}
		}
		return nil
	}
	line := b.lineOf(key)
	if r.vals[key].Kind != yaml.MappingNode {
		return p.errf(line, key, "", "expected {thickness: …, outer_diameter: …, material: …}")
	}
	for _, k := range []string{"thickness", "outer_diameter"} {
		if !given[key+"."+k] {
			return p.errf(line, key+"."+k, "", "required")
		}
		if err := b.positive(key+"."+k, *mustField(key + "." + k).ptr(in)); err != nil {
			return err
		}
	}
	mname, mline, hasMat, err := p.scalar(r, key+".material")
	if err != nil {
		return err
	}
	m, _ := model.LookupMaterial("steel")
	src := "default: steel"
	if hasMat {
		if m, err = model.LookupMaterial(mname); err != nil {
			return p.errf(mline, key+".material", mname, "%v", err)
		}
		src = m.Name
	}
	set := func(k string, v *float64, val float64) {
		if !given[key+"."+k] && val != 0 {
			*v = val
			s.Sources[key+"."+k] = src + ", " + m.Source
		}
	}
	set("modulus", &w.Modulus, m.Modulus)
	set("expansion", &w.Expansion, m.Expansion)
	set("pressure_limit", &w.PressureLimit, m.PressureLimit)
	if !given[key+".inner_diameter"] {
		w.InnerDia = in.HoleDia
		s.Sources[key+".inner_diameter"] = "default: the hole diameter"
	}
	if !(w.InnerDia > in.Thread.D) {
		return p.errf(b.lineOf(key+".inner_diameter"), key+".inner_diameter", b.fmt(w.InnerDia, units.Length), "must exceed the bolt diameter %s", b.fmt(in.Thread.D, units.Length))
	}
	if !(w.InnerDia < w.OuterDia) {
		return p.errf(b.lineOf(key+".inner_diameter"), key+".inner_diameter", b.fmt(w.InnerDia, units.Length), "must be below the outer diameter %s (%s.outer_diameter)", b.fmt(w.OuterDia, units.Length), key)
	}
	if !(w.InnerDia < in.BearingDia) {
		return p.errf(b.lineOf(key+".inner_diameter"), key+".inner_diameter", b.fmt(w.InnerDia, units.Length), "must be below the head's bearing diameter %s: the head would not bear on the washer", b.fmt(in.BearingDia, units.Length))
	}
	if w.OuterDia < in.BearingDia {
		s.Warnings = append(s.Warnings, model.Warning{Field: key + ".outer_diameter", Message: fmt.Sprintf("%s is below the head's bearing diameter %s: the head overhangs the washer", b.fmt(w.OuterDia, units.Length), b.fmt(in.BearingDia, units.Length))})
	}
	if err := b.positive(key+".modulus", w.Modulus); err != nil {
		return err
	}
	return nil
}
