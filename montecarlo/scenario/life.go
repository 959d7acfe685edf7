package scenario

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/fatigue"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// The service-life keys of the fatigue section (fatigue.curve and
// fatigue.design_life are contracts) and of the loads section.
var (
	lifeFatigueKeys = []string{"curve", "design_life", "cycle_rate", "critical_damage", "life_scatter", "rolling"}
	lifeLoadKeys    = []string{"spectrum", "cases"}
	spectrumKeys    = []string{"max", "min", "amplitude", "mean", "level", "cycles"}
)

// Sources of the service-life defaults, stated in reports.
const (
	CriticalDamageDefault = "D_crit = 1 (Palmgren–Miner rule: Miner 1945, J. Appl. Mech. 12:A159–A164; citation from memory)"
	lifeSDSource          = "sd(log10 N) = 0.2 (bolts ≈ 0.15–0.25; from memory), category read as mean − 2 sd (from memory)"
)

// CurveSource names the source and confirmation tag of each curve.
var CurveSource = map[string]string{
	"shigley":    "Budynas & Nisbett, Shigley's Mechanical Engineering Design 9th ed. (2011) Eqs. 6-13…6-16 (confirmed), f from the fit of Fig. 6-18 (secondary source), Goodman Eq. 6-46 (confirmed) on the preload load line",
	"vdi2230":    "VDI 2230 Part 1 (2015) thread fatigue strength σASZ = σAS·(ND/N)^(1/k), ND = 2·10⁶, k = 3 (SV) or 6 (SG) (not confirmed against the published text); d < 40 mm (confirmed)",
	"en1993-1-9": "EN 1993-1-9:2005 Table 8.1 detail 14, category 50 on Δσ = 2σa on As, m = 3 to 5·10⁶, m = 5 to 10⁸ for spectra, ks = (30/d)^0.25 for d > 30 mm (secondary source)",
}

// life reads the service-life keys: fatigue.curve, fatigue.design_life (in
// cycles, or hours with fatigue.cycle_rate), the spectrum and the critical
// damage sum. Without fatigue.curve the other keys are refused.
func (b *builder) life() error {
	p, r, s := b.p, b.r, b.s
	b.restoreCase()
	curveName, err := p.word(r, "fatigue.curve", "", montecarlo.LifeCurveKeys())
	if err != nil {
		return err
	}
	if curveName == "" {
		for _, k := range []string{"fatigue.design_life", "fatigue.cycle_rate", "fatigue.critical_damage", "fatigue.life_scatter", "fatigue.rolling", "loads.spectrum"} {
			if _, ok := r.vals[k]; ok {
				return p.errf(b.lineOf(k), k, "", "needs fatigue.curve (allowed: %s) to compute a finite life", strings.Join(montecarlo.LifeCurveKeys(), ", "))
			}
		}
		return nil
	}
	curve, _ := montecarlo.ParseLifeCurve(curveName)
	spec := &montecarlo.LifeSpec{Curve: curve}
	s.Sources["fatigue.curve"] = CurveSource[curveName]
	if err := b.designLife(spec); err != nil {
		return err
	}
	rolling, err := p.word(r, "fatigue.rolling", "sv", []string{"sv", "sg"})
	if err != nil {
		return err
	}
	if rolling == "sg" {
		if curve != montecarlo.CurveVDI2230 {
			return p.errf(b.lineOf("fatigue.rolling"), "fatigue.rolling", rolling, "applies to fatigue.curve: vdi2230 only")
		}
		spec.Rolling = fatigue.RolledAfterHeatTreatment
	}
	if v, ok, err := p.optNumber(r, "fatigue.life_scatter"); err != nil {
		return err
	} else if ok {
		if curve != montecarlo.CurveEN1993 {
			return p.errf(b.lineOf("fatigue.life_scatter"), "fatigue.life_scatter", units.Sig(v, 4), "applies to fatigue.curve: en1993-1-9 only (the other curves take their scatter from fatigue.endurance)")
		}
		if !(v > 0 && v <= 1) {
			return p.errf(b.lineOf("fatigue.life_scatter"), "fatigue.life_scatter", units.Sig(v, 4), "sd(log10 N) must lie within 0 … 1 (bolts ≈ 0.15–0.25)")
		}
		spec.LifeSD = v
		s.Sources["fatigue.life_scatter"] = "given; category read as mean − 2 sd (from memory)"
	} else if curve == montecarlo.CurveEN1993 {
		spec.LifeSD = montecarlo.DefaultLifeSD
		s.Sources["fatigue.life_scatter"] = lifeSDSource
	}
	if curve == montecarlo.CurveVDI2230 && b.given["fatigue.endurance"] {
		if _, unc := s.Uncertain("fatigue.endurance"); !unc {
			spec.StrengthRef = b.in.Endurance
		}
	}
	if curve == montecarlo.CurveVDI2230 && !b.given["fatigue.endurance"] && s.EnduranceNote != "" && strings.HasPrefix(s.EnduranceNote, "Shigley") {
		// The class's Table 8-17 value is not σASV: scale the VDI curve by
		// the endurance relative to its nominal value.
		spec.StrengthRef = b.in.Endurance
	}
	if err := b.spectrum(spec); err != nil {
		return err
	}
	if err := b.criticalDamage(spec); err != nil {
		return err
	}
	if curve == montecarlo.CurveShigley && b.in.Criterion.String() != "goodman" {
		s.Warnings = append(s.Warnings, model.Warning{Field: "fatigue.curve", Message: "the Shigley finite-life line is combined with the Goodman line whatever fatigue.criterion says (" + b.in.Criterion.String() + " is used by the endurance-limit mode only)"})
	}
	if _, err := spec.NominalLife(b.in); err != nil {
		return b.lifeError(err)
	}
	s.Life = spec
	s.Problem.Life = spec
	// The life's own draws, per bolt: the EN 1993-1-9 life scatter (a
	// standard normal) and an uncertain critical damage sum.
	if curve == montecarlo.CurveEN1993 {
		z, _ := montecarlo.NewNormal(0, 1)
		s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: "fatigue.life_scatter", Dist: z, Role: montecarlo.PerBolt, Aux: montecarlo.AuxLifeScatter})
	}
	if d := spec.Critical; d != nil && spec.Spectrum() && d.Kind != montecarlo.Fixed {
		s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: "fatigue.critical_damage", Dist: *d, Role: montecarlo.PerBolt, Aux: montecarlo.AuxCriticalDamage})
	}
	return nil
}

