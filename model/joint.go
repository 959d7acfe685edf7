package model

import (
	"math"
	"math/bits"
)

// TighteningMethod selects how the assembly preload is obtained.
type TighteningMethod uint8

const (
	// NutFactorMethod: FM = T/(K·d) (Shigley Eq. 8-27).
	NutFactorMethod TighteningMethod = iota
	// FrictionMethod: FM = T / (P/(2π) + 0.577·d2·μG + (DKm/2)·μK)
	// (VDI 2230-1 / ISO 16047 form).
	FrictionMethod
	// DirectPreload: preload given directly (angle-controlled, ultrasonic or
	// tension-controlled tightening). The nut is still turned, so the thread
	// torsion MG = FM·(P/(2π) + 0.577·d2·μG) acts, except with a tensioner
	// (Inputs.Tensioned).
	DirectPreload
)

// String names the method as in scenario files.
func (m TighteningMethod) String() string {
	return [...]string{"nut-factor", "friction", "preload"}[m]
}

// Criterion selects the fatigue failure line.
type Criterion uint8

const (
	Goodman      Criterion = iota // Sa/Se + Sm/Sut = 1 (Shigley Eq. 8-42)
	Gerber                        // Sa/Se + (Sm/Sut)² = 1 (Shigley Eq. 8-43)
	ASMEElliptic                  // (Sa/Se)² + (Sm/Sp)² = 1 (Shigley Eq. 8-44)
	Amplitude                     // Sa = Se: amplitude limit without mean-stress correction (VDI 2230 σASV)
)

// String names the criterion as in scenario files.
func (c Criterion) String() string {
	return [...]string{"goodman", "gerber", "asme-elliptic", "amplitude"}[c]
}

// ShearRule selects the resistance formulas of the shear-side modes.
type ShearRule uint8

const (
	// YieldRule: machine-design checks against yield (Shigley §8-12):
	// shear at 0.577·Sy, bearing at Sy, net section at plate Sy,
	// tear-out at 0.577·Sy of the plate.
	YieldRule ShearRule = iota
	// EN1993: characteristic resistances of EN 1993-1-8:2005 Table 3.4
	// with all partial factors γM = 1.
	EN1993
	// AISC360: nominal strengths Rn of AISC 360-16 J3 (φ = 1, Ω = 1).
	AISC360
)

// String names the rule as in scenario files.
func (r ShearRule) String() string {
	return [...]string{"yield", "en1993", "aisc360"}[r]
}

// Inputs is the flat set of values that define one joint. Every field is a
// plain value so that a copy is cheap and the Monte Carlo driver can write
// sampled values through pointers to the float64 fields.
//
// Units: N, mm, MPa, N·mm.
type Inputs struct {
	Thread Thread
	Bolts  int // number of bolts sharing the loads (≥ 1)

	Proof       float64 // proof strength Sp, MPa
	Yield       float64 // yield strength Sy, MPa
	Tensile     float64 // tensile strength Sut, MPa
	AlphaV      float64 // EN 1993-1-8 αv for threads in the shear plane (0: 0.5)
	FubNominal  float64 // EN 1993-1-8 Table 3.1 nominal fub, MPa (0: Tensile)
	BoltModulus float64 // MPa

	ShankInGrip float64 // unthreaded shank length inside the grip ld, mm
	BearingDia  float64 // outer diameter of the head/nut bearing face dW, mm
	HoleDia     float64 // clearance hole diameter, mm

	Layers           [MaxLayers]Layer
	NLayers          int
	StiffnessMethod  StiffnessMethod
	MemberStiffness  float64 // km given directly, N/mm (0: computed)
	LoadIntroduction float64 // VDI 2230 load-introduction factor n (0: 1)

	Method         TighteningMethod
	Tensioned      bool    // DirectPreload by a tensioner: the nut is not turned under load, no thread torsion
	Torque         float64 // tightening torque, N·mm
	NutFactor      float64 // K
	ThreadFriction float64 // μG (FrictionMethod, and the thread torsion of DirectPreload)
	HeadFriction   float64 // μK
	Preload        float64 // assembly preload for DirectPreload, N
	Embedding      float64 // total embedding (settlement) fZ, mm
	Relaxation     float64 // further preload loss as a fraction of the assembly preload
	TorsionFactor  float64 // share of assembly thread torsion left in service kτ (VDI 2230: 0.5)

	AxialMax float64 // largest external axial load per bolt, N
	AxialMin float64 // smallest external axial load per bolt, N

	ShearLoad           float64 // shear force on the whole joint, N
	ShearPlanes         float64 // shear planes (friction interfaces) per bolt
	ThreadsInShearPlane bool
	ShearRule           ShearRule
	PlateThickness      float64 // thickness in bearing, mm
	PlateWidth          float64 // plate width across the load, mm (0: no net-section check)
	EdgeDistance        float64 // hole centre to edge in the load direction e1, mm
	SideDistance        float64 // hole centre to edge across the load e2, mm (0: = EdgeDistance)
	BoltsAcross         float64 // bolts in the critical cross-section (0: all bolts)
	PlateYield          float64 // MPa
	PlateTensile        float64 // MPa
	SlipFactor          float64 // slip factor μ of the faying surfaces (0: no slip check)

	Criterion Criterion
	Endurance float64 // endurance strength Se (or σASV for Amplitude), MPa

	// Washers under the head and under the nut (zero thickness: none).
	Washer, NutWasher Washer

	// Tapped hole (cap screw): the last layer is the tapped part, Engagement
	// the length of thread engagement in it (mm), TappedShear the shear
	// strength of its material (MPa).
	Tapped      bool
	Engagement  float64
	TappedShear float64
	// NutProof is the proof-load stress of the nut's ISO 898-2 property
	// class, MPa (0: no nut check).
	NutProof float64

	// Service temperature change ΔT of bolt and members from assembly, K
	// (positive: heated), and the bolt's expansion coefficient αb, 1/K.
	TemperatureChange float64
	BoltExpansion     float64

	// Bolt group of a shear joint: rows in the load direction n1 (0: all
	// bolts in one row, BoltsAcross wide), pitch p1 between rows and gauge
	// p2 between columns, mm (0: not given: every bolt is taken as an end
	// and edge bolt).
	BoltsInLine float64
	Pitch       float64
	Gauge       float64
}

