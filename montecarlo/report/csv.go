package report

import (
	"encoding/csv"
	"io"
	"strconv"
)

// Tables for spreadsheets: one header row and one row per record, values in
// the internal SI units named in the header, written by encoding/csv.

func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func probCells(p ProbDoc) []string {
	cov := ""
	if p.COV != nil {
		cov = num(*p.COV)
	}
	return []string{p.Key, num(p.Probability), cov, num(p.CILow), num(p.CIHigh), p.Interval, strconv.FormatInt(p.Failures, 10), strconv.FormatInt(p.Samples, 10)}
}

var probHeader = []string{"mode", "probability", "cov", "ci_low", "ci_high", "interval", "failures", "samples"}

func writeCSV(w io.Writer, rows [][]string) error {
	cw := csv.NewWriter(w)
	if err := cw.WriteAll(rows); err != nil {
		return err
	}
	return cw.Error()
}

// WriteSimulationCSV writes the mode table of a simulation: one row per
// mode and one for any mode.
func WriteSimulationCSV(w io.Writer, doc SimDoc) error {
	rows := [][]string{append(append([]string{}, probHeader...), "nominal_safety_factor", "method", "evaluations")}
	for _, p := range doc.Modes {
		sf := ""
		if p.NominalSF != nil {
			sf = num(*p.NominalSF)
		}
		rows = append(rows, append(probCells(p), sf, doc.Method, strconv.FormatInt(doc.Evaluations, 10)))
	}
	return writeCSV(w, rows)
}

// WriteSweepCSV writes a sweep: one row per step and mode, with bounds.
func WriteSweepCSV(w io.Writer, doc SweepDoc) error {
	if doc.Spread != nil {
		sp := doc.Spread
		return writeCSV(w, [][]string{{"input", "target_probability", "spread_factor", "sd", "cov", "unit", "any_mode_probability"},
			{sp.Input, num(sp.Target), num(sp.Factor), num(sp.SD), num(sp.COV), sp.Unit, num(sp.Probability)}})
	}
	head := append([]string{doc.Vary.Input + valueUnit(doc.Vary.Unit), "valid_samples", "too_few_valid"}, probHeader...)
	rows := [][]string{head}
	for _, st := range doc.Steps {
		for _, p := range st.Modes {
			rows = append(rows, append([]string{num(st.Value), strconv.FormatInt(st.ValidSamples, 10), strconv.FormatBool(st.TooFewValid)}, probCells(p)...))
		}
	}
	return writeCSV(w, rows)
}

func valueUnit(u string) string {
	if u == "" {
		return ""
	}
	return " (" + u + ")"
}

// WriteCompareCSV writes a comparison: one row per mode and variant, with
// the paired difference from the base.
func WriteCompareCSV(w io.Writer, doc CompareDoc) error {
	head := append(append([]string{"variant"}, probHeader...), "difference", "diff_ci_low", "diff_ci_high", "p_value", "verdict")
	rows := [][]string{head}
	for vi, v := range doc.Variants {
		for mi, p := range v.Modes {
			row := append([]string{v.Name}, probCells(p)...)
			if vi == 0 {
				row = append(row, "", "", "", "", "")
			} else {
				d := doc.Differences[vi-1].Modes[mi]
				row = append(row, num(d.Difference), num(d.CILow), num(d.CIHigh), num(d.PValue), d.Verdict)
			}
			rows = append(rows, row)
		}
	}
	return writeCSV(w, rows)
}

// WriteRowsCSV writes a header and rows (the catalogues).
func WriteRowsCSV(w io.Writer, header []string, rows [][]string) error {
	return writeCSV(w, append([][]string{header}, rows...))
}

// WriteLifeCSV writes the reliability curve of a service-life run: one row
// per point of the document's grid (cycles, R(N) and its interval).
func WriteLifeCSV(w io.Writer, doc LifeDoc) error {
	rows := [][]string{{"cycles", "reliability", "ci_low", "ci_high"}}
	for _, p := range doc.Reliability {
		rows = append(rows, []string{num(p.Cycles), num(p.Reliability), num(p.Lower), num(p.Upper)})
	}
	return writeCSV(w, rows)
}
