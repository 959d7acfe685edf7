package report

import (
	"fmt"
	"io"

	"boltrisk/model/units"
	"boltrisk/montecarlo/scenario"
)

// DataDoc says how an input's distribution was fitted to the user's test
// data when the scenario was loaded.
type DataDoc struct {
	File   string `json:"file"`   // as written in the scenario
	SHA256 string `json:"sha256"` // of the file's bytes
	Column string `json:"column"`
	N      int    `json:"n"`    // values fitted
	Rows   int    `json:"rows"` // data rows read (blank cells included)
	// Family fitted; FamilyChosen: by the smallest AIC of normal,
	// lognormal and Weibull (the scenario named none).
	Family       string `json:"family" jsonschema:"enum=normal,enum=lognormal,enum=weibull,enum=truncnormal,enum=uniform,enum=triangular"`
	FamilyChosen bool   `json:"family_chosen"`
	// Predictive: the posterior predictive is sampled (distribution), not
	// the plug-in fit.
	Predictive bool `json:"predictive"`
	// Fit is the plug-in maximum-likelihood fit (internal units).
	Fit *DistDoc `json:"fit"`
	// SampleMean and SampleSD of the data (SD with divisor n − 1), internal units.
	SampleMean float64 `json:"sample_mean"`
	SampleSD   float64 `json:"sample_sd"`
	// FitDisplay is the plug-in fit with units, for people.
	FitDisplay string   `json:"fit_display"`
	Method     string   `json:"method"`
	Notes      []string `json:"notes,omitempty"`
}

func dataDoc(s *scenario.Scenario, path string, sys units.System) *DataDoc {
	for i := range s.Data {
		ds := &s.Data[i]
		if ds.Input != path {
			continue
		}
		doc := &DataDoc{File: ds.File, SHA256: ds.SHA256, Column: ds.Column, N: ds.N, Rows: ds.Rows, Family: ds.Family.String(),
			FamilyChosen: ds.FamilyChosen, Predictive: ds.Predictive, Fit: distDoc(&ds.Fit), SampleMean: ds.Mean, SampleSD: ds.SD,
			Method: ds.Method(), Notes: ds.Notes}
		dim := scenario.FieldDim(path)
		doc.FitDisplay = ds.Fit.Describe(func(v float64) string { return sys.Format(v, dim) })
		return doc
	}
	return nil
}

// dataLine describes one fitted input for people.
func dataLine(label string, d *DataDoc) string {
	return fmt.Sprintf("%s: %s column %q (SHA-256 %s), n = %d; %s; plug-in fit %s", label, d.File, d.Column, d.SHA256, d.N, d.Method, d.FitDisplay)
}

// writeDataLines lists the inputs fitted to test data below the inputs.
func writeDataLines(w io.Writer, inputs []InputDoc) {
	first := true
	for _, r := range inputs {
		if r.Data == nil {
			continue
		}
		if first {
			fmt.Fprintln(w, "\nFitted to test data")
			first = false
		}
		fmt.Fprintln(w, "  "+dataLine(r.Label, r.Data))
	}
}

// dataParagraphs are the review's lines on inputs fitted to test data.
func dataParagraphs(s *scenario.Scenario, sys units.System) []string {
	var out []string
	for i := range s.Data {
		out = append(out, "Fitted to test data — "+dataLine(s.Data[i].Input, dataDoc(s, s.Data[i].Input, sys))+".")
	}
	return out
}

// dataRows are the provenance rows of the data files a scenario read.
func dataRows(s *scenario.Scenario, seen map[string]bool) [][2]string {
	var rows [][2]string
	for _, ds := range s.Data {
		if seen[ds.Resolved+ds.SHA256] {
			continue
		}
		seen[ds.Resolved+ds.SHA256] = true
		rows = append(rows, [2]string{"data " + ds.File, "SHA-256 " + ds.SHA256})
	}
	return rows
}
