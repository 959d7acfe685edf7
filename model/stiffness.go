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
}

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

// memberStiffness computes km over the layers. For the frustum method two
// cones start at the bearing faces under head and nut (diameter dw) and meet at
// the mid-plane of the grip; each layer contributes the parts of the cones it
// holds, all in series (Shigley §8-5).
func memberStiffness(in *Inputs) float64 {
	layers := in.Layers[:in.NLayers]
	grip := in.Grip()
	if in.StiffnessMethod == Wileman {
		// One material: validated by the loader.
		l := layers[0]
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

// Stiffness holds the stiffness results of a joint.
type Stiffness struct {
	Kb  float64 // bolt stiffness, N/mm
	Km  float64 // member stiffness, N/mm
	C   float64 // joint constant kb/(kb + km)
	Phi float64 // load factor Φ = n·C, with n the load-introduction factor

	// Derived once per joint so that EvaluateBolt multiplies instead of divides.
	kz    float64 // kb·km/(kb + km): preload lost per unit of embedding
	sepF  float64 // 1/(1 − Φ)
	invAs float64 // 1/As
}

// ComputeStiffness returns bolt and member stiffness and the joint constant
// (Shigley §8-7: C = kb/(kb + km)). The load factor Φ = n·C applies the VDI
// 2230 load-introduction factor n (1 when the load acts under head and nut).
func ComputeStiffness(in *Inputs) Stiffness {
	kb := BoltStiffness(in.Thread.NominalArea, in.Thread.StressArea, in.BoltModulus, in.ShankInGrip, in.Grip()-in.ShankInGrip)
	km := in.MemberStiffness
	if km == 0 {
		km = memberStiffness(in)
	}
	c := kb / (kb + km)
	n := in.LoadIntroduction
	if n == 0 {
		n = 1
	}
	return Stiffness{Kb: kb, Km: km, C: c, Phi: n * c,
		kz: kb * km / (kb + km), sepF: 1 / (1 - n*c), invAs: 1 / in.Thread.StressArea}
}
