package scenario

import (
	"fmt"
	"strconv"
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// field is one scalar input of the model that a scenario may set to a value
// or a distribution: the one registry that the loader, the runner (through
// montecarlo.Var's role), the reports and 'catalog inputs' read.
type field struct {
	path  string
	dim   units.Dim
	role  montecarlo.Role
	ptr   func(*model.Inputs) *float64
	label string // short name in reports
	help  string // one line for 'catalog inputs'
	// show reports whether the reports list the input for this joint; nil:
	// when it matters to the joint's modes at all (see shown).
	show func(in *model.Inputs) bool
}

// Roles of the registry's inputs.
const (
	perBolt   = montecarlo.PerBolt
	stiffness = montecarlo.FeedsStiffness
	load      = montecarlo.Load
	shearSide = montecarlo.ShearSide
)

// Display rules.
func always(*model.Inputs) bool        { return true }
func hasShear(in *model.Inputs) bool   { return in.ShearLoad > 0 }
func alternates(in *model.Inputs) bool { return in.AxialMax > in.AxialMin }
func byMethod(m model.TighteningMethod) func(*model.Inputs) bool {
	return func(in *model.Inputs) bool { return in.Method == m }
}
func byTorque(in *model.Inputs) bool { return in.Method != model.DirectPreload }
func nonZero(get func(*model.Inputs) *float64) func(*model.Inputs) bool {
	return func(in *model.Inputs) bool { return *get(in) != 0 }
}

// fields is the registry in report order: the bolt, the layers, then the
// rest of the joint.
var fields = func() []field {
	base := baseFields()
	i := 0
	for base[i].path != "members.stiffness" {
		i++
	}
	return append(append(base[:i:i], layerFields()...), append(base[i:], newFields()...)...)
}()

// Display rules of the newer inputs.
func tapped(in *model.Inputs) bool       { return in.Tapped }
func hasWasher(in *model.Inputs) bool    { return in.Washer.Present() }
func hasNutWasher(in *model.Inputs) bool { return in.NutWasher.Present() }
func heated(in *model.Inputs) bool       { return in.TemperatureChange != 0 }
func hasNut(in *model.Inputs) bool       { return in.NutProof > 0 }
func hasPattern(in *model.Inputs) bool   { return in.ShearLoad > 0 && in.Pitch > 0 }
func hasGauge(in *model.Inputs) bool     { return in.ShearLoad > 0 && in.Gauge > 0 }

// newFields are the inputs of washers, tapped holes, nuts, the service
// temperature and the bolt pattern of shear joints.
func newFields() []field {
	var out []field
	for _, w := range []struct {
		key   string
		label string
		get   func(in *model.Inputs) *model.Washer
		show  func(*model.Inputs) bool
	}{
		{"bolt.washer", "head washer", func(in *model.Inputs) *model.Washer { return &in.Washer }, hasWasher},
		{"bolt.nut_washer", "nut washer", func(in *model.Inputs) *model.Washer { return &in.NutWasher }, hasNutWasher},
	} {
		get := w.get
		out = append(out,
			field{w.key + ".thickness", units.Length, stiffness, func(in *model.Inputs) *float64 { return &get(in).Thickness },
				w.label + " thickness", "washer thickness (in the grip and the stiffness)", w.show},
			field{w.key + ".outer_diameter", units.Length, stiffness, func(in *model.Inputs) *float64 { return &get(in).OuterDia },
				w.label + " outer diameter", "washer outer diameter: the bearing diameter on the clamped part", w.show},
			field{w.key + ".inner_diameter", units.Length, stiffness, func(in *model.Inputs) *float64 { return &get(in).InnerDia },
				w.label + " inner diameter", "washer inner diameter (default: the hole diameter)", w.show},
			field{w.key + ".modulus", units.Stress, stiffness, func(in *model.Inputs) *float64 { return &get(in).Modulus },
				w.label + " modulus", "washer Young's modulus (default from material, else steel)", w.show},
			field{w.key + ".expansion", units.Expansion, stiffness, func(in *model.Inputs) *float64 { return &get(in).Expansion },
				w.label + " expansion", "washer thermal expansion coefficient (default from material)", func(in *model.Inputs) bool { return w.show(in) && heated(in) }},
			field{w.key + ".pressure_limit", units.Stress, stiffness, func(in *model.Inputs) *float64 { return &get(in).PressureLimit },
				w.label + " pG", "limiting surface pressure of the washer under the head or nut (default from material)", func(in *model.Inputs) bool { return w.show(in) && get(in).PressureLimit > 0 }},
		)
	}
	out = append(out,
		field{"bolt.expansion", units.Expansion, stiffness, func(in *model.Inputs) *float64 { return &in.BoltExpansion },
			"bolt expansion", "thermal expansion coefficient of the bolt (default 12 µm/m/K steel, 16 µm/m/K stainless)", heated},
		field{"bolt.nut.proof_strength", units.Stress, perBolt, func(in *model.Inputs) *float64 { return &in.NutProof },
			"nut proof strength", "proof-load stress of the nut (default from bolt.nut.class, ISO 898-2)", hasNut},
		field{"members.tapped.engagement", units.Length, stiffness, func(in *model.Inputs) *float64 { return &in.Engagement },
			"thread engagement", "length of thread engagement in the tapped part (the last layer)", tapped},
		field{"members.tapped.shear_strength", units.Stress, 0, func(in *model.Inputs) *float64 { return &in.TappedShear },
			"tapped thread shear strength", "shear strength of the tapped material (default 0.6·Rm of the last layer's material)", tapped},
		field{"service.temperature_change", units.TempDiff, 0, func(in *model.Inputs) *float64 { return &in.TemperatureChange },
			"temperature change", "service temperature minus assembly temperature of bolt and members (positive: heated; default 0)", heated},
		field{"plate.pitch", units.Length, shearSide, func(in *model.Inputs) *float64 { return &in.Pitch },
			"pitch p1", "spacing of the bolt rows in the load direction p1", hasPattern},
		field{"plate.gauge", units.Length, shearSide, func(in *model.Inputs) *float64 { return &in.Gauge },
			"gauge p2", "spacing of the bolt columns across the load p2", hasGauge},
	)
	return out
}

func baseFields() []field {
	ptr := func(f func(in *model.Inputs) *float64) func(*model.Inputs) *float64 { return f }
	relax := ptr(func(in *model.Inputs) *float64 { return &in.Relaxation })
	embed := ptr(func(in *model.Inputs) *float64 { return &in.Embedding })
	km := ptr(func(in *model.Inputs) *float64 { return &in.MemberStiffness })
	slip := ptr(func(in *model.Inputs) *float64 { return &in.SlipFactor })
	return []field{
		{"bolt.proof_strength", units.Stress, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Proof }), "proof strength", "proof strength Sp (default: property class)", always},
		{"bolt.yield_strength", units.Stress, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Yield }), "yield strength", "yield strength Sy (default: property class)", always},
		{"bolt.tensile_strength", units.Stress, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Tensile }), "tensile strength", "tensile strength Sut (default: property class)", always},
		{"bolt.modulus", units.Stress, stiffness, ptr(func(in *model.Inputs) *float64 { return &in.BoltModulus }), "bolt modulus", "Young's modulus of the bolt (default 207 GPa steel, 190 GPa stainless)", always},
		{"bolt.shank_in_grip", units.Length, stiffness, ptr(func(in *model.Inputs) *float64 { return &in.ShankInGrip }), "shank in grip", "unthreaded shank length inside the grip (default from length and thread_length)", always},
		{"bolt.bearing_diameter", units.Length, stiffness, ptr(func(in *model.Inputs) *float64 { return &in.BearingDia }), "bearing diameter", "outer diameter of the head/nut bearing face (default 1.5·d)", always},
		{"bolt.hole_diameter", units.Length, stiffness | shearSide, ptr(func(in *model.Inputs) *float64 { return &in.HoleDia }), "hole diameter", "clearance hole diameter (default normal clearance)", always},
		{"members.stiffness", units.Stiffness, stiffness, km, "member stiffness", "member stiffness km given directly (default computed)", nonZero(km)},
		{"members.load_introduction", units.None, stiffness, ptr(func(in *model.Inputs) *float64 { return &in.LoadIntroduction }), "load introduction n", "VDI 2230 load-introduction factor n, 0 < n ≤ 1 (default 1)",
			func(in *model.Inputs) bool { return in.LoadIntroduction > 0 && in.LoadIntroduction != 1 }},
		{"tightening.torque", units.Torque, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Torque }), "torque", "tightening torque", byTorque},
		{"tightening.nut_factor", units.None, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.NutFactor }), "nut factor", "nut factor K in T = K·F·d", byMethod(model.NutFactorMethod)},
		{"tightening.thread_friction", units.None, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.ThreadFriction }), "thread friction", "thread friction μG", byMethod(model.FrictionMethod)},
		{"tightening.head_friction", units.None, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.HeadFriction }), "head friction", "under-head friction μK", byMethod(model.FrictionMethod)},
		{"tightening.preload", units.Force, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Preload }), "preload", "assembly preload (method: preload)", byMethod(model.DirectPreload)},
		{"tightening.embedding", units.Length, perBolt, embed, "embedding", "total embedding (settlement) fZ (default 0)", nonZero(embed)},
		{"tightening.relaxation", units.Fraction, perBolt, relax, "relaxation", "further preload loss as a fraction (default 0)", nonZero(relax)},
		{"tightening.torsion_factor", units.None, 0, ptr(func(in *model.Inputs) *float64 { return &in.TorsionFactor }), "torsion factor kτ", "share of thread torsion left in service kτ (default 0.5, VDI 2230)", byTorque},
		{"loads.axial_max", units.Force, load, ptr(func(in *model.Inputs) *float64 { return &in.AxialMax }), "largest axial load per bolt", "largest external axial load per bolt", always},
		{"loads.axial_min", units.Force, load, ptr(func(in *model.Inputs) *float64 { return &in.AxialMin }), "least axial load per bolt", "smallest external axial load per bolt (default 0: repeated loading)", always},
		{"loads.shear", units.Force, load | shearSide, ptr(func(in *model.Inputs) *float64 { return &in.ShearLoad }), "shear load on the joint", "shear force on the whole joint (default 0)", hasShear},
		{"plate.thickness", units.Length, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.PlateThickness }), "plate thickness", "thickness in bearing (default thinnest layer)", hasShear},
		{"plate.width", units.Length, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.PlateWidth }), "plate width", "plate width across the load (net-section check)", hasShear},
		{"plate.edge_distance", units.Length, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.EdgeDistance }), "edge distance e1", "hole centre to edge in the load direction e1", hasShear},
		{"plate.side_distance", units.Length, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.SideDistance }), "side distance e2", "hole centre to edge across the load e2 (default e1)", hasShear},
		{"plate.yield_strength", units.Stress, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.PlateYield }), "plate yield strength", "plate yield strength (default from plate.material)", hasShear},
		{"plate.tensile_strength", units.Stress, shearSide, ptr(func(in *model.Inputs) *float64 { return &in.PlateTensile }), "plate tensile strength", "plate tensile strength (default from plate.material)", hasShear},
		{"plate.slip_factor", units.None, shearSide, slip, "slip factor", "slip factor μ of the faying surfaces (0 or absent: no slip check)",
			func(in *model.Inputs) bool { return in.ShearLoad > 0 && in.SlipFactor > 0 }},
		{"fatigue.endurance", units.Stress, perBolt, ptr(func(in *model.Inputs) *float64 { return &in.Endurance }), "endurance strength", "endurance strength Se (default from the class or endurance_source)", alternates},
	}
}

