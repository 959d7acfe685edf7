package scenario

import (
	"fmt"
	"strconv"
	"strings"

	"boltrisk/model"
	"boltrisk/model/units"
)

// field is one scalar input of the model that a scenario may set to a value
// or a distribution.
type field struct {
	path    string
	dim     units.Dim
	perBolt bool // assembly scatter: each bolt draws its own value
	ptr     func(*model.Inputs) *float64
	help    string
}

var fields = []field{
	{"bolt.proof_strength", units.Stress, true, func(in *model.Inputs) *float64 { return &in.Proof }, "proof strength Sp (default: property class)"},
	{"bolt.yield_strength", units.Stress, true, func(in *model.Inputs) *float64 { return &in.Yield }, "yield strength Sy (default: property class)"},
	{"bolt.tensile_strength", units.Stress, true, func(in *model.Inputs) *float64 { return &in.Tensile }, "tensile strength Sut (default: property class)"},
	{"bolt.modulus", units.Stress, false, func(in *model.Inputs) *float64 { return &in.BoltModulus }, "Young's modulus of the bolt (default 207 GPa steel, 190 GPa stainless)"},
	{"bolt.shank_in_grip", units.Length, false, func(in *model.Inputs) *float64 { return &in.ShankInGrip }, "unthreaded shank length inside the grip (default from length and thread_length)"},
	{"bolt.bearing_diameter", units.Length, false, func(in *model.Inputs) *float64 { return &in.BearingDia }, "outer diameter of the head/nut bearing face (default 1.5·d)"},
	{"bolt.hole_diameter", units.Length, false, func(in *model.Inputs) *float64 { return &in.HoleDia }, "clearance hole diameter (default normal clearance)"},
	{"members.stiffness", units.Stiffness, false, func(in *model.Inputs) *float64 { return &in.MemberStiffness }, "member stiffness km given directly (default computed)"},
	{"members.load_introduction", units.None, false, func(in *model.Inputs) *float64 { return &in.LoadIntroduction }, "VDI 2230 load-introduction factor n, 0 < n ≤ 1 (default 1)"},
	{"tightening.torque", units.Torque, true, func(in *model.Inputs) *float64 { return &in.Torque }, "tightening torque"},
	{"tightening.nut_factor", units.None, true, func(in *model.Inputs) *float64 { return &in.NutFactor }, "nut factor K in T = K·F·d"},
	{"tightening.thread_friction", units.None, true, func(in *model.Inputs) *float64 { return &in.ThreadFriction }, "thread friction μG"},
	{"tightening.head_friction", units.None, true, func(in *model.Inputs) *float64 { return &in.HeadFriction }, "under-head friction μK"},
	{"tightening.preload", units.Force, true, func(in *model.Inputs) *float64 { return &in.Preload }, "assembly preload (method: preload)"},
	{"tightening.embedding", units.Length, true, func(in *model.Inputs) *float64 { return &in.Embedding }, "total embedding (settlement) fZ (default 0)"},
	{"tightening.relaxation", units.Fraction, true, func(in *model.Inputs) *float64 { return &in.Relaxation }, "further preload loss as a fraction (default 0)"},
	{"tightening.torsion_factor", units.None, false, func(in *model.Inputs) *float64 { return &in.TorsionFactor }, "share of thread torsion left in service kτ (default 0.5, VDI 2230)"},
	{"loads.axial_max", units.Force, false, func(in *model.Inputs) *float64 { return &in.AxialMax }, "largest external axial load per bolt"},
	{"loads.axial_min", units.Force, false, func(in *model.Inputs) *float64 { return &in.AxialMin }, "smallest external axial load per bolt (default 0: repeated loading)"},
	{"loads.shear", units.Force, false, func(in *model.Inputs) *float64 { return &in.ShearLoad }, "shear force on the whole joint (default 0)"},
	{"plate.thickness", units.Length, false, func(in *model.Inputs) *float64 { return &in.PlateThickness }, "thickness in bearing (default thinnest layer)"},
	{"plate.width", units.Length, false, func(in *model.Inputs) *float64 { return &in.PlateWidth }, "plate width across the load (net-section check)"},
	{"plate.edge_distance", units.Length, false, func(in *model.Inputs) *float64 { return &in.EdgeDistance }, "hole centre to edge in the load direction e1"},
	{"plate.side_distance", units.Length, false, func(in *model.Inputs) *float64 { return &in.SideDistance }, "hole centre to edge across the load e2 (default e1)"},
	{"plate.yield_strength", units.Stress, false, func(in *model.Inputs) *float64 { return &in.PlateYield }, "plate yield strength (default from plate.material)"},
	{"plate.tensile_strength", units.Stress, false, func(in *model.Inputs) *float64 { return &in.PlateTensile }, "plate tensile strength (default from plate.material)"},
	{"plate.slip_factor", units.None, false, func(in *model.Inputs) *float64 { return &in.SlipFactor }, "slip factor μ of the faying surfaces (0 or absent: no slip check)"},
	{"fatigue.endurance", units.Stress, true, func(in *model.Inputs) *float64 { return &in.Endurance }, "endurance strength Se (default from the class or endurance_source)"},
}

func init() {
	for i := range model.MaxLayers {
		i := i
		p := "members.layers." + strconv.Itoa(i+1) + "."
		fields = append(fields,
			field{p + "thickness", units.Length, false, func(in *model.Inputs) *float64 { return &in.Layers[i].Thickness }, "layer thickness"},
			field{p + "modulus", units.Stress, false, func(in *model.Inputs) *float64 { return &in.Layers[i].Modulus }, "layer Young's modulus (default from material)"},
		)
	}
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
		if len(f.path) > len(name) && f.path[len(f.path)-len(name)-1:] == "."+name {
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

// FieldDim returns the dimension of an input path.
func FieldDim(path string) units.Dim {
	f, _ := lookupField(path)
	return f.dim
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

// FieldPerBolt reports whether each bolt draws its own value of the input.
func FieldPerBolt(path string) bool {
	f, _ := lookupField(path)
	return f.perBolt
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
	for _, path := range []string{"loads.axial_max", "loads.axial_min", "loads.shear"} {
		va, ua := a.Uncertain(path)
		vb, ub := b.Uncertain(path)
		fa, fb := *FieldPtr(ia, path), *FieldPtr(ib, path)
		same := ua == ub && (ua && va.Dist == vb.Dist || !ua && fa == fb)
		if !same {
			return fmt.Errorf("%q and %q are not the same joint under the same duty: %s differs (%s vs %s); a comparison holds the loads fixed — run them separately with 'simulate'",
				name(a), name(b), path, describe(a, path), describe(b, path))
		}
	}
	return nil
}

func describe(s *Scenario, path string) string {
	f := func(v float64) string { return units.SI.Format(v, FieldDim(path)) }
	if v, ok := s.Uncertain(path); ok {
		return v.Dist.Describe(f)
	}
	return f(*FieldPtr(s.Inputs(), path))
}

// FieldPtrFunc returns the binding of an input path to its field, or nil.
func FieldPtrFunc(path string) func(*model.Inputs) *float64 {
	f, ok := lookupField(path)
	if !ok {
		return nil
	}
	return f.ptr
}
