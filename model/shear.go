package model

import "math"

// JointModes fills the modes decided once for the whole joint (the shear
// side, for the chosen resistance rule) from the inputs and the summed
// clamp force; it leaves the bolt modes of out alone. It does not allocate.
//
// The bolt group is n1 rows (Inputs.BoltsInLine) of n2 bolts
// (Inputs.BoltsAcross) at pitch p1 and gauge p2. The first row in the load
// direction holds the end bolts (end distance e1), the others are inner
// bolts (pitch p1); the outer columns are edge bolts (side distance e2).
// Without a pitch every bolt is taken as an end bolt, without a gauge as an
// edge bolt.
func JointModes(in *Inputs, clamp float64, out *Outcome) {
	out.ClampSum = clamp
	v := in.ShearLoad
	if !(v > 0) {
		if out.shear {
			for m := range NumModes {
				if !BoltModes.Has(m) {
					out.Active[m] = false
					out.Demand[m], out.Capacity[m] = 0, 0
				}
			}
			out.shear = false
		}
		return
	}
	out.shear = true
	for m := range NumModes {
		if !BoltModes.Has(m) {
			out.Active[m] = false
		}
	}
	g := groupOf(in)
	n := float64(in.Bolts)
	planes := in.ShearPlanes
	d, t, dh := in.Thread.D, in.PlateThickness, in.HoleDia
	e1, e2 := g.e1, g.e2
	ft := in.AxialMax // external tension per bolt (EN 1993-1-8 Ft,Ed; AISC T/n)
	tension := ft > 0
	switch in.ShearRule {
	case YieldRule:
		a := in.Thread.NominalArea
		if in.ThreadsInShearPlane {
			a = in.Thread.MinorArea
		}
		out.set(BoltShear, v, n*planes*a*invSqr3*in.Yield)
		out.set(BoltBearing, v, n*d*t*in.Yield)
		out.set(PlateBearing, v, n*d*t*in.PlateYield)
		if in.PlateWidth > 0 {
			out.set(NetSection, v, (in.PlateWidth-g.across*dh)*t*in.PlateYield)
		}
		if e1 > 0 {
			// Shear-out of the material in front of each bolt, 2·(e − d/2)·t at
			// 0.577·Sy: e = e1 for the end row, p1 − dh/2 (to the next hole's
			// edge) for the inner rows.
			so := func(e float64) float64 { return 2 * (e - d/2) * t * invSqr3 * in.PlateYield }
			out.set(TearOut, v, g.across*(g.endRows*so(e1)+g.innerRows*so(in.Pitch-dh/2)))
		}
		if g.blocks {
			out.set(BlockTearing, v, g.blockTearing(in, dh, func(ant, anv, agv float64) float64 {
				return in.PlateYield*ant + invSqr3*in.PlateYield*anv
			}))
		}
		if tension {
			// von Mises on the bolt section in the shear plane.
			sig, tau := ft/a, v/(n*planes*a)
			out.set(TensionShear, math.Sqrt(sig*sig+3*tau*tau)/in.Yield, 1)
		}
	case EN1993:
		// EN 1993-1-8:2005 Table 3.4, γM = 1.
		fub := in.FubNominal
		if fub == 0 {
			fub = in.Tensile
		}
		fu := in.PlateTensile
		a, av := in.Thread.NominalArea, 0.6
		if in.ThreadsInShearPlane {
			a, av = in.Thread.StressArea, in.AlphaV
			if av == 0 {
				av = 0.5
			}
		}
		// §3.8 long joints: βLf = 1 − (Lj − 15d)/(200d), 0.75 ≤ βLf ≤ 1, for
		// Lj = (n1 − 1)·p1 > 15d.
		beta := 1.0
		if lj := (g.rows - 1) * in.Pitch; in.Pitch > 0 && lj > 15*d {
			beta = math.Max(0.75, math.Min(1, 1-(lj-15*d)/(200*d)))
		}
		fv := planes * av * fub * a * beta // per bolt
		out.set(BoltShear, v, n*fv)
		// Bearing per bolt Fb = k1·αb·fu·d·t: αd = e1/(3d0) for end bolts,
		// p1/(3d0) − 1/4 for inner bolts; k1 = min(2.8·e2/d0 − 1.7, 2.5) for
		// edge bolts (and ≤ 1.4·p2/d0 − 1.7 with several columns), min(1.4·p2/d0
		// − 1.7, 2.5) for inner columns.
		kEdge := math.Min(2.8*e2/dh-1.7, 2.5)
		kInner := kEdge
		edgeCols, innerCols := g.across, 0.0
		if in.Gauge > 0 && g.across >= 2 {
			k := 1.4*in.Gauge/dh - 1.7
			kEdge, kInner = math.Min(kEdge, k), math.Min(k, 2.5)
			edgeCols, innerCols = 2, g.across-2
		}
		ratio := math.Min(fub/fu, 1)
		abEnd := math.Min(e1/(3*dh), ratio)
		abInner := math.Min(in.Pitch/(3*dh)-0.25, ratio)
		base := fu * d * t
		sum := g.endRows*(edgeCols*kEdge+innerCols*kInner)*abEnd*base +
			g.innerRows*(edgeCols*kEdge+innerCols*kInner)*abInner*base
		lo, hi := kEdge*abEnd*base, kEdge*abEnd*base
		for _, f := range [...]struct{ k, ab, rows, cols float64 }{
			{kInner, abEnd, g.endRows, innerCols}, {kEdge, abInner, g.innerRows, edgeCols}, {kInner, abInner, g.innerRows, innerCols},
		} {
			if f.rows > 0 && f.cols > 0 {
				fb := f.k * f.ab * base
				lo, hi = math.Min(lo, fb), math.Max(hi, fb)
			}
		}
		// §3.7(1): the group resists the sum of the bearing resistances only if
		// every Fv,Rd ≥ Fb,Rd; otherwise n times the smallest resistance.
		if fv < hi {
			sum = n * lo
		}
		out.set(PlateBearing, v, sum)
		if in.PlateWidth > 0 {
			out.set(NetSection, v, 0.9*(in.PlateWidth-g.across*dh)*t*fu)
		}
		if g.blocks {
			// §3.10.2 Veff,1 = fu·Ant + fy·Anv/√3 (γM = 1).
			out.set(BlockTearing, v, g.blockTearing(in, dh, func(ant, anv, agv float64) float64 {
				return fu*ant + invSqr3*in.PlateYield*anv
			}))
		}
		if tension {
			// Table 3.4: Fv,Ed/Fv,Rd + Ft,Ed/(1.4·Ft,Rd) ≤ 1 with Ft,Ed ≤ Ft,Rd,
			// Ft,Rd = k2·fub·As, k2 = 0.9.
			ftrd := 0.9 * fub * in.Thread.StressArea
			u := math.Max(v/(n*fv)+ft/(1.4*ftrd), ft/ftrd)
			out.set(TensionShear, u, 1)
		}
	case AISC360:
		// AISC 360-16 J3.6 (Fnv = 0.450 Fu threads included, 0.563 Fu excluded,
		// Table J3.2 "threaded parts"), J3.10 (bearing 2.4·d·t·Fu, tear-out
		// 1.2·lc·t·Fu), J4.1 net-section rupture Fu·An.
		fu := in.PlateTensile
		fnv := 0.563 * in.Tensile
		if in.ThreadsInShearPlane {
			fnv = 0.450 * in.Tensile
		}
		// Table J3.2 note: end-loaded pattern longer than 38 in, Fnv × 0.833.
		if in.Pitch > 0 && (g.rows-1)*in.Pitch > 38*inch {
			fnv *= 0.833
		}
		ab := in.Thread.NominalArea
		out.set(BoltShear, v, n*planes*fnv*ab)
		bearing := 2.4 * d * t * fu
		out.set(PlateBearing, v, n*bearing)
		if e1 > 0 {
			// Each hole resists min(1.2·lc·t·Fu, 2.4·d·t·Fu); lc = e1 − dh/2
			// for end bolts, p1 − dh for inner bolts; the group the sum.
			hole := func(lc float64) float64 { return math.Min(1.2*lc*t*fu, bearing) }
			out.set(TearOut, v, g.across*(g.endRows*hole(e1-dh/2)+g.innerRows*hole(in.Pitch-dh)))
		}
		// §B4.3b: the width of a hole in the net area is the nominal hole plus
		// 1/16 in (2 mm); J4.1(b): An ≤ 0.85·Ag for bolted splice plates.
		dn := dh + aiscHoleAllowance(in.Thread)
		if in.PlateWidth > 0 {
			an := math.Min((in.PlateWidth-g.across*dn)*t, 0.85*in.PlateWidth*t)
			out.set(NetSection, v, an*fu)
		}
		if g.blocks {
			// J4.3: Rn = 0.60·Fu·Anv + Ubs·Fu·Ant ≤ 0.60·Fy·Agv + Ubs·Fu·Ant, Ubs = 1.
			out.set(BlockTearing, v, g.blockTearing(in, dn, func(ant, anv, agv float64) float64 {
				return math.Min(0.6*fu*anv, 0.6*in.PlateYield*agv) + fu*ant
			}))
		}
		if tension {
			// J3.7 with φ = Ω = 1: ft ≤ F′nt = 1.3·Fnt − (Fnt/Fnv)·frv ≤ Fnt,
			// i.e. (ft/Fnt + frv/Fnv)/1.3 ≤ 1 and ft/Fnt ≤ 1, Fnt = 0.75·Fu.
			fnt := 0.75 * in.Tensile
			fts, frv := ft/ab, v/(n*planes*ab)
			out.set(TensionShear, math.Max((fts/fnt+frv/fnv)/1.3, fts/fnt), 1)
		}
	}
	if in.SlipFactor > 0 {
		// Slip: V ≥ μ·m·ΣFclamp (EN 1993-1-8 §3.9 with ks = 1, γM3 = 1 and the
		// actual clamp force in place of Fp,C).
		out.set(Slip, v, in.SlipFactor*planes*clamp)
	}
}

