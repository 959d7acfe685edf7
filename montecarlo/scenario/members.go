package scenario

import (
	"fmt"
	"math"

	"boltrisk/model"
	"boltrisk/model/units"
)

// members reads the clamped layers, the stiffness method and the
// load-introduction factor.
func (b *builder) members() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	if r.nLay == 0 {
		return p.errf(0, "members.layers", "", "required: a list of clamped layers, each with thickness and material or modulus")
	}
	in.NLayers = r.nLay
	var layerMats []string
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
			if !given[pre+"modulus"] {
				l.Modulus = m.Modulus
				s.Sources[pre+"modulus"] = m.Name + ", " + m.Source
			}
			l.WilemanA, l.WilemanB = m.WilemanA, m.WilemanB
			layerMats = append(layerMats, m.Name)
		} else {
			if !given[pre+"modulus"] {
				return p.errf(0, pre+"material", "", "give material (see 'boltrisk catalog materials') or modulus")
			}
			layerMats = append(layerMats, "")
		}
		if err := b.positive(pre+"modulus", l.Modulus); err != nil {
			return err
		}
	}
	method, err := p.word(r, "members.method", "frustum", []string{"frustum", "wileman"})
	if err != nil {
		return err
	}
	if method == "wileman" {
		in.StiffnessMethod = model.Wileman
		for i := 1; i < r.nLay; i++ {
			if in.Layers[i].Modulus != in.Layers[0].Modulus || layerMats[i] != layerMats[0] {
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
	return nil
}

// geometry reads the bolt's geometry in the grip: bearing face, hole, and
// the unthreaded length from the bolt and thread lengths.
func (b *builder) geometry() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	th := in.Thread
	d, grip := th.D, in.Grip()
	if !given["bolt.bearing_diameter"] {
		in.BearingDia = model.DefaultBearingDiameter(th)
		s.Sources["bolt.bearing_diameter"] = "default: washer face 1.5·d, Shigley §8-5"
	}
	if !given["bolt.hole_diameter"] {
		in.HoleDia = model.DefaultHoleDiameter(th)
		s.Sources["bolt.hole_diameter"] = "default: normal clearance (from memory)"
	}
	if !(in.HoleDia > d) {
		return p.errf(b.lineOf("bolt.hole_diameter"), "bolt.hole_diameter", units.SI.Format(in.HoleDia, units.Length), "must exceed the bolt diameter %s", units.SI.Format(d, units.Length))
	}
	if !(in.BearingDia > in.HoleDia) {
		return p.errf(b.lineOf("bolt.bearing_diameter"), "bolt.bearing_diameter", units.SI.Format(in.BearingDia, units.Length), "must exceed the hole diameter %s", units.SI.Format(in.HoleDia, units.Length))
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
		if in.ShankInGrip < 0 || in.ShankInGrip > grip {
			return p.errf(b.lineOf("bolt.shank_in_grip"), "bolt.shank_in_grip", units.SI.Format(in.ShankInGrip, units.Length), "must lie within 0 … grip %s", units.SI.Format(grip, units.Length))
		}
	case hasLen:
		if !(length > grip) {
			return p.errf(b.lineOf("bolt.length"), "bolt.length", units.SI.Format(length, units.Length), "is not longer than the grip %s (sum of members.layers): the bolt cannot clamp the members", units.SI.Format(grip, units.Length))
		}
		if !hasLT {
			lt = model.DefaultThreadLength(th, length)
		}
		if !(lt > 0) {
			return p.errf(b.lineOf("bolt.thread_length"), "bolt.thread_length", units.SI.Format(lt, units.Length), "must be > 0")
		}
		in.ShankInGrip = math.Min(math.Max(length-lt, 0), grip)
		s.Sources["bolt.shank_in_grip"] = "from bolt.length and the thread length"
	case hasLT:
		return p.errf(b.lineOf("bolt.thread_length"), "bolt.thread_length", "", "needs bolt.length")
	}
	return nil
}
