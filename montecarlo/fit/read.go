package fit

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"boltrisk/model/units"
)

// Quantity says what the values of a column are and how to show them: a
// value v in internal units (N, mm, MPa, N·mm; plain for numbers) reads
// v/Scale in Unit.
type Quantity struct {
	Dim   units.Dim
	Unit  string  // display unit ("kN", "%"); "" for plain numbers
	Scale float64 // internal units per display unit (1000 for kN); 0 means 1
}

func (q Quantity) scale() float64 {
	if q.Scale == 0 {
		return 1
	}
	return q.Scale
}

// Format writes an internal value with 4 significant digits (trailing
// zeros dropped) and the unit.
func (q Quantity) Format(v float64) string {
	s := sig(v/q.scale(), 4)
	switch q.Unit {
	case "":
		return s
	case "%":
		return s + "%"
	}
	return s + " " + q.Unit
}

// Spec names the column to read and how to read its cells.
type Spec struct {
	File   string // name of the input in messages; "" reads "input"
	Column string // header of the column to read
	// Unit is the unit of bare numbers ("kN", "N*m", "%"). Empty: bare
	// numbers are plain numbers, unless other cells carry units, in which
	// case every cell must carry one.
	Unit string
	// Comma is the field separator; 0 sniffs it from the header line
	// (comma, semicolon or tab). With a semicolon or tab separator a decimal
	// comma ("31,2") is read as a decimal point.
	Comma rune
	// Progress, if set, is called every 65 536 data rows and once at the
	// end with the data rows and the bytes read so far.
	Progress func(rows int, bytes int64)
}

// Column is a column of numbers read from a CSV file.
type Column struct {
	File, Name string
	Quantity             // dimension and display unit of the values
	Values     []float64 // in internal units, in file order, blank cells left out
	Lines      []int32   // file row of each value (the header is row 1)
	Rows       int       // data rows read (blank cells included)
	Blank      []int     // file rows (the header is row 1) of blank cells, skipped
	Notes      []string
}

// DataError is a problem with an input file: it names the file, the row
// (1 is the header; 0 when it is about no row in particular) and the
// column.
type DataError struct {
	File   string
	Row    int    // first row concerned, 0 for none
	Column string // "" when about no column
	Msg    string
}