// lifeError turns a curve's range error into a scenario error naming the
// key and the allowed range.
func (b *builder) lifeError(err error) error {
	var re *fatigue.RangeError
	if !errors.As(err, &re) {
		return b.p.errf(b.lineOf("fatigue.curve"), "fatigue.curve", "", "%v", err)
	}
	field, value := "fatigue.curve", b.s.Sources["fatigue.curve"]
	if n, _, ok, _ := b.p.scalar(b.r, "fatigue.curve"); ok {
		value = n
	}
	switch {
	case re.Row > 0:
		field, value = fmt.Sprintf("loads.spectrum[%d].cycles", re.Row), units.Sig(re.Value, 4)
	case re.Param == "nominal life":
		field, value = "loads.axial_max", b.fmt(b.in.AxialMax, units.Force)
		if _, ok := b.r.vals["loads.spectrum"]; ok {
			field, value = "loads.spectrum", ""
		}
	}
	return b.p.errf(b.lineOf(field), field, value, "outside the validity range of the curve (%s): %s = %s, allowed %s", re.Curve, re.Param, units.Sig(re.Value, 4), re.Allowed)
}

// designLife reads fatigue.design_life: a number of cycles (2e6, "2e6
// cycles") or hours ("20000 h") with fatigue.cycle_rate (cycles per hour:
// "50", "50/h", "2/min", "1 Hz").
func (b *builder) designLife(spec *montecarlo.LifeSpec) error {
	p, r := b.p, b.r
	txt, line, ok, err := p.scalar(r, "fatigue.design_life")
	if err != nil {
		return err
	}
	if !ok {
		return p.errf(b.lineOf("fatigue.curve"), "fatigue.design_life", "", "required with fatigue.curve: the design life in cycles (e.g. 2e6) or in hours with fatigue.cycle_rate (e.g. 20000 h)")
	}
	num, unit := splitUnit(txt)
	v, perr := units.ParseNumber(num)
	if perr != nil {
		return p.errf(line, "fatigue.design_life", txt, "expected cycles (e.g. 2e6) or hours (e.g. 20000 h)")
	}
	if !(v > 0 && v < 1e15) {
		return p.errf(line, "fatigue.design_life", txt, "must lie within 0 … 1e15 (cycles > 0)")
	}
	switch unit {
	case "", "cycles", "cycle":
		spec.DesignLife = v
		if _, ok := r.vals["fatigue.cycle_rate"]; ok {
			return p.errf(b.lineOf("fatigue.cycle_rate"), "fatigue.cycle_rate", "", "only with a design life in hours (e.g. design_life: 20000 h)")
		}
	case "h", "hours", "hour":
		rtxt, rline, ok, err := p.scalar(r, "fatigue.cycle_rate")
		if err != nil {
			return err
		}
		if !ok {
			return p.errf(line, "fatigue.cycle_rate", "", "required with a design life in hours: the load cycles per hour (e.g. 50, 50/h, 2/min, 1 Hz)")
		}
		rate, err := cycleRate(rtxt)
		if err != nil || !(rate > 0 && rate < 1e12) {
			return p.errf(rline, "fatigue.cycle_rate", rtxt, "expected cycles per hour > 0, e.g. 50, 50/h, 2/min, 1/s or 1 Hz")
		}
		spec.Hours, spec.CycleRate, spec.DesignLife = v, rate, v*rate
	default:
		return p.errf(line, "fatigue.design_life", txt, "unknown unit %q: give cycles (e.g. 2e6) or hours (e.g. 20000 h)", unit)
	}
	if !(spec.DesignLife >= 1) {
		return p.errf(line, "fatigue.design_life", txt, "gives %s cycles; allowed at least 1 cycle", units.Sig(spec.DesignLife, 4))
	}
	return nil
}

