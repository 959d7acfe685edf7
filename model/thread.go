package model

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Thread is the geometry of an external screw thread. All lengths in mm,
// areas in mm².
type Thread struct {
	Name        string  // canonical name, e.g. "M12", "M12x1.25", "1/2-13 UNC"
	Series      string  // "ISO metric coarse", "ISO metric fine", "UNC", "UNF"
	D           float64 // nominal (major) diameter
	Pitch       float64 // thread pitch
	PitchDia    float64 // basic pitch diameter d2
	MinorDia    float64 // minor diameter used for root area (d3 metric, dr unified)
	StressArea  float64 // tensile stress area As (At)
	MinorArea   float64 // root area (π/4)·MinorDia²
	NominalArea float64 // shank area (π/4)·D²
	Unified     bool    // inch series
}

const inch = 25.4 // mm per inch (exact)

// MetricThread returns the geometry of an ISO metric thread of nominal
// diameter d and pitch p (mm) from the basic-profile formulas:
//
//	d2 = d − 0.649519·P   (ISO 724; Shigley Table 8-1 footnote)
//	d3 = d − 1.226869·P   (ISO 724; Shigley Table 8-1 footnote)
//	As = (π/4)·((d2 + d3)/2)²   (ISO 898-1 definition of the stress area)
func MetricThread(d, p float64) Thread {
	d2 := d - 0.649519*p
	d3 := d - 1.226869*p
	ds := (d2 + d3) / 2
	return Thread{
		D: d, Pitch: p, PitchDia: d2, MinorDia: d3,
		StressArea:  math.Pi / 4 * ds * ds,
		MinorArea:   math.Pi / 4 * d3 * d3,
		NominalArea: math.Pi / 4 * d * d,
	}
}

// UnifiedThread returns the geometry of a Unified inch thread of major
// diameter dIn (in) and n threads per inch, converted to mm:
//
//	dp = d − 0.649519/n          (ASME B1.1; Shigley Table 8-2 footnote)
//	dr = d − 1.299038/n          (Shigley Table 8-2 footnote)
//	At = 0.7854·(d − 0.9743/n)²  (ASME B1.1)
func UnifiedThread(dIn, n float64) Thread {
	dp := dIn - 0.649519/n
	dr := dIn - 1.299038/n
	ds := dIn - 0.9743/n
	return Thread{
		D: dIn * inch, Pitch: inch / n, PitchDia: dp * inch, MinorDia: dr * inch,
		StressArea:  0.7854 * ds * ds * inch * inch,
		MinorArea:   math.Pi / 4 * dr * dr * inch * inch,
		NominalArea: math.Pi / 4 * dIn * dIn * inch * inch,
		Unified:     true,
	}
}

// Coarse pitches of ISO metric threads, ISO 261/262 (Shigley Table 8-1 to
// M36; M2, M2.5 and M39–M64 from ISO 261, from memory).
var metricCoarse = []struct {
	d, p float64
}{
	{2, 0.4}, {2.5, 0.45},
	{3, 0.5}, {3.5, 0.6}, {4, 0.7}, {5, 0.8}, {6, 1}, {7, 1}, {8, 1.25}, {10, 1.5},
	{12, 1.75}, {14, 2}, {16, 2}, {18, 2.5}, {20, 2.5}, {22, 2.5}, {24, 3}, {27, 3},
	{30, 3.5}, {33, 3.5}, {36, 4},
	{39, 4}, {42, 4.5}, {45, 4.5}, {48, 5}, {52, 5}, {56, 5.5}, {60, 5.5}, {64, 6},
}

// Common ISO metric fine pitches (ISO 261/262; M39 and above from memory).
var metricFine = []struct {
	d, p float64
}{
	{8, 1}, {10, 1.25}, {10, 1}, {12, 1.5}, {12, 1.25}, {14, 1.5}, {16, 1.5},
	{18, 1.5}, {20, 1.5}, {20, 2}, {22, 1.5}, {24, 2}, {27, 2}, {30, 2}, {33, 2}, {36, 3},
	{39, 3}, {42, 3}, {45, 3}, {48, 3}, {52, 4}, {56, 4}, {60, 4}, {64, 4},
}