func (e *DataError) Error() string {
	var b strings.Builder
	b.WriteString("fit: ")
	b.WriteString(e.File)
	if e.Column != "" {
		fmt.Fprintf(&b, ", column %q", e.Column)
	}
	if e.Row > 0 {
		fmt.Fprintf(&b, ", row %d", e.Row)
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

func cellLine(cs *csv.Reader, idx int) int {
	line, _ := cs.FieldPos(idx)
	return line
}

// sig is units.Sig without the trailing zeros of the decimals.
func sig(v float64, n int) string {
	s := units.Sig(v, n)
	if strings.Contains(s, ".") && !strings.ContainsAny(s, "eE") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	return s
}

var errNotDecimal = errors.New("not a decimal number")

// progressEvery is the number of data rows between progress calls.
const progressEvery = 1 << 16

// countingReader counts the bytes pulled from the underlying reader.
type countingReader struct {
	r io.Reader
	n int64
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += int64(n)
	return n, err
}

// unitInfo is a unit of the column: its dimension and internal units per unit.
type unitInfo struct {
	dim    units.Dim
	factor float64
}

// dimOf finds the dimension of a unit name by asking units.Parse each
// dimension in turn.
func dimOf(unit string) (unitInfo, bool) {
	for _, d := range []units.Dim{units.Fraction, units.Force, units.Length, units.Stress, units.Torque, units.Stiffness} {
		if d == units.Fraction && strings.TrimSpace(unit) != "%" {
			continue
		}
		if f, err := units.Parse("1 "+unit, d); err == nil {
			return unitInfo{d, f}, true
		}
	}
	return unitInfo{}, false
}

// ReadColumn reads the named column of a CSV file with a header row. Values
// come back in internal units; see [Spec] for the unit rules. Blank cells are
// skipped and listed; cells that are not numbers, cells in a unit of another
// dimension, a missing column (with a did-you-mean over the header), an
// empty, one-value or constant column, a binary or non-UTF-8 file are
// errors naming the file, the row and the column ([*DataError]).
func ReadColumn(r io.Reader, s Spec) (*Column, error) {
	file := s.File
	if file == "" {
		file = "input"
	}
	fail := func(row int, col, format string, a ...any) error {
		return &DataError{File: file, Row: row, Column: col, Msg: fmt.Sprintf(format, a...)}
	}
	cr := &countingReader{r: r}
	br := bufio.NewReaderSize(cr, 1<<16)
	head, err := br.Peek(1 << 16)
	if err != nil && err != io.EOF && !errors.Is(err, bufio.ErrBufferFull) {
		return nil, fail(0, "", "cannot read: %v", err)
	}
	if len(bytes.TrimSpace(head)) == 0 {
		return nil, fail(0, "", "the file is empty: a CSV file with a header row is needed")
	}
	if bytes.HasPrefix(head, []byte{0xff, 0xfe}) || bytes.HasPrefix(head, []byte{0xfe, 0xff}) {
		return nil, fail(1, "", "the file is UTF-16 text; save it as UTF-8 CSV")
	}
	if i := bytes.IndexByte(head, 0); i >= 0 {
		return nil, fail(1+bytes.Count(head[:i], []byte{'\n'}), "", "this is a binary file, not CSV text (a zero byte at offset %d)", i)
	}
	comma := s.Comma
	if comma == 0 {
		comma = sniffComma(head)
	}
	cs := csv.NewReader(br)
	cs.Comma = comma
	cs.FieldsPerRecord = -1
	cs.ReuseRecord = true
	cs.TrimLeadingSpace = true

	header, err := cs.Read()
	if err != nil {
		return nil, fail(1, "", "cannot read the header row: %v", csvReason(err))
	}
	names := make([]string, len(header))
	for i, h := range header {
		if !utf8.ValidString(h) {
			return nil, fail(1, "", "header cell %d is not UTF-8 text (the file may be in Latin-1 or Windows-1252: save it as UTF-8)", i+1)
		}
		if i == 0 {
			h = strings.TrimPrefix(h, "\ufeff")
		}
		names[i] = strings.TrimSpace(h)
	}
	idx, err := findColumn(names, s.Column)
	if err != nil {
		return nil, fail(1, "", "%v", err)
	}
	col := &Column{File: file, Name: names[idx]}
	if names[idx] != s.Column {
		col.Notes = append(col.Notes, fmt.Sprintf("column %q read for %q", names[idx], s.Column))
	}

	// The column's unit: from Spec.Unit, else from the first cell with a unit.
	var colUnit unitInfo
	haveUnit := false
	specFactor := 1.0
	if s.Unit != "" {
		u, ok := dimOf(s.Unit)
		if !ok {
			return nil, fail(0, col.Name, "unit %q of bare numbers is not a unit of force, length, stress, torque, stiffness or a percentage", s.Unit)
		}
		colUnit, haveUnit, specFactor = u, true, u.factor
		col.Quantity = Quantity{Dim: u.dim, Unit: strings.TrimSpace(s.Unit), Scale: u.factor}
	}
	decimalComma := comma != ','
	var (
		lastUnit  string
		lastInfo  unitInfo
		seen      = map[string]unitInfo{}
		bad       []badCell
		bareRows  []int // first rows of bare numbers
		bare      int   // bare numbers in all
		firstUnit = 0   // row of the first cell carrying a unit
		commaUsed = false
	)
	rows := 0
	firstRow := 0 // file row of the first value
	for {
		rec, err := cs.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			line := 0
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				line = pe.StartLine
			}
			return nil, fail(line, "", "not valid CSV: %v", csvReason(err))
		}
		rows++
		if s.Progress != nil && rows%progressEvery == 0 {
			s.Progress(rows, cr.n)
		}
		if idx >= len(rec) {
			line, _ := cs.FieldPos(0)
			col.Blank = append(col.Blank, line)
			continue
		}
		cell := strings.TrimSpace(rec[idx])
		if cell == "" {
			line, _ := cs.FieldPos(idx)
			col.Blank = append(col.Blank, line)
			continue
		}
		if firstRow == 0 {
			firstRow, _ = cs.FieldPos(idx)
		}
		// Fast path: a bare finite number.
		var v float64
		perr := errNotDecimal
		if isDecimal(cell) { // before ParseFloat, whose errors allocate
			v, perr = strconv.ParseFloat(cell, 64)
		}
		if perr == nil && !math.IsInf(v, 0) {
			if s.Unit != "" {
				v *= specFactor
			} else {
				bare++
				if len(bareRows) < 10 {
					line, _ := cs.FieldPos(idx)
					bareRows = append(bareRows, line)
				}
			}
			col.Values = append(col.Values, v)
			col.Lines = append(col.Lines, int32(cellLine(cs, idx)))
			continue
		}
		viaComma := false
		if decimalComma && strings.Count(cell, ",") == 1 && !strings.Contains(cell, ".") {
			c2 := strings.Replace(cell, ",", ".", 1)
			if v, perr := strconv.ParseFloat(c2, 64); perr == nil && isDecimal(c2) && !math.IsInf(v, 0) {
				commaUsed = true
				if s.Unit != "" {
					v *= specFactor
				} else {
					bare++
					if len(bareRows) < 10 {
						line, _ := cs.FieldPos(idx)
						bareRows = append(bareRows, line)
					}
				}
				col.Values = append(col.Values, v)
				col.Lines = append(col.Lines, int32(cellLine(cs, idx)))
				continue
			}
			cell, viaComma = c2, true
		}
		num, unit := splitUnit(cell)
		line, _ := cs.FieldPos(idx)
		if unit == "" || num == "" {
			bad = append(bad, badCell{line, rec[idx], ""})
			continue
		}
		v, perr = strconv.ParseFloat(num, 64)
		if perr != nil || math.IsNaN(v) || math.IsInf(v, 0) || !isDecimal(num) {
			bad = append(bad, badCell{line, rec[idx], ""})
			continue
		}
		info := lastInfo
		if unit != lastUnit {
			var ok bool
			if info, ok = seen[unit]; !ok {
				if info, ok = dimOf(unit); !ok {
					bad = append(bad, badCell{line, rec[idx], "unknown unit " + strconv.Quote(unit)})
					continue
				}
				seen[unit] = info
			}
			lastUnit, lastInfo = unit, info
		}
		if !haveUnit {
			colUnit, haveUnit = info, true
			firstUnit = line
			col.Quantity = Quantity{Dim: info.dim, Unit: unit, Scale: info.factor}
		} else if info.dim != colUnit.dim {
			where := "the unit given for the column"
			if firstUnit != 0 {
				where = fmt.Sprintf("row %d", firstUnit)
			}
			return nil, fail(line, col.Name, "%q is a %s, but the column holds %s values (%s): mixed dimensions", rec[idx], info.dim, colUnit.dim, where)
		}
		col.Values = append(col.Values, v*info.factor)
		col.Lines = append(col.Lines, int32(line))
		commaUsed = commaUsed || viaComma
	}
	col.Rows = rows
	if s.Progress != nil {
		s.Progress(rows, cr.n)
	}
	if len(bad) > 0 {
		return nil, badCellsError(file, col.Name, col.Quantity.Dim, bad)
	}
	if firstUnit != 0 && s.Unit == "" && bare > 0 && col.Dim != units.Fraction {
		more := ""
		if bare > len(bareRows) {
			more = fmt.Sprintf(" and %d more", bare-len(bareRows))
		}
		return nil, fail(bareRows[0], col.Name, "%s without a unit, while row %d carries %q: write the unit in every cell, or give the unit of bare numbers (rows %s%s)",
			plural(bare, "bare number", "bare numbers"), firstUnit, col.Unit, strings.Trim(strings.Join(strings.Fields(fmt.Sprint(bareRows)), ", "), "[]"), more)
	}
	if commaUsed {
		col.Notes = append(col.Notes, "decimal commas read as decimal points")
	}
	if col.Scale == 0 {
		col.Scale = 1
	}
	if len(col.Blank) > 0 {
		col.Notes = append(col.Notes, fmt.Sprintf("%s skipped%s", plural(len(col.Blank), "blank cell", "blank cells"), rowList(col.Blank)))
	}
	switch len(col.Values) {
	case 0:
		if rows == 0 {
			return nil, fail(0, col.Name, "no data rows below the header")
		}
		return nil, fail(2, col.Name, "no values: all %d cells are blank", rows)
	case 1:
		return nil, fail(firstRow, col.Name, "a single value (%s): a fit needs at least 2", col.Format(col.Values[0]))
	}
	lo, hi := col.Values[0], col.Values[0]
	for _, v := range col.Values {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo == hi {
		return nil, fail(firstRow, col.Name, "every one of the %d values is %s: a constant column has no scatter to fit", len(col.Values), col.Format(lo))
	}
	return col, nil
}

type badCell struct {
	row        int
	text, note string
}

func badCellsError(file, col string, dim units.Dim, bad []badCell) error {
	var b strings.Builder
	what := "a number"
	if dim != units.None {
		what = "a number or a " + dim.String() + " with its unit"
	}
	if len(bad) == 1 {
		c := bad[0]
		fmt.Fprintf(&b, "%q is not %s", c.text, what)
		if c.note != "" {
			b.WriteString(" (" + c.note + ")")
		}
		b.WriteString(hint(c.text))
		return &DataError{File: file, Row: c.row, Column: col, Msg: b.String()}
	}
	fmt.Fprintf(&b, "%d cells are not %s: ", len(bad), what)
	for i, c := range bad {
		if i == 10 {
			fmt.Fprintf(&b, ", and %d more", len(bad)-10)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "row %d %q", c.row, c.text)
		if c.note != "" {
			b.WriteString(" (" + c.note + ")")
		}
	}
	b.WriteString(hint(bad[0].text))
	return &DataError{File: file, Row: bad[0].row, Column: col, Msg: b.String()}
}

// hint explains the usual causes of a cell that does not read.
func hint(cell string) string {
	switch {
	case !utf8.ValidString(cell):
		return "; the file is not UTF-8 text (Latin-1 or Windows-1252?): save it as UTF-8"
	case strings.Count(cell, ",") == 1 && !strings.Contains(cell, "."):
		return "; a decimal comma? write a decimal point, or use a semicolon separator"
	case strings.EqualFold(cell, "nan") || strings.Contains(strings.ToLower(cell), "inf"):
		return "; leave the cell blank for a missing value"
	}
	return ""
}

// isDecimal refuses the spellings strconv.ParseFloat accepts beyond plain
// decimal numbers: hexadecimal floats, "Inf", "NaN", underscores.
func isDecimal(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || c == '+' || c == '-' || c == 'e' || c == 'E') {
			return false
		}
	}
	return true
}