// CaseHeld reports whether the load cases hold the input at path: with
// loads.cases, each case draws its own axial loads, shear and temperature
// change (a key a case omits takes the top-level value, drawn per case).
func (s *Scenario) CaseHeld(path string) bool {
	if len(s.Problem.Cases) == 0 {
		return false
	}
	switch path {
	case "loads.axial_max", "loads.axial_min", "loads.shear", "service.temperature_change":
		return true
	}
	return false
}

func splitUnit(s string) (num, unit string) {
	s = strings.TrimSpace(s)
	i := strings.IndexFunc(s, func(c rune) bool { return (c < '0' || c > '9') && !strings.ContainsRune("+-.eE", c) })
	if i < 0 {
		return s, ""
	}
	return strings.TrimSpace(s[:i]), strings.ToLower(strings.TrimSpace(s[i:]))
}

// cycleRate reads cycles per hour.
func cycleRate(s string) (float64, error) {
	num, unit := splitUnit(s)
	v, err := units.ParseNumber(num)
	if err != nil {
		return 0, err
	}
	f, ok := map[string]float64{"": 1, "/h": 1, "per hour": 1, "/min": 60, "/s": 3600, "hz": 3600}[unit]
	if !ok {
		return 0, fmt.Errorf("unknown unit %q", unit)
	}
	return v * f, nil
}

