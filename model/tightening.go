package model

import (
	"fmt"
	"math"
)

// PermissibleAssemblyPreload returns the assembly preload (N) at which the
// von Mises stress in tightening reaches ν·Rp0.2, with the thread torsion of
// the joint's tightening method at its nominal friction (VDI 2230-1 FMzul):
//
//	FMzul = As·ν·Rp0.2 / √(1 + 3·[(3/2)·(d2/d0)·(P/(π·d2) + 1.155·μG)]²)
//
// written here as As·ν·Rp0.2/√(1 + 3k²), k = (MG/FM)·As/(π·d0³/12). A
// tensioner applies no torsion (k = 0). VDI 2230-1 uses ν = 0.9.
func PermissibleAssemblyPreload(in *Inputs, nu float64) float64 {
	as := in.Thread.StressArea
	d0 := in.StressDiameter()
	k := in.threadTorqueRatio() * as / (math.Pi / 12 * d0 * d0 * d0)
	return nu * as * in.Yield / math.Sqrt(1+3*k*k)
}

// EmbeddingEstimate is the embedding (settlement) of a joint estimated from
// VDI 2230-1 Table 5 (from memory): an amount in the thread, per head or nut
// bearing face and per inner interface, by the mean roughness Rz and
// whether the load is axial or transverse. Lengths in mm.
type EmbeddingEstimate struct {
	Total                         float64
	Thread, PerFace, PerInterface float64
	Faces, Interfaces             int
	RoughnessClass                string // e.g. "10 µm ≤ Rz < 40 µm"
	Transverse, RoughnessAssumed  bool
}

// embeddingTable is VDI 2230-1 Table 5 (from memory): µm in the thread, per
// bearing face, per inner interface, for axial and transverse load, by the
// upper bound of the Rz class (µm).
var embeddingTable = [...]struct {
	rzMax             float64
	class             string
	axial, transverse [3]float64
}{
	{10, "Rz < 10 µm", [3]float64{3, 2.5, 1.5}, [3]float64{3, 3, 2}},
	{40, "10 µm ≤ Rz < 40 µm", [3]float64{3, 3, 2}, [3]float64{3, 4.5, 2.5}},
	{160, "40 µm ≤ Rz < 160 µm", [3]float64{3, 4, 3}, [3]float64{3, 6.5, 3.5}},
}

// EmbeddingEstimateOf returns the VDI 2230-1 Table 5 estimate of the
// joint's embedding for mean roughness rz (mm; 0: the class 10–40 µm of
// machined faces is assumed, common practice) and transverse (shear) or
// axial load. One thread engagement; bearing faces under head and nut (the
// head only for a tapped hole); inner interfaces between the layers and at
// each washer.
func EmbeddingEstimateOf(in *Inputs, rz float64, transverse bool) EmbeddingEstimate {
	e := EmbeddingEstimate{Transverse: transverse}
	row := embeddingTable[1]
	if rz == 0 {
		e.RoughnessAssumed = true
	} else {
		for _, r := range embeddingTable {
			row = r
			if rz*1000 < r.rzMax {
				break
			}
		}
	}
	v := row.axial
	if transverse {
		v = row.transverse
	}
	e.RoughnessClass = row.class
	e.Thread, e.PerFace, e.PerInterface = v[0]*1e-3, v[1]*1e-3, v[2]*1e-3
	e.Faces = 2
	if in.Tapped {
		e.Faces = 1
	}
	e.Interfaces = in.NLayers - 1
	if in.Washer.Present() {
		e.Interfaces++
	}
	if in.NutWasher.Present() && !in.Tapped {
		e.Interfaces++
	}
	e.Total = e.Thread + float64(e.Faces)*e.PerFace + float64(e.Interfaces)*e.PerInterface
	return e
}

// Describe writes the estimate's terms, e.g. "3 + 2 × 3 + 1 × 2 = 11 µm
// (10 µm ≤ Rz < 40 µm, axial load)".
func (e EmbeddingEstimate) Describe() string {
	load := "axial load"
	if e.Transverse {
		load = "transverse load"
	}
	rz := e.RoughnessClass
	if e.RoughnessAssumed {
		rz += " assumed"
	}
	um := func(v float64) string { return fmt.Sprintf("%g", math.Round(v*1e4)/10) }
	return fmt.Sprintf("%s + %d × %s + %d × %s = %s µm (thread, bearing faces, inner interfaces; %s, %s)",
		um(e.Thread), e.Faces, um(e.PerFace), e.Interfaces, um(e.PerInterface), um(e.Total), rz, load)
}

// PreloadLoss returns the preload lost by an embedding fz (mm):
// FZ = fZ·kb·km/(kb + km) (VDI 2230-1).
func (s *Stiffness) PreloadLoss(fz float64) float64 { return fz * s.kz }

// TorsionFriction returns the thread friction μG behind the joint's thread
// torsion: μG itself (friction method, preload methods), the ISO 16047 total
// friction a nut factor implies (nut-factor method, 0 when negative), or 0
// for a tensioner.
func (in *Inputs) TorsionFriction() float64 {
	lead, thread, _ := in.torqueTerms()
	r := in.threadTorqueRatio()
	if r == 0 {
		return 0
	}
	return (r - lead) / thread
}