// splitUnit separates a leading decimal number from the unit text after it.
func splitUnit(s string) (num, unit string) {
	i := 0
	for i < len(s) {
		c := s[i]
		if c >= '0' && c <= '9' || c == '.' || ((c == '+' || c == '-') && (i == 0 || s[i-1] == 'e' || s[i-1] == 'E')) {
			i++
			continue
		}
		if (c == 'e' || c == 'E') && i > 0 && i+1 < len(s) && (s[i+1] == '-' || s[i+1] == '+' || s[i+1] >= '0' && s[i+1] <= '9') {
			i++
			continue
		}
		break
	}
	if !strings.ContainsAny(s[:i], "0123456789") {
		return "", ""
	}
	return s[:i], strings.TrimSpace(s[i:])
}

// sniffComma picks the separator that occurs most often, outside quotes, on
// the first line; a comma when none does.
func sniffComma(head []byte) rune {
	counts := map[byte]int{}
	in := false
	for _, c := range head {
		if c == '"' {
			in = !in
			continue
		}
		if in {
			continue
		}
		if c == '\n' {
			break
		}
		if c == ',' || c == ';' || c == '\t' {
			counts[c]++
		}
	}
	best := byte(',')
	for _, c := range []byte{';', '\t'} {
		if counts[c] > counts[best] {
			best = c
		}
	}
	return rune(best)
}

