package scenario

import (
	"errors"
	"go.yaml.in/yaml/v3"
	"strings"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

func (b *builder) correlations() error {
	p, r, s := b.p, b.r, b.s
	for _, n := range r.corr {
		if n.Kind != yaml.MappingNode {
			return p.errf(n.Line, "correlations", "", "each entry is {between: [input, input], rho: value}")
		}
		var names []string
		var nameLine int
		rho, rhoSet := 0.0, false
		err := p.pairs(n, "correlations", func(k, v *yaml.Node) error {
			switch k.Value {
			case "between":
				if v.Kind != yaml.SequenceNode || len(v.Content) != 2 {
					return p.errf(v.Line, "correlations.between", "", "expected two input names, e.g. [tightening.thread_friction, tightening.head_friction]")
				}
				for _, c := range v.Content {
					names = append(names, c.Value)
				}
				nameLine = v.Line
			case "rho":
				x, err := units.ParseNumber(v.Value)
				if err != nil || !(x > -1 && x < 1) {
					return p.errf(v.Line, "correlations.rho", v.Value, "must lie strictly between −1 and 1")
				}
				rho, rhoSet = x, true
			default:
				return p.errf(k.Line, "correlations."+k.Value, "", "unknown key%s; allowed: between, rho", suggest(k.Value, []string{"between", "rho"}))
			}
			return nil
		})
		if err != nil {
			return err
		}
		if names == nil || !rhoSet {
			return p.errf(n.Line, "correlations", "", "each entry needs between: [a, b] and rho:")
		}
		idx := [2]int{-1, -1}
		for j, nm := range names {
			path, err := ResolvePath(nm)
			if err != nil {
				var e *Error
				errors.As(err, &e)
				return p.errf(nameLine, "correlations.between", nm, "%s", e.Msg)
			}
			for i, v := range s.Problem.Vars {
				if v.Name == path {
					idx[j] = i
				}
			}
			if idx[j] < 0 && s.CaseHeld(path) {
				return p.errf(nameLine, "correlations.between", nm, "is drawn in each load case once loads.cases is given (loads.cases.NAME.%s), and load-case values cannot be correlated; correlate inputs outside the load cases", path[strings.LastIndex(path, ".")+1:])
			}
			if idx[j] < 0 {
				return p.errf(nameLine, "correlations.between", nm, "is not uncertain: give it a distribution first")
			}
		}
		if idx[0] == idx[1] {
			return p.errf(nameLine, "correlations.between", names[0], "an input cannot be correlated with itself")
		}
		s.Problem.Corr = append(s.Problem.Corr, montecarlo.Correlation{I: idx[0], J: idx[1], Rho: rho})
	}
	if len(s.Problem.Corr) > 0 {
		if _, err := montecarlo.NewCopula(len(s.Problem.Vars), s.Problem.Corr); err != nil {
			line := 0
			if len(r.corr) > 0 {
				line = r.corr[0].Line
			}
			return p.errf(line, "correlations", "", "%v", err)
		}
	}
	return nil
}
