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
	// Size range of the tabulated endurance strength (Shigley Table 8-17),
	// mm; 0 means the row's own range.
	EnduranceMinD, EnduranceMaxD float64
	// EN 1993-1-8 Table 3.4 factor αv for threads in the shear plane (0 where the code gives none).
	AlphaV float64
	// Nominal ultimate strength fub of EN 1993-1-8 Table 3.1 (0 where the code gives none).
	NominalTensile float64
	Note           string
}

// Property classes. Sources:
//   - ISO 898-1 mechanical-property table (Sp, Rp0.2/ReL, Rm); Shigley Table 8-11 p.435.
//     Convention pinned here: M16 belongs to the 8.8 "d ≤ 16 mm" row (ISO 898-1).
//     ISO 898-1 covers d ≤ 39 mm (ISO 898-1:2013 scope, from memory); 9.8 only d ≤ 16 mm.
//   - SAE J429 (Shigley Table 8-9 p.433), ksi, 1/4 – 1-1/2 in.
//   - ASTM F3125 Grades A325 and A490 (Shigley Table 8-10), ksi, 1/2 – 1-1/2 in.
//   - ASTM A193 Grade B7 (alloy-steel studs for flanges and pressure vessels):
//     Su/Sy 125/105 ksi up to 2-1/2 in, 115/95 ksi to 4 in, 100/75 ksi to 7 in
//     (ASTM A193 Table 2, from memory). No proof load: Sp = 0.85·Sy (Shigley
//     Eq. 8-32 note, confirmed).
//   - ASTM A354 Grade BD: Sp/Sy/Su 120/130/150 ksi up to 2-1/2 in, 105/115/140 ksi
//     to 4 in; Grade BC 105/109/125 and 95/99/115 ksi (ASTM A354, from memory).
//   - ISO 3506-1 stainless: Rp0.2 and Rm from the standard's table (secondary
//     reproductions); these classes have no proof load, so Sp = Rp0.2 (common practice);
//     d ≤ 39 mm (size range from memory).
//   - Endurance: Shigley Table 8-17 p.445 (fully corrected, rolled threads) with its size ranges.
//   - αv: EN 1993-1-8:2005 Table 3.4 (0.6 for 4.6, 5.6, 8.8; 0.5 for 4.8, 5.8, 6.8, 10.9).
//   - fub: EN 1993-1-8:2005 Table 3.1 nominal values (4.6, 5.6, 8.8, 10.9 secondary
//     sources; 4.8, 5.8, 6.8 from memory), used by the en1993 shear rule.
var propertyClasses = []PropertyClass{
	{Name: "4.6", Standard: "ISO 898-1", Proof: 225, Yield: 240, Tensile: 400, NominalTensile: 400, AlphaV: 0.6, MaxD: 39},
	{Name: "4.8", Standard: "ISO 898-1", Proof: 310, Yield: 340, Tensile: 420, NominalTensile: 400, AlphaV: 0.5, MaxD: 39},
	{Name: "5.6", Standard: "ISO 898-1", Proof: 280, Yield: 300, Tensile: 500, NominalTensile: 500, AlphaV: 0.6, MaxD: 39},
	{Name: "5.8", Standard: "ISO 898-1", Proof: 380, Yield: 420, Tensile: 520, NominalTensile: 500, AlphaV: 0.5, MaxD: 39},
	{Name: "6.8", Standard: "ISO 898-1", Proof: 440, Yield: 480, Tensile: 600, NominalTensile: 600, AlphaV: 0.5, MaxD: 39},
	{Name: "8.8", Standard: "ISO 898-1", Proof: 580, Yield: 640, Tensile: 800, Endurance: 129, MaxD: 16, NominalTensile: 800, AlphaV: 0.6,
		Note: "Shigley Table 8-17 gives the endurance strength for M16–M36 only; used below M16 as a conservative value"},
	{Name: "8.8", Standard: "ISO 898-1", Proof: 600, Yield: 660, Tensile: 830, Endurance: 129, MinD: 16.0001, MaxD: 39, EnduranceMaxD: 36, NominalTensile: 800, AlphaV: 0.6},
	{Name: "9.8", Standard: "ISO 898-1", Proof: 650, Yield: 720, Tensile: 900, Endurance: 140, MaxD: 16},
	{Name: "10.9", Standard: "ISO 898-1", Proof: 830, Yield: 940, Tensile: 1040, Endurance: 162, NominalTensile: 1000, AlphaV: 0.5, MaxD: 39, EnduranceMinD: 5, EnduranceMaxD: 36},
	{Name: "12.9", Standard: "ISO 898-1", Proof: 970, Yield: 1100, Tensile: 1220, Endurance: 190, MaxD: 39, EnduranceMaxD: 36},
	{Name: "SAE 1", Standard: "SAE J429", Proof: 33 * ksi, Yield: 36 * ksi, Tensile: 60 * ksi, MinD: 0.25 * inch, MaxD: 1.5 * inch},
	{Name: "SAE 2", Standard: "SAE J429", Proof: 55 * ksi, Yield: 57 * ksi, Tensile: 74 * ksi, MinD: 0.25 * inch, MaxD: 0.75 * inch},
	{Name: "SAE 2", Standard: "SAE J429", Proof: 33 * ksi, Yield: 36 * ksi, Tensile: 60 * ksi, MinD: 0.75*inch + 1e-6, MaxD: 1.5 * inch},
	{Name: "SAE 5", Standard: "SAE J429", Proof: 85 * ksi, Yield: 92 * ksi, Tensile: 120 * ksi, Endurance: 18.6 * ksi, MinD: 0.25 * inch, MaxD: 1 * inch},
	{Name: "SAE 5", Standard: "SAE J429", Proof: 74 * ksi, Yield: 81 * ksi, Tensile: 105 * ksi, Endurance: 16.3 * ksi, MinD: 1*inch + 1e-6, MaxD: 1.5 * inch},
	{Name: "SAE 5.2", Standard: "SAE J429", Proof: 85 * ksi, Yield: 92 * ksi, Tensile: 120 * ksi, MinD: 0.25 * inch, MaxD: 1 * inch},
	{Name: "SAE 7", Standard: "SAE J429", Proof: 105 * ksi, Yield: 115 * ksi, Tensile: 133 * ksi, Endurance: 20.6 * ksi, MinD: 0.25 * inch, MaxD: 1.5 * inch},
	{Name: "SAE 8", Standard: "SAE J429", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi, Endurance: 23.2 * ksi, MinD: 0.25 * inch, MaxD: 1.5 * inch},
	{Name: "SAE 8.2", Standard: "SAE J429", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi, MinD: 0.25 * inch, MaxD: 1 * inch},
	{Name: "A325", Standard: "ASTM F3125", Proof: 85 * ksi, Yield: 92 * ksi, Tensile: 120 * ksi, MinD: 0.5 * inch, MaxD: 1.5 * inch,
		Note: "no tabulated endurance strength; give fatigue.endurance"},
	{Name: "A490", Standard: "ASTM F3125", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi, MinD: 0.5 * inch, MaxD: 1.5 * inch,
		Note: "no tabulated endurance strength; give fatigue.endurance"},
	{Name: "B7", Standard: "ASTM A193", Proof: 0.85 * 105 * ksi, Yield: 105 * ksi, Tensile: 125 * ksi, MaxD: 2.5 * inch,
		Note: "no proof load: Sp = 0.85·Sy (Shigley Eq. 8-32 note); no tabulated endurance strength"},
	{Name: "B7", Standard: "ASTM A193", Proof: 0.85 * 95 * ksi, Yield: 95 * ksi, Tensile: 115 * ksi, MinD: 2.5*inch + 1e-6, MaxD: 4 * inch,
		Note: "no proof load: Sp = 0.85·Sy (Shigley Eq. 8-32 note); no tabulated endurance strength"},
	{Name: "B7", Standard: "ASTM A193", Proof: 0.85 * 75 * ksi, Yield: 75 * ksi, Tensile: 100 * ksi, MinD: 4*inch + 1e-6, MaxD: 7 * inch,
		Note: "no proof load: Sp = 0.85·Sy (Shigley Eq. 8-32 note); no tabulated endurance strength"},
	{Name: "BD", Standard: "ASTM A354", Proof: 120 * ksi, Yield: 130 * ksi, Tensile: 150 * ksi, MaxD: 2.5 * inch},
	{Name: "BD", Standard: "ASTM A354", Proof: 105 * ksi, Yield: 115 * ksi, Tensile: 140 * ksi, MinD: 2.5*inch + 1e-6, MaxD: 4 * inch},
	{Name: "BC", Standard: "ASTM A354", Proof: 105 * ksi, Yield: 109 * ksi, Tensile: 125 * ksi, MaxD: 2.5 * inch},
	{Name: "BC", Standard: "ASTM A354", Proof: 95 * ksi, Yield: 99 * ksi, Tensile: 115 * ksi, MinD: 2.5*inch + 1e-6, MaxD: 4 * inch},
	{Name: "A2-50", Standard: "ISO 3506-1", Proof: 210, Yield: 210, Tensile: 500, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A4-50", Standard: "ISO 3506-1", Proof: 210, Yield: 210, Tensile: 500, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A2-70", Standard: "ISO 3506-1", Proof: 450, Yield: 450, Tensile: 700, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A4-70", Standard: "ISO 3506-1", Proof: 450, Yield: 450, Tensile: 700, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A2-80", Standard: "ISO 3506-1", Proof: 600, Yield: 600, Tensile: 800, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A4-80", Standard: "ISO 3506-1", Proof: 600, Yield: 600, Tensile: 800, MaxD: 39, Note: "proof taken as Rp0.2 (common practice)"},
	{Name: "A2-100", Standard: "ISO 3506-1", Proof: 800, Yield: 800, Tensile: 1000, MaxD: 39, Note: "ISO 3506-1:2020 class; proof taken as Rp0.2 (common practice)"},
	{Name: "A4-100", Standard: "ISO 3506-1", Proof: 800, Yield: 800, Tensile: 1000, MaxD: 39, Note: "ISO 3506-1:2020 class; proof taken as Rp0.2 (common practice)"},
}

// EnduranceAt returns the class's tabulated endurance strength for nominal
// diameter d (mm), or an error naming the size range of the table when d
// lies outside it (or the class has none).
func (c PropertyClass) EnduranceAt(d float64) (float64, error) {
	if c.Endurance == 0 {
		return 0, fmt.Errorf("class %s (%s) has no tabulated endurance strength", c.Name, c.Standard)
	}
	lo, hi := c.EnduranceMinD, c.EnduranceMaxD
	if lo == 0 {
		lo = c.MinD
	}
	if hi == 0 {
		hi = c.MaxD
	}
	if (lo > 0 && d < lo-1e-9) || (hi > 0 && d > hi+1e-9) {
		return 0, fmt.Errorf("the endurance strength of class %s (Shigley Table 8-17) is tabulated for %s; d = %.4g mm", c.Name, sizeRange(lo, hi), d)
	}
	return c.Endurance, nil
}

// sizeRange writes a diameter range in mm.
func sizeRange(lo, hi float64) string {
	switch {
	case lo > 0 && hi > 0:
		return fmt.Sprintf("%.4g mm ≤ d ≤ %.4g mm", lo, hi)
	case hi > 0:
		return fmt.Sprintf("d ≤ %.4g mm", hi)
	case lo > 0:
		return fmt.Sprintf("d ≥ %.4g mm", lo)
	}
	return "every size"
}

// Series reports whether the class belongs to an inch standard (SAE, ASTM).
func (c PropertyClass) Inch() bool {
	return strings.HasPrefix(c.Standard, "SAE") || strings.HasPrefix(c.Standard, "ASTM")
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
		var ranges []string
		std := ""
		for _, c := range propertyClasses {
			if normClass(c.Name) == key {
				ranges = append(ranges, sizeRange(c.MinD, c.MaxD))
				std = c.Standard
			}
		}
		hint := ""
		if std == "ISO 898-1" && d > 39 {
			hint = "; for larger bolts use ASTM A193 B7, ASTM A354 BD or BC, or give the strengths"
		}
		return PropertyClass{}, fmt.Errorf("property class %q (%s) is specified for %s; d = %.4g mm%s", name, std, strings.Join(ranges, " and "), d, hint)
	}
	return PropertyClass{}, fmt.Errorf("unknown property class %q: allowed are %s", name, strings.Join(classNames(), ", "))
}

