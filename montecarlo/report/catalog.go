package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// CatalogTopics are the built-in tables 'boltrisk catalog' prints.
var CatalogTopics = []string{"threads", "classes", "materials", "conditions", "tools", "inputs", "modes"}

// CatalogTable is one built-in table: a header (keys of the JSON objects and
// CSV columns), rows of text cells, and the sources below it.
type CatalogTable struct {
	Topic  string
	Header []string
	Rows   [][]string
	Note   string
}

func g(v float64) string { return fmt.Sprintf("%.6g", v) }

func dash(v float64) string {
	if v == 0 {
		return ""
	}
	return g(v)
}

// Catalog returns the built-in table of a topic.
func Catalog(topic string) (CatalogTable, error) {
	t := CatalogTable{Topic: topic}
	switch topic {
	case "threads":
		t.Header = []string{"name", "series", "d_mm", "pitch_mm", "d2_mm", "minor_mm", "stress_area_mm2", "stress_area_in2"}
		for _, th := range model.Threads() {
			t.Rows = append(t.Rows, []string{th.Name, th.Series, g(th.D), g(th.Pitch), g(th.PitchDia), g(th.MinorDia), fmt.Sprintf("%.2f", th.StressArea), fmt.Sprintf("%.4f", th.StressArea/645.16)})
		}
		t.Note = "Sources: ISO 261/262/724 and ISO 898-1 (metric); ASME B1.1 (unified); areas from the standards' formulas."
	case "classes":
		t.Header = []string{"class", "standard", "min_d_mm", "max_d_mm", "proof_MPa", "yield_MPa", "tensile_MPa", "endurance_MPa", "note"}
		for _, c := range model.PropertyClasses() {
			t.Rows = append(t.Rows, []string{c.Name, c.Standard, dash(c.MinD), dash(c.MaxD), g(c.Proof), g(c.Yield), g(c.Tensile), dash(c.Endurance), c.Note})
		}
		t.Note = "Endurance: fully corrected endurance strength of rolled threads, Shigley 9th ed. Table 8-17."
	case "materials":
		t.Header = []string{"material", "modulus_GPa", "poisson", "wileman_a", "wileman_b", "fy_MPa", "fu_MPa", "source"}
		for _, m := range model.Materials() {
			t.Rows = append(t.Rows, []string{m.Name, g(m.Modulus / 1000), g(m.Poisson), dash(m.WilemanA), dash(m.WilemanB), dash(m.Yield), dash(m.Tensile), m.Source})
		}
	case "conditions":
		t.Header = []string{"condition", "nut_factor", "nut_factor_cov", "friction_lo", "friction_hi", "friction_class", "description", "source"}
		for _, c := range scenario.Conditions {
			t.Rows = append(t.Rows, []string{c.Name, g(c.NutFactor), g(c.NutFactorCOV), g(c.FrictionLo), g(c.FrictionHi), c.FrictionClass, c.Description, c.Source})
		}
	case "tools":
		t.Header = []string{"tool", "controls", "tolerance_3sigma", "description", "source"}
		for _, tl := range scenario.Tools {
			t.Rows = append(t.Rows, []string{tl.Name, tl.Controls, g(tl.Tolerance), tl.Description, tl.Source})
		}
	case "inputs":
		t.Header = []string{"path", "unit", "per_bolt", "meaning"}
		for _, f := range scenario.Fields() {
			u, _ := units.SI.Unit(f.Dim)
			if u == "" {
				u = f.Dim.String()
			}
			t.Rows = append(t.Rows, []string{f.Path, u, fmt.Sprint(f.Role&montecarlo.PerBolt != 0), f.Help})
		}
	case "modes":
		t.Header = []string{"key", "title", "scope", "fails_when", "source"}
		for m := range model.NumModes {
			i := m.Info()
			scope := "bolt"
			if i.Scope == model.PerJoint {
				scope = "joint"
			}
			t.Rows = append(t.Rows, []string{i.Key, i.Title, scope, i.Formula, i.Source})
		}
	default:
		return t, fmt.Errorf("unknown catalogue %q (allowed: %s)", topic, strings.Join(CatalogTopics, ", "))
	}
	return t, nil
}

// WriteText writes the table aligned for a terminal.
func (t CatalogTable) WriteText(w io.Writer) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, strings.Join(t.Header, "\t")+"\t")
	for _, r := range t.Rows {
		fmt.Fprintln(tw, strings.Join(r, "\t")+"\t")
	}
	tw.Flush()
	if t.Note != "" {
		fmt.Fprintln(w, "\n"+t.Note)
	}
}

// Objects returns the rows as JSON objects keyed by the header.
func (t CatalogTable) Objects() []map[string]string {
	out := make([]map[string]string, len(t.Rows))
	for i, r := range t.Rows {
		o := map[string]string{}
		for j, h := range t.Header {
			o[h] = r[j]
		}
		out[i] = o
	}
	return out
}
