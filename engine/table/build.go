package table

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
)

// Decimal chooses the decimal mark, or lets the reader decide per column.
type Decimal uint8

const (
	DecimalAuto  Decimal = iota // decide per column from the column's own numbers
	DecimalPoint                // 1,234.5
	DecimalComma                // 1.234,5
)

// Header says whether the first non-blank row holds the column names.
type Header uint8

const (
	HeaderAuto Header = iota // decide from the first rows
	HeaderYes
	HeaderNo
)

// Options change how a table is read. The zero value detects everything, as
// the package-level functions do; the page uses the fields to let the user
// overrule a guess.
type Options struct {
	Delimiter rune    // '\t', ';', ',' or '|'; 0 (or anything else) detects
	Decimal   Decimal // the decimal mark for every column, or DecimalAuto
	Header    Header  // whether the first non-blank row is a header
}

// Parse reads a table pasted from a spreadsheet or typed as CSV text. It
// returns an error only when there is nothing to read (ErrEmpty); every
// other problem is in Table.Problems. Text that is not UTF-8 is decoded as
// ParseBytes does.
func Parse(text string) (*Table, error) { return Options{}.Parse(text) }

// ParseBytes is Parse for bytes, such as a saved file: UTF-8 with or without
// a byte order mark, UTF-16 with a byte order mark, or Windows-1252.
func ParseBytes(b []byte) (*Table, error) { return Options{}.ParseBytes(b) }

// FromRecords builds a table from cells already split into rows, such as
// those read from a spreadsheet file, with the same header, number and name
// rules as Parse. Row numbers are the indexes of records plus one. Rows may
// have different lengths: a spreadsheet leaves empty trailing cells out, so
// short rows are padded without a problem. A lone '.' before three digits is
// read as a decimal point without a warning, because spreadsheets store
// numbers that way.
func FromRecords(records [][]string) (*Table, error) { return Options{}.FromRecords(records) }

// Parse is the package-level Parse with these options.
func (o Options) Parse(text string) (*Table, error) {
	s, p := decode(text)
	return o.parse(s, p)
}

// ParseBytes is the package-level ParseBytes with these options.
func (o Options) ParseBytes(b []byte) (*Table, error) {
	s, p := decode(string(b))
	return o.parse(s, p)
}

// FromRecords is the package-level FromRecords with these options.
func (o Options) FromRecords(records [][]string) (*Table, error) {
	recs := make([]record, len(records))
	for i, f := range records {
		recs[i] = record{fields: f, num: i + 1, line: i + 1}
	}
	b := &builder{opt: o, spreadsheet: true}
	return b.build(recs)
}

func (o Options) parse(s string, enc *Problem) (*Table, error) {
	var d byte
	switch o.Delimiter {
	case '\t', ';', ',', '|':
		d = byte(o.Delimiter)
	default:
		d = detectDelimiter(s)
	}
	r := newReader(s, d)
	recs := r.readAll(0)
	b := &builder{opt: o, delim: rune(d), problems: r.problems}
	if enc != nil {
		b.problems = append(b.problems, enc)
	}
	return b.build(recs)
}

// builder holds the state of turning records into a Table.
type builder struct {
	opt         Options
	delim       rune
	spreadsheet bool // records came from a spreadsheet file
	problems    []*Problem
}

func (b *builder) add(row, line, col int, text string, sev Severity, err error) {
	b.problems = append(b.problems, &Problem{Row: row, Column: col, Text: text, Err: err, Severity: sev, Line: line})
}

// cell is field j of fields, or "" past its end.
func cell(fields []string, j int) string {
	if j < len(fields) {
		return fields[j]
	}
	return ""
}