// Grip returns the clamp length lk (mm): the clamped layers and the
// washers. For a tapped hole the tapped part is not clamped: lk is the
// thickness h under the head. Shigley's stiffness grip l′ is
// Stiffness.Grip.
func (in *Inputs) Grip() float64 {
	n := in.NLayers
	if in.Tapped {
		n--
	}
	g := 0.0
	for _, l := range in.Layers[:n] {
		g += l.Thickness
	}
	if in.Washer.Present() {
		g += in.Washer.Thickness
	}
	if in.NutWasher.Present() && !in.Tapped {
		g += in.NutWasher.Thickness
	}
	return g
}

// Rows returns the rows of the bolt group in the load direction (n1) and
// the bolts in each row (n2).
func (in *Inputs) Rows() (rows, across float64) {
	n := float64(in.Bolts)
	across = in.BoltsAcross
	if across == 0 {
		across = n
	}
	rows = in.BoltsInLine
	if rows == 0 {
		rows = n / across
	}
	return rows, across
}

// BoltResult is the state of one bolt after tightening and under the
// service load.
type BoltResult struct {
	AssemblyPreload float64 // FM, N
	Preload         float64 // residual preload Fi after embedding and relaxation, N
	ThreadTorque    float64 // thread torque in tightening MG, N·mm
	BoltForce       float64 // largest bolt force, N: Fi + Φ·Pmax, or Pmax once separated
	Clamp           float64 // least clamp force Fi − (1 − Φ)·Pmax, N; 0 once separated
	// Demand, capacity and activity of the bolt modes (AssemblyYield …
	// Fatigue); the shear-side entries stay zero. Laid out as in Outcome so
	// that a one-bolt joint can be read from either.
	Demand   [NumModes]float64
	Capacity [NumModes]float64
	Active   [NumModes]bool
	Invalid  bool // an input lies outside the model's domain (e.g. a negative nut factor)
}

// Outcome is the state of the whole joint.
type Outcome struct {
	Stiffness Stiffness
	Bolt      BoltResult // the bolt that governs the most modes (for identical bolts, any)
	Demand    [NumModes]float64
	Capacity  [NumModes]float64
	Active    [NumModes]bool
	ClampSum  float64 // sum over bolts of the residual clamp force (≥ 0 each), N
	Invalid   bool
	shear     bool // shear-side modes were set by the last evaluation
}

// Margin returns capacity − demand of mode m; the mode fails when it is ≤ 0.
func (o *Outcome) Margin(m Mode) float64 { return o.Capacity[m] - o.Demand[m] }

