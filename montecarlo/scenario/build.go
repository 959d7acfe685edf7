package scenario

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// build turns the flattened document into a validated scenario.
func (p *parser) build(r rawDoc) (*Scenario, error) {
	s, err := p.buildOne(r)
	if err != nil {
		return nil, err
	}
	if err := p.buildVariants(s, r); err != nil {
		return nil, err
	}
	return s, nil
}

func (p *parser) buildOne(r rawDoc) (*Scenario, error) {
	s := &Scenario{File: p.file}
	in := &s.Problem.Base
	given := map[string]bool{}
	lineOf := func(path string) int { return r.keyAt[path] }

	if v, _, ok, err := p.scalar(r, "name"); err != nil {
		return nil, err
	} else if ok {
		s.Name = v
	}
	if v, _, ok, err := p.scalar(r, "description"); err != nil {
		return nil, err
	} else if ok {
		s.Description = v
	}
	sysName, err := p.word(r, "units", "si", []string{"si", "us"})
	if err != nil {
		return nil, err
	}
	s.Units, _ = units.ParseSystem(sysName)

	// Every registry field present: nominal value, and a distribution if given.
	for _, f := range fields {
		if _, ok := r.vals[f.path]; !ok {
			continue
		}
		if strings.HasPrefix(f.path, "members.layers.") {
			i, _ := strconv.Atoi(strings.Split(f.path, ".")[2])
			if i > r.nLay {
				continue
			}
		}
		v, d, _, err := p.value(r, f)
		if err != nil {
			return nil, err
		}
		*f.ptr(in) = v
		given[f.path] = true
		if d != nil {
			s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: f.path, Dist: *d, PerBolt: f.perBolt, Field: f.ptr})
		}
	}
	positive := func(path string, v float64) error {
		if !(v > 0) {
			return p.errf(lineOf(path), path, units.SI.Format(v, FieldDim(path)), "must be > 0")
		}
		return nil
	}

	// Bolt.
	tname, line, ok, err := p.scalar(r, "bolt.thread")
	if err != nil {
		return nil, err
	}
	if !ok {
		return nil, p.errf(0, "bolt.thread", "", "required (e.g. M12, M10x1.25, 1/2-13 UNC)")
	}
	th, err := model.LookupThread(tname)
	if err != nil {
		return nil, p.errf(line, "bolt.thread", tname, "%v", err)
	}
	in.Thread = th
	d := th.D
	cname, cline, hasClass, err := p.scalar(r, "bolt.class")
	if err != nil {
		return nil, err
	}
	stainless := false
	enduranceNote := "" // a caveat on the tabulated endurance, reported if fatigue is checked
	if hasClass {
		c, err := model.LookupClass(cname, d)
		if err != nil {
			return nil, p.errf(cline, "bolt.class", cname, "%v", err)
		}
		s.ClassName = c.Name
		stainless = c.Standard == "ISO 3506-1"
		in.AlphaV = c.AlphaV
		in.FubNominal = c.NominalTensile
		if !given["bolt.proof_strength"] {
			in.Proof = c.Proof
		}
		if !given["bolt.yield_strength"] {
			in.Yield = c.Yield
		}
		if !given["bolt.tensile_strength"] {
			in.Tensile = c.Tensile
		}
		if !given["fatigue.endurance"] && c.Endurance > 0 {
			in.Endurance = c.Endurance
			s.EnduranceNote = "Shigley Table 8-17, class " + c.Name
			if c.Note != "" && strings.Contains(c.Note, "Table 8-17") && d < 16 {
				enduranceNote = c.Note
			}
		}
	} else {
		for _, k := range []string{"bolt.proof_strength", "bolt.yield_strength", "bolt.tensile_strength"} {
			if !given[k] {
				return nil, p.errf(0, k, "", "required when bolt.class is not given")
			}
		}
	}
	for _, k := range []string{"bolt.proof_strength", "bolt.yield_strength", "bolt.tensile_strength"} {
		if err := positive(k, *mustField(k).ptr(in)); err != nil {
			return nil, err
		}
	}
	if in.Yield > in.Tensile {
		return nil, p.errf(lineOf("bolt.yield_strength"), "bolt.yield_strength", units.SI.Format(in.Yield, units.Stress), "exceeds the tensile strength %s", units.SI.Format(in.Tensile, units.Stress))
	}
	if !given["bolt.modulus"] {
		in.BoltModulus = 207000 // steel, Shigley Table A-5
		if stainless {
			in.BoltModulus = 190000 // 18-8 stainless, Shigley Table A-5
		}
	}
	if err := positive("bolt.modulus", in.BoltModulus); err != nil {
		return nil, err
	}
	count, err := p.integer(r, "bolt.count", 1, 1, 1000)
	if err != nil {
		return nil, err
	}
	in.Bolts = int(count)

	// Members.
	if r.nLay == 0 {
		return nil, p.errf(0, "members.layers", "", "required: a list of clamped layers, each with thickness and material or modulus")
	}
	in.NLayers = r.nLay
	var layerMats []string
	for i := 1; i <= r.nLay; i++ {
		pre := fmt.Sprintf("members.layers.%d.", i)
		l := &in.Layers[i-1]
		if !given[pre+"thickness"] {
			return nil, p.errf(0, pre+"thickness", "", "required")
		}
		if err := positive(pre+"thickness", l.Thickness); err != nil {
			return nil, err
		}
		mname, mline, hasMat, err := p.scalar(r, pre+"material")
		if err != nil {
			return nil, err
		}
		if hasMat {
			m, err := model.LookupMaterial(mname)
			if err != nil {
				return nil, p.errf(mline, pre+"material", mname, "%v", err)
			}
			if !given[pre+"modulus"] {
				l.Modulus = m.Modulus
			}
			l.WilemanA, l.WilemanB = m.WilemanA, m.WilemanB
			layerMats = append(layerMats, m.Name)
		} else {
			if !given[pre+"modulus"] {
				return nil, p.errf(0, pre+"material", "", "give material (see 'boltrisk catalog materials') or modulus")
			}
			layerMats = append(layerMats, "")
		}
		if err := positive(pre+"modulus", l.Modulus); err != nil {
			return nil, err
		}
	}
	grip := in.Grip()
	method, err := p.word(r, "members.method", "frustum", []string{"frustum", "wileman"})
	if err != nil {
		return nil, err
	}
	if method == "wileman" {
		in.StiffnessMethod = model.Wileman
		for i := 1; i < r.nLay; i++ {
			if in.Layers[i].Modulus != in.Layers[0].Modulus || layerMats[i] != layerMats[0] {
				return nil, p.errf(lineOf("members.method"), "members.method", "wileman", "the Wileman et al. fit holds for members of one material; layers 1 and %d differ (use frustum)", i+1)
			}
		}
		if in.Layers[0].WilemanA == 0 {
			s.Warnings = append(s.Warnings, model.Warning{Field: "members.method", Message: "no Wileman fit for this material; the general-expression constants A = 0.78952, B = 0.62914 are used"})
		}
	}
	if given["members.stiffness"] {
		if err := positive("members.stiffness", in.MemberStiffness); err != nil {
			return nil, err
		}
	}
	if given["members.load_introduction"] && !(in.LoadIntroduction > 0 && in.LoadIntroduction <= 1) {
		return nil, p.errf(lineOf("members.load_introduction"), "members.load_introduction", units.Sig(in.LoadIntroduction, 4), "must lie in (0, 1]")
	}

	// Bolt geometry in the grip.
	if !given["bolt.bearing_diameter"] {
		in.BearingDia = 1.5 * d // washer face 1.5·d (Shigley §8-5)
	}
	if !given["bolt.hole_diameter"] {
		in.HoleDia = defaultHole(th)
	}
	if !(in.HoleDia > d) {
		return nil, p.errf(lineOf("bolt.hole_diameter"), "bolt.hole_diameter", units.SI.Format(in.HoleDia, units.Length), "must exceed the bolt diameter %s", units.SI.Format(d, units.Length))
	}
	if !(in.BearingDia > in.HoleDia) {
		return nil, p.errf(lineOf("bolt.bearing_diameter"), "bolt.bearing_diameter", units.SI.Format(in.BearingDia, units.Length), "must exceed the hole diameter %s", units.SI.Format(in.HoleDia, units.Length))
	}
	length, hasLen, err := p.optQuantity(r, "bolt.length", units.Length)
	if err != nil {
		return nil, err
	}
	lt, hasLT, err := p.optQuantity(r, "bolt.thread_length", units.Length)
	if err != nil {
		return nil, err
	}
	switch {
	case given["bolt.shank_in_grip"]:
		if hasLen || hasLT {
			return nil, p.errf(lineOf("bolt.shank_in_grip"), "bolt.shank_in_grip", "", "give either shank_in_grip or length/thread_length, not both")
		}
		if in.ShankInGrip < 0 || in.ShankInGrip > grip {
			return nil, p.errf(lineOf("bolt.shank_in_grip"), "bolt.shank_in_grip", units.SI.Format(in.ShankInGrip, units.Length), "must lie within 0 … grip %s", units.SI.Format(grip, units.Length))
		}
	case hasLen:
		if !(length > grip) {
			return nil, p.errf(lineOf("bolt.length"), "bolt.length", units.SI.Format(length, units.Length), "is not longer than the grip %s (sum of members.layers): the bolt cannot clamp the members", units.SI.Format(grip, units.Length))
		}
		if !hasLT {
			lt = defaultThreadLength(th, length)
		}
		if !(lt > 0) {
			return nil, p.errf(lineOf("bolt.thread_length"), "bolt.thread_length", units.SI.Format(lt, units.Length), "must be > 0")
		}
		in.ShankInGrip = math.Min(math.Max(length-lt, 0), grip)
	case hasLT:
		return nil, p.errf(lineOf("bolt.thread_length"), "bolt.thread_length", "", "needs bolt.length")
	}

	if err := p.tightening(r, s, given); err != nil {
		return nil, err
	}
	if err := p.loads(r, s, given); err != nil {
		return nil, err
	}
	if err := p.fatigue(r, s, given); err != nil {
		return nil, err
	}
	if enduranceNote != "" && in.AxialMax > in.AxialMin && !given["fatigue.endurance"] && s.EnduranceNote != "" && strings.HasPrefix(s.EnduranceNote, "Shigley") {
		s.Warnings = append(s.Warnings, model.Warning{Field: "fatigue.endurance", Message: enduranceNote})
	}
	if err := p.study(r, s); err != nil {
		return nil, err
	}
	if err := p.correlations(r, s); err != nil {
		return nil, err
	}
	// Lay uncertain nominal values into the base (means), then check the model.
	var out model.Outcome
	model.Evaluate(in, &out)
	if out.Invalid {
		return nil, p.errf(0, "", "", "the nominal joint lies outside the model's domain (check nut factor, friction and strengths)")
	}
	for m := model.Mode(0); m < model.NumModes; m++ {
		if out.Active[m] && (math.IsNaN(out.Demand[m]) || math.IsNaN(out.Capacity[m])) {
			return nil, p.errf(0, "", "", "mode %s gives no number for these inputs; please check the geometry", m.Key())
		}
	}
	s.Warnings = append(s.Warnings, model.Check(in)...)
	return s, nil
}