// layerFields are the thickness and modulus of every possible layer.
func layerFields() []field {
	var out []field
	for i := range model.MaxLayers {
		p := "members.layers." + strconv.Itoa(i+1) + "."
		inLayer := func(in *model.Inputs) bool { return i < in.NLayers }
		out = append(out,
			field{p + "thickness", units.Length, stiffness, func(in *model.Inputs) *float64 { return &in.Layers[i].Thickness },
				fmt.Sprintf("layer %d thickness", i+1), "layer thickness", inLayer},
			field{p + "modulus", units.Stress, stiffness, func(in *model.Inputs) *float64 { return &in.Layers[i].Modulus },
				fmt.Sprintf("layer %d modulus", i+1), "layer Young's modulus (default from material)", inLayer},
			field{p + "expansion", units.Expansion, stiffness, func(in *model.Inputs) *float64 { return &in.Layers[i].Expansion },
				fmt.Sprintf("layer %d expansion", i+1), "layer thermal expansion coefficient (default from material)",
				func(in *model.Inputs) bool { return inLayer(in) && heated(in) }},
			field{p + "pressure_limit", units.Stress, stiffness, func(in *model.Inputs) *float64 { return &in.Layers[i].PressureLimit },
				fmt.Sprintf("layer %d pG", i+1), "limiting surface pressure pG under head, nut or washer (default from material)",
				func(in *model.Inputs) bool { return inLayer(in) && in.Layers[i].PressureLimit > 0 }},
		)
	}
	return out
}

