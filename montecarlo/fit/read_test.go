package fit

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"boltrisk/model/units"
)

func TestReadColumn(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name, csv string
		spec      Spec
		want      []float64 // internal units
		dim       units.Dim
		unit      string
		blank     []int
		note      string
	}{
		{name: "plain", csv: "id,life\n1,17.88\n2,28.92\n", spec: Spec{Column: "life"}, want: []float64{17.88, 28.92}},
		{name: "unit of bare numbers", csv: "F\n31.2\n30.1\n", spec: Spec{Column: "F", Unit: "kN"}, want: []float64{31200, 30100}, dim: units.Force, unit: "kN"},
		{name: "units in cells", csv: "F\n31.2 kN\n30100 N\n", spec: Spec{Column: "F"}, want: []float64{31200, 30100}, dim: units.Force, unit: "kN"},
		{name: "cells override the given unit", csv: "T\n52 N*m\n51000\n", spec: Spec{Column: "T", Unit: "N*mm"}, want: []float64{52000, 51000}, dim: units.Torque, unit: "N*mm"},
		{name: "percentages", csv: "k\n5%\n6 %\n", spec: Spec{Column: "k"}, want: []float64{0.05, 0.06}, dim: units.Fraction, unit: "%"},
		{name: "blank cells skipped", csv: "a,b\n1,2\n3,\n,\n5,6\n", spec: Spec{Column: "b"}, want: []float64{2, 6}, blank: []int{3, 4}, note: "2 blank cells skipped (rows 3, 4)"},
		{name: "short row is blank", csv: "a,b\n1,2\n3\n5,6\n", spec: Spec{Column: "b"}, want: []float64{2, 6}, blank: []int{3}},
		{name: "semicolons and decimal commas", csv: "nr;Vorspannkraft\n1;31,2\n2;30,5\n", spec: Spec{Column: "Vorspannkraft", Unit: "kN"}, want: []float64{31200, 30500}, dim: units.Force, unit: "kN", note: "decimal commas"},
		{name: "tabs", csv: "a\tb\n1\t2.5\n2\t3.5\n", spec: Spec{Column: "b"}, want: []float64{2.5, 3.5}},
		{name: "byte-order mark and case", csv: "\ufeffPreload\n1\n2\n", spec: Spec{Column: "preload"}, want: []float64{1, 2}, note: `column "Preload" read for "preload"`},
		{name: "quoted cells and CRLF", csv: "\"a, b\",c\r\n\"1\",\"2e3\"\r\n3,4\r\n", spec: Spec{Column: "a, b"}, want: []float64{1, 3}},
	} {
		col, err := ReadColumn(strings.NewReader(c.csv), c.spec)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(col.Values) != len(c.want) {
			t.Errorf("%s: %v, want %v", c.name, col.Values, c.want)
			continue
		}
		for i := range c.want {
			if math.Abs(col.Values[i]-c.want[i]) > 1e-9*math.Abs(c.want[i]) {
				t.Errorf("%s: value %d = %g, want %g", c.name, i, col.Values[i], c.want[i])
			}
		}
		if col.Dim != c.dim || col.Unit != c.unit {
			t.Errorf("%s: dimension %v unit %q, want %v %q", c.name, col.Dim, col.Unit, c.dim, c.unit)
		}
		if fmt.Sprint(col.Blank) != fmt.Sprint(c.blank) && !(len(col.Blank) == 0 && len(c.blank) == 0) {
			t.Errorf("%s: blank rows %v, want %v", c.name, col.Blank, c.blank)
		}
		if c.note != "" && !strings.Contains(strings.Join(col.Notes, "; "), c.note) {
			t.Errorf("%s: notes %q lack %q", c.name, col.Notes, c.note)
		}
	}
}