func mustField(path string) field {
	f, ok := lookupField(path)
	if !ok {
		panic("scenario: no field " + path)
	}
	return f
}

func (p *parser) optQuantity(r rawDoc, path string, dim units.Dim) (float64, bool, error) {
	s, line, ok, err := p.scalar(r, path)
	if err != nil || !ok {
		return 0, ok, err
	}
	v, err := units.Parse(s, dim)
	if err != nil {
		return 0, true, p.errf(line, path, s, "%v", err)
	}
	return v, true, nil
}

// defaultHole is the normal clearance hole: EN 1090-2 (from memory) d + 1 mm
// up to M14, d + 2 mm for M16–M24, d + 3 mm from M27; for inch bolts AISC 360
// Table J3.3 (from memory) d + 1/16 in up to 7/8 in, d + 1/8 in from 1 in.
func defaultHole(th model.Thread) float64 {
	d := th.D
	if th.Unified {
		if d < 25.4-1e-9 {
			return d + 25.4/16
		}
		return d + 25.4/8
	}
	switch {
	case d < 16:
		return d + 1
	case d <= 24:
		return d + 2
	}
	return d + 3
}

// defaultThreadLength is the threaded length of a standard bolt (Shigley
// Table 8-7): metric 2d + 6 (L ≤ 125), 2d + 12 (L ≤ 200), 2d + 25 mm;
// inch 2d + 1/4 in (L ≤ 6 in), 2d + 1/2 in.
func defaultThreadLength(th model.Thread, l float64) float64 {
	d := th.D
	if th.Unified {
		if l <= 6*25.4 {
			return 2*d + 25.4/4
		}
		return 2*d + 25.4/2
	}
	switch {
	case l <= 125:
		return 2*d + 6
	case l <= 200:
		return 2*d + 12
	}
	return 2*d + 25
}