func (b *builder) build(recs []record) (*Table, error) {
	last := -1
	for i, rec := range recs {
		if !isBlank(rec.fields) {
			last = i
		}
	}
	if last < 0 {
		return nil, ErrEmpty
	}
	// Blank rows inside the table are reported; those after the last row
	// (trailing line breaks) hold nothing and are passed over.
	rows := make([]record, 0, last+1)
	for _, rec := range recs[:last+1] {
		if isBlank(rec.fields) {
			b.add(rec.num, rec.line, 0, "", Note, fmt.Errorf("%w: left out", ErrBlankRow))
			continue
		}
		rows = append(rows, rec)
	}
	width, longest, typed := 0, 0, 0
	for _, rec := range rows {
		n := filledLen(rec.fields)
		width = max(width, n)
		longest = max(longest, len(rec.fields))
		typed += n
	}
	if budget := max(2*typed, minCells); len(rows)*width > budget {
		width = b.cutWide(rows, budget/len(rows))
		longest = width
	}
	if longest > width && !b.spreadsheet {
		what := fmt.Sprintf("column %d is", width+1)
		if longest > width+1 {
			what = fmt.Sprintf("columns %d to %d are", width+1, longest)
		}
		b.add(0, 0, 0, "", Note, fmt.Errorf("%w: %s empty in every row and left out", ErrEmptyColumn, what))
	}

	t := &Table{Delimiter: b.delim, NameColumn: -1}
	t.HasHeader = b.detectHeader(rows, width)
	var header record
	if t.HasHeader {
		header, rows = rows[0], rows[1:]
		t.HeaderRow = header.num
	}
	t.Header = b.names(header, t.HasHeader, width)

	cells := make([]string, len(rows)*width)
	t.Rows = make([]Row, len(rows))
	for i, rec := range rows {
		c := cells[i*width : (i+1)*width : (i+1)*width]
		copy(c, rec.fields)
		t.Rows[i] = Row{Line: rec.num, Cells: c, StartLine: rec.line}
		if n := len(rec.fields); n < width && !b.spreadsheet {
			b.add(rec.num, rec.line, 0, "", Warning, fmt.Errorf(
				"%w: it has %d of the table's %d cells; the missing ones are read as blank", ErrRagged, n, width))
		}
	}
	b.columns(t, width)
	slices.SortStableFunc(b.problems, func(p, q *Problem) int {
		return cmp.Or(cmp.Compare(p.Row, q.Row), cmp.Compare(p.Column, q.Column))
	})
	t.Problems = b.problems
	return t, nil
}

// minCells is the number of cells a table may always hold, however much of
// it is padding.
const minCells = 1 << 16

// filledLen is the number of fields up to the last one that is not blank.
func filledLen(fields []string) int {
	n := len(fields)
	for n > 0 && trimSpace(fields[n-1]) == "" {
		n--
	}
	return n
}

// cutWide limits the table to width columns, reporting each row that had
// more. It is used when a few rows are so much wider than the rest that
// padding every row to their width would make the table mostly empty cells
// (and, for a long paste, too large to hold): a sign of a broken paste.
func (b *builder) cutWide(rows []record, width int) int {
	for _, rec := range rows {
		n := filledLen(rec.fields)
		if n <= width {
			continue
		}
		extra := 0
		first := ""
		for _, f := range rec.fields[width:n] {
			if trimSpace(f) != "" {
				if extra == 0 {
					first = f
				}
				extra++
			}
		}
		b.add(rec.num, rec.line, 0, first, Error, fmt.Errorf(
			"%w: it has %d cells where most rows have far fewer; only the first %d are read, and %d filled cells after them are not (the first is %q)",
			ErrTooWide, n, width, extra, first))
	}
	return width
}

// detectHeader decides whether the first row holds names: it does when, over
// the columns that hold mostly numbers below it, it holds text at least as
// often as numbers. When no column below holds numbers (a table of text, or a
// single row), it does when it holds no number at all.
func (b *builder) detectHeader(rows []record, width int) bool {
	switch b.opt.Header {
	case HeaderYes:
		return true
	case HeaderNo:
		return false
	}
	first := rows[0].fields
	below := rows[1:min(len(rows), 101)]
	numCols, textOver, numOver, firstNums := 0, 0, 0, 0
	for j := range width {
		fk := lexNumber(cell(first, j)).kind
		if fk == kindNumber {
			firstNums++
		}
		nums, texts := 0, 0
		for _, r := range below {
			switch lexNumber(cell(r.fields, j)).kind {
			case kindNumber:
				nums++
			case kindText:
				texts++
			}
		}
		if nums > 0 && nums >= texts {
			numCols++
			switch fk {
			case kindText:
				textOver++
			case kindNumber:
				numOver++
			}
		}
	}
	if numCols > 0 {
		return textOver > 0 && textOver >= numOver
	}
	return firstNums == 0
}

