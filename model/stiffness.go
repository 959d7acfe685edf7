package model

import "math"

// BoltStiffness returns the axial stiffness (N/mm) of a bolt whose grip holds
// an unthreaded shank of length ld and a threaded length lt, springs in series
// (Shigley Eq. 8-17):
//
//	kb = Ad·At·E / (Ad·lt + At·ld)
//
// with Ad the major-diameter area and At the tensile-stress area.
func BoltStiffness(ad, at, e, ld, lt float64) float64 {
	return ad * at * e / (ad*lt + at*ld)
}

// FrustumStiffness returns the stiffness (N/mm) of one conical frustum of
// half-apex angle alpha (rad), thickness t, smaller outer diameter dw and hole
// (bolt) diameter d in a material of modulus e (Shigley Eq. 8-19):
//
//	k = π·E·d·tan α / ln{ [(2t·tan α + D − d)(D + d)] / [(2t·tan α + D + d)(D − d)] }
func FrustumStiffness(e, d, dw, t, alpha float64) float64 {
	ta := math.Tan(alpha)
	num := (2*t*ta + dw - d) * (dw + d)
	den := (2*t*ta + dw + d) * (dw - d)
	return math.Pi * e * d * ta / math.Log(num/den)
}

// WilemanStiffness returns the member stiffness (N/mm) of two members of one
// material by the exponential fit of Wileman, Choudury & Green (ASME J. Mech.
// Design, 1991; Shigley Eq. 8-23):
//
//	km = E·d·A·exp(B·d/l)
func WilemanStiffness(e, d, l, a, b float64) float64 {
	return e * d * a * math.Exp(b*d/l)
}

// Layer is one clamped member.
type Layer struct {
	Thickness float64 // mm
	Modulus   float64 // MPa
	WilemanA  float64 // Wileman fit constants of the layer's material (0 = none)
	WilemanB  float64
	// Expansion is the linear thermal expansion coefficient α, 1/K (used
	// only with a service temperature change).
	Expansion float64
	// PressureLimit is the limiting surface pressure pG of the layer's
	// material under a head, nut or washer, MPa (0: unknown, not checked).
	PressureLimit float64
}

// Washer is a plain washer under the head or the nut. A zero thickness
// means no washer.
type Washer struct {
	Thickness     float64 // mm
	OuterDia      float64 // mm: its bearing diameter on the clamped part
	InnerDia      float64 // mm (0: the hole diameter)
	Modulus       float64 // MPa
	Expansion     float64 // 1/K
	PressureLimit float64 // pG of the washer under the head or nut, MPa (0: not checked)
}

// Present reports whether the washer is fitted.
func (w *Washer) Present() bool { return w.Thickness > 0 }

// MaxLayers is the largest number of clamped layers a joint may have.
const MaxLayers = 8

// StiffnessMethod selects how member stiffness is computed.
type StiffnessMethod uint8

const (
	// Frustum is the pressure-cone method over the layers in series
	// (Shigley Eqs. 8-18, 8-19), half-apex angle 30°.
	Frustum StiffnessMethod = iota
	// Wileman is the exponential fit for members of one material (Shigley Eq. 8-23).
	Wileman
)

// String names the method as in scenario files.
func (m StiffnessMethod) String() string {
	if m == Wileman {
		return "wileman"
	}
	return "frustum"
}

// coneAngle is the frustum half-apex angle: 30° (Shigley §8-5; Osgood's range 25–33°).
const coneAngle = math.Pi / 6

// stack fills buf with the layers of the stiffness grip from the head
// bearing face down: the head washer, the clamped layers and the nut washer.
// For a tapped hole the last layer is the tapped part and counts with
// min(t2, d)/2 of its thickness, Shigley Table 8-7's effective grip
// l′ = h + t2/2 (t2 < d) or h + d/2 (t2 ≥ d).
func (in *Inputs) stack(buf *[MaxLayers + 2]Layer) []Layer {
	n := 0
	if w := &in.Washer; w.Present() {
		buf[n] = Layer{Thickness: w.Thickness, Modulus: w.Modulus}
		n++
	}
	for i := range in.NLayers {
		buf[n] = in.Layers[i]
		n++
	}
	if in.Tapped {
		buf[n-1].Thickness = math.Min(buf[n-1].Thickness, in.Thread.D) / 2
	} else if w := &in.NutWasher; w.Present() {
		buf[n] = Layer{Thickness: w.Thickness, Modulus: w.Modulus}
		n++
	}
	return buf[:n]
}