// Unified sizes with UNC and UNF threads per inch (ASME B1.1; Shigley
// Table 8-2): numbered sizes #4 … #12 (major diameter 0.060 + 0.013·N in),
// 1/4 to 1-1/2 in, and coarse-only sizes 1-3/4 to 4 in (ASME B1.1, from
// memory; unf 0: no UNF size).
var unifiedSizes = []struct {
	name     string
	d        float64
	unc, unf float64
}{
	{"#4", 0.112, 40, 48}, {"#5", 0.125, 40, 44}, {"#6", 0.138, 32, 40},
	{"#8", 0.164, 32, 36}, {"#10", 0.190, 24, 32}, {"#12", 0.216, 24, 28},
	{"1/4", 0.25, 20, 28}, {"5/16", 0.3125, 18, 24}, {"3/8", 0.375, 16, 24},
	{"7/16", 0.4375, 14, 20}, {"1/2", 0.5, 13, 20}, {"9/16", 0.5625, 12, 18},
	{"5/8", 0.625, 11, 18}, {"3/4", 0.75, 10, 16}, {"7/8", 0.875, 9, 14},
	{"1", 1, 8, 12}, {"1-1/8", 1.125, 7, 12}, {"1-1/4", 1.25, 7, 12},
	{"1-3/8", 1.375, 6, 12}, {"1-1/2", 1.5, 6, 12},
	{"1-3/4", 1.75, 5, 0}, {"2", 2, 4.5, 0}, {"2-1/4", 2.25, 4.5, 0}, {"2-1/2", 2.5, 4, 0},
	{"2-3/4", 2.75, 4, 0}, {"3", 3, 4, 0}, {"3-1/4", 3.25, 4, 0}, {"3-1/2", 3.5, 4, 0},
	{"3-3/4", 3.75, 4, 0}, {"4", 4, 4, 0},
}

var threadCatalogue = buildThreads()

