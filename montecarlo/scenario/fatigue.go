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
	if src == "vdi2230" {
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
	if crit == "" {
		crit = "goodman"
	}
	in.Criterion = map[string]model.Criterion{"goodman": model.Goodman, "gerber": model.Gerber, "asme-elliptic": model.ASMEElliptic, "amplitude": model.Amplitude}[crit]
	if given["fatigue.endurance"] {
		s.EnduranceNote = "given"
	}
	if in.Endurance == 0 {
		if in.AxialMax > in.AxialMin {
			cl := s.ClassName
			if cl == "" {
				cl = "(strengths given)"
			}
			return p.errf(0, "fatigue.endurance", "", "required: the load alternates and class %s has no tabulated endurance strength; give fatigue.endurance or fatigue.endurance_source: vdi2230", cl)
		}
		in.Endurance = in.Tensile // unused: no alternating load
		s.EnduranceNote = "not used (no alternating load)"
	}
	if !(in.Endurance > 0) {
		return p.errf(r.keyAt["fatigue.endurance"], "fatigue.endurance", units.SI.Format(in.Endurance, units.Stress), "must be > 0")
	}
	if b.enduranceNote != "" && in.AxialMax > in.AxialMin && !given["fatigue.endurance"] && strings.HasPrefix(s.EnduranceNote, "Shigley") {
		s.Warnings = append(s.Warnings, model.Warning{Field: "fatigue.endurance", Message: b.enduranceNote})
	}
	s.Sources["fatigue.endurance"] = s.EnduranceNote
	return nil
}
