package model

// Mode identifies one failure mode of a joint. Its key (see [Mode.Key]) is a
// stable identifier used in JSON output and plots.
type Mode int

// The failure modes, in report order. A mode fails when its margin
// (capacity − demand) is zero or negative.
const (
	AssemblyYield Mode = iota // von Mises stress in tightening (tension + thread torsion) reaches yield
	Proof                     // bolt force Fi + Φ·Pmax reaches the proof load Sp·As
	ServiceYield              // von Mises stress in service (tension + residual torsion) reaches yield
	Separation                // external load reaches the separation load Fi/(1 − Φ)
	Fatigue                   // alternating stress reaches the strength amplitude on the load line
	BoltShear                 // shear on the bolt cross-section reaches its shear strength
	BoltBearing               // bearing pressure on the bolt reaches its yield
	PlateBearing              // bearing pressure on the plate reaches its capacity
	NetSection                // stress on the plate net section reaches its capacity
	TearOut                   // shear-out of the plate between hole and edge
	Slip                      // shear load reaches the friction capacity of the clamp force
	NumModes                  // number of modes; not a mode
)

var modeKeys = [NumModes]string{
	"assembly_yield", "proof", "service_yield", "separation", "fatigue",
	"bolt_shear", "bolt_bearing", "plate_bearing", "net_section", "tear_out", "slip",
}

var modeTitles = [NumModes]string{
	"Yield in assembly", "Proof load", "Yield in service", "Separation", "Fatigue",
	"Bolt shear", "Bolt bearing", "Plate bearing", "Net section", "Tear-out", "Slip",
}

// Key returns the stable identifier of the mode, e.g. "assembly_yield".
func (m Mode) Key() string { return modeKeys[m] }

// Title returns a short human-readable name of the mode.
func (m Mode) Title() string { return modeTitles[m] }

// String returns the key.
func (m Mode) String() string { return m.Key() }

// IsBolt reports whether the mode is decided bolt by bolt (tension side);
// the others are decided once for the whole joint (shear side).
func (m Mode) IsBolt() bool { return m <= Fatigue }

// ModeSet is a set of modes, one bit per mode.
type ModeSet uint16

// AllModes holds every mode.
const AllModes ModeSet = 1<<NumModes - 1

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

// ParseMode returns the mode with the given key.
func ParseMode(key string) (Mode, bool) {
	for m, k := range modeKeys {
		if k == key {
			return Mode(m), true
		}
	}
	return 0, false
}

// ModeKeys returns all mode keys in report order.
func ModeKeys() []string { return append([]string(nil), modeKeys[:]...) }