func buildThreads() map[string]Thread {
	m := make(map[string]Thread)
	for _, c := range metricCoarse {
		t := MetricThread(c.d, c.p)
		t.Name = "M" + fmtNum(c.d)
		t.Series = "ISO metric coarse"
		m[t.Name] = t
	}
	for _, c := range metricFine {
		t := MetricThread(c.d, c.p)
		t.Name = "M" + fmtNum(c.d) + "x" + fmtNum(c.p)
		t.Series = "ISO metric fine"
		m[t.Name] = t
	}
	for _, u := range unifiedSizes {
		t := UnifiedThread(u.d, u.unc)
		t.Name = u.name + "-" + fmtNum(u.unc) + " UNC"
		t.Series = "UNC"
		m[t.Name] = t
		if u.unf == 0 {
			continue
		}
		t = UnifiedThread(u.d, u.unf)
		t.Name = u.name + "-" + fmtNum(u.unf) + " UNF"
		t.Series = "UNF"
		m[t.Name] = t
	}
	return m
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// Threads returns every catalogue thread, metric first, each series in size order.
func Threads() []Thread {
	out := make([]Thread, 0, len(threadCatalogue))
	for _, t := range threadCatalogue {
		out = append(out, t)
	}
	rank := map[string]int{"ISO metric coarse": 0, "ISO metric fine": 1, "UNC": 2, "UNF": 3}
	sort.Slice(out, func(i, j int) bool {
		a, b := out[i], out[j]
		if rank[a.Series] != rank[b.Series] {
			return rank[a.Series] < rank[b.Series]
		}
		if a.D != b.D {
			return a.D < b.D
		}
		return a.Pitch > b.Pitch
	})
	return out
}

// LookupThread finds a catalogue thread by name. It accepts "M12", "m12",
// "M12x1.25", "M12×1.25", "1/2-13 UNC", "1/2-13", "1/2 UNC", "1/2-20 UNF".
// A metric size with its coarse pitch written out ("M12x1.75") resolves to the
// coarse entry.
func LookupThread(name string) (Thread, error) {
	s := strings.TrimSpace(name)
	s = strings.ReplaceAll(s, "×", "x")
	s = strings.ReplaceAll(s, "X", "x")
	if t, ok := threadCatalogue[s]; ok {
		return t, nil
	}
	up := strings.ToUpper(s)
	if strings.HasPrefix(up, "M") {
		key := "M" + strings.ToLower(strings.ReplaceAll(up[1:], " ", ""))
		if t, ok := threadCatalogue[key]; ok {
			return t, nil
		}
		if i := strings.IndexByte(key, 'x'); i > 0 {
			if t, ok := threadCatalogue[key[:i]]; ok && "M"+fmtNum(t.D)+"x"+fmtNum(t.Pitch) == key {
				return t, nil
			}
		}
		return Thread{}, fmt.Errorf("unknown thread %q: metric sizes M2–M64 coarse and common fine pitches (see 'boltrisk catalog threads'), or a user-defined thread {diameter, pitch}", name)
	}
	// Unified: "<size>-<tpi> [UNC|UNF]" or "<size> UNC|UNF".
	up = strings.TrimSpace(strings.TrimPrefix(strings.TrimPrefix(up, "NO."), "NO "))
	if t, ok := lookupUnified(up); ok {
		return t, nil
	}
	// Numbered sizes may drop the '#': "10-24", "No. 10-24".
	if t, ok := lookupUnified("#" + up); ok {
		return t, nil
	}
	return Thread{}, fmt.Errorf("unknown thread %q: allowed are metric M2–M64 (e.g. M12, M12x1.25), Unified #4–4 in UNC and #4–1-1/2 in UNF (e.g. #10-24 UNC, 1/2-13 UNC); see 'boltrisk catalog threads', or give a user-defined thread {diameter, pitch}", name)
}

func lookupUnified(up string) (Thread, bool) {
	fields := strings.Fields(up)
	series := ""
	if n := len(fields); n > 1 && (fields[n-1] == "UNC" || fields[n-1] == "UNF") {
		series = fields[n-1]
		fields = fields[:n-1]
	}
	body := strings.Join(fields, "")
	for _, u := range unifiedSizes {
		switch {
		case body == u.name && series != "":
			if t, ok := threadCatalogue[u.name+"-"+fmtNum(pick(series, u.unc, u.unf))+" "+series]; ok {
				return t, true
			}
		case strings.HasPrefix(body, u.name+"-"):
			tpi, err := strconv.ParseFloat(body[len(u.name)+1:], 64)
			if err != nil || tpi == 0 {
				continue
			}
			for _, ser := range []string{"UNC", "UNF"} {
				if tpi == pick(ser, u.unc, u.unf) && (series == "" || series == ser) {
					return threadCatalogue[u.name+"-"+fmtNum(tpi)+" "+ser], true
				}
			}
		}
	}
	return Thread{}, false
}

func pick(series string, unc, unf float64) float64 {
	if series == "UNC" {
		return unc
	}
	return unf
}

// ThreadShearAreas returns the shear areas (mm²) of the external thread
// (bolt) and the internal thread (nut or tapped hole) over an engaged length
// le, at the basic dimensions of the thread:
//
//	ASs = π·(le/P)·D1·[P/2 + (d2 − D1)·tan 30°]   (external, at the internal minor diameter D1)
//	ASn = π·(le/P)·d·[P/2 + (d − d2)·tan 30°]     (internal, at the major diameter d)
//
// with D1 = d − 1.082532·P (ISO 724 basic internal minor diameter). These are
// the FED-STD-H28/2B formulas (Machinery's Handbook, "Formulas for stress
// areas and length of engagement"; secondary source) with basic in place of
// the limiting dimensions: at basic size ASs = 0.75·π·D1·le and
// ASn = 0.875·π·d·le. Tolerances make the real areas somewhat smaller.
func ThreadShearAreas(th Thread, le float64) (ext, internal float64) {
	p := th.Pitch
	d1 := th.D - 1.082532*p
	tan30 := 0.5773502691896258
	ext = math.Pi * (le / p) * d1 * (p/2 + (th.PitchDia-d1)*tan30)
	internal = math.Pi * (le / p) * th.D * (p/2 + (th.D-th.PitchDia)*tan30)
	return ext, internal
}

// CustomThread returns a user-defined thread of major diameter d (mm) with
// the ISO metric basic profile and pitch p (mm), or, when unified is set,
// the Unified profile with p = 25.4/n mm. It checks that the pitch is
// plausible for the diameter (0 < P ≤ d/4).
func CustomThread(d, p float64, unified bool) (Thread, error) {
	if !(d > 0 && d <= 1000) {
		return Thread{}, fmt.Errorf("diameter %.4g mm must lie within 0 … 1000 mm", d)
	}
	if !(p > 0 && p <= d/4) {
		return Thread{}, fmt.Errorf("pitch %.4g mm must lie within 0 … d/4 = %.4g mm", p, d/4)
	}
	if unified {
		t := UnifiedThread(d/inch, inch/p)
		t.Name = fmtNum(math.Round(d/inch*1e4)/1e4) + " in-" + fmtNum(math.Round(inch/p*1e3)/1e3) + " UN (user-defined)"
		t.Series = "UN user-defined"
		return t, nil
	}
	t := MetricThread(d, p)
	t.Name = "M" + fmtNum(d) + "x" + fmtNum(p) + " (user-defined)"
	t.Series = "ISO metric user-defined"
	return t, nil
}
