package scenario

import (
	"fmt"
	"sort"
	"strings"
)

// Condition is an assembly condition preset: the scatter of the nut factor
// (lognormal, by mean and c.o.v.) and the range of thread and under-head
// friction (uniform over the friction class of VDI 2230-1 Table A5).
// Presets are data: any value given explicitly in a scenario wins.
type Condition struct {
	Name          string
	Description   string
	NutFactor     float64 // mean K
	NutFactorCOV  float64
	FrictionLo    float64
	FrictionHi    float64
	Source        string
	FrictionClass string
}

// Conditions are the built-in assembly conditions.
//
// Nut-factor means: Shigley Table 8-15 (0.30 nonplated black finish, 0.20
// zinc-plated, 0.18 lubricated, 0.16 cadmium-plated, 0.12 anti-seize);
// bare steel as received 0.20 (Bickford & Nassar, Handbook of Bolts and
// Bolted Joints, ch. 2 Table 1, secondary source).
// Nut-factor c.o.v.: 0.14 dry and 0.084 lubricated are the preload c.o.v. of
// Shigley Tables 8-13/8-14 (Blake & Kurtz data, torque held fixed, so the
// scatter is that of K); the others are common practice.
// Friction ranges: VDI 2230-1 Table A5 classes (secondary reproductions).
var Conditions = []Condition{
	{Name: "dry", Description: "bright steel, as received, no added lubricant", NutFactor: 0.20, NutFactorCOV: 0.14,
		FrictionLo: 0.14, FrictionHi: 0.24, FrictionClass: "C",
		Source: "K: Bickford & Nassar ch. 2 Table 1; c.o.v.: Shigley Table 8-13; μ: VDI 2230-1 Table A5 class C"},
	{Name: "black-oxide", Description: "nonplated, black finish", NutFactor: 0.30, NutFactorCOV: 0.14,
		FrictionLo: 0.20, FrictionHi: 0.35, FrictionClass: "D",
		Source: "K: Shigley Table 8-15; c.o.v.: common practice; μ: VDI 2230-1 Table A5 class D"},
	{Name: "oiled", Description: "threads and bearing face oiled", NutFactor: 0.18, NutFactorCOV: 0.084,
		FrictionLo: 0.08, FrictionHi: 0.16, FrictionClass: "B",
		Source: "K: Shigley Table 8-15 (lubricated); c.o.v.: Shigley Table 8-14; μ: VDI 2230-1 Table A5 class B"},
	{Name: "mos2-paste", Description: "MoS₂ or anti-seize paste on threads and bearing face", NutFactor: 0.12, NutFactorCOV: 0.10,
		FrictionLo: 0.04, FrictionHi: 0.10, FrictionClass: "A",
		Source: "K: Shigley Table 8-15 (anti-seize); c.o.v.: common practice; μ: VDI 2230-1 Table A5 class A"},
	{Name: "zinc-plated", Description: "electro-zinc plated, dry", NutFactor: 0.20, NutFactorCOV: 0.14,
		FrictionLo: 0.14, FrictionHi: 0.24, FrictionClass: "C",
		Source: "K: Shigley Table 8-15 (Bickford gives 0.295: scatter between sources is large); c.o.v.: common practice; μ: VDI 2230-1 Table A5 class C"},
	{Name: "cadmium-plated", Description: "cadmium plated, dry", NutFactor: 0.16, NutFactorCOV: 0.10,
		FrictionLo: 0.08, FrictionHi: 0.16, FrictionClass: "B",
		Source: "K: Shigley Table 8-15; c.o.v.: common practice; μ: VDI 2230-1 Table A5 class B"},
}

// Tool is a tightening-method preset: the scatter of the controlled quantity
// (torque for torque-controlled tools, preload for the others), as a normal
// distribution with tolerance ±Tolerance (relative) at 3σ.
type Tool struct {
	Name        string
	Description string
	Controls    string // "torque" or "preload"
	Tolerance   float64
	Source      string
	// Tensioner: the preload is applied by stretching the bolt; the nut is
	// run down without load, so there is no thread torsion.
	Tensioner bool
	// AlphaALo, AlphaAHi: the tightening factor αA = FMmax/FMmin of the
	// method in VDI 2230-1 Table A8; AlphaASource its tag.
	AlphaALo, AlphaAHi float64
	AlphaASource       string
}

