package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// CaseDoc is the estimate of each mode in one load case (loads.cases):
// every mode is checked in every case, and the document's modes are the
// all-case probabilities (a mode fails when it fails in any case).
type CaseDoc struct {
	Name  string    `json:"name"`
	Modes []ProbDoc `json:"modes"` // in the order of the document's modes, then "any"
}

func caseDocs(r *montecarlo.Result) []CaseDoc {
	var out []CaseDoc
	for _, c := range r.Cases {
		d := CaseDoc{Name: c.Name}
		for _, m := range c.Modes {
			d.Modes = append(d.Modes, probDoc(m.Mode.Key(), m.Mode.Title(), m.Estimate))
		}
		d.Modes = append(d.Modes, probDoc("any", "Any mode", c.Any))
		out = append(out, d)
	}
	return out
}

// writeCases writes the per-case table: one column per case.
func writeCases(w io.Writer, cases []CaseDoc) {
	if len(cases) == 0 {
		return
	}
	names := make([]string, len(cases))
	for i, c := range cases {
		names[i] = c.Name
	}
	fmt.Fprintf(w, "\nLoad cases (%s): static modes checked in each case, fatigue and fatigue_life in the first (the service case); the table above is all cases together (a mode fails when it fails in any case)\n", strings.Join(names, ", "))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "  mode\t%s\t\n", strings.Join(names, "\t"))
	for i, m := range cases[0].Modes {
		row := []string{m.Title}
		for _, c := range cases {
			row = append(row, FormatProb(c.Modes[i]))
		}
		fmt.Fprintf(tw, "  %s\t\n", strings.Join(row, "\t"))
	}
	tw.Flush()
}

// casesTable is the review table of the load cases.
func casesTable(cases []CaseDoc) *Table {
	t := &Table{Header: []string{"mode"}}
	for _, c := range cases {
		t.Header = append(t.Header, c.Name)
	}
	for i, m := range cases[0].Modes {
		row := []string{m.Title}
		for _, c := range cases {
			row = append(row, FormatProb(c.Modes[i]))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// caseInputs documents the values of the load cases (loads.cases.NAME.KEY):
// axial loads always, shear and temperature change when given.
func caseInputs(s *scenario.Scenario, sys units.System) []InputDoc {
	var out []InputDoc
	keys := [montecarlo.NumCaseSlots]string{"axial_max", "axial_min", "shear", "temperature_change"}
	dims := [montecarlo.NumCaseSlots]units.Dim{units.Force, units.Force, units.Force, units.TempDiff}
	for _, c := range s.Problem.Cases {
		for slot, key := range keys {
			path := "loads.cases." + c.Name + "." + key
			v, unc := s.Uncertain(path)
			if slot >= 2 && c.Values[slot] == 0 && !unc {
				continue
			}
			dim := dims[slot]
			f := func(x float64) string { return sys.Format(x, dim) }
			d := InputDoc{Path: path, Label: c.Name + ": " + strings.ReplaceAll(key, "_", " "), Dimension: dim.Key(), Unit: internalUnit(dim),
				Nominal: c.Values[slot], Display: f(c.Values[slot])}
			if unc {
				d.Distribution = distDoc(&v.Dist)
				d.Display = v.Dist.Describe(f)
			}
			out = append(out, d)
		}
	}
	return out
}