// memberStiffness computes km over the layers of the stiffness grip. For the
// frustum method two cones start at the bearing faces under head and nut
// (diameter dw; for a tapped hole the second at the end of the effective
// grip) and meet at its mid-plane; each layer contributes the parts of the
// cones it holds, all in series (Shigley §8-5).
func memberStiffness(in *Inputs, layers []Layer, grip float64) float64 {
	if in.StiffnessMethod == Wileman {
		// One material: validated by the loader.
		l := in.Layers[0]
		a, b := l.WilemanA, l.WilemanB
		if a == 0 {
			a, b = wilemanGeneralA, wilemanGeneralB
		}
		return WilemanStiffness(l.Modulus, in.Thread.D, grip, a, b)
	}
	half := grip / 2
	inv := 0.0
	z := 0.0 // depth of the layer's top face below the head bearing face
	for _, l := range layers {
		top, bot := z, z+l.Thickness
		// Head-side cone covers [0, half], widening downwards.
		if top < half {
			e := math.Min(bot, half)
			dw := in.BearingDia + 2*top*math.Tan(coneAngle)
			inv += 1 / FrustumStiffness(l.Modulus, in.Thread.D, dw, e-top, coneAngle)
		}
		// Nut-side cone covers [half, grip], widening upwards from the nut face.
		if bot > half {
			s := math.Max(top, half)
			dw := in.BearingDia + 2*(grip-bot)*math.Tan(coneAngle)
			inv += 1 / FrustumStiffness(l.Modulus, in.Thread.D, dw, bot-s, coneAngle)
		}
		z = bot
	}
	return 1 / inv
}

// Stiffness holds the stiffness results of a joint, and the quantities of
// the bolt modes that depend only on geometry (derived once per joint).
type Stiffness struct {
	Kb   float64 // bolt stiffness, N/mm
	Km   float64 // member stiffness, N/mm
	C    float64 // joint constant kb/(kb + km)
	Phi  float64 // load factor Φ = n·C, with n the load-introduction factor
	Grip float64 // stiffness grip l′ (Shigley Table 8-7), mm
	// Thermal is the preload change per kelvin of service temperature
	// change, N/K: (Σ αi·ti − αb·lk)·kb·km/(kb + km) over the clamp length
	// lk. Positive when the members expand more than the bolt.
	Thermal float64

	// Derived once per joint so that EvaluateBolt multiplies instead of divides.
	kz    float64 // kb·km/(kb + km): preload lost per unit of embedding
	sepF  float64 // 1/(1 − Φ)
	invAs float64 // 1/As
	// Surface pressure: the bearing face with the least pG·Ap governs for any
	// force; its 1/Ap and pG (0: no face with a known pG).
	pressInvArea, pressLimit float64
	// Thread stripping in a tapped hole: shear areas of the external and
	// internal thread over the engaged length, mm².
	shearExt, shearInt float64
	// The torque–preload terms (torqueTerms) and the torsion moduli of the
	// stress diameter d0: the thread lever, 1/(thread + head lever), and
	// 1/Wp for the fully plastic (π·d0³/12) and elastic (π·d0³/16) cases.
	// Thread, bearing face and hole feed the stiffness, so they are fixed
	// whenever the stiffness is.
	lead, threadLever, invLever float64
	invWpPlastic, invWpElastic  float64
}