// Every bad input is an error naming the file, the row and the column
// where there is one, and saying what is wrong.
func TestReadColumnErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name, csv string
		spec      Spec
		row       int
		col       string
		want      []string // fragments of the message
	}{
		{"empty file", "", Spec{Column: "x"}, 0, "", []string{"data.csv", "empty"}},
		{"header only", "x,y\n", Spec{Column: "x"}, 0, "x", []string{"no data rows"}},
		{"all blank", "x,y\n,1\n,2\n", Spec{Column: "x"}, 2, "x", []string{"all 2 cells are blank"}},
		{"one value", "x\n\n4.2\n", Spec{Column: "x"}, 3, "x", []string{"single value (4.2)", "at least 2"}},
		{"constant", "x\n3 kN\n3000 N\n3 kN\n", Spec{Column: "x"}, 2, "x", []string{"every one of the 3 values is 3 kN", "constant"}},
		{"missing column", "id,preload,torque\n1,2,3\n", Spec{Column: "prelaod"}, 1, "", []string{`no column "prelaod"`, `did you mean "preload"?`, `columns: "id", "preload", "torque"`}},
		{"missing column, nothing close", "id,preload\n1,2\n", Spec{Column: "stiffness"}, 1, "", []string{`no column "stiffness"`, `columns: "id", "preload"`}},
		{"no column named", "a\n1\n", Spec{}, 1, "", []string{"no column named"}},
		{"duplicate column", "a,a\n1,2\n", Spec{Column: "a"}, 1, "", []string{"two columns are named"}},
		{"non-numeric", "x\n1\nabc\n3\n", Spec{Column: "x"}, 3, "x", []string{`"abc" is not a number`}},
		{"several non-numeric", "x\n1\nn/a\n3\n—\n", Spec{Column: "x"}, 3, "x", []string{"2 cells are not", `row 3 "n/a"`, `row 5 "—"`}},
		{"NaN", "x\n1\nNaN\n3\n", Spec{Column: "x"}, 3, "x", []string{`"NaN"`, "leave the cell blank"}},
		{"Inf", "x\n1\n+Inf\n3\n", Spec{Column: "x"}, 3, "x", []string{`"+Inf"`}},
		{"hexadecimal", "x\n1\n0x1p3\n3\n", Spec{Column: "x"}, 3, "x", []string{`"0x1p3"`}},
		{"decimal comma with comma separator", "x;y\n\"1,5\";2\n", Spec{Column: "x", Comma: ','}, 1, "", []string{`no column "x"`}},
		{"decimal comma in a quoted cell", "x,y\n\"1,5\",2\n\"2,5\",3\n", Spec{Column: "x"}, 2, "x", []string{"decimal comma?"}},
		{"unknown unit", "x\n1 kN\n2 furlong\n", Spec{Column: "x"}, 3, "x", []string{`unknown unit "furlong"`}},
		{"mixed dimensions", "x\n1 kN\n2 mm\n", Spec{Column: "x"}, 3, "x", []string{`"2 mm" is a length`, "force values (row 2)", "mixed dimensions"}},
		{"mixed with given unit", "x\n1\n2 MPa\n", Spec{Column: "x", Unit: "kN"}, 3, "x", []string{"stress", "the unit given for the column"}},
		{"bare numbers among units", "x\n1 kN\n2\n3\n", Spec{Column: "x"}, 3, "x", []string{"2 bare numbers without a unit", `row 2 carries "kN"`, "rows 3, 4"}},
		{"bad given unit", "x\n1\n2\n", Spec{Column: "x", Unit: "furlong"}, 0, "x", []string{`unit "furlong"`}},
		{"binary", "x\n\x00\x01\x02\x03", Spec{Column: "x"}, 2, "", []string{"binary file", "offset 2"}},
		{"UTF-16", "\xff\xfex\x00\n\x00", Spec{Column: "x"}, 1, "", []string{"UTF-16"}},
		{"Latin-1 header", "Pr\xfcfkraft\n1\n2\n", Spec{Column: "Prüfkraft"}, 1, "", []string{"not UTF-8", "Latin-1"}},
		{"Latin-1 cell", "x\n1\n2\xb0\n", Spec{Column: "x"}, 3, "x", []string{"not UTF-8"}},
		{"bad quoting", "x\n1\n\"2\n3\n", Spec{Column: "x"}, 3, "", []string{"not valid CSV"}},
	} {
		c.spec.File = "data.csv"
		_, err := ReadColumn(strings.NewReader(c.csv), c.spec)
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		var de *DataError
		if !errors.As(err, &de) {
			t.Errorf("%s: %T is not a *DataError: %v", c.name, err, err)
			continue
		}
		if de.File != "data.csv" || de.Row != c.row || de.Column != c.col {
			t.Errorf("%s: file %q row %d column %q, want row %d column %q (%v)", c.name, de.File, de.Row, de.Column, c.row, c.col, err)
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q lacks %q", c.name, err, w)
			}
		}
	}
}

func TestReadColumnProgress(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	b.WriteString("x\n")
	for i := range 200000 {
		fmt.Fprintf(&b, "%d\n", i)
	}
	size := int64(b.Len())
	var calls, last int
	var lastBytes int64
	col, err := ReadColumn(&b, Spec{Column: "x", Progress: func(rows int, n int64) { calls++; last, lastBytes = rows, n }})
	if err != nil {
		t.Fatal(err)
	}
	if len(col.Values) != 200000 || calls != 200000/progressEvery+1 || last != 200000 || lastBytes != size {
		t.Errorf("%d values, %d progress calls, last %d rows %d bytes of %d", len(col.Values), calls, last, lastBytes, size)
	}
}

// BenchmarkReadColumn reads 10⁶ rows of three columns, one with units.
func BenchmarkReadColumn(b *testing.B) {
	for _, c := range []struct {
		name string
		cell func(i int) string
	}{
		{"bare", func(i int) string { return fmt.Sprintf("%.3f", 30+float64(i%1000)/100) }},
		{"units", func(i int) string { return fmt.Sprintf("%.3f kN", 30+float64(i%1000)/100) }},
	} {
		var buf bytes.Buffer
		buf.WriteString("id,preload,operator\n")
		for i := range 1000000 {
			fmt.Fprintf(&buf, "%d,%s,A%d\n", i, c.cell(i), i%7)
		}
		data := buf.Bytes()
		b.Run(c.name, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			for b.Loop() {
				col, err := ReadColumn(bytes.NewReader(data), Spec{Column: "preload", Unit: "kN"})
				if err != nil || len(col.Values) != 1000000 {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/1e6, "ns/row")
		})
	}
}
