package scenario

import (
	"fmt"
	"math"

	"boltrisk/model"
	"boltrisk/model/units"
)

func (b *builder) loads() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	lineOf := b.lineOf
	if in.AxialMin > in.AxialMax {
		return p.errf(lineOf("loads.axial_min"), "loads.axial_min", b.fmt(in.AxialMin, units.Force), "exceeds loads.axial_max %s (P_min must not exceed P_max)", b.fmt(in.AxialMax, units.Force))
	}
	if in.ShearLoad < 0 {
		return p.errf(lineOf("loads.shear"), "loads.shear", b.fmt(in.ShearLoad, units.Force), "must be ≥ 0 (a magnitude)")
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
	across, err := p.integer(r, "plate.bolts_across", 0, 1, 1000)
	if err != nil {
		return err
	}
	inLine, err := p.integer(r, "plate.bolts_in_line", 0, 1, 1000)
	if err != nil {
		return err
	}
	if err := b.pattern(across, inLine); err != nil {
		return err
	}
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
		return p.errf(lineOf("plate.thickness"), "plate.thickness", b.fmt(in.PlateThickness, units.Length), "must be > 0")
	}
	mname, mline, hasMat, err := p.scalar(r, "plate.material")
	if err != nil {
		return err
	}
	if hasMat {
		m, err := model.LookupMaterial(mname)
		if err != nil {
			return p.errf(mline, "plate.material", mname, "%v", err)
		}
		if !m.IsPlate() {
			return p.errf(mline, "plate.material", mname, "has no tabulated plate strengths; use a plate grade (S235, S275, S355, A36, A572-50) or give plate.yield_strength and plate.tensile_strength")
		}
		fy, fu, err := m.PlateStrengthAt(in.PlateThickness)
		if err != nil && !(given["plate.yield_strength"] && given["plate.tensile_strength"]) {
			return p.errf(mline, "plate.material", mname, "%v; give plate.yield_strength and plate.tensile_strength", err)
		}
		src := fmt.Sprintf("%s, t = %s: %s", m.Name, b.fmt(in.PlateThickness, units.Length), m.Source)
		if !given["plate.yield_strength"] {
			in.PlateYield = fy
			s.Sources["plate.yield_strength"] = src
		}
		if !given["plate.tensile_strength"] {
			in.PlateTensile = fu
			s.Sources["plate.tensile_strength"] = src
		}
	}
	if !(in.PlateYield > 0) {
		return p.errf(lineOf("plate.yield_strength"), "plate.yield_strength", "", "loads.shear > 0 needs the plate strength: give plate.material or plate.yield_strength > 0")
	}
	if in.ShearRule != model.YieldRule && !(in.PlateTensile > 0) {
		return p.errf(lineOf("plate.tensile_strength"), "plate.tensile_strength", "", "resistance %s needs the plate tensile strength: give plate.material or plate.tensile_strength > 0", rule)
	}
	if in.PlateTensile > 0 && in.PlateYield > in.PlateTensile {
		return p.errf(lineOf("plate.yield_strength"), "plate.yield_strength", b.fmt(in.PlateYield, units.Stress), "exceeds the plate tensile strength %s", b.fmt(in.PlateTensile, units.Stress))
	}
	half := b.fmt(in.HoleDia/2, units.Length)
	if given["plate.edge_distance"] && !(in.EdgeDistance > in.HoleDia/2) {
		return p.errf(lineOf("plate.edge_distance"), "plate.edge_distance", b.fmt(in.EdgeDistance, units.Length), "must lie beyond the hole edge: more than half the hole diameter (%s)", half)
	}
	if given["plate.side_distance"] && !(in.SideDistance > in.HoleDia/2) {
		return p.errf(lineOf("plate.side_distance"), "plate.side_distance", b.fmt(in.SideDistance, units.Length), "must lie beyond the hole edge: more than half the hole diameter (%s)", half)
	}
	if in.ShearRule == model.EN1993 && !given["plate.edge_distance"] {
		return p.errf(0, "plate.edge_distance", "", "resistance en1993 needs the edge distance e1 for bearing")
	}
	_, n := in.Rows()
	if given["plate.width"] && !(in.PlateWidth > n*in.HoleDia) {
		return p.errf(lineOf("plate.width"), "plate.width", b.fmt(in.PlateWidth, units.Length), "must exceed the holes across it (%g × %s)", n, b.fmt(in.HoleDia, units.Length))
	}
	if given["plate.width"] && in.Gauge > 0 && !given["plate.side_distance"] {
		// A centred group: e2 from the width and the gauges.
		if e2 := (in.PlateWidth - (n-1)*in.Gauge) / 2; e2 > in.HoleDia/2 {
			in.SideDistance = e2
			s.Sources["plate.side_distance"] = "from plate.width and plate.gauge (group centred)"
		}
	}
	return b.spacingWarnings()
}