// spectrum reads loads.spectrum: rows of {max, min} (external axial loads
// per bolt), {amplitude, mean}, or {level} (a multiple of the load case's
// axial_max and axial_min), each with cycles per pass.
func (b *builder) spectrum(spec *montecarlo.LifeSpec) error {
	p, r := b.p, b.r
	n, ok := r.vals["loads.spectrum"]
	if !ok {
		if !(b.in.AxialMax > b.in.AxialMin) {
			return p.errf(b.lineOf("fatigue.curve"), "loads.axial_max", b.fmt(b.in.AxialMax, units.Force), "a finite life needs an alternating load: loads.axial_max above loads.axial_min, or a loads.spectrum")
		}
		return nil
	}
	if n.Kind != yaml.SequenceNode || len(n.Content) == 0 {
		return p.errf(n.Line, "loads.spectrum", "", "expected a list of rows, each {max: …, min: …, cycles: …}, {amplitude: …, mean: …, cycles: …} or {level: …, cycles: …}")
	}
	if len(n.Content) > 1000 {
		return p.errf(n.Line, "loads.spectrum", fmt.Sprint(len(n.Content)), "at most 1000 rows")
	}
	for i, row := range n.Content {
		where := fmt.Sprintf("loads.spectrum[%d]", i+1)
		if row.Kind != yaml.MappingNode {
			return p.errf(row.Line, where, "", "expected a mapping such as {max: 20 kN, min: 0 kN, cycles: 1e5}")
		}
		vals := map[string]*yaml.Node{}
		err := p.pairs(row, where, func(k, v *yaml.Node) error {
			if !slices.Contains(spectrumKeys, k.Value) {
				return p.errf(k.Line, where+"."+k.Value, "", "unknown key in a spectrum row%s; allowed: %s", suggest(k.Value, spectrumKeys), strings.Join(spectrumKeys, ", "))
			}
			if v.Kind != yaml.ScalarNode {
				return p.errf(v.Line, where+"."+k.Value, "", "expected a single value")
			}
			vals[k.Value] = v
			return nil
		})
		if err != nil {
			return err
		}
		cyc, ok := vals["cycles"]
		if !ok {
			return p.errf(row.Line, where+".cycles", "", "required: every spectrum row needs its cycles per pass of the spectrum (a number > 0)")
		}
		c, err := units.ParseNumber(cyc.Value)
		if err != nil || !(c > 0 && c < 1e15) {
			return p.errf(cyc.Line, where+".cycles", cyc.Value, "the cycles per pass must be a number > 0 (and below 1e15)")
		}
		force := func(k string) (float64, bool, error) {
			v, ok := vals[k]
			if !ok {
				return 0, false, nil
			}
			x, err := units.Parse(v.Value, units.Force)
			if err != nil {
				return 0, true, p.errf(v.Line, where+"."+k, v.Value, "%v", err)
			}
			return x, true, nil
		}
		blk := montecarlo.LifeBlock{Count: c}
		_, hasLevel := vals["level"]
		_, hasAmp := vals["amplitude"]
		_, hasMax := vals["max"]
		switch {
		case hasLevel && (hasAmp || hasMax || vals["min"] != nil || vals["mean"] != nil):
			return p.errf(row.Line, where+".level", "", "give level alone (a multiple of loads.axial_max and axial_min), or max/min, or amplitude/mean")
		case hasLevel:
			lv, err := units.Parse(vals["level"].Value, units.Fraction)
			if err != nil || !(lv >= 0 && lv <= 100) {
				return p.errf(vals["level"].Line, where+".level", vals["level"].Value, "a multiple of the case's loads within 0 … 100, e.g. 0.8 or 80%%")
			}
			if !(b.in.AxialMax > b.in.AxialMin) {
				return p.errf(vals["level"].Line, where+".level", vals["level"].Value, "scales loads.axial_max and axial_min, which do not alternate; give max and min")
			}
			blk.Level, blk.Max, blk.Min = true, lv, lv
		case hasAmp && hasMax:
			return p.errf(row.Line, where+".amplitude", "", "give either max/min or amplitude/mean, not both")
		case hasAmp:
			a, _, err := force("amplitude")
			if err != nil {
				return err
			}
			m, hasMean, err := force("mean")
			if err != nil {
				return err
			}
			if !hasMean {
				m = a // repeated loading 0 … 2a
			}
			if !(a >= 0) {
				return p.errf(vals["amplitude"].Line, where+".amplitude", vals["amplitude"].Value, "must be ≥ 0")
			}
			blk.Max, blk.Min = m+a, m-a
		case hasMax:
			mx, _, err := force("max")
			if err != nil {
				return err
			}
			mn, _, err := force("min")
			if err != nil {
				return err
			}
			if mn > mx {
				return p.errf(vals["min"].Line, where+".min", vals["min"].Value, "exceeds max %s (min must not exceed max)", b.fmt(mx, units.Force))
			}
			blk.Max, blk.Min = mx, mn
		default:
			return p.errf(row.Line, where, "", "needs the loads of the row: max (and min, default 0), amplitude (and mean), or level")
		}
		if math.Abs(blk.Max) > maxPreload*10 || math.Abs(blk.Min) > maxPreload*10 {
			return p.errf(row.Line, where+".max", b.fmt(blk.Max, units.Force), "must lie within %s … %s", b.fmt(-maxPreload*10, units.Force), b.fmt(maxPreload*10, units.Force))
		}
		spec.Blocks = append(spec.Blocks, blk)
	}
	return nil
}

