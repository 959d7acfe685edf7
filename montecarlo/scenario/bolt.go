package scenario

import (
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
)

var strengthPaths = []string{"bolt.proof_strength", "bolt.yield_strength", "bolt.tensile_strength"}

// bolt reads the bolt section: thread, property class or strengths,
// modulus and count.
func (b *builder) bolt() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	tname, line, ok, err := p.scalar(r, "bolt.thread")
	if err != nil {
		return err
	}
	if !ok {
		return p.errf(0, "bolt.thread", "", "required (e.g. M12, M10x1.25, 1/2-13 UNC)")
	}
	th, err := model.LookupThread(tname)
	if err != nil {
		return p.errf(line, "bolt.thread", tname, "%v", err)
	}
	in.Thread = th
	d := th.D
	cname, cline, hasClass, err := p.scalar(r, "bolt.class")
	if err != nil {
		return err
	}
	stainless := false
	if hasClass {
		c, err := model.LookupClass(cname, d)
		if err != nil {
			return p.errf(cline, "bolt.class", cname, "%v", err)
		}
		s.ClassName = c.Name
		stainless = c.Standard == "ISO 3506-1"
		in.AlphaV = c.AlphaV
		in.FubNominal = c.NominalTensile
		fromClass := map[string]float64{"bolt.proof_strength": c.Proof, "bolt.yield_strength": c.Yield, "bolt.tensile_strength": c.Tensile}
		for _, k := range strengthPaths {
			if !given[k] {
				*mustField(k).ptr(in) = fromClass[k]
				s.Sources[k] = "class " + c.Name + " (" + c.Standard + ")"
			}
		}
		if !given["fatigue.endurance"] && c.Endurance > 0 {
			in.Endurance = c.Endurance
			s.EnduranceNote = "Shigley Table 8-17, class " + c.Name
			if c.Note != "" && strings.Contains(c.Note, "Table 8-17") && d < 16 {
				b.enduranceNote = c.Note
			}
		}
	} else {
		for _, k := range strengthPaths {
			if !given[k] {
				return p.errf(0, k, "", "required when bolt.class is not given")
			}
		}
	}
	for _, k := range strengthPaths {
		if err := b.positive(k, *mustField(k).ptr(in)); err != nil {
			return err
		}
	}
	if in.Yield > in.Tensile {
		return p.errf(b.lineOf("bolt.yield_strength"), "bolt.yield_strength", units.SI.Format(in.Yield, units.Stress), "exceeds the tensile strength %s", units.SI.Format(in.Tensile, units.Stress))
	}
	if !given["bolt.modulus"] {
		in.BoltModulus = model.SteelModulus
		s.Sources["bolt.modulus"] = "default: steel, Shigley Table A-5"
		if stainless {
			in.BoltModulus = model.StainlessModulus
			s.Sources["bolt.modulus"] = "default: 18-8 stainless, Shigley Table A-5"
		}
	}
	if err := b.positive("bolt.modulus", in.BoltModulus); err != nil {
		return err
	}
	count, err := p.integer(r, "bolt.count", 1, 1, 1000)
	if err != nil {
		return err
	}
	in.Bolts = int(count)
	return nil
}
