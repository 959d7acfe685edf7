package scenario

import (
	"fmt"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
)

var strengthPaths = []string{"bolt.proof_strength", "bolt.yield_strength", "bolt.tensile_strength"}

// nutClasses are the ISO 898-2 property classes of nuts accepted by
// bolt.nut.class. The proof-load stress is taken as 100 × the class number
// (MPa): ISO 898-2 tabulates proof-load stresses at or above that value for
// every size and style (from memory), so the lower bound is used.
var nutClasses = []string{"5", "6", "8", "10", "12"}

// bolt reads the bolt section: thread, property class or strengths,
// modulus, count and nut.
func (b *builder) bolt() error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	th, err := b.thread()
	if err != nil {
		return err
	}
	in.Thread = th
	d := th.D
	cname, cline, hasClass, err := p.scalar(r, "bolt.class")
	if err != nil {
		return err
	}
	stainless := false
	var class model.PropertyClass
	if hasClass {
		c, err := model.LookupClass(cname, d)
		if err != nil {
			return p.errf(cline, "bolt.class", cname, "%v", err)
		}
		class = c
		s.ClassName = c.Name
		stainless = c.Standard == "ISO 3506-1"
		in.AlphaV = c.AlphaV
		in.FubNominal = c.NominalTensile
		fromClass := map[string]float64{"bolt.proof_strength": c.Proof, "bolt.yield_strength": c.Yield, "bolt.tensile_strength": c.Tensile}
		for _, k := range strengthPaths {
			if !given[k] {
				*mustField(k).ptr(in) = fromClass[k]
				s.Sources[k] = "class " + c.Name + " (" + c.Standard + ")"
			}
		}
		b.class = c
		if c.Inch() != th.Unified {
			kind := map[bool]string{true: "an inch-series", false: "a metric"}
			s.Warnings = append(s.Warnings, model.Warning{Field: "bolt.class", Message: fmt.Sprintf("%s is %s class (%s) on %s thread %s; check that the bolt is made to this standard",
				c.Name, kind[c.Inch()], c.Standard, kind[th.Unified], th.Name)})
		}
	} else {
		for _, k := range strengthPaths {
			if !given[k] {
				return p.errf(0, k, "", "required when bolt.class is not given")
			}
		}
	}
	for _, k := range strengthPaths {
		if err := b.positive(k, *mustField(k).ptr(in)); err != nil {
			return err
		}
	}
	// Proof ≤ yield ≤ tensile: a proof load is below the yield strength and
	// the yield strength below the tensile strength, by definition.
	describe := func(k string) string {
		src := ""
		if !given[k] && hasClass {
			src = " of class " + class.Name
		}
		name := strings.ReplaceAll(strings.TrimPrefix(k, "bolt."), "_", " ")
		return name + " " + b.fmt(*mustField(k).ptr(in), units.Stress) + src
	}
	for _, o := range [][2]string{{"bolt.proof_strength", "bolt.yield_strength"}, {"bolt.yield_strength", "bolt.tensile_strength"}} {
		lo, hi := o[0], o[1]
		if *mustField(lo).ptr(in) > *mustField(hi).ptr(in) {
			k := lo
			if !given[k] {
				k = hi // the given value is the one at fault
			}
			return p.errf(b.lineOf(k), k, b.fmt(*mustField(k).ptr(in), units.Stress), "%s exceeds the %s; a bolt needs proof ≤ yield ≤ tensile strength",
				describe(lo), describe(hi))
		}
	}
	if !given["bolt.modulus"] {
		in.BoltModulus = model.SteelModulus
		s.Sources["bolt.modulus"] = "default: steel, Shigley Table A-5"
		if stainless {
			in.BoltModulus = model.StainlessModulus
			s.Sources["bolt.modulus"] = "default: 18-8 stainless, Shigley Table A-5"
		}
	}
	if err := b.positive("bolt.modulus", in.BoltModulus); err != nil {
		return err
	}
	if !given["bolt.expansion"] {
		name := "steel"
		if stainless {
			name = "stainless"
		}
		m, _ := model.LookupMaterial(name)
		in.BoltExpansion = m.Expansion
		s.Sources["bolt.expansion"] = "default: " + name + ", " + m.Source
	}
	count, err := p.integer(r, "bolt.count", 1, 1, 1000)
	if err != nil {
		return err
	}
	in.Bolts = int(count)
	return b.nut(class, hasClass)
}