func (p *parser) tightening(r rawDoc, s *Scenario, given map[string]bool) error {
	in := &s.Problem.Base
	lineOf := func(path string) int { return r.keyAt[path] }
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
				s.addVar("tightening.nut_factor", d)
				given["tightening.nut_factor"] = true
			}
		case model.FrictionMethod:
			for _, k := range []string{"tightening.thread_friction", "tightening.head_friction"} {
				if !given[k] {
					d, _ := montecarlo.NewUniform(c.FrictionLo, c.FrictionHi)
					s.addVar(k, d)
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
			s.addVar(path, d)
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
	if err := p.physical(r, s, "tightening.torque", 0, math.Inf(1), "must be > 0"); err != nil {
		return err
	}
	if err := p.physical(r, s, "tightening.preload", 0, math.Inf(1), "must be > 0"); err != nil {
		return err
	}
	if err := p.physical(r, s, "tightening.nut_factor", 0.03, 0.8, "must lie within 0.03 … 0.8, the physical range of nut factors"); err != nil {
		return err
	}
	for _, k := range []string{"tightening.thread_friction", "tightening.head_friction"} {
		if err := p.physical(r, s, k, 0.01, 0.8, "must lie within 0.01 … 0.8, the physical range of friction coefficients"); err != nil {
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
		in.TorsionFactor = 0.5 // VDI 2230-1 recommended kτ (from memory)
	}
	if in.TorsionFactor < 0 || in.TorsionFactor > 1 {
		return p.errf(lineOf("tightening.torsion_factor"), "tightening.torsion_factor", units.Sig(in.TorsionFactor, 4), "must lie within 0 … 1")
	}
	return nil
}

// physical checks the nominal value of a field (and the support of its
// distribution's central 99.8 %) against a physical range (lo, hi].
func (p *parser) physical(r rawDoc, s *Scenario, path string, lo, hi float64, msg string) error {
	f := mustField(path)
	v := *f.ptr(&s.Problem.Base)
	if _, ok := r.vals[path]; !ok && v == 0 {
		if _, unc := s.Uncertain(path); !unc {
			return nil
		}
	}
	line := r.keyAt[path]
	if !(v > lo && v <= hi) {
		return p.errf(line, path, s.Units.Format(v, f.dim), "%s", msg)
	}
	return nil
}

func (s *Scenario) addVar(path string, d montecarlo.Dist) {
	f := mustField(path)
	*f.ptr(&s.Problem.Base) = d.Mean()
	s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: path, Dist: d, PerBolt: f.perBolt, Field: f.ptr})
}

