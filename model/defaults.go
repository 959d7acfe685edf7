package model

// Engineering defaults for values a scenario may leave out. Each is a
// published rule or stated as common practice or from memory.

// Default moduli of bolt steels, MPa (Shigley Table A-5).
const (
	SteelModulus     = 207000 // carbon and alloy steel
	StainlessModulus = 190000 // 18-8 stainless
)

// DefaultTorsionFactor is the share kτ of the assembly thread torsion left
// in service: 0.5, the value VDI 2230-1 recommends (from memory).
const DefaultTorsionFactor = 0.5

// DefaultBearingDiameter is the outer diameter of the head or nut bearing
// face: the washer face 1.5·d (Shigley §8-5).
func DefaultBearingDiameter(th Thread) float64 { return 1.5 * th.D }

// DefaultHoleDiameter is the normal clearance hole: EN 1090-2 (from memory)
// d + 1 mm up to M14, d + 2 mm for M16–M24, d + 3 mm from M27; for inch
// bolts AISC 360 Table J3.3 (from memory) d + 1/16 in up to 7/8 in, d + 1/8 in
// from 1 in.
func DefaultHoleDiameter(th Thread) float64 {
	d := th.D
	if th.Unified {
		if d < inch-1e-9 {
			return d + inch/16
		}
		return d + inch/8
	}
	switch {
	case d < 16:
		return d + 1
	case d <= 24:
		return d + 2
	}
	return d + 3
}

// DefaultThreadLength is the threaded length of a standard bolt of length l
// (Shigley Table 8-7): metric 2d + 6 (l ≤ 125), 2d + 12 (l ≤ 200), 2d + 25 mm;
// inch 2d + 1/4 in (l ≤ 6 in), 2d + 1/2 in.
func DefaultThreadLength(th Thread, l float64) float64 {
	d := th.D
	if th.Unified {
		if l <= 6*inch {
			return 2*d + inch/4
		}
		return 2*d + inch/2
	}
	switch {
	case l <= 125:
		return 2*d + 6
	case l <= 200:
		return 2*d + 12
	}
	return 2*d + 25
}