// csvReason strips the position encoding/csv puts in its messages (the
// caller names the row).
func csvReason(err error) string {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// findColumn returns the index of the named column: an exact match, else a
// unique match ignoring case and surrounding spaces. A miss suggests the
// closest header names.
func findColumn(names []string, want string) (int, error) {
	want = strings.TrimSpace(want)
	if want == "" {
		return 0, fmt.Errorf("no column named (columns: %s)", strings.Join(quoteAll(names), ", "))
	}
	found := -1
	for i, n := range names {
		if n == want {
			if found >= 0 {
				return 0, fmt.Errorf("two columns are named %q (columns %d and %d): rename one", want, found+1, i+1)
			}
			found = i
		}
	}
	if found >= 0 {
		return found, nil
	}
	for i, n := range names {
		if strings.EqualFold(n, want) {
			if found >= 0 {
				return 0, fmt.Errorf("no column %q; %q and %q differ from it only in case", want, names[found], n)
			}
			found = i
		}
	}
	if found >= 0 {
		return found, nil
	}
	var close []string
	for _, n := range names {
		d := editDistance(strings.ToLower(n), strings.ToLower(want))
		if d <= max(2, len(want)/3) || strings.Contains(strings.ToLower(n), strings.ToLower(want)) {
			close = append(close, strconv.Quote(n))
		}
	}
	msg := fmt.Sprintf("no column %q", want)
	if len(close) > 0 {
		msg += "; did you mean " + strings.Join(close, " or ") + "?"
	}
	return 0, fmt.Errorf("%s (columns: %s)", msg, strings.Join(quoteAll(names), ", "))
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, v := range s {
		out[i] = strconv.Quote(v)
	}
	return out
}

// editDistance is the Levenshtein distance of two strings, by runes.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			c := prev[j-1]
			if ra[i-1] != rb[j-1] {
				c++
			}
			cur[j] = min(c, prev[j]+1, cur[j-1]+1)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// rowList writes " (rows 5, 9, 12)" with at most 10 rows shown.
func rowList(rows []int) string {
	if len(rows) == 0 {
		return ""
	}
	var b strings.Builder
	if len(rows) == 1 {
		fmt.Fprintf(&b, " (row %d)", rows[0])
		return b.String()
	}
	b.WriteString(" (rows ")
	for i, r := range rows {
		if i == 10 {
			fmt.Fprintf(&b, " and %d more", len(rows)-10)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(strconv.Itoa(r))
	}
	b.WriteString(")")
	return b.String()
}
