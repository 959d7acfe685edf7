// Package units parses and formats physical quantities written with their
// units ("120 N*m", "30 kN", "1.5 in", "162 MPa") in the model's internal
// system: N, mm, MPa, N·mm.
package units

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Dim is the physical dimension of a quantity.
type Dim uint8

const (
	None      Dim = iota // plain number
	Fraction             // plain number or percentage ("5%")
	Force                // N
	Length               // mm
	Stress               // MPa
	Torque               // N·mm
	Stiffness            // N/mm
	TempDiff             // temperature difference, K
	Expansion            // linear thermal expansion coefficient, 1/K
)

var dimNames = [...]string{"number", "fraction", "force", "length", "stress", "torque", "stiffness", "temperature difference", "thermal expansion coefficient"}

func (d Dim) String() string { return dimNames[d] }

// Key is the dimension's name in machine-readable documents: its name with
// underscores for spaces.
func (d Dim) Key() string { return strings.ReplaceAll(dimNames[d], " ", "_") }

// Conversion factors to the internal unit. Sources: 1 in = 25.4 mm (exact);
// 1 lbf = 4.4482216152605 N (exact by definition of the pound-force);
// 1 psi = 6894.757 Pa (ASME/NIST SP 811).
const (
	lbf = 4.4482216152605
	in  = 25.4
	psi = 0.006894757293168361 // MPa
)

var table = map[Dim]map[string]float64{
	Force: {"N": 1, "kN": 1e3, "MN": 1e6, "lbf": lbf, "kip": 1e3 * lbf, "kips": 1e3 * lbf},
	Length: {"mm": 1, "cm": 10, "m": 1e3, "um": 1e-3, "µm": 1e-3, "μm": 1e-3,
		"in": in, "inch": in, "ft": 12 * in},
	Stress: {"MPa": 1, "N/mm2": 1, "N/mm^2": 1, "N/mm²": 1, "GPa": 1e3, "kPa": 1e-3, "Pa": 1e-6,
		"psi": psi, "ksi": 1e3 * psi, "Mpsi": 1e6 * psi},
	Torque: {"N*mm": 1, "N*m": 1e3, "kN*m": 1e6, "lbf*in": lbf * in, "lbf*ft": lbf * 12 * in,
		"in*lbf": lbf * in, "ft*lbf": lbf * 12 * in},
	Stiffness: {"N/mm": 1, "kN/mm": 1e3, "MN/m": 1e3, "lbf/in": lbf / in, "Mlbf/in": 1e6 * lbf / in},
	// Differences: 1 °C of difference is 1 K, 1 °F is 5/9 K.
	TempDiff: {"K": 1, "°C": 1, "degC": 1, "C": 1, "°F": 5.0 / 9, "degF": 5.0 / 9, "F": 5.0 / 9},
	Expansion: {"1/K": 1, "/K": 1, "1/°C": 1, "/°C": 1, "um/m/K": 1e-6, "µm/m/K": 1e-6, "μm/m/K": 1e-6, "ppm/K": 1e-6,
		"1/°F": 9.0 / 5, "/°F": 9.0 / 5, "uin/in/°F": 1e-6 * 9 / 5, "µin/in/°F": 1e-6 * 9 / 5, "ppm/°F": 1e-6 * 9 / 5},
}

// Units returns the unit names accepted for a dimension, sorted.
func Units(d Dim) []string {
	var out []string
	for u := range table[d] {
		out = append(out, u)
	}
	sort.Strings(out)
	return out
}

// normUnit folds the spellings of a product of units ("N·m", "N.m", "Nm",
// "N m") to "N*m".
func normUnit(u string) string {
	u = strings.TrimSpace(u)
	if strings.ContainsAny(u, "/°") {
		// Quotients and temperature units keep their spelling ("µm/m/K", "1/°F").
		return strings.ReplaceAll(u, " ", "")
	}
	for _, s := range []string{"·", "⋅", "-", " "} {
		u = strings.ReplaceAll(u, s, "*")
	}
	switch u {
	case "Nm":
		return "N*m"
	case "Nmm":
		return "N*mm"
	case "kNm":
		return "kN*m"
	}
	if strings.Count(u, ".") == 1 && !strings.ContainsAny(u, "0123456789") {
		u = strings.ReplaceAll(u, ".", "*")
	}
	return u
}

// ParseNumber parses a finite decimal number; NaN and Inf are errors.
func ParseNumber(s string) (float64, error) {
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil {
		return 0, fmt.Errorf("%q is not a number", s)
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q is not a finite number", s)
	}
	return v, nil
}

