package scenario

import (
	"math"

	"boltrisk/model"
	"boltrisk/model/units"
)

func (b *builder) loads() error {
	p, r, in, given := b.p, b.r, b.in, b.given
	lineOf := b.lineOf
	if in.AxialMin > in.AxialMax {
		return p.errf(lineOf("loads.axial_min"), "loads.axial_min", units.SI.Format(in.AxialMin, units.Force), "exceeds loads.axial_max %s (P_min must not exceed P_max)", units.SI.Format(in.AxialMax, units.Force))
	}
	if in.ShearLoad < 0 {
		return p.errf(lineOf("loads.shear"), "loads.shear", units.SI.Format(in.ShearLoad, units.Force), "must be ≥ 0 (a magnitude)")
	}
	planes, err := p.integer(r, "loads.shear_planes", 1, 1, 20)
	if err != nil {
		return err
	}
	in.ShearPlanes = float64(planes)
	if in.ThreadsInShearPlane, err = p.boolean(r, "loads.threads_in_shear_plane"); err != nil {
		return err
	}
	rule, err := p.word(r, "plate.resistance", "yield", []string{"yield", "en1993", "aisc360"})
	if err != nil {
		return err
	}
	in.ShearRule = map[string]model.ShearRule{"yield": model.YieldRule, "en1993": model.EN1993, "aisc360": model.AISC360}[rule]
	mname, mline, hasMat, err := p.scalar(r, "plate.material")
	if err != nil {
		return err
	}
	if hasMat {
		m, err := model.LookupMaterial(mname)
		if err != nil {
			return p.errf(mline, "plate.material", mname, "%v", err)
		}
		if m.Yield == 0 {
			return p.errf(mline, "plate.material", mname, "has no tabulated strengths; use a plate grade (S235, S275, S355, A36, A572-50) or give plate.yield_strength and plate.tensile_strength")
		}
		if !given["plate.yield_strength"] {
			in.PlateYield = m.Yield
		}
		if !given["plate.tensile_strength"] {
			in.PlateTensile = m.Tensile
		}
	}
	across, err := p.integer(r, "plate.bolts_across", 0, 1, 1000)
	if err != nil {
		return err
	}
	in.BoltsAcross = float64(across)
	if in.SlipFactor < 0 || in.SlipFactor > 1 {
		return p.errf(lineOf("plate.slip_factor"), "plate.slip_factor", units.Sig(in.SlipFactor, 4), "must lie within 0 … 1")
	}
	if !(in.ShearLoad > 0) {
		return nil
	}
	if !given["plate.thickness"] {
		in.PlateThickness = in.Layers[0].Thickness
		for _, l := range in.Layers[1:in.NLayers] {
			in.PlateThickness = math.Min(in.PlateThickness, l.Thickness)
		}
	}
	if !(in.PlateThickness > 0) {
		return p.errf(lineOf("plate.thickness"), "plate.thickness", units.SI.Format(in.PlateThickness, units.Length), "must be > 0")
	}
	if !(in.PlateYield > 0) {
		return p.errf(lineOf("plate.yield_strength"), "plate.yield_strength", "", "loads.shear > 0 needs the plate strength: give plate.material or plate.yield_strength > 0")
	}
	if in.ShearRule != model.YieldRule && !(in.PlateTensile > 0) {
		return p.errf(lineOf("plate.tensile_strength"), "plate.tensile_strength", "", "resistance %s needs the plate tensile strength: give plate.material or plate.tensile_strength > 0", rule)
	}
	if given["plate.edge_distance"] && !(in.EdgeDistance > in.HoleDia/2) {
		return p.errf(lineOf("plate.edge_distance"), "plate.edge_distance", units.SI.Format(in.EdgeDistance, units.Length), "must lie beyond the hole edge: more than half the hole diameter (%s)", units.SI.Format(in.HoleDia/2, units.Length))
	}
	if given["plate.side_distance"] && !(in.SideDistance > in.HoleDia/2) {
		return p.errf(lineOf("plate.side_distance"), "plate.side_distance", units.SI.Format(in.SideDistance, units.Length), "must lie beyond the hole edge: more than half the hole diameter (%s)", units.SI.Format(in.HoleDia/2, units.Length))
	}
	if in.ShearRule == model.EN1993 && !given["plate.edge_distance"] {
		return p.errf(0, "plate.edge_distance", "", "resistance en1993 needs the edge distance e1 for bearing")
	}
	n := in.BoltsAcross
	if n == 0 {
		n = float64(in.Bolts)
	}
	if given["plate.width"] && !(in.PlateWidth > n*in.HoleDia) {
		return p.errf(lineOf("plate.width"), "plate.width", units.SI.Format(in.PlateWidth, units.Length), "must exceed the holes across it (%g × %s)", n, units.SI.Format(in.HoleDia, units.Length))
	}
	return nil
}
