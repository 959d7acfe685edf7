package model

import "boltrisk/model/units"

// Mode identifies one failure mode of a joint. Its key (see [Mode.Key]) is a
// stable identifier used in JSON output and plots.
type Mode int

// The failure modes, in report order. A mode fails when its capacity does
// not exceed its demand ([Failed]).
const (
	AssemblyYield   Mode = iota // von Mises stress in tightening (tension + thread torsion) reaches yield
	Proof                       // bolt force reaches the proof load Sp·As
	ServiceYield                // von Mises stress in service (tension + residual torsion) reaches yield
	Separation                  // external load reaches the separation load Fi/(1 − Φ)
	ThreadStripping             // bolt force reaches the stripping force of the engaged threads (tapped hole or nut)
	HeadPressure                // pressure under head, nut or washer reaches the limiting surface pressure
	Fatigue                     // alternating stress reaches the strength amplitude on the load line
	FatigueLife                 // the finite fatigue life under the load spectrum reaches the design life
	BoltShear                   // shear on the bolt cross-section reaches its shear strength
	BoltBearing                 // bearing pressure on the bolt reaches its yield
	PlateBearing                // bearing pressure on the plate reaches its capacity
	NetSection                  // stress on the plate net section reaches its capacity
	TearOut                     // shear-out of the plate between hole and edge or the next hole
	BlockTearing                // a block of the plate tears out around the bolt group
	TensionShear                // interaction of external tension and shear on the bolt
	Slip                        // shear load reaches the friction capacity of the clamp force
	NumModes                    // number of modes; not a mode
)

// Scope says where a mode is decided.
type Scope uint8

const (
	// PerBolt modes are decided bolt by bolt (the tension side); the joint
	// fails such a mode when any of its bolts does.
	PerBolt Scope = iota
	// PerJoint modes are decided once for the whole joint (the shear side).
	PerJoint
)

// ModeInfo is everything known about a failure mode apart from its
// evaluation: the one table every report, picture and document reads.
type ModeInfo struct {
	Key     string    // stable identifier (JSON contract): never renamed
	Title   string    // short human-readable name
	Dim     units.Dim // dimension of demand and capacity
	Scope   Scope
	Formula string // when the mode fails, in words and symbols
	Source  string // published basis of the check
}

// modeTable holds one row per mode, in report order. The README's mode
// table is tested against it.
var modeTable = [NumModes]ModeInfo{
	AssemblyYield: {"assembly_yield", "Yield in assembly", units.Stress, PerBolt,
		"von Mises stress √(σ² + 3τ²) in tightening, σ = FM/As, τ = MG/(π·d0³/12), reaches Rp0.2", "VDI 2230-1 (FMzul at ν = 1)"},
	Proof: {"proof", "Proof load", units.Force, PerBolt,
		"bolt force Fb = Fi + Φ·Pmax (Pmax once separated) reaches the proof load Sp·As", "Shigley Eqs. 8-28, §8-7"},
	ServiceYield: {"service_yield", "Yield in service", units.Stress, PerBolt,
		"√(σ² + 3(kτ·τ)²) in service, σ = Fb/As, τ on the elastic π·d0³/16, reaches yield", "VDI 2230-1"},
	Separation: {"separation", "Separation", units.Force, PerBolt,
		"Pmax ≥ Fi/(1 − Φ)", "Shigley Eq. 8-30"},
	ThreadStripping: {"thread_stripping", "Thread stripping", units.Force, PerBolt,
		"max(FM, Fb) reaches the stripping force: min(0.6·Rm·ASs, τ·ASn) of bolt and tapped thread over the engagement, or the nut's proof load Sp,nut·As", "FED-STD-H28/2B shear areas; ISO 898-2"},
	HeadPressure: {"head_pressure", "Surface pressure", units.Stress, PerBolt,
		"max(FM, Fb)/Ap under head, nut or washer, Ap = π/4·(D² − dh²), reaches the limiting surface pressure pG", "VDI 2230-1 Table A9"},
	Fatigue: {"fatigue", "Fatigue", units.Stress, PerBolt,
		"strength amplitude on the preload load line (Goodman, Gerber, ASME-elliptic or plain amplitude) reaches σa of the bolt force over the cycle, Φ(Pmax − Pmin)/(2As) while closed", "Shigley Eqs. 8-38, 8-45 to 8-47"},
	FatigueLife: {"fatigue_life", "Fatigue within the design life", units.None, PerBolt,
		"life N = (Σ n_i)/(Σ n_i/N_i)·D_crit on the curve of fatigue.curve under the repeated spectrum reaches the design life", "Palmgren–Miner; Shigley Eqs. 6-13…6-16, VDI 2230-1 σASZ or EN 1993-1-9 detail 14"},
	BoltShear: {"bolt_shear", "Bolt shear", units.Force, PerJoint,
		"shear on the shank (πd²/4) or, with threads in the plane, the root area reaches the shear strength (long joints reduced)", "plate.resistance rule"},
	BoltBearing: {"bolt_bearing", "Bolt bearing", units.Force, PerJoint,
		"V/(n·d·t) reaches the bolt's yield (yield rule only)", "Shigley §8-12"},
	PlateBearing: {"plate_bearing", "Plate bearing", units.Force, PerJoint,
		"bearing on the plate reaches the group's capacity (end and inner bolts)", "plate.resistance rule"},
	NetSection: {"net_section", "Net section", units.Force, PerJoint,
		"V on the net section (w − n_across·d_net)·t reaches its capacity", "plate.resistance rule"},
	TearOut: {"tear_out", "Tear-out", units.Force, PerJoint,
		"shear-out between each hole and the edge or the next hole", "plate.resistance rule"},
	BlockTearing: {"block_tearing", "Block tearing", units.Force, PerJoint,
		"V reaches the least block-tearing resistance of the bolt group (tension area Ant, shear areas Anv, Agv)", "EN 1993-1-8 §3.10.2; AISC 360-16 J4.3"},
	TensionShear: {"tension_shear", "Tension with shear", units.None, PerJoint,
		"interaction of the external tension Ft and the shear per bolt reaches 1", "EN 1993-1-8 Table 3.4; AISC 360-16 J3.7"},
	Slip: {"slip", "Slip", units.Force, PerJoint,
		"V ≥ μ·m·Σ(Fi − (1 − Φ)·Pmax) over the bolts (clamp force after the axial load)", "EN 1993-1-8 §3.9 with the actual clamp force"},
}

