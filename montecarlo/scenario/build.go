package scenario

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// build turns the flattened document into a validated scenario.
func (p *parser) build(r rawDoc) (*Scenario, error) {
	s, err := p.buildOne(r)
	if err != nil {
		return nil, err
	}
	if err := p.buildVariants(s, r); err != nil {
		return nil, err
	}
	s.raw, s.parser = r, p
	return s, nil
}

// builder holds the state of building one scenario from a flattened
// document; each section of the file has its own method (bolt.go,
// members.go, tightening.go, loads.go, fatigue.go, study.go,
// correlations.go).
type builder struct {
	p     *parser
	r     rawDoc
	s     *Scenario
	in    *model.Inputs
	given map[string]bool // registry fields the document sets
	// enduranceNote is a caveat on a tabulated endurance strength, reported
	// when fatigue is checked.
	enduranceNote string
	layerMats     []model.Material    // catalogue material of each layer (zero if given by modulus)
	class         model.PropertyClass // the bolt's class (zero if strengths were given)
	embeddingVDI  bool                // tightening.embedding: vdi2230
}

func (p *parser) buildOne(r rawDoc) (*Scenario, error) {
	s := &Scenario{File: p.file, Sources: map[string]string{}}
	b := &builder{p: p, r: r, s: s, in: &s.Problem.Base, given: map[string]bool{}}
	for _, section := range []func() error{
		b.header, b.registry, b.bolt, b.members, b.geometry, b.loadsWithCases, b.tightening, b.service, b.fatigue, b.study, b.correlations, b.check, b.life,
	} {
		if err := section(); err != nil {
			return nil, err
		}
	}
	s.given = b.given
	return s, nil
}

func (b *builder) lineOf(path string) int { return b.r.keyAt[path] }

// fmt writes an internal value in the scenario's display units.
func (b *builder) fmt(v float64, d units.Dim) string { return b.s.Units.Format(v, d) }

// positive checks that the value of a registry field is > 0.
func (b *builder) positive(path string, v float64) error {
	if !(v > 0) {
		return b.p.errf(b.lineOf(path), path, b.fmt(v, FieldDim(path)), "must be > 0")
	}
	return nil
}

// header reads name, description and display units.
func (b *builder) header() error {
	p, r, s := b.p, b.r, b.s
	if v, _, ok, err := p.scalar(r, "name"); err != nil {
		return err
	} else if ok {
		s.Name = v
	}
	if v, _, ok, err := p.scalar(r, "description"); err != nil {
		return err
	} else if ok {
		s.Description = v
	}
	sysName, err := p.word(r, "units", "si", []string{"si", "us"})
	if err != nil {
		return err
	}
	s.Units, _ = units.ParseSystem(sysName)
	return nil
}

// registry reads every registry field present: its nominal value, and a
// distribution if given.
func (b *builder) registry() error {
	for _, f := range fields {
		if _, ok := b.r.vals[f.path]; !ok {
			continue
		}
		if strings.HasPrefix(f.path, "members.layers.") {
			i, _ := strconv.Atoi(strings.Split(f.path, ".")[2])
			if i > b.r.nLay {
				continue
			}
		}
		if f.path == "tightening.embedding" {
			if n := b.r.vals[f.path]; n.Kind == yaml.ScalarNode && strings.EqualFold(strings.TrimSpace(n.Value), "vdi2230") {
				b.embeddingVDI = true
				continue
			}
		}
		v, d, shared, err := b.value(f) // data.go
		if err != nil {
			if lim, ok := fieldLimits[f.path]; ok {
				var e *Error
				if errors.As(err, &e) {
					e.Msg += fmt.Sprintf("; %s must lie within %s … %s", f.label, b.fmt(lim[0], f.dim), b.fmt(lim[1], f.dim))
				}
			}
			return err
		}
		*f.ptr(b.in) = v
		b.given[f.path] = true
		if d != nil {
			b.s.Problem.Vars = append(b.s.Problem.Vars, montecarlo.Var{Name: f.path, Dist: *d, Role: f.role, Field: f.ptr, Shared: shared})
		}
	}
	return nil
}

// check evaluates the nominal joint (uncertain inputs at their means) and
// collects the model's warnings.
func (b *builder) check() error {
	var out model.Outcome
	model.Evaluate(b.in, &out)
	if out.Invalid {
		return b.p.errf(0, "", "", "the nominal joint lies outside the model's domain (check nut factor, friction and strengths)")
	}
	for m := range model.NumModes {
		if out.Active[m] && (math.IsNaN(out.Demand[m]) || math.IsNaN(out.Capacity[m])) {
			return b.p.errf(0, "", "", "mode %s gives no number for these inputs; please check the geometry", m.Key())
		}
	}
	b.s.Warnings = append(b.s.Warnings, model.Check(b.in, b.s.Units)...)
	return nil
}

// fieldLimits are the physical ranges (lo, hi] of inputs whose messages
// name them.
var fieldLimits = map[string][2]float64{
	"tightening.torque":  {0, maxTorque},
	"tightening.preload": {0, maxPreload},
}

func mustField(path string) field {
	f, ok := lookupField(path)
	if !ok {
		panic("scenario: no field " + path)
	}
	return f
}

// physical checks the nominal value of a field against a physical range
// (lo, hi].
func (b *builder) physical(path string, lo, hi float64, msg string) error {
	f := mustField(path)
	v := *f.ptr(b.in)
	if _, ok := b.r.vals[path]; !ok && v == 0 {
		if _, unc := b.s.Uncertain(path); !unc {
			return nil
		}
	}
	if !(v > lo && v <= hi) {
		return b.p.errf(b.lineOf(path), path, b.fmt(v, f.dim), "%s", msg)
	}
	return nil
}

// addVar makes a registry field uncertain with distribution d (a preset's
// scatter), its nominal value the mean; source says where it came from.
func (b *builder) addVar(path string, d montecarlo.Dist, source string) {
	f := mustField(path)
	*f.ptr(b.in) = d.Mean()
	b.s.Problem.Vars = append(b.s.Problem.Vars, montecarlo.Var{Name: path, Dist: d, Role: f.role, Field: f.ptr})
	b.s.Sources[path] = source
}

// SourceOf says where the value of an input came from: the file ("given"),
// a preset, a class or a default; "" for an input the scenario does not use.
func (s *Scenario) SourceOf(path string) string {
	if src, ok := s.Sources[path]; ok {
		return src
	}
	if s.given[path] {
		return "given"
	}
	return ""
}