// pattern reads the bolt group of a shear joint: bolts_in_line × bolts_across
// = bolt.count, pitch and gauge.
func (b *builder) pattern(across, inLine int64) error {
	p, s, in, given := b.p, b.s, b.in, b.given
	count := int64(in.Bolts)
	in.BoltsAcross = float64(across)
	switch {
	case inLine > 0 && across > 0:
		if inLine*across != count {
			return p.errf(b.lineOf("plate.bolts_in_line"), "plate.bolts_in_line", fmt.Sprint(inLine),
				"× plate.bolts_across %d = %d bolts, but bolt.count is %d; the group must hold every bolt", across, inLine*across, count)
		}
	case inLine > 0:
		if count%inLine != 0 {
			return p.errf(b.lineOf("plate.bolts_in_line"), "plate.bolts_in_line", fmt.Sprint(inLine), "does not divide bolt.count %d into whole rows", count)
		}
		in.BoltsAcross = float64(count / inLine)
	case across > 0:
		if count%across != 0 {
			return p.errf(b.lineOf("plate.bolts_across"), "plate.bolts_across", fmt.Sprint(across), "does not divide bolt.count %d into whole rows", count)
		}
		inLine = count / across
	default:
		inLine = 1 // one row, every bolt across
	}
	in.BoltsInLine = float64(inLine)
	rows, cols := in.Rows()
	for _, k := range []string{"plate.pitch", "plate.gauge"} {
		if given[k] {
			if err := b.positive(k, *mustField(k).ptr(in)); err != nil {
				return err
			}
			if v := *mustField(k).ptr(in); !(v > in.HoleDia) {
				return p.errf(b.lineOf(k), k, b.fmt(v, units.Length), "must exceed the hole diameter %s (the holes would overlap)", b.fmt(in.HoleDia, units.Length))
			}
		}
	}
	if !(in.ShearLoad > 0) {
		return nil
	}
	if rows > 1 && !given["plate.pitch"] {
		s.Warnings = append(s.Warnings, model.Warning{Field: "plate.pitch", Message: fmt.Sprintf("%g rows of bolts in the load direction but no pitch: every bolt is taken as an end bolt (e1), which overrates the inner bolts at close pitch; give plate.pitch (and block tearing is not checked)", rows)})
	}
	if cols > 1 && !given["plate.gauge"] && in.ShearRule != model.AISC360 {
		s.Warnings = append(s.Warnings, model.Warning{Field: "plate.gauge", Message: fmt.Sprintf("%g bolts across but no gauge: every bolt is taken as an edge bolt (e2); give plate.gauge (and block tearing is not checked)", cols)})
	}
	return nil
}

// spacingWarnings flags pitch, gauge and edge distances below the codes'
// minimums (EN 1993-1-8 Table 3.3; AISC 360-16 J3.3).
func (b *builder) spacingWarnings() error {
	in, s := b.in, b.s
	d0, d := in.HoleDia, in.Thread.D
	rows, cols := in.Rows()
	warn := func(field, format string, args ...any) {
		s.Warnings = append(s.Warnings, model.Warning{Field: field, Message: fmt.Sprintf(format, args...)})
	}
	switch in.ShearRule {
	case model.EN1993:
		if rows > 1 && in.Pitch > 0 && in.Pitch < 2.2*d0 {
			warn("plate.pitch", "%s is below the EN 1993-1-8 Table 3.3 minimum p1 = 2.2·d0 = %s", b.fmt(in.Pitch, units.Length), b.fmt(2.2*d0, units.Length))
		}
		if cols > 1 && in.Gauge > 0 && in.Gauge < 2.4*d0 {
			warn("plate.gauge", "%s is below the EN 1993-1-8 Table 3.3 minimum p2 = 2.4·d0 = %s", b.fmt(in.Gauge, units.Length), b.fmt(2.4*d0, units.Length))
		}
		if in.SideDistance > 0 && in.SideDistance < 1.2*d0 {
			warn("plate.side_distance", "%s is below the EN 1993-1-8 Table 3.3 minimum e2 = 1.2·d0 = %s", b.fmt(in.SideDistance, units.Length), b.fmt(1.2*d0, units.Length))
		}
	case model.AISC360:
		for _, x := range []struct {
			field string
			v     float64
			n     float64
		}{{"plate.pitch", in.Pitch, rows}, {"plate.gauge", in.Gauge, cols}} {
			if x.n > 1 && x.v > 0 && x.v < 8.0/3*d {
				warn(x.field, "%s is below the AISC 360-16 J3.3 minimum spacing 2⅔·d = %s", b.fmt(x.v, units.Length), b.fmt(8.0/3*d, units.Length))
			}
		}
	}
	return nil
}

// service reads the service section: the temperature change of bolt and
// members from assembly, and checks that every part has its expansion.
func (b *builder) service() error {
	p, s, in, given := b.p, b.s, b.in, b.given
	if in.TemperatureChange == 0 {
		if _, unc := s.Uncertain("service.temperature_change"); !unc {
			return nil
		}
	}
	if math.Abs(in.TemperatureChange) > 500 {
		return p.errf(b.lineOf("service.temperature_change"), "service.temperature_change", b.fmt(in.TemperatureChange, units.TempDiff), "must lie within %s … %s (the moduli and strengths are taken at assembly temperature)", b.fmt(-500, units.TempDiff), b.fmt(500, units.TempDiff))
	}
	n := in.NLayers
	if in.Tapped {
		n--
	}
	for i := 1; i <= n; i++ {
		k := fmt.Sprintf("members.layers.%d.expansion", i)
		if in.Layers[i-1].Expansion == 0 && !given[k] {
			return p.errf(b.lineOf("service.temperature_change"), k, "", "service.temperature_change needs the expansion coefficient of layer %d: give members.layers.%d.material (see 'boltrisk catalog materials') or members.layers.%d.expansion (e.g. 12 um/m/K)", i, i, i)
		}
	}
	for _, w := range []struct {
		key string
		w   *model.Washer
	}{{"bolt.washer", &in.Washer}, {"bolt.nut_washer", &in.NutWasher}} {
		if w.w.Present() && w.w.Expansion == 0 {
			return p.errf(b.lineOf(w.key), w.key+".expansion", "", "service.temperature_change needs the washer's expansion coefficient: give %s.material or %s.expansion", w.key, w.key)
		}
	}
	if !(in.BoltExpansion > 0) {
		return p.errf(b.lineOf("bolt.expansion"), "bolt.expansion", b.fmt(in.BoltExpansion, units.Expansion), "must be > 0")
	}
	return nil
}