// criticalDamage reads fatigue.critical_damage: a number, "wirsching"
// (log-normal, median 1, c.o.v. 0.3) or a distribution.
func (b *builder) criticalDamage(spec *montecarlo.LifeSpec) error {
	p, r, s := b.p, b.r, b.s
	n, ok := r.vals["fatigue.critical_damage"]
	if !ok {
		s.Sources["fatigue.critical_damage"] = CriticalDamageDefault
		return nil
	}
	if len(spec.Blocks) < 2 {
		return p.errf(n.Line, "fatigue.critical_damage", "", "applies to a variable-amplitude loads.spectrum of two or more rows (a constant amplitude uses the curve's life directly)")
	}
	var d montecarlo.Dist
	switch {
	case n.Kind == yaml.ScalarNode && strings.EqualFold(strings.TrimSpace(n.Value), "wirsching"):
		var err error
		if d, err = montecarlo.NewLogNormalMoments(math.Exp(0.5*math.Log1p(0.09)), math.Exp(0.5*math.Log1p(0.09))*0.3); err != nil {
			return p.errf(n.Line, "fatigue.critical_damage", n.Value, "%v", err)
		}
		s.Sources["fatigue.critical_damage"] = "log-normal, median 1, c.o.v. 0.3 (Wirsching 1984, J. Struct. Eng. ASCE 110(10):2340–2356; from memory)"
	case n.Kind == yaml.ScalarNode:
		v, err := units.ParseNumber(n.Value)
		if err != nil || !(v > 0 && v <= 10) {
			return p.errf(n.Line, "fatigue.critical_damage", n.Value, "a damage sum within 0 … 10 (1: Miner), wirsching, or a distribution {dist: lognormal, mean: 1, cov: 30%%}")
		}
		d = montecarlo.NewFixed(v)
		s.Sources["fatigue.critical_damage"] = "given"
	case n.Kind == yaml.MappingNode:
		var err error
		if d, _, err = p.dist(n, "fatigue.critical_damage", units.None); err != nil {
			return err
		}
		if !(d.Mean() > 0 && d.Quantile(1e-6) >= 0) {
			return p.errf(n.Line, "fatigue.critical_damage", "", "the critical damage sum must be positive: use a lognormal or weibull distribution (mean %s)", units.Sig(d.Mean(), 4))
		}
		s.Sources["fatigue.critical_damage"] = "given (distribution)"
	default:
		return p.errf(n.Line, "fatigue.critical_damage", "", "expected a number, wirsching, or a distribution")
	}
	spec.Critical = &d
	return nil
}

// lifeWordKeys are the JSON Schemas of the service-life keys.
func lifeWordKeys() map[string]keyKind {
	num := func(desc string) keyKind { return keyKind{"type": []string{"number", "string"}, "description": desc} }
	force := map[string]any{"$ref": "#/$defs/quantity_force"}
	row := map[string]any{"type": "object", "additionalProperties": false, "required": []string{"cycles"},
		"properties": map[string]any{
			"max": force, "min": force, "amplitude": force, "mean": force,
			"level":  map[string]any{"$ref": "#/$defs/fraction", "description": "multiple of loads.axial_max and axial_min"},
			"cycles": map[string]any{"type": []string{"number", "string"}, "description": "cycles of this row per pass (> 0)"},
		}}
	return map[string]keyKind{
		"fatigue.curve":       oneOf("finite-life S–N curve of 'boltrisk life' and the fatigue_life mode", montecarlo.LifeCurveKeys()...),
		"fatigue.design_life": num("design life: cycles (e.g. 2e6) or hours with cycle_rate (e.g. 20000 h)"),
		"fatigue.cycle_rate":  num("load cycles per hour for a design life in hours: 50, 50/h, 2/min, 1 Hz"),
		"fatigue.critical_damage": {"anyOf": []any{
			map[string]any{"type": []string{"number", "string"}},
			map[string]any{"$ref": "#/$defs/value_number"},
		}, "description": "critical Palmgren–Miner sum of a spectrum: a number (default 1), wirsching (log-normal, median 1, c.o.v. 0.3) or a distribution"},
		"fatigue.life_scatter": {"type": "number", "exclusiveMinimum": 0, "maximum": 1, "description": "sd(log10 N) of the EN 1993-1-9 median curve (default 0.2)"},
		"fatigue.rolling":      oneOf("VDI 2230 thread rolling: sv before heat treatment (default), sg after", "sv", "sg"),
		"loads.cases": {"type": "array", "minItems": 1, "maxItems": montecarlo.MaxCases, "description": "named load cases; every mode is checked in each, a mode fails when it fails in any",
			"items": map[string]any{"type": "object", "additionalProperties": false, "required": []string{"name"}, "properties": map[string]any{
				"name":               map[string]any{"type": "string", "pattern": "^[A-Za-z0-9_-]{1,40}$"},
				"axial_max":          map[string]any{"$ref": "#/$defs/value_force"},
				"axial_min":          map[string]any{"$ref": "#/$defs/value_force"},
				"shear":              map[string]any{"$ref": "#/$defs/value_force"},
				"temperature_change": map[string]any{"$ref": "#/$defs/value_temperature_difference"},
			}}},
		"loads.spectrum": {"type": "array", "minItems": 1, "items": row, "description": "block spectrum per pass: rows of max/min, amplitude/mean or level, each with cycles"},
	}
}

