package scenario

import (
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
)

func (b *builder) fatigue() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	src, err := p.word(r, "fatigue.endurance_source", "", []string{"table", "vdi2230"})
	if err != nil {
		return err
	}
	crit, err := p.word(r, "fatigue.criterion", "", []string{"goodman", "gerber", "asme-elliptic", "amplitude"})
	if err != nil {
		return err
	}
	alternates := in.AxialMax > in.AxialMin
	if src == "vdi2230" {
		if d := in.Thread.D; d > 40 && alternates {
			return p.errf(r.keyAt["fatigue.endurance_source"], "fatigue.endurance_source", src, "the VDI 2230-1 endurance limit σASV is stated for d ≤ 40 mm; d = %s: give fatigue.endurance (e.g. from EN 1993-1-9 or tests)", b.fmt(d, units.Length))
		}
		if given["fatigue.endurance"] {
			return p.errf(r.keyAt["fatigue.endurance_source"], "fatigue.endurance_source", src, "give either endurance or endurance_source, not both")
		}
		in.Endurance = model.VDIEndurance(in.Thread.D)
		s.EnduranceNote = "VDI 2230-1 σASV = 0.85·(150/d + 45), rolled before heat treatment"
		if crit == "" {
			crit = "amplitude"
		} else if crit != "amplitude" {
			s.Warnings = append(s.Warnings, model.Warning{Field: "fatigue.criterion", Message: "the VDI 2230 endurance limit is an amplitude at the preload's mean stress; combining it with a mean-stress line (" + crit + ") counts the mean stress twice"})
		}
	}
	if src != "vdi2230" && !given["fatigue.endurance"] && b.class.Endurance > 0 {
		c, d := b.class, in.Thread.D
		se, err := c.EnduranceAt(d)
		switch {
		case err == nil:
			in.Endurance = se
			s.EnduranceNote = "Shigley Table 8-17, class " + c.Name
			if c.Note != "" && strings.Contains(c.Note, "Table 8-17") && d < 16 {
				b.enduranceNote = c.Note
			}
		case alternates:
			return p.errf(0, "fatigue.endurance", "", "required: %v; give fatigue.endurance", err)
		}
	}
	if crit == "" {
		crit = "goodman"
	}
	in.Criterion = map[string]model.Criterion{"goodman": model.Goodman, "gerber": model.Gerber, "asme-elliptic": model.ASMEElliptic, "amplitude": model.Amplitude}[crit]
	if given["fatigue.endurance"] {
		s.EnduranceNote = "given"
	}
	if in.Endurance == 0 {
		if alternates {
			cl := s.ClassName
			if cl == "" {
				cl = "(strengths given)"
			}
			alt := " or fatigue.endurance_source: vdi2230"
			if in.Thread.D > 40 {
				alt = " (VDI 2230-1's σASV holds for d ≤ 40 mm only)"
			}
			return p.errf(0, "fatigue.endurance", "", "required: the load alternates and class %s has no tabulated endurance strength; give fatigue.endurance%s", cl, alt)
		}
		in.Endurance = in.Tensile // unused: no alternating load
		s.EnduranceNote = "not used (no alternating load)"
	}
	if !(in.Endurance > 0) {
		return p.errf(r.keyAt["fatigue.endurance"], "fatigue.endurance", b.fmt(in.Endurance, units.Stress), "must be > 0")
	}
	if b.enduranceNote != "" && in.AxialMax > in.AxialMin && !given["fatigue.endurance"] && strings.HasPrefix(s.EnduranceNote, "Shigley") {
		s.Warnings = append(s.Warnings, model.Warning{Field: "fatigue.endurance", Message: b.enduranceNote})
	}
	s.Sources["fatigue.endurance"] = s.EnduranceNote
	return nil
}