// AlphaA returns the tightening factor (1 + t)/(1 − t) implied by the tool's
// own scatter ±t at 3σ (for preload-controlled tools, the preload scatter;
// for torque tools only the torque's part of it).
func (t Tool) AlphaA() float64 { return (1 + t.Tolerance) / (1 - t.Tolerance) }

// Tools are the built-in tightening methods.
var Tools = []Tool{
	{Name: "torque-wrench", Description: "hand click-type torque wrench", Controls: "torque", Tolerance: 0.06,
		Source: "ISO 6789-1 permissible deviation ±6 % for type II click wrenches (from memory), taken at 3σ", AlphaALo: 1.4, AlphaAHi: 1.6, AlphaASource: "VDI 2230-1 Table A8: torque wrench, torque set on the joint 1.4–1.6 (secondary source); 1.6–2.0 with estimated friction"},
	{Name: "power-tool", Description: "calibrated nutrunner with torque control", Controls: "torque", Tolerance: 0.03,
		Source: "common practice for calibrated nutrunners, ±3 % at 3σ", AlphaALo: 1.4, AlphaAHi: 1.6, AlphaASource: "VDI 2230-1 Table A8: precision nut-runner 1.4–1.6 (secondary source)"},
	{Name: "impact-wrench", Description: "impact or impulse wrench", Controls: "torque", Tolerance: 0.30,
		Source: "VDI 2230-1 Table A8: preload scatter up to ±60 % for impact wrenches (secondary source); torque ±30 % at 3σ is common practice", AlphaALo: 2.5, AlphaAHi: 4, AlphaASource: "VDI 2230-1 Table A8: impact or impulse wrench 2.5–4 (from memory)"},
	{Name: "angle-controlled", Description: "torque–angle or yield-controlled tightening", Controls: "preload", Tolerance: 0.13,
		Source: "VDI 2230-1 Table A8: ±9 % to ±17 % (αA 1.2–1.4) for yield/angle control (from memory); ±13 % at 3σ", AlphaALo: 1.2, AlphaAHi: 1.4, AlphaASource: "VDI 2230-1 Table A8: yield- or angle-controlled 1.2–1.4 (from memory)"},
	{Name: "tension-controlled", Description: "hydraulic tensioner set by pressure", Controls: "preload", Tolerance: 0.16,
		Source: "VDI 2230-1 Table A8: ±9 % to ±23 % (αA 1.2–1.6) for hydraulic tensioning (secondary source); ±16 % at 3σ", Tensioner: true, AlphaALo: 1.2, AlphaAHi: 1.6, AlphaASource: "VDI 2230-1 Table A8: hydraulic tensioning 1.2–1.6 (secondary source)"},
	{Name: "ultrasonic", Description: "elongation measured by ultrasound", Controls: "preload", Tolerance: 0.06,
		Source: "VDI 2230-1 Table A8: ±2 % to ±10 % for ultrasonic elongation control (from memory); ±6 % at 3σ", AlphaALo: 1.05, AlphaAHi: 1.2, AlphaASource: "VDI 2230-1 Table A8: ultrasonic elongation control 1.05–1.2 (from memory)"},
}

func lookupCondition(name string) (Condition, error) {
	for _, c := range Conditions {
		if c.Name == name {
			return c, nil
		}
	}
	names := make([]string, len(Conditions))
	for i, c := range Conditions {
		names[i] = c.Name
	}
	return Condition{}, fmt.Errorf("unknown assembly condition %q (allowed: %s)", name, strings.Join(names, ", "))
}

func lookupTool(name string) (Tool, error) {
	for _, t := range Tools {
		if t.Name == name {
			return t, nil
		}
	}
	names := make([]string, len(Tools))
	for i, t := range Tools {
		names[i] = t.Name
	}
	sort.Strings(names)
	return Tool{}, fmt.Errorf("unknown tightening tool %q (allowed: %s)", name, strings.Join(names, ", "))
}