// SafetyFactor returns capacity/demand of mode m (for fatigue, the factor nf
// along the load line).
func (o *Outcome) SafetyFactor(m Mode) float64 { return o.Capacity[m] / o.Demand[m] }

// Fails reports whether the active mode m fails ([Failed]).
func (o *Outcome) Fails(m Mode) bool { return o.Active[m] && Failed(o.Capacity[m], o.Demand[m]) }

// Failures returns the active modes of set that the joint fails.
func (o *Outcome) Failures(set ModeSet) ModeSet {
	return failures(set, &o.Active, &o.Capacity, &o.Demand)
}

// Failures returns the active modes of set that the bolt fails.
func (b *BoltResult) Failures(set ModeSet) ModeSet {
	return failures(set, &b.Active, &b.Capacity, &b.Demand)
}

func failures(set ModeSet, active *[NumModes]bool, capacity, demand *[NumModes]float64) ModeSet {
	// Called per bolt and sample by the estimators: visits only the set's
	// bits, and the index check lets the compiler drop the bounds checks.
	var f ModeSet
	for s := set; s != 0; s &= s - 1 {
		m := bits.TrailingZeros32(uint32(s))
		if m < int(NumModes) && active[m] && Failed(capacity[m], demand[m]) {
			f |= 1 << m
		}
	}
	return f
}

// threadShearRatio is the ultimate shear strength of bolt steel as a share
// of its tensile strength, 0.6 (common practice; EN 1993-1-8 Table 3.4
// uses αv = 0.6 for the shear of 4.6, 5.6 and 8.8 bolts).
const threadShearRatio = 0.6

const (
	twoPi   = 2 * math.Pi
	invSqr3 = 0.5773502691896258 // 1/√3: distortion-energy shear yield (Shigley Eq. 5-21); 1/(2·cos 30°) in the thread-torque term
)

// StressDiameter returns d0 = (d2 + d3)/2, the diameter of the stress area
// used for torsion in the thread (VDI 2230-1).
func (in *Inputs) StressDiameter() float64 { return (in.Thread.PitchDia + in.Thread.MinorDia) / 2 }

// torqueTerms returns the lead term P/(2π), the thread-friction lever
// 0.577·d2 and the head-friction lever DKm/2 = (dW + dh)/4 of the
// torque–preload relation (VDI 2230-1 R13; ISO 16047 definitions).
func (in *Inputs) torqueTerms() (lead, thread, head float64) {
	return in.Thread.Pitch * (1 / twoPi), invSqr3 * in.Thread.PitchDia, (in.BearingDia + in.HoleDia) * 0.25
}

// EquivalentFriction returns the single friction coefficient μ (thread and
// head alike) that a nut factor K implies through the ISO 16047 total-friction
// definition:
//
//	μtot = (K·d − P/(2π)) / (0.577·d2 + DKm/2)
func (in *Inputs) EquivalentFriction(k float64) float64 {
	lead, thread, head := in.torqueTerms()
	return (k*in.Thread.D - lead) / (thread + head)
}

// threadTorqueRatio returns MG/FM, the thread torque per unit assembly
// preload: P/(2π) + 0.577·d2·μG, with μG the thread friction, or for the
// nut-factor method the ISO 16047 total friction the nut factor implies
// (taken as 0 when negative); 0 for a tensioner (no torsion).
func (in *Inputs) threadTorqueRatio() float64 {
	lead, thread, _ := in.torqueTerms()
	mu := 0.0
	switch in.Method {
	case NutFactorMethod:
		mu = in.EquivalentFriction(in.NutFactor)
	case FrictionMethod:
		mu = in.ThreadFriction
	default:
		if in.Tensioned {
			return 0
		}
		mu = in.ThreadFriction
	}
	if mu < 0 {
		mu = 0
	}
	return lead + thread*mu
}

// NutFactorOf returns the nut factor implied by thread and head friction:
// K = (P/(2π) + 0.577·d2·μG + (DKm/2)·μK)/d.
func (in *Inputs) NutFactorOf(muG, muK float64) float64 {
	lead, thread, head := in.torqueTerms()
	return (lead + thread*muG + head*muK) / in.Thread.D
}

// TorqueFor returns the tightening torque (N·mm) that gives assembly preload
// fm with the joint's tightening method and friction values.
func (in *Inputs) TorqueFor(fm float64) float64 {
	switch in.Method {
	case NutFactorMethod:
		return in.NutFactor * fm * in.Thread.D
	case FrictionMethod:
		return fm * in.NutFactorOf(in.ThreadFriction, in.HeadFriction) * in.Thread.D
	}
	return 0
}