// Parse reads a quantity of dimension d and returns it in internal units.
// Dimensional quantities need a unit; a bare number is an error. Fractions
// accept "5%" or 0.05.
func Parse(s string, d Dim) (float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, fmt.Errorf("empty value")
	}
	num, unit := split(s)
	switch d {
	case None:
		if unit != "" {
			return 0, fmt.Errorf("%q takes a plain number without unit", s)
		}
		return ParseNumber(num)
	case Fraction:
		v, err := ParseNumber(num)
		if err != nil {
			return 0, err
		}
		switch unit {
		case "":
			return v, nil
		case "%":
			return v / 100, nil
		}
		return 0, fmt.Errorf("%q takes a plain number or a percentage", s)
	}
	if unit == "" {
		return 0, fmt.Errorf("%q needs a unit of %s (%s)", s, d, strings.Join(Units(d), ", "))
	}
	f, ok := table[d][normUnit(unit)]
	if !ok {
		return 0, fmt.Errorf("unit %q is not a unit of %s (allowed: %s)", unit, d, strings.Join(Units(d), ", "))
	}
	v, err := ParseNumber(num)
	if err != nil {
		return 0, err
	}
	if math.IsInf(v*f, 0) {
		return 0, fmt.Errorf("%q is too large to represent", s)
	}
	return v * f, nil
}

// split separates the leading number from the unit.
func split(s string) (num, unit string) {
	i := 0
	for i < len(s) {
		c := s[i]
		if (c >= '0' && c <= '9') || c == '.' || c == '+' || c == '-' {
			i++
			continue
		}
		if (c == 'e' || c == 'E') && i > 0 && i+1 < len(s) && (s[i+1] == '-' || s[i+1] == '+' || (s[i+1] >= '0' && s[i+1] <= '9')) {
			i++
			continue
		}
		break
	}
	if !strings.ContainsAny(s[:i], "0123456789") {
		// Words such as NaN or Inf: keep the whole token as the number.
		f := strings.Fields(s)
		return f[0], strings.TrimSpace(strings.TrimPrefix(s, f[0]))
	}
	return s[:i], strings.TrimSpace(s[i:])
}

// System is a set of display units.
type System uint8

const (
	SI System = iota // N, mm, MPa, N·m
	US               // lbf, in, ksi, lbf·ft
)

// ParseSystem reads "si" or "us".
func ParseSystem(s string) (System, error) {
	switch strings.ToLower(s) {
	case "si", "":
		return SI, nil
	case "us":
		return US, nil
	}
	return SI, fmt.Errorf("unknown unit system %q (allowed: si, us)", s)
}

// Unit returns the display unit of dimension d in the system, and the factor
// that divides an internal value to express it in that unit.
func (sys System) Unit(d Dim) (name string, factor float64) {
	switch d {
	case Force:
		if sys == US {
			return "lbf", lbf
		}
		return "N", 1
	case Length:
		if sys == US {
			return "in", in
		}
		return "mm", 1
	case Stress:
		if sys == US {
			return "ksi", 1e3 * psi
		}
		return "MPa", 1
	case Torque:
		if sys == US {
			return "lbf*ft", lbf * 12 * in
		}
		return "N*m", 1e3
	case Stiffness:
		if sys == US {
			return "lbf/in", lbf / in
		}
		return "N/mm", 1
	case TempDiff:
		if sys == US {
			return "°F", 5.0 / 9
		}
		return "K", 1
	case Expansion:
		if sys == US {
			return "µin/in/°F", 1e-6 * 9 / 5
		}
		return "µm/m/K", 1e-6
	}
	return "", 1
}

// Convert expresses an internal value in the system's display unit.
func (sys System) Convert(v float64, d Dim) float64 {
	_, f := sys.Unit(d)
	return v / f
}

// Format writes v (internal units) with 4 significant digits and its unit;
// forces of 1000 N (1000 lbf) or more are written in kN (kip).
func (sys System) Format(v float64, d Dim) string {
	u, f := sys.Unit(d)
	if d == Force && math.Abs(v/f) >= 1000 {
		v /= 1000
		u = map[string]string{"N": "kN", "lbf": "kip"}[u]
	}
	if u == "" {
		return Sig(v, 4)
	}
	return Sig(v/f, 4) + " " + u
}

// Sig formats v with n significant digits in plain decimal notation
// (scientific notation only for very large or small magnitudes).
func Sig(v float64, n int) string {
	a := math.Abs(v)
	if a == 0 {
		return "0"
	}
	if a >= 1e9 || a < 1e-4 {
		return strconv.FormatFloat(v, 'g', n, 64)
	}
	digits := n - 1 - int(math.Floor(math.Log10(a)))
	if digits < 0 {
		digits = 0
	}
	return strconv.FormatFloat(v, 'f', digits, 64)
}