// names makes one unique, non-empty name per column from the header record,
// reporting each name it had to invent or change.
func (b *builder) names(header record, has bool, width int) []string {
	names := make([]string, width)
	if !has {
		for j := range names {
			names[j] = fmt.Sprintf("Column %d", j+1)
		}
		b.add(0, 0, 0, "", Note, fmt.Errorf(
			"%w: the first row holds numbers, so it is read as data; the columns are named Column 1 to Column %d", ErrNoHeader, width))
		return names
	}
	used := make(map[string]int, width) // name -> 1-based column
	for j := range names {
		raw := cell(header.fields, j)
		name := strings.Join(strings.FieldsFunc(raw, isSpace), " ")
		if name == "" {
			name = fmt.Sprintf("Column %d", j+1)
			for k := 2; used[name] != 0; k++ {
				name = fmt.Sprintf("Column %d (%d)", j+1, k)
			}
			b.add(header.num, header.line, j+1, raw, Note, fmt.Errorf("%w: it is named %q", ErrEmptyHeader, name))
		} else if other := used[name]; other != 0 {
			base := name
			for k := 2; used[name] != 0; k++ {
				name = fmt.Sprintf("%s (%d)", base, k)
			}
			b.add(header.num, header.line, j+1, raw, Warning, fmt.Errorf(
				"%w: column %d has the same name; this one is named %q", ErrDuplicateHeader, other, name))
		}
		used[name] = j + 1
		names[j] = name
	}
	return names
}

// colStats counts what a column's cells hold.
type colStats struct {
	nums, texts            int
	point, comma           int // cells whose separators say decimal point / comma
	ambigComma, ambigPoint int // cells like 1,234 / 1.234
	example                string
	percent, bracket       int
	currencies             []string
	numeric                bool
}

func (st *colStats) count(n *numText, text string) {
	switch n.kind {
	case kindText:
		st.texts++
		return
	case kindNumber:
	default:
		return
	}
	st.nums++
	switch n.mark {
	case votePoint:
		st.point++
	case voteComma:
		st.comma++
	case voteAmbiguous:
		if st.example == "" {
			st.example = trimSpace(text)
		}
		if n.sep == ',' {
			st.ambigComma++
		} else {
			st.ambigPoint++
		}
	}
	if n.percent {
		st.percent++
	}
	if n.bracket {
		st.bracket++
	}
	if n.currency != "" && !slices.Contains(st.currencies, n.currency) {
		st.currencies = append(st.currencies, n.currency)
	}
}

// columns reads every column's numbers: a first pass counts what the cells
// say about the decimal mark, a second reads the values.
func (b *builder) columns(t *Table, width int) {
	stats := make([]colStats, width)
	for j := range stats {
		st := &stats[j]
		for _, row := range t.Rows {
			n := lexNumber(row.Cells[j])
			st.count(&n, row.Cells[j])
		}
		st.numeric = st.nums > 0 && st.nums >= st.texts
	}
	lean, leanWhy := b.lean(stats)
	textCells := make([]int, len(t.Rows)) // text cells in numeric columns, per row
	numericCols := 0
	t.Columns = make([]Column, width)
	for j := range t.Columns {
		st := &stats[j]
		col := &t.Columns[j]
		col.Name = t.Header[j]
		col.Numeric = st.numeric
		col.Values = make([]float64, len(t.Rows))
		comma, how := b.decide(j, col.Name, st, lean, leanWhy)
		col.DecimalComma = comma
		if col.Numeric {
			numericCols++
			col.Note = how + b.columnExtras(j, col, st)
		}
		for i, row := range t.Rows {
			col.Values[i] = b.value(row, j, col.Numeric, comma, &textCells[i])
		}
	}
	if numericCols > 0 {
		for i, n := range textCells {
			if n == numericCols {
				b.add(t.Rows[i].Line, t.Rows[i].StartLine, 0, "", Warning, fmt.Errorf(
					"%w (is it a second header line?); the row is kept and its cells are reported", ErrTextRow))
			}
		}
	}
	for j := range t.Columns {
		col := &t.Columns[j]
		if col.Numeric {
			continue
		}
		col.Note = "text"
		if t.NameColumn < 0 && stats[j].texts > 0 {
			t.NameColumn = j
			col.Note = "text, offered as the unit names"
		}
	}
}

// lean is the decimal mark for columns whose own numbers do not decide it.
func (b *builder) lean(stats []colStats) (comma bool, why string) {
	switch {
	case b.delim == ';':
		return true, "the table is separated by semicolons, which usually goes with a decimal comma"
	case b.spreadsheet:
		return false, "cells from a spreadsheet file store numbers with a decimal point"
	}
	point, commas := 0, 0
	for _, st := range stats {
		if st.comma > st.point {
			commas++
		} else if st.point > st.comma {
			point++
		}
	}
	if commas > point {
		return true, "other columns use a decimal comma"
	}
	if point > 0 {
		return false, "other columns use a decimal point"
	}
	return false, "nothing in the table says otherwise"
}

