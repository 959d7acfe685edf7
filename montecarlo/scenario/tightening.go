package scenario

import (
	"math"
	"slices"
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

func (b *builder) tightening() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	lineOf := b.lineOf
	def := "nut-factor"
	switch {
	case given["tightening.preload"]:
		def = "preload"
	case given["tightening.thread_friction"] || given["tightening.head_friction"]:
		def = "friction"
	}
	method, err := p.word(r, "tightening.method", def, []string{"nut-factor", "friction", "preload"})
	if err != nil {
		return err
	}
	switch method {
	case "nut-factor":
		in.Method = model.NutFactorMethod
	case "friction":
		in.Method = model.FrictionMethod
	default:
		in.Method = model.DirectPreload
	}
	cond, cline, hasCond, err := p.scalar(r, "tightening.condition")
	if err != nil {
		return err
	}
	if hasCond {
		c, err := lookupCondition(strings.ToLower(cond))
		if err != nil {
			return p.errf(cline, "tightening.condition", cond, "%v", err)
		}
		s.ConditionName = c.Name
		switch in.Method {
		case model.NutFactorMethod:
			if !given["tightening.nut_factor"] {
				d, _ := montecarlo.NewLogNormalMoments(c.NutFactor, c.NutFactor*c.NutFactorCOV)
				b.addVar("tightening.nut_factor", d, "condition "+c.Name)
				given["tightening.nut_factor"] = true
			}
		case model.FrictionMethod:
			for _, k := range []string{"tightening.thread_friction", "tightening.head_friction"} {
				if !given[k] {
					d, _ := montecarlo.NewUniform(c.FrictionLo, c.FrictionHi)
					b.addVar(k, d, "condition "+c.Name)
					given[k] = true
				}
			}
		default:
			return p.errf(cline, "tightening.condition", cond, "an assembly condition sets nut factor or friction; it has no effect with method preload")
		}
	}
	tool, tline, hasTool, err := p.scalar(r, "tightening.tool")
	if err != nil {
		return err
	}
	if hasTool {
		t, err := lookupTool(strings.ToLower(tool))
		if err != nil {
			return p.errf(tline, "tightening.tool", tool, "%v", err)
		}
		s.ToolName = t.Name
		path := "tightening." + t.Controls
		if (t.Controls == "torque") == (in.Method == model.DirectPreload) {
			return p.errf(tline, "tightening.tool", tool, "this tool controls %s; it does not fit tightening method %s", t.Controls, method)
		}
		if !given[path] {
			return p.errf(tline, "tightening.tool", tool, "needs the nominal %s (%s)", t.Controls, path)
		}
		if _, ok := s.Uncertain(path); !ok {
			nom := *mustField(path).ptr(in)
			d, err := montecarlo.NewNormal(nom, t.Tolerance*math.Abs(nom)/3)
			if err != nil {
				return p.errf(lineOf(path), path, "", "%v", err)
			}
			b.addVar(path, d, "tool "+t.Name)
		}
	}
	need := map[model.TighteningMethod][]string{
		model.NutFactorMethod: {"tightening.torque", "tightening.nut_factor"},
		model.FrictionMethod:  {"tightening.torque", "tightening.thread_friction", "tightening.head_friction"},
		model.DirectPreload:   {"tightening.preload"},
	}[in.Method]
	for _, k := range need {
		if !given[k] {
			hint := ""
			if strings.Contains(k, "friction") || strings.Contains(k, "nut_factor") {
				hint = " (or tightening.condition)"
			}
			return p.errf(0, k, "", "required by tightening method %s%s", method, hint)
		}
	}
	for _, k := range []string{"tightening.torque", "tightening.nut_factor", "tightening.thread_friction", "tightening.head_friction", "tightening.preload"} {
		if given[k] && !slices.Contains(need, k) {
			return p.errf(lineOf(k), k, "", "not used by tightening method %s; remove it or change tightening.method", method)
		}
	}
	if err := b.physical("tightening.torque", 0, math.Inf(1), "must be > 0"); err != nil {
		return err
	}
	if err := b.physical("tightening.preload", 0, math.Inf(1), "must be > 0"); err != nil {
		return err
	}
	if err := b.physical("tightening.nut_factor", 0.03, 0.8, "must lie within 0.03 … 0.8, the physical range of nut factors"); err != nil {
		return err
	}
	for _, k := range []string{"tightening.thread_friction", "tightening.head_friction"} {
		if err := b.physical(k, 0.01, 0.8, "must lie within 0.01 … 0.8, the physical range of friction coefficients"); err != nil {
			return err
		}
	}
	if in.Embedding < 0 {
		return p.errf(lineOf("tightening.embedding"), "tightening.embedding", units.SI.Format(in.Embedding, units.Length), "must be ≥ 0")
	}
	if in.Relaxation < 0 || in.Relaxation >= 1 {
		return p.errf(lineOf("tightening.relaxation"), "tightening.relaxation", units.Sig(in.Relaxation, 4), "must lie within 0 … 1 (a fraction; 5%% or 0.05)")
	}
	if !given["tightening.torsion_factor"] {
		in.TorsionFactor = model.DefaultTorsionFactor
		s.Sources["tightening.torsion_factor"] = "default: VDI 2230-1 (from memory)"
	}
	if in.TorsionFactor < 0 || in.TorsionFactor > 1 {
		return p.errf(lineOf("tightening.torsion_factor"), "tightening.torsion_factor", units.Sig(in.TorsionFactor, 4), "must lie within 0 … 1")
	}
	return nil
}
