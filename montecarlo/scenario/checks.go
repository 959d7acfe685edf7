package scenario

import (
	"fmt"
	"strings"

	"boltrisk/model"
)

// Unchecked is a failure mode (by its key) or a topic the tool did not
// evaluate for this joint, and why.
type Unchecked struct {
	Key    string
	Reason string
}

// NotChecked lists, for the nominal joint, every mode of the mode table
// that is not evaluated and why, then the topics this tool does not model
// at all.
func (s *Scenario) NotChecked() []Unchecked {
	in := s.Inputs()
	var o model.Outcome
	model.Evaluate(in, &o)
	var out []Unchecked
	add := func(key, format string, args ...any) { out = append(out, Unchecked{key, fmt.Sprintf(format, args...)}) }
	shear := in.ShearLoad > 0
	for m := range model.NumModes {
		if o.Active[m] {
			continue
		}
		key := m.Key()
		switch {
		case m == model.FatigueLife:
			continue // listed with the service life (fatigue.curve) only
		case m == model.Separation:
			add(key, "no axial load (loads.axial_max is 0)")
		case m == model.Fatigue:
			add(key, "the axial load does not alternate (loads.axial_min equals loads.axial_max)")
		case m == model.ThreadStripping:
			add(key, "through-bolt without a nut class: give bolt.nut: {class: …} (ISO 898-2) to check the nut; a nut of the class matching the bolt is designed not to strip before the bolt breaks")
		case m == model.HeadPressure:
			var names []string
			for i, l := range in.Layers[:in.NLayers] {
				if (i == 0 || i == in.NLayers-1 && !in.Tapped) && l.PressureLimit == 0 {
					names = append(names, fmt.Sprintf("layer %d", i+1))
				}
			}
			add(key, "no limiting surface pressure pG is known for %s: give members.layers.N.pressure_limit, or a catalogue grade with pG (S235, S355, C45, 34CrMo4, GJL-250, AW-6082-T6, GD-AlSi9Cu3, …)", strings.Join(names, " and "))
		case !shear && !m.IsBolt():
			add(key, "no shear load (loads.shear is 0)")
		case m == model.BoltBearing:
			add(key, "checked by the yield rule only; resistance %s checks bearing on the plate", in.ShearRule)
		case m == model.TearOut && in.ShearRule == model.EN1993:
			add(key, "part of the EN 1993-1-8 bearing resistance (αd = e1/(3d0), p1/(3d0) − 1/4)")
		case m == model.TearOut:
			add(key, "no edge distance (plate.edge_distance)")
		case m == model.NetSection:
			add(key, "no plate width (plate.width)")
		case m == model.BlockTearing:
			add(key, "the bolt pattern is not known: needs plate.edge_distance, plate.pitch for several rows and plate.gauge for several columns")
		case m == model.TensionShear:
			add(key, "no axial load acts with the shear")
		case m == model.Slip:
			add(key, "no slip factor (plate.slip_factor): the joint is taken as a bearing joint")
		default:
			add(key, "not active for these inputs")
		}
	}
	add("prying", "prying (lever) forces of eccentrically loaded flanges, brackets and T-stubs are not modelled by this tool: the axial load is taken as acting on the bolt axis")
	add("eccentric_loading", "eccentric clamping and loading (bending of the bolt, VDI 2230-1's eccentric cases) are not modelled by this tool")
	if shear {
		add("group_eccentricity", "a moment on the bolt group (eccentric shear) is not modelled: the shear load is shared equally by the bolts")
	}
	if in.TemperatureChange != 0 {
		add("moduli_at_temperature", "the change of Young's moduli and strengths with temperature (VDI 2230-1 gives the correction) is not modelled: they are taken at assembly temperature")
	}
	add("member_fatigue", "fatigue of the clamped parts and plates (e.g. EN 1993-1-9) is not checked; fatigue is checked for the bolt only")
	return out
}

// ToolPreset returns the tightening-tool preset the scenario uses, if any.
func (s *Scenario) ToolPreset() (Tool, bool) {
	if s.ToolName == "" {
		return Tool{}, false
	}
	t, err := lookupTool(s.ToolName)
	return t, err == nil
}