func (p *parser) loads(r rawDoc, s *Scenario, given map[string]bool) error {
	in := &s.Problem.Base
	lineOf := func(path string) int { return r.keyAt[path] }
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

func (p *parser) fatigue(r rawDoc, s *Scenario, given map[string]bool) error {
	in := &s.Problem.Base
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
	return nil
}

func (p *parser) study(r rawDoc, s *Scenario) error {
	n, err := p.integer(r, "study.samples", 0, 1, 1e11)
	if err != nil {
		return err
	}
	s.Study.Samples = n
	if v, line, ok, err := p.scalar(r, "study.seed"); err != nil {
		return err
	} else if ok {
		seed, err := strconv.ParseUint(v, 10, 64)
		if err != nil {
			return p.errf(line, "study.seed", v, "expected a whole number from 0 to 2^64−1")
		}
		s.Study.Seed, s.Study.SeedSet = seed, true
	}
	if v, line, ok, err := p.scalar(r, "study.confidence"); err != nil {
		return err
	} else if ok {
		c, err := units.Parse(v, units.Fraction)
		if err != nil || !(c > 0 && c < 1) {
			return p.errf(line, "study.confidence", v, "must lie strictly between 0 and 1 (e.g. 0.95 or 95%%)")
		}
		s.Study.Confidence = c
	}
	if v, line, ok, err := p.scalar(r, "study.target"); err != nil {
		return err
	} else if ok {
		c, err := units.Parse(v, units.Fraction)
		if err != nil || !(c > 0 && c < 1) {
			return p.errf(line, "study.target", v, "relative half-width must lie strictly between 0 and 1 (e.g. 0.1 or 10%%)")
		}
		s.Study.Target = c
	}
	return nil
}

func (p *parser) correlations(r rawDoc, s *Scenario) error {
	for _, n := range r.corr {
		if n.Kind != yaml.MappingNode {
			return p.errf(n.Line, "correlations", "", "each entry is {between: [input, input], rho: value}")
		}
		var names []string
		var nameLine int
		rho, rhoSet := 0.0, false
		err := p.pairs(n, "correlations", func(k, v *yaml.Node) error {
			switch k.Value {
			case "between":
				if v.Kind != yaml.SequenceNode || len(v.Content) != 2 {
					return p.errf(v.Line, "correlations.between", "", "expected two input names, e.g. [tightening.thread_friction, tightening.head_friction]")
				}
				for _, c := range v.Content {
					names = append(names, c.Value)
				}
				nameLine = v.Line
			case "rho":
				x, err := units.ParseNumber(v.Value)
				if err != nil || !(x > -1 && x < 1) {
					return p.errf(v.Line, "correlations.rho", v.Value, "must lie strictly between −1 and 1")
				}
				rho, rhoSet = x, true
			default:
				return p.errf(k.Line, "correlations."+k.Value, "", "unknown key%s; allowed: between, rho", suggest(k.Value, []string{"between", "rho"}))
			}
			return nil
		})
		if err != nil {
			return err
		}
		if names == nil || !rhoSet {
			return p.errf(n.Line, "correlations", "", "each entry needs between: [a, b] and rho:")
		}
		idx := [2]int{-1, -1}
		for j, nm := range names {
			path, err := ResolvePath(nm)
			if err != nil {
				return p.errf(nameLine, "correlations.between", nm, "%s", err.(*Error).Msg)
			}
			for i, v := range s.Problem.Vars {
				if v.Name == path {
					idx[j] = i
				}
			}
			if idx[j] < 0 {
				return p.errf(nameLine, "correlations.between", nm, "is not uncertain: give it a distribution first")
			}
		}
		if idx[0] == idx[1] {
			return p.errf(nameLine, "correlations.between", names[0], "an input cannot be correlated with itself")
		}
		s.Problem.Corr = append(s.Problem.Corr, montecarlo.Correlation{I: idx[0], J: idx[1], Rho: rho})
	}
	if len(s.Problem.Corr) > 0 {
		if _, err := montecarlo.NewCopula(len(s.Problem.Vars), s.Problem.Corr); err != nil {
			line := 0
			if len(r.corr) > 0 {
				line = r.corr[0].Line
			}
			return p.errf(line, "correlations", "", "%v", err)
		}
	}
	return nil
}

// buildVariants reads `variants:`, each a name and a `set:` mapping of
// dotted paths to values that replace the base scenario's.
func (p *parser) buildVariants(base *Scenario, r rawDoc) error {
	seen := map[string]bool{}
	for _, n := range r.vars {
		if n.Kind != yaml.MappingNode {
			return p.errf(n.Line, "variants", "", "each entry is {name: …, set: {path: value, …}}")
		}
		var name string
		var set *yaml.Node
		err := p.pairs(n, "variants", func(k, v *yaml.Node) error {
			switch k.Value {
			case "name":
				name = strings.TrimSpace(v.Value)
			case "set":
				if v.Kind != yaml.MappingNode {
					return p.errf(v.Line, "variants.set", "", "expected path: value lines, e.g. tightening.condition: oiled")
				}
				set = v
			default:
				return p.errf(k.Line, "variants."+k.Value, "", "unknown key%s; allowed: name, set", suggest(k.Value, []string{"name", "set"}))
			}
			return nil
		})
		if err != nil {
			return err
		}
		if name == "" || set == nil {
			return p.errf(n.Line, "variants", "", "each variant needs a name and a set: section")
		}
		if seen[name] {
			return p.errf(n.Line, "variants.name", name, "variant name used twice")
		}
		seen[name] = true
		vr := r.clone()
		vr.vars = nil
		// A variant that changes the tightening method starts its tightening
		// afresh: the base's torque, friction, preload and presets belong to
		// the base's method.
		for i := 0; i+1 < len(set.Content); i += 2 {
			if set.Content[i].Value == "tightening.method" {
				for _, k := range []string{"torque", "nut_factor", "thread_friction", "head_friction", "preload", "condition", "tool"} {
					delete(vr.vals, "tightening."+k)
				}
			}
		}
		err = p.pairs(set, "variants.set", func(k, v *yaml.Node) error {
			path := k.Value
			sec, key, ok := strings.Cut(path, ".")
			if !ok || sec == "members" && strings.HasPrefix(key, "layers") {
				if ok && strings.HasPrefix(key, "layers.") {
					vr.vals[path], vr.keyAt[path] = v, k.Line
					return nil
				}
				return p.errf(k.Line, "variants.set."+path, "", "expected a dotted path such as tightening.condition")
			}
			if _, known := sectionKeys[sec]; !known || !slices.Contains(sectionKeys[sec], key) {
				return p.errf(k.Line, "variants.set."+path, "", "no such input%s", suggest(path, allPaths()))
			}
			// A preset replaces the explicit values it governs, and vice versa.
			switch path {
			case "tightening.condition":
				delete(vr.vals, "tightening.nut_factor")
				delete(vr.vals, "tightening.thread_friction")
				delete(vr.vals, "tightening.head_friction")
			case "tightening.nut_factor", "tightening.thread_friction", "tightening.head_friction":
				delete(vr.vals, "tightening.condition")
			}
			vr.vals[path], vr.keyAt[path] = v, k.Line
			return nil
		})
		if err != nil {
			return err
		}
		vs, err := p.buildOne(vr)
		if err != nil {
			if e, ok := err.(*Error); ok {
				e.Msg = "in variant " + strconv.Quote(name) + ": " + e.Msg
			}
			return err
		}
		vs.Variant = name
		vs.Name = base.Name
		base.Variants = append(base.Variants, vs)
	}
	return nil
}

func allPaths() []string {
	var out []string
	for sec, keys := range sectionKeys {
		if sec == "" || sec == "layer" {
			continue
		}
		for _, k := range keys {
			out = append(out, sec+"."+k)
		}
	}
	return out
}