// EvaluateBolt computes the tightening and tension-side modes of one bolt.
// Modes outside set are left as they were (the Monte Carlo driver skips the
// modes it does not tally); the thread torque is computed only when a yield
// mode is in set. It does not allocate.
func EvaluateBolt(in *Inputs, s *Stiffness, set ModeSet, b *BoltResult) {
	th := &in.Thread
	torsion := set&(1<<AssemblyYield|1<<ServiceYield) != 0
	var fm, mg float64
	invalid := false
	switch in.Method {
	case NutFactorMethod:
		fm = in.Torque / (in.NutFactor * th.D)
		if torsion {
			// threadTorqueRatio with the levers of the stiffness.
			mu := max((in.NutFactor*th.D-s.lead)*s.invLever, 0)
			mg = fm * (s.lead + s.threadLever*mu)
		}
		invalid = !(in.NutFactor > 0)
	case FrictionMethod:
		lead, thread, head := in.torqueTerms()
		mt := lead + thread*in.ThreadFriction
		fm = in.Torque / (mt + head*in.HeadFriction)
		mg = fm * mt
		invalid = !(in.ThreadFriction >= 0 && in.HeadFriction >= 0)
	default:
		fm = in.Preload
		if torsion && !in.Tensioned {
			lead, thread, _ := in.torqueTerms()
			mg = fm * (lead + thread*math.Max(in.ThreadFriction, 0))
		}
		invalid = !(in.ThreadFriction >= 0)
	}
	invalid = invalid || !(fm >= 0 && fm < math.Inf(1)) || !(in.Endurance > 0 && in.Proof > 0 && in.Yield > 0 && in.Tensile > 0)

	// Preload loss by embedding, FZ = fZ·kb·km/(kb + km) (VDI 2230-1), and
	// relaxation; change with the service temperature, ΔF = Thermal·ΔT.
	fi := fm*(1-in.Relaxation) - in.Embedding*s.kz + in.TemperatureChange*s.Thermal
	if fi < 0 {
		fi = 0
	}
	phi := s.Phi
	pmax, pmin := in.AxialMax, in.AxialMin
	// Closed joint: Fb = Fi + Φ·P, clamp Fi − (1 − Φ)·P (Shigley Eqs. 8-24,
	// 8-25). Once P ≥ Fi/(1 − Φ) the members have separated: the bolt carries
	// the whole external load, Fb = P, and the clamp force is 0 (Shigley §8-7).
	fb, clamp := fi+phi*pmax, fi-(1-phi)*pmax
	if clamp < 0 {
		fb, clamp = pmax, 0
	}

	b.AssemblyPreload, b.Preload, b.ThreadTorque, b.BoltForce = fm, fi, mg, fb
	b.Clamp = clamp
	b.Invalid = invalid
	b.Active[AssemblyYield] = in.Method != DirectPreload || in.Preload > 0
	b.Active[Proof] = true
	b.Active[ServiceYield] = true
	b.Active[Separation] = pmax > 0
	b.Active[Fatigue] = pmax > pmin
	if torsion {
		// Assembly: σred = √(σ² + 3τ²) against Rp0.2, σ = FM/As, τ = MG/Wp with the
		// fully plastic Wp = π·d0³/12 — the basis of VDI 2230-1's permissible
		// assembly preload FMzul (its factor 3/2) at utilisation ν = 1.
		sig, tau := fm*s.invAs, mg*s.invWpPlastic
		b.Demand[AssemblyYield] = math.Sqrt(sig*sig + 3*tau*tau)
		b.Capacity[AssemblyYield] = in.Yield
		// Service: tension Fb/As with residual torsion kτ·MG/Wp, Wp = π·d0³/16
		// elastic (VDI 2230-1 working-stress check).
		sig = fb * s.invAs
		tau = in.TorsionFactor * mg * s.invWpElastic
		b.Demand[ServiceYield] = math.Sqrt(sig*sig + 3*tau*tau)
		b.Capacity[ServiceYield] = in.Yield
	}

	// Proof: Fb = Fi + Φ·Pmax against Sp·As (Shigley Eq. 8-28).
	b.Demand[Proof] = fb
	b.Capacity[Proof] = in.Proof * th.StressArea

	// Separation: P ≥ Fi/(1 − Φ) (Shigley Eq. 8-30).
	b.Demand[Separation] = pmax
	b.Capacity[Separation] = fi * s.sepF

	// Fatigue on the load line through the preload stress σi.
	if set.Has(Fatigue) {
		if pmax > pmin {
			si, q := fi*s.invAs, 1.0 // q = 1: repeated loading 0…Pmax, the common case
			if clamp > 0 {
				// Closed over the whole cycle: σa = Φ(Pmax − Pmin)/(2As) on the load
				// line Sm = σi + q·Sa.
				b.Demand[Fatigue] = phi * (pmax - pmin) * 0.5 * s.invAs
				if pmin != 0 {
					q = (pmax + pmin) / (pmax - pmin)
				}
			} else {
				b.Demand[Fatigue], q = separatedCycle(fi, fb, phi, pmin, s.invAs)
			}
			if in.Criterion == Goodman {
				// Inline form of StrengthAmplitude's Goodman case (Shigley Eq. 8-38).
				sa := in.Endurance * (in.Tensile - si) / (in.Tensile + q*in.Endurance)
				if !(sa > 0) {
					sa = 0
				}
				b.Capacity[Fatigue] = sa
			} else {
				b.Capacity[Fatigue] = StrengthAmplitude(in.Criterion, in.Endurance, in.Tensile, in.Proof, si, q)
			}
		} else {
			b.Demand[Fatigue], b.Capacity[Fatigue] = 0, 0
		}
	}
	if set&(1<<ThreadStripping|1<<HeadPressure) != 0 {
		boltExtras(in, s, b, fm, fb)
	}
}