// caseKeys are the keys of one load case.
var caseKeys = []string{"name", "axial_max", "axial_min", "shear", "temperature_change"}

// caseFields are the registry paths behind each case slot.
var caseFields = [montecarlo.NumCaseSlots]string{"loads.axial_max", "loads.axial_min", "loads.shear", "service.temperature_change"}

// loadsWithCases reads loads.cases (if any) before the loads section, which
// is then checked against the most demanding values of the cases (the
// largest axial_max and shear, the least axial_min, the largest |ΔT|); the
// base inputs return to the first case's values in restoreCase.
func (b *builder) loadsWithCases() error {
	if _, ok := b.r.vals["loads.cases"]; !ok {
		return b.loads()
	}
	if err := b.cases(); err != nil {
		return err
	}
	cs := b.s.Problem.Cases
	in := b.in
	in.AxialMax, in.AxialMin, in.ShearLoad, in.TemperatureChange = cs[0].Values[0], cs[0].Values[1], cs[0].Values[2], cs[0].Values[3]
	for _, c := range cs[1:] {
		in.AxialMax = math.Max(in.AxialMax, c.Values[0])
		in.AxialMin = math.Min(in.AxialMin, c.Values[1])
		in.ShearLoad = math.Max(in.ShearLoad, c.Values[2])
		if math.Abs(c.Values[3]) > math.Abs(in.TemperatureChange) {
			in.TemperatureChange = c.Values[3]
		}
	}
	return b.loads()
}

// restoreCase sets the base inputs to the first load case (the nominal
// joint of the reports).
func (b *builder) restoreCase() {
	if cs := b.s.Problem.Cases; len(cs) > 0 {
		b.in.AxialMax, b.in.AxialMin, b.in.ShearLoad, b.in.TemperatureChange = cs[0].Values[0], cs[0].Values[1], cs[0].Values[2], cs[0].Values[3]
	}
}

