package scenario

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// DefaultThreadFriction is the thread friction μG of the thread torsion of
// a preload-controlled tightening (angle-controlled, ultrasonic) when
// neither tightening.thread_friction nor tightening.condition gives it:
// 0.12, a common design value in the overlap of VDI 2230-1 Table A5's
// friction classes B and C (common practice).
const DefaultThreadFriction = 0.12

// Physical ranges of the tightening inputs, internal units.
const (
	maxTorque  = 1e9 // N·mm = 1 000 000 N·m
	maxPreload = 1e8 // N = 100 MN
)

func (b *builder) tightening() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	lineOf := b.lineOf
	_, hasMethod := r.vals["tightening.method"]
	def := "nut-factor"
	switch {
	case given["tightening.preload"]:
		def = "preload"
	case !hasMethod && (given["tightening.thread_friction"] || given["tightening.head_friction"]):
		k := "tightening.thread_friction"
		if !given[k] {
			k = "tightening.head_friction"
		}
		return p.errf(lineOf(k), k, "", "given without tightening.method, and the default method nut-factor (T = K·F·d) does not use it: set tightening.method: friction to tighten by torque with thread and head friction (VDI 2230-1 / ISO 16047), or method: preload for the thread torsion of an angle-controlled or ultrasonic tightening")
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
	tool, tline, hasTool, err := p.scalar(r, "tightening.tool")
	if err != nil {
		return err
	}
	var t Tool
	if hasTool {
		if t, err = lookupTool(strings.ToLower(tool)); err != nil {
			return p.errf(tline, "tightening.tool", tool, "%v", err)
		}
		s.ToolName = t.Name
		if (t.Controls == "torque") == (in.Method == model.DirectPreload) {
			return p.errf(tline, "tightening.tool", tool, "this tool controls %s; it does not fit tightening method %s", t.Controls, method)
		}
		in.Tensioned = t.Tensioner
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
		src := "condition " + c.Name
		switch in.Method {
		case model.NutFactorMethod:
			if !given["tightening.nut_factor"] {
				d, _ := montecarlo.NewLogNormalMoments(c.NutFactor, c.NutFactor*c.NutFactorCOV)
				b.addVar("tightening.nut_factor", d, src+" ("+c.Source+")")
				given["tightening.nut_factor"] = true
			}
		case model.FrictionMethod:
			for _, k := range []string{"tightening.thread_friction", "tightening.head_friction"} {
				if !given[k] {
					d, _ := montecarlo.NewUniform(c.FrictionLo, c.FrictionHi)
					b.addVar(k, d, src+" (VDI 2230-1 Table A5 class "+c.FrictionClass+")")
					given[k] = true
				}
			}
		default:
			if in.Tensioned {
				return p.errf(cline, "tightening.condition", cond, "a tensioner does not turn the nut under load, so the thread friction has no effect; remove tightening.condition")
			}
			if !given["tightening.thread_friction"] {
				d, _ := montecarlo.NewUniform(c.FrictionLo, c.FrictionHi)
				b.addVar("tightening.thread_friction", d, src+" (VDI 2230-1 Table A5 class "+c.FrictionClass+"): thread torsion while the nut turns")
				given["tightening.thread_friction"] = true
			}
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
	optional := []string{}
	if in.Method == model.DirectPreload && !in.Tensioned {
		optional = append(optional, "tightening.thread_friction")
	}
	for _, k := range []string{"tightening.torque", "tightening.nut_factor", "tightening.thread_friction", "tightening.head_friction", "tightening.preload"} {
		if given[k] && !slices.Contains(need, k) && !slices.Contains(optional, k) {
			why := "remove it or change tightening.method"
			if k == "tightening.thread_friction" && in.Tensioned {
				why = "a tensioner does not turn the nut under load: no thread torsion; remove it"
			}
			return p.errf(lineOf(k), k, "", "not used by tightening method %s; %s", method, why)
		}
	}
	if in.Method == model.DirectPreload && !in.Tensioned && !given["tightening.thread_friction"] {
		in.ThreadFriction = DefaultThreadFriction
		s.Sources["tightening.thread_friction"] = "default: μG = 0.12 for the thread torsion (common practice design value, VDI 2230-1 Table A5 classes B/C)"
	}
	// Physical ranges, checked before a tool preset builds its scatter on
	// the nominal value.
	if err := b.within("tightening.torque", 0, maxTorque); err != nil {
		return err
	}
	if err := b.within("tightening.preload", 0, maxPreload); err != nil {
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
	if hasTool {
		path := "tightening." + t.Controls
		if _, ok := s.Uncertain(path); !ok {
			nom := *mustField(path).ptr(in)
			d, err := montecarlo.NewNormal(nom, t.Tolerance*math.Abs(nom)/3)
			if err != nil {
				return p.errf(lineOf(path), path, b.fmt(nom, FieldDim(path)), "%v", err)
			}
			b.addVar(path, d, "tool "+t.Name+" ("+t.Source+")")
		}
	}
	if in.Embedding < 0 {
		return p.errf(lineOf("tightening.embedding"), "tightening.embedding", b.fmt(in.Embedding, units.Length), "must be ≥ 0")
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
	if b.embeddingVDI {
		fz := model.EmbeddingEstimateOf(in, b.s.Roughness, in.ShearLoad > 0)
		in.Embedding = fz.Total
		s.Sources["tightening.embedding"] = "VDI 2230-1 Table 5 estimate (from memory): " + fz.Describe()
	}
	// Tightening into the plastic range is not modelled: a preload-controlled
	// tightening whose nominal assembly stress reaches the yield strength is
	// yield-controlled (or angle beyond the elastic limit).
	if in.Method == model.DirectPreload {
		if fmax := model.PermissibleAssemblyPreload(in, 1); in.Preload >= fmax {
			return p.errf(lineOf("tightening.preload"), "tightening.preload", b.fmt(in.Preload, units.Force),
				"reaches the elastic limit of the bolt in tightening (von Mises with the thread torsion: FM at ν = 1 is %s): tightening into the plastic range (yield-controlled, or angle beyond the elastic limit) is not modelled; give a preload below %s",
				b.fmt(fmax, units.Force), b.fmt(fmax, units.Force))
		}
	}
	return nil
}

// within checks the nominal value of a registry field against (lo, hi],
// naming the range in the scenario's units.
func (b *builder) within(path string, lo, hi float64) error {
	f := mustField(path)
	return b.physical(path, lo, hi, fmt.Sprintf("%s must lie within %s … %s", f.label, b.fmt(lo, f.dim), b.fmt(hi, f.dim)))
}