// thread reads bolt.thread: a catalogue name, or a user-defined thread
// {diameter, pitch} (ISO metric profile) or {diameter, threads_per_inch}
// (Unified profile).
func (b *builder) thread() (model.Thread, error) {
	p, r := b.p, b.r
	n, ok := r.vals["bolt.thread"]
	if !ok {
		return model.Thread{}, p.errf(0, "bolt.thread", "", "required (e.g. M12, M10x1.25, 1/2-13 UNC, or {diameter: 42 mm, pitch: 4.5 mm})")
	}
	if n.Kind != yaml.ScalarNode {
		d, hasD, err := p.optQuantity(r, "bolt.thread.diameter", units.Length)
		if err != nil {
			return model.Thread{}, err
		}
		pitch, hasP, err := p.optQuantity(r, "bolt.thread.pitch", units.Length)
		if err != nil {
			return model.Thread{}, err
		}
		tpi, hasN, err := p.optNumber(r, "bolt.thread.threads_per_inch")
		if err != nil {
			return model.Thread{}, err
		}
		if !hasD || hasP == hasN {
			return model.Thread{}, p.errf(n.Line, "bolt.thread", "", "a user-defined thread needs diameter and either pitch (ISO metric profile) or threads_per_inch (Unified profile)")
		}
		if hasN {
			if !(tpi > 0) {
				return model.Thread{}, p.errf(b.lineOf("bolt.thread.threads_per_inch"), "bolt.thread.threads_per_inch", units.Sig(tpi, 4), "must be > 0")
			}
			pitch = 25.4 / tpi
		}
		th, err := model.CustomThread(d, pitch, hasN)
		if err != nil {
			return model.Thread{}, p.errf(n.Line, "bolt.thread", "", "%v", err)
		}
		return th, nil
	}
	tname, line, _, err := p.scalar(r, "bolt.thread")
	if err != nil {
		return model.Thread{}, err
	}
	th, err := model.LookupThread(tname)
	if err != nil {
		return model.Thread{}, p.errf(line, "bolt.thread", tname, "%v", err)
	}
	return th, nil
}

// nut reads bolt.nut: the ISO 898-2 class of the nut of a through-bolt (its
// proof load is the thread-stripping capacity) or its proof strength.
func (b *builder) nut(class model.PropertyClass, hasClass bool) error {
	p, r, s, in, given := b.p, b.r, b.s, b.in, b.given
	cname, line, ok, err := p.scalar(r, "bolt.nut.class")
	if err != nil {
		return err
	}
	if ok {
		cname = strings.TrimSpace(cname)
		if !contains(nutClasses, cname) {
			return p.errf(line, "bolt.nut.class", cname, "allowed ISO 898-2 nut classes: %s", strings.Join(nutClasses, ", "))
		}
		if given["bolt.nut.proof_strength"] {
			return p.errf(b.lineOf("bolt.nut.proof_strength"), "bolt.nut.proof_strength", "", "give either bolt.nut.class or bolt.nut.proof_strength, not both")
		}
		var c float64
		fmt.Sscan(cname, &c)
		in.NutProof = 100 * c
		s.Sources["bolt.nut.proof_strength"] = "nut class " + cname + " (ISO 898-2): 100 × class, the lower bound of its tabulated proof-load stresses (from memory)"
		if hasClass && class.Standard == "ISO 898-1" {
			var first float64
			fmt.Sscan(strings.SplitN(class.Name, ".", 2)[0], &first)
			if c < first {
				s.Warnings = append(s.Warnings, model.Warning{Field: "bolt.nut.class", Message: fmt.Sprintf("nut class %s is below the class %s the bolt needs (ISO 898-2 pairs bolt class %s with nut class %g or higher): the nut may strip before the bolt breaks", cname, units.Sig(first, 2), class.Name, first)})
			}
		}
	}
	if given["bolt.nut.proof_strength"] {
		if err := b.positive("bolt.nut.proof_strength", in.NutProof); err != nil {
			return err
		}
	}
	return nil
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