// boltExtras evaluates thread stripping and the surface pressure under
// head, nut or washer, at the assembly preload and at the service maximum
// (VDI 2230-1).
func boltExtras(in *Inputs, s *Stiffness, b *BoltResult, fm, fb float64) {
	b.Active[ThreadStripping] = in.Tapped || in.NutProof > 0
	b.Active[HeadPressure] = s.pressLimit > 0
	f := math.Max(fm, fb)
	if b.Active[ThreadStripping] {
		b.Demand[ThreadStripping] = f
		if in.Tapped {
			// The weaker of the bolt's thread (τ = threadShearRatio·Rm) and
			// the tapped material's over the engaged length.
			b.Capacity[ThreadStripping] = math.Min(threadShearRatio*in.Tensile*s.shearExt, in.TappedShear*s.shearInt)
		} else {
			// A nut of ISO 898-2 class withstands its proof load Sp,nut·As.
			b.Capacity[ThreadStripping] = in.NutProof * in.Thread.StressArea
		}
	}
	if b.Active[HeadPressure] {
		b.Demand[HeadPressure] = f * s.pressInvArea
		b.Capacity[HeadPressure] = s.pressLimit
	}
}

// separatedCycle returns σa and the load-line slope q of a cycle that
// separates at Pmax (and perhaps at Pmin too): the cycle of the physical bolt
// force Fb(Pmin) … Fb(Pmax) = Pmax, and the load line from σi through its
// point (σm, σa).
func separatedCycle(fi, fb, phi, pmin, invAs float64) (sa, q float64) {
	fmin := fi + phi*pmin
	if pmin*(1-phi) > fi {
		fmin = pmin
	}
	return (fb - fmin) * 0.5 * invAs, (fb + fmin - 2*fi) / (fb - fmin)
}

// StrengthAmplitude returns the strength amplitude Sa where the load line
// through the preload stress σi meets the failure line of criterion c. The
// load line is Sm = σi + q·Sa with q = (σm − σi)/σa = (Pmax + Pmin)/(Pmax − Pmin)
// (q = 1 for repeated loading 0…P). The fatigue factor is nf = Sa/σa; for
// Goodman this is Shigley Eq. 8-38, for q = 1 Eqs. 8-45 to 8-47.
// The result is never negative: a preload stress already on or beyond the
// failure line leaves no amplitude.
func StrengthAmplitude(c Criterion, se, sut, sp, si, q float64) float64 {
	var sa float64
	switch c {
	case Goodman:
		// Sa/Se + (σi + q·Sa)/Sut = 1
		sa = se * (sut - si) / (sut + q*se)
	case Gerber:
		// Sa/Se + ((σi + q·Sa)/Sut)² = 1  →  a·Sa² + b·Sa + c = 0
		a := q * q / (sut * sut)
		bb := 1/se + 2*q*si/(sut*sut)
		cc := si*si/(sut*sut) - 1
		sa = quadRoot(a, bb, cc)
	case ASMEElliptic:
		// (Sa/Se)² + ((σi + q·Sa)/Sp)² = 1
		a := 1/(se*se) + q*q/(sp*sp)
		bb := 2 * q * si / (sp * sp)
		cc := si*si/(sp*sp) - 1
		sa = quadRoot(a, bb, cc)
	default:
		sa = se
	}
	if !(sa > 0) {
		return 0
	}
	return sa
}