// cases reads loads.cases: named load cases, each with its own axial_max,
// axial_min, shear and temperature_change (a value or a distribution);
// a key a case omits takes the top-level loads.* or
// service.temperature_change (drawn per case when uncertain).
func (b *builder) cases() error {
	p, r, s := b.p, b.r, b.s
	n := r.vals["loads.cases"]
	if n.Kind != yaml.SequenceNode || len(n.Content) == 0 {
		return p.errf(n.Line, "loads.cases", "", "expected a list of load cases, each {name: …, axial_max: …, axial_min: …, shear: …, temperature_change: …}")
	}
	if len(n.Content) > montecarlo.MaxCases {
		return p.errf(n.Line, "loads.cases", fmt.Sprint(len(n.Content)), "at most %d load cases", montecarlo.MaxCases)
	}
	// Top-level values are the cases' defaults; their distributions move
	// into the cases.
	var defaults [montecarlo.NumCaseSlots]*montecarlo.Var
	var base [montecarlo.NumCaseSlots]float64
	for i, path := range caseFields {
		base[i] = *mustField(path).ptr(b.in)
		if v, ok := s.Uncertain(path); ok {
			c := *v
			defaults[i] = &c
		}
	}
	vars := s.Problem.Vars[:0:0]
	for _, v := range s.Problem.Vars {
		if !slices.Contains(caseFields[:], v.Name) {
			vars = append(vars, v)
		}
	}
	s.Problem.Vars = vars
	first := map[string]int{}
	for ci, cn := range n.Content {
		where := fmt.Sprintf("loads.cases[%d]", ci+1)
		if cn.Kind != yaml.MappingNode {
			return p.errf(cn.Line, where, "", "expected a mapping such as {name: operation, axial_max: 16 kN}")
		}
		vals := map[string]*yaml.Node{}
		err := p.pairs(cn, where, func(k, v *yaml.Node) error {
			if !slices.Contains(caseKeys, k.Value) {
				return p.errf(k.Line, where+"."+k.Value, "", "unknown key in a load case%s; allowed: %s", suggest(k.Value, caseKeys), strings.Join(caseKeys, ", "))
			}
			vals[k.Value] = v
			return nil
		})
		if err != nil {
			return err
		}
		nameNode, ok := vals["name"]
		if !ok || nameNode.Kind != yaml.ScalarNode || strings.TrimSpace(nameNode.Value) == "" {
			return p.errf(cn.Line, where+".name", "", "required: every load case needs a name (e.g. operation, proof-test, transport)")
		}
		name := strings.TrimSpace(nameNode.Value)
		if !validCaseName(name) {
			return p.errf(nameNode.Line, where+".name", name, "a case name is a word of letters, digits, '-' or '_' (at most 40)")
		}
		if j, dup := first[name]; dup {
			return p.errf(nameNode.Line, where+".name", name, "given twice (first in loads.cases[%d]); each load case needs its own name", j)
		}
		first[name] = ci + 1
		c := montecarlo.Case{Name: name}
		for slot, key := range caseKeys[1:] {
			node, ok := vals[key]
			path := where + "." + key
			f := mustField(caseFields[slot])
			if !ok {
				c.Values[slot] = base[slot]
				if d := defaults[slot]; d != nil {
					s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: "loads.cases." + name + "." + key, Dist: d.Dist, Role: d.Role, Case: ci + 1, Slot: montecarlo.CaseSlot(slot)})
				}
				continue
			}
			tmp := rawDoc{vals: map[string]*yaml.Node{path: node}}
			cf := f
			cf.path = path
			v, d, _, err := p.value(tmp, cf)
			if err != nil {
				return err
			}
			c.Values[slot] = v
			if d != nil {
				s.Problem.Vars = append(s.Problem.Vars, montecarlo.Var{Name: "loads.cases." + name + "." + key, Dist: *d, Role: f.role &^ montecarlo.PerBolt, Case: ci + 1, Slot: montecarlo.CaseSlot(slot)})
			}
		}
		v := c.Values
		line := func(k string) int {
			if n, ok := vals[k]; ok {
				return n.Line
			}
			return cn.Line
		}
		switch {
		case v[1] > v[0]:
			return p.errf(line("axial_min"), where+".axial_min", b.fmt(v[1], units.Force), "exceeds the case's axial_max %s (axial_min must not exceed axial_max)", b.fmt(v[0], units.Force))
		case v[2] < 0:
			return p.errf(line("shear"), where+".shear", b.fmt(v[2], units.Force), "must be ≥ 0 (a magnitude)")
		case math.Abs(v[3]) > 500:
			return p.errf(line("temperature_change"), where+".temperature_change", b.fmt(v[3], units.TempDiff), "must lie within %s … %s", b.fmt(-500, units.TempDiff), b.fmt(500, units.TempDiff))
		}
		s.Problem.Cases = append(s.Problem.Cases, c)
	}
	return nil
}

func validCaseName(s string) bool {
	if len(s) > 40 {
		return false
	}
	for _, c := range s {
		if !(c == '-' || c == '_' || c >= '0' && c <= '9' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z') {
			return false
		}
	}
	return true
}