// ComputeStiffness returns bolt and member stiffness and the joint constant
// (Shigley §8-7: C = kb/(kb + km)). The load factor Φ = n·C applies the VDI
// 2230 load-introduction factor n (1 when the load acts under head and nut).
func ComputeStiffness(in *Inputs) Stiffness {
	var grip, km float64
	if in.Tapped || in.Washer.Present() || in.NutWasher.Present() {
		grip, km = stackedGrip(in)
	} else {
		layers := in.Layers[:in.NLayers]
		for _, l := range layers {
			grip += l.Thickness
		}
		if in.MemberStiffness == 0 {
			km = memberStiffness(in, layers, grip)
		}
	}
	if in.MemberStiffness != 0 {
		km = in.MemberStiffness
	}
	kb := BoltStiffness(in.Thread.NominalArea, in.Thread.StressArea, in.BoltModulus, in.ShankInGrip, grip-in.ShankInGrip)
	c := kb / (kb + km)
	n := in.LoadIntroduction
	if n == 0 {
		n = 1
	}
	kz := kb * km / (kb + km)
	s := Stiffness{Kb: kb, Km: km, C: c, Phi: n * c, Grip: grip,
		kz: kz, sepF: 1 / (1 - n*c), invAs: 1 / in.Thread.StressArea}
	s.Thermal = in.thermalMismatch() * kz // a drawn ΔT multiplies it per sample
	lead, thread, head := in.torqueTerms()
	d0 := in.StressDiameter()
	s.lead, s.threadLever, s.invLever = lead, thread, 1/(thread+head)
	s.invWpPlastic, s.invWpElastic = 12/math.Pi/(d0*d0*d0), 16/math.Pi/(d0*d0*d0)
	if in.NLayers > 0 && (in.Layers[0].PressureLimit > 0 || in.Layers[in.NLayers-1].PressureLimit > 0 || in.Washer.PressureLimit > 0 || in.NutWasher.PressureLimit > 0) {
		s.pressInvArea, s.pressLimit = in.governingFace()
	}
	if in.Tapped {
		s.shearExt, s.shearInt = ThreadShearAreas(in.Thread, in.Engagement)
	}
	return s
}

// stackedGrip returns the stiffness grip and the member stiffness of a joint
// with washers or a tapped hole (the layers of the stack).
func stackedGrip(in *Inputs) (grip, km float64) {
	var buf [MaxLayers + 2]Layer
	layers := in.stack(&buf)
	for _, l := range layers {
		grip += l.Thickness
	}
	if in.MemberStiffness == 0 {
		km = memberStiffness(in, layers, grip)
	}
	return grip, km
}

// thermalMismatch returns Σ αi·ti − αb·lk over the clamped layers and
// washers (the tapped part of a cap-screw joint is not clamped), mm/K.
func (in *Inputs) thermalMismatch() float64 {
	members, lk := 0.0, 0.0
	for _, w := range [2]*Washer{&in.Washer, &in.NutWasher} {
		if w.Present() && (w == &in.Washer || !in.Tapped) {
			members += w.Expansion * w.Thickness
			lk += w.Thickness
		}
	}
	n := in.NLayers
	if in.Tapped {
		n--
	}
	for _, l := range in.Layers[:n] {
		members += l.Expansion * l.Thickness
		lk += l.Thickness
	}
	return members - in.BoltExpansion*lk
}

// annulus returns the area π/4·(D² − d²) of a bearing ring, mm².
func annulus(outer, inner float64) float64 { return math.Pi / 4 * (outer*outer - inner*inner) }

// governingFace returns 1/Ap and pG of the bearing face with the least
// pG·Ap: head (or head washer) on the first layer, head on the washer, and
// the same on the nut side of a through-bolt. Faces whose material has no
// limiting pressure are skipped; (0, 0) when none is left.
func (in *Inputs) governingFace() (invArea, limit float64) {
	best := math.Inf(1)
	face := func(outer, inner, pg float64) {
		if pg > 0 && outer > inner {
			a := annulus(outer, inner)
			if pg*a < best {
				best, invArea, limit = pg*a, 1/a, pg
			}
		}
	}
	side := func(w *Washer, l *Layer) {
		if w.Present() {
			inner := math.Max(in.HoleDia, w.InnerDia)
			face(in.BearingDia, inner, w.PressureLimit)
			face(w.OuterDia, inner, l.PressureLimit)
			return
		}
		face(in.BearingDia, in.HoleDia, l.PressureLimit)
	}
	if in.NLayers == 0 {
		return 0, 0
	}
	side(&in.Washer, &in.Layers[0])
	if !in.Tapped {
		side(&in.NutWasher, &in.Layers[in.NLayers-1])
	}
	return invArea, limit
}