// quadRoot returns the larger root of a·x² + b·x + c = 0 (a ≥ 0), in the
// cancellation-free form 2c/(−b − √(b² − 4ac)) when b > 0; NaN when there
// is no real root.
func quadRoot(a, b, c float64) float64 {
	disc := b*b - 4*a*c
	if disc < 0 {
		return math.NaN()
	}
	r := math.Sqrt(disc)
	if b > 0 {
		return 2 * c / (-b - r)
	}
	return (-b + r) / (2 * a)
}

// EvaluateJoint combines per-bolt results with the joint-level modes. bolts
// holds either one result per bolt, or a single result standing for
// in.Bolts identical bolts. It does not allocate.
//
// A bolt mode fails for the joint when any bolt fails it; the joint's demand
// and capacity are those of the bolt with the smallest safety factor. Slip
// uses the summed residual clamp force of all bolts. With a single result
// and no shear load the joint's modes are exactly the bolt's (Demand,
// Capacity, Active, Invalid), so a caller may read the BoltResult instead.
//
// Outcome.Bolt and Outcome.Stiffness are left alone (Evaluate fills them);
// the Monte Carlo driver reads the bolts directly.
func EvaluateJoint(in *Inputs, s *Stiffness, bolts []BoltResult, out *Outcome) {
	out.Invalid = false
	for i := range bolts {
		out.Invalid = out.Invalid || bolts[i].Invalid
	}
	for m := range NumModes {
		if !BoltModes.Has(m) {
			continue
		}
		w := 0
		active := bolts[0].Active[m]
		if !active && !anyActive(bolts, m) {
			// A mode no bolt has (a tapped hole's stripping on a through-bolt):
			// no search.
			out.Demand[m], out.Capacity[m], out.Active[m] = bolts[0].Demand[m], bolts[0].Capacity[m], false
			continue
		}
		active = true
		for i := 1; i < len(bolts); i++ {
			// bolt i is worse when cap_i/dem_i < cap_w/dem_w (demands are positive).
			if bolts[i].Capacity[m]*bolts[w].Demand[m] < bolts[w].Capacity[m]*bolts[i].Demand[m] {
				w = i
			}
		}
		out.Demand[m] = bolts[w].Demand[m]
		out.Capacity[m] = bolts[w].Capacity[m]
		out.Active[m] = active
	}
	JointModes(in, ClampSum(in, bolts), out)
}

func anyActive(bolts []BoltResult, m Mode) bool {
	for i := range bolts {
		if bolts[i].Active[m] {
			return true
		}
	}
	return false
}

// ClampSum returns the summed residual clamp force of the joint's bolts
// (each bolt's clamp force counted when positive); a single result stands
// for in.Bolts identical bolts.
func ClampSum(in *Inputs, bolts []BoltResult) float64 {
	clamp := 0.0
	for i := range bolts {
		if c := bolts[i].Clamp; c > 0 {
			clamp += c
		}
	}
	if len(bolts) != in.Bolts {
		clamp *= float64(in.Bolts) / float64(len(bolts))
	}
	return clamp
}

func (o *Outcome) set(m Mode, demand, capacity float64) {
	o.Active[m] = true
	o.Demand[m] = demand
	o.Capacity[m] = capacity
}

// Evaluate computes stiffness, the bolt state and every mode of a joint whose
// bolts are identical. It does not allocate.
func Evaluate(in *Inputs, out *Outcome) {
	s := ComputeStiffness(in)
	var b [1]BoltResult
	EvaluateBolt(in, &s, AllModes, &b[0])
	EvaluateJoint(in, &s, b[:], out)
	out.Stiffness = s
	out.Bolt = b[0]
}

// ScaleLoads multiplies every service load (axial maximum and minimum, shear)
// by f.
func (in *Inputs) ScaleLoads(f float64) {
	in.AxialMax *= f
	in.AxialMin *= f
	in.ShearLoad *= f
}