// decide chooses a column's decimal mark and says how, reporting a column
// whose numbers could be read either way.
func (b *builder) decide(j int, name string, st *colStats, lean bool, leanWhy string) (bool, string) {
	switch b.opt.Decimal {
	case DecimalPoint:
		return false, "read with a decimal point, as chosen"
	case DecimalComma:
		return true, "read with a decimal comma, as chosen"
	}
	switch {
	case st.comma > st.point:
		return true, "read with a decimal comma (as in 1.234,5)"
	case st.point > st.comma:
		return false, "read with a decimal point (as in 1,234.5)"
	case st.point > 0: // a tie between clear cells
		return lean, fmt.Sprintf("read with a decimal %s: as many cells use a point as a comma, and %s", markWord(lean), leanWhy)
	case st.ambigComma+st.ambigPoint == 0:
		return false, "whole numbers (no decimal marks)"
	case b.spreadsheet && st.ambigComma == 0:
		return false, "read with a decimal point (as the spreadsheet stores numbers)"
	}
	reading, _ := ParseNumber(st.example, lean)
	how := fmt.Sprintf("read with a decimal %s, so %s is %s, because %s", markWord(lean), st.example, formatValue(reading), leanWhy)
	if st.numeric {
		b.add(0, 0, j+1, name, Warning, fmt.Errorf(
			"%w: numbers such as %s could be read with a decimal point or a decimal comma; %s", ErrAmbiguousDecimal, st.example, how))
	}
	return lean, how
}

func markWord(comma bool) string {
	if comma {
		return "comma"
	}
	return "point"
}

func formatValue(v float64) string { return fmt.Sprintf("%.10g", v) }

// columnExtras reports percent signs, currency signs and brackets found in a
// numeric column and returns the words to add to its note.
func (b *builder) columnExtras(j int, col *Column, st *colStats) string {
	var note strings.Builder
	if st.percent > 0 {
		col.Percent = true
		note.WriteString("; percentages read as typed (12% is 12)")
		b.add(0, 0, j+1, col.Name, Note, fmt.Errorf("%w: the numbers carry %%; they are read as typed (12%% is 12)", ErrPercent))
		if st.percent < st.nums {
			b.add(0, 0, j+1, col.Name, Warning, fmt.Errorf(
				"%w: %d of %d numbers carry %% and the others do not; all are read as typed", ErrPercent, st.percent, st.nums))
		}
	}
	if len(st.currencies) > 0 {
		col.Currency = strings.Join(st.currencies, ", ")
		fmt.Fprintf(&note, "; currency sign %s removed", col.Currency)
		if len(st.currencies) == 1 {
			b.add(0, 0, j+1, col.Name, Note, fmt.Errorf("%w: %s removed from the numbers", ErrCurrency, col.Currency))
		} else {
			b.add(0, 0, j+1, col.Name, Warning, fmt.Errorf(
				"%w: several currencies in one column (%s); the numbers are read as they are, not converted", ErrCurrency, col.Currency))
		}
	}
	if st.bracket > 0 {
		fmt.Fprintf(&note, "; %d in brackets read as negative", st.bracket)
	}
	return note.String()
}

// value reads cell j of row, reporting its problems when the column is
// numeric, and counts text cells of numeric columns in *texts.
func (b *builder) value(row Row, j int, numeric, comma bool, texts *int) float64 {
	text := row.Cells[j]
	n := lexNumber(text)
	if !numeric {
		if n.kind != kindNumber {
			return math.NaN()
		}
		v, _ := n.value(comma)
		return v
	}
	at := func(sev Severity, err error) { b.add(row.Line, row.StartLine, j+1, text, sev, err) }
	switch n.kind {
	case kindBlank, kindMissing:
		at(Warning, fmt.Errorf("%w: %s", ErrMissing, n.why))
		return math.NaN()
	case kindText:
		*texts++
		at(Error, n.textErr())
		return math.NaN()
	}
	v, err := n.value(comma)
	if err != nil {
		at(Error, err)
		return v
	}
	if mark := n.decimalMark(comma); (mark == ',') != comma && mark != 0 {
		at(Warning, fmt.Errorf("%w: this cell uses a decimal %s and the column a decimal %s; read as %s",
			ErrMixedDecimal, markWord(!comma), markWord(comma), formatValue(v)))
	}
	if n.bracket {
		at(Note, fmt.Errorf("%w: read as %s, as in accounts", ErrBracketNegative, formatValue(v)))
	}
	return v
}

// textErr is the error for a cell that is not a number.
func (n *numText) textErr() error {
	return fmt.Errorf("%w%s", ErrNotNumber, strings.TrimPrefix(n.why, "not a number"))
}