func lookupField(path string) (field, bool) {
	for _, f := range fields {
		if f.path == path {
			return f, true
		}
	}
	return field{}, false
}

// ResolvePath returns the full path of an input named by its full dotted path
// or by an unambiguous last part ("torque" → "tightening.torque").
func ResolvePath(name string) (string, error) {
	if _, ok := lookupField(name); ok {
		return name, nil
	}
	var hits []string
	for _, f := range fields {
		if strings.HasSuffix(f.path, "."+name) {
			hits = append(hits, f.path)
		}
	}
	switch len(hits) {
	case 1:
		return hits[0], nil
	case 0:
		hint := suggest(name, FieldPaths())
		if hint == "" {
			// Compare with the last part of each path, suggest the full path.
			best, bestD := "", 3
			for _, f := range fields {
				last := f.path[strings.LastIndexByte(f.path, '.')+1:]
				if d := editDistance(name, last); d < bestD {
					best, bestD = f.path, d
				}
			}
			if best != "" {
				hint = fmt.Sprintf(" (did you mean %q?)", best)
			}
		}
		return "", &Error{Field: name, Msg: "no such input" + hint}
	}
	return "", &Error{Field: name, Msg: "ambiguous: could be " + joinOr(hits)}
}

// FieldPaths lists the paths of every scalar input that may be uncertain.
func FieldPaths() []string {
	out := make([]string, 0, len(fields))
	for _, f := range fields {
		out = append(out, f.path)
	}
	return out
}