func normClass(s string) string {
	s = strings.ToUpper(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	for _, p := range []string{"ASTM", "F3125", "A193", "A354", "GRADE", "GR.", "SAE"} {
		s = strings.TrimPrefix(s, p)
	}
	if len(s) == 1 && s[0] >= '0' && s[0] <= '9' || s == "5.2" || s == "8.2" {
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
	// Plate strengths by thickness (plate grades only; empty otherwise).
	Plate []PlateStrength
	// Yield and Tensile are the plate grade's strengths in its thinnest range
	// (the catalogue listing shows them), and Tensile the minimum tensile
	// strength Rm of a member material (the shear strength of a tapped
	// thread is taken from it); 0 if none.
	Yield, Tensile float64
	// Expansion is the linear thermal expansion coefficient α, 1/K.
	Expansion float64
	// PressureLimit is the limiting surface pressure pG under a head, nut or
	// washer, MPa (0 where no published value is held).
	PressureLimit float64
	Source        string
}

// PlateStrength is the yield and tensile strength of a plate grade up to a
// thickness (MPa, mm).
type PlateStrength struct {
	MaxThickness, Yield, Tensile float64
}

// IsPlate reports whether the material is a plate grade with tabulated
// strengths.
func (m Material) IsPlate() bool { return len(m.Plate) > 0 }

// PlateStrengthAt returns fy and fu of a plate grade for thickness t (mm),
// or an error naming the thickness range of the table.
func (m Material) PlateStrengthAt(t float64) (fy, fu float64, err error) {
	for _, r := range m.Plate {
		if t <= r.MaxThickness+1e-9 {
			return r.Yield, r.Tensile, nil
		}
	}
	if !m.IsPlate() {
		return 0, 0, fmt.Errorf("%s is not a plate grade with tabulated strengths", m.Name)
	}
	return 0, 0, fmt.Errorf("the strengths of %s are tabulated for t ≤ %.4g mm; t = %.4g mm", m.Name, m.Plate[len(m.Plate)-1].MaxThickness, t)
}

// Wileman et al. general-expression constants (Shigley solutions-manual
// excerpt; reference data C2), used for materials without their own fit.
const wilemanGeneralA, wilemanGeneralB = 0.78952, 0.62914

// Member and plate materials. Sources:
//   - Moduli: Shigley Table A-5 (confirmed); structural steels E = 210 GPa
//     (EN 1993-1-1 §3.2.6, secondary source), AISC 29 000 ksi ≈ 200 GPa
//     (secondary source).
//   - Wileman constants: Shigley Table 8-8 (steel, aluminium, cast iron
//     confirmed; copper from memory).
//   - Plate strengths: EN 1993-1-1 Table 3.1 for S235/S275/S355, t ≤ 40 mm and
//     40 < t ≤ 80 mm (S235 235/360 and 215/360, S275 275/430 and 255/410,
//     S355 355/… and 335/470 MPa as reprinted in a Eurocode design aid,
//     secondary source). S355 fu for t ≤ 40 mm: 510 MPa (EN 1993-1-1:2005
//     text as cited in the issue this implements); the design aid citing the
//     corrected text (+AC:2009) gives 490 MPa — the two published values
//     conflict, 510 is used. ASTM A36 (Fy 36 ksi for t ≤ 8 in, Fu 58 ksi) and
//     A572 Gr. 50 (50/65 ksi, t ≤ 4 in) minimums from memory.
//   - Limiting surface pressure pG and Rm of the machine-building grades:
//     VDI 2230-1 (2003) Table A9 as reproduced in a fastener catalogue
//     (secondary source); the reproduction marks the values of C45, 34CrMo4,
//     the aluminium alloys and die-cast alloys as not yet checked against
//     recent research.
//   - Thermal expansion α: steels 12·10⁻⁶/K (EN 1993-1-1 §3.2.6, secondary
//     source); austenitic stainless 16·10⁻⁶/K (EN 1993-1-4, from memory);
//     aluminium 23.6 (alloy 6061), 23.4 (7075), 21.5 (cast 356.0), grey cast
//     iron 11.4, copper 17.0, titanium 8.6·10⁻⁶/K (Callister, Fundamentals of
//     Materials Science and Engineering, Table B.6, secondary source).
var materials = []Material{
	{Name: "steel", Modulus: 207000, Poisson: 0.292, WilemanA: 0.78715, WilemanB: 0.62873, Expansion: 12e-6,
		Source: "Shigley Table A-5, Table 8-8; α EN 1993-1-1 §3.2.6"},
	{Name: "stainless", Modulus: 190000, Poisson: 0.305, Expansion: 16e-6, Source: "Shigley Table A-5 (18-8); α EN 1993-1-4 (from memory)"},
	{Name: "aluminium", Modulus: 71700, Poisson: 0.333, WilemanA: 0.79670, WilemanB: 0.63816, Expansion: 23.6e-6,
		Source: "Shigley Table A-5, Table 8-8; α Callister Table B.6 (6061)"},
	{Name: "cast-iron", Modulus: 100000, Poisson: 0.211, WilemanA: 0.77871, WilemanB: 0.61616, Expansion: 11.4e-6,
		Source: "Shigley Table A-5 (gray), Table 8-8; α Callister Table B.6"},
	{Name: "copper", Modulus: 119000, Poisson: 0.326, WilemanA: 0.79568, WilemanB: 0.63553, Expansion: 17.0e-6,
		Source: "Shigley Table A-5; Table 8-8 constants from memory; α Callister Table B.6"},
	{Name: "titanium", Modulus: 114000, Poisson: 0.340, Expansion: 8.6e-6, Source: "Shigley Table A-5; α Callister Table B.6"},
	{Name: "S235", Modulus: 210000, Poisson: 0.3, Expansion: 12e-6, PressureLimit: 490,
		Yield: 235, Tensile: 360, Plate: []PlateStrength{{40, 235, 360}, {80, 215, 360}}, Source: "EN 1993-1-1 Table 3.1 (secondary source); pG VDI 2230-1 Table A9 (S235JR)"},
	{Name: "S275", Modulus: 210000, Poisson: 0.3, Expansion: 12e-6,
		Yield: 275, Tensile: 430, Plate: []PlateStrength{{40, 275, 430}, {80, 255, 410}}, Source: "EN 1993-1-1 Table 3.1 (secondary source)"},
	{Name: "S355", Modulus: 210000, Poisson: 0.3, Expansion: 12e-6, PressureLimit: 760,
		Yield: 355, Tensile: 510, Plate: []PlateStrength{{40, 355, 510}, {80, 335, 470}},
		Source: "EN 1993-1-1 Table 3.1 (fu 510 MPa for t ≤ 40 mm per the 2005 text; a reprint of the corrected text gives 490); pG VDI 2230-1 Table A9 (S355J0)"},
	{Name: "A36", Modulus: 200000, Poisson: 0.3, Expansion: 12e-6,
		Yield: 36 * ksi, Tensile: 58 * ksi, Plate: []PlateStrength{{8 * inch, 36 * ksi, 58 * ksi}}, Source: "ASTM A36 minimums (from memory); E per AISC"},
	{Name: "A572-50", Modulus: 200000, Poisson: 0.3, Expansion: 12e-6,
		Yield: 50 * ksi, Tensile: 65 * ksi, Plate: []PlateStrength{{4 * inch, 50 * ksi, 65 * ksi}}, Source: "ASTM A572 Gr. 50 minimums (from memory); E per AISC"},
	{Name: "C45", Modulus: 207000, Poisson: 0.292, WilemanA: 0.78715, WilemanB: 0.62873, Expansion: 12e-6, Tensile: 700, PressureLimit: 630,
		Source: "quenched and tempered; Rm, pG VDI 2230-1 Table A9 (not yet checked there); E Shigley Table A-5"},
	{Name: "34CrMo4", Modulus: 207000, Poisson: 0.292, WilemanA: 0.78715, WilemanB: 0.62873, Expansion: 12e-6, Tensile: 1000, PressureLimit: 870,
		Source: "quenched and tempered; Rm, pG VDI 2230-1 Table A9 (not yet checked there); E Shigley Table A-5"},
	{Name: "X5CrNi18-12", Modulus: 190000, Poisson: 0.305, Expansion: 16e-6, Tensile: 500, PressureLimit: 630,
		Source: "1.4303; Rm, pG VDI 2230-1 Table A9; E Shigley Table A-5 (18-8)"},
	{Name: "GJL-250", Modulus: 100000, Poisson: 0.211, WilemanA: 0.77871, WilemanB: 0.61616, Expansion: 11.4e-6, Tensile: 250, PressureLimit: 900,
		Source: "grey cast iron; Rm, pG VDI 2230-1 Table A9; E Shigley Table A-5 (gray); α Callister Table B.6"},
	{Name: "AW-6082-T6", Modulus: 71700, Poisson: 0.333, WilemanA: 0.79670, WilemanB: 0.63816, Expansion: 23.6e-6, Tensile: 290, PressureLimit: 260,
		Source: "AlMgSi1 F31; Rm, pG VDI 2230-1 Table A9 (not yet checked there); E Shigley Table A-5; α 6061 value, Callister Table B.6"},
	{Name: "AW-7075-T6", Modulus: 71700, Poisson: 0.333, WilemanA: 0.79670, WilemanB: 0.63816, Expansion: 23.4e-6, Tensile: 540, PressureLimit: 410,
		Source: "AlZnMgCu1.5; Rm, pG VDI 2230-1 Table A9 (not yet checked there); E Shigley Table A-5; α Callister Table B.6"},
	{Name: "GD-AlSi9Cu3", Modulus: 71700, Poisson: 0.333, WilemanA: 0.79670, WilemanB: 0.63816, Expansion: 21.5e-6, Tensile: 240, PressureLimit: 290,
		Source: "die-cast EN AC-46000; Rm, pG VDI 2230-1 Table A9 (not yet checked there); E Shigley Table A-5 (all aluminium alloys); α cast 356.0 value, Callister Table B.6"},
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