// Info returns the table row of the mode.
func (m Mode) Info() ModeInfo { return modeTable[m] }

// Key returns the stable identifier of the mode, e.g. "assembly_yield".
func (m Mode) Key() string { return modeTable[m].Key }

// Title returns a short human-readable name of the mode.
func (m Mode) Title() string { return modeTable[m].Title }

// Dim returns the dimension of the mode's demand and capacity.
func (m Mode) Dim() units.Dim { return modeTable[m].Dim }

// String returns the key.
func (m Mode) String() string { return m.Key() }

// IsBolt reports whether the mode is decided bolt by bolt (tension side);
// the others are decided once for the whole joint (shear side).
func (m Mode) IsBolt() bool { return modeTable[m].Scope == PerBolt }

// Failed is the one failure predicate of the tool: a mode fails when its
// capacity does not exceed its demand (margin capacity − demand ≤ 0).
func Failed(capacity, demand float64) bool { return capacity <= demand }

// ModeSet is a set of modes, one bit per mode.
type ModeSet uint32

// AllModes holds every mode.
const AllModes ModeSet = 1<<NumModes - 1

// BoltModes holds the modes decided bolt by bolt.
var BoltModes = func() ModeSet {
	var s ModeSet
	for m := range NumModes {
		if m.IsBolt() {
			s |= 1 << m
		}
	}
	return s
}()

// Has reports whether m is in the set.
func (s ModeSet) Has(m Mode) bool { return s&(1<<m) != 0 }

// SetOf returns the set holding the given modes.
func SetOf(modes ...Mode) ModeSet {
	var s ModeSet
	for _, m := range modes {
		s |= 1 << m
	}
	return s
}

// Modes lists the members of the set in report order.
func (s ModeSet) Modes() []Mode {
	var out []Mode
	for m := range NumModes {
		if s.Has(m) {
			out = append(out, m)
		}
	}
	return out
}

// ParseMode returns the mode with the given key.
func ParseMode(key string) (Mode, bool) {
	for m := range NumModes {
		if modeTable[m].Key == key {
			return m, true
		}
	}
	return 0, false
}

// ModeKeys returns all mode keys in report order.
func ModeKeys() []string {
	out := make([]string, NumModes)
	for m := range NumModes {
		out[m] = modeTable[m].Key
	}
	return out
}
