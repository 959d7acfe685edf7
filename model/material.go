package model

import (
	"fmt"
	"sort"
	"strings"
)

const ksi = 6.894757 // MPa per ksi

// PropertyClass holds the minimum strengths of a bolt property class or grade.
// Stresses in MPa; a zero Endurance means the class has no tabulated value.
type PropertyClass struct {
	Name      string
	Standard  string
	Proof     float64 // proof strength Sp (stress under proof load)
	Yield     float64 // minimum yield strength (ReL or Rp0.2)
	Tensile   float64 // minimum tensile strength Sut (Rm)
	Endurance float64 // fully corrected endurance strength of rolled threads (Shigley Table 8-17), 0 if none
	// Size range in mm for which the row applies (inclusive); 0 means no limit.
	MinD, MaxD float64
	// EN 1993-1-8 Table 3.4 factor αv for threads in the shear plane (0 where the code gives none).
	AlphaV float64
	// Nominal ultimate strength fub of EN 1993-1-8 Table 3.1 (0 where the code gives none).
	NominalTensile float64
	Note           string
}

// Property classes. Sources:
//   - ISO 898-1 mechanical-property table (Sp, Rp0.2/ReL, Rm); Shigley Table 8-11 p.435.
//     Convention pinned here: M16 belongs to the 8.8 "d ≤ 16 mm" row (ISO 898-1).
//   - SAE J429 (Shigley Table 8-9 p.433), ksi.
//   - ASTM F3125 Grades A325 and A490 (Shigley Table 8-10), ksi.
//   - ISO 3506-1 stainless: Rp0.2 and Rm from the standard's table (secondary
//     reproductions); these classes have no proof load, so Sp = Rp0.2 (common practice).
//   - Endurance: Shigley Table 8-17 p.445 (fully corrected, rolled threads).
//   - αv: EN 1993-1-8:2005 Table 3.4 (0.6 for 4.6, 5.6, 8.8; 0.5 for 4.8, 5.8, 6.8, 10.9).
//   - fub: EN 1993-1-8:2005 Table 3.1 nominal values (4.6, 5.6, 8.8, 10.9 secondary
//     sources; 4.8, 5.8, 6.8 from memory), used by the en1993 shear rule.
var propertyClasses = []PropertyClass{
	{Name: "4.6", Standard: "ISO 898-1", Proof: 225, Yield: 240, Tensile: 400, NominalTensile: 400, AlphaV: 0.6},
	{Name: "4.8", Standard: "ISO 898-1", Proof: 310, Yield: 340, Tensile: 420, NominalTensile: 400, AlphaV: 0.5},
	{Name: "5.6", Standard: "ISO 898-1", Proof: 280, Yield: 300, Tensile: 500, NominalTensile: 500, AlphaV: 0.6},
	{Name: "5.8", Standard: "ISO 898-1", Proof: 380, Yield: 420, Tensile: 520, NominalTensile: 500, AlphaV: 0.5},
	{Name: "6.8", Standard: "ISO 898-1", Proof: 440, Yield: 480, Tensile: 600, NominalTensile: 600, AlphaV: 0.5},
	{Name: "8.8", Standard: "ISO 898-1", Proof: 580, Yield: 640, Tensile: 800, Endurance: 129, MaxD: 16, NominalTensile: 800, AlphaV: 0.6,
		Note: "Shigley Table 8-17 gives the endurance strength for M16–M36 only; used below M16 as a conservative value"},
	{Name: "8.8", Standard: "ISO 898-1", Proof: 600, Yield: 660, Tensile: 830, Endurance: 129, MinD: 16.0001, NominalTensile: 800, AlphaV: 0.6},
	{Name: "9.8", Standard: "ISO 898-1", Proof: 650, Yield: 720, Tensile: 900, Endurance: 140, MaxD: 16},
	{Name: "10.9", Standard: "ISO 898-1", Proof: 830, Yield: 940, Tensile: 1040, Endurance: 162, NominalTensile: 1000, AlphaV: 0.5},
	{Name: "12.9", Standard: "ISO 898-1", Proof: 970, Yield: 1100, Tensile: 1220, Endurance: 190},
	{Name: "SAE 1", Standard: "SAE J429", Proof: 33 * ksi, Yield: 36 * ksi, Tensile: 60 * ksi},
	{Name: "SAE 2", Standard: "SAE J429", Proof: 55 * ksi, Yield: 57 * ksi, Tensile: 74 * ksi, MaxD: 0.75 * inch},
	{Name: "SAE 2", Standard: "SAE J429", Proof: 33 * ksi, Yield: 36 * ksi, Tensile: 60 * ksi, MinD: 0.75*inch + 1e-6},
	{Name: "SAE 5", Standard: "SAE J429", Proof: 85 * ksi, Yield: 92 * ksi, Tensile: 120 * ksi, Endurance: 18.6 * ksi, MaxD: 1 * inch},
	{Name: "SAE 5", Standard: "SAE J429", Proof: 74 * ksi, Yield: 81 * ksi, Tensile: 105 * ksi, Endurance: 16.3 * ksi, MinD: 1*inch + 1e-6},
	{Name: "SAE 7", Standard: "SAE J429", Proof: 105 * ksi, Yield: 115 * ksi, Tensile: 133 * ksi, Endurance: 20.6 * ksi},
	{Name: "SAE 8", Standard: "SAE J429", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi, Endurance: 23.2 * ksi},
	{Name: "A325", Standard: "ASTM F3125", Proof: 85 * ksi, Yield: 92 * ksi, Tensile: 120 * ksi,
		Note: "no tabulated endurance strength; give fatigue.endurance"},
	{Name: "A490", Standard: "ASTM F3125", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi,
		Note: "no tabulated endurance strength; give fatigue.endurance"},
	{Name: "A2-70", Standard: "ISO 3506-1", Proof: 450, Yield: 450, Tensile: 700, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A4-70", Standard: "ISO 3506-1", Proof: 450, Yield: 450, Tensile: 700, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A2-80", Standard: "ISO 3506-1", Proof: 600, Yield: 600, Tensile: 800, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A4-80", Standard: "ISO 3506-1", Proof: 600, Yield: 600, Tensile: 800, Note: "proof taken as Rp0.2 (common practice)"},
}

// PropertyClasses returns every row of the property-class catalogue.
func PropertyClasses() []PropertyClass { return append([]PropertyClass(nil), propertyClasses...) }

// LookupClass returns the property class named name for a bolt of nominal
// diameter d (mm). Names are matched without regard to case and spaces, so
// "sae5", "SAE 5", "Grade 5" and "grade5" are the same class.
func LookupClass(name string, d float64) (PropertyClass, error) {
	key := normClass(name)
	found := false
	for _, c := range propertyClasses {
		if normClass(c.Name) != key {
			continue
		}
		found = true
		if (c.MinD == 0 || d >= c.MinD) && (c.MaxD == 0 || d <= c.MaxD) {
			return c, nil
		}
	}
	if found {
		return PropertyClass{}, fmt.Errorf("property class %q is not made in diameter %.4g mm", name, d)
	}
	return PropertyClass{}, fmt.Errorf("unknown property class %q: allowed are %s", name, strings.Join(classNames(), ", "))
}

func normClass(s string) string {
	s = strings.ToUpper(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	s = strings.TrimPrefix(s, "GRADE")
	s = strings.TrimPrefix(s, "SAE")
	s = strings.TrimPrefix(s, "F3125")
	if len(s) == 1 && s[0] >= '0' && s[0] <= '9' {
		return "SAE" + s
	}
	return s
}

func classNames() []string {
	var out []string
	seen := map[string]bool{}
	for _, c := range propertyClasses {
		if !seen[c.Name] {
			seen[c.Name] = true
			out = append(out, c.Name)
		}
	}
	return out
}

// Material is a member (clamped part) or plate material.
type Material struct {
	Name    string
	Modulus float64 // Young's modulus E, MPa
	Poisson float64
	// Wileman et al. (1991) exponential-fit constants A and B of
	// km/(E·d) = A·exp(B·d/l); zero if the paper gives none for this material.
	WilemanA, WilemanB float64
	Yield, Tensile     float64 // plate strengths, MPa (0 where not a plate grade)
	Source             string
}

// Wileman et al. general-expression constants (Shigley solutions-manual
// excerpt; reference data C2), used for materials without their own fit.
const wilemanGeneralA, wilemanGeneralB = 0.78952, 0.62914

// Member and plate materials. Moduli: Shigley Table A-5. Wileman constants:
// Shigley Table 8-8 (steel, aluminium, cast iron confirmed; copper from memory).
// Plate grades: EN 1993-1-1 Table 3.1 (t ≤ 40 mm) and ASTM A36/A572 minimums
// (from memory).
var materials = []Material{
	{Name: "steel", Modulus: 207000, Poisson: 0.292, WilemanA: 0.78715, WilemanB: 0.62873, Source: "Shigley Table A-5, Table 8-8"},
	{Name: "stainless", Modulus: 190000, Poisson: 0.305, Source: "Shigley Table A-5 (18-8)"},
	{Name: "aluminium", Modulus: 71700, Poisson: 0.333, WilemanA: 0.79670, WilemanB: 0.63816, Source: "Shigley Table A-5, Table 8-8"},
	{Name: "cast-iron", Modulus: 100000, Poisson: 0.211, WilemanA: 0.77871, WilemanB: 0.61616, Source: "Shigley Table A-5 (gray), Table 8-8"},
	{Name: "copper", Modulus: 119000, Poisson: 0.326, WilemanA: 0.79568, WilemanB: 0.63553, Source: "Shigley Table A-5; Table 8-8 constants from memory"},
	{Name: "titanium", Modulus: 114000, Poisson: 0.340, Source: "Shigley Table A-5"},
	{Name: "S235", Modulus: 210000, Poisson: 0.3, Yield: 235, Tensile: 360, Source: "EN 1993-1-1 Table 3.1, t ≤ 40 mm (from memory)"},
	{Name: "S275", Modulus: 210000, Poisson: 0.3, Yield: 275, Tensile: 430, Source: "EN 1993-1-1 Table 3.1, t ≤ 40 mm (from memory)"},
	{Name: "S355", Modulus: 210000, Poisson: 0.3, Yield: 355, Tensile: 490, Source: "EN 1993-1-1 Table 3.1, t ≤ 40 mm (from memory)"},
	{Name: "A36", Modulus: 200000, Poisson: 0.3, Yield: 36 * ksi, Tensile: 58 * ksi, Source: "ASTM A36 minimums (from memory); E per AISC"},
	{Name: "A572-50", Modulus: 200000, Poisson: 0.3, Yield: 50 * ksi, Tensile: 65 * ksi, Source: "ASTM A572 Gr. 50 minimums (from memory); E per AISC"},
}

// Materials returns the member/plate material catalogue.
func Materials() []Material { return append([]Material(nil), materials...) }

// LookupMaterial returns a catalogue material by name (case-insensitive;
// "aluminum" and "cast iron" are accepted spellings).
func LookupMaterial(name string) (Material, error) {
	key := strings.ToLower(strings.TrimSpace(name))
	key = strings.ReplaceAll(key, " ", "-")
	switch key {
	case "aluminum":
		key = "aluminium"
	case "castiron", "gray-cast-iron", "grey-cast-iron":
		key = "cast-iron"
	}
	for _, m := range materials {
		if strings.ToLower(m.Name) == key {
			return m, nil
		}
	}
	names := make([]string, len(materials))
	for i, m := range materials {
		names[i] = m.Name
	}
	sort.Strings(names)
	return Material{}, fmt.Errorf("unknown material %q: allowed are %s, or give the modulus explicitly", name, strings.Join(names, ", "))
}

// VDIEndurance returns the VDI 2230 Part 1 endurance limit (stress amplitude
// on As, MPa) of a thread rolled before heat treatment, for nominal diameter d
// in mm:
//
//	σASV = 0.85·(150/d + 45)
//
// Valid for ISO 898-1 classes 8.8–12.9, d ≤ 40 mm, N ≥ 2·10⁶ cycles
// (VDI 2230-1; from memory, validity d ≤ 40 mm confirmed in secondary sources).
// It is an amplitude used directly at the mean stress of a preloaded bolt,
// without a mean-stress correction.
func VDIEndurance(d float64) float64 { return 0.85 * (150/d + 45) }