// FieldInfo describes one input of the registry.
type FieldInfo struct {
	Path  string
	Dim   units.Dim
	Role  montecarlo.Role
	Label string
	Help  string
}

// Fields describes every input of the registry, in report order.
func Fields() []FieldInfo {
	out := make([]FieldInfo, len(fields))
	for i, f := range fields {
		out[i] = FieldInfo{Path: f.path, Dim: f.dim, Role: f.role, Label: f.label, Help: f.help}
	}
	return out
}

// FieldDim returns the dimension of an input path.
func FieldDim(path string) units.Dim {
	f, _ := lookupField(path)
	return f.dim
}

// FieldLabel returns the report label of an input path ("nut factor"),
// or the path itself when there is no such input.
func FieldLabel(path string) string {
	if f, ok := lookupField(path); ok && f.label != "" {
		return f.label
	}
	return path
}

// FieldPtr returns the address of the input at path inside in, or nil if
// there is no such input.
func FieldPtr(in *model.Inputs, path string) *float64 {
	f, ok := lookupField(path)
	if !ok {
		return nil
	}
	return f.ptr(in)
}

// FieldPtrFunc returns the binding of an input path to its field, or nil.
func FieldPtrFunc(path string) func(*model.Inputs) *float64 {
	f, ok := lookupField(path)
	if !ok {
		return nil
	}
	return f.ptr
}

// Shown lists the inputs the reports show for this scenario, in registry
// order: every uncertain input, and each fixed one whose display rule holds.
func (s *Scenario) Shown() []FieldInfo {
	var out []FieldInfo
	in := s.Inputs()
	for _, f := range fields {
		_, unc := s.Uncertain(f.path)
		if unc || f.show(in) {
			out = append(out, FieldInfo{Path: f.path, Dim: f.dim, Role: f.role, Label: f.label, Help: f.help})
		}
	}
	return out
}

// SameJoint reports why two scenarios are not variants of one joint under
// one duty: a comparison of assembly choices holds the bolt count and the
// service loads fixed, and says which differs.
func SameJoint(a, b *Scenario) error {
	ia, ib := a.Inputs(), b.Inputs()
	name := func(s *Scenario) string {
		if s.Variant != "" {
			return s.Variant
		}
		if s.File != "" {
			return s.File
		}
		return s.Name
	}
	if ia.Bolts != ib.Bolts {
		return fmt.Errorf("%q and %q are not the same joint: bolt.count differs (%d vs %d)", name(a), name(b), ia.Bolts, ib.Bolts)
	}
	for _, f := range fields {
		if f.role&load == 0 {
			continue
		}
		va, ua := a.Uncertain(f.path)
		vb, ub := b.Uncertain(f.path)
		fa, fb := *f.ptr(ia), *f.ptr(ib)
		same := ua == ub && (ua && va.Dist == vb.Dist || !ua && fa == fb)
		if !same {
			return fmt.Errorf("%q and %q are not the same joint under the same duty: %s differs (%s vs %s); a comparison holds the loads fixed — run them separately with 'simulate'",
				name(a), name(b), f.path, a.Describe(f.path, a.Units), b.Describe(f.path, a.Units))
		}
	}
	return nil
}

// Describe writes the value of an input in the display units: its
// distribution if uncertain, else its value.
func (s *Scenario) Describe(path string, sys units.System) string {
	dim := FieldDim(path)
	f := func(v float64) string { return sys.Format(v, dim) }
	if v, ok := s.Uncertain(path); ok {
		return v.Dist.Describe(f)
	}
	return f(*FieldPtr(s.Inputs(), path))
}