// aiscHoleAllowance is the AISC 360-16 §B4.3b allowance added to the nominal
// hole for net areas: 1/16 in, or 2 mm for metric bolts.
func aiscHoleAllowance(th Thread) float64 {
	if th.Unified {
		return inch / 16
	}
	return 2
}

// group is the bolt pattern of a shear joint.
type group struct {
	rows, across       float64 // n1 rows in the load direction, n2 bolts per row
	endRows, innerRows float64 // rows taken as end rows and as inner rows
	e1, e2             float64
	blocks             bool // the pattern is known well enough for block tearing
}

func groupOf(in *Inputs) group {
	var g group
	g.rows, g.across = in.Rows()
	g.e1, g.e2 = in.EdgeDistance, in.SideDistance
	if g.e2 == 0 {
		g.e2 = g.e1
	}
	g.endRows, g.innerRows = 1, g.rows-1
	if in.Pitch == 0 {
		g.endRows, g.innerRows = g.rows, 0
	}
	g.blocks = g.e1 > 0 && (g.rows <= 1 || in.Pitch > 0) && (g.across <= 1 || in.Gauge > 0)
	return g
}

// blockTearing returns the least resistance of the two block-tearing paths
// of a concentrically loaded group (EN 1993-1-8 Fig. 3.8; AISC 360-16 J4.3),
// with holes of width dn in the net areas: the inner block (tension across
// the n2 − 1 gauges between the outer columns, shear along both outer
// columns) and the outer strips (tension from the outer columns to the side
// edges, shear along the outer columns). Shear length Lv = e1 + (n1 − 1)·p1
// per plane, net Lv − (n1 − 0.5)·dn. r gives the resistance from Ant, Anv and
// Agv (mm²).
func (g *group) blockTearing(in *Inputs, dn float64, r func(ant, anv, agv float64) float64) float64 {
	t := in.PlateThickness
	lv := g.e1 + (g.rows-1)*in.Pitch
	agv := 2 * lv * t
	anv := 2 * (lv - (g.rows-0.5)*dn) * t
	best := r(2*(g.e2-dn/2)*t, anv, agv) // outer strips
	if g.across >= 2 {
		best = math.Min(best, r((g.across-1)*(in.Gauge-dn)*t, anv, agv)) // inner block
	}
	return best
}
